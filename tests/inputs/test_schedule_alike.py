"""Alike schedule files read together give what reading each file alone gives: the same
Schedule (frame, notices, spaces, panels, system) or the same problems, good and bad files
mixed (identity between two ways of the same computation; no published source needed)."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from feedcheck.cli import main
from feedcheck.errors import InputError
from feedcheck.inputs.schedule_alike import ScheduleReader, read_schedule_files
from feedcheck.inputs.schedule_file import read_schedule

HEADER = "circuit,description,kind,continuous,load [VA],breaker [A],conductor,length [ft]"
GOOD_ROW = "{c},circuit {c},lighting,no,{load},20,12 AWG Cu,{length}"


def _alone(path, **kw):
    try:
        return read_schedule(path, **kw)
    except InputError as exc:
        return exc


def assert_same(a, b) -> None:
    """Two results of reading one file: equal problems, or equal schedules (the frame
    bit for bit, -0.0 apart from 0.0, and each cell's Python type)."""
    if isinstance(a, InputError) or isinstance(b, InputError):
        assert type(a) is type(b), (a, b)
        assert a.problems == b.problems
        return
    for key in ("path", "load_unit", "panels", "notices", "spaces", "length_unit", "system"):
        assert getattr(a, key) == getattr(b, key), key
    fa, fb = a.circuits, b.circuits
    assert list(fa.columns) == list(fb.columns)
    assert type(fa.index) is type(fb.index) and fa.index.equals(fb.index)
    for col in fa.columns:
        x, y = fa[col].to_numpy(), fb[col].to_numpy()
        assert x.dtype == y.dtype, col
        if x.dtype.kind == "f":
            assert np.array_equal(x.view(np.int64), y.view(np.int64)), col
        else:
            assert x.tolist() == y.tolist(), col
            assert [type(v) for v in x.tolist()] == [type(v) for v in y.tolist()], col


def _write(folder: Path, name: str, lines: list[str], newline: str = "\n") -> Path:
    p = folder / name
    p.write_bytes((newline.join(lines) + newline).encode("utf-8"))
    return p


def _good(n: int, first: int = 1) -> list[str]:
    return [GOOD_ROW.format(c=first + k, load=600 + 10 * k, length=40 + k) for k in range(n)]


def test_bad_cell_in_file_537_of_1000_names_that_file_and_row(tmp_path):
    paths = [_write(tmp_path, f"P{i:04d}.csv", [HEADER, *_good(3)]) for i in range(1000)]
    bad = paths[536]
    bad.write_text(
        "\n".join([HEADER, *_good(1), "2,circuit 2,lighting,no,lots,20,12 AWG Cu,41"]) + "\n"
    )
    got = read_schedule_files(paths)
    errors = [(i, g) for i, g in enumerate(got) if isinstance(g, InputError)]
    assert [i for i, _ in errors] == [536]
    (problem,) = errors[0][1].problems
    assert (problem.file, problem.where, problem.value) == (
        str(bad),
        "row 3, column 'load [VA]'",
        "lots",
    )
    assert problem.expected == "a load in VA, a number ≥ 0"
    assert_same(errors[0][1], _alone(bad))
    for i in (0, 535, 537, 999):
        assert_same(got[i], _alone(paths[i]))
        assert got[i].panels == (paths[i].stem,)


def test_folder_with_a_bad_file_exits_2_naming_it(tmp_path, capsys):
    for i in range(40):
        _write(tmp_path, f"P{i:02d}.csv", [HEADER, *_good(4)])
    _write(tmp_path, "P23.csv", [HEADER, *_good(2), "2,dup,lighting,no,100,20,12 AWG Cu,10"])
    with pytest.raises(SystemExit) as exit_:
        main(["schedule", str(tmp_path), "--system", "208Y/120 V"])
    assert exit_.value.code == 2
    err = capsys.readouterr().err
    assert (
        f"error: {tmp_path / 'P23.csv'}: row 4, column 'circuit' got '2'; expected a circuit "
        "number not used twice in panel P23 (it has the same circuit number as row 3, "
        "space 2)"
    ) in err
    assert "Traceback" not in err


# cells of each column: read well (the first the plainest), then wrong or unusual ones
VALID = {
    "panel": ["A", "B"],
    "circuit": ["{c}", " {c} "],
    "description": ["Lights", "", "Recept", "spare", "space", "Spares"],
    "kind": ["lighting", "", "receptacle", "motor", "Lights"],
    "continuous": ["no", "yes", "", "X"],
    "poles": ["1", "", "2", "3"],
    "load [VA]": ["{load}", "1,200", "0", "1e3", "1 500"],
    "breaker [A]": ["20", "20 A", "30", "20/22kAIC", "15.5"],
    "conductor": ["12 AWG Cu", "10 AWG Al", "12 AWG", "3#12, 1#12G", "#10 CU THHN"],
    "length [ft]": ["{length}", "50", "12.5", "0000000000000000012"],
    "ground": ["", "12 AWG Cu", "12"],
    "ambient": ["", "30", "40", "-5"],
    "insulation": ["", "75", "90 °C", "60C"],
    "notes": ["", "x"],
    "system": ["", "208Y/120 V"],
}
WRONG = {
    "panel": ["", " "],
    "circuit": ["1", "x", "", "-1", "1.5", "0"],
    "description": ["TOTAL", "Grand total", "Phase A total"],
    "kind": ["bogus"],
    "continuous": ["maybe"],
    "poles": ["4", "-", "one"],
    "load [VA]": ["-", "lots", "-0", "-0.0", "-0e3", "nan", "spare", ""],
    "breaker [A]": ["-", "spare", "0", ""],
    "conductor": ["", "13 AWG Cu", "blue"],
    "length [ft]": ["0", "-", "9e9", "–", ""],
    "ground": ["bogus"],
    "ambient": ["95", "-5", "x"],
    "insulation": ["45"],
    "notes": ["y"],
    "system": ["120/240 V"],
}
HEADERS = [
    ["circuit", "description", "load [VA]", "breaker [A]", "conductor", "length [ft]"],
    [
        *("panel", "circuit", "description", "kind", "continuous", "poles", "load [VA]"),
        *("breaker [A]", "conductor", "length [ft]", "ground", "ambient", "insulation", "notes"),
    ],
    ["circuit", "load [VA]", "breaker [A]", "conductor", "length [ft]", "system", "notes"],
]


def _cell(col: str, rng, k: int, how: int) -> str:
    """A cell: the plainest (``how`` 0), one read well (1) or any (2)."""
    pool = VALID[col] if how < 2 or rng.random() < 0.7 else WRONG[col]
    text = pool[int(rng.integers(len(pool)))] if how else pool[0]
    return text.format(c=k + 1, load=int(rng.integers(0, 3000)), length=int(rng.integers(5, 200)))


# rows that are not circuits: a spare, a space, a spare wired (kept as a circuit of no
# load), totals rows
SPARES = [
    {"description": "spare", "breaker [A]": "20"},
    {"description": "spare", "load [VA]": "-", "breaker [A]": "20", "length [ft]": "-"},
    {"description": "space"},
    {"description": "Spare", "breaker [A]": "20", "conductor": "12 AWG Cu", "length [ft]": "9"},
    {"description": "TOTAL", "load [VA]": "1200"},  # compared with the file's own sum
    {"description": "Phase A total", "load [VA]": "x"},
    {"circuit": "Grand total", "load [VA]": "1,200", "panel": "B"},
]


def _random_rows(rng, header: list[str]) -> list[list[str]]:
    how = int(rng.choice(3, p=[0.3, 0.5, 0.2]))  # plain, unusual but readable, anything
    rows = [list(header)]
    for k in range(int(rng.integers(0, 9))):
        roll = rng.random()
        if how == 2 and roll < 0.05:
            rows.append([""] * len(header))  # a blank row
        elif how == 2 and roll < 0.08:
            rows.append(list(header))  # the header again
        elif how and roll > 0.85:
            spare = {"circuit": str(k + 1), **SPARES[int(rng.integers(len(SPARES)))]}
            rows.append([spare.get(c, "") for c in header])
        else:
            rows.append([_cell(c, rng, k, how if rng.random() < 0.4 else 0) for c in header])
    return rows


def _random_file(rng, header: list[str]) -> list[str]:
    """Lines of plain cells (a cell holding a comma makes its row ragged)."""
    return [",".join(row) for row in _random_rows(rng, header)]


def _write_rows(folder: Path, name: str, rows: list[list[str]], form: str) -> Path:
    """``rows`` as a plain CSV file (LF or CR LF), a CSV file quoting the cells that hold
    a comma (read by the CSV parser), or an XLSX workbook of text cells."""
    if form == "xlsx":
        import openpyxl

        wb = openpyxl.Workbook()
        for row in rows:
            wb.active.append(row)
        wb.save(folder / f"{name}.xlsx")
        return folder / f"{name}.xlsx"
    if form == "quoted":
        rows = [[f'"{c}"' if "," in c else c for c in row] for row in rows]
    lines = [",".join(row) for row in rows]
    return _write(folder, f"{name}.csv", lines, "\r\n" if form == "crlf" else "\n")


@pytest.mark.parametrize("seed", range(6))
def test_random_files_read_together_as_alone(tmp_path, seed):
    rng = np.random.default_rng(seed)
    paths = []
    for i in range(80):
        header = HEADERS[int(rng.integers(len(HEADERS)))]
        form = str(rng.choice(["plain", "crlf", "quoted", "xlsx"], p=[0.5, 0.2, 0.2, 0.1]))
        paths.append(_write_rows(tmp_path, f"S{i:02d}", _random_rows(rng, header), form))
    got = read_schedule_files(paths)
    for path, g in zip(paths, got, strict=True):
        assert_same(g, _alone(path))
    assert sum(not isinstance(g, InputError) for g in got) >= 10  # good ones among them


def test_panel_ids_column_maps_and_other_files(tmp_path):
    """The job's way (panel ids, a column map), beside files read alone: quotes, an XLSX
    workbook, an empty file, a folder, a file that is not UTF-8."""
    import openpyxl

    lines = [HEADER.replace("kind", "Type?"), *_good(3)]
    plain = [_write(tmp_path, f"J{i}.csv", lines) for i in range(5)]
    quoted = _write(tmp_path, "Q.csv", [HEADER, '"1",x,lighting,no,100,20,12 AWG Cu,10'])
    wb = openpyxl.Workbook()
    for row in [HEADER.split(","), *(r.split(",") for r in _good(2))]:
        wb.active.append(row)
    wb.save(tmp_path / "W.xlsx")
    (tmp_path / "E.csv").write_bytes(b"")
    (tmp_path / "L.csv").write_bytes(HEADER.encode() + b"\n1,caf\xe9,x,no,1,20,12 AWG Cu,1\n")
    (tmp_path / "D.csv").mkdir()
    others = [quoted, tmp_path / "W.xlsx", tmp_path / "E.csv", tmp_path / "L.csv"]
    others.append(tmp_path / "D.csv")
    reader = ScheduleReader()
    cases = []
    for i, p in enumerate([*plain, *others]):
        kw = {"panel_id": f"LP-{i}", "columns": {"type": "kind"} if i % 2 else None}
        reader.add(p, **kw)
        cases.append((p, kw))
    for (p, kw), g in zip(cases, reader.read(), strict=True):
        assert_same(g, _alone(p, **kw))


def test_edited_grid_read_in_place_of_its_file(tmp_path):
    p = _write(tmp_path, "G.csv", [HEADER, *_good(2)])
    grid = np.array([r.split(",") for r in [HEADER, *_good(3)]], dtype=object)
    reader = ScheduleReader()
    reader.add(p, "G", cells=grid)
    reader.add(_write(tmp_path, "H.csv", [HEADER, *_good(2)]), "H")
    got, other = reader.read()
    assert len(got.circuits) == 3 and len(other.circuits) == 2
    assert_same(got, read_schedule(p, "G", cells=grid))


def test_group_without_a_circuit_row(tmp_path):
    # every file of the header empty below it (or blank rows only): each its own message
    paths = [_write(tmp_path, f"H{i}.csv", [HEADER]) for i in range(2)]
    paths += [_write(tmp_path, f"B{i}.csv", [HEADER, ",,,,,,,"]) for i in range(2)]
    for path, got in zip(paths, read_schedule_files(paths), strict=True):
        assert isinstance(got, InputError)
        assert_same(got, _alone(path))


def test_files_too_wide_or_too_long_read_alone(tmp_path, monkeypatch):
    # 61 columns (the reader's limit is 60): each file names its own width
    wide = [HEADER + ",x" * 55, *(row + ",1" * 55 for row in _good(2))]
    paths = [_write(tmp_path, f"W{i}.csv", wide) for i in range(2)]
    for path, got in zip(paths, read_schedule_files(paths), strict=True):
        assert isinstance(got, InputError)
        assert_same(got, _alone(path))
    from feedcheck.inputs import schedule_file

    monkeypatch.setattr(schedule_file, "MAX_ROWS", 2)
    paths = [_write(tmp_path, f"L{i}.csv", [HEADER, *_good(1 + i)]) for i in range(3)]
    got = read_schedule_files(paths)
    for path, g in zip(paths, got, strict=True):
        assert_same(g, _alone(path))
    assert [isinstance(g, InputError) for g in got] == [False, True, True]


@pytest.mark.parametrize("seed", range(20))
def test_spaces_of_every_file_at_once_equal_each_file_alone(seed):
    # identity between two ways of the same count (no published value): each file's
    # spare and space poles per panel, counted for all files at once and file by file
    from feedcheck.inputs.schedule_alike import _panel_spaces_each
    from feedcheck.inputs.schedule_rows import CIRCUIT, SPACE, SPARE, TOTAL, panel_spaces

    rng = np.random.default_rng(seed)
    n_files = int(rng.integers(1, 6))
    sizes = rng.integers(0, 9, n_files)
    file_of = np.repeat(np.arange(n_files), sizes)
    n = len(file_of)
    panel = np.array([f"P{k}" for k in rng.integers(0, 4, n)] + [None], dtype=object)[:-1]
    kind = rng.choice(np.array([CIRCUIT, SPARE, SPACE, TOTAL]), n)
    poles = rng.integers(1, 4, n)
    got = _panel_spaces_each(panel, kind, poles, file_of, n_files)
    ends = np.cumsum(sizes)
    for f in range(n_files):
        a, b = int(ends[f - 1]) if f else 0, int(ends[f])
        want = panel_spaces(panel[a:b], kind[a:b], poles[a:b])
        assert got[f] == want and list(got[f]) == list(want)  # the order met too
