"""The job workbook reads back as the job it was written from.

Oracle: our own TOML job reader. A workbook written from a job file must give the
same data (types included) and the same ``feedcheck check --format json`` output,
apart from the job's file name (``job.file``, the only field naming the input; the
JSON has no hash of it). No published value is involved: the property checked is
that two spellings of one job are read alike.
"""

from __future__ import annotations

import datetime as dt
import json
import shutil
import tomllib
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from feedcheck.errors import InputError
from feedcheck.inputs.job_file import parse_job_data, read_job, read_job_data
from feedcheck.inputs.workbook_cells import SHEETS, TEXT_KEYS
from feedcheck.inputs.workbook_file import read_workbook, workbook_data
from feedcheck.workbook_export import job_workbook, template_workbook

from ..badinput import GOOD, cli

SAMPLES = Path(__file__).resolve().parents[2] / "sample_jobs"
SAMPLE_JOBS = sorted(p.name for p in SAMPLES.glob("*.toml"))


def _copy_samples(tmp_path: Path) -> Path:
    for p in SAMPLES.iterdir():
        shutil.copy(p, tmp_path / p.name)
    return tmp_path


def _check_json(path: Path) -> dict:
    r = cli("check", path, "--format", "json")
    assert r.exit_code in (0, 1), r.output
    out = json.loads(r.stdout)
    assert out["job"].pop("file") == path.name
    return out


def test_every_sample_job_is_a_sample_here():
    assert len(SAMPLE_JOBS) >= 7


@pytest.mark.parametrize("name", SAMPLE_JOBS)
def test_sample_job_round_trip_gives_the_same_check_output(tmp_path, name):
    folder = _copy_samples(tmp_path)
    toml = folder / name
    xlsx = toml.with_suffix(".xlsx")
    r = cli("workbook", toml)
    assert r.exit_code == 0, r.output
    assert xlsx.is_file()
    assert read_job_data(xlsx) == read_job_data(toml)  # the same data, types included
    assert _check_json(xlsx) == _check_json(toml)


@pytest.mark.parametrize("name", SAMPLE_JOBS)
def test_sample_job_written_again_from_its_workbook_is_the_same_workbook_data(tmp_path, name):
    folder = _copy_samples(tmp_path)
    first = folder / "first.xlsx"
    first.write_bytes(job_workbook(read_job_data(folder / name)))
    again = workbook_data(job_workbook(read_job_data(first)), "again.xlsx")
    assert again.data == read_job_data(first)


def _one_value(kind: str, key: str, value):
    """``value`` written in the cell of ``key`` and read back."""
    many = SHEETS[kind][1]
    element = {"id": "X1", key: value} if many else {key: value}
    data = {kind: [element] if many else element}
    back = workbook_data(job_workbook(data), "v.xlsx").data[kind]
    return (back[0] if many else back)[key]


@pytest.mark.parametrize(
    ("kind", "key", "value"),
    [
        ("transformer", "tap", "-2.5 %"),  # starts like a formula: kept with an apostrophe
        ("transformer", "tap", "+2.5 %"),
        ("transformer", "tap", "0"),
        ("project", "notes", "=SUM(A1:A9)"),
        ("project", "notes", "@cmd"),
        ("project", "notes", "\ufeff=1+1"),
        ("project", "notes", "'quoted already"),
        ("project", "notes", "''"),
        ("project", "notes", ""),  # the empty text (a lone apostrophe in the cell)
        ("project", "notes", "  spaced  "),
        ("project", "notes", "two\nlines\tand a tab"),
        ("project", "notes", "Ünïcödé — 75 °C, 1½ in"),
        ("project", "date", dt.date(2026, 11, 30)),  # an unquoted TOML date
        ("project", "date", dt.datetime(2026, 11, 30, 8, 30)),
        ("project", "date", "2026-11-30"),
        ("project", "revision", 3),
        ("transformer", "phases_connected", "A-B"),
        ("transformer", "x_r", 3.5),
        ("transformer", "x_r", 4),
        ("transformer", "x_r", 4.0),  # a whole decimal stays a decimal (number format 0.0)
        ("transformer", "x_r", 1e-7),
        ("transformer", "x_r", 123456789012345),
        ("run", "harmonic_neutral", True),
        ("run", "harmonic_neutral", False),
        ("run", "length", "85 ft"),
        ("panel", "columns", {"Ins": "insulation", "Notes": "ignore"}),
        ("panel", "columns", {"Cont?": "continuous", 'a "b"': "ignore", "x=y, z": "ignore"}),
        ("panel", "columns", {}),
    ],
)
def test_cell_spelling_reads_back_identically(kind, key, value):
    back = _one_value(kind, key, value)
    assert back == value and type(back) is type(value)


@pytest.mark.parametrize(
    ("value", "expected"),
    [
        ("a\x00b", "a text without control characters (a cell cannot hold them)"),
        ("a\rb", "a text without control characters (a cell cannot hold them)"),
        (0.1 + 0.2, "a finite number of at most 16 significant digits (a cell's)"),
        (float("inf"), "a finite number of at most 16 significant digits (a cell's)"),
        (10**16, "a whole number of at most 15 digits (a cell's)"),
        ([1, 2], "a text, a number, true or false"),
    ],
)
def test_values_no_cell_holds_unchanged_are_refused_with_their_key(value, expected):
    with pytest.raises(InputError) as e:
        job_workbook({"project": {"name": "P", "notes": value}}, "job.toml")
    (p,) = e.value.problems
    assert (p.file, p.where, p.expected) == ("job.toml", "project.notes", expected)


def test_a_list_in_the_project_date_is_written_as_the_text_the_reader_makes_of_it():
    # project.date and project.revision are read with str(); a TOML array there is valid
    assert _one_value("project", "date", [2026, 11]) == str([2026, 11])


def test_job_shapes_no_workbook_holds_are_refused():
    with pytest.raises(InputError) as e:
        job_workbook({"transformer": {"id": "T1"}, "extra": 1}, "job.toml")
    assert sorted((p.where, p.expected) for p in e.value.problems) == [
        ("extra", "a table of the job: " + _order()),
        ("transformer", "[[transformer]] blocks"),
    ]


def _order() -> str:
    from feedcheck.workbook_export import SHEET_ORDER

    return ", ".join(SHEET_ORDER)


def _exact_float(x: float) -> bool:
    return float(f"{x:.16g}") == x


_TEXT = st.text(
    st.characters(blacklist_categories=("Cs",), blacklist_characters="\r\x7f\ufffe\uffff").filter(
        lambda c: c in "\n\t" or ord(c) >= 0x20
    ),
    max_size=30,
)
_VALUE = st.one_of(
    _TEXT,
    st.booleans(),
    st.integers(-(10**14), 10**14),
    st.floats(allow_nan=False, allow_infinity=False, width=64).filter(_exact_float),
)


_RUN_VALUE_KEYS = [k for k in SHEETS["run"][0] if k not in TEXT_KEYS]


@settings(max_examples=60, deadline=None)
@given(st.dictionaries(st.sampled_from(_RUN_VALUE_KEYS), _VALUE))
def test_any_run_values_read_back_identically(values):
    """Property: texts (formula-like, apostrophes, empty, any printable character),
    numbers a cell holds, truth values: written and read back unchanged."""
    data = {"run": [{"id": "R1", **values}]}
    back = workbook_data(job_workbook(data), "p.xlsx").data
    assert back == data
    types = {k: type(v) for k, v in data["run"][0].items()}
    assert {k: type(v) for k, v in back["run"][0].items()} == types


# ---------------------------------------------------------------- text keys
def _standby_data() -> dict:
    data = tomllib.loads((SAMPLES / "willow_yard_standby.toml").read_text(encoding="utf-8"))
    data["options"] = {"voltage_drop": "recommended"}
    return data


@pytest.mark.parametrize(
    ("kind", "key"),
    sorted((kind, key) for kind, (keys, _) in SHEETS.items() for key in keys if key in TEXT_KEYS),
)
def test_text_keys_are_text_only_in_the_job_file_reader(kind, key):
    """A number where the workbook asks for text: the job file's reader refuses it too
    (so the workbook's own message replaces one, never accepts what TOML refuses)."""
    data = _standby_data()
    element = data[kind][0] if isinstance(data[kind], list) else data[kind]
    element[key] = 1
    with pytest.raises(InputError) as e:
        parse_job_data(data, "", SAMPLES / "willow_yard_standby.toml")
    tails = {p.where.split("]", 1)[-1].split(".")[-1] for p in e.value.problems}
    assert key in tails, [str(p) for p in e.value.problems]


# ---------------------------------------------------------------- the same messages
def _catalogue_cases():
    from ..badinput.test_job_catalogue import CASES

    for case_id, old, new, _ in CASES:
        text = GOOD.replace(old, new, 1)
        try:
            data = tomllib.loads(text)
            job_workbook(data)
        except (tomllib.TOMLDecodeError, InputError):
            continue  # a syntax error or a shape no workbook holds: nothing to compare
        yield case_id, text


REPLAYED = list(_catalogue_cases())


def test_most_of_the_bad_job_catalogue_is_replayed_as_workbooks():
    assert len(REPLAYED) >= 50


@pytest.mark.parametrize(("case_id", "text"), REPLAYED, ids=[c[0] for c in REPLAYED])
def test_bad_job_as_workbook_gives_the_same_messages_at_its_cells(tmp_path, case_id, text):
    """Each case of the bad-job catalogue written as a workbook: the same problems
    (value and expectation), placed at sheet, row and column instead of key and line;
    a number, truth value or date where text is expected is refused by the workbook
    reader itself, at the same cell."""
    toml = tmp_path / "job.toml"
    toml.write_text(text, encoding="utf-8")
    xlsx = tmp_path / "job.xlsx"
    xlsx.write_bytes(job_workbook(tomllib.loads(text)))
    with pytest.raises(InputError) as want:
        read_job(toml)
    with pytest.raises(InputError) as got:
        read_job(xlsx)
    placed = read_workbook_places(xlsx)
    expected = sorted((placed.where(p.where), p.value, p.expected) for p in want.value.problems)
    found = sorted((p.where, p.value, p.expected) for p in got.value.problems)
    assert all(p.file == str(xlsx) and p.line is None for p in got.value.problems)
    if case_id in WORKBOOK_WORDING:  # refused as a cell or a header, in a workbook's words
        sheets = {w.split(",")[0] for w, _, _ in expected}
        assert {w.split(",")[0] for w, _, _ in found} <= sheets, (found, expected)
        assert all(WORKBOOK_WORDING[case_id] in e for _, _, e in found), found
    else:
        assert found == expected


# cases the workbook reader refuses before the job's validation, and its wording
WORKBOOK_WORDING = {
    "misspelt-key": "one of the keys of [panel]",
    "length-toml-date": "not a date",
    "ground-number": "this cell holds a number",
}


def read_workbook_places(xlsx: Path):
    """Where each element stands, read without the cell checks (for the expected text)."""
    import openpyxl

    from feedcheck.inputs.workbook_file import Located

    wb = openpyxl.load_workbook(xlsx)
    placed = Located(str(xlsx))
    for ws in wb.worksheets[1:]:
        placed.sheet_of[ws.title] = ws.title
        placed.rows[ws.title] = list(range(2, ws.max_row + 1))
    return placed


def test_template_workbook_is_the_template_job(tmp_path):
    from feedcheck.template import TEMPLATE

    p = tmp_path / "t.xlsx"
    p.write_bytes(template_workbook())
    assert read_workbook(p).data == tomllib.loads(TEMPLATE)
