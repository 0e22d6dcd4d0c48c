"""Issue 13 item 3 for a panel given by ``load`` (no schedule): the same visible chain on
its calculation sheet (connected → demand factors → largest motor 25 % → continuous
125 %), with the Table 220.12 minimum lighting as a step of it; each step once."""

from __future__ import annotations

import pytest

from feedcheck.runner import run_job
from tests.checks.jobs import job_text


def _steps(write_job, text):
    res = run_job(write_job(text))
    return {s.label: s for s in res.sheets["P"].steps}, res


def test_given_load_chain_by_hand(write_job):
    """40 kVA with 10 kVA continuous: demand 40,000 VA (the job's figure, 100 %); + 25 %
    of the continuous 10,000 VA = 2,500 VA (NFPA 70-2023 215.2(A)(1)); design
    42,500 VA. No motor: the 430.24 step is 0."""
    steps, _ = _steps(write_job, job_text(load_kva=40, continuous_kva=10))
    assert steps["1. Connected load"].result == 40_000
    assert steps["2. After demand factors"].result == 40_000
    assert steps["3. Largest motor"].result == 0
    assert steps["4. Continuous loads"].result == 2_500
    assert steps["Design load"].result == 42_500
    assert "1b. Minimum general lighting load (220.12)" not in steps


def test_design_load_agrees_with_the_design_current(write_job):
    """The chain's design load and the panel's heaviest-phase design current are the
    same figure: 42,500 VA / (√3 · 208 V) = 118.0 A (balanced, IEEE Std 141 ch. 3)."""
    steps, res = _steps(write_job, job_text(load_kva=40, continuous_kva=10))
    node = next(n for n in res.nodes if n.id == "P")
    design_va = steps["Design load"].result
    assert node.values["design_current_a"] == pytest.approx(design_va / (3**0.5 * 208), rel=1e-3)


def test_minimum_lighting_is_a_step_of_the_chain(write_job):
    """Office, 2,000 ft²: 3.5 VA/ft² (NFPA 70-2017 Table 220.12) × 2,000 = 7,000 VA; the
    job's 20 kVA holds no known lighting, so the whole 7,000 VA is added as continuous
    lighting: demand 27,000 VA, + 25 % of (5,000 + 7,000) = 3,000 VA (215.2(A)(1)),
    design 30,000 VA."""
    text = job_text(load_kva=20, continuous_kva=5).replace(
        "power_factor = ", 'occupancy = "office"\narea = "2000 ft2"\npower_factor = '
    )
    steps, res = _steps(write_job, text)
    m = steps["1b. Minimum general lighting load (220.12)"]
    assert m.result == 7_000 and m.rule_id == "lul-office"
    assert steps["2. After demand factors"].result == 27_000
    assert steps["4. Continuous loads"].result == 3_000
    assert steps["Design load"].result == 30_000
    labels = [s.label for s in res.sheets["P"].steps]
    assert labels.index("1. Connected load") < labels.index(m.label)
    assert labels.index(m.label) < labels.index("2. After demand factors")
