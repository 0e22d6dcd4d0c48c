"""The report as a reviewer reads it (issue 15, items 8-10): a contents page whose page
numbers are those the headings land on; a responsibility block with blank fields on the
cover (no approval); schedules in circuit order with continuous, power-factor and
grounding-conductor columns and a totals block; provenance detailed for the tables the
figures were read from. Rendering only: no electrical figure is checked here."""

from __future__ import annotations

import io
import re
from pathlib import Path

import pytest
from pypdf import PdfReader

from feedcheck.render.pdf.report import render_pdf
from feedcheck.runner import load_and_check

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def harbor():
    _, results = load_and_check(ROOT / "sample_jobs" / "harbor_kitchen.toml")
    data, _, pages = render_pdf(results)
    text = [
        re.sub(r"[ \t]+", " ", pg.extract_text() or "") for pg in PdfReader(io.BytesIO(data)).pages
    ]
    return results, text, pages


def test_contents_page_numbers_match_the_headings(harbor):
    _, text, pages = harbor
    contents = text[2]
    assert "Contents" in contents
    for title, key in (
        ("Summary of findings", "findings"),
        ("Table provenance", "tables"),
        ("Calculation sheet — Panel LP1", "sheet:LP1"),
        ("Panel schedule — LP1", "sched:LP1"),
    ):
        page = pages[key]
        assert re.search(re.escape(title) + r"\s*(\(.*?\))?\s*" + str(page) + r"\b", contents), (
            title
        )
        assert title in text[page - 1], (title, page)


def test_cover_carries_a_blank_responsibility_block(harbor):
    _, text, _ = harbor
    cover = text[0]
    for field in ("Reviewed by", "Licence no.", "Date", "Signature"):
        assert field in cover
    flat = " ".join(cover.split())
    assert "approves nothing" in flat
    assert "approved" not in flat.lower()


def test_schedule_in_circuit_order_with_review_columns(harbor):
    results, _, _ = harbor
    from feedcheck.render.pdf.sections import review_order

    sched = results.schedules["LP1"]
    frame = review_order(sched.circuits, sched)
    assert list(frame["circuit"]) == sorted(frame["circuit"])
    assert {"continuous", "pf", "ground"} <= set(frame.columns)
    # the sample schedule: circuit 1 is continuous lighting at pf 0.95 with a 12 AWG Cu EGC
    first = frame.iloc[0]
    assert bool(first["continuous"]) and first["pf"] == 0.95 and first["ground"] == "12 AWG Cu"


def test_schedule_page_shows_the_columns_and_totals(harbor):
    _, text, pages = harbor
    page = text[pages["sched:LP1"] - 1]
    for head in ("Cont", "PF", "EGC", "Panel totals"):
        assert head in page, head


def test_provenance_detailed_only_for_cited_tables(harbor):
    results, text, pages = harbor
    cited = set(results.tables_cited)
    assert "ampacity_raceway" in cited and "conductor_impedance_table9" in cited
    assert "ampacity_free_air" not in cited  # no run of the sample is in free air
    prov = " ".join(text[pages["tables"] - 1 :])
    assert "Other tables in force" in prov
    assert "ampacity_free_air" in prov  # still listed, compactly
