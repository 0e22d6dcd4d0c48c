"""Issue 14 item 3: the one-line diagram draws each motor under its panel with its
horsepower and the full-load current used, naming the table it came from."""

from __future__ import annotations

from pathlib import Path

from feedcheck.render.pdf.one_line import one_line_diagrams
from feedcheck.runner import load_and_check

SAMPLES = Path(__file__).resolve().parents[2] / "sample_jobs"


def _strings(drawings):
    return [s.text for d in drawings for s in d.contents if hasattr(s, "text")]


def test_motor_row_under_its_panel_with_hp_and_flc():
    _, results = load_and_check(SAMPLES / "cedar_annex_review.toml")
    texts = _strings(one_line_diagrams(results, width=528))
    head = texts.index("RTU-1 — motor")
    # 15 hp three-phase at 208 V: 46.2 A, NFPA 70 Table 430.250 (2008 copy; 2023 from memory)
    assert "3-phase, 15 hp · FLC 46.2 A (Table 430.250)" in texts[head + 1]
    # the branch device and disconnect as the job gives them (no figure: the job's own words)
    assert texts[head + 2] == "on panel RTU · 125 A inverse time breaker · disconnect 60 A"
    assert "M" in texts  # the motor symbol
    # drawn after its panel's row
    assert texts.index(next(t for t in texts if t.startswith("RTU — panel"))) < head
