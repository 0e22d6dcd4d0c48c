"""Page numbers drawn before their pages (render/pdf/page_refs.py): the report is drawn in
one pass and the numbers of the contents, of the summary's page column and of each
footer's total are filled in at the end. Rendering only: no electrical figure is
checked here."""

from __future__ import annotations

import io
import re

import pytest
from pypdf import PdfReader

from feedcheck.render.pdf.report import render_pdf
from feedcheck.runner import load_and_check
from tests.bench.bench_building import job_text


@pytest.fixture(scope="module")
def building(tmp_path_factory):
    """The generated 12-panel building: warnings on many elements, sheets on many pages."""
    folder = tmp_path_factory.mktemp("b12")
    (folder / "job.toml").write_text(job_text(12, folder), encoding="utf-8")
    _, results = load_and_check(folder / "job.toml")
    data, total, anchors = render_pdf(results)
    pages = [pg.extract_text() or "" for pg in PdfReader(io.BytesIO(data)).pages]
    return results, pages, total, anchors


def test_summary_page_column_names_each_sheets_page(building):
    results, pages, _, anchors = building
    shown = [f for f in results.sorted_findings() if f.status in ("fail", "warn")]
    assert len(shown) > 20  # the comparison bites on many rows, over several pages
    first, last = anchors["findings"], anchors["diagram"]
    summary = " ".join(pages[first - 1 : last - 1])
    cited = re.findall(r"(\S+)\s+(\d+)\s*$", summary, flags=re.M)  # rule id, page
    cited = [c for c in cited if c[0] != "of"]  # (not a footer's "page X of Y")
    expected = sorted((f.rule_id, str(anchors[_anchor(f.subject)])) for f in shown)
    assert sorted(cited) == expected
    for f in shown:  # each page named is the page its sheet or schedule starts on
        head = f.subject.split("/")[0]
        title = (
            f"Panel schedule — {head}"
            if "/" in f.subject
            else f"Calculation sheet — {results.sheets[f.subject].title}"
        )
        assert title in pages[anchors[_anchor(f.subject)] - 1]


def _anchor(subject: str) -> str:
    """A circuit's finding points at its panel's schedule, any other at its sheet."""
    head = subject.split("/")[0]
    return f"sched:{head}" if "/" in subject else f"sheet:{subject}"


def test_footer_total_and_contents_are_the_final_pages(building):
    _, pages, total, anchors = building
    assert total == len(pages) > 50
    for i, pg in enumerate(pages, start=1):
        assert f"page {i} of {total}" in pg
    contents = pages[anchors["contents"] - 1]
    for key in ("findings", "diagram", "sheets", "schedules", "cautions"):
        assert str(anchors[key]) in contents
