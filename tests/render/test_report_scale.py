"""A 100-panel generated job produces its report and reruns clean (issue 15 item 1):
every drawing splits across pages (one-line sheets, fault-current chart parts)."""

from __future__ import annotations

import re

import pytest
from click.testing import CliRunner
from pypdf import PdfReader
from scale_job import write_scale_job  # beside this file (pytest puts its folder on sys.path)

from feedcheck.cli import main
from feedcheck.render.pdf.drawing import fault_current_charts, voltage_profile_charts
from feedcheck.render.pdf.one_line import one_line_diagrams
from feedcheck.render.pdf.report import BOTTOM, TOP
from feedcheck.runner import load_and_check

FRAME_H = 792.0 - TOP - BOTTOM  # letter page body


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


def test_drawings_of_a_large_feed_fit_a_page(tmp_path):
    _, results = load_and_check(write_scale_job(tmp_path, panels=60))
    charts = fault_current_charts(results, width=528)
    sheets = one_line_diagrams(results, width=528)
    assert len(charts) > 1 and len(sheets) > 1
    profiles = voltage_profile_charts(results, width=528)
    assert len(profiles) > 1
    assert all(d.height < FRAME_H for d in [*charts, *sheets, *profiles])
    # each node with a voltage is labelled in some profile part, each part legibly few
    labelled = [
        {s.text.split()[0] for s in d.contents if getattr(s, "fontSize", 0) == 6.5}
        for d in profiles
    ]
    assert all(len(ids) <= 16 for ids in labelled)
    assert set().union(*labelled) == {
        n.id for n in results.nodes if n.values.get("voltage_pct") is not None
    }
    # every node with a figure is in exactly one chart part, on one shared scale
    rows = sum(len([s for s in c.contents if getattr(s, "fontSize", 0) == 7.5]) for c in charts)
    with_figures = [n for n in results.nodes if {"fault_max_a", "fault_min_a"} & set(n.values)]
    assert rows == len(with_figures)


@pytest.mark.slow
def test_100_panel_job_reports_and_reruns_clean(tmp_path):
    job = write_scale_job(tmp_path, panels=100)
    pdf = tmp_path / "tower.pdf"
    r = _run("report", job, "-o", pdf)
    assert r.exit_code in (0, 1), r.output  # written (the generated job has failing checks)
    text = "\n".join(p.extract_text() for p in PdfReader(str(pdf)).pages[:60])
    last = re.findall(r"One-line diagram, sheet (\d+) of (\d+)", text)
    assert last and last[-1][0] == last[-1][1] and int(last[-1][1]) >= 7  # 16 rows at most each
    assert "Fault current at each node (continued" in text
    r = _run("rerun", pdf)
    assert r.exit_code == 0, r.output
    assert "figures match" in r.stdout and "pages read as the re-run prints them" in r.stdout
