"""Trust between revisions: custom tables travel with the report (issue 15 item 12),
rerun vouches for the printed pages (item 13)."""

from __future__ import annotations

import copy

import pytest
from click.testing import CliRunner

from feedcheck.cli import main
from feedcheck.render.json_csv import render_json
from feedcheck.render.pdf.embed import RESULTS_NAME, attach, input_attachments
from feedcheck.render.pdf.page_check import compare_pages, page_texts
from feedcheck.render.pdf.report import render_pdf
from feedcheck.render.pdf.tables_embed import read_attachment_map
from feedcheck.runner import load_and_check
from feedcheck.tables import set_user_tables_dir


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


@pytest.fixture(autouse=True)
def _reset_tables():
    yield
    set_user_tables_dir(None)


def _local_xr_tables(root, folder):
    """A copy of the typical transformer X/R table with the 25 kVA row moved halfway
    to the next row (a user's own table: values are ours, only the mechanism is tested)."""
    lines = (root / "tables" / "transformer_xr.csv").read_text().splitlines(keepends=True)
    i = next(k for k, ln in enumerate(lines) if ln.startswith("25,"))
    here, nxt = float(lines[i].split(",")[1]), float(lines[i + 1].split(",")[1])
    lines[i] = f"25,{(here + nxt) / 2:g}\n"
    folder.mkdir()
    (folder / "transformer_xr.csv").write_text("".join(lines))
    return folder


def test_custom_tables_travel_with_the_report(tmp_path, request):
    root = request.config.rootpath
    local = _local_xr_tables(root, tmp_path / "local")
    pdf = tmp_path / "maple-local.pdf"
    r = _run("--tables", local, "report", root / "sample_jobs" / "maple_farmhouse.toml", "-o", pdf)
    assert r.exit_code in (0, 1), r.output
    att = read_attachment_map(pdf)
    assert att["tables/transformer_xr.csv"] == (local / "transformer_xr.csv").read_bytes()
    set_user_tables_dir(None)
    # another machine: no --tables given, the report's own table is used
    r = _run("rerun", pdf)
    assert r.exit_code == 0, r.output
    assert "using the report's own tables: transformer_xr" in r.stdout
    assert "figures match" in r.stdout and "differ" not in r.stdout


def test_shipped_tables_report_embeds_none(tmp_path, request):
    pdf = tmp_path / "maple.pdf"
    r = _run("report", request.config.rootpath / "sample_jobs" / "maple_farmhouse.toml", "-o", pdf)
    assert r.exit_code in (0, 1), r.output
    assert not [n for n in read_attachment_map(pdf) if n.startswith("tables/")]


def test_edited_page_is_named_by_rerun(tmp_path, request):
    """A report whose printed figure was altered after it was made, while the
    embedded inputs and results are the genuine ones: the figures still match,
    the pages do not, and the page names the altered figure."""
    job_path = request.config.rootpath / "sample_jobs" / "maple_farmhouse.toml"
    job, results = load_and_check(job_path)
    forged = copy.deepcopy(results)
    node = next(n for n in forged.nodes if n.kind == "panel" and "fault_max_a" in n.values)
    node.values["fault_max_a"] += 3000.0  # as if 6,009 A had been edited to 9,009 A
    data, _, _ = render_pdf(forged)
    files = [*input_attachments(job), (RESULTS_NAME, render_json(results).encode("utf-8"))]
    pdf = tmp_path / "edited.pdf"
    pdf.write_bytes(attach(data, files))
    r = _run("rerun", pdf)
    assert r.exit_code == 1, r.output
    assert "figures match" in r.stdout  # the embedded results are untouched ...
    assert "pages differ from the re-rendered report" in r.stdout  # ... the pages are not
    line = next(ln for ln in r.stdout.splitlines() if ln.strip().startswith("page "))
    assert "first differing figure" in line
    genuine = page_texts(render_pdf(results)[0])
    diffs = compare_pages(page_texts(pdf), genuine)
    assert diffs and all(d.report_word != d.rerun_word for d in diffs)


def test_genuine_report_pages_match(tmp_path, request):
    pdf = tmp_path / "maple.pdf"
    r = _run("report", request.config.rootpath / "sample_jobs" / "maple_farmhouse.toml", "-o", pdf)
    assert r.exit_code in (0, 1), r.output
    r = _run("rerun", pdf)
    assert r.exit_code == 0, r.output
    assert "pages read as the re-run prints them" in r.stdout
