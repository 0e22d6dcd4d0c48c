"""Properties, limiting cases and error handling of the fault kernels."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from feedcheck.calc import fault as F
from feedcheck.calc import fault_lg as G
from feedcheck.calc.transformer import transformer_impedance_ohm

ZT = transformer_impedance_ohm(75e3, 208.0, 5.1, 3.5)
# NFPA 70-2023 Ch. 9 Table 9, Cu in steel conduit, Ω/kft: size: (R, XL)
TABLE9_CU_STEEL = {
    "4": (0.31, 0.060),
    "1/0": (0.12, 0.055),
    "4/0": (0.063, 0.051),
    "250": (0.054, 0.052),
    "500": (0.029, 0.048),
}


def _per_m(size):
    r, x = TABLE9_CU_STEEL[size]
    return r / 304.8, x / 304.8


def _naive_walk(parent, branch, root):
    total = np.empty(len(parent), dtype=complex)
    for i, p in enumerate(parent):
        total[i] = branch[i] + (root if p < 0 else total[p])
    return total


def _random_tree(rng, n):
    parent = np.array([-1] + [int(rng.integers(0, i)) for i in range(1, n)])
    branch = rng.uniform(0, 0.01, n) + 1j * rng.uniform(0, 0.01, n)
    return parent, branch


settings.register_profile("fault", max_examples=40, deadline=None)
settings.load_profile("fault")


@given(
    st.floats(1.0, 300.0),
    st.floats(0.0, 300.0),
    st.sampled_from(list(TABLE9_CU_STEEL)),
    st.integers(1, 4),
)
def test_current_falls_with_length(l1, extra, size, sets):
    r, x = _per_m(size)
    i1 = F.fault_current_3ph_a(208.0, ZT + F.branch_impedance_ohm(l1, r, x, sets))
    i2 = F.fault_current_3ph_a(208.0, ZT + F.branch_impedance_ohm(l1 + extra + 1e-3, r, x, sets))
    assert i2 < i1


@given(st.floats(1.0, 300.0), st.integers(1, 3))
def test_current_rises_with_size_and_sets(length, sets):
    order = ["4", "1/0", "4/0", "250", "500"]  # increasing area, Table 9 rows
    currents = [
        F.fault_current_3ph_a(208.0, ZT + F.branch_impedance_ohm(length, *_per_m(s), sets))
        for s in order
    ]
    assert np.all(np.diff(currents) > 0)
    more = F.fault_current_3ph_a(
        208.0, ZT + F.branch_impedance_ohm(length, *_per_m("4/0"), sets + 1)
    )
    assert more > currents[2]


@given(st.integers(1, 60), st.integers(0, 2**31 - 1))
def test_tree_walk_equals_naive_loop(n, seed):
    rng = np.random.default_rng(seed)
    parent, branch = _random_tree(rng, n)
    root = 0.001 + 0.004j
    np.testing.assert_allclose(
        F.cumulative_impedance_ohm(parent, branch, root),
        _naive_walk(parent, branch, root),
        rtol=1e-12,
        atol=0,
    )


def test_tree_walk_deep_chain_and_forest():
    n = 1000
    parent = np.arange(n) - 1  # a chain 1000 deep
    branch = np.full(n, 1e-4 + 2e-4j)
    got = F.cumulative_impedance_ohm(parent, branch, 0.0)
    np.testing.assert_allclose(got, branch * np.arange(1, n + 1), rtol=1e-12)
    # two roots, each takes its own root impedance
    parent = np.array([-1, 0, -1, 2, 3])
    root = np.array([1.0, 0, 2.0, 0, 0], dtype=complex)
    got = F.cumulative_impedance_ohm(parent, np.ones(5, dtype=complex), root)
    np.testing.assert_allclose(got.real, [2, 3, 3, 4, 5])


def test_subtree_sum_and_depth_match_loops():
    rng = np.random.default_rng(7)
    parent, _ = _random_tree(rng, 200)
    vals = rng.uniform(0, 10, 200)
    expect = vals.copy()
    for i in range(199, 0, -1):
        expect[parent[i]] += expect[i]
    np.testing.assert_allclose(F.subtree_sum(parent, vals), expect, rtol=1e-12)
    depth = np.zeros(200, dtype=int)
    for i in range(1, 200):
        depth[i] = depth[parent[i]] + 1
    assert F.node_depth(parent).tolist() == depth.tolist()


def test_radial_fault_vector_equals_scalar():
    parent = np.array([-1, 0, 1, 1])
    r, x = _per_m("4/0")
    lengths = np.array([0.0, 30.0, 15.0, 45.0])
    zmax = F.branch_impedance_ohm(lengths, r, x)
    zmax[0] = ZT * 0.925
    zmin = zmax * 1.2
    zmin[0] = ZT * 1.075
    res = F.radial_fault_3ph(
        parent, 208.0, zmax, zmin, 0.001 + 0.006j, 0.001 + 0.006j, motor_a=[0, 0, 120.0, 0]
    )
    for i in range(4):
        z = 0.001 + 0.006j + sum(zmax[j] for j in _path(parent, i))
        i_sym = F.fault_current_3ph_a(208.0, z)
        motors = 120.0 if i in (0, 1, 2) else 0.0  # node 2 and its ancestors
        assert res.fault_max_a[i] == pytest.approx(i_sym + motors, rel=1e-12)
        assert res.x_r[i] == pytest.approx(F.x_r_ratio(z), rel=1e-12)
        assert res.peak_a[i] == pytest.approx(F.peak_current_a(i_sym + motors, z.imag / z.real))
    assert np.all(res.fault_min_a < res.fault_max_a)


def test_radial_fault_base_voltage_referral():
    """Impedances referred to a 480 V base give the same current at a 208 V node."""
    z208 = ZT + 0.002 + 0.001j
    direct = F.fault_current_3ph_a(208.0, z208)
    z480 = F.refer_impedance_ohm(z208, 208.0, 480.0)
    res = F.radial_fault_3ph([-1], 208.0, [z480], [z480], base_voltage_ll_v=480.0)
    assert res.fault_max_a[0] == pytest.approx(direct, rel=1e-12)


def _path(parent, i):
    while i >= 0:
        yield i
        i = parent[i]


def test_vector_equals_scalar_kernels():
    v = np.array([208.0, 480.0, 240.0])
    i = np.array([10e3, 30e3, 5e3])
    xr = np.array([2.0, 6.0, 1.0])
    zs = F.source_impedance_ohm(v, i, xr)
    for k in range(3):
        assert zs[k] == F.source_impedance_ohm(v[k], i[k], xr[k])
        assert F.fault_current_3ph_a(v, zs + ZT)[k] == F.fault_current_3ph_a(v[k], zs[k] + ZT)
        assert F.asymmetric_rms_half_cycle_a(i, xr)[k] == F.asymmetric_rms_half_cycle_a(i[k], xr[k])
        assert F.peak_factor_kappa(xr)[k] == F.peak_factor_kappa(xr[k])
    lg = G.fault_current_lg_a(120.0, zs + ZT, np.full(3, ZT))
    assert lg[1] == G.fault_current_lg_a(120.0, zs[1] + ZT, ZT)


def test_source_infinite_and_referral():
    assert F.source_impedance_ohm(480.0, math.inf, 6.0) == 0
    zs = F.source_impedance_ohm(480.0, 30e3, 6.0)
    assert F.fault_current_3ph_a(480.0, zs) == pytest.approx(30e3, rel=1e-12)
    assert zs.imag / zs.real == pytest.approx(6.0)
    z208 = F.refer_impedance_ohm(zs, 480.0, 208.0)
    # through an ideal transformer the source's fault MVA is unchanged
    assert F.fault_current_3ph_a(208.0, z208) * 208.0 == pytest.approx(30e3 * 480.0)
    sc_va = math.sqrt(3) * 480.0 * 30e3
    assert F.source_impedance_from_sc_ohm(480.0, sc_va, 6.0) == pytest.approx(zs)


def test_tolerance_and_voltage_factor():
    zmax, zmin = F.transformer_fault_impedances_ohm(75e3, 208.0, 5.1, 3.5, 7.5)
    assert zmax == pytest.approx(ZT * 0.925) and zmin == pytest.approx(ZT * 1.075)
    base = F.fault_current_3ph_a(208.0, ZT)
    assert F.fault_current_3ph_a(208.0, ZT, c=1.05) == pytest.approx(1.05 * base)


def test_trip_check_and_fix_helpers_are_consistent():
    v = 120.0
    up = 3 * (0.0094 + 0.0302j)  # Z1 + Z2 + Z0 at the run's start
    zp = complex(*_per_m("4/0"))
    zr = complex(*_per_m("4"))
    chk = G.instantaneous_trip_check(2000.0, 225.0, 10.0, 20.0)
    assert chk.required_a == pytest.approx(2700.0) and not chk.trips
    lmax = G.max_length_for_trip_m(v, up, zp, zr, 2700.0)
    at = G.fault_current_lg_a(v, 0j, up + 3 * lmax * (zp + zr), z2_ohm=0j)
    assert at == pytest.approx(2700.0, rel=1e-9)
    longer = G.fault_current_lg_a(v, 0j, up + 3 * (lmax + 1) * (zp + zr), z2_ohm=0j)
    assert longer < 2700.0
    length = 10.0
    rmax = G.max_return_resistance_for_trip_ohm_per_m(v, up, length, zp, zr.imag, 2700.0)
    z = up + 3 * length * (zp + 1j * zr.imag + rmax)
    assert 3 * v / abs(z) == pytest.approx(2700.0, rel=1e-9)
    cands_r = np.array([_per_m(s)[0] for s in ("4", "1/0", "4/0")])
    k = G.smallest_return_for_trip(v, up, length, zp, cands_r, zr.imag, 2700.0)
    assert k >= 0 and k == int(np.flatnonzero(cands_r <= rmax)[0])
    assert G.smallest_return_for_trip(v, up, 300.0, zp, cands_r, zr.imag, 2700.0) == -1
    # already too weak upstream: no length helps
    assert G.max_length_for_trip_m(v, 0.5 + 0.5j, zp, zr, 2700.0) == 0.0


@pytest.mark.parametrize(
    ("call", "match"),
    [
        (lambda: F.source_impedance_ohm(480.0, -5.0, 6.0), "fault_a"),
        (lambda: F.source_impedance_ohm(480.0, 30e3, float("nan")), "x_r"),
        (lambda: F.fault_current_3ph_a(208.0, 0j), "infinite"),
        (lambda: F.fault_current_3ph_a(0.0, ZT), "voltage_ll_v"),
        (lambda: F.branch_impedance_ohm(-1.0, 1e-4, 1e-4), "length_m"),
        (lambda: F.branch_impedance_ohm(10.0, 1e-4, 1e-4, 1.5), "sets"),
        (lambda: F.cumulative_impedance_ohm([0, -1], [0j, 0j]), "parent_index"),
        (lambda: F.cumulative_impedance_ohm([-1, 0], [0j]), "one value per node"),
        (lambda: F.transformer_fault_impedances_ohm(75e3, 208.0, 5.1, 3.5, 120.0), "tolerance"),
        (lambda: G.fault_current_lg_a(120.0, -1 + 0j, ZT), "z1_ohm"),
        (lambda: G.instantaneous_trip_check(1e3, 0.0, 10.0), "device_a"),
    ],
)
def test_bad_input_raises(call, match):
    with pytest.raises(ValueError, match=match):
        call()
