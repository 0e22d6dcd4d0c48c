"""Motor, phase-loading, demand-chain, lighting and tap kernels against the code's rules
and published worked examples (issue 13). Each value names its source beside it."""

import math

import numpy as np
import pytest

from feedcheck.calc.demand_chain import demand_chain
from feedcheck.calc.lighting import M2_PER_FT2, minimum_lighting_load, unit_load_va_per_m2
from feedcheck.calc.motors import (
    MotorFlcTable,
    branch_conductor_min_a,
    branch_device_max_a,
    feeder_conductor_min_a,
    hp_from_kw,
    locked_rotor_multiple,
    motor_flc_a,
)
from feedcheck.calc.phase_loading import element_current_a, phase_loading, vdrop_factor
from feedcheck.calc.taps import parse_tap_pct, secondary_voltage_v
from feedcheck.tables import load_table

SQRT3 = math.sqrt(3)


def _flc_table(name):
    t = load_table(name)
    df = t.data
    return MotorFlcTable.from_named_columns(
        df["hp"], {c: df[c] for c in df.columns}, tuple(df["rule_id"])
    )


@pytest.fixture(scope="module")
def three_phase():
    return _flc_table("motor_flc_three_phase")


@pytest.fixture(scope="module")
def single_phase():
    return _flc_table("motor_flc_single_phase")


def _ratings(kind="breaker"):
    d = load_table("device_ratings").data
    return d.loc[d[kind] == "yes", "rating_a"].to_numpy(float)


def _percent(motor_type, column):
    d = load_table("motor_branch_device_max").data.set_index("motor_type")
    return float(d.loc[motor_type, column])


# ---- 430.6(A)(1): the table current by horsepower and voltage


@pytest.mark.parametrize(
    ("hp", "volts", "expected"),
    [
        (100, 480, 124),  # NFPA 70 Table 430.250, 460 V column serves 440–480 V (table note)
        (100, 460, 124),  # NFPA 70 Table 430.250
        (7.5, 240, 22),  # NFPA 70 Table 430.250, 230 V column serves 220–240 V
        (10, 208, 30.8),  # NFPA 70 Table 430.250, 208 V column
        (10, 200, 32.2),  # NFPA 70 Table 430.250, 200 V column
        (40, 600, 41),  # NFPA 70 Table 430.250, 575 V column serves 550–600 V
        (2, 120, 13.6),  # NFPA 70 Table 430.250, 115 V column serves 110–120 V
        (300, 2300, 72),  # NFPA 70 Table 430.250, 2300 V column
    ],
)
def test_three_phase_flc_by_hp_and_voltage(three_phase, hp, volts, expected):
    assert motor_flc_a(hp, volts, three_phase) == pytest.approx(expected)


@pytest.mark.parametrize(
    ("hp", "volts", "expected"),
    [
        (2, 230, 12),  # NFPA 70 Table 430.248
        (1, 120, 16),  # NFPA 70 Table 430.248, 115 V column serves 110–120 V
        (1 / 3, 115, 7.2),  # NFPA 70 Table 430.248
        (5, 240, 28),  # NFPA 70 Table 430.248, 230 V column serves 220–240 V
    ],
)
def test_single_phase_flc(single_phase, hp, volts, expected):
    assert motor_flc_a(hp, volts, single_phase) == pytest.approx(expected)


def test_kw_rating_at_746_w_per_hp(three_phase):
    # 7.5 kW = 10.05 hp at 746 W/hp (common practice, no source) -> the 10 hp row
    assert motor_flc_a(hp_from_kw(7.5), 480, three_phase) == 14  # NFPA 70 Table 430.250


@pytest.mark.parametrize(
    ("hp", "volts", "match"),
    [
        (4, 480, "between 3 and 5 hp"),
        (600, 480, "ends at 500 hp"),
        (250, 208, "no current"),  # NFPA 70 Table 430.250: dash above 200 hp at 208 V
        (10, 277, "277 V"),
        (10, 380, "380 V"),
    ],
)
def test_unlisted_hp_or_voltage_refused(three_phase, hp, volts, match):
    with pytest.raises(ValueError, match=match):
        motor_flc_a(hp, volts, three_phase)


def test_next_larger_row_on_request(three_phase):
    assert motor_flc_a(4, 480, three_phase, between="next-larger") == 7.6  # 5 hp row


# ---- 430.22, 430.52: one motor


def test_single_motor_worked_example(three_phase):
    """7-1/2 hp, 230 V, three-phase motor: 22 A x 1.25 = 27.5 A conductor; inverse-time
    breaker 22 A x 250 % = 55 A, next size up 60 A (NFPA 70 430.22, Table 430.52,
    430.52(C)(1) Exception No. 1, 240.6(A)); the same figures are worked in an exam-prep
    example quoted on forums.mikeholt.com thread 15136."""
    flc = motor_flc_a(7.5, 230, three_phase)
    assert flc == 22  # NFPA 70 Table 430.250
    assert branch_conductor_min_a(flc) == pytest.approx(27.5)  # NFPA 70 430.22
    r = branch_device_max_a(flc, _percent("squirrel-cage", "inverse_time_breaker_pct"), _ratings())
    assert r.limit_a == pytest.approx(55.0)  # Table 430.52: 250 %
    assert r.permitted_a == 60.0  # 430.52(C)(1) Ex. 1, Table 240.6(A)


def test_device_limit_that_is_a_standard_rating_is_not_raised():
    # 20 A x 250 % = 50 A is itself a standard rating (NFPA 70 Table 240.6(A))
    r = branch_device_max_a(20.0, 250, _ratings())
    assert r.permitted_a == 50.0


def test_time_delay_fuse_and_wound_rotor_percent(three_phase):
    flc = motor_flc_a(30, 460, three_phase)  # 40 A, NFPA 70 Table 430.250
    r = branch_device_max_a(
        flc, _percent("wound-rotor", "nontime_delay_fuse_pct"), _ratings("fuse")
    )
    assert (r.limit_a, r.permitted_a) == (60.0, 60.0)  # Table 430.52 wound rotor 150 %
    r = branch_device_max_a(flc, _percent("squirrel-cage", "time_delay_fuse_pct"), _ratings("fuse"))
    assert r.limit_a == pytest.approx(70.0)  # Table 430.52: 175 % of 40 A


# ---- 430.24: several motors


def test_feeder_of_several_motors_forum_case(three_phase):
    """Two 100 hp, one 60 hp and one 7-1/2 hp motor at 480 V: 124, 124, 77, 11 A
    (NFPA 70 Table 430.250); 430.24: 1.25 x 124 + 124 + 77 + 11 = 367 A (worked on
    forums.mikeholt.com thread 53887 against the 2002 edition)."""
    flc = motor_flc_a(np.array([100, 100, 60, 7.5]), 480, three_phase)
    assert flc.tolist() == [124, 124, 77, 11]
    assert feeder_conductor_min_a(flc) == pytest.approx(367.0)  # NFPA 70 430.24


def test_inverse_time_breaker_of_a_100_hp_motor():
    """100 hp, 480 V: 124 A (NFPA 70 Table 430.250) x 250 % (Table 430.52, inverse-time
    breaker) = 310 A, next standard rating 350 A (430.52(C)(1) Ex. 1, Table 240.6(A));
    the same figures are worked on forums.mikeholt.com thread 53887."""
    r = branch_device_max_a(
        124.0, _percent("squirrel-cage", "inverse_time_breaker_pct"), _ratings()
    )
    assert (r.limit_a, r.permitted_a) == (pytest.approx(310.0), 350.0)


def test_feeder_with_other_loads():
    # NFPA 70 430.24 (1)-(4): 125 % largest + others + 100 % noncontinuous + 125 % continuous
    got = feeder_conductor_min_a(
        [12.0, 11.0, 6.0], other_noncontinuous_a=10.0, other_continuous_a=8.0
    )
    assert got == pytest.approx(1.25 * 12 + 11 + 6 + 10 + 1.25 * 8)


def test_locked_rotor_below_full_load_is_an_input_error():
    with pytest.raises(ValueError, match="below the full-load current"):
        locked_rotor_multiple(15.0, 21.0)


# ---- single-phase elements on three-phase panels (issue 13 items 1 and 2)


def test_single_phase_48kva_on_480v_is_100a():
    """I = S / V_LL for a single-phase load between two lines (NFPA 70 Informative
    Annex D computes line-to-line loads at S / V; IEEE Std 141-1993 ch. 3)."""
    assert element_current_a(48_000, "AB", 480) == pytest.approx(100.0)
    r = phase_loading([48_000], [False], ["AB"], 480)
    assert r.noncontinuous_a.tolist() == pytest.approx([100.0, 100.0, 0.0])
    # not the three-phase figure 48,000 / (sqrt(3) x 480) = 57.7 A
    assert r.design_current_a != pytest.approx(48_000 / (SQRT3 * 480))


def test_single_phase_drop_is_twice_the_understated_figure():
    """Single-phase two-wire drop = 2 I R; three-phase = sqrt(3) I R (IEEE Std 141-1993,
    ch. 3): the 48 kVA load computed as three-phase gave half the real drop."""
    r_ohm = 0.01
    right = vdrop_factor(1) * element_current_a(48_000, "AB", 480) * r_ohm
    wrong = vdrop_factor(3) * element_current_a(48_000, "ABC", 480) * r_ohm
    assert right / wrong == pytest.approx(2.0)


def test_heaviest_phase_11_4_kva_continuous_on_a():
    """11.4 kVA continuous all on phase A of a 208Y/120 V panel: 95 A, 119 A at 125 %
    (NFPA 70-2023 215.2(A)(1), 210.19(A)(1)); the balanced average 31.6 A is not the
    design current (issue 13 item 2)."""
    r = phase_loading([11_400], [True], ["A"], 208)
    assert r.continuous_a[0] == pytest.approx(95.0, rel=2e-3)
    assert r.design_current_a == pytest.approx(119.0, rel=3e-3)
    assert r.heaviest_phase == "A"
    assert r.average_a == pytest.approx(95.0 / 3, rel=2e-3)
    assert r.imbalance_pct == pytest.approx(200.0)


# ---- the demand chain (issue 13 item 3)


def test_demand_chain_counts_the_largest_motor_once():
    """Hand calculation, NFPA 70 430.24 and 215.2(A)(1): 18,000 VA continuous non-motor
    load and one 28,300 VA motor. Demand 46,300 VA; + 25 % of the largest motor
    7,075 VA (430.24) once; + 25 % of the continuous non-motor load 4,500 VA
    (215.2(A)(1)) = 57,875 VA. The reported 53,375 VA x 1.25 = 66,718.75 VA counted the
    motor's 25 % twice and raised the motor again as continuous."""
    r = demand_chain({"lighting": 18_000, "motor": 28_300}, {"lighting": 18_000}, 28_300)
    assert r.demand_total_va == pytest.approx(46_300)
    assert r.largest_motor_adder_va == pytest.approx(7_075)  # 430.24
    assert r.continuous_adder_va == pytest.approx(4_500)  # 215.2(A)(1)
    assert r.design_va == pytest.approx(57_875)
    assert r.design_va != pytest.approx(1.25 * (18_000 + 28_300 + 7_075))


def test_demand_chain_annex_d_example_d3():
    """NFPA 70 Informative Annex D Example D3 (Store Building): receptacles 14,400 VA ->
    12,200 VA (220.44); continuous lighting 9,000 + 6,000 VA and sign 1,200 VA =
    16,200 VA; total 28,400 VA; the feeder takes the continuous part at 125 %."""
    receptacle = [(0, 10_000, 1.0), (10_000, math.inf, 0.5)]  # NFPA 70 Table 220.44
    r = demand_chain(
        {"lighting": 15_000, "receptacle": 14_400, "other": 1_200},
        {"lighting": 15_000, "other": 1_200},
        0.0,
        tiers={"receptacle": receptacle},
    )
    assert r.demand_va["receptacle"] == pytest.approx(12_200)  # Annex D Example D3
    assert r.demand_total_va == pytest.approx(28_400)  # Annex D Example D3
    assert r.continuous_demand_va == pytest.approx(16_200)  # Annex D Example D3
    assert r.design_va == pytest.approx(12_200 + 1.25 * 16_200)


def test_demand_chain_agrees_with_430_24_in_amperes():
    """The chain in VA and 430.24 in amperes give the same feeder at 480 V three-phase
    (124, 124, 77, 11 A: NFPA 70 Table 430.250; 367 A by 430.24)."""
    k = SQRT3 * 480
    motors = np.array([124, 124, 77, 11]) * k
    r = demand_chain({"motor": motors.sum()}, {}, motors.max())
    assert r.design_va / k == pytest.approx(367.0)


# ---- minimum lighting load (issue 13 item 9)


def test_minimum_lighting_office_sample_problem():
    """25,000 ft2 office at 3-1/2 VA/ft2 (NFPA 70-2017 Table 220.12) = 87,500 VA;
    continuous: x 1.25 = 109,375 VA (Modern Commercial Wiring, Goodheart-Willcox 2015,
    Sample Problem 12-1)."""
    unit = load_table("lighting_unit_loads").data.set_index("occupancy")
    va_ft2 = float(unit.loc["office", "va_per_ft2"])
    assert va_ft2 == 3.5  # NFPA 70-2017 Table 220.12 office buildings
    r = minimum_lighting_load(60_000, 25_000 * M2_PER_FT2, unit_load_va_per_m2(va_ft2))
    assert r.minimum_va == pytest.approx(87_500)
    assert r.used_va == pytest.approx(87_500)
    assert r.below
    chain = demand_chain({"lighting": r.used_va}, {"lighting": r.used_va}, 0.0)
    assert chain.design_va == pytest.approx(109_375)


# ---- no-load tap sign (issue 13 item 10)


def test_plus_tap_lowers_the_secondary():
    """A "+2.5 %" primary tap is rated 492 V on a 480 V winding (more turns): 480 V applied
    gives 208 x 480 / 492 = 202.9 V (turns ratio; nameplate tap convention of IEEE Std
    C57.12.00 — from memory)."""
    t = parse_tap_pct("+2.5 %")
    assert t == 2.5
    assert secondary_voltage_v(480, 480, 208, t) == pytest.approx(208 * 480 / 492)
    assert secondary_voltage_v(480, 480, 208, parse_tap_pct("-2.5 %")) > 208


def test_heaviest_phase_with_motors_430_24_per_phase(three_phase):
    """Per phase, 125 % of the largest motor on that phase + the other motors at 100 %
    (NFPA 70 430.24) + continuous other loads at 125 % (215.2(A)(1)). 480 V panel: two
    three-phase motors of 124 and 77 A (100 hp and 60 hp, NFPA 70 Table 430.250) and a
    48 kVA continuous single-phase load on AB (100 A, I = S / V_LL)."""
    k = SQRT3 * 480
    r = phase_loading(
        [124 * k, 77 * k, 48_000],
        [False, False, True],
        ["ABC", "ABC", "AB"],
        480,
        motor=[True, True, False],
    )
    a = 1.25 * 124 + 77 + 1.25 * 100
    c = 1.25 * 124 + 77
    assert r.design_a.tolist() == pytest.approx([a, a, c])
    assert r.design_current_a == pytest.approx(a)
