"""A 100-panel generated job produces its report and reruns clean (issue 15 item 1):
every drawing splits across pages (one-line sheets, fault-current chart parts)."""

from __future__ import annotations

import pytest
from click.testing import CliRunner
from pypdf import PdfReader

from feedcheck.cli import main
from feedcheck.render.pdf.drawing import fault_current_charts, one_line_diagrams
from feedcheck.render.pdf.report import BOTTOM, TOP
from feedcheck.runner import load_and_check

from scale_job import write_scale_job  # beside this file (pytest puts its folder on sys.path)

FRAME_H = 792.0 - TOP - BOTTOM  # letter page body


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


def test_drawings_of_a_large_feed_fit_a_page(tmp_path):
    _, results = load_and_check(write_scale_job(tmp_path, panels=60))
    charts = fault_current_charts(results, width=528)
    sheets = one_line_diagrams(results, width=528)
    assert len(charts) > 1 and len(sheets) > 1
    assert all(d.height < FRAME_H for d in [*charts, *sheets])
    # every node with a figure is in exactly one chart part, on one shared scale
    assert sum(len([s for s in c.contents if getattr(s, "fontSize", 0) == 7.5]) for c in charts) == (
        sum("fault_max_a" in n.values or "fault_min_a" in n.values for n in results.nodes)
    )


@pytest.mark.slow
def test_100_panel_job_reports_and_reruns_clean(tmp_path):
    job = write_scale_job(tmp_path, panels=100)
    pdf = tmp_path / "tower.pdf"
    r = _run("report", job, "-o", pdf)
    assert r.exit_code in (0, 1), r.output  # written (the generated job has failing checks)
    text = "\n".join(p.extract_text() for p in PdfReader(str(pdf)).pages[:60])
    assert "One-line diagram, sheet 7 of 7" in text
    assert "Fault current at each node (continued" in text
    r = _run("rerun", pdf)
    assert r.exit_code == 0, r.output
    assert "figures match" in r.stdout and "pages read as the re-run prints them" in r.stdout
