"""Short-circuit withstand of insulated conductors (adiabatic heating).

Two published forms:

* **IEC adiabatic** ``I²·t = k²·S²`` (S in mm²) with k for the insulation and the
  conductor's role from ``tables/withstand_k.csv`` (IEC 60364-4-43 Table 43A, IEC
  60364-5-54 Table A.54.2), or k from the Annex A formula
  ``k = √(Qc(β + 20)/ρ20 · ln((β + θf)/(β + θi)))`` for any temperatures.
* **ICEA** ``(I/A)²·t = K·log10((T2 + T0)/(T1 + T0))`` with A in circular mils;
  copper K = 0.0297, T0 = 234; aluminum K = 0.0125, T0 = 228 (ICEA P-32-382).

Both ignore heat loss to the insulation, which is conservative for clearing times up
to about 5 s (IEC 60364-4-43 434.5.2). "thermoplastic" stands for THHN/THWN-like
insulation (PVC basis, 70 → 160 °C), "thermoset" for XHHW/XLPE-like (90 → 250 °C).

References
----------
IEC 60364-4-43:2008, 434.5.2 and Table 43A. IEC 60364-5-54:2011, Annex A and
Table A.54.2. IEC 60949:1988. ICEA P-32-382-2007, Short-circuit characteristics of
insulated cable.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .conductor import MATERIALS, material_index
from .sizes import MM2_PER_KCMIL

INSULATIONS = ("thermoplastic", "thermoset")
ROLES = ("line", "protective")
MAX_ADIABATIC_S = 5.0


@dataclass(frozen=True)
class KRow:
    """One k constant with its temperatures and rule id."""

    k: float
    initial_c: float
    final_c: float
    rule_id: str


@dataclass(frozen=True)
class KSpec:
    """One row of the k table: insulation, conductor role, material, temperatures,
    the largest area it applies to [mm²], k and its rule id."""

    insulation: str
    role: str
    material: str
    initial_c: float
    final_c: float
    max_area_mm2: float
    k: float
    rule_id: str


@dataclass(frozen=True)
class WithstandData:
    """The k rows and the material constants (index 0 cu, 1 al) the kernels use.

    Built by the rule book (``book.withstand``, :mod:`feedcheck.rulebook`) from
    ``withstand_k.csv`` and ``conductor_materials.csv``: β [°C], volumetric heat
    capacity Qc [J/(K·mm³)], ρ20 [Ω·mm²/m], ICEA K and T0 [°C].
    """

    k_rows: tuple[KSpec, ...]
    beta_c: np.ndarray
    heat_capacity_j_per_k_mm3: np.ndarray
    rho20_ohm_mm2_per_m: np.ndarray
    icea_k: np.ndarray
    icea_t0_c: np.ndarray


def k_constant(
    insulation: str,
    material: str,
    role: str = "line",
    area_mm2: float = 0.0,
    *,
    data: WithstandData,
) -> KRow:
    """Tabulated k for insulation, material, role (``line`` or ``protective``) and size.

    Line conductors with thermoplastic insulation over 300 mm² use the lower final
    temperature row.

    Examples
    --------
    >>> k_constant("thermoset", "cu", data=book.withstand).k
    143.0
    >>> k_constant("thermoplastic", "cu", area_mm2=400.0, data=book.withstand).k
    103.0
    """
    if insulation not in INSULATIONS:
        raise ValueError(f"insulation: got {insulation!r}; expected one of {INSULATIONS}")
    if role not in ROLES:
        raise ValueError(f"role: got {role!r}; expected one of {ROLES}")
    if material not in MATERIALS:
        raise ValueError(f"material: got {material!r}; expected one of {MATERIALS}")
    rows = [
        r
        for r in data.k_rows
        if r.insulation == insulation and r.material == material and r.role.startswith(role)
    ]
    rows.sort(key=lambda r: r.max_area_mm2)
    for r in rows:
        if area_mm2 <= r.max_area_mm2:
            return KRow(r.k, r.initial_c, r.final_c, r.rule_id)
    raise ValueError(f"area_mm2: got {area_mm2}; no k row covers it")


def k_adiabatic(material, initial_c, final_c, *, data: WithstandData):
    """k [A·s^½/mm²] from the IEC 60364-5-54 Annex A / IEC 60949 formula.

    ``k = √(Qc (β + 20) / ρ20 · ln((β + θf)/(β + θi)))`` with Qc the volumetric heat
    capacity [J/(K·mm³)], β the reciprocal temperature coefficient [°C] and ρ20 [Ω·mm].

    Examples
    --------
    >>> round(float(k_adiabatic("cu", 70.0, 160.0, data=book.withstand)), 1)
    114.8

    References
    ----------
    IEC 60364-5-54:2011 Annex A, Table A.54.1; IEC 60949:1988 §3.
    """
    m = material_index(material)
    beta = data.beta_c[m]
    qc = data.heat_capacity_j_per_k_mm3[m]
    rho = data.rho20_ohm_mm2_per_m[m] * 1e-3  # Ω·mm²/m → Ω·mm
    ti = np.asarray(initial_c, dtype=float)
    tf = np.asarray(final_c, dtype=float)
    if np.any(tf <= ti):
        raise ValueError("final_c: expected a final temperature above initial_c")
    k = np.sqrt(qc * (beta + 20.0) / rho * np.log((beta + tf) / (beta + ti)))
    return k[()] if k.ndim == 0 else k


def _check(name, x, strict=True):
    a = np.asarray(x, dtype=float)
    ok = np.isfinite(a) & ((a > 0) if strict else (a >= 0))
    if not np.all(ok):
        raise ValueError(f"{name}: got {a[~ok].ravel()[0]}; expected a positive finite value")
    return a


def withstand_current_a(area_mm2, clearing_s, k):
    """Largest fault current [A] a conductor carries for ``clearing_s`` (I = k·S/√t).

    Parameters
    ----------
    area_mm2 : float or array_like
        Conductor cross-section S [mm²].
    clearing_s : float or array_like
        Device clearing time t [s]; the adiabatic form holds up to about 5 s.
    k : float or array_like
        Adiabatic constant [A·s^½/mm²] (:func:`k_constant` or :func:`k_adiabatic`).

    Examples
    --------
    >>> round(float(withstand_current_a(95.0, 0.1, 143.0)))  # 143·95/√0.1
    42960

    References
    ----------
    IEC 60364-4-43:2008 434.5.2 equation (t = (k·S/I)²).
    """
    s = _check("area_mm2", area_mm2)
    t, kk = _time_and_constant(clearing_s, k)
    out = kk * s / np.sqrt(t)
    return out[()] if out.ndim == 0 else out


def _time_and_constant(clearing_s, k) -> tuple[np.ndarray, np.ndarray]:
    """Clearing time and constant, checked: the adiabatic method holds up to 5 s."""
    t = _check("clearing_s", clearing_s)
    kk = _check("k", k)
    if np.any(t > MAX_ADIABATIC_S):
        raise ValueError(
            f"clearing_s: got {t.max():g} s; the adiabatic method holds up to {MAX_ADIABATIC_S:g} s"
        )
    return t, kk


def min_area_mm2(fault_a, clearing_s, k):
    """Least cross-section [mm²] that withstands ``fault_a`` for ``clearing_s``: I·√t/k.

    Examples
    --------
    >>> round(float(min_area_mm2(20000.0, 0.05, 115.0)), 2)
    38.89

    References
    ----------
    IEC 60364-5-54:2011 543.1.2 (S = √(I²t)/k).
    """
    i = _check("fault_a", fault_a)
    t, kk = _time_and_constant(clearing_s, k)
    out = i * np.sqrt(t) / kk
    return out[()] if out.ndim == 0 else out


def withstand_current_icea_a(
    area_mm2, clearing_s, material, initial_c, final_c, *, data: WithstandData
):
    """Withstand current [A] by the ICEA P-32-382 form.

    ``I = A_cmil · √(K · log10((T2 + T0)/(T1 + T0)) / t)``.

    Examples
    --------
    >>> d = book.withstand
    >>> round(float(withstand_current_icea_a(107.2, 0.1, "cu", 75.0, 150.0, data=d)))  # 4/0 Cu
    35419

    References
    ----------
    ICEA P-32-382-2007, copper K = 0.0297, T0 = 234; aluminum K = 0.0125, T0 = 228.
    """
    m = material_index(material)
    kk = data.icea_k[m]
    t0 = data.icea_t0_c[m]
    a_cmil = _check("area_mm2", area_mm2) / MM2_PER_KCMIL * 1000.0
    t = _check("clearing_s", clearing_s)
    t1 = np.asarray(initial_c, dtype=float)
    t2 = np.asarray(final_c, dtype=float)
    if np.any(t2 <= t1):
        raise ValueError("final_c: expected a final temperature above initial_c")
    out = a_cmil * np.sqrt(kk * np.log10((t2 + t0) / (t1 + t0)) / t)
    return out[()] if out.ndim == 0 else out
