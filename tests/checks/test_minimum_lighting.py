"""Issue 13 item 9: minimum general lighting load by Table 220.12 where a panel gives an
occupancy and a floor area; the larger of scheduled and minimum is used."""

from __future__ import annotations

import pytest

from tests.checks.jobs import finding, node

JOB = """
[project]
name = "minimum lighting (invented)"

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
conductors = "3/0 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
current_carrying = 4
ground = "6 AWG Cu"
device = "200 A"

[[panel]]
id = "LP"
rating = "225 A"
schedule = "LIGHT.csv"
occupancy = "industrial"
area = "10000 ft2"
"""


def _doc(check_json, tmp_path, va_each):
    rows = "".join(f"{n},1,lighting,yes,{va_each},1,20,12 AWG Cu,10\n" for n in (1, 3, 5))
    head = "circuit,poles,kind,continuous,load [VA],pf,breaker [A],conductor,length [ft]\n"
    (tmp_path / "LIGHT.csv").write_text(head + rows, encoding="utf-8")
    return check_json(JOB)


def test_schedule_below_the_minimum_warns_and_the_minimum_is_used(check_json, tmp_path):
    """Industrial commercial (loft) buildings: 2 VA/ft² (NFPA 70-2017 Table 220.12) ×
    10,000 ft² = 20,000 VA; 3 × 5000 VA = 15,000 VA scheduled is below it."""
    doc = _doc(check_json, tmp_path, 5000)
    f = finding(doc, "LP", "minimum lighting load")
    assert f["status"] == "warn" and f["rule_id"] == "lul-industrial"
    assert (f["value"], f["limit"]) == pytest.approx((15_000, 20_000), rel=1e-9)
    assert node(doc, "LP")["load_va"] == pytest.approx(20_000, rel=1e-9)


def test_schedule_above_the_minimum_is_kept(check_json, tmp_path):
    doc = _doc(check_json, tmp_path, 8000)  # 24,000 VA > 20,000 VA (Table 220.12)
    f = finding(doc, "LP", "minimum lighting load")
    assert f["status"] == "ok"
    assert node(doc, "LP")["load_va"] == pytest.approx(24_000, rel=1e-9)
