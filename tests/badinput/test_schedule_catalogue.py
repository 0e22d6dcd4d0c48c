# ruff: noqa: E501  (expected messages are quoted whole; wrapping them hides them)
"""Bad panel schedules, read through a job by ``feedcheck check`` (exit code 2).

Each case writes a small CSV schedule (``pb.csv``, beside the job file, as the job's
``schedule`` path rule requires) with one thing wrong and asserts the exact message:
``error: <schedule file>: row <n>[, column '<header>'] got '<value>'; expected ...``,
the count line, nothing on stdout and no ``--out`` file. The schedule's own limits
(file size, rows, columns, XLSX unpacked size) are stated in ``feedcheck/inputs/schedule_file.py``.
"""

from __future__ import annotations

import pytest

from . import GOOD, assert_rejected, cli

HEADER = "circuit,description,load [VA],breaker [A],conductor,length [ft]\n"
ROWS = "1,Lights,1200,20,12 AWG Cu,60\n3,Receptacles,1500,20,12 AWG Cu,80\n"
CSV = HEADER + ROWS
LOAD = "expected a load in VA, a number ≥ 0"

# fmt: off
CASES = [
    ("missing-column", CSV.replace(",breaker [A]", "").replace(",20,", ","),
     "row 1 got 'circuit, description, load [VA], conductor, length [ft]'; expected header columns 'breaker' ('breaker', 'breaker rating', 'breaker size', 'brkr', 'bkr', 'cb', 'device', 'ocpd', 'trip', 'amps', 'amp', 'rating') (case, spaces and a unit in brackets do not matter)"),
    ("load-text", CSV.replace("1200", "lots"), f"row 2, column 'load [VA]' got 'lots'; {LOAD}"),
    ("load-negative", CSV.replace("1200", "-5"), f"row 2, column 'load [VA]' got '-5'; {LOAD}"),
    ("load-nan", CSV.replace("1200", "nan"), f"row 2, column 'load [VA]' got 'nan'; {LOAD}"),
    ("size-unknown", CSV.replace("12 AWG Cu,60", "13 AWG Cu,60"),
     "row 2, column 'conductor' got '13 AWG Cu'; expected a conductor such as '12 AWG Cu', '500 MCM CU THHN' or '3#12, 1#12G'; could not read '13 AWG' (expected a standard size: 14 AWG … 4/0 AWG, 250 … 2000 kcmil, or 1.5 … 630 mm2 — did you mean '3 AWG' or '1 AWG'?)"),
    ("length-unit-unknown", CSV.replace("length [ft]", "length [furlong]"),
     "row 1, column 6 got 'length [furlong]'; expected a header such as 'length [ft]' or 'length [m]'"),
    ("circuit-twice", CSV.replace("\n3,", "\n1,"),
     "row 3, column 'circuit' got '1'; expected a circuit number not used twice in panel PB (it has the same circuit number as row 2, space 1)"),
    ("empty-file", "", "got '(empty file)'; expected a header row and one row per circuit"),
    ("header-only", HEADER, "got '(no circuit rows)'; expected at least one circuit row under the header"),
    ("ragged-row", CSV + "5,x,100,20,12 AWG Cu,10,extra,more\n",
     "row 4 got 'Expected 6 fields in line 4, saw 8'; expected the same number of cells in every row as in the header"),
]
# fmt: on


def _job_with(tmp_path, schedule: bytes):
    job = tmp_path / "job.toml"
    job.write_text(
        GOOD.replace('load = "20 kVA"', 'load = "20 kVA"\nschedule = "pb.csv"'), encoding="utf-8"
    )
    (tmp_path / "pb.csv").write_bytes(schedule)
    return job


def test_valid_schedule_checks(tmp_path):
    r = cli("check", _job_with(tmp_path, CSV.encode()), "--format", "json")
    assert r.exit_code in (0, 1), r.stderr


@pytest.mark.parametrize(("text", "tail"), [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_bad_schedule(tmp_path, text, tail):
    job = _job_with(tmp_path, text.encode("utf-8"))
    out = tmp_path / "r.json"
    (line,) = assert_rejected(cli("check", job, "--format", "json", "--out", out), out, n=1)
    assert line == f"error: {tmp_path / 'pb.csv'}: {tail}"


def test_schedule_not_utf8(tmp_path):
    job = _job_with(tmp_path, CSV.replace("Lights", "Lumi\xe8re").encode("latin-1"))
    (line,) = assert_rejected(cli("check", job), n=1)
    assert line == (
        f"error: {tmp_path / 'pb.csv'}: row 2 got 'byte 0xe8'; "
        "expected UTF-8 text (save the schedule as CSV UTF-8)"
    )


def test_schedule_and_job_problems_all_reported(tmp_path):
    """A bad schedule row and a second bad row: both in one run."""
    bad = CSV.replace("1200", "lots").replace("12 AWG Cu,80", "13 AWG Cu,80")
    job = _job_with(tmp_path, bad.encode())
    lines = assert_rejected(cli("check", job), n=2)
    assert any("row 2, column 'load [VA]' got 'lots'" in ln for ln in lines)
    assert any("row 3, column 'conductor' got '13 AWG Cu'" in ln for ln in lines)
