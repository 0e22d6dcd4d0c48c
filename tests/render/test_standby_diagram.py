"""Issue 14 item 4: the one-line diagram draws the transfer switch above the panel it
feeds and the standby generator under the switch, with its rating, X"d and its run."""

from __future__ import annotations

from pathlib import Path

from feedcheck.render.pdf.one_line import one_line_diagrams
from feedcheck.render.text import render_text
from feedcheck.runner import load_and_check

SAMPLES = Path(__file__).resolve().parents[2] / "sample_jobs"


def _strings(drawings):
    return [s.text for d in drawings for s in d.contents if hasattr(s, "text")]


def test_switch_and_generator_rows():
    _, results = load_and_check(SAMPLES / "willow_yard_standby.toml")
    texts = _strings(one_line_diagrams(results, width=528))
    switch = texts.index("ATS-1 — transfer switch, 400 A")
    assert texts[switch + 1] == "normal: run SVC · standby: generator GEN-1"
    gen = next(i for i, t in enumerate(texts) if t.startswith("GEN-1 — standby generator, 300 kVA"))
    assert texts[gen + 1].startswith('X"d 14.00 % · Isc at terminals ')
    assert texts[gen + 2].startswith("to ATS-1 by run GEN-1: 500 kcmil Cu")
    assert "G" in texts  # the generator symbol
    panel = next(i for i, t in enumerate(texts) if t.startswith("MDP — panel"))
    assert switch < gen < panel  # the switch above its panel, the generator beside it


def test_terminal_names_the_governing_position():
    _, results = load_and_check(SAMPLES / "willow_yard_standby.toml")
    text = render_text(results)
    assert "source positions" in text
    (mdp,) = [ln for ln in text.splitlines() if ln.startswith("MDP ") and " / " in ln]
    # the utility governs the maximum, the generator the minimum
    assert mdp.count("(normal)") >= 2 and "(standby)" in mdp


def test_job_without_standby_draws_no_switch():
    _, results = load_and_check(SAMPLES / "willow_yard_service.toml")
    texts = _strings(one_line_diagrams(results, width=528))
    assert not any("transfer switch" in t for t in texts)
    assert "source positions" not in render_text(results)
