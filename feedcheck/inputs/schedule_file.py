"""Read a panel schedule (CSV or XLSX) and validate it into one typed table of circuits.

A schedule is a table with one circuit per row under a header row (row 1). Column
names are matched forgivingly (case, spaces, underscores and hyphens do not matter;
a unit goes in square or round brackets: ``load [VA]``, ``length (m)``).

======================  ========  ====================================================
column                  needed    meaning (accepted values)
======================  ========  ====================================================
``circuit``             yes       first circuit (space) number, a whole number ≥ 1
``load [VA]``           yes       the load, with its unit in the header: ``[VA]``,
                                  ``[kVA]``, ``[W]``, ``[kW]`` or ``[A]``
``breaker [A]``         yes       branch device rating in A (``20`` or ``20 A``)
``conductor``           yes       size and material, ``12 AWG Cu``, ``1/0 AWG Al``
``length [ft]``         yes       one-way length; ``[ft]`` or ``[m]``; feet when the
                                  header has no unit
``description``         no        free text
``poles``               no        1, 2 or 3 (default 1)
``power factor``        no        0.05 … 1 (default 1.0)
``kind``                no        lighting, receptacle, motor, heating, other (default)
``continuous``          no        yes/no, y/n, true/false, 1/0, x (default no)
``insulation``          no        60, 75 or 90 °C (default 75)
``termination``         no        60, 75 or 90 °C (default by NFPA 70 110.14(C))
``ground``              no        equipment grounding conductor, ``12 AWG Cu``
``current carrying``    no        current-carrying conductors in the raceway (default 3)
``ambient``             no        ambient temperature in °C (default 30)
``raceway``             no        steel (default), aluminum, pvc, cable, free-air
``panel``               no        panel id, for one file holding several panels
======================  ========  ====================================================

Rows whose cells are all empty are skipped without an error (spacer rows).
Everything else that is wrong is collected and reported at once: file, row number as
the spreadsheet shows it, column, value and what was expected.

Limits: a file of at most :data:`MAX_FILE_BYTES`, at most :data:`MAX_ROWS` rows and
:data:`MAX_COLUMNS` columns; an XLSX whose parts unpack to more than
:data:`MAX_XLSX_UNPACKED_BYTES` or compress more than :data:`MAX_XLSX_RATIO` to one is
refused before it is opened (zip bomb guard). XLSX cells are read as stored values
(``data_only``): formulas are never evaluated, and a formula cell a spreadsheet program
never saved a value for reads as empty.
"""

from __future__ import annotations

import io
import re
from dataclasses import replace
from pathlib import Path

import numpy as np

from ..errors import InputError, ProblemList
from ..model import Schedule
from ..units import SCHEDULE_HEADER_UNITS
from .files import FileKind, FileRefused, decode_utf8, read_bytes
from .schedule_cells import MAX_PROBLEMS, Cells, factorised
from .schedule_columns import (
    cell_text,
    check_spaces,
    electrical_columns,
    installation_columns,
)
from .schedule_header import match_header
from .schedule_rows import compare_totals, set_aside, unfold_two_column

MAX_FILE_BYTES = 200_000_000
MAX_ROWS = 2_000_000
MAX_COLUMNS = 60
MAX_XLSX_UNPACKED_BYTES = 1_000_000_000
MAX_XLSX_RATIO = 200.0
MAX_XLSX_MEMBERS = 10_000
PLAIN_CHARS = 200_000  # a CSV file up to this long without quotes is split without pandas


def schedule_kind() -> FileKind:
    """What the guard holds a schedule file to (the limit read when called)."""
    return FileKind(
        "schedule file",
        "(.csv or .xlsx)",
        MAX_FILE_BYTES,
        f"a schedule file of at most {MAX_FILE_BYTES:,} bytes",
        (".csv", ".xlsx"),
        "a .csv or .xlsx schedule file",
    )


# --------------------------------------------------------------------------- raw reading
def _guard_file(path: Path, problems: ProblemList) -> bytes:
    try:
        raw = read_bytes(path, schedule_kind())
        if not raw:
            raise FileRefused("(empty file)", "a header row and one row per circuit")
    except FileRefused as exc:
        problems.add("", exc.value, exc.expected)
        problems.raise_if_any()
    return raw


def _read_csv(raw: bytes, problems: ProblemList) -> np.ndarray:
    """The file's cells as a 2-D array of texts (row 0 the header)."""
    try:
        text = decode_utf8(raw, "UTF-8 text (save the schedule as CSV UTF-8)")
    except FileRefused as exc:
        problems.add(f"row {exc.line}", exc.value, exc.expected)
        problems.raise_if_any()
    if not text.strip():
        problems.add("", "(empty file)", "a header row and one row per circuit")
        problems.raise_if_any()
    if "\x00" in text:
        _refuse_nul(text, problems)
    n_lines = text.count("\n") + 1
    if n_lines > MAX_ROWS + 1:
        problems.add("", f"{n_lines:,} lines", f"at most {MAX_ROWS:,} circuit rows per file")
        problems.raise_if_any()
    plain = _plain_csv(text)
    return plain if plain is not None else _pandas_csv(text, problems)


def _plain_csv(text: str) -> np.ndarray | None:
    """A small file of plain cells (no quotes, blank lines, ragged rows or carriage
    returns) split without the CSV parser's fixed cost; None for anything else, which
    the parser reads (the same cells either way)."""
    if len(text) > PLAIN_CHARS or '"' in text or "\r" in text:
        return None
    lines = text[:-1].split("\n") if text.endswith("\n") else text.split("\n")
    rows = [line.split(",") for line in lines]
    width = len(rows[0])
    if any(len(r) != width or r == [""] for r in rows):
        return None
    out = np.empty((len(rows), width), dtype=object)
    out[:] = rows
    return out


def _pandas_csv(text: str, problems: ProblemList) -> np.ndarray:
    import pandas as pd

    try:
        df = pd.read_csv(
            io.StringIO(text),
            header=None,
            dtype=str,
            keep_default_na=False,
            skip_blank_lines=False,
            engine="c",
        )
    except pd.errors.ParserError as exc:
        m = re.search(r"line (\d+)", str(exc))
        problems.add(
            f"row {m.group(1)}" if m else "",
            str(exc).split(". ")[-1].replace("C error: ", "").strip(),
            "the same number of cells in every row as in the header",
        )
        problems.raise_if_any()
    except pd.errors.EmptyDataError:
        problems.add("", "(empty file)", "a header row and one row per circuit")
        problems.raise_if_any()
    return df.to_numpy(object)


def _refuse_nul(text: str, problems: ProblemList) -> None:
    """A NUL byte ends a cell early in the CSV reader (``12\\x0000`` would read as 12):
    refuse it with the cell's place."""
    lines = text.split("\n")
    header = _line_cells(lines[0].replace("\x00", ""))
    listed = 0
    for i, line in enumerate(lines):
        if "\x00" not in line:
            continue
        cells = _line_cells(line.replace("\x00", "\ufffe"))
        for j, cell in enumerate(cells):
            if "\ufffe" in cell and listed < MAX_PROBLEMS:
                name = header[j].strip() if j < len(header) else f"{j + 1}"
                problems.add(
                    f"row {i + 1}, column '{name}'",
                    cell.replace("\ufffe", "\x00"),
                    "a cell without NUL bytes or other control characters",
                )
                listed += 1
    problems.raise_if_any()


def _line_cells(line: str) -> list[str]:
    """One line's cells as the CSV module reads them; a line it cannot read (a carriage
    return inside an unquoted cell) split at its commas."""
    import csv

    try:
        return next(csv.reader([line]), [])
    except csv.Error:
        return line.split(",")


def xlsx_guard(raw: bytes, problems: ProblemList, max_unpacked: int | None = None) -> None:
    """Refuse bytes that are not a zip archive, or that unpack beyond ``max_unpacked``
    bytes, into too many parts, or more than :data:`MAX_XLSX_RATIO` to one (zip bomb
    guard), before any XML is parsed (used by the schedule and job workbook readers)."""
    import zipfile

    if max_unpacked is None:
        max_unpacked = MAX_XLSX_UNPACKED_BYTES
    try:
        zf = zipfile.ZipFile(io.BytesIO(raw))
    except zipfile.BadZipFile:
        problems.add("", "(not a zip archive)", "an .xlsx workbook saved by a spreadsheet program")
        problems.raise_if_any()
    except Exception as exc:  # a damaged directory: unknown versions, bad offsets, …
        problems.add(
            "",
            f"(a damaged zip archive: {type(exc).__name__})",
            "an .xlsx workbook saved by a spreadsheet program",
        )
        problems.raise_if_any()
    infos = zf.infolist()
    total = sum(i.file_size for i in infos)
    if len(infos) > MAX_XLSX_MEMBERS or total > max_unpacked:
        problems.add(
            "",
            f"{len(infos)} parts, {total:,} bytes unpacked",
            f"a workbook unpacking to at most {max_unpacked:,} bytes",
        )
    for i in infos:
        if i.file_size > 1_000_000 and i.file_size > MAX_XLSX_RATIO * max(i.compress_size, 1):
            ratio = i.file_size / max(i.compress_size, 1)
            problems.add(
                "",
                f"part {i.filename} packed {ratio:.0f}:1",
                f"parts compressed at most {MAX_XLSX_RATIO:g}:1 (zip bomb guard)",
            )
            break
    problems.raise_if_any()


def _read_xlsx(raw: bytes, problems: ProblemList) -> np.ndarray:
    import warnings

    import openpyxl

    xlsx_guard(raw, problems)
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            wb = openpyxl.load_workbook(io.BytesIO(raw), read_only=True, data_only=True)
    except Exception as exc:  # openpyxl raises several types for a damaged workbook
        problems.add(
            "", type(exc).__name__, "an .xlsx workbook that opens in a spreadsheet program"
        )
        problems.raise_if_any()
    try:
        ws = wb.worksheets[0]
        # the stored dimension (``<dimension ref="A1:G2"/>``) may be wrong or forged: a
        # sheet tagged smaller than it is would lose rows. Forget it and read every row;
        # the limits hold on the rows actually read.
        ws.reset_dimensions()
        rows: list[list[str]] = []
        width = 0
        for r in ws.iter_rows(values_only=True):
            if len(rows) > MAX_ROWS:
                problems.add(
                    "", f"more than {MAX_ROWS + 1:,} rows", f"at most {MAX_ROWS:,} circuit rows"
                )
                problems.raise_if_any()
            if len(r) > MAX_COLUMNS and any(v is not None for v in r[MAX_COLUMNS:]):
                problems.add(
                    f"row {len(rows) + 1}", f"{len(r)} columns", f"at most {MAX_COLUMNS} columns"
                )
                problems.raise_if_any()
            r = r[:MAX_COLUMNS]
            cells = [cell_text(v) for v in r]
            width = max(width, len(cells))
            rows.append(cells)
    finally:
        wb.close()
    if not rows or not any(any(c.strip() for c in r) for r in rows):
        problems.add("", "(empty sheet)", "a header row and one row per circuit on the first sheet")
        problems.raise_if_any()
    out = np.empty((len(rows), width), dtype=object)
    out[:] = [r + [""] * (width - len(r)) for r in rows]
    return out


# --------------------------------------------------------------------------- schedule
def read_schedule(
    path: str | Path,
    panel_id: str | None = None,
    columns: dict[str, str] | None = None,
    layout: str = "auto",
    cells: np.ndarray | None = None,
) -> Schedule:
    """Read and validate a panel schedule (CSV or XLSX).

    Parameters
    ----------
    path : str or Path
        The schedule file.
    panel_id : str, optional
        Panel id for a file without a ``panel`` column (default: the file's stem).
    columns : dict, optional
        The user's column map, normalised header → column or ``ignore``
        (:func:`feedcheck.inputs.schedule_header.parse_column_map`).
    layout : str
        ``auto`` (detect the two-column panel form), ``one-row`` or ``two-column``.
    cells : 2-D array of str, optional
        The file's cells already in memory (row 0 the file's first row: an edited grid);
        the file is not read. Problems still name ``path``.

    Returns
    -------
    Schedule
        The circuits as typed columns (SI units), blank rows dropped.

    Raises
    ------
    InputError
        Every problem found: file, row (as the spreadsheet shows it), column, value and
        what was expected.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> d = pathlib.Path(tempfile.mkdtemp())
    >>> _ = (d / "LP1.csv").write_text(
    ...     "Circuit,Load [VA],Breaker [A],Conductor,Length [ft]\\n1,1200,20,12 AWG Cu,50\\n")
    >>> s = read_schedule(d / "LP1.csv")
    >>> s.panels, float(s.circuits["length_m"].iloc[0])
    (('LP1',), 15.24)
    """
    p = Path(path)
    problems = ProblemList(str(p))
    notices: list[str] = []
    cols, head, found, row_no = _table(p, layout, columns, problems, notices, cells)
    cols, rows = _circuit_rows(cols, head, found, problems, row_no)
    keep, spaces, totals = set_aside(cols, rows, found, panel_id or p.stem, notices)
    cols, rows = _only(cols, rows, keep, problems)
    c = Cells(cols, len(rows), found, rows, problems)
    values = _values(c, found, rows, panel_id or p.stem, problems)
    value_notices(found, rows, c.assumed_copper, notices)
    unit = found["load"][2] or "va"
    scale = SCHEDULE_HEADER_UNITS["load"].get(unit, ("VA", 1.0))[1]
    compare_totals(totals, values["load_value"], values["panel"], scale, unit.upper(), notices)
    length_unit = "ft" if found["length"][2] in ("", "ft", "feet", "foot") else "m"
    system = _one_system(c, problems)
    sched = _schedule(p, values, c, rows, tuple(notices), spaces, length_unit)
    return replace(sched, system=system) if system else sched


def read_schedule_cells(path: str | Path) -> np.ndarray:
    """A schedule file's cells as texts (row 0 its first row), guarded as
    :func:`read_schedule` guards the file; not validated."""
    p = Path(path)
    problems = ProblemList(str(p))
    raw = _guard_file(p, problems)
    return _read_xlsx(raw, problems) if p.suffix.lower() == ".xlsx" else _read_csv(raw, problems)


def _table(p: Path, layout: str, columns, problems: ProblemList, notices: list[str], cells=None):
    """The file's cells: each column as (codes, distinct stripped texts) of the rows below
    the header, the first rows as text, the header matched, and each row's number."""
    df = read_schedule_cells(p) if cells is None else cells
    if df.shape[1] > MAX_COLUMNS:
        problems.add("row 1", f"{df.shape[1]} columns", f"at most {MAX_COLUMNS} columns")
        problems.raise_if_any()
    df, row_no = unfold_two_column(df, layout, notices, problems)
    cols = {pos: factorised(df[1:, pos]) for pos in range(df.shape[1])}
    head = [[str(x) for x in r] for r in df[:6].tolist()]
    found = match_header(
        head, lambda pos: bool((cols[pos][1] != "").any()), problems, notices, columns
    )
    problems.raise_if_any()
    return cols, head, found, row_no


def _values(c: Cells, found, rows, panel_id: str, problems: ProblemList) -> dict:
    """Every column typed and validated; raises InputError listing every bad cell."""
    values = electrical_columns(c, found)
    values.update(installation_columns(c))
    values["panel"] = c.text("panel", panel_id)
    if "panel" in found:
        empty_panel = values["panel"] == ""
        c.bad(
            "panel", empty_panel, values["panel"], "a panel id in every row of a multi-panel file"
        )
    amb, ins = values["ambient_c"], values["insulation_c"]
    ok_amb = np.isnan(amb) | np.isnan(ins) | (amb < ins)
    c.bad("ambient", ~ok_amb, c.text("ambient"), "an ambient below the insulation rating")
    check_spaces(values["circuit"], values["poles"], values["panel"], rows, found, problems)
    if c.count > MAX_PROBLEMS:
        problems.add(
            "",
            f"{c.count - MAX_PROBLEMS} more bad cells",
            f"(only the first {MAX_PROBLEMS} are listed)",
        )
    problems.raise_if_any()
    return values


def value_notices(found, rows, assumed_copper, notices: list[str]) -> None:
    """Notices on values read but not checked, or assumed (``assumed_copper``: the rows
    whose conductor cell named no material)."""
    if "aic" in found:
        notices.append(
            f"column '{found['aic'][1]}' (interrupting ratings) read and validated but not "
            "checked: hold them against the panel's available fault current"
        )
    if assumed_copper.any():
        at = rows[assumed_copper]
        notices.append(
            f"warning: {len(at)} conductor cell(s) without a material read as copper (Cu), "
            f"rows {', '.join(map(str, at[:10]))}{' …' if len(at) > 10 else ''}: write Cu or "
            "Al to confirm"
        )


def _one_system(c: Cells, problems: ProblemList) -> str:
    """The file's ``system`` column: one voltage system for the whole file, or ""."""
    if "system" not in c.found:
        return ""
    texts = [t for t in dict.fromkeys(c.text("system").tolist()) if t]
    if len(texts) > 1:
        problems.add(
            f"column '{c.found['system'][1]}'",
            ", ".join(texts[:4]),
            "one voltage system for the whole file (one file per panel system)",
        )
        problems.raise_if_any()
    return texts[0] if texts else ""


def _only(cols, rows, keep, problems: ProblemList):
    """The circuit rows alone (spares, spaces and totals rows set aside)."""
    if keep.all():
        return cols, rows
    if not keep.any():
        problems.add("", "(no circuit rows)", "at least one circuit row with a load")
        problems.raise_if_any()
    return {pos: (codes[keep], uniq) for pos, (codes, uniq) in cols.items()}, rows[keep]


def _circuit_rows(cols, head, found, problems: ProblemList, rows_all):
    """Drop blank rows and repeated header rows; returns the columns and row numbers left."""
    codes, uniq = next(iter(cols.values()))
    n_body = len(codes)
    blank = np.ones(n_body, dtype=bool)
    for codes, uniq in cols.values():
        blank &= (uniq == "")[codes]
    # a header row repeated below the header (pasted twice, or a page break copy)
    circ_pos = found["circuit"][0]
    head_txt = head[0][circ_pos].strip().lower()
    codes, uniq = cols[circ_pos]
    rep = np.array([u.lower() == head_txt for u in uniq], dtype=bool)[codes]
    keep = np.flatnonzero(~blank)
    rows = rows_all[keep]
    rep = rep[keep]
    for r in rows[rep][:10]:
        problems.add(f"row {r}", "a repeated header row", "circuit rows only below the header")
    keep = keep[~rep]
    rows = rows[~rep]
    n = len(rows)
    if n == 0:
        problems.add("", "(no circuit rows)", "at least one circuit row under the header")
        problems.raise_if_any()
    if n > MAX_ROWS:
        problems.add("", f"{n:,} rows", f"at most {MAX_ROWS:,} circuit rows")
        problems.raise_if_any()
    if n < n_body:
        cols = {pos: (codes[keep], uniq) for pos, (codes, uniq) in cols.items()}
    return cols, rows


def _schedule(path: Path, v: dict, c: Cells, rows, notices, spaces, length_unit) -> Schedule:
    import pandas as pd

    frame = pd.DataFrame(
        {
            "panel": v["panel"],
            "circuit": v["circuit"].astype(np.int64),
            "description": c.text("description"),
            "poles": v["poles"].astype(np.int64),
            "load_value": v["load_value"],
            "pf": v["pf"],
            "kind": v["kind"],
            "continuous": v["continuous"].astype(bool),
            "breaker_a": v["breaker_a"],
            "size": v["size"],
            "material": v["material"],
            "insulation_c": v["insulation_c"],
            "termination_c": v["termination_c"],
            "ground_size": v["ground_size"],
            "ground_material": v["ground_material"],
            "current_carrying": v["current_carrying"].astype(np.int64),
            "ambient_c": v["ambient_c"],
            "raceway": v["raceway"],
            "length_m": v["length_m"],
            "row": rows,
        },
        copy=False,  # the columns are this reader's own arrays: no second copy of them
    )
    panels = tuple(dict.fromkeys(v["panel"].tolist()))
    return Schedule(path, frame, v["load_unit"], panels, notices, spaces, length_unit)


def read_schedules(paths, panel_ids=None) -> tuple[list[Schedule], list[InputError]]:
    """Read several schedules; return the good ones and every file's InputError (alike
    files read together: :func:`feedcheck.inputs.schedule_alike.read_schedule_files`)."""
    good, bad = [], []
    for i, path in enumerate(paths):
        try:
            good.append(read_schedule(path, panel_ids[i] if panel_ids else None))
        except InputError as exc:
            bad.append(exc)
    return good, bad
