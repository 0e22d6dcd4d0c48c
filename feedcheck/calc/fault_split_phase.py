"""Fault current of a 120/240 V centre-tapped single-phase secondary: line-to-line and
line-to-neutral, maximum and minimum, at the terminals and downstream.

Pure functions on floats or numpy arrays in SI units; impedances are complex ohms.

The half-winding model
----------------------
A line-to-line fault loads the whole 240 V winding; its impedance is the nameplate
impedance Z_T = (%R + j%X)/100 · V_LL²/S. A line-to-neutral fault loads one half of the
secondary only, through a leakage path that couples less well with the primary. The
fuse makers' short-circuit application notes state the usual practice: the line-to-neutral
impedance uses 1.5 × %R and 1.2 × %X of the full-winding values, and the terminal
line-to-neutral current is then 1.33 to 1.67 times the line-to-line current (common
practice; no IEEE or NFPA clause states the factors).

Which base do the factored percentages sit on? Only one reading reproduces the published
1.33–1.67 range: the percentages stay on the full-winding kVA base S and are applied at the
120 V half-winding voltage,

    I_LN = S / (V_LN · |1.5·%R + j·1.2·%X| / 100),   I_LL = S / (V_LL · |%Z| / 100),

so I_LN / I_LL = 2·|%Z| / |1.5·%R + j·1.2·%X|, which runs from 2/1.5 = 1.33 (all
resistance) to 2/1.2 = 1.67 (all reactance). (Putting them on the half-winding base S/2
would make I_LN smaller than I_LL, contrary to the note.) In ohms referred to the half
winding (120 V): Z_LN = (1.5·R_T + j·1.2·X_T)/4, with R_T + jX_T the full-winding ohms at
240 V — the turns ratio of the half winding is half, so ohms refer by (1/2)² = 1/4.

Source and conductors
---------------------
The source impedance ``z_source_ohm`` is the loop impedance the primary sees, referred to
the full (240 V) winding; it refers to the half winding by 1/4 as well (ideal ratio). For a
primary connected line-to-line on a three-phase system whose per-phase impedance is Z_s,
that loop is 2·Z_s referred through the ratio (common practice).

Downstream, the line-to-line loop adds both line conductors (2·Z_line); the
line-to-neutral loop adds one line and the neutral (Z_line + Z_neutral), both at the
half-winding voltage V_LL/2.

References
----------
.. [1] Fuse-maker short-circuit application literature, point-to-point method, note on
   single-phase centre-tapped transformers (I_LN = 1.5 × I_LL at the terminals, theoretically
   1.33 to 1.67, based on 1.2 × %X and 1.5 × %R; infinite source, zero feet) — common
   practice, no standard.
.. [2] IEEE Std 141-1993 (Red Book), ch. 4 (ohmic method; referring impedances by the
   square of the turns ratio).
.. [3] IEEE Std C57.12.00-2021, clause 9 (impedance tolerance ±7.5 %).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .fault import _impedance, _out, _positive
from .transformer import transformer_impedance_ohm

CASES = ("max", "min")
R_FACTOR = 1.5  # half-winding %R multiplier, fuse-maker note (common practice)
X_FACTOR = 1.2  # half-winding %X multiplier, fuse-maker note (common practice)


def half_winding_impedance_ohm(z_full_winding_ohm, r_factor=R_FACTOR, x_factor=X_FACTOR):
    """Line-to-neutral (half-winding) impedance of a centre-tapped secondary.

    Method: Z_LN = (r_factor·R_T + j·x_factor·X_T) / 4, referred to the half-winding
    voltage V_LL/2 (see the module notes for why the factors sit on the full kVA base).

    Parameters
    ----------
    z_full_winding_ohm : complex or array
        Full-winding impedance R_T + jX_T referred to the full secondary voltage [Ω].
    r_factor, x_factor : float or array
        Multipliers on the full-winding resistance and reactance [-] (1.5 and 1.2,
        common practice).

    Returns
    -------
    complex or ndarray of complex
        Half-winding impedance at V_LL/2 [Ω].

    Examples
    --------
    >>> half_winding_impedance_ohm(0.004 + 0.010j)
    (0.0015+0.003j)
    """
    z = np.asarray(_impedance("z_full_winding_ohm", z_full_winding_ohm))
    rf = _positive("r_factor", r_factor)
    xf = _positive("x_factor", x_factor)
    return _out((rf * z.real + 1j * xf * z.imag) / 4.0)


@dataclass(frozen=True)
class SplitPhaseFault:
    """Line-to-line and line-to-neutral fault figures for one case (floats or arrays).

    ``fault_ll_a``/``fault_ln_a`` [A]; ``z_ll_ohm`` the loop at V_LL and ``z_ln_ohm`` the
    loop at V_LL/2 [Ω]; ``x_r_ll``/``x_r_ln`` the loops' X/R; ``case`` "max" or "min".
    """

    fault_ll_a: np.ndarray | float
    fault_ln_a: np.ndarray | float
    z_ll_ohm: np.ndarray | complex
    z_ln_ohm: np.ndarray | complex
    x_r_ll: np.ndarray | float
    x_r_ln: np.ndarray | float
    case: str
    method: str = (
        "half-winding model: Z_LN = (1.5·R_T + j1.2·X_T)/4 at V_LL/2 (fuse-maker "
        "note, common practice); I = c·V/|Z_loop|"
    )


def _xr(z):
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(z.real > 0, z.imag / np.where(z.real > 0, z.real, 1.0), np.inf)


def split_phase_fault(
    rating_va,
    voltage_ll_v,
    z_pct,
    x_r,
    case="max",
    tolerance_pct=7.5,
    z_source_ohm=0j,
    z_line_ohm=0j,
    z_neutral_ohm=0j,
    r_factor=R_FACTOR,
    x_factor=X_FACTOR,
    c=1.0,
):
    """Line-to-line and line-to-neutral fault current of a 120/240 V centre-tapped secondary.

    Method: the transformer impedance at its lower (``case="max"``) or upper (``"min"``)
    tolerance, Z_T·(1 ∓ tol/100) (IEEE C57.12.00 clause 9); the half-winding model for the
    line-to-neutral loop (module notes); loops

    * L-L: Z_src + Z_T + 2·Z_line, I_LL = c·V_LL / |Z|;
    * L-N: Z_src/4 + Z_LN + Z_line + Z_neutral, I_LN = c·(V_LL/2) / |Z|.

    Parameters
    ----------
    rating_va : float or array
        Transformer nameplate rating [VA].
    voltage_ll_v : float or array
        Full secondary voltage (240 V for 120/240 V) [V].
    z_pct : float or array
        Nameplate impedance [%].
    x_r : float or array
        Transformer X/R [-].
    case : {"max", "min"}
        Which tolerance to apply.
    tolerance_pct : float or array
        Impedance tolerance [%], 0 ≤ tol < 100.
    z_source_ohm : complex or array
        Source loop impedance referred to the full winding [Ω] (0 for an infinite source).
    z_line_ohm, z_neutral_ohm : complex or array
        Impedance of one line conductor and of the neutral from the terminals to the fault
        (parallel sets divided, temperature for the case) [Ω]; 0 at the terminals.
    r_factor, x_factor : float
        Half-winding multipliers [-].
    c : float or array
        Voltage factor [-] (1.0 for the plain ohmic method).

    Returns
    -------
    SplitPhaseFault

    Examples
    --------
    >>> f = split_phase_fault(50e3, 240.0, 2.5, 2.0, tolerance_pct=0.0)
    >>> round(f.fault_ll_a), round(f.fault_ln_a)
    (8333, 13168)
    """
    if case not in CASES:
        raise ValueError(f"case must be one of {CASES}, got {case!r}")
    tol = np.asarray(tolerance_pct, dtype=float)
    if np.any(~np.isfinite(tol) | (tol < 0) | (tol >= 100)):
        raise ValueError(f"tolerance_pct must be in [0, 100), got {tolerance_pct!r}")
    scale = 1.0 - tol / 100.0 if case == "max" else 1.0 + tol / 100.0
    zt = np.asarray(transformer_impedance_ohm(rating_va, voltage_ll_v, z_pct, x_r, phases=1))
    zt = zt * scale
    zs = np.asarray(_impedance("z_source_ohm", z_source_ohm))
    zl = np.asarray(_impedance("z_line_ohm", z_line_ohm))
    zn = np.asarray(_impedance("z_neutral_ohm", z_neutral_ohm))
    v = _positive("voltage_ll_v", voltage_ll_v)
    cc = _positive("c", c)
    z_ll = zs + zt + 2.0 * zl
    z_ln = zs / 4.0 + np.asarray(half_winding_impedance_ohm(zt, r_factor, x_factor)) + zl + zn
    i_ll = cc * v / np.abs(z_ll)
    i_ln = cc * (v / 2.0) / np.abs(z_ln)
    return SplitPhaseFault(
        _out(i_ll), _out(i_ln), _out(z_ll), _out(z_ln), _out(_xr(z_ll)), _out(_xr(z_ln)), case
    )


def ln_to_ll_ratio_terminals(x_r, r_factor=R_FACTOR, x_factor=X_FACTOR):
    """Terminal line-to-neutral over line-to-line current, infinite source.

    Method: I_LN/I_LL = 2·√(1 + (X/R)²) / √(r_factor² + (x_factor·X/R)²), from the
    half-winding model; 2/r_factor as X/R → 0, 2/x_factor as X/R → ∞ (the 1.33–1.67 of
    the fuse-maker note).

    Examples
    --------
    >>> round(ln_to_ll_ratio_terminals(3.0), 4)
    1.6217
    """
    xr = np.asarray(x_r, dtype=float)
    if np.any(np.isnan(xr) | (xr < 0)):
        raise ValueError(f"x_r must be a number not below zero, got {x_r!r}")
    rf = _positive("r_factor", r_factor)
    xf = _positive("x_factor", x_factor)
    with np.errstate(invalid="ignore", over="ignore"):
        ratio = 2.0 * np.sqrt(1.0 + xr**2) / np.sqrt(rf**2 + (xf * xr) ** 2)
    return _out(np.where(np.isinf(xr), 2.0 / xf, ratio))
