"""Data tables with provenance: loading, caching and verifying.

Every table is a CSV file under ``tables/`` (shipped inside the wheel as
``feedcheck/tables``) with a commented header block::

    # title: Standard ampere ratings of fuses and inverse-time circuit breakers
    # basis: what the numbers are and how they are used
    # source: the published document, clause or table
    # edition: which edition the values follow
    # conditions: ambient, insulation, frequency ... ("none" when not applicable)
    # confidence: published | common practice | from memory — verify
    # key: rating_a                         (optional: column whose values are unique)
    # monotonic: rating_a increasing        (optional; "col increasing; col2 decreasing")
    # units: rating_a=A                     (optional: unit of each numeric column)
    rating_a,fuse,breaker
    15,yes,yes

Per-row confidence: any table may have a ``row_confidence`` column; a blank cell
takes the table's ``# confidence:`` level. Each loaded :class:`Table` carries one
level per row (``row_confidence``) and counts them (:meth:`Table.confidence_counts`).

A user may point ``--tables DIR`` at a folder with their own copies (to follow
the locally adopted code): a table found there replaces the shipped one of the
same name; the others stay as shipped.
"""

from __future__ import annotations

import io
import re
from collections.abc import Mapping
from dataclasses import dataclass, field
from functools import cached_property
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from .errors import InputError, ProblemList

if TYPE_CHECKING:
    import pandas as pd

REQUIRED_META = ("title", "basis", "source", "edition", "conditions", "confidence")
CONFIDENCE_LEVELS = ("published", "common practice", "from memory — verify")
MAX_TABLE_BYTES = 5_000_000
ROW_CONFIDENCE = "row_confidence"
# levels a figure may rest on without a note: confirmed in a published copy, or a trade
# practice stated as such; any other level (remembered, or a user's own word) is unconfirmed
CONFIRMED_LEVELS = CONFIDENCE_LEVELS[:2]


def is_confirmed(level: str) -> bool:
    """Whether a row of this confidence level (see :func:`confidence_level`) is confirmed.

    >>> is_confirmed("published"), is_confirmed("from memory — verify"), is_confirmed("guess")
    (True, False, False)
    """
    return level in CONFIRMED_LEVELS


def shipped_tables_dir() -> Path:
    """Folder of the tables that ship with the package (wheel or source checkout)."""
    here = Path(__file__).resolve().parent
    inside = here / "tables"
    return inside if inside.is_dir() else here.parent / "tables"


_user_dir: Path | None = None
_cache: dict[tuple[str, str], Table] = {}
_generation = 0


def set_user_tables_dir(path: str | Path | None) -> None:
    """Use a user's folder of tables first (``--tables DIR``); ``None`` resets."""
    global _user_dir, _generation
    _user_dir = Path(path) if path is not None else None
    _generation += 1
    _cache.clear()


def user_tables_dir() -> Path | None:
    return _user_dir


def generation() -> int:
    """Counts calls of :func:`set_user_tables_dir` (so caches of loaded tables renew)."""
    return _generation


def confidence_level(text: str) -> str:
    """The confidence level a confidence text starts with (one of ``CONFIDENCE_LEVELS``;
    "from memory" and "from memory — verify" are the same level); other texts are
    returned stripped, as their own level."""
    low = text.strip().lower()
    for level in CONFIDENCE_LEVELS:
        if low.startswith(level.split(" —")[0]):
            return level
    return text.strip()


@dataclass(frozen=True)
class Table:
    """A loaded table: its rows, its provenance and where it came from.

    ``columns`` holds each column as a numpy array (int64, float64 with NaN for a blank
    cell, or object texts), in file order; ``data`` is the same table as a pandas
    DataFrame, built on first use (the quick commands never import pandas).
    """

    name: str
    columns: Mapping[str, np.ndarray]
    meta: dict[str, str]
    path: Path
    origin: str  # "shipped" or "user"
    sha256: str = ""
    units: dict[str, str] = field(default_factory=dict)
    row_confidence: tuple[str, ...] = ()  # one level per row (column, else the header)

    @cached_property
    def data(self) -> pd.DataFrame:
        import pandas as pd

        return pd.DataFrame(dict(self.columns))

    def records(self) -> list[dict]:
        """Every row as a dict of Python values (``data.to_dict("records")``)."""
        cols = [(k, v.tolist()) for k, v in self.columns.items()]
        n = len(cols[0][1]) if cols else 0
        return [{k: v[i] for k, v in cols} for i in range(n)]

    def __len__(self) -> int:
        return len(next(iter(self.columns.values()))) if self.columns else 0

    @property
    def title(self) -> str:
        return self.meta.get("title", self.name)

    @property
    def source(self) -> str:
        return self.meta.get("source", "")

    @property
    def confidence(self) -> str:
        return self.meta.get("confidence", "")

    def confidence_counts(self) -> dict[str, int]:
        """Rows by confidence level, in the order of ``CONFIDENCE_LEVELS`` (others after)."""
        counts: dict[str, int] = {}
        for level in self.row_confidence:
            counts[level] = counts.get(level, 0) + 1
        return sorted_counts(counts)


def sorted_counts(counts: dict[str, int]) -> dict[str, int]:
    """Counts by confidence level in the order of ``CONFIDENCE_LEVELS``, others after."""
    order = {lv: i for i, lv in enumerate(CONFIDENCE_LEVELS)}
    return dict(sorted(counts.items(), key=lambda kv: (order.get(kv[0], 99), kv[0])))


def _split_header(text: str) -> tuple[dict[str, str], str, int]:
    meta: dict[str, str] = {}
    lines = text.splitlines(keepends=True)
    n = 0
    for line in lines:
        if line.startswith("#"):
            body = line[1:].strip()
            if ":" in body:
                k, v = body.split(":", 1)
                k = k.strip().lower()
                meta[k] = (meta[k] + " " + v.strip()) if k in meta else v.strip()
            n += 1
        elif not line.strip():
            n += 1
        else:
            break
    return meta, "".join(lines[n:]), n


_CURRENT = object()


def table_path(name: str, user_dir: Path | object | None = _CURRENT) -> tuple[Path, str]:
    """Where table ``name`` is read from, and whether that is the user's copy.

    ``user_dir`` defaults to the folder set by :func:`set_user_tables_dir`."""
    udir = _user_dir if user_dir is _CURRENT else user_dir
    if udir is not None:
        p = Path(udir) / f"{name}.csv"  # type: ignore[arg-type]
        if p.exists() or p.is_symlink():  # any entry of that name is the user's copy:
            return p, "user"  # a pipe, device or broken link is refused when read
    return shipped_tables_dir() / f"{name}.csv", "shipped"


def read_table_file(path: Path, name: str, origin: str) -> Table:
    """Read and validate one table file; raise InputError naming each problem."""
    import hashlib

    problems = ProblemList(str(path))
    raw = _raw_bytes(path, problems)
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        problems.add("", f"byte 0x{raw[exc.start]:02x}", "UTF-8 text", line=line)
        problems.raise_if_any()
    meta, body, n_header = _split_header(text)
    for key in REQUIRED_META:
        if not meta.get(key):
            problems.add(f"header '# {key}:'", "", "a provenance line naming the " + key)
    conf = meta.get("confidence", "")
    if conf and not any(conf.lower().startswith(c.split(" —")[0]) for c in CONFIDENCE_LEVELS):
        problems.add(
            "header '# confidence:'", conf, " or ".join(repr(c) for c in CONFIDENCE_LEVELS)
        )
    cols = _plain_columns(body)
    if cols is None:
        cols = _pandas_columns(body, problems)
    units = _check_columns(cols, meta, n_header, problems)
    problems.raise_if_any()
    header_level = confidence_level(conf)
    n = len(next(iter(cols.values()))) if cols else 0
    if ROW_CONFIDENCE in cols:
        rows = tuple(
            header_level if _blank(v) else confidence_level(str(v))
            for v in cols[ROW_CONFIDENCE].tolist()
        )
    else:
        rows = (header_level,) * n
    return Table(name, cols, meta, path, origin, hashlib.sha256(raw).hexdigest(), units, rows)


def _raw_bytes(path: Path, problems: ProblemList) -> bytes:
    """The table file's bytes through the one guard on a user's file (a regular file,
    its size checked before reading: a pipe or device in ``--tables DIR`` never hangs)."""
    from .inputs.files import FileKind, FileRefused, read_bytes

    kind = FileKind(
        "table file", "(.csv)", MAX_TABLE_BYTES, f"a table under {MAX_TABLE_BYTES} bytes"
    )
    try:
        return read_bytes(path, kind)
    except FileRefused as exc:
        problems.add("", exc.value, exc.expected)
        problems.raise_if_any()
    raise AssertionError("unreachable")  # raise_if_any raised


def _blank(v) -> bool:
    return v is None or (isinstance(v, float) and v != v) or not str(v).strip()


# what the CSV parser reads as a missing value (pandas' default NA texts)
_NA = {
    "", "#N/A", "#N/A N/A", "#NA", "-1.#IND", "-1.#QNAN", "-NaN", "-nan", "1.#IND",
    "1.#QNAN", "<NA>", "N/A", "NA", "NULL", "NaN", "None", "n/a", "nan", "null",
}  # fmt: skip
_INT = re.compile(r"-?\d{1,18}")
_FLOAT = re.compile(r"-?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?|-?inf")


def _plain_columns(body: str) -> dict[str, np.ndarray] | None:
    """The table's columns read without pandas: plain cells (no quotes, no padding after
    a value, every row as wide as the header); None for anything else, which pandas
    reads. Column types as pandas gives them: int64, float64 (NaN for a blank cell) or
    object texts."""
    if "\r" in body:
        return None
    lines = [ln for ln in body.split("\n") if ln]
    if len(lines) < 2 or any(not ln.strip() for ln in lines):
        return None
    if '"' in body:  # quoted cells (a comma inside a text)
        import csv

        names, *rows = list(csv.reader(lines, skipinitialspace=True))
    else:
        names = [c.lstrip() for c in lines[0].split(",")]
        rows = [[c.lstrip() for c in ln.split(",")] for ln in lines[1:]]
    if len(set(names)) != len(names) or not all(names) or any(len(r) != len(names) for r in rows):
        return None
    out = {}
    for j, name in enumerate(names):
        arr = _typed([r[j] for r in rows])
        if arr is None:
            return None
        out[name.strip()] = arr
    return out


def _typed(cells: list[str]) -> np.ndarray | None:
    """One column as pandas types it, or None when unsure (pandas decides)."""
    if any(c != c.rstrip() for c in cells):
        return None
    na = [c in _NA for c in cells]
    vals = [c for c, m in zip(cells, na, strict=True) if not m]
    if not vals:
        return np.full(len(cells), np.nan)
    if all(_INT.fullmatch(v) for v in vals) and not any(na):
        return np.array([int(v) for v in vals], dtype=np.int64)
    if all(_INT.fullmatch(v) or _FLOAT.fullmatch(v) for v in vals):
        return np.array([np.nan if m else float(c) for c, m in zip(cells, na, strict=True)])
    for v in vals:
        if v.lower() in ("true", "false") or (not _FLOAT.fullmatch(v) and _parses_as_float(v)):
            return None  # pandas reads these as booleans or numbers
    out = np.empty(len(cells), dtype=object)
    out[:] = [np.nan if m else c for c, m in zip(cells, na, strict=True)]
    return out


def _parses_as_float(v) -> bool:
    try:
        float(v)
    except (TypeError, ValueError):
        return False
    return True


def _pandas_columns(body: str, problems: ProblemList) -> dict[str, np.ndarray]:
    import pandas as pd

    try:
        df = pd.read_csv(
            io.StringIO(body), skipinitialspace=True, comment=None, float_precision="round_trip"
        )
    except Exception as exc:  # pandas raises several parser error types
        problems.add("body", "", f"CSV rows under the header ({exc})")
        problems.raise_if_any()
    return {str(c).strip(): df[c].to_numpy() for c in df.columns}


def _isna(arr: np.ndarray) -> np.ndarray:
    if arr.dtype.kind == "f":
        return np.isnan(arr)
    if arr.dtype.kind == "O":
        return np.array([v is None or (isinstance(v, float) and v != v) for v in arr], bool)
    return np.zeros(len(arr), dtype=bool)


def _as_numbers(arr: np.ndarray) -> np.ndarray:
    """A column as floats, NaN where a cell is not a number (``pandas.to_numeric``)."""
    if arr.dtype.kind in "iufb":
        return arr.astype(float)
    vals = arr.tolist()
    return np.array([float(v) if _parses_as_float(v) else np.nan for v in vals], dtype=float)


def _check_columns(cols: dict, meta: dict, n_header: int, problems: ProblemList) -> dict:
    """The declared units, gaps, numeric columns, key and monotonic rules of a table."""
    units: dict[str, str] = {}
    for part in filter(None, (p.strip() for p in meta.get("units", "").split(","))):
        if "=" in part:
            col, unit = (s.strip() for s in part.split("=", 1))
            units[col] = unit
            if col not in cols:
                problems.add("header '# units:'", col, f"a column of the table ({', '.join(cols)})")
    n = len(next(iter(cols.values()))) if cols else 0
    if n == 0:
        problems.add("body", "", "at least one data row")
    for col, arr in cols.items():
        gaps = np.flatnonzero(_isna(arr))
        if len(gaps) and not (col.startswith("opt_") or col == ROW_CONFIDENCE):
            line = int(gaps[0]) + n_header + 2
            problems.add(f"column '{col}'", "", "a value in every row (no gaps)", line=line)
    not_numeric: set[str] = set()  # reported once, not again as out of order
    for col, unit in units.items():
        arr = cols.get(col)
        if n and arr is not None and arr.dtype.kind not in "iufb":
            bad = np.isnan(_as_numbers(arr)) & ~_isna(arr)
            first = int(bad.argmax())
            line = first + n_header + 2
            problems.add(f"column '{col}'", str(arr[first]), f"numbers (in {unit})", line=line)
            not_numeric.add(col)
    _check_key(cols, meta.get("key", "").strip(), n_header, problems)
    for rule in filter(None, (r.strip() for r in meta.get("monotonic", "").split(";"))):
        _check_monotonic(cols, rule, not_numeric, n, n_header, problems)
    return units


def _check_key(cols: dict, key: str, n_header: int, problems: ProblemList) -> None:
    if not key:
        return
    if key not in cols:
        problems.add("header '# key:'", key, "a column of the table")
        return
    seen: set = set()
    for i, v in enumerate(cols[key].tolist()):
        k = "\x00nan" if isinstance(v, float) and v != v else v
        if k in seen:
            problems.add(f"column '{key}'", v, "unique key values", line=i + n_header + 2)
            return
        seen.add(k)


_DIRECTIONS = {
    "increasing": np.greater,
    "decreasing": np.less,
    "nondecreasing": np.greater_equal,
    "nonincreasing": np.less_equal,
}


def _check_monotonic(cols, rule: str, not_numeric, n: int, n_header: int, problems) -> None:
    parts = rule.split()
    if len(parts) != 2 or parts[1] not in _DIRECTIONS:
        problems.add("header '# monotonic:'", rule, "'column increasing' or 'column decreasing'")
        return
    col, direction = parts
    if col not in cols:
        problems.add("header '# monotonic:'", col, "a column of the table")
        return
    if n == 0 or col in not_numeric:
        return
    s = _as_numbers(cols[col])
    good = _DIRECTIONS[direction](np.diff(s), 0)
    if not good.all() or np.isnan(s).any():
        bad_pos = int((~good).argmax()) + 1 if len(good) else 0
        problems.add(
            f"column '{col}'",
            str(cols[col][bad_pos]),
            f"values {direction} down the table",
            line=bad_pos + n_header + 2,
        )


def load_table(name: str) -> Table:
    """Load (once) and validate table ``name`` (file ``tables/<name>.csv``).

    Raises
    ------
    InputError
        When the table is missing, unreadable, lacks provenance or breaks its own
        declared key / monotonic / units rules.
    """
    path, origin = table_path(name)
    ck = (str(path), name)
    if ck in _cache:
        return _cache[ck]
    if not path.is_file():
        pl = ProblemList(str(path))
        pl.add("", name, "a table file named " + f"{name}.csv in {path.parent}")
        pl.raise_if_any()
    table = read_table_file(path, name, origin)
    _cache[ck] = table
    return table


def table_names() -> list[str]:
    """Names of every shipped table, plus any extra ones in the user's folder."""
    names = {p.stem for p in shipped_tables_dir().glob("*.csv")}
    if _user_dir is not None and _user_dir.is_dir():
        names |= {p.stem for p in _user_dir.glob("*.csv")}
    return sorted(names)


def verify_all() -> tuple[list[Table], list[InputError]]:
    """Load every table; return the good ones and the errors of the bad ones."""
    good: list[Table] = []
    bad: list[InputError] = []
    for name in table_names():
        try:
            good.append(load_table(name))
        except InputError as exc:
            bad.append(exc)
    return good, bad


def rule(table: str, rule_id: str) -> dict:
    """One row of a rules table, by its ``rule_id`` column."""
    t = load_table(table)
    for row in t.records():
        if row.get("rule_id") == rule_id:
            return row
    pl = ProblemList(str(t.path))
    pl.add("column 'rule_id'", rule_id, "a row with this rule id")
    pl.raise_if_any()


def used_tables() -> list[Table]:
    """Tables loaded so far in this process (for the report's provenance page)."""
    return sorted(_cache.values(), key=lambda t: t.name)


__all__ = [
    "InputError",
    "Table",
    "confidence_level",
    "is_confirmed",
    "load_table",
    "rule",
    "set_user_tables_dir",
    "shipped_tables_dir",
    "table_names",
    "used_tables",
    "verify_all",
]
