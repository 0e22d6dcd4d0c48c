"""Read a job workbook (XLSX) into the data the job file's TOML reader produces.

The data then goes through the same validation as a job file
(:func:`feedcheck.inputs.job_file.parse_job_data`); its problems name the key path
(``run[2].length``, counted from 1 like the elements) and :meth:`Located.where` turns
that into the place in the workbook: ``sheet 'run', row 3, column 'length'``.

What only a workbook can get wrong is refused here, every problem collected with its
sheet, row and column: a sheet or key that is no job's (with the nearest name), a key
twice, a value under no key, an empty row between elements, merged cells, spreadsheet
errors, a formula with no stored result (formulas are never evaluated: the value a
spreadsheet program stored is read, as for schedules), a date or number where text is
expected (:mod:`.workbook_cells`). The file passes the same guards as a schedule
workbook first (a regular file, its size, the zip bomb guard), with tighter limits.
"""

from __future__ import annotations

import difflib
import hashlib
import io
import re
from dataclasses import dataclass, field, replace
from itertools import zip_longest
from pathlib import Path
from typing import NamedTuple

from ..errors import InputError, ProblemList
from .files import FileKind, FileRefused, read_bytes
from .workbook_cells import README_SHEET, SHEETS, CellRefused, job_value

MAX_WORKBOOK_BYTES = 5_000_000
MAX_UNPACKED_BYTES = 10_000_000  # a job of a thousand panels unpacks to well under 1 MB
MAX_ROWS = 5_000  # elements per sheet (a building-scale job has about a thousand runs)
MAX_COLUMNS = 60
MAX_CELLS = 150_000  # filled cells in the workbook
MAX_PROBLEMS = 50
WORKBOOK_FILE = FileKind(
    "job workbook",
    "(.xlsx)",
    MAX_WORKBOOK_BYTES,
    f"a job workbook of at most {MAX_WORKBOOK_BYTES:,} bytes",
    (".xlsx",),
    "a job workbook saved as .xlsx",
)
_PATH_RE = re.compile(r"^([a-z_]+)(?:\[(\d+)\])?(?:\.(.+))?$")


@dataclass
class Located:
    """A workbook read into job data, with where each element and key stands."""

    file: str
    data: dict = field(default_factory=dict)
    sha256: str = ""
    sheet_of: dict[str, str] = field(default_factory=dict)  # kind -> sheet name as written
    rows: dict[str, list[int]] = field(default_factory=dict)  # kind -> row of each element
    headers: dict[str, dict[str, str]] = field(default_factory=dict)  # kind -> key -> header
    filled: int = 0  # filled cells read so far

    def where(self, path: str) -> str:
        """``run[2].length`` → ``sheet 'run', row 3, column 'length'`` (unchanged when
        the path names nothing in the workbook)."""
        m = _PATH_RE.match(path)
        if not m or m.group(1) not in SHEETS:
            return path
        kind, index, key = m.group(1), m.group(2), m.group(3)
        parts = [f"sheet {self.sheet_of.get(kind, kind)!r}"]
        rows = self.rows.get(kind, [])
        if index is not None and 0 < int(index) <= len(rows):
            parts.append(f"row {rows[int(index) - 1]}")
        elif index is None and key is not None and rows:
            parts.append(f"row {rows[0]}")
        if key is not None:
            key = key.split(".", 1)[0]
            parts.append(f"column {self.headers.get(kind, {}).get(key, key)!r}")
        return ", ".join(parts)

    def locate(self, exc: InputError) -> InputError:
        """The same problems, their key paths turned into places in the workbook."""
        return InputError(
            [
                replace(p, where=self.where(p.where), line=None) if p.file == self.file else p
                for p in exc.problems
            ]
        )


def read_workbook(path: str | Path) -> Located:
    """Read a job workbook into job data.

    Raises
    ------
    InputError
        Every problem of the workbook as a workbook (file, sheet, row, column, value,
        expectation); the job's own validation follows in the caller.
    """
    p = Path(path)
    problems = ProblemList(str(p))
    try:
        raw = read_bytes(p, WORKBOOK_FILE)
        if not raw:
            raise FileRefused("(empty file)", "a job workbook (see `feedcheck workbook`)")
    except FileRefused as exc:
        problems.add("", exc.value, exc.expected)
        problems.raise_if_any()
    return workbook_data(raw, str(p))


def workbook_data(raw: bytes, file: str) -> Located:
    """Job data out of the bytes of a workbook (``file`` names it in problems)."""
    from .schedule_file import xlsx_guard

    problems = ProblemList(file)
    xlsx_guard(raw, problems, MAX_UNPACKED_BYTES)
    values, formulas = _open(raw, problems)
    out = Located(file, sha256=hashlib.sha256(raw).hexdigest())
    try:
        names = [ws.title for ws in values.worksheets]  # a chart sheet holds no values
        for kind, name in _sheet_kinds(names, problems).items():
            _read_sheet(out, kind, (values[name], formulas[name], raw), problems)
            if len(problems.items) >= MAX_PROBLEMS:
                break
    finally:
        values.close()
        formulas.close()
    problems.raise_if_any()
    return out


def _open(raw: bytes, problems: ProblemList):
    """The workbook twice, read as a stream (read-only): stored values, and formulas
    (to tell a formula cell)."""
    import warnings

    import openpyxl

    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            values = openpyxl.load_workbook(io.BytesIO(raw), read_only=True, data_only=True)
            formulas = openpyxl.load_workbook(io.BytesIO(raw), read_only=True, data_only=False)
    except Exception as exc:  # openpyxl raises several types for a damaged workbook
        problems.add(
            "", type(exc).__name__, "an .xlsx workbook that opens in a spreadsheet program"
        )
        problems.raise_if_any()
    return values, formulas


def _norm(name: str) -> str:
    return re.sub(r"[\s-]+", "_", str(name).strip().lower())


def _sheet_kinds(names: list[str], problems: ProblemList) -> dict[str, str]:
    """Each sheet's kind (``transfer switch`` and ``Transfer_Switch`` name the same);
    the read-me sheet is skipped, any other name refused with the nearest kind."""
    kinds: dict[str, str] = {}
    for name in names:
        kind = _norm(name)
        if kind == _norm(README_SHEET):
            continue
        if len(problems.items) >= MAX_PROBLEMS:
            break
        if kind not in SHEETS:
            close = difflib.get_close_matches(kind, list(SHEETS), n=1)
            hint = f" — did you mean {close[0]!r}?" if close else ""
            problems.add(
                f"sheet {name!r}",
                name,
                "a sheet named after a table of the job: " + ", ".join(SHEETS) + hint,
            )
        elif kind in kinds:
            problems.add(
                f"sheet {name!r}", name, f"one sheet per table ({kinds[kind]!r} is {kind} too)"
            )
        else:
            kinds[kind] = name
    return kinds


class Stored(NamedTuple):
    """One stored cell: its value (a formula's stored result), openpyxl's data type, its
    number format, and whether it holds a formula."""

    value: object
    data_type: str
    number_format: str
    formula: bool


def _stored_cells(
    ws, wf, sheet: str, problems: ProblemList, room: int
) -> dict[tuple[int, int], Stored] | None:
    """The cells holding a value or a formula, by (row, column), read row by row from the
    stored values (``ws``) and formulas (``wf``, None: the sheet has none); the stored
    size of the sheet is not trusted. A value beyond the limits (``room``: the filled
    cells still allowed) ends the reading, the limit named (None)."""
    ws.reset_dimensions()
    cells: dict[tuple[int, int], Stored] = {}
    if wf is not None:
        wf.reset_dimensions()
    formulas = wf.iter_rows() if wf is not None else ()
    rows = zip_longest(ws.iter_rows(), formulas, fillvalue=())
    for r, (row_v, row_f) in enumerate(rows, start=1):
        for c, (cv, cf) in enumerate(zip_longest(row_v, row_f), start=1):
            value = getattr(cv, "value", None)
            formula = getattr(cf, "data_type", "") == "f"
            if value is None and not formula:
                continue
            if r > MAX_ROWS + 1 or c > MAX_COLUMNS or len(cells) >= room:
                problems.add(*_limit(sheet, r, c))
                return None
            if value is None:  # a formula a spreadsheet program never stored a result for
                cells[r, c] = Stored(cf.value, "f", "", True)
            else:
                cells[r, c] = Stored(value, cv.data_type, cv.number_format or "", formula)
    return cells


def _limit(sheet: str, r: int, c: int) -> tuple[str, str, str]:
    if r > MAX_ROWS + 1:
        return f"{sheet}, row {r}", "a value", f"at most {MAX_ROWS:,} rows of elements"
    if c > MAX_COLUMNS:
        return f"{sheet}, column {_letter(c)}", "a value", f"at most {MAX_COLUMNS} columns"
    return (
        f"{sheet}, row {r}",
        f"more than {MAX_CELLS:,} filled cells",
        f"at most {MAX_CELLS:,} filled cells in the workbook",
    )


def _sheet_part(raw: bytes, ws) -> bytes:
    """The XML of a read-only sheet, from its part of the archive (openpyxl keeps the
    part's name in ``_worksheet_path``): a read-only sheet lists no merged cells."""
    import zipfile

    with zipfile.ZipFile(io.BytesIO(raw)) as z:
        try:
            return z.read(ws._worksheet_path)
        except KeyError:
            return b""


_FORMULA_TAG = re.compile(rb"<(?:\w+:)?f[\s>/]")


def _merged(data: bytes) -> list[str]:
    """The merged ranges (``A2:B2``) of a sheet's XML."""
    import xml.etree.ElementTree as ET

    if b"mergeCell" not in data:
        return []
    found = []
    for _, el in ET.iterparse(io.BytesIO(data)):
        if el.tag.rsplit("}", 1)[-1] == "mergeCell" and el.get("ref"):
            found.append(el.get("ref"))
        el.clear()
    return sorted(found)


def _sheet_cells(ws, wf, raw: bytes, sheet: str, problems: ProblemList, room: int):
    """The sheet's merged ranges refused and its stored cells (None past a limit); a
    damaged part of the archive (the sheets are unpacked and parsed only now) is refused
    with the sheet named."""
    try:
        part = _sheet_part(raw, ws)
        for rng in _merged(part):
            problems.add(
                f"{sheet}, cells {rng}", "merged cells", "one value per cell (unmerge the cells)"
            )
        wf = wf if _FORMULA_TAG.search(part) or not part else None  # formulas: a second pass
        return _stored_cells(ws, wf, sheet, problems, room)
    except Exception as exc:  # zip, deflate and XML errors of many kinds in a damaged part
        problems.add(
            sheet,
            type(exc).__name__,
            "a sheet that opens in a spreadsheet program (this part of the workbook is damaged)",
        )
        return {}


def _read_sheet(out: Located, kind: str, sheets, problems: ProblemList) -> None:
    ws, wf, raw = sheets
    name = ws.title
    sheet = f"sheet {name!r}"
    if out.filled > MAX_CELLS:
        return  # the limit is named at the sheet where it was passed
    cells = _sheet_cells(ws, wf, raw, sheet, problems, MAX_CELLS - out.filled)
    out.filled = out.filled + len(cells) if cells is not None else MAX_CELLS + 1
    if not cells:
        return
    header, refused = _header(kind, cells, sheet, problems)
    many = SHEETS[kind][1]
    rows = sorted({r for r, _ in cells if r > 1})
    _gaps(rows, sheet, problems)
    if not many and len(rows) > 1:
        problems.add(
            f"{sheet}, row {rows[1]}",
            "a second row",
            f"one row: the job has one [{kind}] (its keys across row 2)",
        )
    out.sheet_of[kind] = name
    out.headers[kind] = {key: text for key, (_, text) in header.items()}
    out.rows[kind] = rows
    column_key = {col: key for key, (col, _) in header.items()}
    by_row: dict[int, list] = {r: [] for r in rows}
    for (row, col), c in sorted(cells.items()):
        if row > 1:
            by_row[row].append((col, c))
    elements = []
    for r in rows:
        if len(problems.items) >= MAX_PROBLEMS:
            break
        element = {}
        for col, c in by_row[r]:
            if col in refused:
                continue  # under a key refused in row 1: that problem says it
            if col not in column_key:
                problems.add(
                    f"{sheet}, row {r}, column {_letter(col)}",
                    _shown(c.value),
                    "a value under a key of row 1 (this column has none)",
                )
                continue
            key = column_key[col]
            where = f"{sheet}, row {r}, column {header[key][1]!r}"
            value = _cell(kind, key, c, problems, where)
            if value is not None:
                element[key] = value
        elements.append(element)
    if elements:
        out.data[kind] = elements if many else elements[0]


def _cell(kind: str, key: str, c: Stored, problems: ProblemList, where: str):
    if c.formula and c.data_type == "f":
        problems.add(
            where,
            str(c.value),
            "a value: this formula has no stored result (type the value, or open and save "
            "the workbook in a spreadsheet program; formulas are not evaluated)",
        )
        return None
    try:
        return job_value(kind, key, c.value, c.data_type, c.number_format)
    except CellRefused as exc:
        problems.add(where, exc.shown, exc.expected)
        return None


def _header(kind: str, cells: dict, sheet: str, problems: ProblemList) -> tuple[dict, set]:
    """Row 1: key -> (column, the header as written), and the columns whose key is
    refused (unknown or repeated)."""
    allowed = SHEETS[kind][0]
    found: dict[str, tuple[int, str]] = {}
    refused: set[int] = set()
    for (row, col), c in sorted(cells.items()):
        if row != 1:
            continue
        text = c.value if isinstance(c.value, str) else ""
        where = f"{sheet}, row 1, column {_letter(col)}"
        key = _norm(text.lstrip("'"))
        if key not in allowed or key in found:
            refused.add(col)
        if key not in allowed:
            close = difflib.get_close_matches(key, allowed, n=1)
            hint = f" — did you mean {close[0]!r}?" if close else ""
            problems.add(
                where, _shown(c.value), f"one of the keys of [{kind}]: " + ", ".join(allowed) + hint
            )
        elif key in found:
            problems.add(where, text, f"each key once (column {_letter(found[key][0])} has it)")
        else:
            found[key] = (col, text.strip())
    return found, refused


def _gaps(rows: list[int], sheet: str, problems: ProblemList) -> None:
    """An empty row between elements is refused (rows below the last are not rows)."""
    expected = 2
    for r in rows:
        if r > expected:
            span = f"row {expected}" if r == expected + 1 else f"rows {expected}-{r - 1}"
            problems.add(
                f"{sheet}, {span}",
                "(empty row)",
                "one element per row from row 2, no empty row between (delete it)",
            )
        expected = r + 1


def _letter(col: int) -> str:
    from openpyxl.utils import get_column_letter

    return get_column_letter(col)


def _shown(value) -> str:
    return "" if value is None else str(value)
