"""The PDF calculation report: content, page numbering, diagram, schedules,
reproducible bytes, embedded inputs.

These tests check rendering, not electrical computation: the figures the
report must show are recomputed here from their published formula (source
beside each) and looked for in the PDF text.
"""

from __future__ import annotations

import io
import math
import re
import shutil
import subprocess
from types import SimpleNamespace

import pandas as pd
import pytest
from pypdf import PdfReader

from feedcheck import CAUTION
from feedcheck.render import display
from feedcheck.render.pdf import sections as sx
from feedcheck.render.pdf.embed import MANIFEST_NAME, RESULTS_NAME
from feedcheck.render.pdf.report import render_pdf, write_report
from feedcheck.runner import load_and_check


def _text(reader: PdfReader) -> list[str]:
    return [re.sub(r"\s+", " ", pg.extract_text() or "") for pg in reader.pages]


@pytest.fixture(scope="module")
def harbor(tmp_path_factory, request):
    root = request.config.rootpath
    job, results = load_and_check(root / "sample_jobs" / "harbor_kitchen.toml")
    out = tmp_path_factory.mktemp("rep") / "harbor.pdf"
    info = write_report(job, results, out)
    reader = PdfReader(str(out))
    return SimpleNamespace(
        job=job, results=results, path=out, info=info, reader=reader, pages=_text(reader)
    )


def test_key_figures_in_text(harbor):
    text = " ".join(harbor.pages)
    # IEEE Std 141-1993 ch. 4: I = S / (√3 · V_LL); 75 kVA at 208 V → 208.2 A, at 480 V → 90.2 A
    assert f"{75_000 / (math.sqrt(3) * 208):.1f}" in text
    assert f"{75_000 / (math.sqrt(3) * 480):.1f}" in text
    for word in (
        "Harbor Street community kitchen",
        "Summary of findings",
        "One-line diagram",
        "Calculation sheet",
        "Methods and assumptions",
        "Table provenance",
        "Cautions",
    ):
        assert word in text, word


def test_cautions_present(harbor):
    text = " ".join(harbor.pages)
    assert re.sub(r"\s+", " ", CAUTION) in text
    assert "does not cover the safety of the work on site" in text
    assert all("licensed electrician or engineer must review" in pg for pg in harbor.pages)


def test_every_page_has_header_and_page_x_of_y(harbor):
    n = len(harbor.reader.pages)
    assert n == harbor.info.pages
    for i, pg in enumerate(harbor.pages, start=1):
        assert f"page {i} of {n}" in pg
        assert "rev B" in pg and "Harbor Street" in pg


def test_sheet_pages_point_at_their_sheets(harbor):
    for eid, page in harbor.info.sheet_pages.items():
        title = harbor.results.sheets[eid].title
        assert f"Calculation sheet — {title}" in harbor.pages[page - 1]
    # the summary cites, for each failing/warning finding, its sheet's page
    summary = harbor.pages[harbor.info.anchors["findings"] - 1]  # (the contents names it too)
    assert "Summary of findings" in summary
    for f in harbor.results.findings:
        if f.status in ("fail", "warn") and f.subject in harbor.info.sheet_pages:
            assert f.rule_id in summary
    outline = [o.title for o in harbor.reader.outline if not isinstance(o, list)]
    assert "Summary of findings" in outline and "Cautions" in outline


def test_cover_has_counts_tables_and_version(harbor):
    cover = harbor.pages[0]
    c = harbor.results.counts()
    # the list of tables may run onto the next page; it ends before the findings
    front = " ".join(harbor.pages[: harbor.info.anchors["findings"] - 1])
    for word, key in (("FAIL", "fail"), ("WARN", "warn"), ("OK", "ok"), ("INFO", "info")):
        assert f"{word}: {c[key]}" in cover
    for t in harbor.results.tables:
        assert t["name"] in front and t["sha256"][:16] in front
    assert "feedcheck 0.1.0" in cover


def test_inputs_and_results_are_embedded(harbor):
    att = harbor.reader.attachments
    assert {MANIFEST_NAME, RESULTS_NAME, "inputs/harbor_kitchen.toml"} <= set(att)
    assert att["inputs/harbor_kitchen.toml"][0] == harbor.job.path.read_bytes()


def test_same_bytes_twice(harbor, tmp_path, monkeypatch):
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "1764547200")
    a, b = tmp_path / "a.pdf", tmp_path / "b.pdf"
    write_report(harbor.job, harbor.results, a)
    write_report(harbor.job, harbor.results, b)
    assert a.read_bytes() == b.read_bytes()
    meta = PdfReader(str(a)).metadata
    assert meta.creation_date.year == 2025 and meta.creation_date.month == 12  # the fixed epoch
    assert not list(tmp_path.glob(".*.part"))  # atomic write left no temporary file


@pytest.mark.skipif(shutil.which("pdftoppm") is None, reason="pdftoppm (poppler-utils) missing")
def test_page_one_renders(harbor, tmp_path):
    subprocess.run(
        [
            "pdftoppm",
            "-png",
            "-r",
            "40",
            "-f",
            "1",
            "-l",
            "1",
            str(harbor.path),
            str(tmp_path / "pg"),
        ],
        check=True,
        capture_output=True,
        timeout=60,
    )
    (png,) = tmp_path.glob("pg*.png")
    data = png.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n" and len(data) > 5_000


TWELVE = """
[project]
name = "Twelve-panel test feed (generated)"
revision = "T"
[source]
voltage = "480 V delta"
phases = 3
available_fault = "40 kA"
x_r = 8
[[transformer]]
id = "T1"
rating = "300 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5.5 %"
x_r = 5
primary_device = "450 A"
"""


def _twelve_panel_job() -> str:
    parts = [TWELVE]
    for i in range(1, 13):
        src = "T1" if i % 3 == 1 else f"P{i - 1:02d}"
        parts.append(
            f'[[run]]\nid = "R{i:02d}"\nfrom = "{src}"\nto = "P{i:02d}"\n'
            f'length = "{20 + 5 * i} m"\nconductors = "2 AWG Cu"\ninsulation = "75 degC"\n'
            'raceway = "pvc"\nambient = "30 degC"\ncurrent_carrying = 3\n'
            'ground = "8 AWG Cu"\ndevice = "100 A"\n'
        )
        parts.append(
            f'[[panel]]\nid = "P{i:02d}"\nrating = "100 A"\nmain_device = "100 A"\n'
            f'interrupting = "10 kA"\nload = "{5 + i} kVA"\npower_factor = 0.9\n'
        )
    return "\n".join(parts)


def test_twelve_panel_diagram_on_one_page(write_job, tmp_path):
    _, results = load_and_check(write_job(_twelve_panel_job(), "twelve.toml"))
    data, pages, anchors = render_pdf(results)
    reader = PdfReader(io.BytesIO(data))
    page = _text(reader)[anchors["diagram"] - 1]
    for i in range(1, 13):
        assert f"P{i:02d} — panel" in page  # every panel labelled on the diagram page
    assert pages == len(reader.pages)


def _schedule():
    circuits = pd.DataFrame(
        {
            "circuit": [1, 2, 3],
            "description": ["Walk-in cooler", "Receptacles", "Hood lights"],
            "load_va": [1800.0, 1440.0, 600.0],
            "breaker_a": [20, 20, 15],
            "vdrop_pct": [1.2, 3.6, 0.4],
            "status": ["ok", "fail", "warn"],
            "reason": ["", "drop over the branch limit", "check the wire size"],
            "spare_capacity_pct": [10.0, 0.0, 5.0],  # a column this renderer does not know
        }
    )
    return SimpleNamespace(circuits=circuits, totals={"connected load VA": 3840.0})


def test_schedule_table_marks_flags_with_words():
    from reportlab.platypus import SimpleDocTemplate

    buf = io.BytesIO()
    SimpleDocTemplate(buf, invariant=1).build(
        sx.schedule_section("LP1", _schedule(), _plain_heading)
    )
    text = _text(PdfReader(buf))[0]
    assert "FAIL" in text and "WARN" in text
    assert "Walk-in cooler" in text and "Spare capacity" in text and "3,840" in text


def _plain_heading(text, key, level, style):
    return sx.p(text, style)


def test_new_keys_and_schedules_render_generically(harbor):
    import copy

    results = copy.deepcopy(harbor.results)
    results.nodes[-1].values["widget_margin_pct"] = 12.5
    results.schedules = {"LP1": _schedule()}
    data, _, anchors = render_pdf(results)
    pages = _text(PdfReader(io.BytesIO(data)))
    assert any("Widget margin" in pg for pg in pages)
    sched = pages[anchors["sched:LP1"] - 1]
    assert "Panel schedule — LP1" in sched and "FAIL" in sched


def test_node_figure_labels():
    assert display.node_figure("fault_max_a", 12_345.0) == (
        "Fault current, maximum",
        "12.35",
        "kA",
    )
    assert display.node_figure("new_thing_ohm", 0.0123) == ("New thing", "0.0123", "Ω")
    assert display.number(float("inf")) == "unlimited" and display.number(None) == "–"
    assert display.number(30_000.0) == "30,000"


def test_pages_come_from_the_results_alone(harbor, monkeypatch):
    """No table or job file is read while the pages are drawn: provenance, the job's
    fingerprint and the feed's runs all come from the results."""
    import copy

    def no_disk(*a, **k):
        raise AssertionError("the PDF renderer read a table or the job file")

    monkeypatch.setattr("feedcheck.tables.load_table", no_disk)
    monkeypatch.setattr("feedcheck.tables.read_table_file", no_disk)
    results = copy.deepcopy(harbor.results)
    results.length_unit = "ft"
    data, _, anchors = render_pdf(results)
    pages = _text(PdfReader(io.BytesIO(data)))
    text = " ".join(pages)
    assert results.job_sha256[:16] in pages[0]
    assert "distance from the source (ft)" in text and "Len ft" in text
    # the one-line diagram gives each run's length in the display unit first
    # (1 ft = 0.3048 m exactly: international foot, 1959 yard and pound agreement)
    run = results.diagram.runs[0]
    diagram = pages[anchors["diagram"] - 1]
    assert f"{run.length_m / 0.3048:,.0f} ft ({run.length_m:,.1f} m)" in diagram
