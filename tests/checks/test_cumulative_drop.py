"""Issue 13 item 6: the informational 3 % feeder limit applies to the feeder as a whole
(every run from the transformer secondary to the panel), not run by run (NFPA 70-2023
215.2(A)(1) Informational Note No. 2: 3 % feeder, 5 % feeder plus branch)."""

from __future__ import annotations

import math

import pytest

from tests.checks.jobs import finding, run

TWO_RUNS = """
[project]
name = "two feeder runs in series (invented)"

[source]
voltage = "480 V delta"
available_fault = "infinite"
x_r = 6

[[transformer]]
id = "T"
rating = "150 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "2 %"
x_r = 3
primary_device = "250 A"
secondary_device = "450 A"

[[run]]
id = "A"
from = "T"
to = "P1"
length = "200 ft"
conductors = "1/0 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 3
ground = "6 AWG Cu"
device = "125 A"

[[panel]]
id = "P1"
rating = "225 A"

[[run]]
id = "B"
from = "P1"
to = "P2"
length = "200 ft"
conductors = "1/0 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 3
ground = "6 AWG Cu"
device = "125 A"

[[panel]]
id = "P2"
rating = "225 A"
load = "36 kVA"
power_factor = 1.0
"""


def test_feeder_limit_counts_every_run_to_the_panel(check_json):
    """36 kVA at 208 V: I = 36,000 / (√3 · 208) = 99.9 A; 1/0 AWG Cu in PVC R = 0.12
    Ω/kft at 75 °C (NFPA 70-2023 Ch. 9 Table 9), pf 1: each 200 ft run drops
    √3 × 99.9 × 0.2 × 0.12 = 4.15 V = 2.0 % (IEEE Std 141-1993 ch. 3). Each run alone
    is within 3 %; the feeder as a whole (4.0 %) is not."""
    doc = check_json(TWO_RUNS)
    hand = math.sqrt(3) * 36000 / (math.sqrt(3) * 208) * 0.2 * 0.12 / 208 * 100
    a, b = run(doc, "A"), run(doc, "B")
    assert a["vdrop_pct"] == pytest.approx(hand, rel=0.03)
    assert b["vdrop_pct"] == pytest.approx(hand, rel=0.03)
    fa, fb = finding(doc, "A", "feeder voltage drop"), finding(doc, "B", "feeder voltage drop")
    assert fa["status"] == "ok" and fa["value"] == pytest.approx(a["vdrop_pct"])
    assert fb["value"] == pytest.approx(a["vdrop_pct"] + b["vdrop_pct"], rel=1e-9)
    assert fb["value"] == pytest.approx(2 * hand, rel=0.03) and fb["limit"] == 3.0
    assert fb["status"] == "warn"  # the recommended (informational) limits warn


def test_total_limit_counts_feeder_and_branch(check_json, tmp_path):
    """The 5 % of 215.2(A)(1) Informational Note No. 2 (NFPA 70-2023) is feeder plus
    branch: a 1,200 VA 120 V circuit over 100 ft of 12 AWG Cu (R = 2.0 Ω/kft, NFPA
    70-2023 Ch. 9 Table 9; pf 1) drops 2 × 10 A × 0.1 kft × 2.0 Ω/kft = 4.0 V = 3.33 %
    (IEEE Std 141-1993 ch. 3), held together with the drop of both feeder runs before it."""
    (tmp_path / "P2.csv").write_text(
        "circuit,poles,load [VA],pf,breaker [A],conductor,length [ft]\n"
        "1,1,1200,1,20,12 AWG Cu,100\n",
        encoding="utf-8",
    )
    doc = check_json(TWO_RUNS.replace('load = "36 kVA"', 'schedule = "P2.csv"'))
    feeder = run(doc, "A")["vdrop_pct"] + run(doc, "B")["vdrop_pct"]
    assert run(doc, "B")["feeder_vdrop_pct"] == pytest.approx(feeder)
    c = doc["schedules"]["P2"]["circuits"][0]
    assert c["vdrop_pct"] == pytest.approx(4.0 / 120 * 100, rel=0.03)
    assert c["total_vdrop_pct"] == pytest.approx(feeder + c["vdrop_pct"], rel=1e-9)
