"""``feedcheck schedule`` for batches people run (issue 16): --keep-going, per-file
systems (--systems FILE, a system column), --columns, results files for people, progress
for one large file. Schedules are invented test data written by the test."""

import csv

import openpyxl
from click.testing import CliRunner

from feedcheck.cli import main

HEADER = "Circuit,Description,Load [VA],Breaker [A],Conductor,Length [ft]\n"
GOOD = HEADER + "1,Lights,1200,20,12 AWG Cu,60\n3,Receptacles,1500,20,12 AWG Cu,40\n"


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


def _folder(tmp_path, n_good=3, bad=True):
    d = tmp_path / "in"
    d.mkdir()
    for k in range(n_good):
        (d / f"P{k}.csv").write_text(GOOD)
    if bad:
        (d / "BAD.csv").write_text(GOOD.replace("1200", "lots"))
    return d


def test_default_is_strict(tmp_path):
    d = _folder(tmp_path)
    out = tmp_path / "r.csv"
    r = _run("schedule", d, "--system", "208Y/120 V", "--out", out)
    assert r.exit_code == 2 and not out.exists()
    assert "nothing was written" in r.stderr


def test_keep_going_writes_readable_files_and_exits_2(tmp_path):
    d = _folder(tmp_path)
    out = tmp_path / "r.csv"
    r = _run("schedule", d, "--system", "208Y/120 V", "--out", out, "--keep-going")
    assert r.exit_code == 2, r.output
    assert "3 file(s), 6 circuits" in r.stdout
    assert f"error: {d / 'BAD.csv'}: row 2, column 'Load [VA]' got 'lots'" in r.stderr
    assert "1 file(s) could not be read" in r.stderr and "BAD.csv" in r.stderr
    files = {row["file"] for row in csv.DictReader(out.open(encoding="utf-8"))}
    assert files == {"P0.csv", "P1.csv", "P2.csv"}
    (tmp_path / "b").mkdir()
    ok = _run(
        "schedule", _folder(tmp_path / "b", bad=False), "--system", "208Y/120 V", "--keep-going"
    )
    assert ok.exit_code == 0


def test_systems_file_and_system_column(tmp_path):
    d = tmp_path / "mixed"
    d.mkdir()
    (d / "LP1.csv").write_text(GOOD)
    (d / "HP1.csv").write_text(GOOD)
    (d / "DP1.csv").write_text(
        GOOD.replace("Length [ft]\n", "Length [ft],System\n")
        .replace(",60\n", ",60,480Y/277 V\n")
        .replace(",40\n", ",40,480Y/277 V\n")
    )
    m = tmp_path / "systems.txt"
    m.write_text("# invented site\nLP1.csv = 208Y/120 V\nHP1.csv = 120/240 V\n")
    r = _run("schedule", d, "--systems", m)
    assert r.exit_code == 0, r.output
    assert "LP1.csv  panel LP1  208Y/120 V" in r.stdout
    assert "HP1.csv  panel HP1  120/240 V" in r.stdout and "phases A/B " in r.stdout
    assert "DP1.csv  panel DP1  480Y/277 V" in r.stdout
    m.write_text("LP1.csv = 208Y/120 V\n")  # HP1 has no system now
    r = _run("schedule", d, "--systems", m)
    assert r.exit_code == 2 and "HP1.csv: got '(no system)'" in r.stderr
    m.write_text("LP1.csv: 208Y/120 V\n")
    r = _run("schedule", d, "--systems", m)
    assert r.exit_code == 2 and "line 1" in r.stderr


def test_columns_option_and_notice(tmp_path):
    p = tmp_path / "LP1.csv"
    p.write_text(
        GOOD.replace("Length [ft]\n", "Length [ft],Cont?,Ins\n")
        .replace(",60\n", ",60,x,90\n")
        .replace(",40\n", ",40,,90\n")
    )
    r = _run("schedule", p, "--system", "208Y/120 V")
    assert "column 8 'Ins' not understood" in r.stdout
    r = _run("schedule", p, "--system", "208Y/120 V", "--columns", "Ins=insulation")
    assert r.exit_code == 0 and "not understood" not in r.stdout
    r = _run("schedule", p, "--system", "208Y/120 V", "--columns", "Ins")
    assert r.exit_code == 2 and "HEADER=COLUMN" in r.stderr


def test_results_xlsx_for_people(tmp_path):
    p = tmp_path / "LP1.csv"
    p.write_text(GOOD.replace("1,Lights,1200,20", "1,Lights,1200,30"))  # 30 A on 12 AWG fails
    out = tmp_path / "r.xlsx"
    r = _run("schedule", p, "--system", "208Y/120 V", "--out", out)
    assert r.exit_code == 1, r.output
    wb = openpyxl.load_workbook(out)
    assert wb.sheetnames == ["circuits", "panels", "notes"]
    ws = wb["circuits"]
    assert ws.freeze_panes == "A2" and ws.auto_filter.ref.startswith("A1:")
    head = [c.value for c in ws[1]]
    row = dict(zip(head, ws[2], strict=True))
    assert row["status"].value == "fail" and row["status"].fill.fgColor.rgb.endswith("FFC7CE")
    assert row["current_a"].number_format == "0.0"
    assert row["length"].value == 60 and row["length_unit"].value == "ft"
    assert ws.column_dimensions["T"].width > 8
    panels = wb["panels"]
    phead = [c.value for c in panels[1]]
    assert "spares" in phead and len(list(panels.rows)) == 2  # no caution row among panels
    notes = [c.value for c in wb["notes"]["A"] if c.value]
    assert any("licensed electrician" in n for n in notes)
    assert wb.properties.title == "feedcheck schedule results"


def test_progress_for_one_large_file_on_a_terminal(tmp_path, monkeypatch):
    import feedcheck.commands.schedule as cmd

    p = tmp_path / "LP1.csv"
    p.write_text(GOOD)
    monkeypatch.setattr(cmd, "LARGE_FILE_BYTES", 10)
    monkeypatch.setattr(cmd, "_on_terminal", lambda: True)
    seen = []
    real = cmd._one_with_stages
    monkeypatch.setattr(cmd, "_one_with_stages", lambda f, one: (seen.append(f), real(f, one)))
    r = _run("schedule", p, "--system", "208Y/120 V")
    assert r.exit_code == 0, r.output
    assert seen == [p]


def test_job_panel_columns_key(tmp_path):
    from tests.badinput import GOOD as JOB

    sched = tmp_path / "pb.csv"
    sched.write_text(
        GOOD.replace("Length [ft]\n", "Length [ft],Ins\n")
        .replace(",60\n", ",60,90\n")
        .replace(",40\n", ",40,90\n")
    )
    job = tmp_path / "job.toml"
    job.write_text(JOB.replace('load = "20 kVA"', 'load = "20 kVA"\nschedule = "pb.csv"'))
    r = _run("check", job, "--format", "json")
    assert r.exit_code in (0, 1), r.output
    import json

    (s,) = json.loads(r.stdout)["schedules"].values()
    assert any("'Ins' not understood" in n for n in s["notices"])
    job.write_text(
        JOB.replace(
            'load = "20 kVA"',
            'load = "20 kVA"\nschedule = "pb.csv"\ncolumns = {Ins = "insulation"}',
        )
    )
    r = _run("check", job, "--format", "json")
    (s,) = json.loads(r.stdout)["schedules"].values()
    assert not any("not understood" in n for n in s["notices"])
    job.write_text(
        JOB.replace(
            'load = "20 kVA"', 'load = "20 kVA"\nschedule = "pb.csv"\ncolumns = {Ins = "isolation"}'
        )
    )
    r = _run("check", job)
    assert r.exit_code == 2 and ".columns" in r.stderr and "HEADER=COLUMN" in r.stderr


def test_unknown_column_named_by_check_and_in_the_report(tmp_path):
    """An unknown column is named in the `check` terminal summary and in the PDF report
    (issue: no column dropped in silence)."""
    from pypdf import PdfReader

    from tests.badinput import GOOD as JOB

    sched = tmp_path / "pb.csv"
    sched.write_text(
        GOOD.replace("Length [ft]\n", "Length [ft],Ins\n")
        .replace(",60\n", ",60,90\n")
        .replace(",40\n", ",40,90\n")
    )
    job = tmp_path / "job.toml"
    job.write_text(JOB.replace('load = "20 kVA"', 'load = "20 kVA"\nschedule = "pb.csv"'))
    r = _run("check", job)
    assert r.exit_code in (0, 1), r.output
    assert "notice:" in r.output and "'Ins'" in r.output
    pdf = tmp_path / "r.pdf"
    r = _run("report", job, "-o", pdf)
    assert r.exit_code in (0, 1), r.output
    text = " ".join(page.extract_text() for page in PdfReader(str(pdf)).pages)
    assert "Reading notices" in text and "Ins" in text
