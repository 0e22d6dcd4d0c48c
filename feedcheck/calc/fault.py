"""Available fault current: ohmic (complex impedance) method, radial walk, asymmetry,
motor contribution and single-phase three-wire secondaries.

Pure functions on floats or numpy arrays in SI units (V, A, Ω, m, VA). Complex
impedances are ``R + jX`` in ohms. Line-to-ground faults (symmetrical components) and
the instantaneous-trip check live in :mod:`feedcheck.calc.fault_lg`; the point-to-point
method (the second figure) in :mod:`feedcheck.calc.point_to_point`.

Maximum and minimum
-------------------
The maximum current (for interrupting ratings) uses the transformer impedance at its
lower tolerance and conductor resistance at 20 °C; the minimum (does the device still
trip fast?) uses the upper tolerance and conductor resistance at operating temperature.
The caller passes the two sets of conductor r (the conductor kernel corrects r for
temperature); the tolerance, temperatures and IEC 60909 voltage factors are rule rows
of ``tables/fault_assumptions.csv``.

References
----------
.. [1] IEEE Std 141-1993 (Red Book), ch. 4, short-circuit current calculations
   (ohmic method, asymmetry, motor contribution).
.. [2] IEC 60909-0:2016, Short-circuit currents in three-phase a.c. systems — Part 0:
   Calculation of currents; clause 5.3.1 (voltage factor c, Table 1), 8.1 (peak current,
   κ = 1.02 + 0.98·e^(−3R/X)).
.. [3] IEEE Std C57.12.00-2021, clause 9 (impedance tolerance ±7.5 %).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .constants import SQRT3
from .transformer import transformer_impedance_ohm


def _out(arr):
    """Return a Python scalar for 0-d results, the array otherwise."""
    arr = np.asarray(arr)
    if arr.ndim:
        return arr
    return complex(arr) if np.iscomplexobj(arr) else float(arr)


def _positive(name: str, value, allow_inf: bool = False) -> np.ndarray:
    arr = np.asarray(value, dtype=float)
    bad = np.isnan(arr) | (arr <= 0) | (~np.isfinite(arr) & (not allow_inf))
    if bad.any():
        raise ValueError(
            f"{name} must be a number greater than zero"
            f"{'' if allow_inf else ' and finite'}, got {value!r}"
        )
    return arr


def _nonneg(name: str, value) -> np.ndarray:
    arr = np.asarray(value, dtype=float)
    if (~np.isfinite(arr) | (arr < 0)).any():
        raise ValueError(f"{name} must be a finite number not below zero, got {value!r}")
    return arr


def _impedance(name: str, value) -> np.ndarray:
    z = np.asarray(value, dtype=complex)
    if (~np.isfinite(z)).any() or (z.real < 0).any() or (z.imag < 0).any():
        raise ValueError(f"{name} must be finite with R ≥ 0 and X ≥ 0 [Ω], got {value!r}")
    return z


# --------------------------------------------------------------------------- sources


def source_impedance_ohm(voltage_ll_v, fault_a, x_r):
    """Utility source impedance from its available three-phase fault current.

    Method: |Z| = V_LL / (√3 · I_sc), split by X/R (IEEE Std 141 ch. 4). An infinite
    source (``fault_a = inf``) gives 0 Ω.

    Parameters
    ----------
    voltage_ll_v : float or array
        Line-to-line voltage at which the fault current is stated [V].
    fault_a : float or array
        Available symmetrical three-phase fault current [A]; ``inf`` for an infinite bus.
    x_r : float or array
        Source X/R ratio [-].

    Returns
    -------
    complex or ndarray of complex
        R + jX per phase [Ω], referred to ``voltage_ll_v``.

    Examples
    --------
    >>> z = source_impedance_ohm(480.0, 30e3, 6.0)
    >>> round(abs(z), 6)
    0.009238
    >>> source_impedance_ohm(480.0, float("inf"), 6.0)
    0j

    References
    ----------
    IEEE Std 141-1993, ch. 4.
    """
    v = _positive("voltage_ll_v", voltage_ll_v)
    i = _positive("fault_a", fault_a, allow_inf=True)
    xr = _positive("x_r", x_r)
    mag = v / (SQRT3 * i)
    r = mag / np.sqrt(1.0 + xr**2)
    return _out(r + 1j * r * xr)


def source_impedance_from_sc_ohm(voltage_ll_v, sc_va, x_r):
    """Source impedance from its short-circuit power S_sc [VA] (``inf`` → 0 Ω).

    Method: |Z| = V_LL² / S_sc, split by X/R (IEEE Std 141 ch. 4).

    Examples
    --------
    >>> round(abs(source_impedance_from_sc_ohm(480.0, 500e6, 8.0)), 7)
    0.0004608
    """
    v = _positive("voltage_ll_v", voltage_ll_v)
    s = _positive("sc_va", sc_va, allow_inf=True)
    xr = _positive("x_r", x_r)
    r = (v**2 / s) / np.sqrt(1.0 + xr**2)
    return _out(r + 1j * r * xr)


def refer_impedance_ohm(z_ohm, from_voltage_v, to_voltage_v):
    """Refer an impedance through an ideal transformer ratio: Z · (V_to / V_from)².

    Examples
    --------
    >>> refer_impedance_ohm(0.0092376 + 0j, 480.0, 208.0).real.__round__(7)
    0.0017346
    """
    z = _impedance("z_ohm", z_ohm)
    a = _positive("to_voltage_v", to_voltage_v) / _positive("from_voltage_v", from_voltage_v)
    return _out(z * a**2)


def transformer_fault_impedances_ohm(rating_va, voltage_ll_v, z_pct, x_r, tolerance_pct, phases=3):
    """Transformer impedance for the maximum and the minimum fault case.

    Method: Z = Z_nameplate · (1 ∓ tol/100), lower for the maximum case, upper for the
    minimum (IEEE C57.12.00 tolerance ±7.5 %; ±10 % is a common practice for dry-type
    units). X/R is kept. Uses :func:`feedcheck.calc.transformer.transformer_impedance_ohm`.

    Parameters
    ----------
    rating_va, voltage_ll_v, z_pct, x_r, phases
        As :func:`feedcheck.calc.transformer.transformer_impedance_ohm` [VA, V, %, -, -].
    tolerance_pct : float or array
        Impedance tolerance [%], 0 ≤ tol < 100.

    Returns
    -------
    z_for_max_ohm, z_for_min_ohm : complex or ndarray of complex
        Impedance referred to ``voltage_ll_v`` [Ω].

    Examples
    --------
    >>> zmax, zmin = transformer_fault_impedances_ohm(75e3, 208.0, 5.1, 3.5, 7.5)
    >>> round(abs(zmax) / abs(zmin), 6)
    0.860465
    """
    tol = np.asarray(tolerance_pct, dtype=float)
    if (~np.isfinite(tol) | (tol < 0) | (tol >= 100)).any():
        raise ValueError(f"tolerance_pct must be in [0, 100), got {tolerance_pct!r}")
    z = np.asarray(transformer_impedance_ohm(rating_va, voltage_ll_v, z_pct, x_r, phases))
    return _out(z * (1.0 - tol / 100.0)), _out(z * (1.0 + tol / 100.0))


def branch_impedance_ohm(length_m, r_ohm_per_m, x_ohm_per_m, sets=1):
    """Series impedance of one run per phase: L · (r + jx) / n (n parallel sets).

    Examples
    --------
    >>> z = branch_impedance_ohm(30.0, 0.2067e-3, 0.1673e-3, 1)
    >>> round(z.real, 6), round(z.imag, 6)
    (0.006201, 0.005019)
    """
    length = _nonneg("length_m", length_m)
    r = _nonneg("r_ohm_per_m", r_ohm_per_m)
    x = _nonneg("x_ohm_per_m", x_ohm_per_m)
    n = np.asarray(sets, dtype=float)
    if (~np.isfinite(n) | (n < 1) | (n != np.round(n))).any():
        raise ValueError(f"sets must be a whole number ≥ 1, got {sets!r}")
    return _out(length * (r + 1j * x) / n)


# --------------------------------------------------------------------------- bolted faults


def fault_current_3ph_a(voltage_ll_v, z_total_ohm, c=1.0):
    """Three-phase bolted fault current by the ohmic method.

    Method: I = c · V_LL / (√3 · |Z_total|) (IEEE Std 141 ch. 4; c is the IEC 60909-0
    voltage factor, 1.0 for the plain ohmic method).

    Parameters
    ----------
    voltage_ll_v : float or array
        Nominal line-to-line voltage [V].
    z_total_ohm : complex or array
        Total impedance per phase from the source to the fault [Ω].
    c : float or array
        Voltage factor [-] (IEC 60909-0 Table 1: LV c_max 1.05/1.10, c_min 0.95).

    Returns
    -------
    float or ndarray
        Symmetrical RMS fault current [A].

    Raises
    ------
    ValueError
        For zero impedance (an infinite current) or non-positive voltage or c.

    Examples
    --------
    >>> round(fault_current_3ph_a(208.0, 0.0045 + 0.0120j))
    9370

    References
    ----------
    IEEE Std 141-1993, ch. 4; IEC 60909-0:2016, 5.3.1.
    """
    v = _positive("voltage_ll_v", voltage_ll_v)
    cc = _positive("c", c)
    z = np.abs(_impedance("z_total_ohm", z_total_ohm))
    if (z <= 0).any():
        raise ValueError(
            "z_total_ohm must not be zero: an infinite source needs a "
            "transformer or conductor impedance in the path"
        )
    return _out(cc * v / (SQRT3 * z))


def fault_current_1ph_a(voltage_v, z_loop_ohm, c=1.0):
    """Single-phase (loop) fault current: I = c · V / |Z_loop|.

    ``z_loop_ohm`` is the whole loop: source winding plus the outgoing and the
    returning conductor.

    Examples
    --------
    >>> round(fault_current_1ph_a(240.0, 0.03 + 0.04j))
    4800
    """
    v = _positive("voltage_v", voltage_v)
    cc = _positive("c", c)
    z = np.abs(_impedance("z_loop_ohm", z_loop_ohm))
    if (z <= 0).any():
        raise ValueError("z_loop_ohm must not be zero")
    return _out(cc * v / z)


def x_r_ratio(z_ohm):
    """X/R of an impedance (inf when R = 0).

    Examples
    --------
    >>> round(x_r_ratio(0.01 + 0.035j), 6)
    3.5
    """
    z = _impedance("z_ohm", z_ohm)
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.where(z.real > 0, z.imag / np.where(z.real > 0, z.real, 1.0), np.inf)
    return _out(out)


# --------------------------------------------------------------------------- asymmetry


def peak_factor_kappa(x_r):
    """IEC 60909-0 peak factor κ = 1.02 + 0.98 · e^(−3R/X).

    Limits: κ → 2.0 as R/X → 0, κ → 1.02 for large R/X.

    Examples
    --------
    >>> round(peak_factor_kappa(3.5), 4)
    1.4359

    References
    ----------
    IEC 60909-0:2016, 8.1, equation (55).
    """
    xr = _positive("x_r", x_r, allow_inf=True)
    return _out(1.02 + 0.98 * np.exp(-3.0 / xr))


def peak_current_a(fault_a, x_r):
    """Peak asymmetrical current i_p = κ · √2 · I (IEC 60909-0, 8.1).

    Examples
    --------
    >>> round(peak_current_a(10000.0, 3.5))
    20306
    """
    i = _nonneg("fault_a", fault_a)
    return _out(np.asarray(peak_factor_kappa(x_r)) * math.sqrt(2.0) * i)


def asymmetric_rms_half_cycle_a(fault_a, x_r):
    """RMS asymmetrical current at one half cycle after fault inception.

    Method: with the full DC offset √2·I·e^(−ωt·R/X) (worst closing angle), the total RMS
    at time t is I·√(1 + 2·e^(−2ωt·R/X)); at t = ½ cycle (ωt = π):
    I_asym = I · √(1 + 2·e^(−2π/(X/R))). Limits: I as X/R → 0; √3·I as X/R → ∞.

    Examples
    --------
    >>> round(asymmetric_rms_half_cycle_a(10000.0, 3.5))
    11542

    References
    ----------
    IEEE Std 141-1993, ch. 4 (DC component decaying with the time constant X/(ωR));
    the half-cycle evaluation is the usual low-voltage practice.
    """
    i = _nonneg("fault_a", fault_a)
    xr = _positive("x_r", x_r, allow_inf=True)
    return _out(i * np.sqrt(1.0 + 2.0 * np.exp(-2.0 * np.pi / xr)))


# --------------------------------------------------------------------------- radial walk


def _check_parents(parent_index) -> np.ndarray:
    p = np.asarray(parent_index)
    if p.ndim != 1 or not np.issubdtype(p.dtype, np.integer):
        raise ValueError("parent_index must be a 1-D integer array (−1 for a root)")
    idx = np.arange(p.size)
    if ((p < -1) | (p >= idx)).any():
        bad = int(np.flatnonzero((p < -1) | (p >= idx))[0])
        raise ValueError(
            f"parent_index[{bad}] = {int(p[bad])}: expected −1 (root) or the "
            "index of an earlier node (parents before children)"
        )
    return p.astype(np.intp)


def cumulative_impedance_ohm(parent_index, branch_z_ohm, root_z_ohm=0.0):
    """Total impedance from the source to each node of a radial feed, vectorised.

    Method: pointer jumping. Each node holds the partial sum of branch impedances up to
    (not including) its current ancestor; each pass adds the ancestor's partial sum and
    jumps to the ancestor's ancestor, so the loop runs ⌈log₂(depth + 1)⌉ times with
    numpy fancy indexing and no per-node Python loop.

    Parameters
    ----------
    parent_index : 1-D int array
        Parent of each node, −1 for a root; parents come before children.
    branch_z_ohm : complex array, same length
        Impedance of the branch feeding each node (for a root: what lies between the
        source and that node, e.g. the transformer) [Ω], all referred to one voltage.
    root_z_ohm : complex or complex array
        Source impedance added to every node (scalar), or one value per node of which
        each node takes its root's value [Ω].

    Returns
    -------
    ndarray of complex
        Total impedance source → node [Ω].

    Examples
    --------
    >>> cumulative_impedance_ohm([-1, 0, 1, 0], [1 + 1j, 2 + 0j, 3 + 0j, 4 + 0j], 0.5)
    array([1.5+1.j, 3.5+1.j, 6.5+1.j, 5.5+1.j])
    """
    p = _check_parents(parent_index)
    acc = np.array(_impedance("branch_z_ohm", branch_z_ohm), dtype=complex, copy=True)
    if acc.shape != p.shape:
        raise ValueError("branch_z_ohm must have one value per node")
    root_z = _impedance("root_z_ohm", root_z_ohm)
    anc = np.where(p < 0, np.arange(p.size), p)
    done = p < 0
    while not done.all():
        todo = ~done
        a = anc[todo]
        acc[todo] += acc[a]
        done_new = done.copy()
        done_new[todo] = done[a]
        anc[todo] = anc[a]
        done = done_new
    if root_z.ndim == 0:
        return acc + root_z
    if root_z.shape != p.shape:
        raise ValueError("root_z_ohm must be a scalar or have one value per node")
    return acc + root_z[anc]


def node_depth(parent_index):
    """Depth of each node (0 for a root), vectorised by the same pointer jumping.

    Examples
    --------
    >>> node_depth([-1, 0, 1, 0]).tolist()
    [0, 1, 2, 1]
    """
    p = _check_parents(parent_index)
    d = cumulative_impedance_ohm(p, np.ones(p.size, dtype=complex)).real - 1.0
    return np.rint(d).astype(np.intp)


def subtree_sum(parent_index, values):
    """Sum of ``values`` over each node and all its descendants.

    Method: depth levels from the deepest up, ``np.add.at`` into the parents; the
    Python loop runs once per depth level, not per node.

    Examples
    --------
    >>> subtree_sum([-1, 0, 1, 0], [1.0, 2.0, 3.0, 4.0]).tolist()
    [10.0, 5.0, 3.0, 4.0]
    """
    p = _check_parents(parent_index)
    out = np.array(values, dtype=float, copy=True)
    if out.shape != p.shape:
        raise ValueError("values must have one entry per node")
    depth = node_depth(p)
    top = int(depth.max(initial=0))
    order = np.argsort(depth, kind="stable")
    bounds = np.searchsorted(depth[order], np.arange(top + 2))
    for lvl in range(top, 0, -1):
        nodes = order[bounds[lvl] : bounds[lvl + 1]]
        np.add.at(out, p[nodes], out[nodes])
    return out


def motor_contribution_a(motor_flc_a, multiple):
    """Motor contribution to a fault: multiple × motor full-load current.

    The multiple (4 × FLC) is a common practice, no published source (rule row
    ``fault-motor-multiple`` of ``tables/fault_assumptions.csv``).

    Examples
    --------
    >>> motor_contribution_a(65.0, 4.0)
    260.0
    """
    return _out(_nonneg("motor_flc_a", motor_flc_a) * _positive("multiple", multiple))


@dataclass(frozen=True)
class RadialFault:
    """Three-phase fault figures at every node of a radial feed (arrays, one per node)."""

    z_max_ohm: np.ndarray
    z_min_ohm: np.ndarray
    x_r: np.ndarray
    fault_max_a: np.ndarray
    fault_min_a: np.ndarray
    motor_a: np.ndarray
    peak_a: np.ndarray
    asym_rms_a: np.ndarray
    c_max: float
    c_min: float
    method: str = (
        "ohmic: I = c·V_LL/(√3·|Z|), Z = source + transformer + runs (complex sum); "
        "motor contribution added arithmetically to the maximum"
    )


def radial_fault_3ph(
    parent_index,
    voltage_ll_v,
    branch_z_max_ohm,
    branch_z_min_ohm,
    root_z_max_ohm=0.0,
    root_z_min_ohm=0.0,
    c_max=1.0,
    c_min=1.0,
    motor_a=None,
    base_voltage_ll_v=None,
):
    """Maximum and minimum three-phase fault current at every node of a radial feed.

    Method: total impedance per node by :func:`cumulative_impedance_ohm`; I by
    :func:`fault_current_3ph_a`. Impedances may be referred to one base voltage
    V_b (``base_voltage_ll_v``) across transformers; then I = c·V_b² / (√3·|Z|·V_node).
    Motor contribution: each node gets the sum of the motor contributions connected at
    it and below it, added to the maximum at full magnitude (simplification: the
    impedance between a motor and the fault is neglected — conservative for ratings —
    and motors on sibling branches are not counted). Peak and asymmetrical RMS use the
    node's X/R (maximum case) on the symmetrical maximum including motors.

    Parameters
    ----------
    parent_index : 1-D int array
        Parent of each node, −1 for a root.
    voltage_ll_v : float or array
        Nominal line-to-line voltage of each node [V].
    branch_z_max_ohm, branch_z_min_ohm : complex arrays
        Branch impedance per phase for the maximum case (lower transformer tolerance,
        conductors at 20 °C) and the minimum case [Ω].
    root_z_max_ohm, root_z_min_ohm : complex
        Source impedance for each case [Ω].
    c_max, c_min : float
        Voltage factors [-] (1.0 = plain ohmic; IEC 60909-0: 1.05 or 1.10, and 0.95).
    motor_a : array, optional
        Motor contribution connected at each node [A] (see :func:`motor_contribution_a`).
    base_voltage_ll_v : float, optional
        Voltage all impedances are referred to [V]; default: each node's own voltage.

    Returns
    -------
    RadialFault

    Examples
    --------
    >>> r = radial_fault_3ph([-1, 0], 208.0, [0.01 + 0.03j, 0.01 + 0.005j],
    ...                      [0.012 + 0.035j, 0.013 + 0.005j])
    >>> [round(v) for v in r.fault_max_a]
    [3798, 2979]
    """
    p = _check_parents(parent_index)
    zmax = cumulative_impedance_ohm(p, branch_z_max_ohm, root_z_max_ohm)
    zmin = cumulative_impedance_ohm(p, branch_z_min_ohm, root_z_min_ohm)
    v = np.broadcast_to(_positive("voltage_ll_v", voltage_ll_v), p.shape)
    vb = v if base_voltage_ll_v is None else _positive("base_voltage_ll_v", base_voltage_ll_v)
    scale = vb / v  # I_node = c·V_b/(√3·|Z_b|) · V_b/V_node
    imax = np.asarray(fault_current_3ph_a(vb, zmax, c_max)) * scale
    imin = np.asarray(fault_current_3ph_a(vb, zmin, c_min)) * scale
    motors = np.zeros(p.size) if motor_a is None else subtree_sum(p, _nonneg("motor_a", motor_a))
    imax = imax + motors
    xr = np.asarray(x_r_ratio(zmax))
    return RadialFault(
        zmax,
        zmin,
        xr,
        imax,
        imin,
        motors,
        np.asarray(peak_current_a(imax, xr)),
        np.asarray(asymmetric_rms_half_cycle_a(imax, xr)),
        float(c_max),
        float(c_min),
    )


# --------------------------------------------------------------------------- 120/240 V


def split_phase_source_ohm(z_full_winding_ohm, ln_multiplier):
    """Source impedances of a single-phase 120/240 V centre-tapped secondary.

    Method: line-to-line faults see the full winding, Z_LL = Z_T (ohms at 240 V, from
    :func:`~feedcheck.calc.transformer.transformer_impedance_ohm` with ``phases=1``).
    Line-to-neutral faults at the terminals carry ``ln_multiplier`` × the line-to-line
    current (1.5, common practice; physically 1.33–1.67), so the half-winding impedance
    at 120 V is Z_LN = Z_T / (2·m): V_LN/|Z_LN| = m·V_LL/|Z_T| with V_LL = 2·V_LN.
    Downstream, the line-to-neutral loop is Z_LN + Z_line + Z_neutral — the ohmic
    equivalent of the point-to-point f = 2·L·I/(C·n·V_LN)
    (:func:`feedcheck.calc.point_to_point.ptp_factor`).

    Returns
    -------
    z_ll_ohm, z_ln_ohm : complex

    Examples
    --------
    >>> zll, zln = split_phase_source_ohm(0.06 + 0.03j, 1.5)
    >>> round(zln.real, 6), round(zln.imag, 6)
    (0.02, 0.01)
    """
    z = _impedance("z_full_winding_ohm", z_full_winding_ohm)
    m = _positive("ln_multiplier", ln_multiplier)
    return _out(z), _out(z / (2.0 * m))
