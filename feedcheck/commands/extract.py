"""``feedcheck extract``: take a report's job back out, ready to edit and re-check."""

from __future__ import annotations

import sys

import click

from .. import CAUTION
from .errors import handle_input_errors
from .params import CONTEXT


@click.command("extract", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("report_pdf", type=click.Path(exists=True, dir_okay=False))
@click.argument("folder", type=click.Path(file_okay=False))
@click.option("--force", is_flag=True, help="Overwrite files that already exist in FOLDER.")
@handle_input_errors
def extract_command(report_pdf, folder, force):
    """Write the job, schedules and custom tables embedded in a report into FOLDER.

    The job file and its schedules keep their names and relative paths; custom
    tables the report was made with (--tables) go to FOLDER/tables/. Nothing is
    written outside FOLDER, and an existing file is never replaced unless
    --force is given. FOLDER is created when its parent exists.

    \b
    Example:
      feedcheck extract harbor_kitchen.pdf rev_b/
      feedcheck --tables rev_b/tables check rev_b/harbor_kitchen.toml
    Exit code 0: written; 2: not a readable feedcheck report, or a file
    would be overwritten (nothing written).
    """
    import shutil
    import tempfile
    from pathlib import Path

    from ..render.pdf.embed import NotAReport, extract_inputs
    from ..render.pdf.tables_embed import (
        TablesDamaged,
        embedded_tables,
        read_attachment_map,
        write_tables,
    )

    dest = Path(folder)
    if not dest.resolve().parent.is_dir():
        click.echo(
            f"error: {folder}: its parent folder does not exist; nothing was written", err=True
        )
        sys.exit(2)
    with tempfile.TemporaryDirectory(prefix="feedcheck-extract-") as tmp:
        stage = Path(tmp) / "out"
        try:
            ex = extract_inputs(report_pdf, stage)
            tables = embedded_tables(read_attachment_map(report_pdf))
        except (NotAReport, TablesDamaged) as exc:
            click.echo(f"error: {report_pdf}: {exc}; nothing was written", err=True)
            sys.exit(2)
        if tables:
            write_tables(tables, stage / "tables")
        files = sorted(p.relative_to(stage) for p in stage.rglob("*") if p.is_file())
        clash = [str(dest / rel) for rel in files if (dest / rel).exists()]
        if clash and not force:
            more = f" (and {len(clash) - 1} more)" if len(clash) > 1 else ""
            click.echo(
                f"error: {clash[0]} exists{more}; use --force to overwrite; nothing was written",
                err=True,
            )
            sys.exit(2)
        bad = [
            dest / rel
            for rel in files
            if (dest / rel).is_dir() or not (dest / rel).resolve().is_relative_to(dest.resolve())
        ]
        if bad:  # a folder in the way, or a link leading outside FOLDER
            click.echo(f"error: {bad[0]}: cannot write there; nothing was written", err=True)
            sys.exit(2)
        for rel in files:
            target = dest / rel
            target.parent.mkdir(parents=True, exist_ok=True)
            shutil.copyfile(stage / rel, target)
        job_rel = ex.job_path.relative_to(stage.resolve())
    for rel in files:
        click.echo(f"wrote {dest / rel}")
    tables_opt = f"--tables {dest / 'tables'} " if tables else ""
    click.echo(f"re-check with: feedcheck {tables_opt}check {dest / job_rel}", err=True)
    sys.exit(0)
