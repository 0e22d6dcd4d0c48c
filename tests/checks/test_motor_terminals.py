"""Issue 13 items 4 and 5: the motor starting dip at the motor terminals, through the
motor's branch run, held against the dip rows of tables/motor_starting_limits.csv; a
locked-rotor current below the full-load current refused (exit 2)."""

from __future__ import annotations

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
