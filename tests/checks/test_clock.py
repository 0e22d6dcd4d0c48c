"""Checks are pure of the clock: the fault-marking date is handed in by the command."""

from __future__ import annotations

from feedcheck.checks import check_job
from feedcheck.inputs.job_file import read_job


def _marking_notes(res):
    return [f.note for f in res.findings if f.check == "available fault current (marking)"]


def test_marking_date_is_the_one_handed_in(samples, monkeypatch):
    job = read_job(samples / "maple_farmhouse.toml")
    if job.project.date:  # the job's own date wins; use a copy without it
        import dataclasses

        job = dataclasses.replace(job, project=dataclasses.replace(job.project, date=None))
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "0")  # must not be read by the checks
    notes = _marking_notes(check_job(job, calc_date="2031-02-03"))
    assert notes and all(n.endswith("calculated 2031-02-03") for n in notes)
    notes = _marking_notes(check_job(job))
    assert all("1970" not in n for n in notes)


def test_command_honours_source_date_epoch(write_job, monkeypatch):
    from click.testing import CliRunner

    from feedcheck.cli import main
    from tests.test_transformer_checks import JOB

    text = JOB.format(
        pdev="100 A", sdev="", length="8 ft", cond="4/0 AWG Cu", sets=1, rdev="", main="200 A"
    )
    assert "date" not in text
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "86400")  # 1970-01-02
    out = CliRunner().invoke(main, ["check", str(write_job(text)), "--format", "json"]).stdout
    assert "calculated 1970-01-02" in out
