"""``feedcheck schedule``: exit codes, exports (atomic, formula-safe), job mode, interrupts."""

import json
import shutil

import openpyxl
import pytest
from click.testing import CliRunner

from feedcheck.cli import main

WYE = ["--system", "208Y/120 V"]


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


def test_help_has_example_and_caution():
    r = _run("schedule", "--help")
    assert r.exit_code == 0
    assert "Examples:" in r.stdout and "licensed electrician or engineer" in r.stdout


def test_clean_schedule_exits_0(samples):
    r = _run("schedule", samples / "LP1.csv", *WYE)
    assert r.exit_code == 0, r.output
    assert "panel LP1" in r.stdout and "12 circuits, 0 fail" in r.stdout


def test_errors_flagged_exit_1_and_csv_neutralised(samples, tmp_path):
    out = tmp_path / "res.csv"
    r = _run("schedule", samples / "LA_with_errors.csv", *WYE, "--out", out)
    assert r.exit_code == 1, r.output
    assert "FAIL" in r.stdout and "12 AWG cu on 30 A" in r.stdout
    text = out.read_text(encoding="utf-8")
    assert "status" in text.splitlines()[0] and "reason" in text.splitlines()[0]
    assert "'=HYPERLINK" in text and ",=HYPERLINK" not in text and '"=HYPERLINK' not in text
    assert sorted(p.name for p in tmp_path.iterdir()) == ["res.csv", "res.panels.csv"]


def test_xlsx_and_json_exports(samples, tmp_path):
    xl = tmp_path / "res.xlsx"
    r = _run("schedule", samples / "LA_with_errors.csv", *WYE, "--out", xl)
    assert r.exit_code == 1
    ws = openpyxl.load_workbook(xl, read_only=True)["circuits"]
    rows = list(ws.iter_rows(values_only=True))
    head = list(rows[0])
    desc = [row[head.index("description")] for row in rows[1:]]
    assert any(d.startswith("'=HYPERLINK") for d in desc)
    assert not any(isinstance(d, str) and d.startswith("=") for d in desc)
    js = tmp_path / "res.json"
    _run("schedule", samples / "LP1.csv", *WYE, "--out", js)
    d = json.loads(js.read_text())
    assert d["files"][0]["totals"]["panel"] == "LP1" and "licensed" in d["caution"]
    assert {"status", "reason", "total_vdrop_pct"} <= set(d["files"][0]["circuits"][0])


def test_bad_input_exits_2_and_writes_nothing(samples, tmp_path):
    bad = tmp_path / "bad.csv"
    bad.write_text("circuit,load [VA],breaker [A],conductor,length [ft]\n1,abc,20,12 AWG Cu,5\n")
    out = tmp_path / "res.csv"
    r = _run("schedule", samples / "LP1.csv", bad, *WYE, "--out", out)
    assert r.exit_code == 2
    assert "bad.csv: row 2, column 'load [VA]' got 'abc'" in r.stderr
    assert "nothing was written" in r.stderr and "LP1.csv" in r.stderr
    assert "Traceback" not in r.output and not out.exists()


def test_usage_errors():
    assert _run("schedule", "x.csv").exit_code == 2
    r = CliRunner().invoke(main, ["schedule", "--system", "208Y/120 V"])
    assert r.exit_code == 2 and "no .csv or .xlsx" in r.output


def test_job_mode_takes_voltage_and_feeder_drop(samples):
    r = _run("schedule", "--job", samples / "harbor_kitchen.toml")
    assert r.exit_code in (0, 1), r.output
    assert "panel LP1" in r.stdout and "panel EQ1" in r.stdout
    r = _run("schedule", "--job", samples / "maple_farmhouse.toml", samples / "SHOP.csv")
    assert "120/240 V" in r.stdout
    r = _run("schedule", "--job", samples / "maple_farmhouse.toml", samples / "LP1.csv")
    assert r.exit_code == 2 and "a schedule named by a panel" in r.stderr


def test_folder_with_progress_and_interrupt_leaves_nothing(samples, tmp_path, monkeypatch):
    src = tmp_path / "in"
    src.mkdir()
    for k in range(12):
        shutil.copy(samples / "LP1.csv", src / f"P{k:02d}.csv")
    out = tmp_path / "res.csv"
    r = _run("schedule", src, *WYE, "--out", out)
    assert r.exit_code == 0 and "12 file(s)" in r.stdout and out.exists()
    out.unlink()
    (tmp_path / "res.panels.csv").unlink()
    import feedcheck.inputs.schedule_alike as sa

    real = sa._plain_lines
    calls = []

    def flaky(*a, **k):
        calls.append(1)
        if len(calls) == 3:
            raise KeyboardInterrupt
        return real(*a, **k)

    # interrupted while reading the third file: alike files are read together after
    # each is guarded and split, and checked together after reading
    # (checks/schedule_batch.check_files), so none is checked yet
    monkeypatch.setattr(sa, "_plain_lines", flaky)
    r = _run("schedule", src, *WYE, "--out", out)
    assert r.exit_code == 130
    assert "interrupted" in r.stderr and "0 of 12" in r.stderr
    assert not out.exists() and [p.name for p in tmp_path.iterdir()] == ["in"]


@pytest.mark.parametrize("name", ["res.txt"])
def test_out_suffix_checked(samples, tmp_path, name):
    r = _run("schedule", samples / "LP1.csv", *WYE, "--out", tmp_path / name)
    assert r.exit_code == 2 and ".csv, .xlsx or .json" in r.output


def test_collector_set_back_after_the_files(samples, tmp_path):
    # the objects set aside from the garbage collector while files are read are given
    # back, a good run or a refused one (no published value: the process's own state)
    import gc

    bad = tmp_path / "LP2.csv"
    bad.write_text("circuit,load [VA],breaker [A],conductor\n1,lots,20,12 AWG Cu\n")
    before = gc.get_freeze_count()
    assert _run("schedule", samples / "LP1.csv", *WYE).exit_code == 0
    assert gc.get_freeze_count() == before
    assert _run("schedule", bad, *WYE).exit_code == 2
    assert gc.get_freeze_count() == before
