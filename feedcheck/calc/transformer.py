"""Transformer kernels: rated currents, impedance, regulation, protection limits.

Pure functions on floats or numpy arrays in SI units (VA, V, A, Ω, %).

References
----------
.. [1] IEEE Std 141-1993 (Red Book), ch. 3 (voltage) and ch. 4 (short-circuit
   calculations): per-unit bases, transformer impedance from %Z and X/R.
.. [2] IEEE Std C57.12.00-2021, clause 9 (impedance tolerance ±7.5 %) and the
   regulation definition of IEEE Std C57.12.80 (no-load minus full-load voltage,
   over full-load voltage, receiving end held at rated voltage).
.. [3] NFPA 70 National Electrical Code 2023, 450.3(B), Table 450.3(B).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .constants import SQRT3
from .power import current_from_apparent_power_a


def _phase_factor(phases):
    phases = np.asarray(phases)
    if not np.isin(phases, (1, 3)).all():
        raise ValueError(f"phases must be 1 or 3, got {phases!r}")
    return np.where(phases == 3, SQRT3, 1.0)


def _positive(name: str, value) -> np.ndarray:
    arr = np.asarray(value, dtype=float)
    if not np.isfinite(arr).all() or (arr <= 0).any():
        raise ValueError(f"{name} must be a finite number greater than zero, got {value!r}")
    return arr


def rated_current_a(rating_va, voltage_ll_v, phases=3):
    """Rated (full-load) line current of a transformer winding.

    Method: I = S / (√3 · V_LL) for three-phase, I = S / V for single-phase (for a
    120/240 V three-wire winding, V is the 240 V line-to-line voltage).

    Parameters
    ----------
    rating_va : float or array
        Nameplate apparent power [VA].
    voltage_ll_v : float or array
        Winding line-to-line voltage [V].
    phases : int or array
        1 or 3.

    Returns
    -------
    float or ndarray
        Rated line current [A].

    Examples
    --------
    >>> round(float(rated_current_a(75e3, 208)), 1)
    208.2
    >>> round(float(rated_current_a(75e3, 480)), 1)
    90.2
    >>> round(float(rated_current_a(25e3, 240, phases=1)), 1)
    104.2

    References
    ----------
    IEEE Std 141-1993, ch. 4 (per-unit bases).
    """
    return current_from_apparent_power_a(_positive("rating_va", rating_va), voltage_ll_v, phases)


def base_impedance_ohm(rating_va, voltage_ll_v, phases=3):
    """Base impedance [Ω] of a winding: V_LL² / S (three-phase, per phase of the wye
    equivalent) or V² / S (single-phase, over the full winding).

    Examples
    --------
    >>> round(float(base_impedance_ohm(75e3, 208)), 4)
    0.5769
    """
    s = _positive("rating_va", rating_va)
    v = _positive("voltage_ll_v", voltage_ll_v)
    _phase_factor(phases)
    out = v**2 / s
    return out if out.ndim else float(out)


def impedance_parts_pct(z_pct, x_r):
    """Split a percent impedance into percent resistance and reactance.

    R% = Z% / √(1 + (X/R)²), X% = R% · X/R.

    Examples
    --------
    >>> r, x = impedance_parts_pct(5.0, 3.0)
    >>> round(float(r), 4), round(float(x), 4)
    (1.5811, 4.7434)
    """
    z = _positive("z_pct", z_pct)
    xr = _positive("x_r", x_r)
    r = z / np.sqrt(1.0 + xr**2)
    x = r * xr
    return (r, x) if r.ndim else (float(r), float(x))


def transformer_impedance_ohm(rating_va, voltage_ll_v, z_pct, x_r, phases=3):
    """Transformer series impedance in ohms referred to the side at ``voltage_ll_v``.

    Method: Z = (Z% / 100) · Z_base, split by X/R into R + jX (IEEE Std 141 ch. 4).
    Three-phase: per phase of the wye equivalent (use with V_LL/√3). Single-phase:
    over the full winding (use with the full winding voltage).

    Parameters
    ----------
    rating_va : float or array
        Nameplate apparent power [VA].
    voltage_ll_v : float or array
        Line-to-line voltage of the side to refer to [V].
    z_pct : float or array
        Nameplate impedance [%].
    x_r : float or array
        Reactance-to-resistance ratio [-].
    phases : int
        1 or 3.

    Returns
    -------
    complex or ndarray of complex
        R + jX [Ω].

    Examples
    --------
    >>> z = transformer_impedance_ohm(75e3, 208, 5.0, 3.0)
    >>> round(abs(z), 5)
    0.02884
    """
    zb = np.asarray(base_impedance_ohm(rating_va, voltage_ll_v, phases))
    r_pct, x_pct = impedance_parts_pct(z_pct, x_r)
    out = zb * (np.asarray(r_pct) + 1j * np.asarray(x_pct)) / 100.0
    return out if out.ndim else complex(out)


def _load_terms(r_pct, x_pct, load_fraction, pf):
    pf = np.asarray(pf, dtype=float)
    if ((pf <= 0) | (pf > 1)).any():
        raise ValueError(f"power factor must be in (0, 1], got {pf!r}")
    n = np.asarray(load_fraction, dtype=float)
    if (n < 0).any() or not np.isfinite(n).all():
        raise ValueError(f"load fraction must be finite and not negative, got {load_fraction!r}")
    sin = np.sqrt(1.0 - pf**2)
    a = n * (np.asarray(r_pct) * pf + np.asarray(x_pct) * sin) / 100.0
    b = n * (np.asarray(x_pct) * pf - np.asarray(r_pct) * sin) / 100.0
    return a, b


def regulation_pct_approximate(r_pct, x_pct, load_fraction, pf):
    """Voltage regulation by the usual %R/%X approximation.

    %Reg ≈ n(%R cos φ + %X sin φ) + n²(%X cos φ − %R sin φ)² / 200,
    with n the load as a fraction of rating and φ the load angle (lagging positive).

    Parameters
    ----------
    r_pct, x_pct : float or array
        Percent resistance and reactance on the transformer's own base [%].
    load_fraction : float or array
        Load / rating [-].
    pf : float or array
        Load power factor, lagging [-], in (0, 1].

    Returns
    -------
    float or ndarray
        Regulation [%] (receiving end at rated voltage).

    Examples
    --------
    >>> round(float(regulation_pct_approximate(1.0, 5.0, 1.0, 0.8)), 4)
    3.8578

    References
    ----------
    IEEE Std C57.12.80 (definition of regulation); the series expansion of the exact
    phasor magnitude below, as in standard transformer texts.
    """
    a, b = _load_terms(r_pct, x_pct, load_fraction, pf)
    out = 100.0 * a + (100.0 * b) ** 2 / 200.0
    return out if np.ndim(out) else float(out)


def regulation_pct_exact(r_pct, x_pct, load_fraction, pf):
    """Voltage regulation by the exact phasor form, receiving end held at rated voltage.

    E_s = |1 + n(r cos φ + x sin φ) + j n(x cos φ − r sin φ)| (per unit);
    %Reg = (E_s − 1) · 100.

    Examples
    --------
    >>> round(float(regulation_pct_exact(1.0, 5.0, 1.0, 0.8)), 4)
    3.8557
    """
    a, b = _load_terms(r_pct, x_pct, load_fraction, pf)
    out = 100.0 * (np.sqrt((1.0 + a) ** 2 + b**2) - 1.0)
    return out if np.ndim(out) else float(out)


def secondary_drop_pct_exact(r_pct, x_pct, load_fraction, pf, sending_pu=1.0):
    """Drop of the secondary voltage below the (tap-adjusted) no-load voltage when the
    primary is held fixed — the transformer as one segment of a feed.

    Exact phasor form with the sending end fixed: E_r = √(E_s² − b²) − a, drop =
    (E_s − E_r) · 100 [% of rated], with a = n(r cos φ + x sin φ), b = n(x cos φ − r sin φ)
    in per unit and the load current held at its rated-voltage value.

    Raises
    ------
    ValueError
        When the load cannot be delivered (b > E_s).

    Examples
    --------
    >>> round(float(secondary_drop_pct_exact(1.0, 5.0, 1.0, 0.8)), 4)
    3.8578
    """
    a, b = _load_terms(r_pct, x_pct, load_fraction, pf)
    es = np.asarray(sending_pu, dtype=float)
    rad = es**2 - b**2
    if (rad < 0).any():
        raise ValueError("load too large for this impedance: no real receiving-end voltage")
    out = 100.0 * (es - (np.sqrt(rad) - a))
    return out if np.ndim(out) else float(out)


@dataclass(frozen=True)
class ProtectionLimit:
    """Largest permitted device on one winding, with the rule row it came from."""

    winding: str
    arrangement: str
    rule_id: str
    rated_current_a: float
    max_pct: float
    computed_a: float
    max_device_a: float
    next_size_up: bool


def next_standard_rating_a(current_a: float, ratings_a) -> float:
    """Smallest standard rating ≥ ``current_a`` (inf when beyond the list)."""
    r = np.sort(np.asarray(ratings_a, dtype=float))
    idx = np.searchsorted(r, current_a * (1 - 1e-9))
    return float(r[idx]) if idx < len(r) else math.inf


def largest_standard_at_most_a(current_a: float, ratings_a) -> float:
    """Largest standard rating ≤ ``current_a`` (0 when below the list)."""
    r = np.sort(np.asarray(ratings_a, dtype=float))
    idx = np.searchsorted(r, current_a * (1 + 1e-9), side="right") - 1
    return float(r[idx]) if idx >= 0 else 0.0


def protection_limit(
    rated_current: float, winding: str, arrangement: str, rules: list[dict], ratings_a
) -> ProtectionLimit:
    """Largest primary or secondary device permitted for a transformer winding.

    Picks the rule row whose arrangement and winding match and whose current band
    ``current_from_a ≤ I < current_to_a`` contains the rated current; the limit is
    ``max_pct`` of the rated current; where the row permits it (``next_size_up``),
    the next standard rating above that figure is allowed, otherwise the largest
    standard rating not above it.

    Parameters
    ----------
    rated_current : float
        Rated current of the winding [A].
    winding : str
        ``"primary"`` or ``"secondary"``.
    arrangement : str
        ``"primary only"`` or ``"primary and secondary"``.
    rules : list of dict
        Rows of ``tables/transformer_protection.csv``.
    ratings_a : array
        Standard device ratings [A] (``tables/device_ratings.csv``).

    Examples
    --------
    >>> rules = [dict(rule_id="r", arrangement="primary only", winding="primary",
    ...               current_from_a=9, current_to_a=math.inf, max_pct=125, next_size_up="yes")]
    >>> protection_limit(90.2, "primary", "primary only", rules, [100, 110, 125]).max_device_a
    125.0

    References
    ----------
    NFPA 70-2023, 450.3(B) and Table 450.3(B), note 1.
    """
    for row in rules:
        if (
            row["arrangement"] == arrangement
            and row["winding"] == winding
            and float(row["current_from_a"]) <= rated_current < float(row["current_to_a"])
        ):
            computed = rated_current * float(row["max_pct"]) / 100.0
            nsu = str(row["next_size_up"]).strip().lower() == "yes"
            if nsu:
                dev = next_standard_rating_a(computed, ratings_a)
            else:
                dev = largest_standard_at_most_a(computed, ratings_a)
                if dev == 0.0:  # below the smallest standard rating: the figure itself
                    dev = computed
            return ProtectionLimit(
                winding,
                arrangement,
                str(row["rule_id"]),
                float(rated_current),
                float(row["max_pct"]),
                computed,
                dev,
                nsu,
            )
    raise ValueError(
        f"no protection rule for {winding} winding, arrangement {arrangement!r}, "
        f"rated current {rated_current} A"
    )


def gec_row(largest_area_kcmil: float, material: str, rows: list[dict]) -> dict:
    """Row of the grounding-electrode-conductor table for the largest ungrounded
    conductor area [kcmil] (sum over parallel sets) of the given material."""
    col = "cu_up_to_kcmil" if material == "cu" else "al_up_to_kcmil"
    for row in rows:
        if largest_area_kcmil <= float(row[col]) * (1 + 1e-6):
            return row
    raise ValueError(f"area {largest_area_kcmil} kcmil beyond the table")
