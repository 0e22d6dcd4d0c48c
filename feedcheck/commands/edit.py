"""``feedcheck edit``: a job opened in the browser, checked as it is typed (the
workbench, :mod:`feedcheck.workbench`)."""

from __future__ import annotations

import sys

import click

from .. import CAUTION
from .errors import handle_input_errors
from .params import CONTEXT


@click.command("edit", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("job_file", type=click.Path(dir_okay=True, exists=False))
@click.option(
    "--port",
    type=click.IntRange(0, 65535),
    default=0,
    show_default=True,
    help="Port on 127.0.0.1 to listen on (0: a free one).",
)
@click.option(
    "--no-browser",
    is_flag=True,
    help="Print the address only (open it yourself, in a browser on this computer).",
)
@handle_input_errors
def edit_command(job_file, port, no_browser):
    """Open a job file in the browser: forms for every table of the job, the one-line
    diagram with each node's figures, and the findings, re-checked as you type (the
    same checks and messages as `feedcheck check`); save the file, write the PDF
    report, edit panel schedules, start a new job from the template.

    The page is served on this computer only (127.0.0.1), at an address holding a
    random key; nothing is fetched from the network. Saving keeps the file yours:
    comments, key order and layout of what you did not change stay as they were.
    A JOB_FILE that does not exist starts from the template (Save creates it).
    The server stops on Ctrl-C, when the page is closed, or after 150 s without
    the page.

    \b
    Examples:
      feedcheck edit sample_jobs/harbor_kitchen.toml
      feedcheck edit new_site.toml --no-browser
    Exit code 0: stopped; 2: the job file cannot be opened (nothing written).
    """
    from pathlib import Path

    from ..inputs.job_file import read_job_source
    from ..template import TEMPLATE
    from ..workbench.actions import Session
    from ..workbench.server import serve
    from .clock import calc_date

    path = Path(job_file)
    if path.suffix.lower() == ".xlsx":
        click.echo(
            f"error: {job_file}: a job workbook is edited in a spreadsheet program; "
            "`feedcheck edit` takes a job file (.toml)",
            err=True,
        )
        sys.exit(2)
    if path.suffix.lower() != ".toml":
        click.echo(f"error: {job_file}: expected a job file ending in .toml", err=True)
        sys.exit(2)
    if not path.parent.resolve().is_dir():
        click.echo(f"error: {job_file}: the folder {path.parent} does not exist", err=True)
        sys.exit(2)
    if path.exists() or path.is_symlink():
        text, exists = read_job_source(path)[0], True
    else:
        text, exists = TEMPLATE, False
    session = Session(path, calc_date(), text, exists)

    def echo(line: str) -> None:
        click.echo(line)
        sys.stdout.flush()

    if not exists:
        click.echo(f"{job_file} does not exist: the page starts from the template", err=True)
    serve(session, port, open_browser=not no_browser, echo=echo)
