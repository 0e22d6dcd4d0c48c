"""Properties of the conductor impedance kernels (shape, limits, errors)."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from feedcheck.calc.conductor import parallel_impedance_ohm_per_m
from feedcheck.calc.sizes import AWG_KCMIL_ORDER, METRIC_ORDER, SIZES
from tests.kernels import (
    ac_impedance_computed_ohm_per_m,
    ac_impedance_ohm_per_m,
    dc_resistance_ohm_per_m,
    impedance_method,
)

ALL = list(AWG_KCMIL_ORDER) + list(METRIC_ORDER)


def test_vector_equals_scalar():
    sizes = np.array(ALL)
    r, x = ac_impedance_ohm_per_m(sizes, "cu", "steel", 90.0)
    for i, s in enumerate(ALL):
        rs, xs = ac_impedance_ohm_per_m(s, "cu", "steel", 90.0)
        assert r[i] == rs and x[i] == xs


def test_resistance_falls_with_size_in_each_system():
    for order in (AWG_KCMIL_ORDER, METRIC_ORDER):
        for mat in ("cu", "al"):
            r, _ = ac_impedance_ohm_per_m(np.array(order), mat, "pvc")
            assert np.all(np.diff(r) < 0)


@pytest.mark.parametrize("t", [20.0, 75.0])
def test_largest_sizes_compute_at_fault_temperature(t):
    # 2000 kcmil Cu at 20 °C has xs > 2.8: IEC 60287-1-1 §2.1.2 second branch, no error
    r, x = ac_impedance_ohm_per_m(["1750 kcmil", "2000 kcmil", "630 mm2"], "cu", "steel", t)
    assert np.all(np.isfinite(r)) and np.all(r > 0) and np.all(x > 0)
    assert r[1] < r[0]


def test_methods():
    assert impedance_method("4/0 AWG") == "table"
    assert impedance_method("800 kcmil") == "computed"
    assert impedance_method("95 mm2") == "computed"


@settings(max_examples=40, deadline=None)
@given(
    st.sampled_from(ALL),
    st.sampled_from(["cu", "al"]),
    st.floats(20.0, 250.0),
    st.floats(20.0, 250.0),
)
def test_resistance_rises_with_temperature(size, mat, t1, t2):
    lo, hi = sorted((t1, t2))
    r_lo, x_lo = ac_impedance_ohm_per_m(size, mat, "pvc", lo)
    r_hi, x_hi = ac_impedance_ohm_per_m(size, mat, "pvc", hi)
    assert r_lo <= r_hi
    assert x_lo == pytest.approx(x_hi)


def test_aluminum_more_resistive_than_copper_same_area():
    a = np.array([SIZES[n].area_mm2 for n in ALL])
    assert np.all(dc_resistance_ohm_per_m(a, "al", 75.0) > dc_resistance_ohm_per_m(a, "cu", 75.0))


def test_steel_reactance_above_nonmagnetic():
    for s in ("12 AWG", "500 kcmil", "240 mm2"):
        x_steel = ac_impedance_ohm_per_m(s, "cu", "steel")[1]
        assert x_steel > ac_impedance_ohm_per_m(s, "cu", "pvc")[1]


def test_cable_and_free_air_read_pvc_columns():
    # documented mapping: cable, free-air -> nonmagnetic (PVC) columns
    assert ac_impedance_ohm_per_m("2/0 AWG", "cu", "cable") == ac_impedance_ohm_per_m(
        "2/0 AWG", "cu", "pvc"
    )
    assert ac_impedance_ohm_per_m("2/0 AWG", "al", "free-air") == ac_impedance_ohm_per_m(
        "2/0 AWG", "al", "pvc"
    )


def test_parallel_divides():
    r, x = ac_impedance_ohm_per_m("500 kcmil", "cu", "steel")
    r2, x2 = parallel_impedance_ohm_per_m(r, x, 3)
    assert (r2, x2) == pytest.approx((r / 3, x / 3))
    with pytest.raises(ValueError, match="sets"):
        parallel_impedance_ohm_per_m(r, x, 0)


def test_skin_effect_small_for_small_conductors():
    # AC/DC ratio ~1 for 2.5 mm² at 60 Hz, noticeable (>1 %) at 630 mm² (IEC 60287-1-1 §2.1)
    r_ac, _ = ac_impedance_computed_ohm_per_m(2.5, "cu", "pvc", 20.0)
    assert r_ac / dc_resistance_ohm_per_m(2.5, "cu", 20.0) == pytest.approx(1.0, abs=1e-3)
    r_ac, _ = ac_impedance_computed_ohm_per_m(630.0, "cu", "pvc", 20.0)
    assert r_ac / dc_resistance_ohm_per_m(630.0, "cu", 20.0) > 1.01


@pytest.mark.parametrize(
    "kwargs,match",
    [
        ({"size": "7 AWG"}, "conductor size"),
        ({"material": "fe"}, "material"),
        ({"raceway": "duct"}, "raceway"),
        ({"conductor_c": 900.0}, "conductor_c"),
        ({"conductor_c": float("nan")}, "conductor_c"),
    ],
)
def test_bad_input_raises(kwargs, match):
    args = {"size": "4/0 AWG", "material": "cu", "raceway": "pvc", "conductor_c": 75.0}
    args.update(kwargs)
    with pytest.raises(ValueError, match=match):
        ac_impedance_ohm_per_m(**args)


def test_bad_area_raises():
    with pytest.raises(ValueError, match="area_mm2"):
        dc_resistance_ohm_per_m(-1.0, "cu", 20.0)
