"""Issue-12 kernels against published formulas, worked examples and tables.

Each test names its source in the docstring and beside the values it checks.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from feedcheck.calc import fault as F
from feedcheck.calc.bonding import JumperTable, jumper_passes, supply_side_jumper_size
from feedcheck.calc.fault_duty import (
    TestConditionRow,
    asymmetry_multiplying_factor,
    fault_lg_delta_wye_a,
    governing_duty_a,
    test_condition_row,
)
from feedcheck.calc.fault_split_phase import ln_to_ll_ratio_terminals, split_phase_fault
from feedcheck.calc.sizes import parse_size, smallest_at_least
from feedcheck.calc.withstand_icea import (
    InsulationType,
    icea_final_temperature_c,
    icea_k_si,
    icea_withstand_current_a,
    insulation_type,
)
from feedcheck.tables import load_table
from tests.kernels import ac_impedance_ohm_per_m

# ICEA P-32-382-2007 constants (A in circular mils): copper K, T0; aluminum K, T0
CU_K, CU_T0, AL_K, AL_T0 = 0.0297, 234.0, 0.0125, 228.0


# --------------------------------------------------------------------------- 120/240 V


def _published_split_phase(kva, z_pct, x_r, tol_pct):
    """The fuse-maker note's percent form (infinite source, zero feet): L-L on the full
    winding, L-N with 1.5·%R and 1.2·%X at 120 V on the full kVA base."""
    r = z_pct / math.sqrt(1 + x_r**2)
    x = r * x_r
    z_ln = math.hypot(1.5 * r, 1.2 * x)
    k = 1.0 - tol_pct / 100.0
    i_ll = kva * 1e3 / 240.0 * 100.0 / (z_pct * k)
    i_ln = kva * 1e3 / 120.0 * 100.0 / (z_ln * k)
    return i_ll, i_ln


def test_issue_example_terminal_line_to_neutral_exceeds_line_to_line():
    """Issue 12 example: 167 kVA, 2 %Z, X/R 3, 480 V to 120/240 V, infinite source.
    Fuse-maker point-to-point note (common practice): L-N uses 1.2 × %X and 1.5 × %R.
    Hand figures: %R = 0.6325, %X = 1.8974, |1.5·%R + j1.2·%X| = 2.4666 %;
    nominal I_LL = 696 A · 100/2 = 34,792 A, I_LN = 1392 A · 100/2.4666 = 56,421 A;
    with the −7.5 % tolerance (IEEE C57.12.00 clause 9): 37,613 A and 60,996 A."""
    for tol, ll_hand, ln_hand in ((0.0, 34_792, 56_421), (7.5, 37_613, 60_996)):
        f = split_phase_fault(167e3, 240.0, 2.0, 3.0, case="max", tolerance_pct=tol)
        i_ll, i_ln = _published_split_phase(167.0, 2.0, 3.0, tol)
        assert f.fault_ll_a == pytest.approx(i_ll, rel=1e-9)
        assert f.fault_ln_a == pytest.approx(i_ln, rel=1e-9)
        assert f.fault_ll_a == pytest.approx(ll_hand, abs=1.0)
        assert f.fault_ln_a == pytest.approx(ln_hand, abs=1.0)
        assert f.fault_ln_a > f.fault_ll_a


def test_issue_example_at_the_panel_ln_governs():
    """Issue 12 example continued: 5 ft of 2 × 600 kcmil Cu (neutral the same) to an
    800 A panel rated 42 kA. The line-to-neutral maximum at the panel must exceed both
    the line-to-line maximum and the 42 kA rating (the unsafe 'ok' of the issue);
    conductor R and X from NFPA 70-2023 Ch. 9 Table 9 (steel raceway) at 20 °C."""
    r, x = ac_impedance_ohm_per_m("600 kcmil", "cu", "steel", conductor_c=20.0)
    z = F.branch_impedance_ohm(5 * 0.3048, float(r), float(x), 2)
    f = split_phase_fault(
        167e3, 240.0, 2.0, 3.0, case="max", tolerance_pct=7.5, z_line_ohm=z, z_neutral_ohm=z
    )
    assert f.fault_ln_a > f.fault_ll_a > 0
    assert f.fault_ln_a > 42_000
    duty = governing_duty_a(fault_ll_a=f.fault_ll_a, fault_ln_a=f.fault_ln_a)
    assert duty.case == "ln"


def test_ln_to_ll_ratio_spans_the_published_range():
    """Fuse-maker note: the 1.5 multiplier 'will theoretically vary from 1.33 to 1.67'
    (1.2 × %X and 1.5 × %R): all-resistive → 2/1.5, all-reactive → 2/1.2."""
    assert ln_to_ll_ratio_terminals(0.0) == pytest.approx(4 / 3, rel=1e-12)
    assert ln_to_ll_ratio_terminals(math.inf) == pytest.approx(5 / 3, rel=1e-12)
    xr = np.array([0.5, 1.0, 2.0, 3.0, 8.0])
    got = ln_to_ll_ratio_terminals(xr)
    assert np.all((got > 4 / 3) & (got < 5 / 3))
    kern = split_phase_fault(100e3, 240.0, 2.2, xr, tolerance_pct=0.0)
    np.testing.assert_allclose(kern.fault_ln_a / kern.fault_ll_a, got, rtol=1e-12)


# --------------------------------------------------------------------------- X/R factor


def test_multiplying_factors_reproduce_ecm_example():
    """EC&M 'Short circuit current duties of circuit breakers and fuses, part 2' (2012),
    worked example at X/R 7.0 (formulas of IEEE Std C37.13-2008 and IEEE Std 1015-2006):
    unfused LV power breaker MF 1.012 (test X/R 6.6, RMS basis); molded/insulated-case
    MF 1.073 (test X/R 4.9, peak basis); LV fuse MF 1.078 (RMS basis, X/R limit 4.9)."""
    assert asymmetry_multiplying_factor(7.0, 6.6, "rms") == pytest.approx(1.012, abs=5e-4)
    assert asymmetry_multiplying_factor(7.0, 4.9, "peak") == pytest.approx(1.073, abs=5e-4)
    # The article's fuse figure 1.078 = √(1 + 2e^(−2π/7))/1.25, i.e. the test-circuit
    # ratio 1.247 (20 % PF) rounded to 1.25; the unrounded ratio gives 1.0805 (0.23 % more,
    # the safe side). Held to the article at 3e-3.
    assert asymmetry_multiplying_factor(7.0, 4.9, "rms") == pytest.approx(1.078, rel=3e-3)


@pytest.mark.parametrize(
    ("x_r", "published"),
    [
        # Sheldrake, Handbook of Electrical Engineering (Wiley 2003), Table 8.1,
        # "max 1-phase rms current at 1/2 cycle" / rms symmetrical current
        (100.0, 1.696),
        (9.9501, 1.436),
        (6.5912, 1.330),
        (4.8990, 1.247),
        (3.1798, 1.130),
        (2.2913, 1.062),
        (1.7321, 1.026),
        (1.3333, 1.009),
    ],
)
def test_rms_asymmetry_ratio_matches_handbook_table(x_r, published):
    """The RMS-basis numerator √(1 + 2e^(−2π/(X/R))) against a published table (a test
    X/R → 0 leaves the numerator alone)."""
    got = asymmetry_multiplying_factor(x_r, 1e-9, "rms")
    assert got == pytest.approx(published, abs=1.5e-3)
    # cross-method: the existing half-cycle asymmetrical kernel (IEEE Std 141 ch. 4)
    assert got == pytest.approx(F.asymmetric_rms_half_cycle_a(1.0, x_r), rel=1e-12)


def test_test_condition_rows_pick_ul489_band():
    """UL 489 bands via TSEWG TP-6 Table 1: 7.5 kA → X/R 1.73; 14 kA → 3.18; 22 kA → 4.9."""
    rows = [
        TestConditionRow.from_record(r)
        for r in load_table("device_test_power_factor").data.to_dict("records")
    ]
    assert test_condition_row("mccb", 7_500, rows).test_x_r == 1.73
    assert test_condition_row("mccb", 10_000, rows).test_x_r == 1.73
    assert test_condition_row("mccb", 14_000, rows).test_x_r == 3.18
    assert test_condition_row("mccb", 22_000, rows).test_x_r == 4.90
    with pytest.raises(ValueError, match="no test-condition row"):
        test_condition_row("vacuum", 22_000, rows)


# --------------------------------------------------------------------------- line-to-ground


def test_lg_at_delta_wye_terminals_matches_symmetrical_components():
    """IEEE Std 141-1993 ch. 4: at a delta–wye secondary fed from an infinite bus,
    I_LG / I_3ph = 3 / (2 + k) with Z0_T = k · Z1_T; k < 1 puts L-G above three-phase,
    k = 1 makes them equal, and the ratio must be honoured (issue 12 item 7)."""
    zt = 0.004 + 0.012j
    i3 = F.fault_current_3ph_a(208.0, zt)
    for k in (0.3, 0.85, 1.0, 2.0):
        ilg = fault_lg_delta_wye_a(208.0 / math.sqrt(3), 0j, zt, k)
        assert ilg / i3 == pytest.approx(3.0 / (2.0 + k), rel=1e-12)
    vals = [fault_lg_delta_wye_a(120.0, 0j, zt, k) for k in (0.3, 1.0, 2.0)]
    assert vals[0] > vals[1] > vals[2]


# --------------------------------------------------------------------------- ICEA withstand


def test_icea_k_thermoplastic_90_to_150_is_about_92():
    """Issue 12 item 8 and ICEA P-32-382 constants: copper from 90 °C to 150 °C gives
    k ≈ 92 A·s^½/mm² (against the 143 used for thermoset)."""
    assert icea_k_si(CU_K, CU_T0, 90.0, 150.0) == pytest.approx(92.0, abs=0.5)


@pytest.mark.parametrize(
    ("k_icea", "t0", "t1", "t2", "iec_k"),
    [
        # IEC 60364-4-43:2008 Table 43A: PVC Cu 70→160 °C k = 115; XLPE Cu 90→250 k = 143;
        # XLPE Al 90→250 k = 94; PVC Al 70→160 k = 76
        (CU_K, CU_T0, 70.0, 160.0, 115.0),
        (CU_K, CU_T0, 90.0, 250.0, 143.0),
        (AL_K, AL_T0, 90.0, 250.0, 94.0),
        (AL_K, AL_T0, 70.0, 160.0, 76.0),
    ],
)
def test_icea_k_agrees_with_iec_table_43a(k_icea, t0, t1, t2, iec_k):
    """Cross-method: ICEA P-32-382 and the IEC adiabatic k differ only in their material
    constants (within 2 %; aluminium PVC differs most, 1.7 %)."""
    assert icea_k_si(k_icea, t0, t1, t2) == pytest.approx(iec_k, rel=0.02)


def test_icea_constants_in_the_shipped_table():
    """ICEA P-32-382: copper K = 0.0297, T0 = 234; aluminum K = 0.0125, T0 = 228."""
    m = load_table("conductor_materials").data.set_index("material")
    assert (m.loc["cu", "icea_k"], m.loc["cu", "icea_t0_c"]) == (CU_K, CU_T0)
    assert (m.loc["al", "icea_k"], m.loc["al", "icea_t0_c"]) == (AL_K, AL_T0)


def test_icea_withstand_matches_existing_kernel_and_round_trips():
    """Cross-method with feedcheck.calc.withstand.withstand_current_icea_a (same ICEA
    P-32-382 formula, table-fed), and T2 recovered from the current."""
    from tests.kernels import withstand_current_icea_a

    a = parse_size("4/0 AWG").area_mm2
    got = icea_withstand_current_a(a, 0.1, CU_K, CU_T0, 75.0, 150.0)
    assert got == pytest.approx(withstand_current_icea_a(a, 0.1, "cu", 75.0, 150.0), rel=1e-6)
    t2 = icea_final_temperature_c(got, a, 0.1, CU_K, CU_T0, 75.0)
    assert t2 == pytest.approx(150.0, rel=1e-12)


def test_thhn_gets_the_thermoplastic_limit():
    """Issue 12 item 8: THHN is 90 °C thermoplastic (NFPA 70 Table 310.4(A)); its
    withstand ends at 150 °C (ICEA P-32-382, from memory) and is lower than XHHW-2's."""
    rows = [
        InsulationType.from_record(r)
        for r in load_table("insulation_types").data.to_dict("records")
    ]
    thhn, xhhw2 = insulation_type("THHN", rows), insulation_type("xhhw 2", rows)
    assert (thhn.family, thhn.dry_c, thhn.sc_final_c) == ("thermoplastic", 90.0, 150.0)
    assert (xhhw2.family, xhhw2.dry_c, xhhw2.sc_final_c) == ("thermoset", 90.0, 250.0)
    a = parse_size("1/0 AWG").area_mm2
    i_tp = icea_withstand_current_a(a, 0.05, CU_K, CU_T0, thhn.dry_c, thhn.sc_final_c)
    i_ts = icea_withstand_current_a(a, 0.05, CU_K, CU_T0, xhhw2.dry_c, xhhw2.sc_final_c)
    assert i_tp < 0.7 * i_ts
    with pytest.raises(ValueError, match="one marking"):
        insulation_type("THHN/THWN-2", rows)


# --------------------------------------------------------------------------- bonding


def _jumper_table():
    return JumperTable.from_records(
        load_table("supply_side_bonding_jumper").data.to_dict("records")
    )


def test_4_0_cu_secondary_needs_2_awg_so_4_awg_fails():
    """Issue 12 item 9; NFPA 70-2023 Table 250.102(C)(1): 4/0 Cu lies in 'over 3/0
    through 350' → 2 AWG Cu; a 4 AWG Cu jumper fails, a 2 AWG passes."""
    j = supply_side_jumper_size(parse_size("4/0 AWG").area_kcmil, 1, "cu", _jumper_table())
    assert (j.size, j.rule) == ("2 AWG", "table")
    assert not jumper_passes(parse_size("4 AWG").area_kcmil, j.required_kcmil)
    assert jumper_passes(parse_size("2 AWG").area_kcmil, j.required_kcmil)


@pytest.mark.parametrize(
    ("size", "sets", "material", "expected"),
    [
        # worked examples quoting Table 250.102(C)(1) (building-code forum thread, 2019)
        ("250 kcmil", 1, "cu", "2 AWG"),
        ("250 kcmil", 3, "cu", "2/0 AWG"),
        ("3/0 AWG", 2, "cu", "2 AWG"),
        # table edges: NFPA 70-2023 Table 250.102(C)(1)
        ("2 AWG", 1, "cu", "8 AWG"),
        ("1 AWG", 1, "cu", "6 AWG"),
        ("3/0 AWG", 1, "cu", "4 AWG"),
        ("350 kcmil", 1, "cu", "2 AWG"),
        ("600 kcmil", 1, "cu", "1/0 AWG"),
        ("1/0 AWG", 1, "al", "6 AWG"),
        ("250 kcmil", 1, "al", "2 AWG"),
        ("500 kcmil", 1, "al", "1/0 AWG"),
        ("900 kcmil", 1, "al", "3/0 AWG"),
        ("1750 kcmil", 1, "al", "4/0 AWG"),
    ],
)
def test_table_rows(size, sets, material, expected):
    j = supply_side_jumper_size(parse_size(size).area_kcmil, sets, material, _jumper_table())
    assert j.size == expected


def test_twelve_and_a_half_percent_rule_with_parallel_sets():
    """NFPA 70-2023 Table 250.102(C)(1) note: above 1100 kcmil Cu / 1750 kcmil Al the
    jumper has at least 12½ % of the (equivalent) area. Issue example 2 × 600 kcmil Cu
    = 1200 kcmil → 150 kcmil → 3/0 Cu (167.8 kcmil, Ch. 9 Table 8); 4 × 500 kcmil Al =
    2000 kcmil → 250 kcmil Al."""
    t = _jumper_table()
    j = supply_side_jumper_size(600.0, 2, "cu", t)
    assert (j.rule, j.rule_id) == ("percent", "nec-t250.102c1-note")
    assert j.required_kcmil == pytest.approx(150.0)
    pick = smallest_at_least(j.required_kcmil * 0.506707479)
    assert pick.name == "3/0 AWG"
    assert not jumper_passes(parse_size("2/0 AWG").area_kcmil, j.required_kcmil)
    j_al = supply_side_jumper_size(500.0, 4, "al", t)
    assert j_al.required_kcmil == pytest.approx(250.0)
    # the same 1200 kcmil as one conductor per phase set in three raceways of 400 kcmil
    assert supply_side_jumper_size(400.0, 3, "cu", t).required_kcmil == pytest.approx(150.0)
    # exactly 1100 kcmil stays in the table (row 'over 600 through 1100')
    assert supply_side_jumper_size(550.0, 2, "cu", t).size == "2/0 AWG"
