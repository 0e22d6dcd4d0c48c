"""Issue 13 item 4 / issue 14 item 3: motors given by horsepower alone, checked end to
end from the table full-load current (430.6(A)(1)): 430.22 branch conductors, 430.24
panel load, 430.52 branch device, 430.110(A) disconnect; missing data is a warning,
never "ok". Read back from the JSON of ``feedcheck check``.

Table values used (NFPA 70 Table 430.250, three-phase, 208 V column; read in the 2008
edition's table and believed unchanged in NFPA 70-2023, from memory): 10 hp 30.8 A,
25 hp 74.8 A.
"""

from __future__ import annotations

import math

import pytest

from tests.checks.jobs import finding, job_text, node

FLC_10HP_208 = 30.8  # NFPA 70 Table 430.250, 10 hp, 208 V
FLC_25HP_208 = 74.8  # NFPA 70 Table 430.250, 25 hp, 208 V

MOTORS = """
[[motor]]
id = "EF-10"
panel = "P"
hp = 10

[[motor]]
id = "AHU-25"
panel = "P"
hp = 25
{extra}
"""


def _job(extra="", **kw):
    return job_text(**kw) + MOTORS.format(extra=extra)


def test_panel_design_current_is_430_24_hand_calculation(check_json):
    """430.24: 125 % of the largest motor + 100 % of the other + the other loads.
    Hand calculation: 60 kVA noncontinuous at 208 V three-phase is
    60,000 / (√3 × 208) = 166.5 A per line; + 30.8 A + 1.25 × 74.8 A = 290.8 A."""
    doc = check_json(_job())
    other = 60_000 / (math.sqrt(3) * 208)
    hand = other + FLC_10HP_208 + 1.25 * FLC_25HP_208
    assert hand == pytest.approx(290.84, abs=0.01)
    assert node(doc, "P")["design_current_a"] == pytest.approx(hand, rel=1e-6)
    # the motors are counted once: the panel's VA is its own load + Σ √3·V·FLC + 25 %
    va = 60_000 + math.sqrt(3) * 208 * (FLC_10HP_208 + 1.25 * FLC_25HP_208)
    assert node(doc, "P")["load_va"] == pytest.approx(va, rel=1e-6)


def test_missing_branch_device_disconnect_are_warnings_not_ok(check_json):
    doc = check_json(_job())
    for check in ("branch conductor ampacity", "branch device", "disconnect rating"):
        f = finding(doc, "AHU-25", check)
        assert f["status"] == "warn" and f["value"] is None, f
        assert "not checked" in f["note"]


@pytest.mark.parametrize(
    ("device", "device_type", "limit", "status"),
    [
        # Table 430.52: inverse-time breaker 250 % × 74.8 = 187 A → 200 A (Exc. No. 1)
        ("200 A", "inverse-time-breaker", 200.0, "ok"),
        ("225 A", "inverse-time-breaker", 200.0, "fail"),
        # time-delay fuse 175 % × 74.8 = 130.9 A → 150 A (240.6(A) standard rating)
        ("150 A", "time-delay-fuse", 150.0, "ok"),
        # nontime-delay fuse 300 % × 74.8 = 224.4 A → 225 A
        ("250 A", "nontime-delay-fuse", 225.0, "fail"),
    ],
)
def test_branch_device_table_430_52(check_json, device, device_type, limit, status):
    """NFPA 70-2023 430.52(C)(1) and Table 430.52 (squirrel-cage column percents, read
    in the 2011 table; 240.6(A) standard ratings)."""
    extra = f'device = "{device}"\ndevice_type = "{device_type}"'
    f = finding(check_json(_job(extra)), "AHU-25", "branch device")
    assert f["limit"] == pytest.approx(limit)
    assert f["status"] == status


@pytest.mark.parametrize(("rating", "status"), [("100 A", "ok"), ("60 A", "fail")])
def test_disconnect_115_percent(check_json, rating, status):
    """430.110(A): at least 115 % of the table FLC, 1.15 × 74.8 = 86.02 A."""
    f = finding(check_json(_job(f'disconnect = "{rating}"')), "AHU-25", "disconnect rating")
    assert f["limit"] == pytest.approx(1.15 * FLC_25HP_208)
    assert f["status"] == status


@pytest.mark.parametrize(
    ("termination", "ampacity", "status"),
    [
        # 3 AWG Cu, NFPA 70-2023 Table 310.16: 85 A (60 °C), 100 A (75 °C)
        ("", 85.0, "fail"),  # 93.5 A ≤ 100 A circuit: 60 °C by 110.14(C)(1)(a)
        ('termination = "75 degC"', 100.0, "ok"),
    ],
)
def test_branch_conductor_125_percent(check_json, termination, ampacity, status):
    """430.22: ampacity at least 125 % of the table FLC, 1.25 × 74.8 = 93.5 A."""
    extra = f'length = "50 ft"\nconductors = "3 AWG Cu"\n{termination}'
    f = finding(check_json(_job(extra)), "AHU-25", "branch conductor ampacity")
    assert f["limit"] == pytest.approx(1.25 * FLC_25HP_208)
    assert f["value"] == pytest.approx(ampacity)
    assert f["status"] == status


def test_nameplate_only_motor_warns(check_json):
    text = job_text() + '\n[[motor]]\nid = "M"\npanel = "P"\nfull_load = "28 A"\n'
    f = finding(check_json(text), "M", "full-load current from the table")
    assert f["status"] == "warn" and "430.6(A)(1)" in f["note"]


def test_kw_rating_takes_the_table_row(check_json):
    """7.5 kW = 10.05 hp at 746 W/hp: the 10 hp row, 30.8 A at 208 V (Table 430.250)."""
    text = job_text() + '\n[[motor]]\nid = "M"\npanel = "P"\nkw = 7.5\ndisconnect = "30 A"\n'
    f = finding(check_json(text), "M", "disconnect rating")
    assert f["limit"] == pytest.approx(1.15 * FLC_10HP_208)
    assert f["status"] == "fail"


def test_single_phase_motor_on_three_phase_panel(check_json):
    """A 5 hp single-phase motor at 208 V: 30.8 A (NFPA 70 Table 430.248, 208 V column,
    read in the 1999 table, believed unchanged in 2023, from memory) on two lines of
    the 208Y/120 V panel; its starting dip is computed over the loop of both lines."""
    text = job_text(load_kva=0.001) + (
        '\n[[motor]]\nid = "P1"\npanel = "P"\nhp = 5\nphases = 1\nlocked_rotor = "180 A"\n'
    )
    doc = check_json(text)
    f = finding(doc, "P1", "disconnect rating")
    assert f["limit"] == pytest.approx(1.15 * 30.8)
    # two lines carry 30.8 A + its 25 % (largest motor), the third none of it
    assert node(doc, "P")["design_current_a"] == pytest.approx(1.25 * 30.8, rel=1e-3)
    dip = finding(doc, "P1", "starting dip at the panel")
    assert 0 < dip["value"] < 100


@pytest.mark.parametrize(
    "kw, row_hp, flc_a",
    [
        # IEC ratings between the horsepower rows at 746 W/hp: the next larger row of
        # NFPA 70 Table 430.250, 208 V column (from memory, as the table file's rows)
        (22, 30, 88.0),  # 22 kW = 29.49 hp → 30 hp row, 88 A
        (11, 15, 46.2),  # 11 kW = 14.75 hp → 15 hp row, 46.2 A
        (4, 7.5, 24.2),  # 4 kW = 5.36 hp → 7-1/2 hp row, 24.2 A
    ],
)
def test_kw_between_rows_takes_the_next_larger_row(check_json, kw, row_hp, flc_a):
    """A kW rating between horsepower rows is sized from the next larger row (the larger
    table current, 430.6(A)(1)) and the finding says so; it is not refused."""
    text = job_text() + f'\n[[motor]]\nid = "M"\npanel = "P"\nkw = {kw}\n'
    doc = check_json(text)
    info = finding(doc, "M", "full-load current from the table")
    assert info["status"] == "info" and info["value"] == pytest.approx(flc_a)
    assert f"next larger row, {row_hp:g} hp" in info["note"]
    assert finding(doc, "M", "disconnect rating")["limit"] == pytest.approx(1.15 * flc_a)


def test_kw_on_a_row_has_no_taken_up_note(check_json):
    """18.5 kW = 24.80 hp is within 1 % of the 25 hp row: that row, 74.8 A (Table 430.250,
    208 V), no note."""
    text = job_text() + '\n[[motor]]\nid = "M"\npanel = "P"\nkw = 18.5\n'
    doc = check_json(text)
    assert not [f for f in doc["findings"] if f["check"] == "full-load current from the table"]
    assert finding(doc, "M", "disconnect rating")["limit"] == pytest.approx(1.15 * FLC_25HP_208)


def test_kw_beyond_the_last_row_is_refused(write_job):
    """400 kW = 536 hp: above the last row of Table 430.250 (500 hp): an input error."""
    from click.testing import CliRunner

    from feedcheck.cli import main

    path = write_job(job_text() + '\n[[motor]]\nid = "M"\npanel = "P"\nkw = 400\n')
    res = CliRunner().invoke(main, ["check", str(path)])
    assert res.exit_code == 2 and "the table ends at 500 hp" in res.output


def test_sample_motor_is_complete():
    """The willow_yard_service sample's AC-1 gives its device and disconnect: every one of
    its findings is evaluated. Limits: 25 hp, 460 V column, 34 A (NFPA 70 Table 430.250,
    from memory as the table file); Table 430.52 inverse-time breaker 250 % → 85 A, next
    standard rating 90 A (240.6(A), 430.52(C)(1) Exception No. 1); 430.110(A) 115 % →
    39.1 A."""
    import json
    from pathlib import Path

    from click.testing import CliRunner

    from feedcheck.cli import main

    job = Path(__file__).parents[2] / "sample_jobs" / "willow_yard_service.toml"
    doc = json.loads(CliRunner().invoke(main, ["check", str(job), "--format", "json"]).stdout)
    mine = [f for f in doc["findings"] if f["subject"] == "AC-1"]
    assert mine and all(f["status"] == "ok" for f in mine), mine
    assert finding(doc, "AC-1", "branch device")["limit"] == pytest.approx(90.0)
    assert finding(doc, "AC-1", "disconnect rating")["limit"] == pytest.approx(1.15 * 34.0)
