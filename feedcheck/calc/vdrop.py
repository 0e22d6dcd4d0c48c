"""Voltage drop along conductor runs: approximate and exact phasor forms, the longest
run within a limit, the smallest conductor within a limit, and the cumulative drop
profile of a feed (motor-starting voltage: :mod:`feedcheck.calc.motor_starting`).

All kernels take plain floats or numpy arrays in SI units (A, V, Ω, Ω/m, m) and return
the broadcast shape of their inputs (a float for all-scalar input).

Circuit kinds and the factor ``k`` that turns one conductor's drop into the circuit's:

========  ===  ==============================================================
circuit   k    drop returned, and the nominal voltage to take a percent of
========  ===  ==============================================================
``3ph``   √3   three-phase balanced load; line-to-line drop (of ``V_LL``)
``1ph2w`` 2    single-phase two-wire (outgoing + return); drop of the supply
               voltage across the load
``1ph3w`` 2    single-phase three-wire 120/240 V, balanced: the neutral
               carries no current, so the line-to-line (240 V) drop is twice
               one line conductor's drop. An unbalanced 120 V load on it is a
               ``ln4w``-style two-wire loop (k = 2 on the 120 V drop)
``ln4w``  2    line-to-neutral load on a three-phase four-wire system; the
               neutral (taken as the same size as the phase conductor)
               carries the full return current; drop of ``V_LN``
========  ===  ==============================================================

References
----------
.. [1] IEEE Std 141-1993 (Red Book), Recommended Practice for Electric Power
   Distribution for Industrial Plants, ch. 3 (voltage drop V = I(R cos θ + X sin θ)).
.. [2] UFC 3-520-01, Interior Electrical Systems (2002), Appendix B-2.1: voltage drop
   = I_L (R cos θ + X sin θ), with R and X from NFPA 70 Ch. 9 Tables 8 and 9.
.. [3] NFPA 70 (2023), Chapter 9 Table 9, Note 2: I × effective impedance
   (R cos θ + X sin θ) approximates the line-to-neutral drop.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from . import vdrop_scalar as _sc
from .constants import SQRT3

#: Factor from one conductor's drop to the circuit's drop (see the module table).
CIRCUIT_FACTORS: dict[str, float] = {"3ph": SQRT3, "1ph2w": 2.0, "1ph3w": 2.0, "ln4w": 2.0}


def _out(x):
    """A float for a 0-d result, else the array."""
    x = np.asarray(x)
    return x if x.ndim else x.item()


def _finite(name: str, value, *, minimum: float | None = 0.0, strict: bool = False):
    a = np.asarray(value, dtype=float)
    if not np.all(np.isfinite(a)):
        raise ValueError(f"{name} must be finite, got {value!r}")
    if minimum is not None:
        bad = a <= minimum if strict else a < minimum
        if np.any(bad):
            rel = ">" if strict else "≥"
            raise ValueError(f"{name} must be {rel} {minimum:g}, got {value!r}")
    return a


def circuit_factor(circuit) -> float | np.ndarray:
    """Factor k from one conductor's drop to the circuit's drop.

    Parameters
    ----------
    circuit : str or array of str
        ``"3ph"``, ``"1ph2w"``, ``"1ph3w"`` or ``"ln4w"`` (see the module notes).

    Returns
    -------
    float or ndarray
        √3 for ``3ph``; 2 for the others.

    Raises
    ------
    ValueError
        For an unknown circuit kind.

    Examples
    --------
    >>> round(circuit_factor("3ph"), 4)
    1.7321
    >>> circuit_factor(["1ph2w", "ln4w"]).tolist()
    [2.0, 2.0]
    """
    if isinstance(circuit, str):
        if circuit not in CIRCUIT_FACTORS:
            raise ValueError(
                f"circuit must be one of {', '.join(CIRCUIT_FACTORS)}; got {circuit!r}"
            )
        return CIRCUIT_FACTORS[circuit]
    arr = np.asarray(circuit)
    kinds, inverse = np.unique(arr, return_inverse=True)
    bad = [str(k) for k in kinds if str(k) not in CIRCUIT_FACTORS]
    if bad:
        raise ValueError(f"circuit must be one of {', '.join(CIRCUIT_FACTORS)}; got {bad!r}")
    factors = np.array([CIRCUIT_FACTORS[str(k)] for k in kinds])
    return factors[inverse].reshape(arr.shape)


def _cos_sin(pf):
    """cos θ and sin θ from a power factor; negative pf = leading (sin θ < 0)."""
    p = _finite("pf", pf, minimum=None)
    if np.any(np.abs(p) > 1.0):
        raise ValueError(f"pf must be between -1 and 1 (negative = leading), got {pf!r}")
    cos = np.abs(p)
    sin = np.where(p < 0, -1.0, 1.0) * np.sqrt(1.0 - p**2)
    return cos, sin


def _sets(sets):
    s = np.asarray(sets, dtype=float)
    if np.any(~np.isfinite(s)) or np.any(s < 1) or np.any(s != np.round(s)):
        raise ValueError(f"sets must be a whole number ≥ 1, got {sets!r}")
    return s


def circuit_of_system(kind: str, phases: int) -> str:
    """Circuit kind of the approximate and exact forms for a system voltage: ``1ph3w`` for a
    120/240 V single-phase three-wire system (``kind`` ``"split"``), ``1ph2w`` for a
    single-phase two-wire one, ``3ph`` otherwise.

    Examples
    --------
    >>> circuit_of_system("split", 1), circuit_of_system("wye", 3)
    ('1ph3w', '3ph')
    """
    return {"split": "1ph3w", "single": "1ph2w"}.get(kind, "3ph" if phases == 3 else "1ph2w")


def voltage_drop_approximate_v(
    current_a, r_ohm_per_m, x_ohm_per_m, length_m, pf, circuit="3ph", sets=1
):
    """Voltage drop by the approximate (effective-impedance) form.

    Method of IEEE Std 141 ch. 3 and UFC 3-520-01 B-2.1: one conductor drops
    I (R cos θ + X sin θ); the circuit factor k (√3 or 2) gives the circuit's drop.

    Parameters
    ----------
    current_a : float or array
        Load current [A], not negative.
    r_ohm_per_m, x_ohm_per_m : float or array
        AC resistance and reactance of one conductor of one set [Ω/m].
    length_m : float or array
        One-way run length [m].
    pf : float or array
        Load power factor [-]; positive lagging, negative leading.
    circuit : str or array of str
        ``"3ph"``, ``"1ph2w"``, ``"1ph3w"`` or ``"ln4w"`` (module notes).
    sets : int or array
        Conductors in parallel per phase; they divide the impedance.

    Returns
    -------
    vdrop_v : float or ndarray
        Drop [V]: line-to-line for ``3ph`` and ``1ph3w``, of the supply for ``1ph2w``,
        line-to-neutral for ``ln4w``. Negative means a rise (leading load).

    Raises
    ------
    ValueError
        Negative or non-finite inputs, |pf| > 1, unknown circuit, sets < 1.

    Notes
    -----
    VD = k · I · (R cos θ + X sin θ) · L / sets. It neglects the quadrature part of the
    drop, which the exact form keeps; the two agree closely while the drop is a few
    percent (see :func:`voltage_drop_exact_v`).

    Examples
    --------
    250 kcmil Cu in steel conduit, NFPA 70 Ch. 9 Table 9 (0.054 / 0.052 Ω per 1000 ft),
    100 A at pf 0.85 over 1000 ft, three-phase:

    >>> from feedcheck.calc.constants import M_PER_FT as ft
    >>> vd = voltage_drop_approximate_v(100, 0.054 / 1000 / ft, 0.052 / 1000 / ft,
    ...                                 1000 * ft, 0.85, "3ph")
    >>> round(vd, 2)
    12.69

    References
    ----------
    IEEE Std 141-1993 ch. 3; UFC 3-520-01 (2002) App. B-2.1; NFPA 70-2023 Ch. 9
    Table 9 Note 2.
    """
    if _sc.plain(current_a, r_ohm_per_m, x_ohm_per_m, length_m, pf):  # one figure
        k = CIRCUIT_FACTORS.get(circuit) if isinstance(circuit, str) else None
        v = _sc.approximate_v(current_a, r_ohm_per_m, x_ohm_per_m, length_m, pf, k, sets)
        if v is not None:
            return v
    i = _finite("current_a", current_a)
    r = _finite("r_ohm_per_m", r_ohm_per_m)
    x = _finite("x_ohm_per_m", x_ohm_per_m)
    length = _finite("length_m", length_m)
    cos, sin = _cos_sin(pf)
    k = circuit_factor(circuit)
    return _out(k * i * (r * cos + x * sin) * length / _sets(sets))


def voltage_drop_pct(vdrop_v, nominal_v):
    """A drop as a percent of a nominal voltage.

    Parameters
    ----------
    vdrop_v : float or array
        Drop [V].
    nominal_v : float or array
        Nominal voltage the drop is measured against [V] (line-to-line for ``3ph`` and
        ``1ph3w``, the supply for ``1ph2w``, line-to-neutral for ``ln4w``), > 0.

    Returns
    -------
    vdrop_pct : float or ndarray
        100 · vdrop_v / nominal_v [%].

    Examples
    --------
    >>> voltage_drop_pct(6.24, 208)
    3.0
    """
    vn = _finite("nominal_v", nominal_v, strict=True)
    vd = _finite("vdrop_v", vdrop_v, minimum=None)
    return _out(100.0 * vd / vn)


def _exact_terms(current_a, r_ohm, x_ohm, pf):
    i = _finite("current_a", current_a)
    r = _finite("r_ohm", r_ohm)
    x = _finite("x_ohm", x_ohm)
    cos, sin = _cos_sin(pf)
    along = i * (r * cos + x * sin)  # in phase with the receiving voltage
    across = i * (x * cos - r * sin)  # in quadrature
    return along, across


def receiving_voltage_exact_v(sending_v, current_a, r_ohm, x_ohm, pf):
    """Receiving-end voltage of one phase by the exact phasor form, sending end fixed.

    Parameters
    ----------
    sending_v : float or array
        Sending-end voltage, line-to-neutral [V], > 0.
    current_a : float or array
        Load current [A], its magnitude held fixed.
    r_ohm, x_ohm : float or array
        Total resistance and reactance of the path, per phase [Ω].
    pf : float or array
        Load power factor at the receiving end [-]; positive lagging, negative leading.

    Returns
    -------
    receiving_v : float or ndarray
        Line-to-neutral voltage at the load [V].

    Raises
    ------
    ValueError
        When the load cannot be delivered: the radicand below is negative, or the
        receiving voltage would not be positive.

    Notes
    -----
    With the receiving voltage E_r as reference and the current lagging it by θ,
    E_s² = (E_r + IR cos θ + IX sin θ)² + (IX cos θ − IR sin θ)², hence
    E_r = √(E_s² − (IX cos θ − IR sin θ)²) − IR cos θ − IX sin θ.

    Examples
    --------
    >>> round(receiving_voltage_exact_v(277, 200, 0.02, 0.01, 0.85), 4)
    272.5461

    References
    ----------
    IEEE Std 141-1993 ch. 3 (exact voltage-drop relation of the phasor diagram).
    """
    es = _finite("sending_v", sending_v, strict=True)
    along, across = _exact_terms(current_a, r_ohm, x_ohm, pf)
    rad = es**2 - across**2
    if np.any(rad < 0):
        raise ValueError(
            "the load cannot be delivered: the quadrature drop "
            "I(X cos θ − R sin θ) exceeds the sending voltage"
        )
    er = np.sqrt(rad) - along
    if np.any(er <= 0):
        raise ValueError(
            "the load cannot be delivered: the drop reaches the whole "
            "sending voltage (impedance or current too large)"
        )
    return _out(er)


def voltage_drop_exact_v(sending_v, current_a, r_ohm, x_ohm, pf):
    """Voltage drop of one phase by the exact phasor form: E_s − E_r.

    VD = E_s + IR cos θ + IX sin θ − √(E_s² − (IX cos θ − IR sin θ)²).

    Parameters are those of :func:`receiving_voltage_exact_v`; the result is the
    line-to-neutral drop [V].

    Examples
    --------
    >>> round(voltage_drop_exact_v(277, 200, 0.02, 0.01, 0.85), 4)
    4.4539

    References
    ----------
    IEEE Std 141-1993 ch. 3.
    """
    es = _finite("sending_v", sending_v, strict=True)
    return _out(es - receiving_voltage_exact_v(sending_v, current_a, r_ohm, x_ohm, pf))


def voltage_drop_exact_circuit_v(
    sending_v, current_a, r_ohm_per_m, x_ohm_per_m, length_m, pf, circuit="3ph", sets=1
):
    """Circuit drop by the exact phasor form, for the circuit kinds of the approximate form.

    Parameters
    ----------
    sending_v : float or array
        The circuit's nominal (sending) voltage [V]: line-to-line for ``3ph`` and
        ``1ph3w``, the supply for ``1ph2w``, line-to-neutral for ``ln4w``.
    current_a, r_ohm_per_m, x_ohm_per_m, length_m, pf, circuit, sets
        As in :func:`voltage_drop_approximate_v`.

    Returns
    -------
    vdrop_v : float or ndarray
        Drop [V], measured like ``sending_v``.

    Notes
    -----
    k · VD_exact(E/k, I, R, X) with R, X = r·L/sets, x·L/sets. For ``3ph`` this is √3 ×
    the per-phase drop at E_LN = E_LL/√3; for the two-wire loops it equals the exact
    drop of the whole loop (2R, 2X) at the full voltage, since the exact drop is
    homogeneous of degree one in (E, R, X). For ``1ph3w`` (balanced) each line drops
    against its 120 V half.

    Examples
    --------
    >>> round(voltage_drop_exact_circuit_v(480 * 3**0.5, 200, 1e-4, 5e-5, 200, 0.85), 3)
    7.714
    """
    if _sc.plain(sending_v, current_a, r_ohm_per_m, x_ohm_per_m, length_m, pf):  # one figure
        k = CIRCUIT_FACTORS.get(circuit) if isinstance(circuit, str) else None
        args = (sending_v, current_a, r_ohm_per_m, x_ohm_per_m, length_m, pf, k, sets)
        v = _sc.exact_circuit_v(*args)
        if v is not None:
            return v
    k = circuit_factor(circuit)
    s = _sets(sets)
    length = _finite("length_m", length_m)
    r = _finite("r_ohm_per_m", r_ohm_per_m) * length / s
    x = _finite("x_ohm_per_m", x_ohm_per_m) * length / s
    es = _finite("sending_v", sending_v, strict=True)
    return _out(k * voltage_drop_exact_v(es / k, current_a, r, x, pf))


def max_length_m(current_a, r_ohm_per_m, x_ohm_per_m, pf, limit_v, circuit="3ph", sets=1):
    """Longest one-way run whose approximate drop stays within a limit.

    The inverse of :func:`voltage_drop_approximate_v` in length:
    L = limit · sets / (k · I · (R cos θ + X sin θ)).

    Parameters
    ----------
    current_a, r_ohm_per_m, x_ohm_per_m, pf, circuit, sets
        As in :func:`voltage_drop_approximate_v`.
    limit_v : float or array
        Permitted drop [V] (e.g. 3 % of the nominal voltage), > 0.

    Returns
    -------
    length_m : float or ndarray
        Longest run [m]; ``inf`` where the drop does not grow with length (no current,
        or a leading load whose effective impedance is not positive).

    Examples
    --------
    >>> from feedcheck.calc.constants import M_PER_FT as ft
    >>> round(max_length_m(100, 0.054 / 1000 / ft, 0.052 / 1000 / ft, 0.85, 12.69) / ft)
    1000
    """
    i = _finite("current_a", current_a)
    r = _finite("r_ohm_per_m", r_ohm_per_m)
    x = _finite("x_ohm_per_m", x_ohm_per_m)
    lim = _finite("limit_v", limit_v, strict=True)
    cos, sin = _cos_sin(pf)
    per_m = circuit_factor(circuit) * i * (r * cos + x * sin) / _sets(sets)
    with np.errstate(divide="ignore"):
        out = np.where(per_m > 0, lim / np.where(per_m > 0, per_m, 1.0), np.inf)
    return _out(out)


def min_conductor_index(
    current_a, r_ohm_per_m, x_ohm_per_m, length_m, pf, limit_v, circuit="3ph", sets=1
):
    """Index of the smallest candidate conductor whose approximate drop meets a limit.

    Parameters
    ----------
    current_a, length_m, pf, limit_v, circuit, sets : float or array
        As in :func:`voltage_drop_approximate_v` and :func:`max_length_m`; they
        broadcast together to the shape of the result.
    r_ohm_per_m, x_ohm_per_m : array, shape (..., n)
        Candidates along the last axis, smallest conductor first [Ω/m].

    Returns
    -------
    index : int or ndarray of int
        Index of the first candidate with drop ≤ limit; −1 when none meets it.

    Examples
    --------
    NFPA 70 Ch. 9 Table 9, Cu in steel, 2/0 … 250 kcmil (Ω per 1000 ft):

    >>> from feedcheck.calc.constants import M_PER_FT as ft
    >>> r = [0.10, 0.079, 0.063, 0.054]
    >>> x = [0.054, 0.052, 0.051, 0.052]
    >>> per_m = lambda v: [c / 1000 / ft for c in v]
    >>> min_conductor_index(150, per_m(r), per_m(x), 250 * ft, 0.85, 0.03 * 208)
    1
    """
    r = _finite("r_ohm_per_m", r_ohm_per_m)
    x = _finite("x_ohm_per_m", x_ohm_per_m)
    if r.ndim == 0 or r.shape[-1] == 0:
        raise ValueError("r_ohm_per_m must list at least one candidate along its last axis")
    lim = _finite("limit_v", limit_v, strict=True)
    i = _finite("current_a", current_a)[..., None]
    length = _finite("length_m", length_m)[..., None]
    cos, sin = _cos_sin(pf)
    k = np.asarray(circuit_factor(circuit))[..., None]
    s = _sets(sets)[..., None]
    drop = k * i * (r * cos[..., None] + x * sin[..., None]) * length / s
    lim_e = lim[..., None]
    ok = np.asarray(drop) <= lim_e * (1.0 + 1e-12)
    idx = np.where(ok.any(axis=-1), ok.argmax(axis=-1), -1)
    return idx if idx.ndim else int(idx)


@dataclass(frozen=True)
class VoltageProfile:
    """Cumulative drop and distance from the source for each node of a feed.

    Attributes
    ----------
    node_ids : tuple of str
        Node ids in the given (topological) order.
    drop_pct : ndarray, shape (..., n)
        Drop from the source to the node [%], the sum of the branch drops on the path.
    distance_m : ndarray, shape (..., n)
        Run length from the source to the node [m].
    """

    node_ids: tuple[str, ...]
    drop_pct: np.ndarray
    distance_m: np.ndarray

    def at(self, node_id: str) -> tuple[float | np.ndarray, float | np.ndarray]:
        """(drop_pct, distance_m) of one node."""
        j = self.node_ids.index(node_id)
        return _out(self.drop_pct[..., j]), _out(self.distance_m[..., j])


def voltage_profile(node_ids, parent_index, branch_drop_pct, branch_length_m) -> VoltageProfile:
    """Cumulative drop and distance along a tree of runs (source → panels → circuits).

    Parameters
    ----------
    node_ids : sequence of str
        One id per node, unique, parents listed before their children.
    parent_index : sequence of int
        Index of each node's parent in ``node_ids``; −1 for a node fed from the source.
    branch_drop_pct : array, shape (..., n)
        Drop of the branch that feeds each node [%] (for a transformer node, its
        regulation); each as a percent of its own nominal voltage, so percents add
        across transformers. Leading axes evaluate several cases at once.
    branch_length_m : array, shape (..., n)
        Length of the branch feeding each node [m] (0 for a transformer).

    Returns
    -------
    VoltageProfile
        ``drop_pct[i] = branch_drop_pct[i] + drop_pct[parent[i]]``, likewise distance.

    Raises
    ------
    ValueError
        Duplicate ids, a parent not listed before its child, mismatched lengths,
        non-finite drops, negative lengths.

    Notes
    -----
    Vectorised by pointer jumping: each pass adds the ancestor's running sum and
    jumps to the ancestor's ancestor, so a depth-d tree takes ⌈log2 d⌉ passes.

    Examples
    --------
    >>> p = voltage_profile(["T1", "LP1", "LP1/1", "LP2"], [-1, 0, 1, 0],
    ...                     [1.8, 1.1, 2.0, 0.4], [0.0, 30.0, 25.0, 12.0])
    >>> [round(v, 3) for v in p.drop_pct.tolist()]
    [1.8, 2.9, 4.9, 2.2]
    >>> p.distance_m.tolist()
    [0.0, 30.0, 55.0, 12.0]
    """
    ids = tuple(str(n) for n in node_ids)
    n = len(ids)
    if len(set(ids)) != n:
        raise ValueError("node_ids must be unique")
    parent = np.asarray(parent_index)
    if parent.shape != (n,) or (n and not np.issubdtype(parent.dtype, np.integer)):
        raise ValueError(f"parent_index must be {n} whole numbers, one per node")
    if np.any(parent < -1) or np.any(parent >= np.arange(n)):
        raise ValueError(
            "each parent_index must be −1 or the index of an earlier node (parents listed first)"
        )
    drop = _finite("branch_drop_pct", branch_drop_pct, minimum=None)
    dist = _finite("branch_length_m", branch_length_m)
    drop, dist = np.broadcast_arrays(drop, dist)
    if drop.ndim == 0 or drop.shape[-1] != n:
        raise ValueError(f"branch_drop_pct and branch_length_m need {n} values on the last axis")
    acc_d, acc_l, anc = drop.astype(float), dist.astype(float), parent.astype(np.intp)
    while np.any(anc >= 0):
        has = anc >= 0
        up = np.where(has, anc, 0)
        acc_d = acc_d + np.where(has, acc_d[..., up], 0.0)
        acc_l = acc_l + np.where(has, acc_l[..., up], 0.0)
        anc = np.where(has, anc[up], -1)
    return VoltageProfile(ids, acc_d, acc_l)


__all__ = [
    "CIRCUIT_FACTORS",
    "VoltageProfile",
    "circuit_factor",
    "max_length_m",
    "min_conductor_index",
    "receiving_voltage_exact_v",
    "voltage_drop_approximate_v",
    "voltage_drop_exact_circuit_v",
    "voltage_drop_exact_v",
    "voltage_drop_pct",
    "voltage_profile",
]
