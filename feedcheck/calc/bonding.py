"""Supply-side bonding jumper and grounded conductor of a separately derived system,
sized from the largest ungrounded conductor (NFPA 70 Table 250.102(C)(1)).

Pure functions on floats or numpy arrays; areas in kcmil (the table's own unit; 1 kcmil =
0.506 707 mm²). The table rows are passed in as a :class:`JumperTable` built by the caller
from ``tables/supply_side_bonding_jumper.csv``.

References
----------
.. [1] NFPA 70-2023, 250.102(C)(1) and (C)(2), Table 250.102(C)(1) and its note on
   conductors above 1100 kcmil Cu / 1750 kcmil Al (12½ percent of the area).
.. [2] NFPA 70-2023, 250.30(A)(2) (supply-side bonding jumper of a separately derived
   system) and 250.30(A)(3) (its grounded conductor).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

MATERIALS = ("cu", "al")
AREA_RTOL = 2e-3  # table areas are printed to 4 digits (NFPA 70 Ch. 9 Table 8)


@dataclass(frozen=True)
class JumperTable:
    """Rows of Table 250.102(C)(1), in order.

    ``up_to_kcmil`` maps material → row upper bounds of the phase area [kcmil] (``inf`` on
    the percentage row); ``jumper_kcmil`` maps material → least jumper area of each row
    [kcmil]; ``jumper_name`` maps material → size names; ``percent_of_area`` per row [%]
    (non-zero on the percentage row only); ``rule_id`` per row.
    """

    up_to_kcmil: dict[str, tuple[float, ...]]
    jumper_kcmil: dict[str, tuple[float, ...]]
    jumper_name: dict[str, tuple[str, ...]]
    percent_of_area: tuple[float, ...]
    rule_id: tuple[str, ...]

    @classmethod
    def from_records(cls, records) -> JumperTable:
        """Build from the rows of ``tables/supply_side_bonding_jumper.csv`` as dicts (columns
        ``cu_up_to_kcmil``, ``al_up_to_kcmil``, ``jumper_cu``, ``jumper_al``,
        ``jumper_cu_kcmil``, ``jumper_al_kcmil``, ``percent_of_area``, ``rule_id``)."""
        rows = list(records)
        return cls(
            {m: tuple(float(r[f"{m}_up_to_kcmil"]) for r in rows) for m in MATERIALS},
            {m: tuple(float(r[f"jumper_{m}_kcmil"]) for r in rows) for m in MATERIALS},
            {m: tuple(str(r[f"jumper_{m}"]) for r in rows) for m in MATERIALS},
            tuple(float(r["percent_of_area"]) for r in rows),
            tuple(str(r["rule_id"]) for r in rows),
        )


@dataclass(frozen=True)
class JumperSize:
    """Least jumper area for each phase-conductor set (floats or arrays).

    ``phase_area_kcmil`` the (equivalent) phase area used [kcmil]; ``required_kcmil``
    the least jumper area [kcmil]; ``size`` the table size name, or ``"12.5 % of area"``
    text on the percentage row; ``rule_id``; ``rule`` ``"table"`` or ``"percent"``.
    """

    phase_area_kcmil: np.ndarray | float
    required_kcmil: np.ndarray | float
    size: np.ndarray | str
    rule_id: np.ndarray | str
    rule: np.ndarray | str


def _material(material):
    if material not in MATERIALS:
        raise ValueError(f"material must be one of {MATERIALS}, got {material!r}")
    return material


def _equivalent_area_kcmil(phase_area_kcmil, sets) -> np.ndarray:
    """sets × area of one ungrounded conductor (250.102(C)(1)), inputs checked."""
    area = np.asarray(phase_area_kcmil, dtype=float)
    count = np.asarray(sets, dtype=float)
    if np.any(~np.isfinite(area) | (area <= 0)):
        raise ValueError(
            f"phase_area_kcmil must be finite and above zero, got {phase_area_kcmil!r}"
        )
    if np.any(~np.isfinite(count) | (count < 1) | (count != np.round(count))):
        raise ValueError(f"sets must be a whole number ≥ 1, got {sets!r}")
    return area * count


def _row_names(table_names: np.ndarray, pct: np.ndarray) -> np.ndarray:
    """The table's size name of each row, or "12.5 % of area" on a percentage row."""
    percent_names = np.asarray([f"{p:g} % of area" for p in np.atleast_1d(pct)], dtype=object)
    return np.where(pct > 0, percent_names.reshape(pct.shape), table_names)


def supply_side_jumper_size(
    phase_area_kcmil, sets, material, table: JumperTable, jumper_material=None
):
    """Least supply-side bonding jumper (or SDS grounded conductor) for a phase set.

    Method (NFPA 70-2023 250.102(C)(1)): equivalent area A = sets × area of the largest
    ungrounded conductor (parallel sets summed); the table row with A ≤ its bound for the
    phase material gives the jumper in the jumper's material; above the last row the
    jumper needs percent/100 × A (12.5 %), not more than A itself. Areas within 0.2 % of
    a bound count as on it (table areas are rounded).

    Parameters
    ----------
    phase_area_kcmil : float or array
        Area of one ungrounded conductor of the largest phase [kcmil].
    sets : int or array
        Conductors in parallel per phase (all in one raceway; for one jumper per raceway,
        pass the sets in that raceway, 250.102(C)(2)).
    material : {"cu", "al"}
        Material of the ungrounded conductors.
    table : JumperTable
        Rows of Table 250.102(C)(1).
    jumper_material : {"cu", "al"}, optional
        Material of the jumper; default the phase material. A different material is
        refused: the table note then sizes from an equal-ampacity conductor of the jumper's
        material, which needs the ampacity tables.

    Returns
    -------
    JumperSize

    Raises
    ------
    ValueError
        For a non-positive area, a fractional or zero set count, an unknown material, or
        mixed materials.

    Examples
    --------
    >>> t = JumperTable({"cu": (350.0, 1100.0, np.inf), "al": (500.0, 1750.0, np.inf)},
    ...                 {"cu": (66.36, 133.1, np.inf), "al": (105.6, 211.6, np.inf)},
    ...                 {"cu": ("2 AWG", "2/0 AWG", "-"), "al": ("1/0 AWG", "4/0 AWG", "-")},
    ...                 (0.0, 0.0, 12.5), ("r4", "r6", "note"))
    >>> j = supply_side_jumper_size(211.6, 1, "cu", t)
    >>> j.size, j.required_kcmil, j.rule
    ('2 AWG', 66.36, 'table')
    >>> round(supply_side_jumper_size(600.0, 2, "cu", t).required_kcmil, 1)
    150.0
    """
    m = _material(material)
    jm = m if jumper_material is None else _material(jumper_material)
    if jm != m:
        raise ValueError(
            "jumper and phase conductors of different materials: size from an "
            "ungrounded conductor of the jumper's material with the same "
            "ampacity (Table 250.102(C)(1) note)"
        )
    eq = _equivalent_area_kcmil(phase_area_kcmil, sets)
    bounds = np.asarray(table.up_to_kcmil[m], dtype=float)
    row = np.searchsorted(bounds * (1.0 + AREA_RTOL), eq, side="left")
    row = np.minimum(row, bounds.size - 1)
    pct = np.asarray(table.percent_of_area, dtype=float)[row]
    tab = np.asarray(table.jumper_kcmil[jm], dtype=float)[row]
    req = np.where(pct > 0, np.minimum(pct / 100.0 * eq, eq), tab)
    names = _row_names(np.asarray(table.jumper_name[jm], dtype=object)[row], pct)
    ids = np.asarray(table.rule_id, dtype=object)[row]
    rule = np.where(pct > 0, "percent", "table").astype(object)
    if eq.ndim == 0:
        return JumperSize(float(eq), float(req), str(names), str(ids), str(rule))
    return JumperSize(eq, req, names, ids, rule)


def jumper_passes(jumper_area_kcmil, required_kcmil):
    """Does a jumper of the given area meet the requirement? (area ≥ required, with the
    0.2 % allowance for rounded table areas).

    Examples
    --------
    >>> bool(jumper_passes(41.74, 66.36)), bool(jumper_passes(66.36, 66.36))
    (False, True)
    """
    have = np.asarray(jumper_area_kcmil, dtype=float)
    need = np.asarray(required_kcmil, dtype=float)
    if np.any(~np.isfinite(have) | (have <= 0)):
        raise ValueError(
            f"jumper_area_kcmil must be finite and above zero, got {jumper_area_kcmil!r}"
        )
    out = have * (1.0 + AREA_RTOL) >= need
    return out if out.ndim else bool(out)
