"""Properties of the load kernels: vector = scalar, limiting cases, conservation,
monotonicity, invalid input. (No published values here: see tests/reference.)"""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from feedcheck.calc.demand_chain import demand_chain, tiered_demand_va
from feedcheck.calc.lighting import minimum_lighting_load
from feedcheck.calc.motors import (
    MotorFlcTable,
    branch_conductor_min_a,
    branch_device_max_a,
    feeder_conductor_min_a,
    locked_rotor_multiple,
    motor_flc_a,
    motor_flc_row,
    table_column_voltage_v,
)
from feedcheck.calc.phase_loading import (
    assign_connections,
    element_current_a,
    phase_currents_a,
    phase_loading,
    vdrop_factor,
)
from feedcheck.calc.taps import parse_tap_pct, secondary_voltage_v

# invented table for the properties (not an oracle of values)
T = MotorFlcTable(
    [1, 2, 5, 10],
    [115, 230, 460],
    [[8.0, 4.0, np.nan], [12.0, 6.0, 3.0], [np.nan, 15.0, 7.5], [np.nan, 28.0, 14.0]],
)
loads = st.lists(st.floats(0, 1e6, allow_nan=False), min_size=1, max_size=12)


def test_motor_vector_equals_scalar():
    hp = np.array([1, 2, 5, 10])
    v = np.array([120, 240, 480, 460])
    vec = motor_flc_a(hp, v, T)
    assert vec.tolist() == [motor_flc_a(h, x, T) for h, x in zip(hp, v, strict=True)]


def test_motor_flc_increases_with_hp_and_falls_with_voltage():
    assert np.all(np.diff(motor_flc_a(np.array([2, 5, 10]), 460, T)) > 0)
    assert np.all(np.diff(motor_flc_a(2, np.array([115, 230, 460]), T)) < 0)


def test_voltage_ranges_edges():
    cols = [115, 230, 460, 575]
    assert table_column_voltage_v(110, cols) == 115 and table_column_voltage_v(220, cols) == 230
    for bad in (109, 121, 219, 241, 439, 481, 549, 601, 0):
        with pytest.raises(ValueError, match="voltage_v"):
            table_column_voltage_v(bad, cols)


def test_hp_within_one_percent_is_the_row():
    assert motor_flc_row(4.96, T) == 2  # 3.7 kW = 4.96 hp -> 5 hp row
    with pytest.raises(ValueError, match="between 5 and 10 hp"):
        motor_flc_row(7, T)
    with pytest.raises(ValueError, match="below the first row, 1 hp"):
        motor_flc_row(0.5, T)
    assert motor_flc_row(0.5, T, between="next-larger") == 0
    with pytest.raises(ValueError, match="between"):
        motor_flc_row(3, T, between="largest")


@pytest.mark.parametrize("bad", [0, -1, math.nan, math.inf])
def test_motor_invalid_hp(bad):
    with pytest.raises(ValueError, match="hp"):
        motor_flc_a(bad, 460, T)


def test_table_validation():
    with pytest.raises(ValueError, match="increasing"):
        MotorFlcTable([2, 1], [460], [[1.0], [2.0]])
    with pytest.raises(ValueError, match="shape"):
        MotorFlcTable([1, 2], [460], [[1.0]])


@given(st.lists(st.floats(0.1, 2000), min_size=1, max_size=10))
def test_feeder_at_least_largest_branch_and_sum(flc):
    f = feeder_conductor_min_a(flc)
    assert f >= branch_conductor_min_a(max(flc)) - 1e-9
    assert f == pytest.approx(sum(flc) + 0.25 * max(flc))


def test_feeder_vectorised_over_feeders():
    m = np.array([[10.0, 5.0, 0.0], [7.0, 7.0, 7.0]])
    out = feeder_conductor_min_a(m, other_continuous_a=np.array([0.0, 4.0]))
    assert out.tolist() == pytest.approx([17.5, 1.25 * 7 + 14 + 5.0])


@given(st.floats(0.5, 2000), st.sampled_from([150, 175, 250, 300, 800, 1100]))
def test_device_permitted_is_next_standard(flc, pct):
    r = np.array(
        [
            15,
            20,
            25,
            30,
            35,
            40,
            45,
            50,
            60,
            70,
            80,
            90,
            100,
            110,
            125,
            150,
            175,
            200,
            225,
            250,
            300,
            350,
            400,
            450,
            500,
            600,
            700,
            800,
            1000,
            1200,
            1600,
            2000,
            2500,
            3000,
            4000,
            5000,
            6000,
            30000,
        ],
        float,
    )
    out = branch_device_max_a(flc, pct, r)
    assert out.permitted_a >= out.limit_a * (1 - 1e-12)
    i = int(np.searchsorted(r, out.permitted_a))
    assert i == 0 or r[i - 1] < out.limit_a * (1 - 1e-12)


def test_device_errors():
    with pytest.raises(ValueError, match="largest standard rating"):
        branch_device_max_a(5000.0, 250, [15, 20, 6000])
    with pytest.raises(ValueError, match="> 0"):
        branch_device_max_a(0.0, 250, [15])


def test_locked_rotor_vector_and_errors():
    assert locked_rotor_multiple(np.array([60.0, 120.0]), 10.0).tolist() == [6.0, 12.0]
    assert locked_rotor_multiple(10.0, 10.0) == 1.0
    with pytest.raises(ValueError, match="9 A, below"):
        locked_rotor_multiple(np.array([60.0, 9.0]), 10.0)
    with pytest.raises(ValueError, match="> 0"):
        locked_rotor_multiple(0.0, 10.0)


# ---- phase loading


@given(loads)
def test_phase_current_conservation(s):
    """Each L-L load appears on two phases, each L-N load on one, three-phase on three."""
    s = np.array(s)
    conns = (["AB", "BC", "CA", "A", "B", "C", "ABC"] * 2)[: len(s)]
    i = phase_currents_a(s, conns, 480)
    per = np.array([element_current_a(x, c, 480) for x, c in zip(s, conns, strict=True)])
    n = np.array([len(c) for c in conns])
    assert i.sum() == pytest.approx((per * n).sum(), rel=1e-9, abs=1e-9)


def test_element_vector_equals_scalar():
    s = np.array([1e3, 2e3, 3e3])
    c = ["AB", "A", "ABC"]
    assert element_current_a(s, c, 208).tolist() == pytest.approx(
        [element_current_a(x, y, 208) for x, y in zip(s, c, strict=True)]
    )


@given(st.lists(st.floats(1, 1e5), min_size=1, max_size=9))
@settings(max_examples=50)
def test_assignment_deterministic_and_no_worse_than_one_pair(s):
    conns = assign_connections(s, ["LL"] * len(s), 480)
    assert conns == assign_connections(s, ["LL"] * len(s), 480)
    assert set(conns) <= {"AB", "BC", "CA"}
    balanced = phase_currents_a(s, conns, 480).max()
    lumped = phase_currents_a(s, ["AB"] * len(s), 480).max()
    assert balanced <= lumped + 1e-9


def test_assignment_keeps_given_connections_and_fills_lightest():
    conns = assign_connections([10e3, 5e3, 5e3], ["AB", "LN", "LL"], 480)
    assert conns[0] == "AB"
    assert conns[1] == "C"  # A and B carry the 10 kVA pair; C is the lightest phase
    assert conns[2] in ("BC", "CA")


def test_phase_loading_balanced_three_phase_has_no_imbalance():
    r = phase_loading([30e3, 30e3], [True, False], ["ABC", "ABC"], 480)
    assert r.imbalance_pct == pytest.approx(0.0, abs=1e-9)
    i = 30e3 / (math.sqrt(3) * 480)
    assert r.design_current_a == pytest.approx(1.25 * i + i)


def test_phase_loading_errors():
    with pytest.raises(ValueError, match="connection"):
        phase_loading([1e3], [False], ["AN"], 480)
    with pytest.raises(ValueError, match="voltage_ll_v"):
        element_current_a(1e3, "AB", 0)
    with pytest.raises(ValueError, match="assigned first"):
        phase_currents_a([1e3], ["LL"], 480)
    with pytest.raises(ValueError, match="phases"):
        vdrop_factor(2)


def test_empty_panel_has_zero_current():
    r = phase_loading([0.0], [False], ["A"], 208)
    assert r.design_current_a == 0.0 and r.imbalance_pct == 0.0


# ---- demand chain


@given(st.floats(0, 1e6), st.floats(0, 1e6), st.floats(0, 1))
def test_chain_steps_each_once(light, motor, frac):
    big = motor * frac
    r = demand_chain({"lighting": light, "motor": motor}, {"lighting": light}, big)
    assert r.design_va == pytest.approx(light * 1.25 + motor + 0.25 * big)
    assert r.design_va >= r.demand_total_va >= 0


def test_second_equal_motor_adds_its_load_once():
    one = demand_chain({"motor": 10e3}, {}, 10e3).design_va
    two = demand_chain({"motor": 20e3}, {}, 10e3).design_va
    assert two - one == pytest.approx(10e3)


def test_chain_vectorised_over_panels():
    r = demand_chain(
        {"lighting": np.array([1e3, 2e3]), "motor": np.array([0.0, 4e3])},
        {"lighting": np.array([1e3, 0.0])},
        np.array([0.0, 4e3]),
    )
    assert np.asarray(r.design_va).tolist() == pytest.approx([1250.0, 7000.0])


def test_chain_errors():
    with pytest.raises(ValueError, match="unknown kind"):
        demand_chain({"lights": 1.0}, {}, 0.0)
    with pytest.raises(ValueError, match=r"430\.24"):
        demand_chain({"motor": 1.0}, {"motor": 1.0}, 1.0)
    with pytest.raises(ValueError, match="above the connected"):
        demand_chain({"lighting": 1.0}, {"lighting": 2.0}, 0.0)
    with pytest.raises(ValueError, match="largest_motor_va"):
        demand_chain({"motor": 1.0}, {}, 2.0)
    with pytest.raises(ValueError, match="tiers"):
        tiered_demand_va(1.0, [(1, math.inf, 1.0)])


@given(st.floats(0, 1e7), st.floats(0, 1e7))
def test_tiers_monotonic(a, b):
    t = [(0, 10e3, 1.0), (10e3, math.inf, 0.5)]
    lo, hi = sorted((a, b))
    assert tiered_demand_va(lo, t) <= tiered_demand_va(hi, t) + 1e-9


# ---- lighting, taps


@given(st.floats(0, 1e6), st.floats(0, 1e5), st.floats(0, 100))
def test_lighting_used_is_the_larger(s, area, unit):
    r = minimum_lighting_load(s, area, unit)
    assert r.used_va == max(s, area * unit)
    assert r.below == (s < area * unit * (1 - 1e-12))


def test_lighting_vector_and_errors():
    r = minimum_lighting_load(np.array([1e3, 5e3]), 100.0, 20.0)
    assert r.below.tolist() == [True, False]
    with pytest.raises(ValueError, match="area_m2"):
        minimum_lighting_load(1e3, -1.0, 20.0)


@pytest.mark.parametrize(
    ("text", "pct"),
    [
        ("+2.5 %", 2.5),
        ("+2.5%", 2.5),
        ("-5 %", -5.0),
        ("- 2.5", -2.5),
        ("+5", 5.0),
        ("2.5 % above normal", 2.5),
        ("5% below", -5.0),
        ("7.5 % BELOW NOMINAL", -7.5),
        ("0", 0.0),
        ("0 %", 0.0),
        ("nominal", 0.0),
        ("+0", 0.0),
    ],
)
def test_tap_spellings_accepted(text, pct):
    assert parse_tap_pct(text) == pct


@pytest.mark.parametrize(
    ("text", "match"),
    [
        ("2.5 %", "expected a signed percent"),
        ("2.5", "expected a signed percent"),
        ("boost 2.5 %", "ambiguous"),
        ("+2.5 % buck", "ambiguous"),
        ("raise 5%", "ambiguous"),
        ("lower 2.5", "ambiguous"),
        ("±2.5 %", "ambiguous"),
        ("+/-5", "ambiguous"),
        ("5 % up", "ambiguous"),
        ("+12.5 %", "at most"),
        ("FCAN", "expected a signed"),
        ("", "expected a signed"),
    ],
)
def test_tap_spellings_refused(text, match):
    with pytest.raises(ValueError, match=match):
        parse_tap_pct(text)


def test_tap_not_text():
    with pytest.raises(ValueError, match="expected text"):
        parse_tap_pct(2.5)


@given(st.floats(-10, 10), st.floats(-10, 10))
def test_secondary_falls_as_tap_rises(a, b):
    lo, hi = sorted((a, b))
    assert secondary_voltage_v(480, 480, 208, hi) <= secondary_voltage_v(480, 480, 208, lo)


def test_secondary_at_nominal_and_vector():
    assert secondary_voltage_v(480, 480, 208, 0) == pytest.approx(208)
    out = secondary_voltage_v(np.array([480, 456]), 480, 208, np.array([0, -5]))
    assert out.tolist() == pytest.approx([208, 208])
    with pytest.raises(ValueError, match="tap_pct"):
        secondary_voltage_v(480, 480, 208, 20)


def test_motor_adder_is_per_phase_and_once():
    # two single-phase motors on different pairs: each phase takes 25 % of its own largest
    r = phase_loading([4800.0, 2400.0], [False, False], ["AB", "BC"], 480, motor=[True, True])
    i1, i2 = 10.0, 5.0
    assert r.design_a.tolist() == pytest.approx([1.25 * i1, i1 + i2 + 0.25 * i1, 1.25 * i2])
    with pytest.raises(ValueError, match="not also a continuous"):
        phase_loading([4800.0], [True], ["AB"], 480, motor=[True])


def test_chain_factors_from_rule_rows():
    r = demand_chain(
        {"motor": 10e3, "lighting": 1e3},
        {"lighting": 1e3},
        10e3,
        largest_motor_factor=1.25,
        continuous_factor=1.25,
    )
    assert r.design_va == pytest.approx(11e3 + 2500 + 250)
    with pytest.raises(ValueError, match="largest_motor_factor"):
        demand_chain({"motor": 1.0}, {}, 1.0, largest_motor_factor=0.8)
