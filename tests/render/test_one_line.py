"""The one-line diagram carries the ratings (issue 15, item 7): transformer kVA, %Z and
connection, devices, panel bus, main and interrupting ratings, motors, single-phase
nodes marked, each run's sets, size, grounding conductor and length in the job's unit;
rows wrap and the drawings split so every one fits a page. Rendering only: the figures
are the job's own inputs and the results' node figures."""

from __future__ import annotations

from pathlib import Path

from reportlab.pdfbase.pdfmetrics import stringWidth

from feedcheck.render.pdf.one_line import MAX_DRAWING_H, one_line_diagrams
from feedcheck.runner import load_and_check

ROOT = Path(__file__).resolve().parents[2]


def _text(results) -> str:
    drawings = one_line_diagrams(results, width=528)
    assert all(d.height <= MAX_DRAWING_H + 8 for d in drawings)
    for d in drawings:
        for s in d.contents:
            if hasattr(s, "text"):  # no line runs off the page
                assert s.x + stringWidth(s.text, s.fontName, s.fontSize) <= 528, s.text
    return "\n".join(s.text for d in drawings for s in d.contents if hasattr(s, "text"))


def test_ratings_on_the_diagram():
    _, results = load_and_check(ROOT / "sample_jobs" / "harbor_kitchen.toml")
    text = _text(results)
    for part in (
        "75 kVA",  # the job's transformer rating
        "5.10 % Z",
        "480 V delta → 208Y/120 V",
        "primary device 110 A",
        "secondary device 250 A",
        "bus 225 A",
        "main 225 A",
        "interrupting rating 22.00 kA",
        "300 kcmil Cu + 4 AWG Cu EGC",
        "95 ft (29.0 m)",  # 95 ft = 28.956 m (1 ft = 0.3048 m exactly, NIST SP 811 B.9)
        "device 250 A",
        "available 30.00 kA",
    ):
        assert part in text, part
    assert "duty" in text  # the governing interrupting duty beside the bolted maximum


def test_single_phase_marked_and_metric_lengths():
    _, results = load_and_check(ROOT / "sample_jobs" / "maple_farmhouse.toml")
    text = _text(results)
    assert "(1φ)" in text
    assert "single-phase" in text
    assert "60.0 m (197 ft)" in text  # 60 m = 196.85 ft; the job is written in metres


def test_motors_on_the_diagram():
    _, results = load_and_check(ROOT / "sample_jobs" / "cedar_annex_review.toml")
    text = _text(results)
    assert results.diagram.motors
    for m in results.diagram.motors:
        assert f"{m.id} — motor" in text
    assert "2 sets × 500 kcmil Cu" in text
