"""Phase loading of a three-phase panel: single-phase and three-phase elements.

Method:

* A three-phase element of apparent power S draws I = S / (√3 · V_LL) on each phase.
* A single-phase element connected line to line draws I = S / V_LL on each of its two
  phases (a 48 kVA single-phase transformer on a 480 V pair: 100 A on both lines).
* A single-phase element connected line to neutral draws I = S / V_LN on its phase.
* The phase current is the arithmetic sum of the magnitudes on that phase. Line-to-line
  and line-to-neutral currents on one phase are up to 30° apart, so the arithmetic sum is
  an upper bound of the phasor sum (equal when the currents on the phase are in phase):
  conservative for conductor, bus and device checks.
* Unspecified connections are assigned greedily (largest load first, input order on
  ties): each line-to-line load to the pair (AB, BC, CA in that order on ties), each
  line-to-neutral load to the phase (A, B, C) that leaves the heaviest phase lightest.
  Deterministic; the caller reports the assignment.
* Design current of the heaviest phase: 125 % of its continuous part plus its
  noncontinuous part (NFPA 70 215.2(A)(1), 210.19(A)(1)), plus 25 % of the largest
  motor current on that phase (430.24; motors are never also "continuous"); the feeder,
  bus, main device and transformer winding are judged on it, not on the balanced average.

References
----------
.. [1] NFPA 70 National Electrical Code 2023, 210.19(A)(1), 215.2(A)(1), 220.61
   (neutral), Informative Annex D (line-to-line loads taken at S / V_LL).
.. [2] IEEE Std 141-1993 (Red Book), ch. 3: voltage drop factors (2 for single-phase
   two-wire, √3 for three-phase).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .constants import SQRT3

CONTINUOUS_FACTOR = 1.25  # 215.2(A)(1), 210.19(A)(1)
PHASES = ("A", "B", "C")
# connection code -> phases loaded (indices); "" = unspecified
CONNECTIONS = {
    "A": (0,),
    "B": (1,),
    "C": (2,),
    "AB": (0, 1),
    "BC": (1, 2),
    "CA": (2, 0),
    "ABC": (0, 1, 2),
}
PAIRS = ("AB", "BC", "CA")
UNSPECIFIED = {"LL": PAIRS, "LN": ("A", "B", "C")}


def element_current_a(load_va, connection, voltage_ll_v):
    """Line current [A] of one element on each phase it loads.

    Parameters
    ----------
    load_va : float or array
        Apparent power of the element [VA].
    connection : str or sequence of str
        ``"ABC"`` three-phase, ``"AB"``/``"BC"``/``"CA"`` single-phase line to line,
        ``"A"``/``"B"``/``"C"`` single-phase line to neutral.
    voltage_ll_v : float
        Panel line-to-line voltage [V].

    Examples
    --------
    >>> round(float(element_current_a(48_000, "AB", 480)), 1)
    100.0
    >>> round(float(element_current_a(48_000, "ABC", 480)), 1)
    57.7
    >>> round(float(element_current_a(11_400, "A", 208)), 1)
    94.9
    """
    s = _nonneg("load_va", load_va)
    v = float(voltage_ll_v)
    if not (math.isfinite(v) and v > 0):
        raise ValueError(f"voltage_ll_v: got {voltage_ll_v!r}; expected a voltage > 0 V")
    conn = np.broadcast_to(np.asarray(connection, dtype=object), s.shape)
    div = np.empty(s.shape)
    bad = np.ones(s.shape, dtype=bool)  # not (yet) a known connection
    for code, ph in CONNECTIONS.items():
        this = conn == code
        div[this] = {1: v / SQRT3, 2: v, 3: SQRT3 * v}[len(ph)]
        bad &= ~this
    if bad.any():
        raise ValueError(
            f"connection: got {conn[bad].ravel()[0]!r}; expected one of {', '.join(CONNECTIONS)}"
        )
    out = s / div
    return out if out.ndim else float(out)


def assign_connections(load_va, connection, voltage_ll_v):
    """Connections with the unspecified ones (``"LL"``, ``"LN"``) assigned to balance.

    Method: the specified elements load the phases first; the unspecified ones follow,
    largest first (input order on ties); each takes the pair or phase, in the order
    AB, BC, CA (A, B, C), that gives the smallest heaviest-phase current, then the
    smallest sum of squares of the phase currents. Deterministic.

    Returns
    -------
    list of str
        The connection of every element (given ones unchanged).

    Examples
    --------
    Invented: three 10 kVA single-phase 480 V loads, pair not given.

    >>> assign_connections([10e3, 10e3, 10e3], ["LL", "LL", "LL"], 480)
    ['AB', 'BC', 'CA']
    """
    s = np.atleast_1d(_nonneg("load_va", load_va))
    conn = [str(c) for c in np.broadcast_to(np.asarray(connection, dtype=object), s.shape)]
    fixed = [i for i, c in enumerate(conn) if c not in UNSPECIFIED]
    phase_a = np.zeros(3)
    if fixed:
        phase_a += phase_currents_a(s[fixed], [conn[i] for i in fixed], voltage_ll_v)
    todo = sorted((i for i, c in enumerate(conn) if c in UNSPECIFIED), key=lambda i: (-s[i], i))
    for i in todo:
        best = None
        for cand in UNSPECIFIED[conn[i]]:
            trial = phase_a.copy()
            trial[list(CONNECTIONS[cand])] += element_current_a(s[i], cand, voltage_ll_v)
            score = (round(trial.max(), 9), round(float((trial**2).sum()), 6))
            if best is None or score < best[0]:
                best = (score, cand, trial)
        conn[i], phase_a = best[1], best[2]
    return conn


def phase_currents_a(load_va, connection, voltage_ll_v):
    """Current [A] on phases A, B, C of a three-phase panel from its elements.

    Parameters
    ----------
    load_va : array, shape (n,)
        Apparent power of each element [VA].
    connection : sequence of str, length n
        Connection of each element (see ``element_current_a``); unspecified ones must
        be assigned first (``assign_connections``).
    voltage_ll_v : float
        Panel line-to-line voltage [V].

    Returns
    -------
    ndarray, shape (3,)
        Arithmetic sum of the element currents on A, B and C [A].

    Examples
    --------
    A 48 kVA single-phase transformer on AB of a 480 V panel:

    >>> [round(float(x), 1) for x in phase_currents_a([48_000], ["AB"], 480)]
    [100.0, 100.0, 0.0]
    """
    s = np.atleast_1d(_nonneg("load_va", load_va))
    conn = np.broadcast_to(np.asarray(connection, dtype=object), s.shape)
    unset = np.isin(conn, list(UNSPECIFIED))
    if unset.any():
        raise ValueError(
            "connection: unspecified (LL/LN) connections must be assigned "
            "first (assign_connections)"
        )
    i = np.atleast_1d(element_current_a(s, conn, voltage_ll_v))
    out = np.zeros(3)
    for code, ph in CONNECTIONS.items():
        m = conn == code
        if m.any():
            out[list(ph)] += i[m].sum()
    return out


@dataclass(frozen=True)
class PhaseLoading:
    """Per-phase currents of a panel and the heaviest phase's design current.

    Attributes
    ----------
    continuous_a, noncontinuous_a : ndarray, shape (3,)
        Continuous and noncontinuous current on A, B, C [A].
    design_a : ndarray, shape (3,)
        125 % of the continuous part + the noncontinuous part, per phase [A].
    heaviest_phase : str
        ``"A"``, ``"B"`` or ``"C"`` (first one on ties).
    design_current_a : float
        Design current of the heaviest phase [A].
    average_a : float
        Mean of the three phase currents (no 125 %) [A].
    imbalance_pct : float
        Largest deviation of a phase current from the mean, over the mean [%].
    connection : tuple of str
        Connection used for every element (after assignment).
    """

    continuous_a: np.ndarray
    noncontinuous_a: np.ndarray
    design_a: np.ndarray
    heaviest_phase: str
    design_current_a: float
    average_a: float
    imbalance_pct: float
    connection: tuple[str, ...]


def phase_loading(load_va, continuous, connection, voltage_ll_v, motor=None) -> PhaseLoading:
    """Phase currents, heaviest-phase design current and imbalance of a panel.

    Parameters
    ----------
    load_va : array, shape (n,)
        Apparent power of each element [VA].
    continuous : array of bool, shape (n,)
        Whether each element is a continuous load (3 h or more).
    connection : sequence of str, length n
        Connection of each element; ``"LL"``/``"LN"`` = unspecified, assigned to balance.
    voltage_ll_v : float
        Panel line-to-line voltage [V].
    motor : array of bool, shape (n,), optional
        Which elements are motors (at their table full-load current). Motors count at
        100 % (never as continuous), and each phase adds 25 % of the largest motor
        current on that phase (430.24), once.

    Returns
    -------
    PhaseLoading

    Examples
    --------
    Invented panel, 208Y/120 V: 11.4 kVA of continuous lighting all on phase A.

    >>> r = phase_loading([11_400], [True], ["A"], 208)
    >>> r.heaviest_phase, round(r.design_current_a, 1), round(r.average_a, 1)
    ('A', 118.7, 31.6)

    References
    ----------
    NFPA 70-2023 215.2(A)(1), 210.19(A)(1).
    """
    s = np.atleast_1d(_nonneg("load_va", load_va))
    cont = np.broadcast_to(np.asarray(continuous, dtype=bool), s.shape)
    mot = (
        np.zeros(s.shape, bool)
        if motor is None
        else np.broadcast_to(np.asarray(motor, dtype=bool), s.shape)
    )
    if (cont & mot).any():
        raise ValueError(
            "continuous: a motor is not also a continuous load (430.24 takes "
            "125 % of the largest motor instead)"
        )
    conn = assign_connections(s, connection, voltage_ll_v)
    c_a = (
        phase_currents_a(s[cont], [c for c, k in zip(conn, cont, strict=True) if k], voltage_ll_v)
        if cont.any()
        else np.zeros(3)
    )
    n_a = (
        phase_currents_a(
            s[~cont], [c for c, k in zip(conn, cont, strict=True) if not k], voltage_ll_v
        )
        if (~cont).any()
        else np.zeros(3)
    )
    largest = np.zeros(3)  # largest motor current on each phase (430.24)
    if mot.any():
        i_m = np.atleast_1d(
            element_current_a(
                s[mot], [c for c, k in zip(conn, mot, strict=True) if k], voltage_ll_v
            )
        )
        for i, c in zip(i_m, (c for c, k in zip(conn, mot, strict=True) if k), strict=True):
            ph = list(CONNECTIONS[c])
            largest[ph] = np.maximum(largest[ph], i)
    design = CONTINUOUS_FACTOR * c_a + n_a + (CONTINUOUS_FACTOR - 1.0) * largest
    total = c_a + n_a
    k = int(np.argmax(design))
    avg = float(total.mean())
    imb = float(np.abs(total - avg).max() / avg * 100.0) if avg > 0 else 0.0
    return PhaseLoading(c_a, n_a, design, PHASES[k], float(design[k]), avg, imb, tuple(conn))


def vdrop_factor(phases):
    """Voltage-drop multiplier of the one-way conductor impedance × current.

    2 for a single-phase two-wire circuit (out and back; also a line-to-line load on
    two phases), √3 for a balanced three-phase circuit (line-to-line drop).

    Examples
    --------
    >>> vdrop_factor(1), round(vdrop_factor(3), 4)
    (2.0, 1.7321)

    References
    ----------
    IEEE Std 141-1993, ch. 3 (voltage drop of single- and three-phase circuits).
    """
    p = np.asarray(phases)
    if not np.isin(p, (1, 3)).all():
        raise ValueError(f"phases: got {phases!r}; expected 1 or 3")
    out = np.where(p == 3, SQRT3, 2.0)
    return out if out.ndim else float(out)


def _nonneg(name, x):
    a = np.asarray(x, dtype=float)
    if not (np.isfinite(a) & (a >= 0)).all():
        raise ValueError(f"{name}: got {x!r}; expected finite values ≥ 0")
    return a
