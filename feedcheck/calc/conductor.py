"""Resistance and reactance of conductors (DC and 60 Hz AC, per conductor, one set).

Two methods:

* **table** — AWG/kcmil sizes listed in NFPA 70 Chapter 9 Table 9 (14 AWG … 1000 kcmil
  except 700, 800 and 900 kcmil) read the tabulated AC resistance at 75 °C and the
  reactance; R is moved to another conductor temperature with the Table 8 note
  coefficient ``R2 = R1 [1 + α75 (T2 − 75)]``.
* **computed** — metric sizes and AWG/kcmil sizes the table lacks: DC resistance from
  resistivity, temperature coefficient and a stranding factor; skin and proximity
  effect from IEC 60287-1-1 §2.1.2–2.1.4; reactance from the geometry of three single
  conductors in trefoil at an effective spacing; metal-raceway effects from
  ``tables/raceway_effects.csv``.

Raceways: ``steel``, ``aluminum``, ``pvc``; ``cable`` and ``free-air`` are treated as
nonmagnetic (the PVC columns), i.e. conductors laid together without a magnetic
enclosure. Parallel sets divide R and X by the number of sets
(:func:`parallel_impedance_ohm_per_m`), assuming equal sets with the same phase
arrangement in each raceway.

References
----------
NFPA 70 National Electrical Code, 2023, Chapter 9 Tables 8 and 9.
IEC 60287-1-1:2006, Electric cables — Calculation of the current rating, §2.1.
IEC 60228:2004, Conductors of insulated cables.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..model import MATERIALS, RACEWAYS
from .constants import FT_PER_KFT, M_PER_FT
from .sizes import SIZES, SizeError, parse_size

OHM_PER_KFT_TO_OHM_PER_M = 1.0 / (FT_PER_KFT * M_PER_FT)
MU0_OVER_2PI = 2e-7  # H/m, μ0/(2π)
FREQUENCY_HZ = 60.0
STRAND_DIAMETER_FACTOR = 1.15  # class 2 round stranded diameter / solid diameter; common practice
SPACING_FACTOR = 2.0  # effective centre spacing / overall diameter, random lay in a raceway
SIZE_NAMES: tuple[str, ...] = tuple(SIZES)
_SIZE_INDEX = {n: i for i, n in enumerate(SIZE_NAMES)}
AREA_MM2 = np.array([SIZES[n].area_mm2 for n in SIZE_NAMES])


@dataclass(frozen=True)
class ConductorData:
    """Tables the impedance kernels read, as numpy arrays indexed like ``SIZE_NAMES``.

    Attributes
    ----------
    r75_ohm_per_m : ndarray, shape (2, 3, n_sizes)
        Table AC resistance at 75 °C [Ω/m] by material (cu, al), column (pvc, aluminum,
        steel) and size; NaN where the table has no row.
    xl_ohm_per_m : ndarray, shape (2, n_sizes)
        Table reactance [Ω/m]: row 0 nonmagnetic/aluminum raceway, row 1 steel.
    rho20, alpha20, alpha75, k_strand : ndarray, shape (2,)
        Material constants (cu, al) from ``conductor_materials.csv``.
    x_factor, r_added_ohm_per_m : ndarray, shape (5,)
        Raceway effects by ``RACEWAYS`` order (computed method).
    column : ndarray of int, shape (5,)
        Table 9 column (0 pvc, 1 aluminum, 2 steel) each raceway reads.
    ins_up_to_mm2, ins_thickness_mm : ndarray
        Insulation thickness steps (computed method).

    Built by the rule book (``book.conductors``, :mod:`feedcheck.rulebook`).
    """

    r75_ohm_per_m: np.ndarray
    xl_ohm_per_m: np.ndarray
    rho20: np.ndarray
    alpha20: np.ndarray
    alpha75: np.ndarray
    k_strand: np.ndarray
    x_factor: np.ndarray
    r_added_ohm_per_m: np.ndarray
    column: np.ndarray
    ins_up_to_mm2: np.ndarray
    ins_thickness_mm: np.ndarray


# up to this many names are looked up one by one; more are first made distinct
SMALL_LOOKUP = 64


def size_index(size) -> np.ndarray:
    """Index into ``SIZE_NAMES`` for a size name or an array of names (same shape).

    Canonical names (``"4/0 AWG"``) are looked up directly; other trade spellings
    go through :func:`~feedcheck.calc.sizes.parse_size`. Unknown names raise ValueError.
    """
    if type(size) is str and size in _SIZE_INDEX:  # one canonical name: the common call
        return np.array(_SIZE_INDEX[size], dtype=np.intp)
    arr = np.asarray(size, dtype=object)
    if arr.size <= SMALL_LOOKUP:
        names = arr.ravel().tolist()
        if all(type(n) is str and n in _SIZE_INDEX for n in names):  # canonical names
            return np.array([_SIZE_INDEX[n] for n in names], dtype=np.intp).reshape(arr.shape)
    uniq, inv = np.unique(arr.ravel().astype(str), return_inverse=True)
    idx = np.empty(len(uniq), dtype=np.intp)
    for k, name in enumerate(uniq):
        if name in _SIZE_INDEX:
            idx[k] = _SIZE_INDEX[name]
        else:
            try:
                idx[k] = _SIZE_INDEX[parse_size(name).name]
            except SizeError as exc:
                raise ValueError(f"conductor size: {exc}") from None
    return idx[inv].reshape(arr.shape)


def _choice_index(value, choices: tuple[str, ...], what: str) -> np.ndarray:
    if type(value) is str and value in choices:  # one canonical choice: the common call
        return np.array(choices.index(value), dtype=np.intp)
    arr = np.asarray(value, dtype=object)
    uniq, inv = np.unique(arr.ravel().astype(str), return_inverse=True)
    out = np.empty(len(uniq), dtype=np.intp)
    for k, u in enumerate(uniq):
        key = u.strip().lower()
        if key not in choices:
            raise ValueError(f"{what}: got {u!r}; expected one of {', '.join(choices)}")
        out[k] = choices.index(key)
    return out[inv].reshape(arr.shape)


def material_index(material) -> np.ndarray:
    """0 for ``"cu"``, 1 for ``"al"`` (scalar or array); anything else raises ValueError."""
    return _choice_index(material, MATERIALS, "material")


def _check_temperature(conductor_c) -> np.ndarray:
    t = np.asarray(conductor_c, dtype=float)
    if not np.isfinite(t).all() or ((t < -50.0) | (t > 400.0)).any():
        bad = t[~(np.isfinite(t) & (t >= -50.0) & (t <= 400.0))].ravel()[0]
        raise ValueError(f"conductor_c: got {bad}; expected a temperature from -50 to 400 °C")
    return t


def dc_resistance_ohm_per_m(area_mm2, material, conductor_c, *, data: ConductorData):
    """DC resistance [Ω/m] of a stranded conductor from resistivity and temperature.

    Method: ``R = k_strand · ρ20 / A · (1 + α20 (T − 20))`` with ρ20 and α20 of annealed
    copper (IACS) or EC aluminium and a stranding (lay) factor of 1.02.

    Parameters
    ----------
    area_mm2 : float or array_like
        Nominal cross-section [mm²], > 0.
    material : str or array_like of str
        ``"cu"`` or ``"al"``.
    conductor_c : float or array_like
        Conductor temperature [°C], −50 … 400.
    data : ConductorData
        Conductor tables (``book.conductors`` of the rule book).

    Returns
    -------
    r_ohm_per_m : float or ndarray
        DC resistance per metre of one conductor [Ω/m].

    Raises
    ------
    ValueError
        Non-positive area, unknown material, temperature out of range.

    Notes
    -----
    The plain IACS value lies about 2 % below the stranded values of NFPA 70 Ch. 9
    Table 8; the stranding factor covers the longer length of the helical strands.

    Examples
    --------
    >>> d = book.conductors  # the rule book's record (feedcheck.rulebook)
    >>> round(float(dc_resistance_ohm_per_m(107.2, "cu", 75.0, data=d)) * 304.8, 4)  # Ω/kft
    0.0608

    References
    ----------
    IEC 60028 (IACS); NFPA 70-2023 Ch. 9 Table 8 and its notes; IEC 60228:2004.
    """
    d = data
    a = np.asarray(area_mm2, dtype=float)
    if not (np.isfinite(a) & (a > 0)).all():
        raise ValueError(
            f"area_mm2: got {a[~(np.isfinite(a) & (a > 0))].ravel()[0]}; "
            "expected a positive cross-section in mm²"
        )
    m = material_index(material)
    t = _check_temperature(conductor_c)
    r = d.k_strand[m] * d.rho20[m] / a * (1.0 + d.alpha20[m] * (t - 20.0))
    return r[()] if np.ndim(r) == 0 else r


def _skin_proximity(xs2):
    """IEC 60287-1-1 factor x⁴/(192 + 0.8 x⁴), valid for x ≤ 2.8."""
    x4 = xs2 * xs2
    return x4 / (192.0 + 0.8 * x4)


def _check_frequency(frequency_hz) -> float:
    f = float(frequency_hz)
    if not (f > 0 and np.isfinite(f)):
        raise ValueError(f"frequency_hz: got {frequency_hz}; expected a positive frequency")
    return f


def _skin_effect(xs2, fx):
    """Skin effect factor ys of IEC 60287-1-1 §2.1.2: ``fx`` (the x⁴ form) up to
    xs = 2.8, then the two published branches for 2.8 < xs ≤ 3.8 and xs > 3.8."""
    xs = np.sqrt(xs2)
    return np.where(
        xs <= 2.8, fx, np.where(xs <= 3.8, -0.136 - 0.0177 * xs + 0.0563 * xs2, 0.354 * xs - 0.733)
    )


def _diameter_and_spacing_mm(area_mm2, data: ConductorData):
    """Conductor diameter dc = 1.15·√(4A/π) and effective centre spacing s = 2·D, with
    D = dc + 2t and the insulation thickness t of the area's step (see Notes of
    :func:`ac_impedance_computed_ohm_per_m`) [mm]."""
    dc = STRAND_DIAMETER_FACTOR * np.sqrt(4.0 * area_mm2 / np.pi)
    steps = data.ins_up_to_mm2
    step = np.minimum(np.searchsorted(steps, area_mm2 * (1 - 1e-9)), len(steps) - 1)
    overall = dc + 2.0 * data.ins_thickness_mm[step]
    return dc, SPACING_FACTOR * overall


def ac_impedance_computed_ohm_per_m(
    area_mm2,
    material,
    raceway,
    conductor_c=75.0,
    frequency_hz: float = FREQUENCY_HZ,
    *,
    data: ConductorData,
):
    """AC resistance and reactance [Ω/m] of one conductor computed from first principles.

    Method: DC resistance as :func:`dc_resistance_ohm_per_m`; skin effect
    ``ys = xs⁴/(192 + 0.8 xs⁴)``, ``xs² = 8πf/R' · 10⁻⁷ · ks`` (ks = 1, round stranded)
    and proximity effect for three single conductors
    ``yp = F(xp) (dc/s)² [0.312 (dc/s)² + 1.18/(F(xp) + 0.27)]`` (kp = 1) from
    IEC 60287-1-1 §2.1.2–2.1.4; ``R = R'(1 + ys + yp) + R_raceway``. Reactance of three
    conductors in trefoil, ``X = k_raceway · 2πf · (μ0/2π) · (ln(2s/dc) + 1/4)``.

    Parameters
    ----------
    area_mm2 : float or array_like
        Cross-section [mm²].
    material : str or array_like of str
        ``"cu"`` or ``"al"``.
    raceway : str or array_like of str
        ``steel``, ``aluminum``, ``pvc``, ``cable`` or ``free-air``.
    conductor_c : float or array_like, default 75
        Conductor temperature [°C].
    frequency_hz : float, default 60
        System frequency [Hz].
    data : ConductorData
        Conductor tables (``book.conductors`` of the rule book).

    Returns
    -------
    r_ohm_per_m, x_ohm_per_m : float or ndarray
        AC resistance and inductive reactance of one conductor [Ω/m].

    Notes
    -----
    Geometry (stated assumptions): conductor diameter ``dc = 1.15 · √(4A/π)`` (class 2
    round stranding, common practice); overall diameter ``D = dc + 2t`` with the
    insulation thickness t of ``tables/insulation_thickness.csv``; effective centre
    spacing ``s = 2 D``: single conductors pulled into a raceway lie at random, not in
    touching trefoil, and NFPA 70 Ch. 9 Table 9 reactances correspond to s/D of 1.7–2.8.
    With s = 2 D the reactance lands within ±15 % of every Table 9 row (12 AWG …
    1000 kcmil); the tests hold it there. That is the accuracy to expect: ±15 % in X
    changes the 0.85-PF effective impedance by at most about 8 % at 1000 kcmil and
    under 2 % below 1/0, where R dominates. Steel raceway: X × 1.25 and
    R + 0.002 Ω/kft; aluminum raceway: R + 0.005 Ω/kft (``tables/raceway_effects.csv``,
    from Table 9 column ratios). The proximity term keeps the xp ≤ 2.8 form for the
    largest sizes (2000 kcmil Cu at 20 °C, xp ≈ 2.9), a small approximation.

    Examples
    --------
    >>> r, x = ac_impedance_computed_ohm_per_m(95.0, "cu", "pvc", data=book.conductors)
    >>> round(float(r) * 1000, 4), round(float(x) * 1000, 4)  # Ω/km
    (0.2261, 0.1355)

    References
    ----------
    IEC 60287-1-1:2006 §2.1.2 (skin), §2.1.4 (proximity, three single-core cables).
    NFPA 70-2023 Ch. 9 Table 9 (raceway effects, test reference).
    """
    d = data
    a = np.asarray(area_mm2, dtype=float)
    r_dc = dc_resistance_ohm_per_m(a, material, conductor_c, data=d)
    rw = _choice_index(raceway, RACEWAYS, "raceway")
    f = _check_frequency(frequency_hz)
    xs2 = 8.0 * np.pi * f / r_dc * 1e-7
    fx = _skin_proximity(xs2)
    ys = _skin_effect(xs2, fx)
    dc, s = _diameter_and_spacing_mm(a, d)
    ratio2 = (dc / s) ** 2
    yp = fx * ratio2 * (0.312 * ratio2 + 1.18 / (fx + 0.27))
    r = r_dc * (1.0 + ys + yp) + d.r_added_ohm_per_m[rw]
    x = d.x_factor[rw] * 2.0 * np.pi * f * MU0_OVER_2PI * (np.log(2.0 * s / dc) + 0.25)
    r, x = np.broadcast_arrays(r, x)
    return (r[()], x[()]) if r.ndim == 0 else (np.array(r), np.array(x))


def impedance_method(size, *, data: ConductorData) -> np.ndarray:
    """``"table"`` where NFPA 70 Ch. 9 Table 9 lists the size, else ``"computed"``."""
    d = data
    idx = size_index(size)
    out = np.where(np.isnan(d.xl_ohm_per_m[0, idx]), "computed", "table")
    return out[()] if out.ndim == 0 else out


def ac_impedance_ohm_per_m(size, material, raceway, conductor_c=75.0, *, data: ConductorData):
    """AC resistance and reactance [Ω/m] of one conductor of one set, 60 Hz.

    Method: NFPA 70 Ch. 9 Table 9 for the AWG/kcmil sizes it lists, with
    ``R(T) = R75 [1 + α75 (T − 75)]`` (α75 = 0.00323 Cu, 0.00330 Al, Table 8 note);
    :func:`ac_impedance_computed_ohm_per_m` for metric sizes and for 700, 800, 900 and
    1250–2000 kcmil.

    Parameters
    ----------
    size : str or array_like of str
        Size name(s) as in ``sizes.SIZES`` (``"4/0 AWG"``, ``"250 kcmil"``, ``"95 mm2"``).
    material : str or array_like of str
        ``"cu"`` or ``"al"``.
    raceway : str or array_like of str
        ``steel``, ``aluminum``, ``pvc``; ``cable`` and ``free-air`` read the PVC
        (nonmagnetic) columns.
    conductor_c : float or array_like, default 75
        Conductor temperature [°C]: 20 for maximum fault current, 75 or 90 for drop.
    data : ConductorData
        Conductor tables (``book.conductors`` of the rule book).

    Returns
    -------
    r_ohm_per_m, x_ohm_per_m : float or ndarray
        Per-conductor (to neutral) resistance and reactance [Ω/m] of one set; divide by
        the number of parallel sets with :func:`parallel_impedance_ohm_per_m`.

    Raises
    ------
    ValueError
        Unknown size, material or raceway; temperature outside −50 … 400 °C.

    Examples
    --------
    >>> r, x = ac_impedance_ohm_per_m("250 kcmil", "cu", "steel", data=book.conductors)
    >>> round(float(r) * 304.8, 3), round(float(x) * 304.8, 3)  # Ω/kft
    (0.054, 0.052)

    References
    ----------
    NFPA 70-2023 Chapter 9 Table 9 and Table 8 notes; IEC 60287-1-1:2006.
    """
    d = data
    idx = size_index(size)
    m = material_index(material)
    rw = _choice_index(raceway, RACEWAYS, "raceway")
    t = _check_temperature(conductor_c)
    idx, m, rw, t = np.broadcast_arrays(idx, m, rw, t)
    col = d.column[rw]
    r = d.r75_ohm_per_m[m, col, idx] * (1.0 + d.alpha75[m] * (t - 75.0))
    x = d.xl_ohm_per_m[(col == 2).astype(np.intp), idx]
    missing = np.isnan(r)
    if missing.any():
        rc, xc = ac_impedance_computed_ohm_per_m(
            AREA_MM2[idx[missing]],
            np.array(MATERIALS)[m[missing]],
            np.array(RACEWAYS)[rw[missing]],
            t[missing],
            data=d,
        )
        r = np.array(r, dtype=float)
        x = np.array(x, dtype=float)
        r[missing] = rc
        x[missing] = xc
    return (r[()], x[()]) if np.ndim(r) == 0 else (r, x)


def parallel_impedance_ohm_per_m(r_ohm_per_m, x_ohm_per_m, sets):
    """Impedance of ``sets`` equal conductors in parallel per phase: R/n, X/n.

    Assumes identical sets (same size, material, length, termination) with all phases
    of each set in the same raceway, as NFPA 70 310.10(G) requires.

    Examples
    --------
    >>> parallel_impedance_ohm_per_m(0.2, 0.1, 2)
    (0.1, 0.05)
    """
    n = np.asarray(sets)
    if not ((n >= 1) & (n == np.floor(n))).all():
        raise ValueError(f"sets: got {sets}; expected a whole number of sets ≥ 1")
    r = np.asarray(r_ohm_per_m, dtype=float) / n
    x = np.asarray(x_ohm_per_m, dtype=float) / n
    return (float(r), float(x)) if r.ndim == 0 else (r, x)
