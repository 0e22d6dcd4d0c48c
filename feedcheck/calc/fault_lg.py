"""Line-to-ground faults on solidly grounded wye secondaries (symmetrical components),
and whether the upstream device still trips in its instantaneous region.

Pure functions on floats or numpy arrays in SI units; impedances are complex ohms.

Model
-----
* Bolted line-to-ground fault: I_LG = 3·c·V_LN / |Z1 + Z2 + Z0|, Z2 = Z1 (static plant).
* Delta–wye transformer: the delta winding blocks the source's zero-sequence current, so
  at the secondary Z0 = Z0_T = k·Z1_T (k ≈ 0.85–1.0 for dry-type units, common practice;
  rule row ``fault-z0-ratio-*`` of ``tables/fault_assumptions.csv``); the source's
  impedance appears only in Z1 and Z2.
* A run whose fault current returns on one conductor (the equipment grounding conductor
  or the neutral) of impedance Z_ret: Z1 = Z2 = Z_phase, Z0 = Z_phase + 3·Z_ret, so the
  run adds 3·(Z_phase + Z_ret) to Z1 + Z2 + Z0 — the loop form I = V_LN / |Z_src + Z_phase
  + Z_ret|. Parallel return paths (steel conduit, building steel) and mutual coupling
  are neglected: this lowers the computed current, the safe side for a minimum.

References
----------
.. [1] IEEE Std 141-1993 (Red Book), ch. 4: symmetrical components, unbalanced faults,
   sequence networks of delta–wye transformers.
.. [2] IEC 60909-0:2016, 7.1.3 (line-to-earth short circuit I = √3·c·U_n / |Z1 + Z2 + Z0|,
   with U_n the line voltage, i.e. 3·c·V_LN / |Z1 + Z2 + Z0|).
.. [3] IEEE Std 242-2001 (Buff Book), ch. 8: ground-fault protection; the return-path
   loop model of a feeder's equipment grounding conductor.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .fault import _check_parents, _impedance, _nonneg, _out, _positive, cumulative_impedance_ohm


def transformer_zero_sequence_ohm(z1_transformer_ohm, z0_ratio=1.0):
    """Zero-sequence impedance at a delta–wye transformer's grounded secondary.

    Method: Z0 = k · Z1_T (the delta blocks the source's zero sequence; IEEE Std 141 ch. 4).

    Examples
    --------
    >>> transformer_zero_sequence_ohm(0.01 + 0.03j, 0.85)
    (0.0085+0.0255j)
    """
    return _out(
        _impedance("z1_transformer_ohm", z1_transformer_ohm) * _positive("z0_ratio", z0_ratio)
    )


def run_zero_sequence_ohm(z_phase_ohm, z_return_ohm):
    """Zero-sequence impedance of a run with one return conductor: Z0 = Z_phase + 3·Z_ret.

    Examples
    --------
    >>> z0 = run_zero_sequence_ohm(0.01 + 0.01j, 0.02 + 0.01j)
    >>> round(z0.real, 6), round(z0.imag, 6)
    (0.07, 0.04)
    """
    return _out(
        _impedance("z_phase_ohm", z_phase_ohm) + 3.0 * _impedance("z_return_ohm", z_return_ohm)
    )


def fault_current_lg_a(voltage_ln_v, z1_ohm, z0_ohm, z2_ohm=None, c=1.0):
    """Bolted line-to-ground fault current by symmetrical components.

    Method: I_LG = 3 · c · V_LN / |Z1 + Z2 + Z0| (IEEE Std 141 ch. 4; IEC 60909-0, 7.1.3),
    Z2 = Z1 unless given.

    Parameters
    ----------
    voltage_ln_v : float or array
        Line-to-neutral voltage [V].
    z1_ohm, z0_ohm, z2_ohm : complex or array
        Positive-, zero- and negative-sequence impedance source → fault [Ω].
    c : float
        IEC 60909-0 voltage factor [-] (1.0 plain ohmic; c_min 0.95 for minimum).

    Returns
    -------
    float or ndarray
        Symmetrical RMS fault current [A].

    Examples
    --------
    >>> round(fault_current_lg_a(120.0, 0.01 + 0.03j, 0.01 + 0.03j))
    3795
    """
    v = _positive("voltage_ln_v", voltage_ln_v)
    z1 = _impedance("z1_ohm", z1_ohm)
    z2 = z1 if z2_ohm is None else _impedance("z2_ohm", z2_ohm)
    z = np.abs(z1 + z2 + _impedance("z0_ohm", z0_ohm))
    if np.any(z <= 0):
        raise ValueError("z1 + z2 + z0 must not be zero")
    return _out(3.0 * _positive("c", c) * v / z)


def radial_fault_lg_a(
    parent_index, voltage_ln_v, branch_z1_ohm, branch_z0_ohm, root_z1_ohm, root_z0_ohm, c=1.0
):
    """Line-to-ground fault current at every node of a radial feed.

    Z1 and Z0 are summed along the tree by
    :func:`feedcheck.calc.fault.cumulative_impedance_ohm`; for a delta–wye secondary,
    ``root_z0_ohm`` is the transformer's Z0 alone and ``root_z1_ohm`` includes the
    source. Branch Z0 from :func:`run_zero_sequence_ohm`.

    Examples
    --------
    >>> i = radial_fault_lg_a([-1, 0], 120.0, [0j, 0.01 + 0.005j], [0j, 0.05 + 0.02j],
    ...                       0.01 + 0.03j, 0.01 + 0.03j)
    >>> [round(v) for v in i]
    [3795, 2305]
    """
    p = _check_parents(parent_index)
    z1 = cumulative_impedance_ohm(p, branch_z1_ohm, root_z1_ohm)
    z0 = cumulative_impedance_ohm(p, branch_z0_ohm, root_z0_ohm)
    return np.asarray(fault_current_lg_a(voltage_ln_v, z1, z0, c=c))


@dataclass(frozen=True)
class InstantaneousCheck:
    """Does the minimum fault current reach the device's instantaneous region?

    Attributes (arrays or floats): ``fault_a`` the minimum fault current; ``pickup_a``
    the nominal instantaneous pickup (multiple × rating); ``required_a`` the pickup at
    the top of its tolerance band (what is needed to be sure of tripping); ``trips``;
    ``margin`` = fault / required (≥ 1 trips).
    """

    fault_a: np.ndarray | float
    pickup_a: np.ndarray | float
    required_a: np.ndarray | float
    trips: np.ndarray | bool
    margin: np.ndarray | float


def instantaneous_trip_check(fault_min_a, device_a, pickup_multiple, tolerance_pct=0.0):
    """Compare a minimum fault current with a device's instantaneous pickup.

    Method: pickup = multiple × device rating; required = pickup · (1 + tol/100); trips
    when fault ≥ required. Multiples and tolerances by device type are common practice
    (``tables/instantaneous_pickup.csv``), or the actual setting when known.

    Examples
    --------
    >>> chk = instantaneous_trip_check(2400.0, 225.0, 10.0, 20.0)
    >>> chk.required_a, bool(chk.trips), round(chk.margin, 3)
    (2700.0, False, 0.889)
    """
    i = _nonneg("fault_min_a", fault_min_a)
    pickup = _positive("device_a", device_a) * _positive("pickup_multiple", pickup_multiple)
    tol = _nonneg("tolerance_pct", tolerance_pct)
    req = pickup * (1.0 + tol / 100.0)
    trips = i >= req
    return InstantaneousCheck(
        _out(i), _out(pickup), _out(req), trips if np.ndim(trips) else bool(trips), _out(i / req)
    )


def _solve_abs(a, b, k):
    """Largest t ≥ 0 with |a + t·b| ≤ k (R, X ≥ 0 so |a + t·b| grows with t); 0 when
    |a| > k already; inf when b = 0 and |a| ≤ k."""
    bb = np.abs(b) ** 2
    half = (a * np.conj(b)).real
    cc = np.abs(a) ** 2 - k**2
    with np.errstate(divide="ignore", invalid="ignore"):
        disc = np.maximum(half**2 - bb * cc, 0.0)
        t = (-half + np.sqrt(disc)) / bb
    t = np.where(bb > 0, t, np.where(cc <= 0, np.inf, 0.0))
    return np.where(cc > 0, 0.0, np.maximum(t, 0.0))


def max_length_for_trip_m(
    voltage_ln_v, z_sum_upstream_ohm, z_phase_ohm_per_m, z_return_ohm_per_m, required_a, c=1.0
):
    """Longest run that still gives at least ``required_a`` for a line-to-ground fault
    at its far end.

    Method: with A = Z1 + Z2 + Z0 at the run's start and B = 3·(z_phase + z_return) per
    metre, solve |A + L·B| = 3·c·V_LN / I_required for L (quadratic in L).

    Parameters
    ----------
    z_sum_upstream_ohm : complex
        Z1 + Z2 + Z0 from the source to the run's start [Ω].
    z_phase_ohm_per_m : complex
        Phase impedance per metre of the run, parallel sets already divided [Ω/m].
    z_return_ohm_per_m : complex
        Return-path (EGC or neutral) impedance per metre [Ω/m].
    required_a : float
        Current needed to trip [A] (:attr:`InstantaneousCheck.required_a`).

    Returns
    -------
    float or ndarray
        Length [m]; 0 when even a zero-length run falls short.

    Examples
    --------
    >>> round(max_length_for_trip_m(120.0, 0.03 + 0.09j, 0.2e-3 + 0.16e-3j,
    ...                             1.0e-3 + 0.2e-3j, 2700.0), 1)
    14.3
    """
    a = _impedance("z_sum_upstream_ohm", z_sum_upstream_ohm)
    b = 3.0 * (
        _impedance("z_phase_ohm_per_m", z_phase_ohm_per_m)
        + _impedance("z_return_ohm_per_m", z_return_ohm_per_m)
    )
    k = (
        3.0
        * _positive("c", c)
        * _positive("voltage_ln_v", voltage_ln_v)
        / _positive("required_a", required_a)
    )
    return _out(_solve_abs(a, b, k))


def max_return_resistance_for_trip_ohm_per_m(
    voltage_ln_v,
    z_sum_upstream_ohm,
    length_m,
    z_phase_ohm_per_m,
    x_return_ohm_per_m,
    required_a,
    c=1.0,
):
    """Largest return-path resistance per metre that still trips at the far end.

    Method: solve |A + 3L·(z_phase + j·x_ret) + 3L·r| = 3·c·V_LN / I_required for r. The
    caller picks the smallest return conductor whose resistance (at the minimum-case
    temperature) is not above the result; see :func:`smallest_return_for_trip`.

    Returns
    -------
    float or ndarray
        r [Ω/m]; 0 when no return conductor can make it trip (the phase conductors or
        the source are already too weak).

    Examples
    --------
    >>> round(max_return_resistance_for_trip_ohm_per_m(120.0, 0.03 + 0.09j, 10.0,
    ...       0.2e-3 + 0.16e-3j, 0.2e-3, 2700.0) * 1e3, 4)
    1.7092
    """
    length = _positive("length_m", length_m)
    a = _impedance("z_sum_upstream_ohm", z_sum_upstream_ohm) + 3.0 * length * (
        _impedance("z_phase_ohm_per_m", z_phase_ohm_per_m)
        + 1j * _nonneg("x_return_ohm_per_m", x_return_ohm_per_m)
    )
    k = (
        3.0
        * _positive("c", c)
        * _positive("voltage_ln_v", voltage_ln_v)
        / _positive("required_a", required_a)
    )
    return _out(_solve_abs(a, 3.0 * length + 0j, k))


def smallest_return_for_trip(
    voltage_ln_v,
    z_sum_upstream_ohm,
    length_m,
    z_phase_ohm_per_m,
    r_return_ohm_per_m,
    x_return_ohm_per_m,
    required_a,
    c=1.0,
):
    """Index of the first candidate return conductor (candidates ordered by area) that
    makes the far-end line-to-ground current reach ``required_a``; −1 if none does.

    Vectorised over the candidates (arrays of r and x per metre).

    Examples
    --------
    >>> smallest_return_for_trip(120.0, 0.03 + 0.09j, 10.0, 0.2e-3 + 0.16e-3j,
    ...                          [2.6e-3, 1.0e-3, 0.4e-3], [0.2e-3] * 3, 2700.0)
    1
    """
    r = np.atleast_1d(_nonneg("r_return_ohm_per_m", r_return_ohm_per_m))
    x = np.broadcast_to(_nonneg("x_return_ohm_per_m", x_return_ohm_per_m), r.shape)
    length = _positive("length_m", length_m)
    z = _impedance("z_sum_upstream_ohm", z_sum_upstream_ohm) + 3.0 * length * (
        _impedance("z_phase_ohm_per_m", z_phase_ohm_per_m) + r + 1j * x
    )
    i = 3.0 * _positive("c", c) * _positive("voltage_ln_v", voltage_ln_v) / np.abs(z)
    ok = np.flatnonzero(i >= _positive("required_a", required_a))
    return int(ok[0]) if ok.size else -1
