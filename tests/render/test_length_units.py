"""Lengths reach people in the unit system the job is written in (issue 15, item 2): a job
in feet is shown in feet, a metric job in metres — terminal findings, report pages
(findings, sheets, schedules, the voltage-profile axis) — while the JSON keeps SI keys.

The same invented feed is written twice, once in feet and AWG/kcmil and once in metres
and mm²; the length 60 ft = 18.288 m (1 ft = 0.3048 m exactly, NIST SP 811 (2008) B.9).
"""

from __future__ import annotations

import json
import re

import pytest
from click.testing import CliRunner
from pypdf import PdfReader

from feedcheck.cli import main as cli
from feedcheck.inputs.unit_system import job_length_unit, length_word_system
from feedcheck.render.pdf.report import render_pdf
from feedcheck.runner import load_and_check

JOB = """
[project]
name = "Length units test (invented)"

[source]
voltage = "480 V delta"
available_fault = "30 kA"
x_r = 6

[[transformer]]
id = "T1"
from = "source"
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5.1 %"
x_r = 3.5
primary_device = "110 A"

[[run]]
id = "F-LP1"
from = "T1"
to = "LP1"
length = "{length}"
conductors = "{phase}"
ground = "{ground}"

[[panel]]
id = "LP1"
rating = "225 A"
main_device = "225 A"
load = "34 kVA"
schedule = "LP1.csv"
"""
SCHEDULE = (
    "Circuit,Description,Poles,Kind,Load [VA],Breaker [A],Conductor,Length [{unit}]\n"
    "1,Lights,1,lighting,1200,20,12 AWG Cu,{branch}\n"
)
FEET = {"length": "60 ft", "phase": "300 kcmil Cu", "ground": "4 AWG Cu"}
METRIC = {"length": "18.288 m", "phase": "150 mm2 Cu", "ground": "25 mm2 Cu"}


def _job(tmp_path, name: str, keys: dict, branch: str, unit: str):
    folder = tmp_path / name
    folder.mkdir()
    (folder / "LP1.csv").write_text(SCHEDULE.format(branch=branch, unit=unit), encoding="utf-8")
    path = folder / "job.toml"
    path.write_text(JOB.format(**keys), encoding="utf-8")
    return path


@pytest.fixture(scope="module")
def jobs(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("units")
    return {
        "ft": _job(tmp, "feet", FEET, "50", "ft"),
        "m": _job(tmp, "metric", METRIC, "15.24", "m"),
    }


def test_unit_words():
    assert length_word_system("85 ft") == "ft"
    assert length_word_system("26 metres") == "m"
    assert length_word_system("12") is None
    # most lengths decide; a tie goes to the conductor sizes; nothing to go by: feet
    assert job_length_unit(["10 ft", "3 m", "4 m"], ["awg"]) == "m"
    assert job_length_unit(["10 ft", "3 m"], ["metric"]) == "m"
    assert job_length_unit([], ["awg", "metric", "awg"]) == "ft"
    assert job_length_unit([], []) == "ft"


@pytest.mark.parametrize("unit", ["ft", "m"])
def test_results_carry_the_jobs_unit(jobs, unit):
    job, results = load_and_check(jobs[unit])
    assert job.length_unit == unit
    assert results.length_unit == unit


def test_terminal_findings_in_the_jobs_unit(jobs, monkeypatch):
    out = {}
    for unit, path in jobs.items():
        monkeypatch.chdir(path.parent)
        out[unit] = CliRunner().invoke(cli, ["check", path.name]).stdout
    # 240.21(C)(6): 25 ft of secondary conductors (NFPA 70-2023 240.21(C)(6)); 25 ft = 7.62 m
    assert "secondary conductor length: 60 ft vs 25 ft" in out["ft"]
    assert "secondary conductor length: 18.3 m vs 7.6 m" in out["m"]
    assert not re.search(r"\d ft\b", out["m"]), "a metric job shows no feet in its findings"
    assert not re.search(r"\d(\.\d)? m\b", out["ft"]), "a feet job shows no metres"


def test_json_keeps_si_keys(jobs, monkeypatch):
    monkeypatch.chdir(jobs["ft"].parent)
    data = json.loads(CliRunner().invoke(cli, ["check", "job.toml", "--format", "json"]).stdout)
    run = next(r for r in data["runs"] if r["id"] == "F-LP1")
    assert run["length_m"] == pytest.approx(18.288, rel=1e-12)  # 60 × 0.3048 (exact)
    f = next(f for f in data["findings"] if f["check"] == "secondary conductor length")
    assert f["unit"] == "m" and f["value"] == pytest.approx(18.288, rel=1e-12)


@pytest.mark.parametrize("unit", ["ft", "m"])
def test_report_pages_in_the_jobs_unit(jobs, unit):
    import io

    _, results = load_and_check(jobs[unit])
    data, _, _ = render_pdf(results)
    text = " ".join(
        re.sub(r"\s+", " ", pg.extract_text() or "") for pg in PdfReader(io.BytesIO(data)).pages
    )
    other = "m" if unit == "ft" else "ft"
    assert f"distance from the source ({unit})" in text  # voltage-profile axis
    assert f"Len {unit}" in text  # schedule column
    assert f"Len {other}" not in text
    shown = "60 ft" if unit == "ft" else "18.3 m"
    assert f"{shown} of secondary conductors" in text
