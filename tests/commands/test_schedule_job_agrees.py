"""``feedcheck schedule --job`` and ``feedcheck check`` give the same schedule findings
(issue 11, bug 1: the schedule command re-checked schedules on its own, rebuilding the
feeder drop from two output columns and leaving out the bus and main ratings and the
job's drop limits)."""

from __future__ import annotations

import json
import shutil

import pytest
from click.testing import CliRunner

from feedcheck.cli import main
from tests.conftest import SAMPLES

SAMPLE_JOBS = sorted(p for p in SAMPLES.glob("*.toml") if "schedule =" in p.read_text())
PANEL_CHECKS = ("phase balance", "demand vs bus rating", "demand vs main device")


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


def _schedule_findings(job, tmp_path):
    out = tmp_path / "schedules.json"
    r = _run("schedule", "--job", job, "--out", out)
    assert r.exit_code in (0, 1), r.output
    files = json.loads(out.read_text(encoding="utf-8"))["files"]
    return [f for file in files for f in file["findings"]], {
        p["panel"] for file in files for p in file["panels"]
    }


def _check_findings(job, panels):
    r = _run("check", job, "--format", "json")
    assert r.exit_code in (0, 1), r.output
    return [
        f
        for f in json.loads(r.stdout)["findings"]
        if f["status"] in ("fail", "warn")
        and (
            f["subject"].split("/")[0] in panels
            if "/" in f["subject"]
            else f["subject"] in panels and f["check"] in PANEL_CHECKS
        )
    ]


@pytest.mark.parametrize("job", SAMPLE_JOBS, ids=[p.stem for p in SAMPLE_JOBS])
def test_schedule_job_agrees_with_check(job, tmp_path):
    sched, panels = _schedule_findings(job, tmp_path)
    assert panels  # every sample job here has at least one schedule
    assert sorted(sched, key=json.dumps) == sorted(_check_findings(job, panels), key=json.dumps)


def test_job_rules_reach_the_schedule_command(tmp_path):
    # a job with mandatory drop limits of its own, a hospital panel and a small bus: the
    # schedule command must cite the job's limits and the bus rating, as check does
    for name in ("cedar_annex_review.toml", "LA_with_errors.csv"):
        shutil.copy(SAMPLES / name, tmp_path / name)
    job = tmp_path / "cedar_annex_review.toml"
    text = job.read_text(encoding="utf-8")
    assert "[options]" not in text
    job.write_text(
        text + '\n[options]\nvoltage_drop = "mandatory"\nbranch_drop = "1 %"\n',
        encoding="utf-8",
    )
    sched, panels = _schedule_findings(job, tmp_path)
    assert any(f["rule_id"] == "vd-job-branch" and f["status"] == "fail" for f in sched)
    assert sorted(sched, key=json.dumps) == sorted(_check_findings(job, panels), key=json.dumps)


def test_occupancy_with_job_is_a_usage_error():
    r = _run("schedule", "--job", SAMPLES / "harbor_kitchen.toml", "--occupancy", "hospital")
    assert r.exit_code == 2
    assert "come from the job with --job" in r.output
