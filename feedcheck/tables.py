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
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

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
    """A loaded table: its rows, its provenance and where it came from."""

    name: str
    data: pd.DataFrame
    meta: dict[str, str]
    path: Path
    origin: str  # "shipped" or "user"
    sha256: str = ""
    units: dict[str, str] = field(default_factory=dict)
    row_confidence: tuple[str, ...] = ()  # one level per row (column, else the header)

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
        if p.is_file():
            return p, "user"
    return shipped_tables_dir() / f"{name}.csv", "shipped"


def read_table_file(path: Path, name: str, origin: str) -> Table:
    """Read and validate one table file; raise InputError naming each problem."""
    import hashlib

    import pandas as pd

    problems = ProblemList(str(path))
    try:
        raw = path.read_bytes()
    except OSError as exc:
        problems.add("", "", f"a readable table file ({exc.strerror})")
        problems.raise_if_any()
    if len(raw) > MAX_TABLE_BYTES:
        problems.add("", f"{len(raw)} bytes", f"a table under {MAX_TABLE_BYTES} bytes")
        problems.raise_if_any()
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
    try:
        df = pd.read_csv(
            io.StringIO(body), skipinitialspace=True, comment=None, float_precision="round_trip"
        )
    except Exception as exc:  # pandas raises several parser error types
        problems.add("body", "", f"CSV rows under the header ({exc})")
        problems.raise_if_any()
    df.columns = [str(c).strip() for c in df.columns]
    units: dict[str, str] = {}
    for part in filter(None, (p.strip() for p in meta.get("units", "").split(","))):
        if "=" in part:
            col, unit = (s.strip() for s in part.split("=", 1))
            units[col] = unit
            if col not in df.columns:
                problems.add(
                    "header '# units:'", col, f"a column of the table ({', '.join(df.columns)})"
                )
    if df.empty:
        problems.add("body", "", "at least one data row")
    for col in df.columns:
        if df[col].isna().any() and not (col.startswith("opt_") or col == ROW_CONFIDENCE):
            bad = int(df.index[df[col].isna()][0]) + n_header + 2
            problems.add(f"column '{col}'", "", "a value in every row (no gaps)", line=bad)
    not_numeric: set[str] = set()  # reported once, not again as out of order
    for col, unit in units.items():
        if not df.empty and col in df.columns and not pd.api.types.is_numeric_dtype(df[col]):
            bad_rows = pd.to_numeric(df[col], errors="coerce").isna() & df[col].notna()
            first = int(bad_rows.to_numpy().argmax())
            problems.add(
                f"column '{col}'",
                str(df[col].iloc[first]),
                f"numbers (in {unit})",
                line=first + n_header + 2,
            )
            not_numeric.add(col)
    key = meta.get("key", "").strip()
    if key:
        if key not in df.columns:
            problems.add("header '# key:'", key, "a column of the table")
        elif df[key].duplicated().any():
            first = int(df[key].duplicated().to_numpy().argmax())
            problems.add(
                f"column '{key}'",
                df[key].iloc[first],
                "unique key values",
                line=first + n_header + 2,
            )
    for rule in filter(None, (r.strip() for r in meta.get("monotonic", "").split(";"))):
        parts = rule.split()
        if len(parts) != 2 or parts[1] not in (
            "increasing",
            "decreasing",
            "nondecreasing",
            "nonincreasing",
        ):
            problems.add(
                "header '# monotonic:'", rule, "'column increasing' or 'column decreasing'"
            )
            continue
        col, direction = parts
        if col not in df.columns:
            problems.add("header '# monotonic:'", col, "a column of the table")
            continue
        if df.empty or col in not_numeric:
            continue
        s = pd.to_numeric(df[col], errors="coerce")
        d = s.diff().iloc[1:]
        ok = {
            "increasing": (d > 0).all(),
            "decreasing": (d < 0).all(),
            "nondecreasing": (d >= 0).all(),
            "nonincreasing": (d <= 0).all(),
        }[direction]
        if not ok or s.isna().any():
            bad_pos = (
                int(
                    (
                        ~{
                            "increasing": d > 0,
                            "decreasing": d < 0,
                            "nondecreasing": d >= 0,
                            "nonincreasing": d <= 0,
                        }[direction]
                    )
                    .to_numpy()
                    .argmax()
                )
                + 1
            )
            problems.add(
                f"column '{col}'",
                str(df[col].iloc[bad_pos]),
                f"values {direction} down the table",
                line=bad_pos + n_header + 2,
            )
    problems.raise_if_any()
    header_level = confidence_level(conf)
    if ROW_CONFIDENCE in df.columns:
        rows = tuple(
            header_level if pd.isna(v) or not str(v).strip() else confidence_level(str(v))
            for v in df[ROW_CONFIDENCE]
        )
    else:
        rows = (header_level,) * len(df)
    return Table(name, df, meta, path, origin, hashlib.sha256(raw).hexdigest(), units, rows)


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
    rows = t.data[t.data["rule_id"] == rule_id]
    if rows.empty:
        pl = ProblemList(str(t.path))
        pl.add("column 'rule_id'", rule_id, "a row with this rule id")
        pl.raise_if_any()
    return rows.iloc[0].to_dict()


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
