"""Conductor ampacity as a chain of factors: table value, corrections, termination limit.

Chain (NFPA 70-2023 Article 310 with 110.14(C)):

1. base ampacity of one conductor from the **insulation** temperature column of
   Table 310.16 (raceway, cable; ≤ 3 current-carrying conductors) or Table 310.17
   (single conductors in free air), both at 30 °C ambient;
2. ambient correction ``√((Tc − Ta)/(Tc − 30))`` (310.15(B)(1) formula), with an optional
   rooftop temperature adder on Ta (310.15(B)(2));
3. adjustment for more than three current-carrying conductors (Table 310.15(C)(1));
4. times the number of parallel sets (each set ≥ 1/0 AWG, 310.10(G));
5. capped by the **termination** column's unadjusted value × sets (110.14(C)).

Metric sizes are not in Table 310.16: their base ampacity is interpolated log-log in
area between the neighbouring AWG/kcmil rows of the same column (``method ==
"interpolated"``). That is an engineering estimate, not a code table value; use a
table of the locally adopted code (IEC 60364-5-52) for metric installations.

References
----------
NFPA 70 National Electrical Code, 2023: 110.14(C), 215.2(A)(1), 310.10(G), 310.15(B)–(E),
Tables 310.15(C)(1), 310.16, 310.17.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .conductor import AREA_MM2, SIZE_NAMES, material_index, size_index
from .sizes import SIZES

COLUMNS_C = (60.0, 75.0, 90.0)
PARALLEL_MIN_AREA_MM2 = SIZES["1/0 AWG"].area_mm2
SMALL_TERMINATION_MAX_AREA_MM2 = SIZES["1 AWG"].area_mm2


@dataclass(frozen=True)
class AmpacityTables:
    """Ampacity tables as arrays (materials cu/al × columns 60/75/90 °C × ``SIZE_NAMES``).

    NaN where a table has no value (14 AWG aluminum; metric sizes outside the
    AWG/kcmil range). ``interpolated`` marks metric cells filled by interpolation.
    Built by the rule book (``book.ampacity``, :mod:`feedcheck.rulebook`) from Tables
    310.16 and 310.17, Table 310.15(C)(1) and the rooftop adders.
    """

    raceway_a: np.ndarray
    free_air_a: np.ndarray
    interpolated: np.ndarray
    adj_from: np.ndarray
    adj_to: np.ndarray
    adj_factor: np.ndarray
    adj_rule_ids: tuple[str, ...]
    rooftop: tuple[tuple[str, float, float, float, str], ...]
    continuous_factor: float  # rule continuous-125 (125 % → 1.25), 215.2(A)(1)(a)


def _column(temp_c, what: str) -> np.ndarray:
    t = np.asarray(temp_c, dtype=float)
    col = np.full(t.shape, -1, dtype=np.intp)
    for i, c in enumerate(COLUMNS_C):
        col[t == c] = i
    if (col < 0).any():
        bad = t[col < 0].ravel()[0]
        raise ValueError(f"{what}: got {bad:g} °C; expected a table column, 60, 75 or 90 °C")
    return col


def ambient_factor(insulation_c, ambient_c):
    """Ambient temperature correction factor ``√((Tc − Ta)/(Tc − 30))``.

    Parameters
    ----------
    insulation_c : float or array_like
        Conductor insulation temperature rating Tc [°C].
    ambient_c : float or array_like
        Ambient temperature Ta [°C], including any rooftop adder; below Tc.

    Returns
    -------
    factor : float or ndarray
        Multiplier on the 30 °C table ampacity (> 1 below 30 °C).

    Raises
    ------
    ValueError
        Ambient at or above the insulation rating (no ampacity left).

    Examples
    --------
    >>> round(float(ambient_factor(90.0, 40.0)), 3)
    0.913

    References
    ----------
    NFPA 70-2023 310.15(B)(1) equation 310.15(B)(1); Table 310.15(B)(1).
    """
    tc = np.asarray(insulation_c, dtype=float)
    ta = np.asarray(ambient_c, dtype=float)
    if not np.isfinite(ta).all() or (ta >= tc).any() or (ta < -50.0).any():
        bad = np.broadcast_to(ta, np.broadcast(ta, tc).shape)[
            ~np.broadcast_to(
                np.isfinite(ta) & (ta < tc) & (ta >= -50.0), np.broadcast(ta, tc).shape
            )
        ].ravel()[0]
        raise ValueError(
            f"ambient_c: got {bad:g} °C; expected −50 °C up to below the "
            "insulation rating (no ampacity is left at or above it)"
        )
    f = np.sqrt((tc - ta) / (tc - 30.0))
    return f[()] if f.ndim == 0 else f


def adjustment_factor(current_carrying, *, tables: AmpacityTables):
    """Adjustment factor for the number of current-carrying conductors in one raceway.

    Examples
    --------
    >>> t = book.ampacity  # the rule book's record (feedcheck.rulebook)
    >>> float(adjustment_factor(6, tables=t)), float(adjustment_factor(7, tables=t))
    (0.8, 0.7)

    References
    ----------
    NFPA 70-2023 Table 310.15(C)(1).
    """
    t = tables
    n = np.asarray(current_carrying)
    if not ((n >= 1) & (n == np.floor(n))).all():
        raise ValueError(
            f"current_carrying: got {current_carrying}; expected a whole number ≥ 1 "
            "of current-carrying conductors in the raceway"
        )
    row = np.searchsorted(t.adj_to, n.astype(np.int64), side="left")
    f = t.adj_factor[np.minimum(row, len(t.adj_factor) - 1)]
    return f[()] if f.ndim == 0 else f


def _adjustment_rule(current_carrying: int, tables: AmpacityTables) -> str:
    row = int(np.searchsorted(tables.adj_to, int(current_carrying), side="left"))
    return tables.adj_rule_ids[min(row, len(tables.adj_rule_ids) - 1)]


def count_current_carrying(ungrounded, neutral: bool = False, neutral_counts: bool = False):
    """Current-carrying conductors in a raceway for Table 310.15(C)(1).

    Ungrounded (phase) conductors always count. A neutral counts only when it carries
    more than unbalanced current: ``neutral_counts=True`` for a 4-wire wye whose major
    load is nonlinear (harmonics, 310.15(E)(3)) or a 3-wire circuit from a 4-wire wye
    (310.15(E)(2)). Equipment grounding conductors never count (310.15(F)).

    Examples
    --------
    >>> count_current_carrying(6, neutral=True, neutral_counts=True)
    7
    """
    n = np.asarray(ungrounded) + (1 if (neutral and neutral_counts) else 0)
    return int(n) if n.ndim == 0 else n


def rooftop_adder_c(
    height_above_roof_m: float,
    edition: str = "2017",
    xhhw2: bool = False,
    *,
    tables: AmpacityTables,
) -> tuple[float, str]:
    """Temperature adder [°C] for a sunlit rooftop raceway, and its rule id.

    ``edition="2017"`` (2017 and later): 33 °C below 23 mm (7/8 in), else 0; XHHW-2 is
    exempt. ``edition="2011"`` (2011–2014): four height bands.

    Examples
    --------
    >>> rooftop_adder_c(0.01, tables=book.ampacity)
    (33.0, 'nec-310.15(B)(2)-rooftop')

    References
    ----------
    NFPA 70-2023 310.15(B)(2); NFPA 70-2011 Table 310.15(B)(3)(c).
    """
    t = tables
    h_mm = float(height_above_roof_m) * 1000.0
    if not (np.isfinite(h_mm) and h_mm >= 0):
        raise ValueError(f"height_above_roof_m: got {height_above_roof_m}; expected ≥ 0 m")
    rows = [r for r in t.rooftop if r[0] == str(edition)]
    if not rows:
        raise ValueError(
            f"edition: got {edition!r}; expected one of {sorted({r[0] for r in t.rooftop})}"
        )
    if xhhw2 and str(edition) != "2011":
        return 0.0, rows[0][4]
    for _, _lo, hi, adder, rid in rows:
        # 2017+: "less than 23 mm"; 2011-2014 bands include their upper edge.
        if h_mm < hi or (str(edition) == "2011" and h_mm <= hi):
            return adder, rid
    return rows[-1][3], rows[-1][4]


def termination_c_for(circuit_a, size, equipment_75c: bool = False):
    """Termination temperature column [°C] by 110.14(C)(1).

    Circuits rated 100 A or less, or conductors 14 through 1 AWG: 60 °C unless the
    equipment is listed and marked for 75 °C (``equipment_75c``); otherwise 75 °C.

    Examples
    --------
    >>> float(termination_c_for(100.0, "3 AWG")), float(termination_c_for(225.0, "4/0 AWG"))
    (60.0, 75.0)
    """
    a = np.asarray(circuit_a, dtype=float)
    area = AREA_MM2[size_index(size)]
    small = (a <= 100.0) | (area <= SMALL_TERMINATION_MAX_AREA_MM2 * (1 + 1e-9))
    out = np.where(small & (not equipment_75c), 60.0, 75.0)
    return out[()] if out.ndim == 0 else out


def _base(tables, free_air, m, col, idx):
    table = np.where(
        np.asarray(free_air, dtype=bool),
        tables.free_air_a[m, col, idx],
        tables.raceway_a[m, col, idx],
    )
    if np.isnan(table).any():
        pos = np.flatnonzero(np.isnan(np.asarray(table).ravel()))[0]
        name = SIZE_NAMES[np.asarray(idx).ravel()[pos]]
        mat = ("cu", "al")[np.asarray(m).ravel()[pos]]
        raise ValueError(
            f"size: got {name!r} {mat}; expected a size the ampacity table lists "
            "for that material (14 AWG … 2000 kcmil Cu, 12 AWG … 2000 kcmil Al; "
            "metric sizes within that area range)"
        )
    return table


def _check_sets(sets, idx) -> np.ndarray:
    """Parallel sets as an array: whole numbers ≥ 1, and 1/0 AWG or larger when > 1."""
    n_sets = np.asarray(sets)
    if not ((n_sets >= 1) & (n_sets == np.floor(n_sets))).all():
        raise ValueError(f"sets: got {sets}; expected a whole number ≥ 1")
    if ((n_sets > 1) & (AREA_MM2[idx] < PARALLEL_MIN_AREA_MM2 * (1 - 1e-9))).any():
        raise ValueError(
            "sets: conductors in parallel must be 1/0 AWG or larger "
            "(NFPA 70 310.10(G)(1)); got a smaller size with sets > 1"
        )
    return n_sets


def ampacity_a(
    size,
    material,
    insulation_c,
    ambient_c=30.0,
    current_carrying=3,
    termination_c=75.0,
    sets=1,
    free_air=False,
    rooftop_adder_c=0.0,
    *,
    tables: AmpacityTables,
):
    """Allowable ampacity [A] of a run after every correction and the termination cap.

    Vectorised: every argument may be an array (broadcast together); sizes are names.

    Parameters
    ----------
    size : str or array_like of str
        Size name(s) (``"3/0 AWG"``, ``"250 kcmil"``, ``"95 mm2"``).
    material : str or array_like of str
        ``"cu"`` or ``"al"``.
    insulation_c : float or array_like
        Insulation temperature column [°C]: 60, 75 or 90.
    ambient_c : float or array_like, default 30
        Ambient temperature [°C].
    current_carrying : int or array_like, default 3
        Current-carrying conductors in one raceway or cable.
    termination_c : float or array_like, default 75
        Termination temperature column [°C]: 60, 75 or 90 (see :func:`termination_c_for`).
    sets : int or array_like, default 1
        Conductors in parallel per phase; > 1 needs 1/0 AWG or larger.
    free_air : bool or array_like, default False
        Single conductors in free air (Table 310.17) instead of Table 310.16.
    rooftop_adder_c : float or array_like, default 0
        Added to the ambient (see :func:`rooftop_adder_c`) [°C].
    tables : AmpacityTables
        The ampacity tables (``book.ampacity`` of the rule book).

    Returns
    -------
    ampacity_a : float or ndarray
        ``min(base·f_ambient·f_adjust, base_termination) · sets`` [A].

    Raises
    ------
    ValueError
        Unknown size/material, untabulated size, a column other than 60/75/90 °C, ambient
        at or above the insulation rating, parallel sets smaller than 1/0 AWG.

    Examples
    --------
    >>> t = book.ampacity
    >>> round(float(ampacity_a("3/0 AWG", "cu", 90.0, 40.0, 6, 75.0, tables=t)), 1)  # 225·0.913·0.8
    164.3

    References
    ----------
    NFPA 70-2023 110.14(C), 310.10(G), 310.15(B)(1), Table 310.15(C)(1), Tables 310.16/17.
    """
    t = tables
    idx = size_index(size)
    m = material_index(material)
    ci = _column(insulation_c, "insulation_c")
    ct = _column(termination_c, "termination_c")
    n_sets = _check_sets(sets, idx)
    base = _base(t, free_air, m, ci, idx)
    fa = ambient_factor(
        np.asarray(COLUMNS_C)[ci],
        np.asarray(ambient_c, dtype=float) + np.asarray(rooftop_adder_c, dtype=float),
    )
    fadj = adjustment_factor(current_carrying, tables=t)
    cap = _base(t, free_air, m, ct, idx)
    out = np.round(np.minimum(base * fa * fadj, cap) * n_sets, 9)
    return out[()] if np.ndim(out) == 0 else out


@dataclass(frozen=True)
class AmpacityChain:
    """Every step of one run's ampacity, for a printed chain and for findings.

    Currents are totals for all ``sets`` unless named ``_per_set``.
    """

    size: str
    material: str
    method: str
    insulation_c: float
    base_per_set_a: float
    ambient_c: float
    rooftop_adder_c: float
    ambient_factor: float
    current_carrying: int
    adjustment_factor: float
    adjustment_rule_id: str
    sets: int
    corrected_a: float
    termination_c: float
    termination_cap_a: float
    final_a: float
    governed_by: str
    table_rule_id: str
    continuous_a: float
    noncontinuous_a: float
    required_before_a: float
    ok_before: bool
    required_after_a: float
    ok_after: bool
    rule_ids: tuple[str, ...]

    def steps(self) -> tuple[tuple[str, float, str, str], ...]:
        """(label, value, unit, rule id) for each link of the chain, in order."""
        return (
            (
                f"table ampacity, {self.insulation_c:g} °C column, one conductor",
                self.base_per_set_a,
                "A",
                self.table_rule_id,
            ),
            (
                "ambient used (with rooftop adder)",
                self.ambient_c + self.rooftop_adder_c,
                "°C",
                "ambient-formula",
            ),
            ("ambient correction factor", self.ambient_factor, "", "ambient-formula"),
            (
                f"adjustment factor, {self.current_carrying} current-carrying",
                self.adjustment_factor,
                "",
                self.adjustment_rule_id,
            ),
            ("parallel sets", float(self.sets), "", "parallel-min-1/0"),
            ("corrected ampacity", self.corrected_a, "A", "adjust-more-than-3"),
            (
                f"termination limit, {self.termination_c:g} °C column",
                self.termination_cap_a,
                "A",
                "term-60c-100a" if self.termination_c == 60 else "term-75c-over-100a",
            ),
            ("allowable ampacity", self.final_a, "A", self.table_rule_id),
        )


def ampacity_chain(
    size: str,
    material: str,
    insulation_c: float,
    ambient_c: float = 30.0,
    current_carrying: int = 3,
    termination_c: float = 75.0,
    sets: int = 1,
    free_air: bool = False,
    rooftop_adder_c: float = 0.0,
    continuous_a: float = 0.0,
    noncontinuous_a: float = 0.0,
    *,
    tables: AmpacityTables,
) -> AmpacityChain:
    """The ampacity chain of one run, with the continuous-load checks.

    Same method as :func:`ampacity_a`, keeping every factor. Load checks follow
    215.2(A)(1) (feeders) and 210.19(A)(1) (branch circuits), which read the same:

    * **before** adjustment and correction: table ampacity at the lower of the
      insulation and termination columns × sets ≥ 1.25 × continuous + noncontinuous
      (the 125 % is checked at the termination column per 110.14(C));
    * **after** adjustment and correction: allowable (capped) ampacity ≥ continuous +
      noncontinuous.

    Examples
    --------
    >>> c = ampacity_chain("3/0 AWG", "cu", 90.0, 40.0, 6, 75.0, tables=book.ampacity)
    >>> c.base_per_set_a, round(c.ambient_factor, 3), c.adjustment_factor, round(c.final_a, 1)
    (225.0, 0.913, 0.8, 164.3)

    References
    ----------
    NFPA 70-2023 110.14(C), 210.19(A)(1), 215.2(A)(1), 310.15, Tables 310.16/17.
    """
    t = tables
    _check_load_currents(continuous_a, noncontinuous_a)
    run = (size, material, insulation_c, ambient_c, current_carrying, termination_c, sets)
    final, idx, m, base, fa, fadj, corrected, cap, before = _chain_figures(
        run, free_air, rooftop_adder_c, t
    )
    req_before = t.continuous_factor * continuous_a + noncontinuous_a
    req_after = continuous_a + noncontinuous_a
    table_rule = "nec-310.17" if free_air else "nec-310.16"
    adj_rule = _adjustment_rule(current_carrying, t)
    return AmpacityChain(
        SIZE_NAMES[idx],
        ("cu", "al")[m],
        "interpolated" if t.interpolated[idx] else "table",
        float(insulation_c),
        base,
        float(ambient_c),
        float(rooftop_adder_c),
        fa,
        int(current_carrying),
        fadj,
        adj_rule,
        int(sets),
        corrected,
        float(termination_c),
        cap,
        final,
        "termination limit" if cap < corrected else "corrected insulation column",
        table_rule,
        float(continuous_a),
        float(noncontinuous_a),
        req_before,
        before >= req_before - 1e-9,
        req_after,
        final >= req_after - 1e-9,
        _chain_rule_ids(table_rule, adj_rule, termination_c, sets),
    )


_FIGURES: dict = {}  # (id(tables), inputs) -> (tables, figures): see _chain_figures
_FIGURES_MAX = 4096


def _chain_figures(run: tuple, free_air, rooftop_adder_c, tables: AmpacityTables) -> tuple:
    """The figures of a run's chain that do not depend on its load: (final ampacity,
    size and material index, base, ambient and adjustment factors, corrected, cap,
    before corrections). Remembered by their inputs (a building repeats the same
    runs): keyed by the tables' identity, which is checked again on use."""
    key = (id(tables), run, free_air, rooftop_adder_c)
    try:
        hit = _FIGURES.get(key)
    except TypeError:  # an input that cannot be a key (an array): worked out each time
        key, hit = None, None
    if hit is not None and hit[0] is tables:
        return hit[1]
    size, material, insulation_c, ambient_c, current_carrying, termination_c, sets = run
    final = float(ampacity_a(*run, free_air, rooftop_adder_c, tables=tables))
    idx, m, ci, ct = _table_indices(size, material, insulation_c, termination_c)
    tab = tables.free_air_a if free_air else tables.raceway_a
    base = float(tab[m, ci, idx])
    fa = float(ambient_factor(COLUMNS_C[ci], ambient_c + rooftop_adder_c))
    fadj = float(adjustment_factor(current_carrying, tables=tables))
    corrected = round(base * fa * fadj * sets, 9)
    cap = float(tab[m, ct, idx]) * sets
    before = float(tab[m, min(ci, ct), idx]) * sets
    figures = (final, idx, m, base, fa, fadj, corrected, cap, before)
    if key is not None:
        if len(_FIGURES) >= _FIGURES_MAX:
            _FIGURES.clear()
        _FIGURES[key] = (tables, figures)
    return figures


def _check_load_currents(continuous_a, noncontinuous_a) -> None:
    for name, value in (("continuous_a", continuous_a), ("noncontinuous_a", noncontinuous_a)):
        if not (np.isfinite(value) and value >= 0):
            raise ValueError(f"{name}: got {value}; expected a load current ≥ 0 A")


def _table_indices(size, material, insulation_c, termination_c) -> tuple[int, int, int, int]:
    """Indices of one run into the ampacity tables: size, material, insulation column,
    termination column."""
    return (
        int(size_index(size)),
        int(material_index(material)),
        int(_column(insulation_c, "insulation_c")),
        int(_column(termination_c, "termination_c")),
    )


def _chain_rule_ids(table_rule: str, adj_rule: str, termination_c, sets) -> tuple[str, ...]:
    """The rule ids an ampacity chain cites, in the order of its steps."""
    rules = [
        table_rule,
        "ambient-formula",
        adj_rule,
        "term-60c-100a" if termination_c == 60 else "term-75c-over-100a",
        "continuous-125",
        "load-after-derating",
    ]
    if sets > 1:
        rules.append("parallel-min-1/0")
    return tuple(rules)
