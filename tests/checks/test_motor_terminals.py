"""Issue 13 items 4 and 5: the motor starting dip at the motor terminals, through the
motor's branch run, held against the dip rows of tables/motor_starting_limits.csv; a
locked-rotor current below the full-load current refused (exit 2)."""

from __future__ import annotations

import pytest
from click.testing import CliRunner

from feedcheck.cli import main
from tests.checks.jobs import finding, job_text

MOTOR = """
[[motor]]
id = "M1"
panel = "P"
full_load = "46.2 A"
locked_rotor = "{lra}"
hp = 15
{branch}
"""


def _job(lra="300 A", branch=""):
    return job_text() + MOTOR.format(lra=lra, branch=branch)


def test_dip_at_terminals_includes_the_branch_run(check_json):
    """The branch impedance is in series with the path (impedance divider, IEEE Std
    399-1997 ch. 9): 200 ft of 6 AWG Cu (R 0.49 Ω/kft, NFPA 70-2023 Ch. 9 Table 9) adds
    about 0.1 Ω to a path of a few hundredths of an ohm, so the dip at the terminals is
    several points larger than at the panel (limit 20 %, common practice)."""
    doc = check_json(_job(branch='length = "200 ft"\nconductors = "6 AWG Cu"\nraceway = "pvc"'))
    term = finding(doc, "M1", "motor starting dip")
    bus = finding(doc, "M1", "starting dip at the panel")
    assert term["value"] > bus["value"] + 5.0
    assert "motor terminals" in term["note"]
    assert term["rule_id"] == "ms-motor-terminals" and bus["rule_id"] == "ms-other-loads"
    assert term["limit"] == 20.0 and bus["limit"] == 15.0


def test_without_a_branch_the_panel_figure_is_labelled(check_json):
    doc = check_json(_job())
    term = finding(doc, "M1", "motor starting dip")
    bus = finding(doc, "M1", "starting dip at the panel")
    assert term["value"] == bus["value"] and "branch run not given" in term["note"]


def test_locked_rotor_below_full_load_is_an_input_error(write_job):
    res = CliRunner().invoke(main, ["check", str(write_job(_job(lra="30 A")))])
    assert res.exit_code == 2
    assert "motor[1].locked_rotor" in res.output and "30 A" in res.output


LIGHTING_MOTOR = '\n[[motor]]\nid = "M"\npanel = "P"\nhp = 25\nlocked_rotor = "{lr} A"\n'


@pytest.mark.parametrize("lr, status", [(150, "ok"), (4000, "info")])
def test_lighting_panel_dip_while_a_motor_starts(check_json, lr, status):
    """Row ms-lighting-flicker (5 %, common practice, no source) applied at a panel that
    serves general lighting (here the 220.12 minimum of its occupancy and area): the dip
    at the motor's own panel is the panel dip of the same divider (IEEE Std 399-1997
    ch. 9); above 5 % an info finding."""

    text = job_text(load_kva=0.001).replace(
        "power_factor = ", 'occupancy = "office"\narea = "2000 ft2"\npower_factor = '
    ) + LIGHTING_MOTOR.format(lr=lr)
    doc = check_json(text)
    f = finding(doc, "P", "lighting dip while a motor starts")
    panel = finding(doc, "M", "starting dip at the panel")
    assert f["value"] == pytest.approx(panel["value"], rel=1e-9)
    assert f["limit"] == 5.0 and f["status"] == status


def test_no_lighting_no_flicker_finding(check_json):
    """A panel given by load alone is not known to serve lighting: no finding."""

    doc = check_json(job_text() + LIGHTING_MOTOR.format(lr=400))
    assert not [f for f in doc["findings"] if f["check"] == "lighting dip while a motor starts"]
