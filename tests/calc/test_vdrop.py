"""Properties, limiting cases and errors of the voltage-drop kernels."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from feedcheck.calc.motor_starting import motor_starting_current_a, motor_starting_voltage_pct
from feedcheck.calc.vdrop import (
    SQRT3,
    circuit_factor,
    max_length_m,
    min_conductor_index,
    receiving_voltage_exact_v,
    voltage_drop_approximate_v,
    voltage_drop_exact_circuit_v,
    voltage_drop_exact_v,
    voltage_drop_pct,
    voltage_profile,
)

FT = 0.3048
CIRCUITS = ["3ph", "1ph2w", "1ph3w", "ln4w"]

currents = st.floats(0.0, 2000.0)
r_per_m = st.floats(1e-5, 1e-2)
x_per_m = st.floats(0.0, 5e-4)
lengths = st.floats(0.0, 500.0)
pfs = st.floats(0.05, 1.0)
circuits = st.sampled_from(CIRCUITS)
FAST = settings(max_examples=60, deadline=None)


# --- limiting cases and identities -------------------------------------------------------


@FAST
@given(currents, r_per_m, x_per_m, pfs, circuits)
def test_zero_length_zero_drop(i, r, x, pf, circuit):
    assert voltage_drop_approximate_v(i, r, x, 0.0, pf, circuit) == 0.0
    assert voltage_drop_exact_circuit_v(480.0, i, r, x, 0.0, pf, circuit) == pytest.approx(
        0.0, abs=1e-9
    )


@FAST
@given(
    st.floats(0.1, 2000.0),
    r_per_m,
    x_per_m,
    st.floats(0.1, 500.0),
    pfs,
    circuits,
    st.floats(0.1, 10.0),
)
def test_approximate_is_linear_in_length_and_current(i, r, x, length, pf, circuit, scale):
    base = voltage_drop_approximate_v(i, r, x, length, pf, circuit)
    assert voltage_drop_approximate_v(i, r, x, scale * length, pf, circuit) == pytest.approx(
        scale * base, rel=1e-12
    )
    assert voltage_drop_approximate_v(scale * i, r, x, length, pf, circuit) == pytest.approx(
        scale * base, rel=1e-12
    )


@FAST
@given(
    st.floats(100.0, 600.0),
    st.floats(0.0, 800.0),
    st.floats(0.0, 0.05),
    st.floats(0.0, 0.05),
    st.floats(-1.0, 1.0),
)
def test_exact_minus_approximate_is_the_quadrature_term(es, i, r, x, pf):
    # exact − approx = Es − √(Es² − b²), b = I(X cos θ − R sin θ): 0 ≤ gap ≤ b²/Es for b ≤ Es/2
    cos = abs(pf)
    sin = math.copysign(math.sqrt(1 - pf * pf), pf if pf != 0 else 1.0)
    b = i * (x * cos - r * sin)
    a = i * (r * cos + x * sin)
    if abs(b) > es / 2 or es - a <= 1:
        return
    exact = voltage_drop_exact_v(es, i, r, x, pf)
    approx = voltage_drop_approximate_v(i, r, x, 1.0, pf, "3ph") / SQRT3
    gap = exact - approx
    assert -1e-9 <= gap <= b * b / es + 1e-9


@FAST
@given(
    st.floats(100.0, 600.0),
    st.floats(1.0, 400.0),
    st.floats(1e-4, 0.01),
    st.floats(1e-4, 0.01),
    pfs,
)
def test_exact_close_to_approximate_at_small_drops(es, i, r, x, pf):
    approx = voltage_drop_approximate_v(i, r, x, 1.0, pf, "3ph") / SQRT3
    if approx > 0.03 * es:
        return
    exact = voltage_drop_exact_v(es, i, r, x, pf)
    # the quadrature term is second order: ≤ (I·|Z|)²/Es ≤ 0.2 % of Es when I|Z| ≤ 4.5 % Es
    iz = i * math.hypot(r, x)
    assert abs(exact - approx) <= iz * iz / es + 1e-12
    if iz <= 0.045 * es:
        assert abs(exact - approx) <= 0.002 * es


@FAST
@given(
    st.floats(1.0, 2000.0), r_per_m, x_per_m, pfs, circuits, st.floats(0.5, 40.0), st.integers(1, 6)
)
def test_max_length_round_trip(i, r, x, pf, circuit, limit_v, sets):
    length = max_length_m(i, r, x, pf, limit_v, circuit, sets)
    assert math.isfinite(length) and length > 0
    back = voltage_drop_approximate_v(i, r, x, length, pf, circuit, sets)
    assert back == pytest.approx(limit_v, rel=1e-12)


def test_max_length_infinite_without_current_or_for_leading_capacitive_case():
    assert max_length_m(0.0, 1e-4, 1e-4, 0.9, 5.0) == math.inf
    # leading pf 0.1 with X ≫ R: R cos θ + X sin θ < 0, the drop never grows
    assert max_length_m(100.0, 1e-5, 2e-4, -0.1, 5.0) == math.inf
    assert voltage_drop_approximate_v(100.0, 1e-5, 2e-4, 100.0, -0.1) < 0  # a voltage rise


@FAST
@given(currents, r_per_m, x_per_m, lengths, pfs, st.integers(1, 8))
def test_sets_divide_the_drop(i, r, x, length, pf, sets):
    one = voltage_drop_approximate_v(i, r, x, length, pf, "3ph", 1)
    assert voltage_drop_approximate_v(i, r, x, length, pf, "3ph", sets) == pytest.approx(
        one / sets, rel=1e-12, abs=1e-15
    )


def test_circuit_factors_and_loop_equivalence():
    assert circuit_factor("3ph") == pytest.approx(math.sqrt(3))
    for c in ("1ph2w", "1ph3w", "ln4w"):
        assert circuit_factor(c) == 2.0
    # single-phase two-wire exact drop = exact drop of the whole loop (2R, 2X) at full voltage
    r, x, length = 3.2e-4, 1.7e-4, 60.0
    loop = voltage_drop_exact_v(240.0, 80.0, 2 * r * length, 2 * x * length, 0.9)
    assert voltage_drop_exact_circuit_v(240.0, 80.0, r, x, length, 0.9, "1ph2w") == pytest.approx(
        loop, rel=1e-12
    )
    # balanced 120/240 V: each line drops against its 120 V half; 240 V drop is twice that
    half = voltage_drop_exact_v(120.0, 80.0, r * length, x * length, 0.9)
    assert voltage_drop_exact_circuit_v(240.0, 80.0, r, x, length, 0.9, "1ph3w") == pytest.approx(
        2 * half, rel=1e-12
    )


def test_percent_helper():
    assert voltage_drop_pct(6.24, 208.0) == pytest.approx(3.0)
    np.testing.assert_allclose(
        voltage_drop_pct(np.array([2.4, 6.0]), np.array([120, 240])), [2.0, 2.5]
    )


# --- vector = scalar ------------------------------------------------------------------


def test_vector_equals_scalar():
    rng = np.random.default_rng(7)
    n = 50
    i = rng.uniform(1, 500, n)
    r = rng.uniform(1e-5, 3e-3, n)
    x = rng.uniform(1e-5, 3e-4, n)
    length = rng.uniform(1, 200, n)
    pf = rng.uniform(0.5, 1.0, n)
    circ = rng.choice(CIRCUITS, n)
    sets = rng.integers(1, 4, n)
    vec = voltage_drop_approximate_v(i, r, x, length, pf, circ, sets)
    exact_vec = voltage_drop_exact_circuit_v(480.0, i, r, x, length, pf, circ, sets)
    lim = max_length_m(i, r, x, pf, 10.0, circ, sets)
    for j in range(n):
        args = (float(i[j]), float(r[j]), float(x[j]))
        assert vec[j] == voltage_drop_approximate_v(
            *args, float(length[j]), float(pf[j]), str(circ[j]), int(sets[j])
        )
        assert exact_vec[j] == pytest.approx(
            voltage_drop_exact_circuit_v(
                480.0, *args, float(length[j]), float(pf[j]), str(circ[j]), int(sets[j])
            ),
            rel=1e-14,
        )
        assert lim[j] == max_length_m(*args, float(pf[j]), 10.0, str(circ[j]), int(sets[j]))
    assert isinstance(voltage_drop_approximate_v(1.0, 1e-3, 1e-4, 1.0, 0.9), float)
    assert vec.shape == (n,)


# --- smallest conductor ---------------------------------------------------------------

# NFPA 70-2023 Ch. 9 Table 9, Cu in steel conduit, Ω per 1000 ft:
# 6, 4, 2, 1/0, 2/0, 3/0, 4/0, 250 kcmil
R_KFT = np.array([0.49, 0.31, 0.20, 0.12, 0.10, 0.079, 0.063, 0.054])
X_KFT = np.array([0.064, 0.060, 0.057, 0.055, 0.054, 0.052, 0.051, 0.052])
R_M, X_M = R_KFT / (1000 * FT), X_KFT / (1000 * FT)


@FAST
@given(
    st.floats(5.0, 400.0),
    st.floats(3.0, 400.0),
    st.floats(0.6, 1.0),
    circuits,
    st.floats(1.0, 15.0),
)
def test_min_conductor_index_is_first_passing(i, length, pf, circuit, limit_v):
    idx = min_conductor_index(i, R_M, X_M, length, pf, limit_v, circuit)
    drops = voltage_drop_approximate_v(i, R_M, X_M, length, pf, circuit)
    ok = drops <= limit_v
    if idx == -1:
        assert not ok.any()
    else:
        assert ok[idx] and not ok[:idx].any()


def test_min_conductor_index_vectorised():
    i = np.array([50.0, 150.0, 400.0, 2000.0])
    got = min_conductor_index(i, R_M, X_M, 60.0, 0.85, 0.03 * 208)
    want = [min_conductor_index(float(v), R_M, X_M, 60.0, 0.85, 0.03 * 208) for v in i]
    assert got.tolist() == want
    assert want[-1] == -1  # 2000 A over 60 m: nothing up to 250 kcmil meets 3 %


# --- motor starting -------------------------------------------------------------------


def test_motor_starting_stiff_source_and_monotone():
    assert motor_starting_voltage_pct(277.0, 600.0, 0.3, 0.0, 0.0) == pytest.approx(100.0)
    v = motor_starting_voltage_pct(
        277.0, 600.0, 0.3, np.array([0.0, 0.01, 0.05, 0.2]), np.array([0.0, 0.02, 0.1, 0.4])
    )
    assert np.all(np.diff(v) < 0)


@FAST
@given(
    st.floats(100.0, 600.0),
    st.floats(10.0, 3000.0),
    st.floats(0.1, 0.6),
    st.floats(0.0, 0.1),
    st.floats(0.0, 0.2),
)
def test_motor_divider_agrees_with_exact_phasor(es, ilr, pf, r, x):
    """Cross-method: the exact phasor form fed the divider's current at the starting pf
    gives the divider's terminal voltage."""
    vt_pct = motor_starting_voltage_pct(es, ilr, pf, r, x)
    i_start = motor_starting_current_a(es, ilr, pf, r, x)
    er = receiving_voltage_exact_v(es, i_start, r, x, pf)
    assert 100.0 * er / es == pytest.approx(vt_pct, rel=1e-9)
    assert i_start <= ilr * (1 + 1e-12)  # a sagging constant impedance draws less


def test_motor_rated_voltage_differs_from_source():
    # motor rated 460 V (265.6 V to neutral) on a 480 V (277 V) source, no path impedance:
    # terminal voltage is 277/265.6 of rated
    got = motor_starting_voltage_pct(277.0, 500.0, 0.3, 0.0, 0.0, rated_v=460 / SQRT3)
    assert got == pytest.approx(100 * 277.0 / (460 / SQRT3))


# --- voltage profile ------------------------------------------------------------------


def _profile_loop(parent, drop, dist):
    cd, cl = [], []
    for j, p in enumerate(parent):
        cd.append(drop[j] + (cd[p] if p >= 0 else 0.0))
        cl.append(dist[j] + (cl[p] if p >= 0 else 0.0))
    return cd, cl


@FAST
@given(
    st.lists(
        st.tuples(st.floats(0, 1), st.floats(0, 5), st.floats(0, 100)), min_size=1, max_size=40
    )
)
def test_profile_matches_plain_loop(rows):
    parent = [int(u * j) - 1 for j, (u, _, _) in enumerate(rows)]  # −1 … j − 1
    drop = [d for _, d, _ in rows]
    dist = [length for _, _, length in rows]
    prof = voltage_profile([f"n{j}" for j in range(len(rows))], parent, drop, dist)
    cd, cl = _profile_loop(parent, drop, dist)
    np.testing.assert_allclose(prof.drop_pct, cd, rtol=1e-12, atol=1e-12)
    np.testing.assert_allclose(prof.distance_m, cl, rtol=1e-12, atol=1e-12)


def test_profile_batched_cases_and_lookup():
    ids = ["T1", "LP1", "LP1/1", "LP2", "LP2/4"]
    parent = [-1, 0, 1, 0, 3]
    drops = np.array([[1.8, 1.1, 2.0, 0.4, 2.5], [2.0, 1.0, 1.0, 1.0, 1.0]])
    prof = voltage_profile(ids, parent, drops, [0, 30, 25, 12, 40])
    np.testing.assert_allclose(prof.drop_pct[0], [1.8, 2.9, 4.9, 2.2, 4.7])
    np.testing.assert_allclose(prof.drop_pct[1], [2.0, 3.0, 4.0, 3.0, 4.0])
    d, dist = prof.at("LP2/4")
    np.testing.assert_allclose(d, [4.7, 4.0])
    np.testing.assert_allclose(dist, [52.0, 52.0])


# --- errors ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "kwargs, match",
    [
        ({"pf": 1.2}, "pf must be between"),
        ({"pf": float("nan")}, "pf must be finite"),
        ({"circuit": "2ph"}, "circuit must be one of"),
        ({"length_m": -1.0}, "length_m must be"),
        ({"current_a": -5.0}, "current_a must be"),
        ({"sets": 0}, "sets must be"),
        ({"sets": 1.5}, "sets must be"),
    ],
)
def test_approximate_rejects_bad_input(kwargs, match):
    args = {
        "current_a": 100.0,
        "r_ohm_per_m": 1e-4,
        "x_ohm_per_m": 1e-4,
        "length_m": 10.0,
        "pf": 0.9,
        "circuit": "3ph",
        "sets": 1,
    }
    args.update(kwargs)
    with pytest.raises(ValueError, match=match):
        voltage_drop_approximate_v(**args)


def test_exact_rejects_undeliverable_load():
    with pytest.raises(ValueError, match="cannot be delivered"):
        voltage_drop_exact_v(120.0, 1000.0, 0.0, 0.5, 1.0)  # quadrature drop 500 V > 120 V
    with pytest.raises(ValueError, match="cannot be delivered"):
        voltage_drop_exact_v(120.0, 1000.0, 0.2, 0.0, 1.0)  # IR = 200 V ≥ Es
    with pytest.raises(ValueError, match="sending_v"):
        voltage_drop_exact_v(0.0, 10.0, 0.1, 0.1, 0.9)


def test_other_kernels_reject_bad_input():
    with pytest.raises(ValueError, match="limit_v"):
        max_length_m(100.0, 1e-4, 1e-4, 0.9, 0.0)
    with pytest.raises(ValueError, match="candidate"):
        min_conductor_index(100.0, [], [], 10.0, 0.9, 5.0)
    with pytest.raises(ValueError, match="starting_pf"):
        motor_starting_voltage_pct(277.0, 600.0, 1.5, 0.0, 0.0)
    with pytest.raises(ValueError, match="locked_rotor_a"):
        motor_starting_voltage_pct(277.0, 0.0, 0.3, 0.0, 0.0)
    with pytest.raises(ValueError, match="earlier node"):
        voltage_profile(["a", "b"], [1, -1], [1.0, 1.0], [0.0, 0.0])
    with pytest.raises(ValueError, match="unique"):
        voltage_profile(["a", "a"], [-1, 0], [1.0, 1.0], [0.0, 0.0])
    with pytest.raises(ValueError, match="last axis"):
        voltage_profile(["a", "b"], [-1, 0], [1.0, 1.0, 1.0], [0.0, 0.0, 0.0])
    with pytest.raises(ValueError, match="nominal_v"):
        voltage_drop_pct(3.0, 0.0)
