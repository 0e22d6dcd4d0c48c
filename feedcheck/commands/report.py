"""``feedcheck report`` (the PDF calculation report) and ``feedcheck rerun``
(re-check a report from the inputs embedded in it)."""

from __future__ import annotations

import sys

import click

from .. import CAUTION
from .errors import handle_input_errors
from .params import CONTEXT


def job_inputs(job) -> list:
    """The files a job was read from: the job file and its panels' schedules."""
    return [job.path, *(panel.schedule for panel in job.panels if getattr(panel, "schedule", None))]


@click.command("report", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("job_file", type=click.Path(dir_okay=True, exists=False))
@click.option(
    "-o",
    "--out",
    "out",
    type=click.Path(),
    help="PDF file to write (default: the job file's name with .pdf, in the current folder); "
    "never one of the job's inputs, a folder or a read-only file.",
)
@handle_input_errors
def report_command(job_file, out):
    """Write the submittal-style PDF calculation report of a job.

    The report holds a cover page, the failing and warning checks with the
    page of each calculation sheet, a one-line diagram, the voltage profile
    and fault currents, one calculation sheet per element, the panel
    schedules, methods and assumptions, table provenance and cautions. The job
    file, its schedules and the results are embedded in the PDF, so anyone who
    receives it can re-check it with `feedcheck rerun`. With SOURCE_DATE_EPOCH
    set, the same job and tables give the same bytes.

    \b
    Examples:
      feedcheck report sample_jobs/harbor_kitchen.toml -o harbor_kitchen.pdf
      feedcheck --tables my_tables/ report job.toml -o job-local-tables.pdf
    Exit code 0: written, no failing check; 1: written, a check failed;
    2: the input is invalid (nothing written); 130: interrupted (nothing written).
    """
    from pathlib import Path

    from ..io_atomic import check_output
    from ..render.pdf.report import write_report
    from ..runner import load_and_check

    target = out if out else Path(job_file).stem + ".pdf"
    check_output(target, [job_file])
    job, results = load_and_check(job_file)
    target = Path(target)
    if not target.parent.resolve().is_dir():
        click.echo(f"error: folder {target.parent} does not exist; nothing was written", err=True)
        sys.exit(2)
    check_output(target, job_inputs(job))
    info = write_report(job, results, target)
    counts = results.counts()
    click.echo(
        f"wrote {target} ({info.pages} pages; {counts['fail']} fail, {counts['warn']} warn, "
        f"{counts['ok']} ok, {counts['info']} info)",
        err=True,
    )
    sys.exit(results.exit_code)


@click.command("rerun", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("report_pdf", type=click.Path(exists=True, dir_okay=False))
@handle_input_errors
def rerun_command(report_pdf):
    """Re-check a feedcheck report from the inputs embedded in it.

    Takes the job file and schedules out of the PDF into a temporary folder,
    checks them again with the current tables (the report's own custom tables
    when it carries them, or yours with --tables), and compares every node figure
    and every finding with the results embedded in the report (relative
    tolerance 1e-9). The pages are re-rendered from the re-run and their text
    compared with the report's, page by page: an edited page is named with its
    first differing figure.

    \b
    Examples:
      feedcheck rerun harbor_kitchen.pdf
      feedcheck --tables local_tables/ rerun harbor_kitchen.pdf
    Exit code 0: all figures and pages match; 1: a figure or a page differs;
    2: the file is not a readable feedcheck report (not a regular file, over
    100 MB, embedded files over 60 MB unpacked, duplicate attachment names,
    AES-encrypted, damaged results); 130: interrupted.
    """
    import json
    import tempfile
    from pathlib import Path

    from ..errors import InputError
    from ..io_atomic import interrupts_unwind
    from ..render.display import MISSING
    from ..render.json_csv import render_json
    from ..render.pdf.embed import NotAReport, read_report, write_inputs
    from ..render.pdf.rerun_compare import compare_results, table_changes
    from ..runner import load_and_check

    try:
        embedded = read_report(report_pdf)  # checked whole before any folder is made
    except NotAReport as exc:
        click.echo(f"error: {exc}", err=True)
        sys.exit(2)
    with interrupts_unwind(), tempfile.TemporaryDirectory(prefix="feedcheck-rerun-") as tmp:
        ex = write_inputs(embedded, tmp)
        from ..render.pdf.tables_embed import TablesDamaged, use_embedded_tables

        try:  # custom tables embedded in the report, unless --tables names others
            own = use_embedded_tables(report_pdf, Path(tmp) / "embedded-tables")
        except TablesDamaged as exc:
            click.echo(f"error: {report_pdf}: {exc}", err=True)
            sys.exit(2)
        if own:
            click.echo(f"using the report's own tables: {', '.join(own)}")
        from ..render.pdf.page_check import check_pages, report_calc_date

        try:
            _, results = load_and_check(ex.job_path, report_calc_date(ex.results))
        except InputError as exc:  # name the report, not the temporary folder
            raise _named_in_report(exc, tmp, report_pdf) from None
        rerun = json.loads(render_json(results))
        n_pages, page_diffs = check_pages(report_pdf, results)  # the printed pages too
    job = ex.results.get("job", {})
    click.echo(
        f"report: {job.get('name', '?')} (rev {job.get('revision') or MISSING}), made with "
        f"feedcheck {job.get('feedcheck_version', '?')}; rerun with feedcheck "
        f"{rerun['job'].get('feedcheck_version', '?')}"
    )
    for line in table_changes(ex.results, rerun):
        click.echo(line)
    n, diffs = compare_results(ex.results, rerun)
    _echo_differences(
        diffs,
        f"all {n} figures match",
        f"{len(diffs)} of {n} figures differ (element: figure: report, rerun):",
    )
    _echo_differences(
        page_diffs,
        f"all {n_pages} pages read as the re-run prints them",
        f"{len(page_diffs)} of {n_pages} pages differ from the re-rendered report:",
    )
    sys.exit(1 if diffs or page_diffs else 0)


def _echo_differences(differences: list, none_text: str, heading: str) -> None:
    """``none_text`` when nothing differs, else ``heading`` and one indented line each."""
    if not differences:
        click.echo(none_text)
        return
    click.echo(heading)
    for difference in differences:
        click.echo(f"  {difference}")


def _named_in_report(exc, tmp: str, report_pdf: str):
    """The input error with the temporary folder's paths named as parts of the report."""
    import dataclasses
    import os

    from ..errors import InputError

    def name(file: str) -> str:
        for root in (os.path.realpath(tmp), tmp):
            if file.startswith(root + os.sep):
                return f"{report_pdf}[embedded {os.path.relpath(file, root)}]"
        return file

    return InputError([dataclasses.replace(p, file=name(p.file)) for p in exc.problems])
