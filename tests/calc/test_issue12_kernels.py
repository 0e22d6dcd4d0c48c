"""Properties of the issue-12 kernels: limiting cases, monotonicity, vector = scalar,
invalid input raises. (Published values are in tests/reference/.)"""

from __future__ import annotations

import math

import numpy as np
import pytest

from feedcheck.calc.bonding import JumperTable, jumper_passes, supply_side_jumper_size
from feedcheck.calc.fault_duty import (
    asymmetry_multiplying_factor,
    fault_lg_delta_wye_a,
    governing_duty_a,
    x_r_from_power_factor,
)
from feedcheck.calc.fault_split_phase import (
    half_winding_impedance_ohm,
    ln_to_ll_ratio_terminals,
    split_phase_fault,
)
from feedcheck.calc.withstand_icea import (
    icea_final_temperature_c,
    icea_k_si,
    icea_withstand_current_a,
    insulation_rating_c,
    insulation_type,
    operating_temperature_c,
)
from feedcheck.tables import load_table

ZLINE = 1e-3 * (0.2 + 0.05j)  # per metre, invented


# --------------------------------------------------------------------------- split phase


def test_split_phase_falls_with_distance_and_min_below_max():
    lengths = np.array([0.0, 5.0, 20.0, 60.0, 200.0])
    fmax = split_phase_fault(
        75e3, 240.0, 2.5, 2.0, "max", 7.5, z_line_ohm=lengths * ZLINE, z_neutral_ohm=lengths * ZLINE
    )
    fmin = split_phase_fault(
        75e3,
        240.0,
        2.5,
        2.0,
        "min",
        7.5,
        z_line_ohm=lengths * ZLINE * 1.2,
        z_neutral_ohm=lengths * ZLINE * 1.2,
    )
    assert np.all(np.diff(fmax.fault_ll_a) < 0) and np.all(np.diff(fmax.fault_ln_a) < 0)
    assert np.all(fmin.fault_ll_a < fmax.fault_ll_a)
    assert np.all(fmin.fault_ln_a < fmax.fault_ln_a)
    # far enough out the neutral loop makes L-N the smaller figure (fuse-maker note)
    assert fmax.fault_ln_a[0] > fmax.fault_ll_a[0] and fmax.fault_ln_a[-1] < fmax.fault_ll_a[-1]


def test_split_phase_vector_equals_scalar():
    kva = np.array([25e3, 50e3, 167e3])
    z = np.array([1.8, 2.2, 2.0])
    xr = np.array([1.2, 1.6, 3.0])
    zl = np.array([0j, 3 * ZLINE, 10 * ZLINE])
    vec = split_phase_fault(
        kva, 240.0, z, xr, "max", 7.5, z_source_ohm=1e-4 + 4e-4j, z_line_ohm=zl, z_neutral_ohm=zl
    )
    for i in range(3):
        one = split_phase_fault(
            kva[i],
            240.0,
            z[i],
            xr[i],
            "max",
            7.5,
            z_source_ohm=1e-4 + 4e-4j,
            z_line_ohm=zl[i],
            z_neutral_ohm=zl[i],
        )
        assert one.fault_ll_a == pytest.approx(vec.fault_ll_a[i], rel=1e-12)
        assert one.fault_ln_a == pytest.approx(vec.fault_ln_a[i], rel=1e-12)


def test_split_phase_source_lowers_both_and_tolerance_orders():
    inf = split_phase_fault(50e3, 240.0, 2.0, 2.0, tolerance_pct=0.0)
    weak = split_phase_fault(50e3, 240.0, 2.0, 2.0, tolerance_pct=0.0, z_source_ohm=0.002 + 0.008j)
    assert weak.fault_ll_a < inf.fault_ll_a and weak.fault_ln_a < inf.fault_ln_a
    hi = split_phase_fault(50e3, 240.0, 2.0, 2.0, "max", 10.0).fault_ln_a
    lo = split_phase_fault(50e3, 240.0, 2.0, 2.0, "min", 10.0).fault_ln_a
    assert hi / lo == pytest.approx(1.1 / 0.9, rel=1e-12)


def test_half_winding_factors_one_give_the_quarter_impedance():
    # with factors 1 the half winding is the ideal-ratio referral (1/2)²
    assert half_winding_impedance_ohm(0.004 + 0.01j, 1.0, 1.0) == pytest.approx(0.001 + 0.0025j)
    assert ln_to_ll_ratio_terminals(3.0, 1.0, 1.0) == pytest.approx(2.0)


@pytest.mark.parametrize(
    "bad", [dict(case="mid"), dict(tolerance_pct=100.0), dict(z_line_ohm=-1e-3 + 0j), dict(c=0.0)]
)
def test_split_phase_rejects_bad_input(bad):
    kw = dict(case="max", tolerance_pct=7.5) | bad
    with pytest.raises(ValueError):
        split_phase_fault(50e3, 240.0, 2.0, 2.0, **kw)


# --------------------------------------------------------------------------- duty, MF


def test_governing_duty_is_the_maximum_and_names_it():
    a = np.array([10e3, 20e3, 5e3])
    b = np.array([12e3, 19e3, 5e3])
    d = governing_duty_a(a, None, b, None)
    np.testing.assert_array_equal(d.duty_a, np.maximum(a, b))
    assert d.case.tolist() == ["ln", "3ph", "3ph"]  # tie → the earlier case
    assert d.cases == ("3ph", "ln")
    with pytest.raises(ValueError, match="at least one"):
        governing_duty_a()
    with pytest.raises(ValueError, match="fault_lg_a"):
        governing_duty_a(1e3, fault_lg_a=float("nan"))


def test_multiplying_factor_limits_and_monotonic():
    for basis, limit in (("peak", 2.0), ("rms", math.sqrt(3.0))):
        assert asymmetry_multiplying_factor(4.9, 4.9, basis) == 1.0
        assert asymmetry_multiplying_factor(1.0, 4.9, basis) == 1.0  # floored
        xr = np.array([5.0, 7.0, 10.0, 20.0, 50.0])
        mf = asymmetry_multiplying_factor(xr, 4.9, basis)
        assert np.all(np.diff(mf) > 0)
        # X/R → ∞: full offset, peak ratio 2 and RMS ratio √3 over the test circuit's
        top = asymmetry_multiplying_factor(math.inf, 1e-9, basis)
        assert top == pytest.approx(limit, rel=1e-12)
    vec = asymmetry_multiplying_factor([7.0, 7.0], [4.9, 6.6], ["peak", "rms"])
    assert vec.tolist() == [
        asymmetry_multiplying_factor(7.0, 4.9, "peak"),
        asymmetry_multiplying_factor(7.0, 6.6, "rms"),
    ]
    with pytest.raises(ValueError, match="basis"):
        asymmetry_multiplying_factor(7.0, 4.9, "sym")
    with pytest.raises(ValueError):
        x_r_from_power_factor(0.0)


def test_lg_delta_wye_falls_downstream_and_vector_equals_scalar():
    L = np.array([0.0, 10.0, 50.0, 150.0])
    got = fault_lg_delta_wye_a(120.0, 2e-4 + 1e-3j, 0.004 + 0.012j, 0.85, L * ZLINE, L * ZLINE * 2)
    assert np.all(np.diff(got) < 0)
    for i, length in enumerate(L):
        one = fault_lg_delta_wye_a(
            120.0, 2e-4 + 1e-3j, 0.004 + 0.012j, 0.85, length * ZLINE, length * ZLINE * 2
        )
        assert one == pytest.approx(got[i], rel=1e-12)
    # a bigger return conductor (lower impedance) raises the current
    assert fault_lg_delta_wye_a(
        120.0, 0j, 0.004 + 0.012j, 1.0, 50 * ZLINE, 25 * ZLINE
    ) > fault_lg_delta_wye_a(120.0, 0j, 0.004 + 0.012j, 1.0, 50 * ZLINE, 50 * ZLINE)
    with pytest.raises(ValueError, match="z0_ratio"):
        fault_lg_delta_wye_a(120.0, 0j, 0.004 + 0.012j, 0.0)


# --------------------------------------------------------------------------- withstand


def test_icea_withstand_properties():
    a = np.array([13.3, 33.6, 107.2])
    i = icea_withstand_current_a(a, 0.05, 0.0297, 234.0, 75.0, 150.0)
    assert np.all(np.diff(i) > 0)
    assert icea_withstand_current_a(33.6, 0.2, 0.0297, 234.0, 75.0, 150.0) == pytest.approx(
        icea_withstand_current_a(33.6, 0.05, 0.0297, 234.0, 75.0, 150.0) / 2.0, rel=1e-12
    )
    # hotter start → less withstand; withstand → 0 as the start nears the limit
    ks = icea_k_si(0.0297, 234.0, np.array([30.0, 75.0, 90.0, 149.9]), 150.0)
    assert np.all(np.diff(ks) < 0) and ks[-1] < 5.0
    for j, area in enumerate(a):
        assert icea_withstand_current_a(area, 0.05, 0.0297, 234.0, 75.0, 150.0) == pytest.approx(
            i[j], rel=1e-12
        )
    assert icea_final_temperature_c(0.0, 33.6, 0.1, 0.0297, 234.0, 60.0) == pytest.approx(60.0)
    with pytest.raises(ValueError, match="final_c"):
        icea_k_si(0.0297, 234.0, 150.0, 90.0)


def test_operating_temperature_limits():
    assert operating_temperature_c(30.0, 90.0, 0.0, 100.0) == 30.0
    assert operating_temperature_c(30.0, 90.0, 100.0, 100.0) == 90.0
    assert operating_temperature_c(30.0, 90.0, 150.0, 100.0) == 90.0  # capped
    t = operating_temperature_c(30.0, 90.0, np.array([20.0, 50.0, 80.0]), 100.0)
    assert np.all(np.diff(t) > 0)


def test_insulation_lookup():
    from feedcheck.calc.withstand_icea import InsulationType

    rows = [
        InsulationType.from_record(r)
        for r in load_table("insulation_types").data.to_dict("records")
    ]
    thhw = insulation_type("thhw", rows)
    assert insulation_rating_c(thhw, wet=True) == 75.0
    assert insulation_rating_c(thhw, wet=False) == 90.0
    with pytest.raises(ValueError, match="not listed for wet"):
        insulation_rating_c(insulation_type("THHN", rows), wet=True)
    with pytest.raises(ValueError, match="expected one of"):
        insulation_type("THHX", rows)


# --------------------------------------------------------------------------- bonding


def _table():
    return JumperTable.from_records(
        load_table("supply_side_bonding_jumper").data.to_dict("records")
    )


def test_jumper_grows_with_phase_area_and_vector_equals_scalar():
    t = _table()
    areas = np.array([41.74, 105.6, 211.6, 500.0, 1000.0, 600.0, 1500.0])
    sets = np.array([1, 1, 1, 1, 1, 2, 2])
    vec = supply_side_jumper_size(areas, sets, "cu", t)
    eq = areas * sets
    order = np.argsort(eq)
    assert np.all(np.diff(vec.required_kcmil[order]) >= 0)
    for i in range(areas.size):
        one = supply_side_jumper_size(areas[i], int(sets[i]), "cu", t)
        assert one.required_kcmil == pytest.approx(vec.required_kcmil[i])
        assert one.size == vec.size[i]
    assert jumper_passes(np.array([66.36, 41.74]), 66.36).tolist() == [True, False]


@pytest.mark.parametrize(
    ("args", "match"),
    [((0.0, 1, "cu"), "phase_area"), ((211.6, 1.5, "cu"), "sets"), ((211.6, 1, "fe"), "material")],
)
def test_jumper_rejects_bad_input(args, match):
    with pytest.raises(ValueError, match=match):
        supply_side_jumper_size(*args, _table())


def test_jumper_refuses_mixed_materials():
    with pytest.raises(ValueError, match="different materials"):
        supply_side_jumper_size(211.6, 1, "al", _table(), jumper_material="cu")
