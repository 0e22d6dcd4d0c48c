"""Error handling shared by the CLI commands.

Input problems: one line each on stderr, exit code 2, nothing written. An interrupt
(Ctrl-C, SIGINT; SIGTERM while an output is written): exit code 130, nothing written.
Any other exception is a fault in feedcheck: a short message, exit code 3, no traceback
(``FEEDCHECK_DEBUG=1`` shows it).
"""

from __future__ import annotations

import functools
import os
import sys

import click

from ..errors import InputError

INTERRUPTED = 130  # 128 + SIGINT, as shells report an interrupted program


def problem_line(problem) -> str:
    """The line an input problem is shown as (the terminal and the workbench alike)."""
    return f"error: {problem}"


def echo_problems(problems) -> None:
    """Each input problem on its own line of stderr, then how many and that nothing was
    written."""
    for problem in problems:
        click.echo(problem_line(problem), err=True)
    count = len(problems)
    click.echo(
        f"{count} problem{'s' if count != 1 else ''} in the input; nothing was written.",
        err=True,
    )


def handle_input_errors(fn):
    """Map InputError to exit 2, an interrupt to exit 130 and unexpected exceptions to
    exit 3, without tracebacks."""

    @functools.wraps(fn)
    def wrapper(*args, **kwargs):
        try:
            return fn(*args, **kwargs)
        except InputError as exc:
            echo_problems(exc.problems)
            sys.exit(2)
        except KeyboardInterrupt:
            click.echo("interrupted; nothing was written.", err=True)
            sys.exit(INTERRUPTED)
        except (click.ClickException, click.exceptions.Exit, click.Abort, SystemExit):
            raise
        except OSError as exc:  # the machine said no (missing folder, disk full, permission)
            where = exc.filename or "a file"
            click.echo(f"error: {where}: {exc.strerror or exc}; nothing was written.", err=True)
            sys.exit(2)
        except Exception as exc:  # a bug, not the user's input: say so without a traceback
            if os.environ.get("FEEDCHECK_DEBUG"):
                raise
            click.echo(f"internal error: {type(exc).__name__}: {exc}", err=True)
            click.echo(
                "This is a fault in feedcheck, not in your input. Please report it with the "
                "job file (set FEEDCHECK_DEBUG=1 to see the traceback). Nothing was written.",
                err=True,
            )
            sys.exit(3)

    wrapper.guarded = True
    return wrapper


def guard_all(group: click.Group) -> None:
    """Give every command under ``group`` (nested groups included) the wrapper of
    :func:`handle_input_errors`, unless it has it already."""
    for cmd in group.commands.values():
        if isinstance(cmd, click.Group):
            guard_all(cmd)
        elif cmd.callback is not None and not getattr(cmd.callback, "guarded", False):
            cmd.callback = handle_input_errors(cmd.callback)
