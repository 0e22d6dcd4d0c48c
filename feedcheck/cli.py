"""Command line: the click groups and the core commands (check, init, tables); the
other commands live in :mod:`feedcheck.commands` and are attached by its registry.

Parse, call the library, render, map problems to exit codes.

Exit codes: 0 no failing check (warnings allowed), 1 at least one failing check,
2 the input could not be read or is invalid (nothing is written), 3 an internal error
(a fault in feedcheck; nothing is written), 130 interrupted (nothing is written).
"""

from __future__ import annotations

import functools
import sys
import textwrap

import click

from . import CAUTION, __version__
from .commands.errors import guard_all, handle_input_errors
from .commands.params import CONTEXT, VOLTAGE_SYSTEM


@click.group(context_settings=CONTEXT, epilog=CAUTION)
@click.version_option(__version__, "-V", "--version", prog_name="feedcheck")
@click.option(
    "--tables",
    "tables_dir",
    type=click.Path(exists=True, file_okay=False),
    help="Folder of your own table copies (CSV with provenance header); a table "
    "found there replaces the shipped one of the same name.",
)
def main(tables_dir):
    """Size and check feeds from low-voltage distribution transformers.

    \b
    Typical use:
      feedcheck init my_job.toml          write a commented job template
      feedcheck check my_job.toml         check a job; summary in the terminal
      feedcheck check my_job.toml --format json > results.json
      feedcheck workbook my_job.toml      the job as a workbook (check it as my_job.xlsx)
      feedcheck tables                    list the data tables and their sources
      feedcheck calc rated-current --rating 75kVA --voltage 208V

    Results are an aid: verify them against the locally adopted electrical code
    and have a licensed electrician or engineer review the work.
    """
    _quick_exit()
    if tables_dir:
        from .tables import set_user_tables_dir

        set_user_tables_dir(tables_dir)


@functools.cache
def _quick_exit() -> None:
    """At exit, the objects still alive are set aside from the cycle collector
    (``gc.freeze``) before the interpreter's last collections, which would otherwise
    scan a large job's results once more only to free them; they are freed as the
    interpreter tears down all the same, and the operating system takes back the rest
    (a 1,000-panel check exits about 50 ms sooner). Registered once per process."""
    import atexit
    import gc

    atexit.register(gc.freeze)


def _check_out_folder(value):
    """An output path whose folder does not exist is a usage error (exit 2)."""
    from pathlib import Path

    if value and not Path(value).resolve().parent.is_dir():
        raise click.BadParameter(
            f"got {value!r}; the folder {str(Path(value).parent)!r} does not exist",
            param_hint="--out",
        )
    return value


@main.command("check", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("job_file", type=click.Path(dir_okay=True, exists=False))
@click.option(
    "--format",
    "fmt",
    type=click.Choice(["text", "json", "csv"]),
    default="text",
    show_default=True,
    help="text summary, JSON (nodes + findings) or CSV (findings).",
)
@click.option(
    "--out",
    "out",
    type=click.Path(dir_okay=False),
    callback=lambda ctx, param, value: _check_out_folder(value),
    help="Write the JSON/CSV/text to this file (atomically) instead of stdout; never one "
    "of the job's inputs, a folder or a read-only file.",
)
@click.option("--all", "show_all", is_flag=True, help="Also list passing and info findings.")
@handle_input_errors
def check_cmd(job_file, fmt, out, show_all):
    """Check every element of a job file (TOML, or a job workbook .xlsx).

    \b
    Examples:
      feedcheck check sample_jobs/harbor_kitchen.toml
      feedcheck check job.toml --format json --out results.json
      feedcheck check job.xlsx
    Exit code 0: no failing check; 1: a check failed; 2: the input is invalid;
    130: interrupted.
    """
    from .commands.clock import calc_date
    from .render.json_csv import render_csv, render_json
    from .render.text import render_text
    from .runner import load_and_check

    if out:
        from .io_atomic import check_output

        check_output(out, [job_file])  # before the work; again below with the schedules
    job, results = load_and_check(job_file, calc_date())
    text = {"json": render_json, "csv": render_csv}.get(
        fmt, functools.partial(render_text, show_all=show_all)
    )(results)
    if out:
        from .commands.report import job_inputs
        from .io_atomic import write_text_atomic

        check_output(out, job_inputs(job))
        write_text_atomic(out, text)
        click.echo(f"wrote {out}", err=True)
    else:
        click.echo(text, nl=not text.endswith("\n"))
    sys.exit(results.exit_code)


@main.command("init", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("path", type=click.Path(dir_okay=False), default="job.toml")
@click.option("--force", is_flag=True, help="Overwrite an existing file.")
def init_cmd(path, force):
    """Write a commented job-file template to PATH (default job.toml); a PATH ending
    in .xlsx gets the same job as a workbook to fill in (see `feedcheck workbook`).

    \b
    Examples:
      feedcheck init site_a.toml && feedcheck check site_a.toml
      feedcheck init site_a.xlsx && feedcheck check site_a.xlsx
    """
    from pathlib import Path

    from .io_atomic import write_text_atomic
    from .template import TEMPLATE

    if not Path(path).resolve().parent.is_dir():
        click.echo(f"error: {path}: the folder {Path(path).parent} does not exist", err=True)
        sys.exit(2)
    if Path(path).exists() and not force:
        click.echo(f"error: {path} exists; use --force to overwrite it", err=True)
        sys.exit(2)
    if Path(path).suffix.lower() == ".xlsx":
        from .io_atomic import write_bytes_atomic
        from .workbook_export import template_workbook

        write_bytes_atomic(path, template_workbook())
    else:
        write_text_atomic(path, TEMPLATE)
    click.echo(f"wrote {path} — edit it, then run: feedcheck check {path}")


@main.command("tables", context_settings=CONTEXT, epilog=CAUTION)
@click.option(
    "--verify",
    is_flag=True,
    help="Check every table (header, columns, units, monotonic order, gaps); "
    "exit 2 if any is broken.",
)
def tables_cmd(verify):
    """List the data tables with their source and confidence.

    \b
    Examples:
      feedcheck tables
      feedcheck --tables my_tables/ tables --verify
    """
    from .tables import sorted_counts, verify_all

    good, bad = verify_all()
    total: dict[str, int] = {}
    for t in good:
        level, detail = _confidence_parts(t.confidence)
        click.echo(f"{t.name}  [{level}]  {t.origin}")
        counts = t.confidence_counts()
        for k, n in counts.items():
            total[k] = total.get(k, 0) + n
        click.echo("    rows:   " + _counts_text(counts))
        click.echo(
            textwrap.fill(
                t.source, 96, initial_indent="    source: ", subsequent_indent="            "
            )
        )
        if detail:
            click.echo(
                textwrap.fill(
                    detail, 96, initial_indent="    note:   ", subsequent_indent="            "
                )
            )
    n_rows = sum(total.values())
    total = sorted_counts(total)
    click.echo(f"{len(good)} tables, {n_rows} rows by confidence: {_counts_text(total)}")
    for exc in bad:
        for p in exc.problems:
            click.echo(f"error: {p}", err=True)
    if verify:
        click.echo(f"{len(good)} tables verified, {len(bad)} broken", err=True)
    sys.exit(2 if bad else 0)


def _counts_text(counts: dict[str, int]) -> str:
    """'36 published, 14 from memory — verify' (levels as the tables module orders them)."""
    return ", ".join(f"{n} {level}" for level, n in counts.items()) or "none"


def _confidence_parts(text: str) -> tuple[str, str]:
    """("published", "rows … from memory") from a table's confidence line."""
    from .tables import CONFIDENCE_LEVELS

    for level in CONFIDENCE_LEVELS:
        head = level.split(" —")[0]
        if text.lower().startswith(head):
            rest = text[len(level) if text.startswith(level) else len(head) :].strip(" ;")
            return level, rest.strip("()")
    return text, ""


@main.group("calc", context_settings=CONTEXT, epilog=CAUTION)
def calc():
    """Quick figures for spot checks (one value, formula shown)."""


def _register_optional() -> None:
    """Commands contributed by other modules."""
    from .commands import registry

    registry.register(main, calc)


_register_optional()
guard_all(main)  # every command: input errors exit 2, interrupts 130, faults 3 (no traceback)

__all__ = ["VOLTAGE_SYSTEM", "main"]
