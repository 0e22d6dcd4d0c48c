"""Issue 13 item 1 (panels): a single-phase panel ("208 V 1ph", two wires) fed from a
three-phase panel takes S / V_LL on the two lines of its pair, drops with the
single-phase factor 2, and its pair is in the parent's phase loads, imbalance and design
current (checks/loads.py through the feed walk, read back from the JSON output)."""

from __future__ import annotations

import math

import pytest

from tests.checks.jobs import finding, node, run

JOB = """
[project]
name = "single-phase panel on a three-phase panel (invented)"

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
to = "DP"
length = "10 ft"
conductors = "4/0 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 4
ground = "4 AWG Cu"
device = "225 A"

[[panel]]
id = "DP"
rating = "225 A"

[[run]]
id = "R1"
from = "DP"
to = "SP"
length = "100 ft"
conductors = "4 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 2
ground = "8 AWG Cu"
device = "70 A"
termination = "75 degC"

[[panel]]
id = "SP"
rating = "100 A"
voltage = "208 V 1ph"
load = "10 kVA"
power_factor = 1.0
{pair}
"""


def _doc(check_json, pair='phases_connected = "B-C"'):
    return check_json(JOB.replace("{pair}", pair))


def test_single_phase_panel_draws_s_over_v_ll(check_json):
    """10 kVA at 208 V single-phase: I = S / V = 10,000 / 208 = 48.08 A on each of its
    two lines, not 10,000 / (√3 · 208) = 27.8 A (IEEE Std 141-1993 ch. 3; NFPA 70-2023
    Informative Annex D, line-to-line loads at S / V)."""
    doc = _doc(check_json)
    assert run(doc, "R1")["current_a"] == pytest.approx(10_000 / 208, rel=1e-9)


def test_single_phase_panel_drop_uses_factor_two(check_json):
    """VD = 2 · I · L · R at pf 1 (IEEE Std 141-1993 ch. 3, single-phase); 4 AWG Cu in
    PVC R = 0.31 Ω/kft at 75 °C (NFPA 70-2023 Ch. 9 Table 9): 2 × 48.08 × 0.1 × 0.31 =
    2.98 V = 1.43 % of 208 V (√3 would give 1.24 %)."""
    doc = _doc(check_json)
    hand = 2 * 10_000 / 208 * 0.100 * 0.31 / 208 * 100
    assert run(doc, "R1")["vdrop_approx_pct"] == pytest.approx(hand, rel=0.02)
    assert run(doc, "R1")["vdrop_pct"] == pytest.approx(hand, rel=0.02)


def test_parent_phase_loads_hold_the_pair(check_json):
    """DP carries 48.08 A on B and C and nothing on A: its design current is 48.08 A on
    the heaviest phase (B), not the 27.8 A balanced average (NFPA 70-2023 215.2(A)(1))."""
    doc = _doc(check_json)
    f = finding(doc, "DP", "load vs bus rating")
    assert f["value"] == pytest.approx(10_000 / 208, rel=1e-9)
    assert "heaviest phase (B)" in f["note"]
    assert node(doc, "DP")["design_current_a"] == pytest.approx(10_000 / 208, rel=1e-9)
    assert run(doc, "F")["current_a"] == pytest.approx(10_000 / 208, rel=1e-9)


def test_pair_assigned_to_balance_is_said(check_json):
    doc = _doc(check_json, pair="")
    f = finding(doc, "SP", "lines taken on the feed")
    assert f["status"] == "info" and "phases_connected" in f["note"] and "A-B" in f["note"]
    assert run(doc, "R1")["current_a"] == pytest.approx(10_000 / 208, rel=1e-9)


def test_line_to_line_fault_at_the_single_phase_panel(check_json):
    """A fault on the two lines of the pair is a line-to-line fault of the three-phase
    system: I_LL = V_LL / (2·Z_upstream + 2·Z_run) (IEEE Std 141-1993 ch. 4), with no
    run I_LL = (√3/2)·I_3ph. Checked by the ratio of the panel figure to the DP figure
    with the run impedance removed: at 0 ft both panels see the same upstream loop."""
    short = JOB.replace('length = "100 ft"', 'length = "0.01 ft"')
    doc = check_json(short.replace("{pair}", 'phases_connected = "B-C"'))
    i3 = node(doc, "DP")["fault_max_a"]
    ill = node(doc, "SP")["fault_max_a"]
    assert ill == pytest.approx(math.sqrt(3) / 2 * i3, rel=1e-3)


def test_pair_key_needs_a_single_phase_panel(write_job):
    from click.testing import CliRunner

    from feedcheck.cli import main

    text = JOB.replace("{pair}", 'phases_connected = "A-B"').replace('voltage = "208 V 1ph"\n', "")
    res = CliRunner().invoke(main, ["check", str(write_job(text))])
    assert res.exit_code == 2 and "panel[2].phases_connected" in res.output


def test_split_panel_needs_a_neutral_on_its_feed(write_job):
    from click.testing import CliRunner

    from feedcheck.cli import main

    text = JOB.replace("{pair}", "").replace('"208 V 1ph"', '"208/104 V"')
    res = CliRunner().invoke(main, ["check", str(write_job(text))])
    assert res.exit_code == 2 and "panel[2].voltage" in res.output


def test_two_wire_schedule_counts_a_two_pole_circuit_once(check_json, tmp_path):
    """A "208 V 1ph" panel with a schedule: one two-pole 2,080 VA circuit draws
    2,080 / 208 = 10 A on the pair (IEEE Std 141-1993 ch. 3, I = S / V single-phase),
    not 20 A (each pole counted on the one line of a two-wire panel, as before)."""
    (tmp_path / "SP.csv").write_text(
        "circuit,poles,load [VA],breaker [A],conductor,length [ft]\n1,2,2080,20,12 AWG Cu,50\n",
        encoding="utf-8",
    )
    text = JOB.replace("{pair}", 'phases_connected = "A-B"').replace(
        'load = "10 kVA"', 'schedule = "SP.csv"'
    )
    doc = check_json(text)
    assert run(doc, "R1")["current_a"] == pytest.approx(10.0, rel=1e-9)
    assert node(doc, "DP")["design_current_a"] == pytest.approx(10.0, rel=1e-9)


def test_pair_key_needs_a_three_phase_feed(write_job):
    """A single-phase panel under a single-phase feed takes that feed's lines: a pair
    there is an input error naming the key (exit 2)."""
    from click.testing import CliRunner

    from feedcheck.cli import main

    text = (
        JOB.replace("{pair}", 'phases_connected = "A-B"')
        .replace('secondary = "208Y/120 V"', 'secondary = "208 V 1ph"')
        .replace('primary = "480 V delta"\nsecondary', 'primary = "480 V 1ph"\nsecondary')
        .replace('rating = "225 A"\n', 'rating = "225 A"\nvoltage = "208 V 1ph"\n', 1)
    )
    res = CliRunner().invoke(main, ["check", str(write_job(text))])
    assert res.exit_code == 2, res.output
    assert "panel[2].phases_connected" in res.output and "not three-phase" in res.output
