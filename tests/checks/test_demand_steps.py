"""The demand chain's printed steps state the factors the rule book gave, not a copy of
1.25 in the code (a --tables override of df-motor-largest / df-continuous must show)."""

from __future__ import annotations

from types import SimpleNamespace

import pytest

from feedcheck.calc.demand_chain import demand_chain
from feedcheck.checks.demand_sheet import demand_chain_steps


class _Sheet:
    def __init__(self):
        self.steps = []

    def step(self, label, method, working, value, unit, rule_id=""):
        self.steps.append((label, method, working, value, unit))


def _steps(motor_factor, continuous_factor):
    # invented panel: 10,000 VA continuous lighting and one 8,000 VA motor
    chain = demand_chain(
        {"lighting": 10_000.0, "motor": 8_000.0},
        {"lighting": 10_000.0},
        8_000.0,
        largest_motor_factor=motor_factor,
        continuous_factor=continuous_factor,
    )
    sheet = _Sheet()
    ctx = SimpleNamespace(chains={"P": chain}, lighting_minimum=[])
    demand_chain_steps(ctx, SimpleNamespace(id="P"), sheet)
    return {label: (method, working, value) for label, method, working, value, _ in sheet.steps}


def test_default_factors_read_as_before():
    # NFPA 70-2023 430.24 and 215.2(A)(1): 125 % → an adder of 25 %
    steps = _steps(1.25, 1.25)
    assert steps["3. Largest motor"] == (
        "+ 25 % of the largest motor (430.24), once",
        "0.25 × 8,000",
        2000,
    )
    assert steps["4. Continuous loads"][1:] == ("0.25 × 10,000", 2500)


@pytest.mark.parametrize(("motor", "continuous"), [(1.3, 1.2), (1.5, 1.1)])
def test_overridden_factors_are_the_ones_printed(motor, continuous):
    steps = _steps(motor, continuous)
    method, working, value = steps["3. Largest motor"]
    assert method.startswith(f"+ {round((motor - 1) * 100)} % of the largest motor")
    assert working == f"{round(motor - 1, 6):g} × 8,000"
    assert value == round((motor - 1) * 8_000)
    method, working, value = steps["4. Continuous loads"]
    assert method.startswith(f"+ {round((continuous - 1) * 100)} % of the continuous")
    assert working == f"{round(continuous - 1, 6):g} × 10,000"
    assert value == round((continuous - 1) * 10_000)
