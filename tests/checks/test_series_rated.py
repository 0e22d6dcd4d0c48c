"""Series-rated combinations (issue 14 item 6; NFPA 70-2023 240.86(B), (C), 110.22(C)) on
an invented job (demo data, never an oracle): the rule arithmetic is checked, the fault
figures are the program's own (held against published sources elsewhere)."""

from __future__ import annotations

import pytest

from feedcheck.runner import run_job

JOB = """
[project]
name = "series-rated bench (invented)"
[source]
voltage = "480Y/277 V"
available_fault = "35 kA"
x_r = 6
[[run]]
id = "SVC"
from = "source"
to = "MDP"
length = "20 ft"
conductors = "500 kcmil Cu"
sets = 2
neutral = "500 kcmil Cu"
[[panel]]
id = "MDP"
rating = "800 A"
main_device = "800 A"
interrupting = "65 kA"
load = "100 kVA"
[[run]]
id = "F-P"
from = "MDP"
to = "P"
length = "10 ft"
conductors = "3 AWG Cu"
ground = "8 AWG Cu"
device = "100 A"
[[panel]]
id = "P"
rating = "100 A"
main_device = "100 A"
interrupting = "14 kA"
load = "30 kVA"
series_rating = "65 kA"
series_upstream = "F-P"
series_upstream_device = "100 A"
"""


def _f(res, subject, check):
    return [f for f in res.findings if f.subject == subject and f.check == check]


def test_combination_rating_is_used_and_the_marking_reminded(write_job):
    res = run_job(write_job(JOB))
    (duty,) = _f(res, "P", "interrupting rating")
    assert duty.limit == 65e3 and duty.rule_id == "series-rated" and duty.status == "ok"
    assert duty.value > 14e3  # the panel's own 14 kA would fail
    (mark,) = _f(res, "P", "series combination marking")
    assert "110.22(C)" in mark.note and mark.status == "info"


def test_without_the_combination_the_own_rating_fails(write_job):
    text = "\n".join(ln for ln in JOB.splitlines() if not ln.startswith("series_"))
    (duty,) = _f(run_job(write_job(text)), "P", "interrupting rating")
    assert duty.limit == 14e3 and duty.status == "fail"


def test_another_line_side_device_voids_the_combination(write_job):
    res = run_job(
        write_job(
            JOB.replace('series_upstream_device = "100 A"', 'series_upstream_device = "125 A"')
        )
    )
    (dev,) = _f(res, "P", "series combination, line-side device")
    assert dev.status == "fail" and dev.rule_id == "series-rated"
    (duty,) = _f(res, "P", "interrupting rating")
    assert duty.limit == 14e3 and duty.status == "fail"


@pytest.mark.parametrize(("fla", "status"), [("130 A", "ok"), ("150 A", "fail")])
def test_motor_contribution_limit(write_job, fla, status):
    # 240.86(C): 1 % of the lower-rated device's 14 kA = 140 A of motor full-load current
    motor = f'\n[[motor]]\nid = "M1"\npanel = "P"\nfull_load = "{fla}"\n'
    res = run_job(write_job(JOB + motor))
    (m,) = _f(res, "P", "series combination, motor contribution")
    assert m.limit == pytest.approx(140.0) and m.status == status
    (duty,) = _f(res, "P", "interrupting rating")
    assert duty.limit == (65e3 if status == "ok" else 14e3)


def test_series_upstream_must_be_on_the_feed(write_job, tmp_path):
    from tests.badinput import assert_rejected, cli

    job = write_job(JOB.replace('series_upstream = "F-P"', 'series_upstream = "F-Q"'))
    (line,) = assert_rejected(cli("check", job), n=1)
    assert "panel[2].series_upstream got 'F-Q'; expected the id of a run on the feed" in line
