"""Demand-load kernel (feedcheck.calc.demand) against NFPA 70 Article 220 and 430.24."""

from __future__ import annotations

import numpy as np
import pytest

from feedcheck.calc.demand import FULL, KINDS, Tiers, panel_demand, tiered_demand_va

# NFPA 70-2017 220.44 and Table 220.44: first 10 kVA at 100 %, remainder at 50 %
RECEPTACLE = Tiers(np.array([0.0, 10e3]), np.array([10e3, np.inf]), np.array([1.0, 0.5]))
# NFPA 70-2017 Table 220.42, hospitals: first 50,000 VA at 40 %, remainder at 20 %
HOSPITAL = Tiers(np.array([0.0, 50e3]), np.array([50e3, np.inf]), np.array([0.4, 0.2]))


def test_receptacle_tiers_annex_d_example_d3():
    # NFPA 70 Informative Annex D Example D3: 14,400 VA of receptacles → 12,200 VA
    assert float(tiered_demand_va(14_400.0, RECEPTACLE)) == pytest.approx(12_200.0)


def test_hospital_lighting_tiers():
    # NFPA 70-2017 Table 220.42: 80,000 VA → 0.40 × 50,000 + 0.20 × 30,000 = 26,000 VA
    assert float(tiered_demand_va(80e3, HOSPITAL)) == pytest.approx(26_000.0)


def test_tiers_vector_equals_scalar_and_limits():
    s = np.array([0.0, 5e3, 10e3, 14_400.0, 1e6])
    vec = tiered_demand_va(s, RECEPTACLE)
    assert vec == pytest.approx([float(tiered_demand_va(x, RECEPTACLE)) for x in s])
    assert vec[0] == 0.0  # no load, no demand
    assert np.all(np.diff(vec) > 0)  # demand grows with the load
    assert float(tiered_demand_va(7e3, FULL)) == 7e3  # 100 % kinds pass unchanged


def test_largest_motor_at_125_percent_and_panels_apart():
    # NFPA 70-2017 430.24: motors at 100 % plus 25 % of the largest; two panels kept apart
    kind = np.array([KINDS.index("motor")] * 3 + [KINDS.index("receptacle")])
    load = np.array([3e3, 5e3, 4e3, 14_400.0])
    d = panel_demand(
        kind,
        load,
        np.array([False, True, False, False]),
        np.array([0.8, 0.8, 0.9, 1.0]),
        np.array([0, 0, 1, 1]),
        2,
        {"receptacle": RECEPTACLE},
        1.25,
    )
    assert d.demand_va[0] == pytest.approx(3e3 + 5e3 + 0.25 * 5e3)
    assert d.demand_va[1] == pytest.approx(4e3 * 1.25 + 12_200.0)
    assert d.largest_motor_va == pytest.approx([5e3, 4e3])
    assert d.connected_va.sum(axis=1) == pytest.approx([8e3, 18_400.0])
    # the continuous motor counts at its kind's overall factor (9,250 / 8,000)
    assert d.continuous_va[0] == pytest.approx(5e3 * 9_250 / 8_000)
    assert d.continuous_va[1] == 0.0
