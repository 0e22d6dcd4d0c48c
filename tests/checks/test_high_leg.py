"""Issue 14 item 5: the 240/120 V four-wire delta with a high leg (B, 208 V to neutral):
the system spelling, 120 V loads only on the legs beside the neutral tap, the marking
(110.15) and position (408.3(E)(1)) notes, and fault and drop figures per leg."""

from __future__ import annotations

import cmath
import math

import pytest

from feedcheck.units import UnitParseError, parse_voltage_system
from tests.checks.jobs import finding, node, run

JOB = """
[project]
name = "high-leg delta shop (invented)"

[source]
voltage = "480 V delta"
available_fault = "infinite"
x_r = 6

[[transformer]]
id = "T"
rating = "75 kVA"
primary = "480 V delta"
secondary = "240/120 V high-leg delta"
impedance = "3 %"
x_r = 2
primary_device = "125 A"
secondary_device = "225 A"

[[run]]
id = "F"
from = "T"
to = "HL"
length = "100 ft"
conductors = "1/0 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 4
ground = "6 AWG Cu"
device = "150 A"

[[panel]]
id = "HL"
rating = "225 A"
load = "30 kVA"
power_factor = 1.0
{schedule}

[[run]]
id = "R2"
from = "HL"
to = "SP"
length = "20 ft"
conductors = "6 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 2
ground = "10 AWG Cu"
device = "60 A"
termination = "75 degC"

[[panel]]
id = "SP"
rating = "100 A"
voltage = "240/120 V"
load = "12 kVA"
power_factor = 1.0
{pair}

[options]
impedance_tolerance = "0 %"
"""


def _doc(check_json, pair="", schedule=""):
    return check_json(JOB.replace("{pair}", pair).replace("{schedule}", schedule))


@pytest.mark.parametrize(
    "text", ["240/120 V high-leg delta", "240/120 V delta high-leg", "240/120 V high leg delta"]
)
def test_spellings(text):
    v = parse_voltage_system(text)
    assert (v.kind, v.phases, v.voltage_ll_v, v.voltage_ln_v) == ("highleg", 3, 240.0, 120.0)


def test_neutral_must_be_half_the_line_voltage():
    with pytest.raises(UnitParseError, match="high-leg"):
        parse_voltage_system("240/100 V high-leg delta")


def test_three_phase_fault_at_the_terminals(check_json):
    """Infinite bus: I = S / (√3 · V · Z) = 75,000 / (√3 × 240 × 0.03) = 6014 A (IEEE Std
    141-1993 ch. 4, the infinite-bus through-fault formula; tolerance 0 %)."""
    doc = _doc(check_json)
    assert node(doc, "T")["fault_max_a"] == pytest.approx(75_000 / (math.sqrt(3) * 240 * 0.03))


def test_line_to_neutral_per_leg_at_the_terminals(check_json):
    """Hand calculation by Thévenin's theorem (IEEE Std 141-1993 ch. 4 network reduction):
    Z_Y = 0.03 × 240² / 75,000 = 0.02304 Ω, Z_Δ = 3·Z_Y = 0.06912 Ω. A (or C) to neutral:
    120 V / (5/12 × 0.06912) = 4167 A; B (high leg, 207.8 V) to neutral: 207.8 V /
    (3/4 × 0.06912) = 4009 A; 0.693 and 0.667 of the three-phase 6014 A."""
    doc = _doc(check_json)
    t = node(doc, "T")
    assert t["fault_ln_max_a"] == pytest.approx(120 / (5 / 12 * 0.06912), rel=1e-4)
    assert t["fault_high_leg_max_a"] == pytest.approx(207.846 / (0.75 * 0.06912), rel=1e-4)
    # the minimum line-to-neutral walk bounds both legs from below: B-N governs here
    assert t["fault_lg_min_a"] == pytest.approx(t["fault_high_leg_max_a"], rel=1e-6)


def test_line_to_neutral_per_leg_at_the_panel(check_json):
    """Through the feeder the line and the neutral add in series: I = V_oc / |Z_th +
    2·Z_run|. Z_T and Z_run are recovered from the walk's three-phase figures at T and
    HL (I = V / (√3·|Z|) with their X/R, IEEE Std 141-1993 ch. 4), then the hand
    calculation of the previous test is repeated with them."""
    doc = _doc(check_json)

    def z_of(n):
        x = node(doc, n)
        mag = 240 / (math.sqrt(3) * x["fault_max_a"])
        return cmath.rect(mag, math.atan(x["x_r"]))

    zt, zhl = z_of("T"), z_of("HL")
    zrun = zhl - zt
    hl = node(doc, "HL")
    assert hl["fault_ln_max_a"] == pytest.approx(120 / abs(5 / 4 * zt + 2 * zrun), rel=1e-3)
    assert hl["fault_high_leg_max_a"] == pytest.approx(
        207.846 / abs(9 / 4 * zt + 2 * zrun), rel=1e-3
    )


def test_drop_per_leg(check_json):
    """HL: 30 kVA three-phase, 30,000 / (√3 × 240) = 72.2 A per line, plus the 120/240 V
    panel SP on C-A: 12,000 / 240 = 50 A on A and C. 1/0 AWG Cu in PVC R = 0.12 Ω/kft at
    75 °C (NFPA 70-2023 Ch. 9 Table 9), 100 ft, pf 1: A and C 2 × 122.2 × 0.012 / 120 =
    2.44 %, B √3 × 72.2 × 0.012 / 240 = 0.63 % (IEEE Std 141-1993 ch. 3 factors 2 and √3)."""
    doc = _doc(check_json)
    f = run(doc, "F")
    i_3 = 30_000 / (math.sqrt(3) * 240)
    assert f["vdrop_a_pct"] == pytest.approx(2 * (i_3 + 50) * 0.012 / 120 * 100, rel=0.02)
    assert f["vdrop_c_pct"] == pytest.approx(f["vdrop_a_pct"], rel=1e-9)
    assert f["vdrop_b_pct"] == pytest.approx(math.sqrt(3) * i_3 * 0.012 / 240 * 100, rel=0.02)


def test_split_panel_takes_the_legs_beside_the_neutral(check_json):
    """SP (120/240 V) sits on C-A, never on the high leg: HL's heaviest phase is A at
    72.2 + 50 = 122.2 A, B carries the three-phase share only (NFPA 70-2023 408.3(E)(1))."""
    doc = _doc(check_json)
    assert node(doc, "HL")["design_current_a"] == pytest.approx(
        30_000 / (math.sqrt(3) * 240) + 50, rel=1e-9
    )
    assert "heaviest phase (A)" in finding(doc, "HL", "load vs bus rating")["note"]


def test_split_panel_on_the_high_leg_is_refused(write_job):
    from click.testing import CliRunner

    from feedcheck.cli import main

    text = JOB.replace("{pair}", 'phases_connected = "A-B"').replace("{schedule}", "")
    res = CliRunner().invoke(main, ["check", str(write_job(text))])
    assert res.exit_code == 2 and "panel[2].phases_connected" in res.output
    assert "high leg" in res.output


def test_marking_and_position_are_stated(check_json):
    doc = _doc(check_json)
    for n in ("T", "HL"):
        m = finding(doc, n, "high-leg marking")
        assert m["status"] == "info" and "orange" in m["note"] and "110.15" in m["note"]
        p = finding(doc, n, "high-leg position")
        assert p["status"] == "info" and "408.3(E)(1)" in p["note"]
    assert not [f for f in doc["findings"] if f["subject"] == "SP" and "high-leg" in f["check"]]


def test_one_pole_circuit_on_the_high_leg_fails(check_json, tmp_path):
    """Spaces 1-2 → A, 3-4 → B, 5-6 → C (common practice, no source); a one-pole 120 V
    circuit in space 3 is on the high leg, 208 V to neutral (NFPA 70-2023 408.3(E)(1));
    a two-pole 240 V circuit on B-C is fine."""
    (tmp_path / "HL.csv").write_text(
        "circuit,poles,load [VA],breaker [A],conductor,length [ft]\n"
        "1,1,1200,20,12 AWG Cu,50\n"
        "3,1,1200,20,12 AWG Cu,50\n"
        "4,2,2400,20,12 AWG Cu,50\n",
        encoding="utf-8",
    )
    doc = _doc(check_json, schedule='schedule = "HL.csv"')
    bad = [f for f in doc["findings"] if f["rule_id"] == "sched-high-leg"]
    assert [f["subject"] for f in bad] == ["HL/3"] and bad[0]["status"] == "fail"
