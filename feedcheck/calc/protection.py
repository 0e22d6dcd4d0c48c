"""Conductor protection and equipment grounding conductor size.

* Device vs conductor (NFPA 70 240.4): a conductor is protected at its ampacity; when the
  ampacity is not a standard rating, the next higher standard rating is permitted up to
  800 A (240.4(B)); above 800 A the ampacity must be at least the rating (240.4(C)); the
  small-conductor limits of 240.4(D) cap 14–10 AWG copper and 12–10 AWG aluminum.
* Device vs load (215.3, 210.20(A)): at least 125 % of the continuous load plus 100 % of
  the noncontinuous load.
* Equipment grounding conductor (250.122): table size by device rating, increased in
  proportion to circular-mil area when the ungrounded conductors are upsized, never
  larger than the ungrounded conductors, one full-size EGC per raceway of a parallel run.

Standard ratings come from ``tables/device_ratings.csv`` (240.6(A)).

References
----------
NFPA 70 National Electrical Code, 2023: 210.20(A), 215.3, 240.4, 240.6(A), 250.122.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .conductor import AREA_MM2, SIZE_NAMES, material_index, size_index
from .sizes import SIZES, smallest_at_least


@dataclass(frozen=True)
class ProtectionTables:
    """Standard ratings, small-conductor limits and EGC rows as arrays.

    Built by the rule book (``book.protection``, :mod:`feedcheck.rulebook`) from Table
    240.6(A), 240.4(D), Table 250.122 and the materials' resistivity (``rho20``, Ω·mm²/m,
    cu/al: the equal-conductance cap of 250.122(A) across materials).
    """

    breaker_a: np.ndarray
    fuse_a: np.ndarray
    small_limit_a: np.ndarray  # shape (2, n_sizes), inf where no limit
    small_rule_id: tuple[tuple[str, ...], ...]
    egc_up_to_a: np.ndarray
    egc_cu: tuple[str, ...]
    egc_al: tuple[str, ...]
    rho20: np.ndarray
    next_size_up_max_a: float  # rule prot-next-size-up, 240.4(B)
    continuous_factor: float  # rule device-continuous-125 (125 % → 1.25), 215.3


def standard_ratings_a(kind: str = "breaker", *, tables: ProtectionTables):
    """Standard ratings [A] of ``"breaker"`` or ``"fuse"`` (240.6(A)), ascending."""
    t = tables
    if kind not in ("breaker", "fuse"):
        raise ValueError(f"kind: got {kind!r}; expected 'breaker' or 'fuse'")
    return t.breaker_a if kind == "breaker" else t.fuse_a


def _positive(x, name):
    a = np.asarray(x, dtype=float)
    if not (np.isfinite(a) & (a >= 0)).all():
        raise ValueError(
            f"{name}: got {a[~(np.isfinite(a) & (a >= 0))].ravel()[0]}; "
            "expected a finite current ≥ 0 A"
        )
    return a


def next_standard_rating_a(current_a, kind: str = "breaker", *, tables: ProtectionTables):
    """Smallest standard device rating [A] at least ``current_a`` (vectorised).

    Raises
    ------
    ValueError
        Current above the largest standard rating (6000 A).

    Examples
    --------
    >>> t = book.protection  # the rule book's record (feedcheck.rulebook)
    >>> float(next_standard_rating_a(164.3, tables=t)), float(next_standard_rating_a(175, tables=t))
    (175.0, 175.0)

    References
    ----------
    NFPA 70-2023 240.6(A) Table 240.6(A).
    """
    r = standard_ratings_a(kind, tables=tables)
    a = _positive(current_a, "current_a")
    i = np.searchsorted(r, a * (1 - 1e-12), side="left")
    if (i >= len(r)).any():
        raise ValueError(
            f"current_a: got {a.max():g} A; expected at most {r[-1]:g} A, the "
            "largest standard rating"
        )
    out = r[i]
    return out[()] if out.ndim == 0 else out


def _largest_standard_at_most(a, r):
    i = np.searchsorted(r, a * (1 + 1e-12), side="right") - 1
    return np.where(i >= 0, r[np.maximum(i, 0)], 0.0)


def device_min_for_load_a(continuous_a, noncontinuous_a=0.0, *, tables: ProtectionTables):
    """Least device rating [A] for a load: 1.25 × continuous + noncontinuous (215.3).

    The factor is ``tables.continuous_factor`` (rule ``device-continuous-125``).

    Examples
    --------
    >>> float(device_min_for_load_a(100.0, 20.0, tables=book.protection))
    145.0
    """
    c = _positive(continuous_a, "continuous_a")
    n = _positive(noncontinuous_a, "noncontinuous_a")
    out = tables.continuous_factor * c + n
    return out[()] if out.ndim == 0 else out


def max_device_a(ampacity_a, size, material, kind: str = "breaker", *, tables: ProtectionTables):
    """Largest device rating [A] that protects a conductor of the given ampacity.

    Method: ``next_standard(ampacity)`` when that is 800 A or less (240.4(B)); otherwise
    the largest standard rating not above the ampacity (240.4(C)); then the 240.4(D)
    small-conductor limit for 14/12/10 AWG Cu and 12/10 AWG Al.

    Parameters
    ----------
    ampacity_a : float or array_like
        Allowable ampacity of the conductors after every correction, all sets [A].
    size : str or array_like of str
        Conductor size name(s) (for 240.4(D)).
    material : str or array_like of str
        ``"cu"`` or ``"al"``.
    kind : str
        ``"breaker"`` or ``"fuse"`` (which standard ratings to round to).
    tables : ProtectionTables
        ``book.protection`` of the rule book.

    Returns
    -------
    device_a : float or ndarray
        Largest permitted device rating [A] (0 when no standard rating fits).

    Examples
    --------
    >>> t = book.protection
    >>> float(max_device_a(164.3, "3/0 AWG", "cu", tables=t))
    175.0
    >>> float(max_device_a(30.0, "12 AWG", "cu", tables=t))
    20.0
    >>> float(max_device_a(850.0, "600 kcmil", "cu", tables=t))  # 240.4(C): not above ampacity
    800.0

    References
    ----------
    NFPA 70-2023 240.4(B), (C), (D); 240.6(A).
    """
    t = tables
    r = standard_ratings_a(kind, tables=t)
    a = _positive(ampacity_a, "ampacity_a")
    i = np.searchsorted(r, a * (1 - 1e-12), side="left")
    nxt = r[np.minimum(i, len(r) - 1)]
    next_ok = (i < len(r)) & (nxt <= t.next_size_up_max_a)
    up = np.where(next_ok, nxt, _largest_standard_at_most(a, r))
    lim = t.small_limit_a[material_index(material), size_index(size)]
    out = np.minimum(up, lim)
    return out[()] if out.ndim == 0 else out


def device_protects_conductor(
    device_a, ampacity_a, size, material, kind: str = "breaker", *, tables: ProtectionTables
):
    """True where ``device_a`` ≤ :func:`max_device_a` (vectorised)."""
    d = _positive(device_a, "device_a")
    out = d <= max_device_a(ampacity_a, size, material, kind, tables=tables) + 1e-9
    return out[()] if out.ndim == 0 else out


@dataclass(frozen=True)
class ProtectionCheck:
    """Device-vs-conductor check of one run."""

    device_a: float
    ampacity_a: float
    max_device_a: float
    ok: bool
    rule_id: str
    note: str


def conductor_protection(
    device_a: float,
    ampacity_a: float,
    size: str,
    material: str,
    kind: str = "breaker",
    *,
    tables: ProtectionTables,
) -> ProtectionCheck:
    """Check one device against one run's ampacity, naming the governing rule.

    Examples
    --------
    >>> c = conductor_protection(20.0, 25.0, "12 AWG", "cu", tables=book.protection)
    >>> c.ok, c.rule_id
    (True, 'nec-240.4(D)(5)-cu12')
    """
    t = tables
    mx = float(max_device_a(ampacity_a, size, material, kind, tables=t))
    m, i = int(material_index(material)), int(size_index(size))
    small = t.small_limit_a[m, i]
    if np.isfinite(small) and small <= mx:
        rid, why = t.small_rule_id[m][i], f"small-conductor limit {small:g} A"
    elif mx > ampacity_a + 1e-9:
        rid = "prot-next-size-up"
        why = f"next standard rating above the ampacity (≤ {t.next_size_up_max_a:g} A)"
    elif ampacity_a > t.next_size_up_max_a:
        rid = "prot-over-800"
        why = f"over {t.next_size_up_max_a:g} A the device may not exceed the ampacity"
    else:
        rid, why = "prot-ampacity", "device at most the ampacity"
    ok = device_a <= mx + 1e-9
    note = (
        f"{device_a:g} A device, {ampacity_a:.1f} A conductor: largest permitted {mx:g} A ({why})"
    )
    return ProtectionCheck(float(device_a), float(ampacity_a), mx, bool(ok), rid, note)


@dataclass(frozen=True)
class EgcResult:
    """Equipment grounding conductor size and the reasoning behind it."""

    size: str
    material: str
    table_size: str
    device_a: float
    ratio: float
    capped_at_phase: bool
    per_raceway: int
    rule_ids: tuple[str, ...]
    reasoning: str


def egc_area_mm2(
    device_a,
    material="cu",
    phase_area_mm2=None,
    phase_min_area_mm2=None,
    phase_material=None,
    *,
    tables: ProtectionTables,
):
    """Least equipment grounding conductor area [mm²] by 250.122(A) and (B): the one rule
    for runs (:func:`egc_size`) and schedule circuits.

    Method: the Table 250.122 size for the device ahead of the circuit; where the
    ungrounded conductors are larger than the minimum size that has sufficient ampacity
    for the intended installation (corrections and adjustments included), that area ×
    (installed / minimum circular mils) (250.122(B), 2023 wording); never more than
    the ungrounded conductors (250.122(A)), by area of equal conductance across
    materials (ρ20 of the EGC material over that of the phase material).

    Parameters
    ----------
    device_a : float or array
        Rating of the overcurrent device ahead of the circuit [A] (≤ 6000).
    material : str or array
        EGC material, ``"cu"`` or ``"al"``.
    phase_area_mm2, phase_min_area_mm2 : float or array, optional
        Installed ungrounded conductor area and the minimum area with sufficient
        ampacity for the installation [mm²] (per set). Both or neither.
    phase_material : str or array, optional
        Material of the ungrounded conductors (default: the EGC's).

    Returns
    -------
    need_mm2, table_mm2, ratio, cap_mm2 : float or ndarray
        The required area (uncapped), the Table 250.122 area, the circular-mil ratio
        (≥ 1) and the 250.122(A) cap (inf without ``phase_area_mm2``).

    Examples
    --------
    200 A device, 250 kcmil installed where 3/0 AWG suffices: 6 AWG Cu (13.30 mm²,
    Table 250.122) × 126.7 / 85.03 = 19.82 mm² (250.122(B)).

    >>> need, table, ratio, cap = egc_area_mm2(200.0, "cu", 126.7, 85.03,
    ...                                        tables=book.protection)
    >>> round(float(table), 2), round(float(ratio), 3), round(float(need), 2)
    (13.3, 1.49, 19.82)

    References
    ----------
    NFPA 70-2023 250.122(A), (B); Table 250.122.
    """
    t = tables
    d = np.asarray(device_a, float)
    if not (np.isfinite(d) & (d > 0) & (d <= t.egc_up_to_a[-1])).all():
        raise ValueError(
            f"device_a: got {device_a}; expected a device rating from 1 to "
            f"{t.egc_up_to_a[-1]:g} A (Table 250.122)"
        )
    row = np.searchsorted(t.egc_up_to_a, d * (1 - 1e-12), side="left")
    gm = material_index(material)
    cu = AREA_MM2[size_index(np.array(t.egc_cu))]
    al = AREA_MM2[size_index(np.array(t.egc_al))]
    table = np.where(gm == 0, cu[row], al[row])
    if phase_area_mm2 is None or phase_min_area_mm2 is None:
        shape = np.shape(table)
        return table, table, np.ones(shape), np.full(shape, np.inf)
    ps = np.asarray(phase_area_mm2, float)
    pm = np.asarray(phase_min_area_mm2, float)
    if not ((ps > 0).all() and (pm > 0).all()):
        raise ValueError("phase_area_mm2, phase_min_area_mm2: expected areas > 0 mm²")
    ratio = np.where(ps > pm * (1 + 1e-9), ps / pm, 1.0)
    pmat = material_index(material if phase_material is None else phase_material)
    cap = ps * t.rho20[gm] / t.rho20[pmat]
    return table * ratio, table, ratio, cap


def _table_250_122(device_a, material: str, sets, t: ProtectionTables) -> tuple[int, str]:
    """The material index and the Table 250.122 size name for ``device_a``."""
    if not (isinstance(sets, int | np.integer) and sets >= 1):
        raise ValueError(f"sets: got {sets}; expected a whole number ≥ 1")
    m = int(material_index(material))
    row = int(np.searchsorted(t.egc_up_to_a, device_a * (1 - 1e-12), side="left"))
    return m, (t.egc_cu if m == 0 else t.egc_al)[min(row, len(t.egc_up_to_a) - 1)]


def _upsized(phase_min_size: str, phase_size: str, ratio: float) -> str:
    return (
        f"phase conductors upsized {SIZE_NAMES[size_index(phase_min_size)]} → "
        f"{SIZE_NAMES[size_index(phase_size)]} (×{ratio:.3f} circular mils)"
    )


def _capped_at_phase(chosen, cap_area: float):
    """The smaller size that 250.122(A) ("never larger than the circuit conductors")
    allows, ``cap_area`` the phase area by equal conductance in the EGC material; None
    when the chosen EGC is not larger."""
    if chosen.area_mm2 <= cap_area * (1 + 1e-9):
        return None
    capped_size = smallest_at_least(cap_area, "awg") or chosen
    return capped_size if capped_size.area_mm2 < chosen.area_mm2 else None


def egc_size(
    device_a: float,
    material: str = "cu",
    phase_size: str | None = None,
    phase_min_size: str | None = None,
    phase_material: str | None = None,
    sets: int = 1,
    *,
    tables: ProtectionTables,
) -> EgcResult:
    """Minimum equipment grounding conductor for a run (250.122).

    Parameters
    ----------
    device_a : float
        Rating of the overcurrent device ahead of the run [A] (≤ 6000).
    material : str
        EGC material, ``"cu"`` or ``"al"``.
    phase_size : str, optional
        Ungrounded conductor size actually installed (per set).
    phase_min_size : str, optional
        Smallest ungrounded size that would have had enough ampacity (per set). When
        ``phase_size`` is larger, the EGC grows by the circular-mil ratio (250.122(B)).
    phase_material : str, optional
        Material of the ungrounded conductors (default: the EGC's); the 250.122(A) cap
        compares areas of equal conductance (:func:`egc_area_mm2`).
    sets : int
        Parallel sets; a full-size EGC runs in each raceway (250.122(F)).

    Returns
    -------
    EgcResult
        ``size`` per raceway, ``per_raceway`` count, ``reasoning``, rule ids.

    Examples
    --------
    >>> egc_size(400.0, tables=book.protection).size
    '3 AWG'
    >>> r = egc_size(200.0, phase_size="250 kcmil", phase_min_size="3/0 AWG",
    ...              tables=book.protection)
    >>> r.size, round(r.ratio, 3)   # 6 AWG × 250/167.8 = 39.1 kcmil → 4 AWG
    ('4 AWG', 1.49)

    References
    ----------
    NFPA 70-2023 250.122(A), (B), (F); Table 250.122.
    """
    m, table_name = _table_250_122(device_a, material, sets, tables)
    ps = None if phase_size is None else SIZES[phase_size].area_mm2
    pm = ps if phase_min_size is None or ps is None else SIZES[phase_min_size].area_mm2
    need, _, ratio, cap = egc_area_mm2(device_a, material, ps, pm, phase_material, tables=tables)
    rules, ratio, area = ["egc-table"], float(ratio), float(need)
    why = [f"Table 250.122 gives {table_name} {material} for a {device_a:g} A device"]
    if ratio > 1.0:
        rules.append("egc-proportional")
        why.append(_upsized(phase_min_size, phase_size, ratio))
    chosen = smallest_at_least(area, "awg")
    if chosen is None:
        raise ValueError(f"device_a: EGC area {area:.0f} mm² exceeds the largest size")
    capped = _capped_at_phase(chosen, float(cap)) if phase_size is not None else None
    if capped is not None:
        chosen = capped
        rules.append("egc-not-larger")
        why.append("not larger than the ungrounded conductors")
    if sets > 1:
        rules.append("egc-parallel")
        why.append(f"one {chosen.name} in each of {sets} raceways")
    return EgcResult(
        chosen.name,
        ("cu", "al")[m],
        table_name,
        float(device_a),
        ratio,
        capped is not None,
        int(sets),
        tuple(rules),
        "; ".join(why) + f" → {chosen.name} {material}",
    )
