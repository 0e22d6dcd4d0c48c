"""Fault-current kernels against published formulas, examples and tables.

Each test names its source in the docstring and beside the values it uses.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from feedcheck.calc import fault as F
from feedcheck.calc import fault_lg as G
from feedcheck.calc import point_to_point as PTP
from feedcheck.calc.transformer import rated_current_a, transformer_impedance_ohm


@pytest.mark.parametrize(
    ("kva", "v", "z_pct", "x_r"),
    [
        (75.0, 208.0, 5.1, 3.5),
        (300.0, 208.0, 2.0, 4.0),
        (500.0, 480.0, 5.75, 4.8),
        (15.0, 208.0, 3.2, 1.0),
    ],
)
def test_infinite_bus_three_phase(kva, v, z_pct, x_r):
    """Infinite-bus fault I·100/%Z (IEEE Std 141-1993 ch. 4):
    the ohmic method with zero source impedance must reproduce it for any X/R."""
    i_rated = kva * 1e3 / (math.sqrt(3) * v)  # I = S/(√3·V_LL), IEEE Std 141-1993 ch. 4
    zt = transformer_impedance_ohm(kva * 1e3, v, z_pct, x_r)
    got = F.fault_current_3ph_a(v, F.source_impedance_ohm(v, math.inf, 6.0) + zt)
    assert got == pytest.approx(i_rated * 100.0 / z_pct, rel=1e-12)


def test_infinite_bus_single_phase():
    """Single-phase: I = S/V and infinite-bus I·100/%Z (IEEE Std 141-1993 ch. 4)."""
    zt = transformer_impedance_ohm(25e3, 240.0, 2.4, 1.2, phases=1)
    got = F.fault_current_1ph_a(240.0, zt)
    assert got == pytest.approx(25e3 / 240.0 * 100.0 / 2.4, rel=1e-12)


def test_point_to_point_published_example():
    """Cooper Bussmann, Electrical Plan Review (2005), Part II point-to-point example, Fault #1:
    300 kVA, 2 %Z, 208Y/120 V, infinite primary: rated 833 A; multiplier 100/(0.9×2) = 55.55;
    46,273 A at the secondary; 20 ft of 2 sets 500 kcmil Cu in steel, C = 22,185:
    f = 0.174, M = 0.852, 39,425 A. C is passed directly (the publisher's own data)."""
    rated = rated_current_a(300e3, 208.0)
    assert rated == pytest.approx(833.0, abs=0.5)  # published, rounded to 1 A
    start = PTP.ptp_secondary_current_a(rated, 2.0, tolerance_pct=10.0)
    assert start == pytest.approx(46_273.0, rel=5e-4)  # published used 833 A × 55.55
    f = PTP.ptp_factor(20 * 0.3048, 46_273.0, 22_185.0, 2, 208.0, "3ph")
    assert f == pytest.approx(0.174, abs=5e-4)  # published to 3 decimals
    assert 1.0 / (1.0 + f) == pytest.approx(0.852, abs=5e-4)
    end = PTP.ptp_chain_a(46_273.0, [20 * 0.3048], [22_185.0], [2], 208.0)
    assert end[0] == pytest.approx(39_425.0, rel=1e-3)  # published from rounded M


def test_conductor_constant_from_table9():
    """C = 1000/|Z per 1000 ft| (conductor constant of the point-to-point method, Cooper
    Bussmann, Electrical Plan Review, 2005, Part II) with NFPA 70-2023 Ch. 9 Table 9,
    250 kcmil Cu in steel: R 0.054, XL 0.052 Ω/kft."""
    c = PTP.conductor_constant_a_ft_per_v(0.054 / 304.8, 0.052 / 304.8)
    assert c == pytest.approx(1000.0 / math.hypot(0.054, 0.052), rel=1e-12)
    assert c == pytest.approx(13_339, abs=1)


@pytest.mark.parametrize("x_r", [0.5, 1.0, 3.5, 8.0, 20.0])
def test_line_to_ground_equals_three_phase_when_z0_equals_z1(x_r):
    """Symmetrical components (IEEE Std 141 ch. 4; IEC 60909-0 7.1.3): a bolted
    line-to-ground fault at a delta–wye secondary with Z0 = Z1 (infinite source) carries
    3·V_LN/|3·Z1| = V_LL/(√3·|Z1|), the three-phase current."""
    zt = transformer_impedance_ohm(112.5e3, 208.0, 4.5, x_r)
    v_ln = 208.0 / math.sqrt(3)
    i_lg = G.fault_current_lg_a(v_ln, zt, G.transformer_zero_sequence_ohm(zt, 1.0))
    assert i_lg == pytest.approx(F.fault_current_3ph_a(208.0, zt), rel=1e-12)


def test_line_to_ground_run_is_loop_form():
    """Run with one return conductor: Z0 = Z_phase + 3·Z_ret makes I_LG = V_LN /
    |Z_T + Z_phase + Z_ret| when Z0_T = Z1_T (IEEE Std 141 ch. 4 sequence networks;
    IEEE Std 242 ch. 8 loop model)."""
    zt = 0.0086 + 0.030j
    zp, zr = 0.0058 + 0.0047j, 0.0290 + 0.0055j
    i = G.fault_current_lg_a(120.0, zt + zp, zt + G.run_zero_sequence_ohm(zp, zr))
    assert i == pytest.approx(120.0 / abs(zt + zp + zr), rel=1e-12)


def test_kappa_iec60909_formula_and_limits():
    """IEC 60909-0:2016 8.1: κ = 1.02 + 0.98·e^(−3R/X); κ → 2 as R/X → 0 and → 1.02 as
    R/X grows."""
    for r_x in (0.05, 0.1, 0.3, 0.5, 1.0):
        assert F.peak_factor_kappa(1.0 / r_x) == pytest.approx(
            1.02 + 0.98 * math.exp(-3.0 * r_x), rel=1e-12
        )
    assert F.peak_factor_kappa(math.inf) == pytest.approx(2.0)
    assert F.peak_factor_kappa(1e6) == pytest.approx(2.0, abs=1e-5)
    assert F.peak_factor_kappa(1e-3) == pytest.approx(1.02, abs=1e-12)
    assert F.peak_current_a(10e3, 10.0) == pytest.approx(
        (1.02 + 0.98 * math.exp(-0.3)) * math.sqrt(2) * 10e3
    )


def test_asymmetric_half_cycle():
    """Half-cycle asymmetrical RMS I·√(1 + 2·e^(−2π/(X/R))) (IEEE Std 141 ch. 4, DC decay with
    time constant X/(ωR)); limits I (X/R → 0) and √3·I (X/R → ∞). At 20 % power factor
    (X/R 4.9) the low-voltage half-cycle RMS multiplier is 1.25 (# from memory)."""
    assert F.asymmetric_rms_half_cycle_a(1000.0, math.inf) == pytest.approx(math.sqrt(3) * 1e3)
    assert F.asymmetric_rms_half_cycle_a(1000.0, 1e-3) == pytest.approx(1000.0)
    xr = math.tan(math.acos(0.20))
    assert F.asymmetric_rms_half_cycle_a(1.0, xr) == pytest.approx(1.25, abs=0.005)


def test_dc_offset_simulated():
    """Cross-method: the half-cycle form equals √(I_ac² + i_dc(t)²) with i_dc read off a
    simulated worst-case fault current i(t) = √2·I·[sin(ωt − θ) + sin θ·e^(−ωt/(X/R))],
    θ = atan(X/R), at t = ½ cycle (IEEE Std 141 ch. 4)."""
    xr = 3.5
    theta = math.atan(xr)
    wt = math.pi
    ac = math.sqrt(2) * math.sin(wt - theta)
    total = ac + math.sqrt(2) * math.sin(theta) * math.exp(-wt / xr)
    dc = total - ac
    expected = math.sqrt(1 + dc**2 / math.sin(theta) ** 2)  # full offset: sin θ → 1
    assert F.asymmetric_rms_half_cycle_a(1.0, xr) == pytest.approx(expected, rel=1e-12)


def test_assumption_table_cells():
    """tables/fault_assumptions.csv spot-check: IEEE Std C57.12.00-2021 cl. 9 ±7.5 %; ±10 %
    for dry-type (common practice, no source); IEC 60909-0:2016 Table 1 c_max 1.05/1.10,
    c_min 0.95; 4 × FLC motor
    multiple (# common practice, no source)."""
    from feedcheck.tables import rule

    assert float(rule("fault_assumptions", "fault-z-tolerance")["value"]) == 7.5
    assert float(rule("fault_assumptions", "fault-z-tolerance-alt")["value"]) == 10.0
    assert float(rule("fault_assumptions", "fault-c-max-6pct")["value"]) == 1.05
    assert float(rule("fault_assumptions", "fault-c-max-10pct")["value"]) == 1.10
    assert float(rule("fault_assumptions", "fault-c-min")["value"]) == 0.95
    assert float(rule("fault_assumptions", "fault-motor-multiple")["value"]) == 4.0
    assert float(rule("fault_assumptions", "fault-split-ln-multiplier")["value"]) == 1.5


def test_split_phase_terminals():
    """120/240 V centre-tapped secondary at the terminals: line-to-line I = V_LL/|Z_T|
    = I_rated·100/%Z (IEEE Std 141-1993 ch. 4); line-to-neutral ≈ 1.5 × line-to-line
    (# common practice, no source)."""
    zt = transformer_impedance_ohm(50e3, 240.0, 2.0, 1.6, phases=1)
    zll, zln = F.split_phase_source_ohm(zt, 1.5)
    i_ll = F.fault_current_1ph_a(240.0, zll)
    assert i_ll == pytest.approx(50e3 / 240.0 * 100 / 2.0, rel=1e-12)
    assert F.fault_current_1ph_a(120.0, zln) == pytest.approx(1.5 * i_ll, rel=1e-12)


def test_ptp_line_to_neutral_matches_ohmic_for_resistive_parts():
    """The p-t-p line-to-neutral f = 2·L·I/(C·n·V_LN) (Cooper Bussmann,
    Electrical Plan Review, 2005, Part II) equals the ohmic
    loop Z_LN + 2·Z_run when source and run impedances share one angle (magnitudes add)."""
    zln = 0.004 * (1 + 1j)
    z_per_m = 0.6e-3 * (1 + 1j)
    length = 20.0
    i0 = 120.0 / abs(zln)
    c = PTP.conductor_constant_a_ft_per_v(z_per_m.real, z_per_m.imag)
    ptp = PTP.ptp_chain_a(i0, [length], [c], [1], 120.0, kind="1ph-ln")[0]
    ohmic = F.fault_current_1ph_a(120.0, zln + 2 * length * z_per_m)
    assert ptp == pytest.approx(ohmic, rel=1e-12)
    assert np.isfinite(ptp)
