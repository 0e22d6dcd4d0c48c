"""`feedcheck workbook` and a job workbook through the other commands (check, report,
rerun, extract, compare, schedule --job, init FILE.xlsx)."""

from __future__ import annotations

import shutil

import openpyxl
from click.testing import CliRunner

from feedcheck import CAUTION
from feedcheck.cli import main


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


def _harbor(samples, tmp_path):
    for name in ("harbor_kitchen.toml", "LP1.csv", "EQ1.csv"):
        shutil.copy(samples / name, tmp_path / name)
    return tmp_path / "harbor_kitchen.toml"


def _workbook(samples, tmp_path):
    job = _harbor(samples, tmp_path)
    r = _run("workbook", job)
    assert r.exit_code == 0, r.output
    return job.with_suffix(".xlsx")


def test_workbook_is_written_beside_the_job_with_a_read_me_sheet(samples, tmp_path):
    xlsx = _workbook(samples, tmp_path)
    wb = openpyxl.load_workbook(xlsx)
    assert wb.sheetnames == ["read me", "project", "source", "transformer", "run", "panel"]
    readme = [c.value for c in wb["read me"]["A"] if c.value]
    assert CAUTION in readme and "licensed electrician or engineer" in CAUTION
    run = wb["run"]
    assert run.freeze_panes == "A2" and run["A1"].font.bold
    assert [c.value for c in run[1]][:5] == ["id", "from", "to", "length", "conductors"]
    assert [c.value for c in run[2]][:5] == ["F-LP1", "T1", "LP1", "95 ft", "300 kcmil Cu"]
    assert 8 <= run.column_dimensions["E"].width <= 60


def test_workbook_never_replaces_without_force(samples, tmp_path):
    xlsx = _workbook(samples, tmp_path)
    xlsx.write_bytes(b"edited by hand")
    r = _run("workbook", tmp_path / "harbor_kitchen.toml")
    assert r.exit_code == 2 and "exists; use --force" in r.stderr
    assert xlsx.read_bytes() == b"edited by hand"
    assert _run("workbook", tmp_path / "harbor_kitchen.toml", "--force").exit_code == 0
    assert xlsx.read_bytes()[:2] == b"PK"


def test_workbook_of_an_invalid_job_writes_nothing(samples, tmp_path):
    job = _harbor(samples, tmp_path)
    job.write_text(job.read_text().replace('length = "95 ft"', 'length = "95"'))
    r = _run("workbook", job)
    assert r.exit_code == 2 and "run[1].length got '95'" in r.stderr
    assert "Traceback" not in r.output
    assert not job.with_suffix(".xlsx").exists() and not list(tmp_path.glob(".*.part"))


def test_workbook_onto_its_own_job_is_refused(samples, tmp_path):
    xlsx = _workbook(samples, tmp_path)
    before = xlsx.read_bytes()
    r = _run("workbook", xlsx, "-o", xlsx, "--force")
    assert r.exit_code == 2 and "other than the command's inputs" in r.stderr
    assert xlsx.read_bytes() == before


def test_workbook_elsewhere_names_the_schedules_to_copy(samples, tmp_path):
    job = _harbor(samples, tmp_path)
    (tmp_path / "out").mkdir()
    r = _run("workbook", job, "-o", tmp_path / "out" / "hk.xlsx")
    assert r.exit_code == 0
    assert "note: the schedules (LP1.csv, EQ1.csv) are read from the workbook's folder" in r.stderr
    r = _run("check", tmp_path / "out" / "hk.xlsx")
    assert r.exit_code == 2
    assert "sheet 'panel', row 2, column 'schedule' got 'LP1.csv'" in r.stderr


def test_report_of_a_workbook_job_reruns_and_extracts(samples, tmp_path):
    xlsx = _workbook(samples, tmp_path)
    pdf = tmp_path / "hk.pdf"
    r = _run("report", xlsx, "-o", pdf)
    assert r.exit_code in (0, 1), r.output
    r = _run("rerun", pdf)
    assert r.exit_code == 0, r.output
    assert "figures match" in r.stdout and "pages read as the re-run prints them" in r.stdout
    r = _run("extract", pdf, tmp_path / "x")
    assert r.exit_code == 0, r.output
    assert (tmp_path / "x" / "harbor_kitchen.xlsx").read_bytes() == xlsx.read_bytes()


def test_compare_a_job_file_with_its_edited_workbook(samples, tmp_path):
    xlsx = _workbook(samples, tmp_path)
    toml = tmp_path / "harbor_kitchen.toml"
    r = _run("compare", toml, xlsx)
    assert r.exit_code == 0 and "inputs changed: none" in r.stdout, r.output
    wb = openpyxl.load_workbook(xlsx)
    wb["run"]["D2"] = "120 ft"
    wb.save(xlsx)
    r = _run("compare", toml, xlsx)
    assert r.exit_code == 1
    assert "job run F-LP1.length: '95 ft' → '120 ft'" in r.stdout


def test_schedule_check_of_a_workbook_job(samples, tmp_path):
    xlsx = _workbook(samples, tmp_path)
    a = _run("schedule", "--job", tmp_path / "harbor_kitchen.toml")
    b = _run("schedule", "--job", xlsx)
    assert b.exit_code == a.exit_code and b.stdout == a.stdout


def test_init_writes_the_template_as_a_workbook(tmp_path):
    r = _run("init", tmp_path / "t.xlsx")
    assert r.exit_code == 0, r.output
    assert _run("init", tmp_path / "t.toml").exit_code == 0
    a = _run("check", tmp_path / "t.toml", "--format", "json")
    b = _run("check", tmp_path / "t.xlsx", "--format", "json")
    assert b.exit_code == a.exit_code
    assert b.stdout == a.stdout.replace('"t.toml"', '"t.xlsx"')


def test_help_has_examples_and_caution():
    r = _run("workbook", "--help")
    assert r.exit_code == 0 and "feedcheck workbook" in r.stdout
    assert "licensed electrician or engineer" in r.stdout
