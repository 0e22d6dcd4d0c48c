"""``feedcheck compare``: what changed between two revisions (reports or jobs)."""

from __future__ import annotations

import sys

import click

from .. import CAUTION
from .errors import handle_input_errors
from .params import CONTEXT


def _revision(path: str, label: str):
    """A Revision from a report PDF (its embedded inputs and results) or a job file
    (checked now)."""
    import json
    from pathlib import Path

    from ..render.json_csv import render_json
    from ..render.pdf.embed import INPUT_PREFIX, MANIFEST_NAME, RESULTS_NAME, NotAReport
    from ..render.revision_diff import Revision

    if Path(path).suffix.lower() == ".pdf":
        from ..render.pdf.tables_embed import read_attachment_map

        try:
            att = read_attachment_map(path)
            manifest = json.loads(att[MANIFEST_NAME].decode("utf-8"))
            results = json.loads(att[RESULTS_NAME].decode("utf-8"))
            names = [manifest["job"], *manifest.get("schedules", [])]
            files = {str(n): att[INPUT_PREFIX + str(n)] for n in names}
        except Exception as exc:  # pypdf and damaged attachments raise many kinds
            raise NotAReport(
                f"{path}: not a readable feedcheck report ({type(exc).__name__})"
            ) from exc
        return Revision(label, str(manifest["job"]), files, results)
    from ..render.pdf.embed import input_attachments
    from ..runner import load_and_check

    job, results = load_and_check(path)
    files = {
        n[len(INPUT_PREFIX) :]: data
        for n, data in input_attachments(job)
        if n.startswith(INPUT_PREFIX)
    }
    return Revision(label, Path(job.path).name, files, json.loads(render_json(results)))


@click.command("compare", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("old", type=click.Path(exists=True, dir_okay=False))
@click.argument("new", type=click.Path(exists=True, dir_okay=False))
@handle_input_errors
def compare_command(old, new):
    """List what changed from revision OLD to revision NEW.

    OLD and NEW are each a feedcheck report (.pdf, compared through the job,
    schedules and results embedded in it) or a job file (checked now). The
    listing names the inputs that changed (job keys, schedule lines, tables)
    and then the figures and findings that changed as a result. A changed
    figure is a reason to review it again, not a verdict on either revision.

    \b
    Examples:
      feedcheck compare annex-rev-b.pdf annex-rev-c.pdf
      feedcheck compare annex-rev-b.pdf annex.toml
    Exit code 0: nothing changed; 1: something changed; 2: a file is not a
    readable report or job.
    """
    from ..render.pdf.embed import NotAReport
    from ..render.revision_diff import job_changes, result_changes, schedule_changes, table_changes

    try:
        a, b = _revision(old, "OLD"), _revision(new, "NEW")
    except NotAReport as exc:
        click.echo(f"error: {exc}", err=True)
        sys.exit(2)
    click.echo(f"OLD: {old} (rev {a.results.get('job', {}).get('revision') or '—'})")
    click.echo(f"NEW: {new} (rev {b.results.get('job', {}).get('revision') or '—'})")
    inputs = job_changes(a, b) + schedule_changes(a, b) + table_changes(a, b)
    figures, findings, n = result_changes(a, b)
    for title, lines in (
        ("inputs changed", inputs),
        ("figures changed", figures),
        ("findings changed", findings),
    ):
        count = sum(not line.startswith(" ") for line in lines)
        click.echo(f"{title}: {count or 'none'}")
        for line in lines:
            click.echo(f"  {line}")
    changed = bool(inputs or figures or findings)
    click.echo(
        f"{n} figures and findings compared; {'changes listed above' if changed else 'no change'}"
    )
    sys.exit(1 if changed else 0)
