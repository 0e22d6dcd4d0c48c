"""The rule book: every data table loaded once into typed, frozen records.

The checks receive one :class:`RuleBook` (``ctx.rules``) and hand its records to the
kernels (``book.ampacity``, ``book.conductors``, ``book.protection``,
``book.withstand``, …); no kernel under ``feedcheck/calc/`` reads a table itself.

One way to fetch a rule row: ``book.rule(rule_id)`` returns a :class:`RuleRow` from
any table keyed by ``rule_id`` (check rules, voltage-drop limits, fault assumptions,
schedule rules, …). Tables keyed otherwise are read as records with
``book.rows(table_name)``.

The book is built from the shipped tables, with the tables of a user's folder
(``--tables DIR``) replacing the shipped ones of the same name; every value of a
user's table is honoured (no value of a table is repeated in the code).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from pathlib import Path
from types import MappingProxyType
from typing import Any

import numpy as np

from . import tables as _tables
from .calc.ampacity import AmpacityTables
from .calc.conductor import (
    AREA_MM2,
    MATERIALS,
    OHM_PER_KFT_TO_OHM_PER_M,
    RACEWAYS,
    SIZE_NAMES,
    ConductorData,
    material_index,
    size_index,
)
from .calc.motors import MotorFlcTable, MotorFlcTables
from .calc.protection import ProtectionTables
from .calc.selection import SizingData
from .calc.sizes import SIZES, parse_size
from .calc.withstand import KSpec, WithstandData
from .errors import ProblemList
from .findings import Finding
from .rowuse import RowUse, canon_cell
from .tables import Table, confidence_level

Row = Mapping[str, Any]


@dataclass(frozen=True)
class RuleRow:
    """One row of a rules table: its id, its columns, its table and its confidence.

    ``row["limit"]`` reads a column as stored; :meth:`number` and :meth:`text` convert.
    """

    rule_id: str
    table: str
    fields: Row
    confidence: str

    def __getitem__(self, column: str) -> Any:
        return self.fields[column]

    def get(self, column: str, default: Any = None) -> Any:
        return self.fields.get(column, default)

    def number(self, column: str = "value") -> float:
        """The column as a float (``value`` by default)."""
        return float(self.fields[column])

    def text(self, column: str) -> str:
        return str(self.fields[column])


@dataclass(frozen=True)
class FaultAssumptions:
    """The rows of ``fault_assumptions.csv`` by meaning (one attribute per rule id)."""

    z_tolerance_pct: float  # fault-z-tolerance
    z_tolerance_alt_pct: float  # fault-z-tolerance-alt
    cond_temp_max_c: float  # fault-cond-temp-max
    cond_temp_min_c: float  # fault-cond-temp-min
    c_max_6pct: float  # fault-c-max-6pct
    c_max_10pct: float  # fault-c-max-10pct
    c_min: float  # fault-c-min
    motor_multiple: float  # fault-motor-multiple
    ptp_disagree_pct: float  # fault-ptp-disagree
    split_ln_multiplier: float  # fault-split-ln-multiplier
    z0_ratio_max: float  # fault-z0-ratio-max
    z0_ratio_min: float  # fault-z0-ratio-min


FAULT_ROWS = {
    "z_tolerance_pct": "fault-z-tolerance",
    "z_tolerance_alt_pct": "fault-z-tolerance-alt",
    "cond_temp_max_c": "fault-cond-temp-max",
    "cond_temp_min_c": "fault-cond-temp-min",
    "c_max_6pct": "fault-c-max-6pct",
    "c_max_10pct": "fault-c-max-10pct",
    "c_min": "fault-c-min",
    "motor_multiple": "fault-motor-multiple",
    "ptp_disagree_pct": "fault-ptp-disagree",
    "split_ln_multiplier": "fault-split-ln-multiplier",
    "z0_ratio_max": "fault-z0-ratio-max",
    "z0_ratio_min": "fault-z0-ratio-min",
}


@dataclass(frozen=True)
class TransformerXR:
    """Typical X/R by transformer rating (``transformer_xr.csv``)."""

    rating_kva: np.ndarray
    x_r: np.ndarray

    def typical(self, rating_va: float) -> tuple[float, str]:
        """X/R of the rating's row, else of the next rating above it (the higher X/R:
        conservative for the maximum fault and peak; the last row above the table), and
        a label naming the row."""
        i = int(np.searchsorted(self.rating_kva, rating_va / 1000.0 - 1e-9, side="left"))
        i = min(i, len(self.rating_kva) - 1)
        label = f"{self.rating_kva[i]:g} kVA row"
        if abs(self.rating_kva[i] - rating_va / 1000.0) > 1e-9:
            label += ", the next listed rating (higher X/R, conservative for the maximum)"
        return float(self.x_r[i]), label


@dataclass(frozen=True)
class RuleBook:
    """Every table, loaded once, as typed records (see the module docstring).

    Attributes
    ----------
    tables : Mapping[str, Table]
        Every table by name, with its provenance header, origin (shipped/user),
        SHA-256 and per-row confidence (for the report's provenance pages).
    ampacity, conductors, protection, withstand :
        Kernel records: :class:`~feedcheck.calc.ampacity.AmpacityTables`,
        :class:`~feedcheck.calc.conductor.ConductorData`,
        :class:`~feedcheck.calc.protection.ProtectionTables`,
        :class:`~feedcheck.calc.withstand.WithstandData`.
    transformer_xr : TransformerXR
        Typical X/R by rating.
    fault : FaultAssumptions
        The fault-current assumptions.
    transformer_protection : tuple of Mapping
        Rows of Table 450.3(B) (for :func:`~feedcheck.calc.transformer.protection_limit`).
    device_ratings_a : ndarray
        Every standard device rating of Table 240.6(A) [A], ascending.
    tables_dir : Path or None
        The user's folder the book was built with (``--tables DIR``), if any.
    motor_flc : MotorFlcTables
        Motor full-load currents, Tables 430.248 and 430.250 (430.6(A)(1)).
    """

    tables: Mapping[str, Table]
    ampacity: AmpacityTables
    conductors: ConductorData
    protection: ProtectionTables
    withstand: WithstandData
    transformer_xr: TransformerXR
    fault: FaultAssumptions
    transformer_protection: tuple[Row, ...]
    device_ratings_a: np.ndarray
    tables_dir: Path | None
    _rules: Mapping[str, RuleRow]
    _rows: dict = field(default_factory=dict, compare=False, repr=False)
    _index: dict = field(default_factory=dict, compare=False, repr=False)
    motor_flc: MotorFlcTables | None = None

    @property
    def sizing(self) -> SizingData:
        """The records :func:`~feedcheck.calc.selection.select_conductor` reads."""
        return SizingData(self.ampacity, self.protection, self.conductors, self.withstand)

    def rule(self, rule_id: str) -> RuleRow:
        """The rule row with this id (from any table keyed by ``rule_id``)."""
        try:
            return self._rules[rule_id]
        except KeyError:
            raise KeyError(f"rule {rule_id!r}: no table keyed by rule_id has this row") from None

    def has_rule(self, rule_id: str) -> bool:
        return rule_id in self._rules

    def rows(self, table: str) -> tuple[Row, ...]:
        """Every row of a table as read-only mappings, in file order (made once per
        table: the rows are read-only and the book's tables do not change)."""
        rows = self._rows.get(table)
        if rows is None:
            rows = self._rows[table] = _records(self.tables[table])
        return rows

    def table(self, name: str) -> Table:
        return self.tables[name]

    def row_use(self, table: str, **match: str) -> RowUse:
        """The row of ``table`` whose columns hold ``match`` (compared as text, a
        ``size`` in its canonical spelling), as a :class:`RowUse` with its confidence.

        >>> book.row_use("ampacity_raceway", size="4/0", material="cu").row
        '4/0 AWG cu'
        """
        t, cols = self.tables[table], tuple(match)
        index = self._index.get((table, cols))
        if index is None:
            columns = [[canon_cell(c, v) for v in t.columns[c].tolist()] for c in cols]
            index = {}
            for i, key in enumerate(zip(*columns, strict=True)):
                index.setdefault(key, i)
            self._index[(table, cols)] = index
        key = tuple(canon_cell(c, v) for c, v in match.items())
        if key not in index:
            raise KeyError(f"{table}: no row with {dict(zip(cols, key, strict=True))}")
        return RowUse(table, " ".join(key), t.row_confidence[index[key]], t.meta.get("cite", ""))

    def rule_use(self, rule_id: str) -> RowUse | None:
        """The rule row ``rule_id`` as a :class:`RowUse` (None: no table has this id)."""
        r = self._rules.get(rule_id)
        if r is None:
            return None
        return RowUse(r.table, r.rule_id, r.confidence, self.tables[r.table].meta.get("cite", ""))

    def impedance_uses(self, size: str) -> tuple[RowUse, ...]:
        """The row a conductor impedance of ``size`` reads: its row of Chapter 9 Table 9,
        or, for a size the table does not list (computed method), the row of the
        insulation thickness table that sets its spacing."""
        want = parse_size(size)
        t9 = self.tables["conductor_impedance_table9"]
        if any(canon_cell("size", v) == want.name for v in t9.columns["size"].tolist()):
            return (self.row_use(t9.name, size=want.name),)
        ins = self.tables["insulation_thickness"]
        up_to = np.asarray(ins.columns["up_to_mm2"], dtype=float)
        i = min(int(np.searchsorted(up_to, want.area_mm2 * (1 - 1e-9))), len(up_to) - 1)
        label = f"up to {up_to[i]:g} mm2 (for {want.name})"
        return (RowUse(ins.name, label, ins.row_confidence[i], ins.meta.get("cite", "")),)

    def with_cited_notes(self, findings: list[Finding]) -> list[Finding]:
        """``findings`` with the note of each unconfirmed rule row they cite, for findings
        made outside a check run's context (per-circuit schedule findings); the list
        itself when no rule row is unconfirmed."""
        flagged = self._index.get("unconfirmed rules")
        if flagged is None:
            flagged = self._index["unconfirmed rules"] = {
                rid: use.note()
                for rid in self._rules
                if not (use := self.rule_use(rid)).confirmed  # type: ignore[union-attr]
            }
        if not flagged:
            return findings
        return [
            replace(f, unconfirmed=tuple(dict.fromkeys((*f.unconfirmed, flagged[f.rule_id]))))
            if f.rule_id in flagged
            else f
            for f in findings
        ]

    def ampacity_uses(self, size: str, material: str, free_air: bool) -> tuple[RowUse, ...]:
        """The rows an ampacity figure of ``size`` reads: Table 310.16 (raceway; also its
        termination column) and, in free air, Table 310.17; a size a table does not list
        (metric, interpolated) reads the two rows around it."""
        names = ("ampacity_raceway", "ampacity_free_air") if free_air else ("ampacity_raceway",)
        out = []
        for name in names:
            sizes = self._index.get((name, "sizes", material))
            if sizes is None:
                cols = self.tables[name].columns
                sizes = [
                    parse_size(str(s))
                    for s, m in zip(cols["size"].tolist(), cols["material"].tolist(), strict=True)
                    if m == material
                ]
                self._index[(name, "sizes", material)] = sizes
            want = parse_size(size)
            if any(s.name == want.name for s in sizes):
                near = [want]
            else:
                below = [s for s in sizes if s.area_mm2 < want.area_mm2]
                above = [s for s in sizes if s.area_mm2 > want.area_mm2]
                near = [max(below, key=lambda s: s.area_mm2)] if below else []
                near += [min(above, key=lambda s: s.area_mm2)] if above else []
            out += [self.row_use(name, size=s.name, material=material) for s in near]
        return tuple(out)

    def provenance(self) -> list[dict[str, Any]]:
        """One entry per table for results and reports: name, title, source, edition,
        confidence (header), counts by row confidence, origin and SHA-256."""
        return [
            {
                "name": t.name,
                "title": t.title,
                "source": t.source,
                "edition": t.meta.get("edition", ""),
                "confidence": t.confidence,
                "origin": t.origin,
                "sha256": t.sha256,
            }
            for t in (self.tables[n] for n in sorted(self.tables))
        ]

    def confidence_counts(self) -> dict[str, int]:
        """Rows by confidence level over every table."""
        out: dict[str, int] = {}
        for t in self.tables.values():
            for level, n in t.confidence_counts().items():
                out[level] = out.get(level, 0) + n
        return out


def _records(t: Table) -> tuple[Row, ...]:
    return tuple(MappingProxyType(r) for r in t.records())


def _missing(t: Table, column: str, value: str, expected: str) -> None:
    pl = ProblemList(str(t.path))
    pl.add(f"column '{column}'", value, expected)
    pl.raise_if_any()


def _ampacity_array(t: Table) -> np.ndarray:
    """(material, column 60/75/90, size) array; metric sizes interpolated log-log."""
    df = t.columns
    out = np.full((2, 3, len(SIZE_NAMES)), np.nan)
    idx = size_index(df["size"].astype(str))
    m = material_index(df["material"].astype(str))
    for c, col in enumerate(("c60_a", "c75_a", "c90_a")):
        out[m, c, idx] = df[col].astype(float)
    metric = np.array([SIZES[n].system == "metric" for n in SIZE_NAMES])
    for mm in range(2):
        for c in range(3):
            row = out[mm, c]
            known = ~np.isnan(row)
            if np.any(np.diff(row[known]) <= 0):
                _missing(t, "c60_a/c75_a/c90_a", "", "values rising with conductor size")
            la = np.log(AREA_MM2[known])
            target = np.log(AREA_MM2[metric])
            inside = (target >= la.min() - 1e-12) & (target <= la.max() + 1e-12)
            vals = np.exp(np.interp(target, la, np.log(row[known])))
            row[np.flatnonzero(metric)[inside]] = vals[inside]
    return out


def _ampacity(tabs: Mapping[str, Table], rules: Mapping[str, RuleRow]) -> AmpacityTables:
    adj = tabs["adjustment_factors"].columns
    roof = tabs["rooftop_adder"].records()
    metric = np.array([SIZES[n].system == "metric" for n in SIZE_NAMES])
    return AmpacityTables(
        _ampacity_array(tabs["ampacity_raceway"]),
        _ampacity_array(tabs["ampacity_free_air"]),
        metric,
        adj["count_from"].astype(int),
        adj["count_to"].astype(int),
        adj["factor"].astype(float),
        tuple(str(x) for x in adj["rule_id"].tolist()),
        tuple(
            (
                str(r["edition"]),
                float(r["height_from_mm"]),
                float(r["height_to_mm"]),
                float(r["adder_c"]),
                str(r["rule_id"]),
            )
            for r in roof
        ),
        _need(rules, tabs, "ampacity_rules", "continuous-125").number() / 100.0,
    )


def _by_key(t: Table, key: str, wanted: tuple[str, ...], column: str) -> np.ndarray:
    """Column ``column`` of the rows whose ``key`` is each of ``wanted``, in that order."""
    keys = t.columns[key].tolist()
    for w in wanted:
        if w not in keys:
            _missing(t, key, w, f"a row for {w!r}")
    return t.columns[column][[keys.index(w) for w in wanted]]


def _conductors(tabs: Mapping[str, Table]) -> ConductorData:
    t9 = tabs["conductor_impedance_table9"].records()
    mat_t, rw_t = tabs["conductor_materials"], tabs["raceway_effects"]
    ins = tabs["insulation_thickness"].columns
    n = len(SIZE_NAMES)
    r75 = np.full((2, 3, n), np.nan)
    xl = np.full((2, n), np.nan)
    names = {nm: i for i, nm in enumerate(SIZE_NAMES)}
    for row in t9:
        i = names[parse_size(row["size"]).name]
        for m, pre in enumerate(MATERIALS):
            for c, col in enumerate(("pvc", "aluminum", "steel")):
                r75[m, c, i] = row[f"{pre}_r_{col}"] * OHM_PER_KFT_TO_OHM_PER_M
        xl[0, i] = row["xl_nonmagnetic"] * OHM_PER_KFT_TO_OHM_PER_M
        xl[1, i] = row["xl_steel"] * OHM_PER_KFT_TO_OHM_PER_M
    colmap = {"pvc": 0, "aluminum": 1, "steel": 2}

    def m(col):
        return _by_key(mat_t, "material", MATERIALS, col).astype(float)

    def rw(col):
        return _by_key(rw_t, "raceway", RACEWAYS, col)

    return ConductorData(
        r75,
        xl,
        m("rho20_ohm_mm2_per_m"),
        m("alpha20_per_k"),
        m("alpha75_per_k"),
        m("k_strand"),
        rw("x_factor").astype(float),
        rw("r_added_ohm_per_kft").astype(float) * OHM_PER_KFT_TO_OHM_PER_M,
        np.array([colmap[c] for c in rw("table9_column").tolist()]),
        ins["up_to_mm2"].astype(float),
        ins["thickness_mm"].astype(float),
    )


def _protection(
    tabs: Mapping[str, Table], rules: Mapping[str, RuleRow], rho20: np.ndarray
) -> ProtectionTables:
    dev = tabs["device_ratings"].columns
    small = tabs["small_conductor_limits"].records()
    egc = tabs["egc_size"].columns
    lim = np.full((2, len(SIZE_NAMES)), np.inf)
    rid = [[""] * len(SIZE_NAMES) for _ in range(2)]
    for r in small:
        mi, i = int(material_index(r["material"])), int(size_index(r["size"]))
        lim[mi, i] = float(r["max_device_a"])
        rid[mi][i] = str(r["rule_id"])
    return ProtectionTables(
        dev["rating_a"][dev["breaker"] == "yes"].astype(float),
        dev["rating_a"][dev["fuse"] == "yes"].astype(float),
        lim,
        tuple(tuple(x) for x in rid),
        egc["device_up_to_a"].astype(float),
        tuple(str(SIZES[s].name) if s in SIZES else s for s in egc["cu"].tolist()),
        tuple(str(SIZES[s].name) if s in SIZES else s for s in egc["al"].tolist()),
        rho20,
        _need(rules, tabs, "protection_rules", "prot-next-size-up").number(),
        _need(rules, tabs, "protection_rules", "device-continuous-125").number() / 100.0,
    )


def _withstand(tabs: Mapping[str, Table]) -> WithstandData:
    mat_t = tabs["conductor_materials"]

    def m(col):
        return _by_key(mat_t, "material", MATERIALS, col).astype(float)

    rows = tuple(
        KSpec(
            str(r["insulation"]),
            str(r["conductor_role"]),
            str(r["material"]),
            float(r["initial_c"]),
            float(r["final_c"]),
            float(r["max_area_mm2"]),
            float(r["k"]),
            str(r["rule_id"]),
        )
        for r in tabs["withstand_k"].records()
    )
    return WithstandData(
        rows,
        m("beta_c"),
        m("heat_capacity_j_per_k_mm3"),
        m("rho20_ohm_mm2_per_m"),
        m("icea_k"),
        m("icea_t0_c"),
    )


def _motor_flc(tabs: Mapping[str, Table]) -> MotorFlcTables:
    """Tables 430.248 and 430.250 as arrays (columns ``flc_<V>v_a``, blank = no current)."""

    def one(name: str, title: str) -> MotorFlcTable:
        cols = tabs[name].columns  # numpy columns: no pandas on the quick commands
        return MotorFlcTable.from_named_columns(
            np.asarray(cols["hp"], float),
            {c: np.asarray(cols[c], float) for c in cols if "flc_" in str(c)},
            tuple(str(v) for v in cols["rule_id"]),
            title,
        )

    return MotorFlcTables(
        one("motor_flc_single_phase", "Table 430.248"),
        one("motor_flc_three_phase", "Table 430.250"),
    )


def _rules(tabs: Mapping[str, Table]) -> dict[str, RuleRow]:
    """Index of every row of every table keyed by ``rule_id``; an id in two tables is
    an error naming both."""
    out: dict[str, RuleRow] = {}
    for name in sorted(tabs):
        t = tabs[name]
        if t.meta.get("key", "").strip() != "rule_id":
            continue
        for rec, conf in zip(_records(t), t.row_confidence, strict=True):
            rid = str(rec["rule_id"])
            if rid in out:
                _missing(t, "rule_id", rid, f"an id not already used in {out[rid].table}.csv")
            out[rid] = RuleRow(rid, name, rec, conf)
    return out


def _need(
    rules: Mapping[str, RuleRow], tabs: Mapping[str, Table], table: str, rule_id: str
) -> RuleRow:
    """A rule row the checks cannot do without; its absence names the table file."""
    if rule_id not in rules:
        _missing(tabs[table], "rule_id", rule_id, "a row with this rule id")
    return rules[rule_id]


def _fault(rules: Mapping[str, RuleRow], tabs: Mapping[str, Table]) -> FaultAssumptions:
    return FaultAssumptions(
        **{
            attr: _need(rules, tabs, "fault_assumptions", rid).number("value")
            for attr, rid in FAULT_ROWS.items()
        }
    )


def build_rulebook(user_dir: str | Path | None = None) -> RuleBook:
    """Read every table (shipped, replaced by the user's copies) into a rule book.

    Raises
    ------
    InputError
        A table is missing, unreadable, lacks provenance, breaks its own declared
        rules, or lacks a row the checks need.
    """
    udir = Path(user_dir) if user_dir is not None else None
    names = {p.stem for p in _tables.shipped_tables_dir().glob("*.csv")}
    if udir is not None and udir.is_dir():
        names |= {p.stem for p in udir.glob("*.csv")}
    tabs: dict[str, Table] = {}
    for name in sorted(names):
        path, origin = _tables.table_path(name, udir)
        tabs[name] = _tables.read_table_file(path, name, origin)
    conductors = _conductors(tabs)
    rules = _rules(tabs)
    return RuleBook(
        MappingProxyType(tabs),
        _ampacity(tabs, rules),
        conductors,
        _protection(tabs, rules, conductors.rho20),
        _withstand(tabs),
        TransformerXR(
            tabs["transformer_xr"].columns["rating_kva"].astype(float),
            tabs["transformer_xr"].columns["x_r"].astype(float),
        ),
        _fault(rules, tabs),
        _records(tabs["transformer_protection"]),
        tabs["device_ratings"].columns["rating_a"].astype(float),
        udir,
        MappingProxyType(rules),
        motor_flc=_motor_flc(tabs),
    )


_books: dict[tuple[str, int], RuleBook] = {}


def current_rulebook() -> RuleBook:
    """The rule book for the tables in force (shipped, or ``--tables DIR``), built once."""
    udir = _tables.user_tables_dir()
    if udir is None:
        return default_rulebook()
    key = (str(udir), _tables.generation())
    if key not in _books:
        for old in [k for k in _books if k[1] >= 0]:
            del _books[old]
        _books[key] = build_rulebook(udir)
    return _books[key]


def default_rulebook() -> RuleBook:
    """The rule book of the shipped tables alone (tests, doctests)."""
    key = ("None", -1)
    if key not in _books:
        _books[key] = build_rulebook(None)
    return _books[key]


__all__ = [
    "FaultAssumptions",
    "RowUse",
    "RuleBook",
    "RuleRow",
    "TransformerXR",
    "build_rulebook",
    "confidence_level",
    "current_rulebook",
    "default_rulebook",
]
