"""Short-circuit withstand of insulated conductors by the ICEA P-32-382 formula, starting
from the operating temperature and ending at the insulation's short-circuit limit
(thermoplastic or thermoset), and the insulation-type lookup that feeds it.

Pure functions on floats or numpy arrays; the constants (K, T0) and the insulation rows
are passed in by the caller from ``tables/conductor_materials.csv`` and
``tables/insulation_types.csv``.

Formula
-------
ICEA P-32-382:  (I/A)² · t = K · log10((T2 + T0) / (T1 + T0))

with I [A], A [circular mils], t [s], T1 the conductor temperature when the fault starts,
T2 the short-circuit limit of the insulation [°C], and copper K = 0.0297, T0 = 234;
aluminum K = 0.0125, T0 = 228. In SI form I·√t = k·S with S in mm² and
k = √(K·log10((T2 + T0)/(T1 + T0))) · 1973.525 (circular mils per mm²). Copper from
90 °C to 150 °C gives k ≈ 92.4, against 143 for a thermoset from 90 °C to 250 °C (IEC).
Adiabatic (no heat to the insulation): conservative, valid for short clearing times.

References
----------
.. [1] ICEA P-32-382-2007, Short-circuit characteristics of insulated cable.
.. [2] NFPA 70-2023, Table 310.4(A) and the column heads of Table 310.16 (insulation
   types and their temperature ratings).
"""

from __future__ import annotations

import re
from dataclasses import dataclass

import numpy as np

CMIL_PER_MM2 = 1.0 / 0.000_506_707_479  # 1 cmil = π/4 · (0.0254 mm)² = 5.067e-4 mm²
FAMILIES = ("thermoplastic", "thermoset")


def _arr(name, x, allow_zero=False):
    a = np.asarray(x, dtype=float)
    ok = np.isfinite(a) & ((a >= 0) if allow_zero else (a > 0))
    if not ok.all():
        raise ValueError(
            f"{name} must be finite and {'not below' if allow_zero else 'above'} zero, got {x!r}"
        )
    return a


def _temps(t0_c, initial_c, final_c):
    t0 = _arr("t0_c", t0_c)
    t1 = np.asarray(initial_c, dtype=float)
    t2 = np.asarray(final_c, dtype=float)
    if (~np.isfinite(t1) | ~np.isfinite(t2)).any():
        raise ValueError("initial_c and final_c must be finite temperatures [°C]")
    if (t2 <= t1).any():
        raise ValueError(f"final_c must be above initial_c, got {final_c!r} ≤ {initial_c!r}")
    if (t1 + t0 <= 0).any():
        raise ValueError("initial_c must be above −T0")
    return t0, t1, t2


def _out(a):
    a = np.asarray(a)
    return a if a.ndim else float(a)


def icea_k_si(k_icea, t0_c, initial_c, final_c):
    """Adiabatic constant k [A·s^½/mm²] from the ICEA P-32-382 constants.

    Method: k = √(K · log10((T2 + T0)/(T1 + T0))) · CMIL_PER_MM2.

    Parameters
    ----------
    k_icea : float or array
        ICEA constant K [A²·s/cmil²] (copper 0.0297, aluminum 0.0125).
    t0_c : float or array
        Inferred temperature of zero resistance T0 [°C] (copper 234, aluminum 228).
    initial_c, final_c : float or array
        Conductor temperature when the fault starts and at its end [°C].

    Examples
    --------
    >>> round(icea_k_si(0.0297, 234.0, 90.0, 150.0), 1)
    92.4
    """
    t0, t1, t2 = _temps(t0_c, initial_c, final_c)
    k = _arr("k_icea", k_icea)
    return _out(np.sqrt(k * np.log10((t2 + t0) / (t1 + t0))) * CMIL_PER_MM2)


def icea_withstand_current_a(area_mm2, clearing_s, k_icea, t0_c, initial_c, final_c):
    """Largest symmetrical fault current [A] a conductor carries for ``clearing_s``
    without passing ``final_c`` (ICEA P-32-382).

    Method: I = A_cmil · √(K · log10((T2 + T0)/(T1 + T0)) / t).

    Parameters
    ----------
    area_mm2 : float or array
        Conductor cross-section [mm²] (one conductor; a parallel set carries its share).
    clearing_s : float or array
        Fault duration [s].
    k_icea, t0_c, initial_c, final_c
        As :func:`icea_k_si`.

    Examples
    --------
    >>> round(icea_withstand_current_a(107.2, 0.05, 0.0297, 234.0, 90.0, 150.0))
    44291
    """
    s = _arr("area_mm2", area_mm2)
    t = _arr("clearing_s", clearing_s)
    k = np.asarray(icea_k_si(k_icea, t0_c, initial_c, final_c))
    return _out(k * s / np.sqrt(t))


def icea_final_temperature_c(current_a, area_mm2, clearing_s, k_icea, t0_c, initial_c):
    """Conductor temperature [°C] at the end of a fault (the formula solved for T2).

    Method: T2 = (T1 + T0) · 10^((I/A_cmil)² · t / K) − T0.

    Examples
    --------
    >>> round(icea_final_temperature_c(44291.0, 107.2, 0.05, 0.0297, 234.0, 90.0), 1)
    150.0
    """
    i = _arr("current_a", current_a, allow_zero=True)
    a_cmil = _arr("area_mm2", area_mm2) * CMIL_PER_MM2
    t = _arr("clearing_s", clearing_s)
    k = _arr("k_icea", k_icea)
    t0 = _arr("t0_c", t0_c)
    t1 = np.asarray(initial_c, dtype=float)
    if (~np.isfinite(t1) | (t1 + t0 <= 0)).any():
        raise ValueError(f"initial_c must be a finite temperature above −T0, got {initial_c!r}")
    return _out((t1 + t0) * 10.0 ** ((i / a_cmil) ** 2 * t / k) - t0)


def operating_temperature_c(ambient_c, rated_c, current_a, ampacity_a):
    """Conductor temperature at a steady load: T = T_amb + (T_rated − T_amb)·(I/I_amp)².

    Method: conductor heating proportional to I²R with the rating reached at the
    ampacity (common practice; the same square law underlies the ambient-correction
    formula of NFPA 70 310.15(B)). Capped at ``rated_c``; ``ampacity_a`` is the
    allowable ampacity at that ambient.

    Examples
    --------
    >>> operating_temperature_c(30.0, 90.0, 200.0, 260.0).__round__(1)
    65.5
    """
    ta = np.asarray(ambient_c, dtype=float)
    tr = np.asarray(rated_c, dtype=float)
    if (~np.isfinite(ta) | ~np.isfinite(tr) | (tr <= ta)).any():
        raise ValueError("rated_c must be a finite temperature above ambient_c")
    i = _arr("current_a", current_a, allow_zero=True)
    amp = _arr("ampacity_a", ampacity_a)
    return _out(np.minimum(ta + (tr - ta) * (i / amp) ** 2, tr))


@dataclass(frozen=True)
class InsulationType:
    """One insulation type row: name, ratings [°C] (``wet_c`` None when not listed for wet
    locations), family, short-circuit limit [°C] and rule id."""

    name: str
    dry_c: float
    wet_c: float | None
    family: str
    sc_final_c: float
    rule_id: str

    @classmethod
    def from_record(cls, r) -> InsulationType:
        """Build from one row of ``tables/insulation_types.csv`` as a dict (a blank or NaN
        ``opt_wet_c`` means not listed for wet locations)."""
        wet = r.get("opt_wet_c")
        wet = None if wet is None or wet == "" or wet != wet else float(wet)
        if r["family"] not in FAMILIES:
            raise ValueError(f"insulation family: got {r['family']!r}; expected {FAMILIES}")
        return cls(
            str(r["type"]),
            float(r["dry_c"]),
            wet,
            str(r["family"]),
            float(r["sc_final_c"]),
            str(r["rule_id"]),
        )


def _norm(name: str) -> str:
    return re.sub(r"[\s_]+", "", str(name).strip().upper()).replace("–", "-")


def insulation_type(name: str, rows) -> InsulationType:
    """Look up an insulation type name (``"THWN-2"``, ``"thhn"``, ``"XHHW 2"``).

    Dual markings such as ``"THHN/THWN-2"`` are refused: the caller picks the marking
    that applies to the location (dry or wet).

    Examples
    --------
    >>> rows = [InsulationType("THWN-2", 90.0, 90.0, "thermoplastic", 150.0, "ins-thwn-2")]
    >>> insulation_type(" thwn-2 ", rows).family
    'thermoplastic'
    """
    key = _norm(name)
    if "/" in key:
        raise ValueError(
            f"insulation {name!r}: give the one marking that applies to the "
            "location (e.g. THHN for dry, THWN-2 for wet)"
        )
    key = re.sub(r"(?<=[A-Z])2$", "-2", key)
    for r in rows:
        if _norm(r.name) == key:
            return r
    known = ", ".join(r.name for r in rows)
    raise ValueError(f"insulation {name!r}: expected one of {known}")


def insulation_rating_c(row: InsulationType, wet: bool) -> float:
    """Temperature rating [°C] of an insulation type in a dry or a wet location.

    Raises ValueError when the type is not listed for wet locations.

    Examples
    --------
    >>> r = InsulationType("THHW", 90.0, 75.0, "thermoplastic", 150.0, "ins-thhw")
    >>> insulation_rating_c(r, wet=True), insulation_rating_c(r, wet=False)
    (75.0, 90.0)
    """
    if not wet:
        return float(row.dry_c)
    if row.wet_c is None:
        raise ValueError(
            f"insulation {row.name} is not listed for wet locations (NFPA 70 Table 310.4(A))"
        )
    return float(row.wet_c)
