"""Panel schedules (CSV or XLSX): read and validate into one typed table of circuits.

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
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from .errors import InputError, ProblemList

if TYPE_CHECKING:
    import pandas as pd

MAX_FILE_BYTES = 200_000_000
MAX_ROWS = 2_000_000
MAX_COLUMNS = 60
MAX_XLSX_UNPACKED_BYTES = 1_000_000_000
MAX_XLSX_RATIO = 200.0
MAX_XLSX_MEMBERS = 10_000
MAX_PROBLEMS = 100
FT = 0.3048  # m per international foot (exact)

KINDS = ("lighting", "receptacle", "motor", "heating", "other")
RACEWAYS = ("steel", "aluminum", "pvc", "cable", "free-air")
LOAD_UNITS = {
    "va": ("VA", 1.0),
    "kva": ("VA", 1e3),
    "w": ("W", 1.0),
    "kw": ("W", 1e3),
    "a": ("A", 1.0),
}
LENGTH_UNITS = {
    "": 1.0 * FT,
    "ft": FT,
    "feet": FT,
    "foot": FT,
    "m": 1.0,
    "metre": 1.0,
    "meter": 1.0,
    "metres": 1.0,
    "meters": 1.0,
}
_TRUE = {"yes", "y", "true", "t", "1", "x", "c", "cont", "continuous"}
_FALSE = {"no", "n", "false", "f", "0", "", "-", "nc"}

# canonical column -> spellings (normalised: lower case, single spaces)
ALIASES: dict[str, tuple[str, ...]] = {
    "panel": ("panel", "panel id", "panelboard"),
    "circuit": (
        "circuit",
        "circuits",
        "circuit no",
        "circuit number",
        "ckt",
        "ckt no",
        "no",
        "number",
        "space",
        "cct",
    ),
    "description": ("description", "desc", "load description", "name", "served"),
    "poles": ("poles", "pole", "p", "no of poles"),
    "load": ("load", "connected load"),
    "pf": ("pf", "power factor"),
    "kind": ("kind", "load kind", "type", "load type", "class"),
    "continuous": ("continuous", "cont", "continuous load"),
    "breaker": ("breaker", "breaker rating", "device", "ocpd", "trip", "rating"),
    "conductor": ("conductor", "conductors", "wire", "wire size", "conductor size"),
    "insulation": ("insulation", "insulation rating", "insulation temperature"),
    "termination": ("termination", "terminations", "termination rating"),
    "ground": ("ground", "egc", "grounding conductor", "equipment ground"),
    "current_carrying": ("current carrying", "current carrying conductors", "ccc"),
    "ambient": ("ambient", "ambient temperature"),
    "raceway": ("raceway", "conduit", "raceway type"),
    "length": ("length", "run length", "one way length"),
}
REQUIRED = ("circuit", "load", "breaker", "conductor", "length")
_LOOKUP = {a: k for k, names in ALIASES.items() for a in names}
_UNIT_RE = re.compile(r"^(?P<name>.*?)\s*[\[(]\s*(?P<unit>[^\])]*?)\s*[\])]\s*$")


def normalise_header(text: object) -> tuple[str, str]:
    """``"Load_[VA] "`` → ``("load", "va")``: name and unit, lower case, single spaces.

    Examples
    --------
    >>> normalise_header("Length (ft)")
    ('length', 'ft')
    >>> normalise_header("  CURRENT_carrying  ")
    ('current carrying', '')
    """
    s = "" if text is None else str(text)
    m = _UNIT_RE.match(s.strip())
    name, unit = (m.group("name"), m.group("unit")) if m else (s, "")
    name = " ".join(re.sub(r"[_\-.#:]+", " ", name).lower().split())
    return name, unit.strip().lower().replace("°", "")


@dataclass(frozen=True)
class Schedule:
    """A validated schedule: one row per circuit, typed columns in SI units.

    ``circuits`` columns: ``panel``, ``circuit`` (int), ``description``, ``poles``,
    ``load_value`` with ``load_unit`` (``VA``, ``W`` or ``A``), ``pf``, ``kind``,
    ``continuous`` (bool), ``breaker_a``, ``size`` (canonical name), ``material``,
    ``insulation_c``, ``termination_c`` (NaN: by 110.14(C)), ``ground_size`` ("" when
    none), ``ground_material``, ``current_carrying``, ``ambient_c``, ``raceway``,
    ``length_m``, ``row`` (row number as the spreadsheet shows it).
    """

    path: Path
    circuits: pd.DataFrame
    load_unit: str
    panels: tuple[str, ...]


# --------------------------------------------------------------------------- raw reading
def _guard_file(path: Path, problems: ProblemList) -> bytes:
    if path.is_dir():
        problems.add("", str(path), "a schedule file (.csv or .xlsx), not a folder")
        problems.raise_if_any()
    if path.suffix.lower() not in (".csv", ".xlsx"):
        problems.add("", path.name, "a .csv or .xlsx schedule file")
        problems.raise_if_any()
    try:
        size = path.stat().st_size
    except OSError as exc:
        problems.add("", str(path), f"a readable schedule file ({exc.strerror})")
        problems.raise_if_any()
    if size > MAX_FILE_BYTES:
        problems.add("", f"{size} bytes", f"a schedule file of at most {MAX_FILE_BYTES:,} bytes")
        problems.raise_if_any()
    if size == 0:
        problems.add("", "(empty file)", "a header row and one row per circuit")
        problems.raise_if_any()
    try:
        return path.read_bytes()
    except OSError as exc:
        problems.add("", str(path), f"a readable schedule file ({exc.strerror})")
        problems.raise_if_any()
    raise AssertionError("unreachable")


def _read_csv(raw: bytes, problems: ProblemList) -> list[list[str]] | pd.DataFrame:
    import pandas as pd

    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        problems.add(
            f"row {line}",
            f"byte 0x{raw[exc.start]:02x}",
            "UTF-8 text (save the schedule as CSV UTF-8)",
        )
        problems.raise_if_any()
    if not text.strip():
        problems.add("", "(empty file)", "a header row and one row per circuit")
        problems.raise_if_any()
    n_lines = text.count("\n") + 1
    if n_lines > MAX_ROWS + 1:
        problems.add("", f"{n_lines:,} lines", f"at most {MAX_ROWS:,} circuit rows per file")
        problems.raise_if_any()
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
    return df


def _xlsx_guard(raw: bytes, problems: ProblemList) -> None:
    import zipfile

    try:
        zf = zipfile.ZipFile(io.BytesIO(raw))
    except zipfile.BadZipFile:
        problems.add("", "(not a zip archive)", "an .xlsx workbook saved by a spreadsheet program")
        problems.raise_if_any()
    infos = zf.infolist()
    total = sum(i.file_size for i in infos)
    if len(infos) > MAX_XLSX_MEMBERS or total > MAX_XLSX_UNPACKED_BYTES:
        problems.add(
            "",
            f"{len(infos)} parts, {total:,} bytes unpacked",
            f"a workbook unpacking to at most {MAX_XLSX_UNPACKED_BYTES:,} bytes",
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


def _cell_text(v) -> str:
    if v is None:
        return ""
    if isinstance(v, bool):
        return "yes" if v else "no"
    if isinstance(v, float):
        return str(int(v)) if v.is_integer() and abs(v) < 1e15 else repr(v)
    return str(v)


def _read_xlsx(raw: bytes, problems: ProblemList) -> pd.DataFrame:
    import warnings

    import openpyxl
    import pandas as pd

    _xlsx_guard(raw, problems)
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
        if ws.max_row is not None and ws.max_row > MAX_ROWS + 1:
            problems.add("", f"{ws.max_row:,} rows", f"at most {MAX_ROWS:,} circuit rows")
        if ws.max_column is not None and ws.max_column > MAX_COLUMNS:
            problems.add("", f"{ws.max_column} columns", f"at most {MAX_COLUMNS} columns")
        problems.raise_if_any()
        rows: list[list[str]] = []
        width = 0
        for r in ws.iter_rows(min_row=1, values_only=True):
            if len(rows) > MAX_ROWS + 1 or len(r) > MAX_COLUMNS:
                problems.add(
                    "",
                    "a larger sheet than its header declares",
                    f"at most {MAX_ROWS:,} rows and {MAX_COLUMNS} columns",
                )
                problems.raise_if_any()
            cells = [_cell_text(v) for v in r]
            width = max(width, len(cells))
            rows.append(cells)
    finally:
        wb.close()
    if not rows or not any(any(c.strip() for c in r) for r in rows):
        problems.add("", "(empty sheet)", "a header row and one row per circuit on the first sheet")
        problems.raise_if_any()
    rows = [r + [""] * (width - len(r)) for r in rows]
    return pd.DataFrame(rows, dtype=object)


# --------------------------------------------------------------------------- header
def _match_header(
    df: pd.DataFrame, has_values, problems: ProblemList
) -> dict[str, tuple[int, str, str]]:
    """canonical name -> (column position, header text, unit).

    ``df`` holds the header row and the rows below it as text (the first few are enough:
    they are searched for a header placed too low); ``has_values(pos)`` tells whether
    column ``pos`` has a non-blank cell below the header.
    """
    header = [str(x) for x in df.iloc[0].tolist()]
    found: dict[str, tuple[int, str, str]] = {}
    unknown: list[str] = []
    blank: list[int] = []
    for pos, text in enumerate(header):
        name, unit = normalise_header(text)
        if not name:
            if has_values(pos):
                blank.append(pos)
            continue
        key = _LOOKUP.get(name)
        if key is None:
            unknown.append(text)
            continue
        if key in found:
            problems.add(
                f"row 1, column {pos + 1}",
                text,
                f"one column for {key!r} (column {found[key][0] + 1} "
                f"'{found[key][1]}' is one already)",
            )
            continue
        found[key] = (pos, text, unit)
    missing = [k for k in REQUIRED if k not in found]
    if missing:
        hint = ""
        for r in range(1, min(len(df), 6)):
            names = {_LOOKUP.get(normalise_header(x)[0]) for x in df.iloc[r].tolist()}
            if all(k in names for k in missing):
                hint = (
                    f" (they are in row {r + 1}: the header must be row 1 — remove the "
                    "title rows above it, or unmerge them)"
                )
                break
        problems.add(
            "row 1",
            ", ".join(header)[:80],
            "header columns " + ", ".join(repr(k) for k in missing) + hint,
        )
    else:
        for pos in blank:
            problems.add(
                f"row 1, column {pos + 1}",
                "",
                "a name for every column with values (blank or merged header cell)",
            )
    for key in ("load", "length", "breaker", "insulation", "ambient", "termination"):
        if key not in found:
            continue
        pos, text, unit = found[key]
        allowed = {
            "load": LOAD_UNITS,
            "length": LENGTH_UNITS,
            "breaker": {"": 1, "a": 1},
            "insulation": {"": 1, "c": 1, "degc": 1},
            "ambient": {"": 1, "c": 1, "degc": 1},
            "termination": {"": 1, "c": 1, "degc": 1},
        }[key]
        if unit not in allowed:
            want = {
                "load": "'load [VA]', '[kVA]', '[W]', '[kW]' or '[A]'",
                "length": "'length [ft]' or 'length [m]'",
                "breaker": "'breaker [A]'",
            }.get(key, f"'{key} [C]' (degrees Celsius)")
            problems.add(f"row 1, column {pos + 1}", text, f"a header such as {want}")
        elif key == "load" and unit == "":
            problems.add(
                f"row 1, column {pos + 1}",
                text,
                "the load's unit in the header: 'load [VA]', '[kVA]', '[W]', '[kW]' or '[A]'",
            )
    return found


# --------------------------------------------------------------------------- cells
def _factorised(raw: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Column cells as (codes, distinct stripped texts): ``texts[codes]`` is the column.

    Every parse and test below runs once per distinct text, not once per cell.
    """
    import pandas as pd

    codes, uniq = pd.factorize(raw)
    if len(codes) and codes.min() < 0:  # a missing cell (short CSV row): text as pandas does
        codes, uniq = pd.factorize(pd.Series(raw, dtype=object).astype(str).to_numpy(object))
    texts = pd.Series(uniq, dtype=object).astype(str).to_numpy(object)
    stripped = np.array([t.strip() for t in texts] + [None], dtype=object)[:-1]
    s_codes, s_uniq = pd.factorize(stripped)
    return s_codes[codes], np.asarray(s_uniq, dtype=object)


class _Cells:
    """Column parsers that collect problems for every bad cell (vectorised: each distinct
    cell text is parsed once and the result spread over the rows that hold it)."""

    def __init__(
        self,
        cols: dict[int, tuple[np.ndarray, np.ndarray]],
        n: int,
        found,
        rows: np.ndarray,
        problems: ProblemList,
    ):
        self.cols = cols  # column position -> (codes, distinct stripped texts)
        self.n = n
        self.found = found
        self.rows = rows
        self.problems = problems
        self.count = 0

    def col(self, key: str) -> tuple[np.ndarray, np.ndarray]:
        return self.cols[self.found[key][0]]

    def text(self, key: str, default: str = "") -> np.ndarray:
        if key not in self.found:
            return np.full(self.n, default, dtype=object)
        codes, uniq = self.col(key)
        return uniq[codes]  # cells are stripped text

    def bad(self, key: str, mask, values, expected: str) -> None:
        """``values``: the column's cells, or its (codes, texts)."""
        idx = np.flatnonzero(np.asarray(mask))
        if not len(idx):
            return
        _pos, header, _unit = self.found[key]
        shown = idx[: max(0, MAX_PROBLEMS - self.count)]
        if isinstance(values, tuple):
            codes, uniq = values
            vals = uniq[codes[shown]]
        else:
            vals = np.asarray(values, dtype=object)[shown]
        for i, v in zip(shown, vals, strict=True):
            self.problems.add(f"row {self.rows[i]}, column '{header}'", v, expected)
        self.count += len(idx)

    def number(
        self,
        key: str,
        expected: str,
        lo: float,
        hi: float,
        default: float | None,
        integer: bool = False,
        strip: str = "",
    ) -> np.ndarray:
        import pandas as pd

        if key not in self.found:
            return np.full(self.n, np.nan if default is None else default)
        codes, uniq = self.col(key)
        s = pd.Series(uniq, dtype=object)
        clean = s.str.replace(r"[,_\s]", "", regex=True)
        if strip:
            clean = clean.str.replace(strip, "", regex=True, case=False)
        v = pd.to_numeric(clean, errors="coerce").to_numpy(float)
        empty = uniq == ""
        if default is not None:
            v[empty] = default
        ok = np.isfinite(v) & (v >= lo) & (v <= hi)
        if integer:
            ok &= v == np.floor(v)
        self.bad(key, (~ok & (~empty | (default is None)))[codes], (codes, uniq), expected)
        return v[codes]

    def choice(
        self, key: str, mapping: dict[str, object], expected: str, default, squeeze: bool = False
    ) -> np.ndarray:
        import pandas as pd

        if key not in self.found:
            return np.full(self.n, default, dtype=object)
        codes, uniq = self.col(key)
        s = pd.Series(uniq, dtype=object).str.lower()
        if squeeze:
            s = s.str.replace(r"[\s°]|deg", "", regex=True)
        low = s.to_numpy(object)
        mapped = np.array([mapping.get(u) if u else default for u in low] + [None], dtype=object)[
            :-1
        ]
        self.bad(key, (pd.isna(mapped) & (low != ""))[codes], (codes, uniq), expected)
        return mapped[codes]

    def conductor(self, key: str, required: bool) -> tuple[np.ndarray, np.ndarray]:
        from .calc.sizes import SizeError, parse_size

        if key not in self.found:
            return np.full(self.n, "", dtype=object), np.full(self.n, "", dtype=object)
        codes, uniq = self.col(key)
        sizes, mats = [], []
        for u in uniq:
            parts = u.rsplit(None, 1)
            size = mat = None
            if len(parts) == 2 and parts[1].lower() in (
                "cu",
                "al",
                "copper",
                "aluminum",
                "aluminium",
            ):
                mat = "cu" if parts[1].lower() in ("cu", "copper") else "al"
                try:
                    size = parse_size(parts[0]).name
                except SizeError:
                    size = None
            sizes.append(size)
            mats.append(mat)
        bad = np.array([sz is None for sz in sizes]) & ((uniq != "") | required)
        self.bad(
            key,
            bad[codes],
            (codes, uniq),
            "a size and material such as '12 AWG Cu', '1/0 AWG Al' or '4 mm2 Cu'",
        )
        size_u = np.array([sz if sz is not None else "" for sz in sizes] + [None], dtype=object)[
            :-1
        ]
        mat_u = np.array([m if m is not None else "" for m in mats] + [None], dtype=object)[:-1]
        return size_u[codes], mat_u[codes]


def _truthy() -> dict[str, object]:
    return {**{k: True for k in _TRUE}, **{k: False for k in _FALSE}}


def read_schedule(path: str | Path, panel_id: str | None = None) -> Schedule:
    """Read and validate a panel schedule (CSV or XLSX).

    Parameters
    ----------
    path : str or Path
        The schedule file.
    panel_id : str, optional
        Panel id for a file without a ``panel`` column (default: the file's stem).

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
    import pandas as pd

    p = Path(path)
    problems = ProblemList(str(p))
    raw = _guard_file(p, problems)
    df = _read_xlsx(raw, problems) if p.suffix.lower() == ".xlsx" else _read_csv(raw, problems)
    if df.shape[1] > MAX_COLUMNS:
        problems.add("row 1", f"{df.shape[1]} columns", f"at most {MAX_COLUMNS} columns")
        problems.raise_if_any()
    # every column as (codes, distinct stripped texts) of the rows below the header
    cols = {pos: _factorised(df[col].to_numpy(object)[1:]) for pos, col in enumerate(df.columns)}
    head = df.iloc[:6].astype(str)
    found = _match_header(head, lambda pos: bool((cols[pos][1] != "").any()), problems)
    problems.raise_if_any()
    n_body = len(df) - 1
    rows_all = np.arange(2, len(df) + 1)
    blank = np.ones(n_body, dtype=bool)
    for codes, uniq in cols.values():
        blank &= (uniq == "")[codes]
    # a header row repeated below the header (pasted twice, or a page break copy)
    circ_pos = found["circuit"][0]
    head_txt = str(head.iat[0, circ_pos]).strip().lower()
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
    c = _Cells(cols, n, found, rows, problems)

    circuit = c.number(
        "circuit", "a circuit number, a whole number from 1 to 999", 1, 999, None, integer=True
    )
    poles = c.number("poles", "1, 2 or 3 poles", 1, 3, 1.0, integer=True)
    load_unit, load_scale = LOAD_UNITS.get(found["load"][2], ("VA", 1.0))
    unit_text = {"va": "VA", "kva": "kVA", "w": "W", "kw": "kW", "a": "A"}.get(
        found["load"][2], "VA"
    )
    load = c.number("load", f"a load in {unit_text}, a number ≥ 0", 0, 1e8, None)
    pf = c.number("pf", "a power factor from 0.05 to 1", 0.05, 1.0, 1.0)
    breaker = c.number(
        "breaker", "a breaker rating in A, e.g. 20 or '20 A'", 1, 6000, None, strip=r"a$"
    )
    len_scale = LENGTH_UNITS.get(found["length"][2], FT)
    length = c.number(
        "length", "a one-way length greater than 0 (up to 2000 m)", 1e-6, 2000 / len_scale, None
    )
    ins = c.choice(
        "insulation",
        {"60": 60.0, "75": 75.0, "90": 90.0, "60c": 60.0, "75c": 75.0, "90c": 90.0},
        "60, 75 or 90 (°C)",
        75.0,
        squeeze=True,
    )
    term = c.choice(
        "termination",
        {"60": 60.0, "75": 75.0, "90": 90.0, "60c": 60.0, "75c": 75.0, "90c": 90.0},
        "60, 75 or 90 (°C)",
        np.nan,
        squeeze=True,
    )
    amb = c.number("ambient", "an ambient from -40 to 85 °C", -40, 85, 30.0)
    ccc = c.number(
        "current_carrying",
        "a whole number of current-carrying conductors, 1 to 80",
        1,
        80,
        3.0,
        integer=True,
    )
    kind = c.choice(
        "kind",
        {k: k for k in KINDS}
        | {
            "light": "lighting",
            "lights": "lighting",
            "receptacles": "receptacle",
            "recept": "receptacle",
            "motors": "motor",
            "heat": "heating",
            "heater": "heating",
        },
        "a load kind: " + ", ".join(KINDS),
        "other",
    )
    cont = c.choice("continuous", _truthy(), "yes or no", False)
    raceway = c.choice(
        "raceway",
        {r: r for r in RACEWAYS}
        | {"emt": "steel", "rmc": "steel", "imc": "steel", "free air": "free-air"},
        "one of " + ", ".join(RACEWAYS),
        "steel",
    )
    size, material = c.conductor("conductor", required=True)
    gsize, gmat = c.conductor("ground", required=False)
    panel = c.text("panel", panel_id or p.stem)
    if "panel" in found:
        empty_panel = panel == ""
        c.bad("panel", empty_panel, panel, "a panel id in every row of a multi-panel file")
    ok_amb = np.isnan(amb) | np.isnan(ins.astype(float)) | (amb < ins.astype(float))
    c.bad("ambient", ~ok_amb, c.text("ambient"), "an ambient below the insulation rating")
    # duplicate circuit numbers and spaces taken twice (multi-pole circuits take n, n+2, ...)
    valid = np.isfinite(circuit) & np.isfinite(poles)
    if valid.any():
        pan_codes = pd.factorize(pd.Series(panel))[0]
        n_pole = np.where(valid, poles, 1).astype(np.int64)
        idx = np.repeat(np.flatnonzero(valid), n_pole[valid])
        step = np.arange(len(idx)) - np.repeat(
            np.cumsum(n_pole[valid]) - n_pole[valid], n_pole[valid]
        )
        space = circuit[idx].astype(np.int64) + 2 * step
        key = pan_codes[idx].astype(np.int64) * 10_000 + space
        order = np.argsort(key, kind="stable")
        ks = key[order]
        dup = np.flatnonzero(ks[1:] == ks[:-1]) + 1
        first_of = {}
        for d in dup[:MAX_PROBLEMS]:
            j = idx[order[d]]
            # the earliest row holding this space
            start = d
            while start > 0 and ks[start - 1] == ks[d]:
                start -= 1
            first = idx[order[start]]
            first_of[j] = first
            what = (
                "the same circuit number as"
                if step[order[d]] == 0 and circuit[j] == circuit[first]
                else "a space already taken by"
            )
            problems.add(
                f"row {rows[j]}, column '{found['circuit'][1]}'",
                _cell_text(circuit[j]),
                f"a circuit number not used twice in panel {panel[j]} (it has "
                f"{what} row {rows[first]}, space {space[order[d]]})",
            )
    if c.count > MAX_PROBLEMS:
        problems.add(
            "",
            f"{c.count - MAX_PROBLEMS} more bad cells",
            f"(only the first {MAX_PROBLEMS} are listed)",
        )
    problems.raise_if_any()
    frame = pd.DataFrame(
        {
            "panel": panel,
            "circuit": circuit.astype(np.int64),
            "description": c.text("description"),
            "poles": poles.astype(np.int64),
            "load_value": load * load_scale,
            "pf": pf,
            "kind": kind,
            "continuous": cont.astype(bool),
            "breaker_a": breaker,
            "size": size,
            "material": material,
            "insulation_c": ins.astype(float),
            "termination_c": term.astype(float),
            "ground_size": gsize,
            "ground_material": gmat,
            "current_carrying": ccc.astype(np.int64),
            "ambient_c": amb,
            "raceway": raceway,
            "length_m": length * len_scale,
            "row": rows,
        }
    )
    return Schedule(p, frame, load_unit, tuple(dict.fromkeys(panel.tolist())))


def read_schedules(paths, panel_ids=None) -> tuple[list[Schedule], list[InputError]]:
    """Read several schedules; return the good ones and every file's InputError."""
    good, bad = [], []
    for i, path in enumerate(paths):
        try:
            good.append(read_schedule(path, panel_ids[i] if panel_ids else None))
        except InputError as exc:
            bad.append(exc)
    return good, bad
