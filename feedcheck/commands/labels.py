"""``feedcheck labels``: a printable sheet of fault-current labels (110.24)."""

from __future__ import annotations

import sys

import click

from .. import CAUTION
from .errors import handle_input_errors
from .params import CONTEXT


@click.command("labels", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("job_file", type=click.Path(dir_okay=True, exists=False))
@click.option(
    "-o",
    "--out",
    "out",
    type=click.Path(dir_okay=False),
    help="PDF file to write (default: the job file's name with -labels.pdf, in the "
    "current folder).",
)
@handle_input_errors
def labels_command(job_file, out):
    """Write a PDF sheet of fault-current labels, one per node with a figure.

    Each label gives the maximum available fault current at the node (the
    figure `feedcheck check` reports for the 110.24 marking), the date of the
    calculation (the job's date, else today), the node id and its voltage.
    Field marking follows the locally adopted code: check the figure, the
    wording it requires and who may apply the label. No arc-flash figures.

    \b
    Example:
      feedcheck labels sample_jobs/cedar_annex_review.toml -o cedar-labels.pdf
    Exit code 0: written; 2: the input is invalid, or no node has a figure
    (nothing written).
    """
    from pathlib import Path

    from ..io_atomic import write_bytes_atomic
    from ..render.pdf.labels import labels_from, render_labels
    from ..runner import load_and_check
    from .clock import calc_date

    today = calc_date()
    _, results = load_and_check(job_file, today)
    target = Path(out) if out else Path(Path(job_file).stem + "-labels.pdf")
    if not target.parent.resolve().is_dir():
        click.echo(f"error: folder {target.parent} does not exist; nothing was written", err=True)
        sys.exit(2)
    labels = labels_from(results, today)
    if not labels:
        click.echo(
            f"error: {job_file}: no node has a maximum fault-current figure to mark "
            "(is the source fault current given?); nothing was written",
            err=True,
        )
        sys.exit(2)
    project = str(results.job_summary.get("name", ""))
    write_bytes_atomic(target, render_labels(labels, project))
    click.echo(f"wrote {target} ({len(labels)} labels)", err=True)
    sys.exit(0)
