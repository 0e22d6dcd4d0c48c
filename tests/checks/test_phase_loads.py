"""Issue 13 items 1 and 2: single-phase elements on three-phase feeds, and feeders,
buses, mains and windings judged on the heaviest phase (checks/loads.py through the
whole feed walk, read back from the JSON output)."""

from __future__ import annotations

import math

import pytest

from tests.checks.jobs import finding, node, run

SINGLE_PHASE_ON_480 = """
[project]
name = "single-phase unit on a three-phase panel (invented)"

[source]
voltage = "480 V delta"
available_fault = "infinite"
x_r = 6

[[transformer]]
id = "T1"
rating = "150 kVA"
primary = "480 V delta"
secondary = "480 V delta"
impedance = "2 %"
x_r = 3
primary_device = "250 A"

[[panel]]
id = "DP"
rating = "225 A"

[[run]]
id = "R0"
from = "T1"
to = "DP"
length = "10 ft"
conductors = "4/0 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 3
ground = "4 AWG Cu"
device = "225 A"

[[transformer]]
id = "T2"
from = "DP"
rating = "48 kVA"
primary = "480 V"
secondary = "120/240 V"
impedance = "2.5 %"
x_r = 2
primary_device = "125 A"
{pair}

[[run]]
id = "R1"
from = "DP"
to = "T2"
length = "100 ft"
conductors = "1/0 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 2
ground = "6 AWG Cu"
device = "125 A"

[[run]]
id = "R2"
from = "T2"
to = "LP"
length = "10 ft"
conductors = "4/0 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 3
ground = "4 AWG Cu"
device = "225 A"

[[panel]]
id = "LP"
rating = "225 A"
load = "48 kVA"
power_factor = 1.0
"""


def _r1(check_json, pair='phases_connected = "A-B"'):
    return check_json(SINGLE_PHASE_ON_480.replace("{pair}", pair))


def test_single_phase_unit_draws_s_over_v_ll(check_json):
    """48 kVA single-phase on 480 V: I = S / V_LL = 48,000 / 480 = 100 A on each of its
    two lines, not 48,000 / (√3 · 480) = 57.7 A (IEEE Std 141-1993 ch. 3; NFPA 70-2023
    Informative Annex D, line-to-line loads at S / V)."""
    doc = _r1(check_json)
    assert run(doc, "R1")["current_a"] == pytest.approx(100.0, rel=1e-9)
    # the 125 % rule sees 100 A of noncontinuous load on the run (215.2(A)(1))
    assert run(doc, "R1")["noncontinuous_a"] == pytest.approx(100.0, rel=1e-9)


def test_single_phase_unit_drop_uses_factor_two(check_json):
    """VD = 2 · I · L · (R cos θ + X sin θ) (IEEE Std 141-1993 ch. 3, single-phase);
    1/0 AWG Cu in PVC: R = 0.12 Ω/kft at 75 °C (NFPA 70-2023 Ch. 9 Table 9), pf 1:
    2 × 100 A × 0.100 kft × 0.12 Ω/kft = 2.40 V = 0.50 % of 480 V; today's figure was
    √3 × 57.7 A × 0.1 × 0.12 = 1.20 V (0.25 %), half of it."""
    doc = _r1(check_json)
    assert run(doc, "R1")["vdrop_approx_pct"] == pytest.approx(2.40 / 480 * 100, rel=0.02)
    assert run(doc, "R1")["vdrop_pct"] == pytest.approx(2.40 / 480 * 100, rel=0.02)


def test_parent_phase_loads_include_the_pair(check_json):
    """DP carries 100 A on A and B and nothing on C: its design current is 100 A, not the
    57.7 A balanced average (NFPA 70-2023 215.2(A)(1))."""
    doc = _r1(check_json)
    f = finding(doc, "DP", "load vs bus rating")
    assert f["value"] == pytest.approx(100.0, rel=1e-9)
    assert "heaviest phase (A)" in f["note"]
    assert run(doc, "R0")["noncontinuous_a"] == pytest.approx(100.0, rel=1e-9)


def test_pair_assigned_to_balance_is_said(check_json):
    doc = _r1(check_json, pair="")
    f = finding(doc, "T2", "lines taken on the feed")
    assert f["status"] == "info" and "phases_connected" in f["note"]
    assert run(doc, "R1")["current_a"] == pytest.approx(100.0, rel=1e-9)


def test_pair_must_be_a_pair(write_job):
    from click.testing import CliRunner

    from feedcheck.cli import main

    path = write_job(SINGLE_PHASE_ON_480.replace("{pair}", 'phases_connected = "A"'))
    res = CliRunner().invoke(main, ["check", str(path)])
    assert res.exit_code == 2
    assert "phases_connected" in res.output


HEAVY_A = """
[project]
name = "all lighting on phase A (invented)"

[source]
voltage = "480 V delta"
available_fault = "infinite"
x_r = 6

[[transformer]]
id = "T"
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5 %"
x_r = 3
primary_device = "125 A"
secondary_device = "250 A"

[[run]]
id = "F"
from = "T"
to = "LP"
length = "20 ft"
conductors = "8 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 4
ground = "10 AWG Cu"
device = "50 A"
termination = "75 degC"

[[panel]]
id = "LP"
rating = "60 A"
main_device = "50 A"
schedule = "HEAVY_A.csv"
"""

# three 3800 VA continuous lighting circuits, spaces 1, 7, 13: all on phase A
# (panelboard numbering 1,2 → A; 7,8 → A; 13,14 → A; common practice, no source)
SCHEDULE = (
    "circuit,poles,kind,continuous,load [VA],pf,breaker [A],conductor,length [ft]\n"
    "1,1,lighting,yes,3800,1,50,6 AWG Cu,10\n"
    "7,1,lighting,yes,3800,1,50,6 AWG Cu,10\n"
    "13,1,lighting,yes,3800,1,50,6 AWG Cu,10\n"
)


def _heavy(check_json, tmp_path):
    (tmp_path / "HEAVY_A.csv").write_text(SCHEDULE, encoding="utf-8")
    return check_json(HEAVY_A)


def test_heaviest_phase_design_current(check_json, tmp_path):
    """11.4 kVA continuous on phase A at 120 V: 95 A, 118.75 A at 125 % (NFPA 70-2023
    215.2(A)(1)); the balanced average 11,400 / (√3 · 208) = 31.6 A (39.6 A at 125 %) is
    what passed before."""
    doc = _heavy(check_json, tmp_path)
    assert node(doc, "LP")["design_current_a"] == pytest.approx(1.25 * 11400 / 120, rel=1e-9)
    assert 1.25 * 11400 / (math.sqrt(3) * 208) == pytest.approx(39.55, rel=1e-3)


@pytest.mark.parametrize(
    ("subject", "check", "value", "limit"),
    [
        ("LP", "load vs bus rating", 118.75, 60.0),  # 408.30
        ("LP", "load vs main device", 118.75, 50.0),  # 408.36, 215.3
        ("LP", "demand vs bus rating", 118.75, 60.0),  # the schedule's own check
        ("LP", "demand vs main device", 118.75, 50.0),
        ("F", "device vs load", 50.0, 118.75),  # 215.3: device ≥ 125 % continuous
        ("F", "ampacity vs 125 % continuous + noncontinuous", 118.75, 50.0),  # 215.2(A)(1)
    ],
)
def test_heaviest_phase_fails_feeder_bus_and_main(
    check_json, tmp_path, subject, check, value, limit
):
    """8 AWG Cu at 75 °C: 50 A (NFPA 70-2023 Table 310.16) < 118.75 A; a 50 A main and
    a 60 A bus below 118.75 A: all fail now (all passed on the 39.6 A average)."""
    doc = _heavy(check_json, tmp_path)
    f = finding(doc, subject, check)
    assert f["status"] == "fail", f
    assert (f["value"], f["limit"]) == pytest.approx((value, limit), rel=1e-9)


def test_transformer_winding_heaviest_phase(check_json, tmp_path):
    """75 kVA 208Y/120 V: rated 75,000 / (√3 · 208) = 208.2 A per winding; phase A design
    118.75 A (IEEE Std C57.12.00 rated current; NFPA 70-2023 215.2(A)(1))."""
    doc = _heavy(check_json, tmp_path)
    f = finding(doc, "T", "winding loading (heaviest phase)")
    assert f["value"] == pytest.approx(118.75, rel=1e-9)
    assert f["limit"] == pytest.approx(75000 / (math.sqrt(3) * 208), rel=1e-9)
    assert f["status"] == "ok"


def test_unbalanced_secondary_carried_to_the_primary_is_stated(write_job, tmp_path):
    """The delta primary of a 208Y/120 V unit sees 11.4 kVA on phase a as a single-phase
    load on one primary pair: 11,400 / 480 = 23.75 A on two lines (NFPA 70-2023
    Informative Annex D, line-to-line loads at S / V); the report says how."""
    from feedcheck.runner import run_job

    (tmp_path / "HEAVY_A.csv").write_text(SCHEDULE, encoding="utf-8")
    res = run_job(write_job(HEAVY_A))
    assert any("T: the secondary phases are unequally loaded" in a for a in res.assumptions)
    r = next(
        x
        for x in res.findings
        if x.subject == "T" and x.check == "winding loading (heaviest phase)"
    )
    assert r.value == pytest.approx(118.75, rel=1e-9)
