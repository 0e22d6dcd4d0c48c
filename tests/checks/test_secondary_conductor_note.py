"""The 240.21(C) secondary-conductor finding explains its limit with the figures it used
(issue 11, bug 2: it printed "required 60 A (primary device 40 A × 2.00 ratio)")."""

from __future__ import annotations

import re

import pytest

from feedcheck.runner import run_job
from tests.test_transformer_checks import JOB

NUMBER = r"([0-9][0-9,]*(?:\.[0-9]+)?)"


def _finding(write_job, pdev, length, cond, main):
    text = JOB.format(pdev=pdev, sdev="", length=length, cond=cond, sets=1, rdev="", main=main)
    res = run_job(write_job(text))
    return next(f for f in res.findings if f.check.startswith("secondary conductors ("))


def _explained(note):
    m = re.search(
        rf"primary device {NUMBER} A × voltage ratio {NUMBER} ÷ {NUMBER} = {NUMBER} A", note
    )
    assert m, note
    return [float(g.replace(",", "")) for g in m.groups()]


@pytest.mark.parametrize(
    ("pdev", "length", "cond", "main", "divisor"),
    [
        # NFPA 70-2023 240.21(C)(2)(1)(b): 10 ft, 1/10 of primary device × voltage ratio
        ("225 A", "8 ft", "4/0 AWG Cu", "200 A", 10.0),
        # NFPA 70-2023 240.21(C)(6)(1): 25 ft, 1/3 of primary device × voltage ratio
        ("225 A", "20 ft", "2 AWG Cu", "100 A", 3.0),
    ],
)
def test_note_figures_multiply_out(write_job, pdev, length, cond, main, divisor):
    f = _finding(write_job, pdev, length, cond, main)
    primary, ratio, div, result = _explained(f.note)
    assert primary == pytest.approx(225.0)
    assert ratio == pytest.approx(480 / 208, abs=5e-4)  # primary / secondary line voltage
    assert div == divisor
    assert primary * ratio / div == pytest.approx(result, abs=0.1)
    required = float(re.search(rf"required {NUMBER} A", f.note).group(1))
    assert required == pytest.approx(f.limit, abs=0.5)


def test_ten_foot_note_names_the_larger_of_ratio_and_end_device(write_job):
    # 240.21(C)(2)(1)(a) and (b): the larger of the end device (200 A) and the ratio figure
    f = _finding(write_job, "100 A", "8 ft", "4/0 AWG Cu", "200 A")
    assert "the larger of" in f.note and "end device 200 A" in f.note
    primary, ratio, div, result = _explained(f.note)
    assert primary * ratio / div == pytest.approx(result, abs=0.1)
    assert f.limit == pytest.approx(max(result, 200.0))
    # the old note said "× 2.31 ratio" for a limit it did not multiply out to
    assert not re.search(r"× [0-9.]+ ratio\)", f.note)
