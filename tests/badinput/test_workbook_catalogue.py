# ruff: noqa: E501  (expected messages are quoted whole; wrapping them hides them)
"""Catalogue of bad job workbooks, each run through ``feedcheck check`` (exit code 2).

Every case writes the valid job of :mod:`badinput` as a workbook, breaks it in one
place with openpyxl (or at the byte level) and asserts the complete set of messages,
``error: <file>: sheet '<name>', row <n>, column '<key>' got '<value>'; expected …``,
the closing count line, nothing on stdout and no output file. The job's own mistakes
(a wrong length, a missing key) read as in a job file, placed at the cell instead of
the line: the replay of the whole bad-job catalogue is in
tests/inputs/test_workbook_roundtrip.py.
"""

from __future__ import annotations

import datetime as dt
import io
import tomllib
import zipfile

import openpyxl
import pytest

from feedcheck.inputs.workbook_cells import COLUMNS_EXPECTED
from feedcheck.workbook_export import job_workbook

from . import GOOD, assert_no_traceback, assert_rejected, cli

RUN_KEYS = "id, from, to, length, conductors, sets, insulation, raceway, ambient, current_carrying, ground, device, termination, rooftop_height, harmonic_neutral, clearing_time, tap_rule, bonding_jumper, neutral"
SHEETS = "project, source, transformer, run, panel, motor, generator, transfer_switch, options"
TEXT = "text (this cell holds {}: format the cell as Text, or type an apostrophe before the value)"
NOT_DATE = "a text or a number, not a date (format the cell as Text and type the value again)"
INSIDE = "a path inside the job file's folder (no absolute paths, no '..')"
# run sheet of GOOD: A id, B from, C to, D length, E conductors, F sets, G insulation,
# H raceway, I ambient, J current_carrying, K ground, L device; rows 2 (W-A) and 3 (W-B)


def _good(path):
    path.write_bytes(job_workbook(tomllib.loads(GOOD)))
    return path


def _edit(path, change):
    wb = openpyxl.load_workbook(path)
    change(wb)
    wb.save(path)


def _set(sheet, cell, value, number_format=None):
    def change(wb):
        wb[sheet][cell] = value
        if number_format:
            wb[sheet][cell].number_format = number_format

    return change


def _merge(wb):
    wb["run"].merge_cells("K2:L2")


def _gap(wb):
    wb["run"].insert_rows(3)


def _drop_column(sheet, col):
    return lambda wb: wb[sheet].delete_cols(col)


# fmt: off
CASES = [
    ("sheet-unknown", lambda wb: wb.create_sheet("runs"),
     [f"sheet 'runs' got 'runs'; expected a sheet named after a table of the job: {SHEETS} — did you mean 'run'?"]),
    ("sheet-twice", lambda wb: wb.create_sheet("Run "),
     ["sheet 'Run ' got 'Run '; expected one sheet per table ('run' is run too)"]),
    ("header-unknown", lambda wb: (_set("run", "M1", "lenght")(wb), _set("run", "M2", "3 ft")(wb)),
     [f"sheet 'run', row 1, column M got 'lenght'; expected one of the keys of [run]: {RUN_KEYS} — did you mean 'length'?"]),
    ("header-with-unit", _set("run", "D1", "length [ft]"),
     [f"sheet 'run', row 1, column D got 'length [ft]'; expected one of the keys of [run]: {RUN_KEYS} — did you mean 'length'?"]),
    ("header-twice", _set("run", "M1", "Length"),
     ["sheet 'run', row 1, column M got 'Length'; expected each key once (column D has it)"]),
    ("header-number", lambda wb: (_set("run", "M1", 5)(wb), _set("run", "M2", "x")(wb)),
     [f"sheet 'run', row 1, column M got '5'; expected one of the keys of [run]: {RUN_KEYS}"]),
    ("value-without-key", _set("run", "P3", "spare"),
     ["sheet 'run', row 3, column P got 'spare'; expected a value under a key of row 1 (this column has none)"]),
    ("empty-row-between", _gap,
     ["sheet 'run', row 3 got '(empty row)'; expected one element per row from row 2, no empty row between (delete it)"]),
    ("merged-cells", _merge,
     ["sheet 'run', cells K2:L2 got 'merged cells'; expected one value per cell (unmerge the cells)"]),
    ("formula-no-stored-value", _set("run", "F2", "=1+1"),
     ["sheet 'run', row 2, column 'sets' got '=1+1'; expected a value: this formula has no stored result (type the value, or open and save the workbook in a spreadsheet program; formulas are not evaluated)"]),
    ("spreadsheet-error", _set("run", "F2", "#DIV/0!"),
     ["sheet 'run', row 2, column 'sets' got '#DIV/0!'; expected a value, not a spreadsheet error"]),
    ("date-in-id", _set("run", "A3", dt.datetime(2026, 1, 2)),
     ["sheet 'run', row 3, column 'id' got '2026-01-02 00:00:00'; expected " + TEXT.format("a date or time the spreadsheet made of what was typed")]),
    ("date-in-length", _set("run", "D2", dt.datetime(2026, 1, 2)),
     [f"sheet 'run', row 2, column 'length' got '2026-01-02 00:00:00'; expected {NOT_DATE}"]),
    ("number-in-id", _set("transformer", "A2", 5),
     ["sheet 'transformer', row 2, column 'id' got '5'; expected " + TEXT.format("a number")]),
    ("decimal-in-conductors", _set("run", "E3", 2.5),
     ["sheet 'run', row 3, column 'conductors' got '2.5'; expected " + TEXT.format("a number")]),
    ("truth-in-raceway", _set("run", "H2", True),
     ["sheet 'run', row 2, column 'raceway' got 'TRUE'; expected " + TEXT.format("a truth value")]),
    ("source-two-rows", _set("source", "A3", "480 V delta"),
     ["sheet 'source', row 3 got 'a second row'; expected one row: the job has one [source] (its keys across row 2)"]),
    ("columns-not-a-map", lambda wb: (_set("panel", "I1", "columns")(wb), _set("panel", "I2", "Ins = insulation")(wb)),
     [f"sheet 'panel', row 2, column 'columns' got 'Ins = insulation'; expected {COLUMNS_EXPECTED}"]),
    ("columns-extra-key", lambda wb: (_set("panel", "I1", "columns")(wb), _set("panel", "I2", '{Ins = "insulation"}\nx = 1')(wb)),
     [f"sheet 'panel', row 2, column 'columns' got '{{Ins = \"insulation\"}}\\nx = 1'; expected {COLUMNS_EXPECTED}"]),
    ("far-row", _set("run", "A20000", "W-Z"),
     ["sheet 'run', row 20000 got 'a value'; expected at most 5,000 rows of elements"]),
    ("far-column", _set("run", "BZ2", "x"),
     ["sheet 'run', column BZ got 'a value'; expected at most 60 columns"]),
    # the job's own validation, placed at the cell
    ("length-unit", _set("run", "D3", "140 fx"),
     ["sheet 'run', row 3, column 'length' got '140 fx'; expected a length with a unit, e.g. '85 ft or 26 m' ('fx' is not a unit)"]),
    ("sets-as-text", _set("run", "F2", "2"),
     ["sheet 'run', row 2, column 'sets' got '2'; expected a whole number from 1 to 20 (no quotes)"]),
    ("missing-required", _drop_column("transformer", 8),
     ["sheet 'transformer', row 2, column 'primary_device' got (missing); expected a value for 'primary_device' (required)"]),
    ("missing-source-sheet", lambda wb: wb.remove(wb["source"]),
     ["sheet 'source' got (missing); expected a [source] table (required)"]),
    ("schedule-outside", lambda wb: (_set("panel", "I1", "schedule")(wb), _set("panel", "I3", "../pb.csv")(wb)),
     [f"sheet 'panel', row 3, column 'schedule' got '../pb.csv'; expected {INSIDE}"]),
    ("unknown-from-case", _set("run", "B3", "pa"),
     ["sheet 'run', row 3, column 'from' got 'pa'; expected the id of the source, a transformer or a panel"]),
]
# fmt: on


@pytest.mark.parametrize(("change", "expected"), [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_bad_workbook(tmp_path, change, expected):
    job = _good(tmp_path / "job.xlsx")
    _edit(job, change)
    out = tmp_path / "out.json"
    r = cli("check", job, "--format", "json", "--out", out)
    lines = assert_rejected(r, out, n=len(expected))
    assert sorted(lines) == sorted(f"error: {job}: {tail}" for tail in expected)


def test_case_ids_unique():
    ids = [c[0] for c in CASES]
    assert len(ids) == len(set(ids)) and len(ids) >= 25


def _zip(parts: dict[str, bytes]) -> bytes:
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w", zipfile.ZIP_DEFLATED) as z:
        for name, data in parts.items():
            z.writestr(name, data)
    return buf.getvalue()


@pytest.mark.parametrize(
    ("name", "data", "expected"),
    [
        (
            "job.xlsx",
            b"[project]\nname = 'x'\n",
            "got '(not a zip archive)'; expected an .xlsx workbook saved by a spreadsheet program",
        ),
        ("job.xlsx", b"", "got '(empty file)'; expected a job workbook (see `feedcheck workbook`)"),
        (
            "job.xlsx",
            _zip({"a.txt": b"hello"}),
            "expected an .xlsx workbook that opens in a spreadsheet program",
        ),
        (
            "job.xlsx",
            _zip({"a.txt": b"\0" * 5_000_000}),
            "expected parts compressed at most 200:1 (zip bomb guard)",
        ),
        (
            "job.ods",
            b"PK",
            "got 'job.ods'; expected a TOML job file or a job workbook saved as .xlsx",
        ),
        (
            "job.xls",
            b"\xd0\xcf",
            "got 'job.xls'; expected a TOML job file or a job workbook saved as .xlsx",
        ),
        (
            "job.csv",
            b"a,b\n",
            "got 'job.csv'; expected a TOML job file or a job workbook saved as .xlsx",
        ),
    ],
    ids=["text-named-xlsx", "empty", "zip-not-workbook", "zip-bomb", "ods", "xls", "csv"],
)
def test_not_a_job_workbook(tmp_path, name, data, expected):
    job = tmp_path / name
    job.write_bytes(data)
    (line,) = assert_rejected(cli("check", job), n=1)
    assert line.startswith(f"error: {job}: ") and line.endswith(expected), line


def _zip_needing_version_7_1() -> bytes:
    data = bytearray(job_workbook(tomllib.loads(GOOD)))
    i = data.index(b"PK\x01\x02")  # the first entry of the central directory
    data[i + 6] = 71  # "version needed to extract": 7.1, which no reader here supports
    return bytes(data)


@pytest.mark.parametrize("command", [["check"], ["schedule", "--system", "208Y/120 V"]])
def test_damaged_zip_directory_is_an_input_error_not_a_fault(tmp_path, command):
    """Found by tests/fuzz/fuzz_workbook.py: the zip reader's NotImplementedError was an
    internal error (exit 3) for a job workbook and a schedule workbook alike."""
    p = tmp_path / "PA.xlsx"
    p.write_bytes(_zip_needing_version_7_1())
    (line,) = assert_rejected(cli(*command, p), n=1)
    assert line == (
        f"error: {p}: got '(a damaged zip archive: NotImplementedError)'; expected an .xlsx "
        "workbook saved by a spreadsheet program"
    )


def test_a_folder_named_like_a_workbook(tmp_path):
    job = tmp_path / "job.xlsx"
    job.mkdir()
    (line,) = assert_rejected(cli("check", job), n=1)
    assert line == f"error: {job}: got '{job}'; expected a job workbook (.xlsx), not a folder"


def test_workbook_over_the_size_limit_is_refused_before_reading(tmp_path, monkeypatch):
    from feedcheck.inputs import workbook_file

    job = _good(tmp_path / "job.xlsx")
    kind = workbook_file.WORKBOOK_FILE
    monkeypatch.setattr(
        workbook_file,
        "WORKBOOK_FILE",
        type(kind)(
            *(
                (
                    kind.noun,
                    kind.folder_hint,
                    100,
                    "a job workbook of at most 100 bytes",
                    kind.suffixes,
                    kind.suffix_expected,
                )
            )
        ),
    )
    (line,) = assert_rejected(cli("check", job), n=1)
    assert (
        line
        == f"error: {job}: got '{job.stat().st_size} bytes'; expected a job workbook of at most 100 bytes"
    )


def test_filled_cells_beyond_the_limit_end_the_reading(tmp_path, monkeypatch):
    from feedcheck.inputs import workbook_file

    monkeypatch.setattr(workbook_file, "MAX_CELLS", 30)
    job = _good(tmp_path / "job.xlsx")
    (line,) = assert_rejected(cli("check", job), n=1)
    assert line.startswith(f"error: {job}: sheet 'run', row ") and line.endswith(
        "filled cells'; expected at most 30 filled cells in the workbook"
    ), line


def test_sheet_with_a_forged_small_dimension_is_read_whole(tmp_path):
    """The stored size of a sheet (``<dimension ref="A1:A1"/>``) is not trusted."""
    job = _good(tmp_path / "job.xlsx")
    _edit(job, _set("run", "D3", "140 fx"))
    with zipfile.ZipFile(job) as z:
        parts = {i.filename: z.read(i.filename) for i in z.infolist()}
    name = f"xl/worksheets/sheet{openpyxl.load_workbook(job).sheetnames.index('run') + 1}.xml"
    xml = parts[name].decode()
    start = xml.index("<dimension ref=")
    parts[name] = (
        xml[:start] + '<dimension ref="A1:A1" />' + xml[xml.index("/>", start) + 2 :]
    ).encode()
    job.write_bytes(_zip(parts))
    (line,) = assert_rejected(cli("check", job), n=1)
    assert "sheet 'run', row 3, column 'length' got '140 fx'" in line


def _with_stored_formula(path):
    """Row 2's sets cell as a formula with the value a spreadsheet program stored (2)."""
    with zipfile.ZipFile(path) as z:
        parts = {i.filename: z.read(i.filename) for i in z.infolist()}
    wb = openpyxl.load_workbook(path)
    sheet_no = wb.sheetnames.index("run") + 1
    name = f"xl/worksheets/sheet{sheet_no}.xml"
    xml = parts[name].decode()
    old = '<c r="F2" t="n"><v>1</v></c>'
    assert old in xml
    parts[name] = xml.replace(old, '<c r="F2"><f>1+1</f><v>2</v></c>').encode()
    path.write_bytes(_zip(parts))


def test_workbooks_a_spreadsheet_program_makes_are_read(tmp_path):
    """What a person does in a spreadsheet and is not a mistake: sheet names in other
    case and spacing, a capitalised key, a percentage typed as 5.1 %, a formula whose
    result is stored, styled empty rows below the last element, the project date as a
    date: the same job (its figures compared with the job file's)."""
    job = _good(tmp_path / "job.xlsx")

    def change(wb):
        wb["transformer"]["F2"] = 0.046  # impedance 4.6 %, as a spreadsheet stores it
        wb["transformer"]["F2"].number_format = "0.0%"
        wb["transformer"].title = "tx"
        wb["tx"].title = " Transformer "
        wb["run"]["D1"] = "Length"
        wb["run"]["A40"].number_format = "0.00"  # a styled cell, no value
        wb["project"]["C1"] = "date"
        wb["project"]["C2"] = dt.date(2026, 11, 30)

    _edit(job, change)
    _with_stored_formula(job)
    toml = tmp_path / "job.toml"
    toml.write_text(
        GOOD.replace("sets = 1", "sets = 2").replace(
            'prepared_by = "Test fixture"', 'prepared_by = "Test fixture"\ndate = 2026-11-30'
        ),
        encoding="utf-8",
    )
    a, b = cli("check", toml, "--format", "json"), cli("check", job, "--format", "json")
    assert_no_traceback(b)
    assert b.exit_code == a.exit_code and b.exit_code in (0, 1), b.output
    assert a.stdout.replace("job.toml", "job.xlsx") == b.stdout
