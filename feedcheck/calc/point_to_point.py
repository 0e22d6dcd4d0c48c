"""Point-to-point method of short-circuit calculation: the second fault figure, held
beside the ohmic maximum of :mod:`feedcheck.calc.fault`.

The method works on magnitudes: a starting figure at a transformer secondary, then one
multiplier per run, M = 1/(1 + f), with f growing with the run's length and the current
at its head and falling with the conductor constant C, the number of sets and the
voltage. Lengths are converted to feet inside the kernels, since C is stated in A·ft/V.

Pure functions on floats or numpy arrays in SI units (A, V, m, Ω/m).

References
----------
.. [1] The point-to-point method as published in fuse makers' short-circuit
   application literature, e.g. Cooper Bussmann, *Electrical Plan Review* (2005),
   Part II, "Point-to-Point Method of Short-Circuit Calculation"
   (f = √3·L·I/(C·n·V_LL), M = 1/(1 + f)). Its worked example is reproduced as a test
   oracle in ``tests/reference/test_fault_reference.py``; the examples below are invented.
"""

from __future__ import annotations

import numpy as np

from .constants import M_PER_FT, SQRT3
from .fault import _nonneg, _out, _positive

FT_PER_M = 1.0 / M_PER_FT
PTP_KINDS = ("3ph", "1ph-ll", "1ph-ln")


def conductor_constant_a_ft_per_v(r_ohm_per_m, x_ohm_per_m):
    """Point-to-point conductor constant C = 1000 / |Z per 1000 ft| [A·ft/V].

    Examples
    --------
    An invented conductor of 0.062 + j0.050 Ω per 1000 ft:

    >>> round(conductor_constant_a_ft_per_v(0.062 / 304.8, 0.050 / 304.8))
    12555
    """
    z_kft = np.hypot(_nonneg("r_ohm_per_m", r_ohm_per_m), _nonneg("x_ohm_per_m", x_ohm_per_m))
    z_kft = z_kft * 304.8
    if (z_kft <= 0).any():
        raise ValueError("conductor impedance must not be zero")
    return _out(1000.0 / z_kft)


def ptp_secondary_current_a(
    rated_current_a,
    z_pct,
    tolerance_pct=0.0,
    primary_fault_a=None,
    primary_v=None,
    secondary_v=None,
):
    """Point-to-point starting figure at a transformer secondary.

    Infinite primary: I = I_rated · 100 / (%Z · (1 − tol/100)). With the source included
    (``primary_fault_a`` given): the method's transformer step, f = I_p,ref / I_inf with
    I_p,ref = I_sc,primary · V_p / V_s, M = 1/(1 + f), I = I_p,ref · M — i.e. the
    magnitudes of source and transformer impedance add (no X/R).

    Examples
    --------
    An invented 112.5 kVA, 3.4 %Z unit at 208 V (312.3 A rated), 7.5 % tolerance:

    >>> round(ptp_secondary_current_a(312.3, 3.4, 7.5))
    9930
    """
    i = _positive("rated_current_a", rated_current_a)
    zp = _positive("z_pct", z_pct)
    tol = np.asarray(tolerance_pct, dtype=float)
    if (~np.isfinite(tol) | (tol < 0) | (tol >= 100)).any():
        raise ValueError(f"tolerance_pct must be in [0, 100), got {tolerance_pct!r}")
    inf_bus = i * 100.0 / (zp * (1.0 - tol / 100.0))
    if primary_fault_a is None:
        return _out(inf_bus)
    ip = _positive("primary_fault_a", primary_fault_a, allow_inf=True)
    ratio = _positive("primary_v", primary_v) / _positive("secondary_v", secondary_v)
    with np.errstate(invalid="ignore"):
        ref = ip * ratio
        out = np.where(np.isinf(ref), inf_bus, ref / (1.0 + ref / inf_bus))
    return _out(out)


def ptp_factor(length_m, fault_a, c_a_ft_per_v, sets, voltage_v, kind="3ph"):
    """Point-to-point f factor for one run.

    f = √3·L·I/(C·n·V_LL) (``"3ph"``), 2·L·I/(C·n·V_LL) (``"1ph-ll"``),
    2·L·I/(C·n·V_LN) (``"1ph-ln"``), L in feet, I the fault current at the run's start.

    Examples
    --------
    An invented 45 ft run, one set, C = 11,900 A·ft/V, 9,930 A at its head, 208 V:

    >>> round(ptp_factor(45 * M_PER_FT, 9930.0, 11900.0, 1, 208.0), 3)
    0.313
    """
    if kind not in PTP_KINDS:
        raise ValueError(f"kind must be one of {PTP_KINDS}, got {kind!r}")
    k = SQRT3 if kind == "3ph" else 2.0
    length_ft = _nonneg("length_m", length_m) * FT_PER_M
    n = _positive("sets", sets)
    return _out(
        k
        * length_ft
        * _nonneg("fault_a", fault_a)
        / (_positive("c_a_ft_per_v", c_a_ft_per_v) * n * _positive("voltage_v", voltage_v))
    )


def ptp_chain_a(start_a, lengths_m, c_a_ft_per_v, sets, voltage_v, kind="3ph"):
    """Point-to-point fault current at the end of each run of a chain, applied
    successively: I_k = I_(k−1) · M_k with M_k = 1/(1 + f_k).

    Parameters
    ----------
    start_a : float
        Fault current at the head of the chain [A].
    lengths_m, c_a_ft_per_v, sets : array (one per run, in order)
    voltage_v : float or array
        V_LL (``3ph``, ``1ph-ll``) or V_LN (``1ph-ln``) [V].

    Returns
    -------
    ndarray
        Fault current at the end of each run [A].

    Examples
    --------
    Two invented runs in series at 208 V: 45 ft (C = 11,900) then 30 ft (C = 5,900):

    >>> ptp_chain_a(9930.0, [45 * M_PER_FT, 30 * M_PER_FT], [11900.0, 5900.0], [1, 1],
    ...             208.0).round(-1).tolist()
    [7560.0, 5730.0]
    """
    lengths = np.atleast_1d(_nonneg("lengths_m", lengths_m))
    c = np.broadcast_to(np.asarray(c_a_ft_per_v, dtype=float), lengths.shape)
    n = np.broadcast_to(np.asarray(sets, dtype=float), lengths.shape)
    v = np.broadcast_to(np.asarray(voltage_v, dtype=float), lengths.shape)
    out = np.empty(lengths.shape)
    i = float(_positive("start_a", start_a))
    for k in range(lengths.size):  # sequential by nature: each run starts where the last ended
        i = i / (1.0 + float(ptp_factor(lengths[k], i, c[k], n[k], v[k], kind)))
        out[k] = i
    return out


def percent_difference(value, reference):
    """(value − reference) / reference · 100 [%].

    Examples
    --------
    >>> percent_difference(95.0, 100.0)
    -5.0
    """
    ref = _positive("reference", reference)
    return _out((np.asarray(value, dtype=float) - ref) / ref * 100.0)
