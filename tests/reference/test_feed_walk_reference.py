"""The whole feed walk (job file → checks) against outside references.

Each test builds a small job, runs `feedcheck.runner.run_job`, and compares a node
figure with a value computed independently: a published formula by hand, a published
worked example, or the general-purpose library pandapower (IEC 60909).
"""

from __future__ import annotations

import math

import pytest

from feedcheck.runner import run_job

JOB = """
[project]
name = "reference"

[source]
voltage = "480 V delta"
available_fault = "{src}"
x_r = 6

[[transformer]]
id = "T"
rating = "{kva} kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "{z} %"
x_r = {xr}
primary_device = "{pdev} A"

[[run]]
id = "R"
from = "T"
to = "P"
length = "{length}"
conductors = "{cond}"
sets = {sets}
insulation = "75 degC"
raceway = "{raceway}"
ground = "{ground}"

[[panel]]
id = "P"
rating = "800 A"
load = "{load} kVA"
power_factor = {pf}

[options]
impedance_tolerance = "{tol} %"
"""


def _job(write_job, **kw):
    base = dict(
        src="infinite",
        kva=300,
        z=2.0,
        xr=4,
        pdev=450,
        length="20 ft",
        cond="500 kcmil Cu",
        sets=2,
        raceway="steel",
        ground="1/0 AWG Cu",
        load=100,
        pf=0.85,
        tol=0,
    )
    base.update(kw)
    return run_job(write_job(JOB.format(**base)))


def _node(results, node_id):
    return next(n for n in results.nodes if n.id == node_id).values


def test_infinite_bus_secondary_fault(write_job):
    # Infinite-bus formula I_sc = I_rated · 100 / %Z (IEEE Std 141-1993 ch. 4):
    # 300 kVA at 208 V: I = 300,000/(√3·208) = 832.7 A; /0.02 = 41,637 A
    res = _job(write_job)
    rated = 300e3 / (math.sqrt(3) * 208)
    assert _node(res, "T")["fault_max_a"] == pytest.approx(rated * 100 / 2.0, rel=1e-9)


def test_published_point_to_point_starting_figure(write_job):
    # Cooper Bussmann, Electrical Plan Review (2005), Part II point-to-point example,
    # Fault #1: 300 kVA, 2 %Z, 208Y/120 V,
    # infinite primary, %Z × 0.9 (a 10 % impedance tolerance) → 46,273 A at the secondary.
    res = _job(write_job, tol=10)
    assert _node(res, "T")["fault_max_a"] == pytest.approx(46_273, rel=5e-4)
    assert _node(res, "T")["fault_ptp_a"] == pytest.approx(46_273, rel=5e-4)


def test_pandapower_agrees_on_the_job_walk(write_job):
    """IEC 60909-0:2016 via pandapower (converted as in test_fault_pandapower.py) for the
    same network as
    the job: 480 V source 30 kA X/R 6, 75 kVA 5.1 % X/R 3.5, 95 ft of 4/0 Cu in steel."""
    pytest.importorskip("pandapower")
    from tests.kernels import ac_impedance_ohm_per_m
    from tests.reference.test_fault_pandapower import _pandapower_ikss

    res = _job(
        write_job,
        src="30 kA",
        kva=75,
        z=5.1,
        xr=3.5,
        pdev=110,
        length="95 ft",
        cond="4/0 AWG Cu",
        sets=1,
        ground="4 AWG Cu",
        load=40,
    )
    r, x = ac_impedance_ohm_per_m("4/0 AWG", "cu", "steel", conductor_c=20.0)
    expected = _pandapower_ikss(
        480.0, 208.0, 75e3, 5.1, 3.5, 30e3, 6.0, [(95 * 0.3048, float(r), float(x), 1)]
    )
    assert _node(res, "T")["fault_max_a"] == pytest.approx(expected[0], rel=0.02)
    assert _node(res, "P")["fault_max_a"] == pytest.approx(expected[1], rel=0.02)


def test_run_drop_matches_effective_impedance_by_hand(write_job):
    # NFPA 70 Ch. 9 Table 9 (2023), 250 kcmil Cu in steel conduit at 75 °C:
    # R = 0.054, XL = 0.052 Ω/1000 ft; Ze at 0.85 pf = 0.054·0.85 + 0.052·0.527 = 0.0733.
    # Three-phase approximate drop √3·I·L·Ze (IEEE Std 141 ch. 3): 100 kVA at 208 V,
    # I = 277.6 A; 100 ft → √3 × 277.6 × 0.1 kft × 0.0733 Ω/kft = 3.52 V = 1.69 % of 208 V.
    res = _job(
        write_job,
        cond="250 kcmil Cu",
        sets=1,
        length="100 ft",
        ground="4 AWG Cu",
        load=100,
        pf=0.85,
    )
    run = next(r for r in res.runs if r["id"] == "R")
    ze = 0.054 * 0.85 + 0.052 * math.sqrt(1 - 0.85**2)
    current = 100e3 / (math.sqrt(3) * 208)
    expected_pct = math.sqrt(3) * current * 0.1 * ze / 208 * 100
    assert run["vdrop_approx_pct"] == pytest.approx(expected_pct, rel=0.01)
    # the exact phasor form agrees with the approximate one at small drops
    assert run["vdrop_pct"] == pytest.approx(run["vdrop_approx_pct"], rel=0.01)


def test_fault_current_falls_along_the_feed(write_job):
    res = _job(write_job, src="30 kA", length="300 ft")
    t, p = _node(res, "T"), _node(res, "P")
    assert p["fault_max_a"] < t["fault_max_a"]
    assert p["fault_min_a"] < p["fault_max_a"]
    assert 0 < p["fault_lg_min_a"] < t["fault_lg_min_a"]


def test_bolted_lg_at_terminals_equals_three_phase_when_z0_equals_z1(write_job):
    # Symmetrical components (IEEE Std 141 ch. 4): at the secondary terminals of a
    # delta-wye transformer with Z0 = Z1 and an infinite source, I_LG = I_3ph.
    res = _job(write_job, tol=0)
    t = _node(res, "T")
    assert t["fault_lg_min_a"] == pytest.approx(t["fault_min_a"], rel=1e-9)


PRIMARY_RUN_JOB = """
[project]
name = "primary feeder"

[source]
voltage = "480 V delta"
available_fault = "infinite"

[[run]]
id = "PF"
from = "source"
to = "T"
length = "200 ft"
conductors = "4/0 AWG Cu"
raceway = "steel"
device = "150 A"

[[transformer]]
id = "T"
from = "source"
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5 %"
x_r = 3
primary_device = "110 A"

[[run]]
id = "S"
from = "T"
to = "P"
length = "10 ft"
conductors = "4/0 AWG Cu"
device = "250 A"

[[panel]]
id = "P"
rating = "225 A"
load = "30 kVA"
"""


def test_fault_at_the_far_end_of_a_primary_feeder(write_job):
    # NFPA 70 Ch. 9 Table 9: 4/0 Cu in steel conduit R = 0.063, XL = 0.051 Ω/kft at
    # 75 °C; Table 8 note: R20 = R75·[1 + 0.00323·(20 − 75)]. Infinite source, 200 ft:
    # I = (480/√3) / |0.2·(R20 + jXL)| (IEEE Std 141 ch. 4 ohmic method).
    res = run_job(write_job(PRIMARY_RUN_JOB))
    r20 = 0.063 * (1 + 0.00323 * (20 - 75))
    expected = 480 / math.sqrt(3) / abs(complex(0.2 * r20, 0.2 * 0.051))
    got = _node(res, "T")["fault_primary_max_a"]
    assert got == pytest.approx(expected, rel=0.01)
    assert _node(res, "T")["fault_primary_min_a"] < got
