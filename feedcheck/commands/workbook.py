"""``feedcheck workbook``: a job written as one XLSX workbook, to fill in or edit in a
spreadsheet program and check as it is (every command taking a job takes the workbook)."""

from __future__ import annotations

import sys

import click

from .. import CAUTION
from .errors import handle_input_errors
from .params import CONTEXT


@click.command("workbook", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("job_file", type=click.Path(dir_okay=True, exists=False))
@click.option(
    "-o",
    "--out",
    "out",
    type=click.Path(dir_okay=False),
    help="Workbook to write (default: the job file's name with .xlsx, beside it, where "
    "its schedules are found); never the job file itself.",
)
@click.option("--force", is_flag=True, help="Replace an existing workbook.")
@handle_input_errors
def workbook_command(job_file, out, force):
    """Write a job file as one XLSX workbook: a read-me sheet, then a sheet per table
    of the job (project, source, transformer, run, panel, motor, generator,
    transfer_switch, options) with its keys in row 1 and one element per row.

    Values are written as the job file writes them ("85 ft" stays 85 ft), so the
    workbook reads back as the same job: `feedcheck check JOB.xlsx` gives the same
    results. The job is validated first; an invalid job writes nothing. JOB_FILE may
    be a workbook too (it is written afresh). Panel schedules are not copied: they
    are found beside the workbook, as beside a job file.

    \b
    Examples:
      feedcheck workbook sample_jobs/harbor_kitchen.toml
      feedcheck workbook site.toml -o site.xlsx && feedcheck check site.xlsx
    Exit code 0: written; 2: the job is invalid, or the workbook exists (use
    --force), nothing written; 130: interrupted (nothing written).
    """
    from pathlib import Path

    from ..inputs.job_file import read_job, read_job_data
    from ..io_atomic import check_output
    from ..workbook_export import write_job_workbook

    target = Path(out) if out else Path(job_file).with_suffix(".xlsx")
    check_output(target, [job_file])
    if target.exists() and not force:
        click.echo(f"error: {target} exists; use --force to replace it", err=True)
        sys.exit(2)
    if not target.resolve().parent.is_dir():
        click.echo(f"error: folder {target.parent} does not exist; nothing was written", err=True)
        sys.exit(2)
    job = read_job(job_file)  # the same validation as `feedcheck check`
    data = read_job_data(job_file)
    write_job_workbook(data, target, str(job_file))
    click.echo(f"wrote {target} — edit it, then run: feedcheck check {target}", err=True)
    moved = [p for p in job.panels if p.schedule is not None]
    if moved and target.resolve().parent != Path(job_file).resolve().parent:
        names = ", ".join(str(Path(p.schedule).relative_to(Path(job_file).parent)) for p in moved)
        click.echo(
            f"note: the schedules ({names}) are read from the workbook's folder "
            f"{target.resolve().parent}: copy them there",
            err=True,
        )
