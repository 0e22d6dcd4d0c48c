"""Interrupting duty: the governing fault case, the X/R asymmetry multiplying factor
against a device's test conditions, and the line-to-ground maximum on a delta–wye
secondary.

Pure functions on floats or numpy arrays in SI units; impedances are complex ohms. The
device test power factors are data (``tables/device_test_power_factor.csv``); the caller
passes the chosen row's test X/R and rating basis.

References
----------
.. [1] IEEE Std 1015-2006 (Blue Book), Recommended practice for applying low-voltage
   circuit breakers, ch. 5 (interrupting ratings, test power factors, multiplying factors).
.. [2] IEEE Std 242-2001 (Buff Book), ch. 5 and 7 (devices rated on a symmetrical basis,
   X/R above the test X/R).
.. [3] IEEE Std C37.13-2008, Low-voltage AC power circuit breakers used in enclosures
   (test power factor 15 % unfused, 20 % fused; multiplying factor on the half-cycle RMS).
.. [4] UL 489, Molded-case circuit breakers (test power factor by interrupting rating).
.. [5] IEEE Std 141-1993 (Red Book), ch. 4 (symmetrical components; delta–wye sequence
   networks).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .fault import _impedance, _out, _positive

FAULT_CASES = ("3ph", "ll", "ln", "lg")
RATING_BASES = ("peak", "rms")


@dataclass(frozen=True)
class GoverningDuty:
    """The largest maximum fault current and the case that gives it.

    ``duty_a`` [A]; ``case`` the governing case name (``"3ph"``, ``"ll"``, ``"ln"`` or
    ``"lg"``; an array of names for array input); ``cases`` the names compared.
    """

    duty_a: np.ndarray | float
    case: np.ndarray | str
    cases: tuple[str, ...]


def governing_duty_a(fault_3ph_a=None, fault_ll_a=None, fault_ln_a=None, fault_lg_a=None):
    """Governing maximum duty: the largest of the three-phase, line-to-line,
    line-to-neutral and line-to-ground maxima.

    Method: equipment is held against the worst case the method gives (NFPA 70-2023 110.9,
    110.10 and 110.24 name the available fault current without naming a fault type; IEEE
    Std 1015 ch. 5 applies the rating to the highest current of any fault type). A case
    that does not exist on the system (three-phase on a 120/240 V single-phase secondary,
    line-to-neutral on a three-wire delta) is passed as ``None``. On ties the earlier case
    in the order 3ph, ll, ln, lg is named.

    Parameters
    ----------
    fault_3ph_a, fault_ll_a, fault_ln_a, fault_lg_a : float, array or None
        Maximum symmetrical RMS fault currents [A]; arrays broadcast together.

    Returns
    -------
    GoverningDuty

    Raises
    ------
    ValueError
        When every case is ``None``, or a value is negative or not a number.

    Examples
    --------
    >>> d = governing_duty_a(fault_ll_a=37600.0, fault_ln_a=61000.0)
    >>> d.duty_a, d.case
    (61000.0, 'ln')
    >>> governing_duty_a([4150.0, 9000.0], None, None, [4448.0, 8000.0]).case.tolist()
    ['lg', '3ph']
    """
    given = [
        (n, v)
        for n, v in zip(FAULT_CASES, (fault_3ph_a, fault_ll_a, fault_ln_a, fault_lg_a), strict=True)
        if v is not None
    ]
    if not given:
        raise ValueError(
            "at least one fault case is needed (three-phase, line-to-line, "
            "line-to-neutral or line-to-ground)"
        )
    names = tuple(n for n, _ in given)
    if all(type(v) in (float, np.float64) for _, v in given):  # one node: in Python
        for n, v in given:
            if not (math.isfinite(v) and v >= 0):
                raise ValueError(f"fault_{n}_a must be finite numbers not below zero, got {v!r}")
        k = max(range(len(given)), key=lambda i: (given[i][1], -i))  # first of the largest
        return GoverningDuty(float(given[k][1]), names[k], names)
    arrs = []
    for n, v in given:
        a = np.asarray(v, dtype=float)
        if (~np.isfinite(a) | (a < 0)).any():
            raise ValueError(f"fault_{n}_a must be finite numbers not below zero, got {v!r}")
        arrs.append(a)
    stack = np.stack(np.broadcast_arrays(*arrs))
    idx = np.argmax(stack, axis=0)
    duty = np.take_along_axis(stack, idx[None, ...], axis=0)[0]
    case = np.asarray(names, dtype=object)[idx]
    if np.ndim(idx) == 0:
        return GoverningDuty(float(duty), str(case), names)
    return GoverningDuty(duty, case, names)


def x_r_from_power_factor(pf):
    """X/R of a test circuit from its power factor: X/R = √(1 − pf²) / pf.

    Examples
    --------
    >>> round(x_r_from_power_factor(0.20), 3), round(x_r_from_power_factor(0.15), 3)
    (4.899, 6.591)
    """
    p = np.asarray(pf, dtype=float)
    if (~np.isfinite(p) | (p <= 0) | (p > 1)).any():
        raise ValueError(f"pf must be in (0, 1], got {pf!r}")
    return _out(np.sqrt(1.0 - p**2) / p)


def _peak_ratio(xr):
    """1 + e^(−π/(X/R)): peak over √2·I_sym at the half cycle, full offset."""
    return 1.0 + np.exp(-np.pi / xr)


def _rms_ratio(xr):
    """√(1 + 2e^(−2π/(X/R))): half-cycle total RMS over I_sym, full offset."""
    return np.sqrt(1.0 + 2.0 * np.exp(-2.0 * np.pi / xr))


def asymmetry_multiplying_factor(x_r, test_x_r, basis):
    """Multiplying factor on the symmetrical fault current when the system X/R is above
    the device's test X/R.

    Method (IEEE Std 1015-2006 ch. 5; IEEE Std 242-2001; IEEE Std C37.13-2008):

    * devices rated on peak (molded-case and insulated-case breakers, UL 489):
      MF = (1 + e^(−π/(X/R))) / (1 + e^(−π/(X/R)_test));
    * devices rated on the half-cycle RMS asymmetrical current (low-voltage power circuit
      breakers, IEEE C37.13; low-voltage fuses):
      MF = √(1 + 2e^(−2π/(X/R))) / √(1 + 2e^(−2π/(X/R)_test));

    MF is floored at 1 (a lower X/R than the test circuit earns no credit).

    Parameters
    ----------
    x_r : float or array
        X/R of the fault at the device's line terminals [-] (``inf`` allowed).
    test_x_r : float or array
        X/R of the device's test circuit [-] (from its test power factor).
    basis : {"peak", "rms"} or array of them
        What the device's rating rests on.

    Returns
    -------
    float or ndarray
        MF ≥ 1 [-]; the duty to compare with the rating is MF × I_sym.

    Examples
    --------
    >>> round(asymmetry_multiplying_factor(7.0, 4.9, "peak"), 3)
    1.073
    >>> round(asymmetry_multiplying_factor(7.0, 6.6, "rms"), 3)
    1.012
    >>> asymmetry_multiplying_factor(3.0, 4.9, "peak")
    1.0
    """
    xr = _positive("x_r", x_r, allow_inf=True)
    xt = _positive("test_x_r", test_x_r)
    b = np.asarray(basis, dtype=object)
    bad = ~np.isin(b, RATING_BASES)
    if bad.any():
        raise ValueError(f"basis must be one of {RATING_BASES}, got {basis!r}")
    peak = _peak_ratio(xr) / _peak_ratio(xt)
    rms = _rms_ratio(xr) / _rms_ratio(xt)
    mf = np.where(b == "peak", peak, rms).astype(float)
    return _out(np.maximum(mf, 1.0))


@dataclass(frozen=True)
class TestConditionRow:
    """One row of the device test-condition table (passed in by the caller).

    ``family`` device family key; ``above_a``/``up_to_a`` the interrupting-rating band
    (above, at most) [A]; ``test_pf``; ``test_x_r``; ``basis`` "peak" or "rms";
    ``rule_id``.
    """

    family: str
    above_a: float
    up_to_a: float
    test_pf: float
    test_x_r: float
    basis: str
    rule_id: str

    @classmethod
    def from_record(cls, r) -> TestConditionRow:
        """Build from one row of ``tables/device_test_power_factor.csv`` as a dict."""
        return cls(
            str(r["family"]),
            float(r["above_a"]),
            float(r["up_to_a"]),
            float(r["test_pf"]),
            float(r["test_x_r"]),
            str(r["rating_basis"]),
            str(r["rule_id"]),
        )


def test_condition_row(family: str, interrupting_a: float, rows) -> TestConditionRow:
    """The test-condition row for a device family and interrupting rating.

    Examples
    --------
    >>> rows = [TestConditionRow("mccb", 0, 10e3, 0.5, 1.732, "peak", "a"),
    ...         TestConditionRow("mccb", 10e3, 20e3, 0.3, 3.18, "peak", "b")]
    >>> test_condition_row("mccb", 14e3, rows).rule_id
    'b'
    """
    i = float(interrupting_a)
    if not np.isfinite(i) or i <= 0:
        raise ValueError(f"interrupting_a must be a positive number, got {interrupting_a!r}")
    hits = [r for r in rows if r.family == family and r.above_a < i <= r.up_to_a]
    if not hits:
        known = sorted({r.family for r in rows})
        raise ValueError(
            f"no test-condition row for family {family!r} at {i:g} A (families: {', '.join(known)})"
        )
    return hits[0]


test_condition_row.__test__ = False  # not a pytest test despite its name
TestConditionRow.__test__ = False


def fault_lg_delta_wye_a(
    voltage_ln_v, z_source_ohm, z_transformer_ohm, z0_ratio, z_phase_ohm=0j, z_return_ohm=0j, c=1.0
):
    """Bolted line-to-ground fault at or downstream of a delta–wye transformer's
    grounded secondary, honouring a given zero-sequence ratio.

    Method: symmetrical components, I_LG = 3·c·V_LN / |Z1 + Z2 + Z0| with Z2 = Z1
    (IEEE Std 141 ch. 4; IEC 60909-0 7.1.3). The delta winding blocks the source's zero
    sequence, so Z0 at the secondary is the transformer's alone: Z0_T = ratio · Z1_T. A run
    whose fault current returns on one conductor adds Z_phase to Z1 and Z2 and
    Z_phase + 3·Z_return to Z0. With ratio < 1 the terminal line-to-ground current exceeds
    the three-phase one.

    Parameters
    ----------
    voltage_ln_v : float or array
        Line-to-neutral voltage [V].
    z_source_ohm : complex or array
        Source positive-sequence impedance referred to the secondary [Ω].
    z_transformer_ohm : complex or array
        Transformer positive-sequence impedance, tolerance for the case applied [Ω].
    z0_ratio : float or array
        Z0_T / Z1_T [-] (for the maximum the lower figure, for the minimum the upper).
    z_phase_ohm, z_return_ohm : complex or array
        Phase and return-conductor impedance from the terminals to the fault (parallel
        sets divided) [Ω].
    c : float or array
        Voltage factor [-].

    Returns
    -------
    float or ndarray
        Symmetrical RMS line-to-ground current [A].

    Examples
    --------
    >>> round(fault_lg_delta_wye_a(120.0, 0.0005 + 0.002j, 0.006 + 0.02j, 0.85))
    5658
    """
    v = _positive("voltage_ln_v", voltage_ln_v)
    zs = np.asarray(_impedance("z_source_ohm", z_source_ohm))
    zt = np.asarray(_impedance("z_transformer_ohm", z_transformer_ohm))
    k = _positive("z0_ratio", z0_ratio)
    zp = np.asarray(_impedance("z_phase_ohm", z_phase_ohm))
    zr = np.asarray(_impedance("z_return_ohm", z_return_ohm))
    z1 = zs + zt + zp
    z0 = k * zt + zp + 3.0 * zr
    z = np.abs(2.0 * z1 + z0)
    if (z <= 0).any():
        raise ValueError("z1 + z2 + z0 must not be zero")
    return _out(3.0 * _positive("c", c) * v / z)
