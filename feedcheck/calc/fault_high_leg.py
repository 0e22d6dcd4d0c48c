"""Line-to-neutral faults of a 240/120 V four-wire delta with a high leg.

The secondary is a delta of three windings (A–B, B–C, C–A) with the neutral at the
midpoint of the C–A winding; B is the high leg, √3/2 · V_LL (208 V on 240 V) to
neutral (NFPA 70-2023 408.3(E)(1) puts it in the B position of panelboards).

Method (network reduction by Thévenin's theorem, IEEE Std 141-1993 ch. 4):

* the source and transformer are given as the per-phase (wye-equivalent) impedance
  Z_Y at the secondary, as the three-phase walk has it; the delta windings that give the
  same three-phase and line-to-line figures are Z_Δ = 3 · Z_Y each, the C–A winding
  split at the neutral into two halves of Z_Δ / 2;
* A (or C) to neutral: open-circuit V_LL / 2; Thévenin impedance
  Z_Δ/2 ∥ (Z_Δ/2 + 2·Z_Δ) = 5/12 · Z_Δ;
* B (high leg) to neutral: open-circuit √3/2 · V_LL; Thévenin impedance
  (Z_Δ + Z_Δ/2) ∥ (Z_Δ + Z_Δ/2) = 3/4 · Z_Δ;
* conductors between the transformer and the fault add the line and the return
  (neutral or grounding conductor) in series: I = c · V_oc / |Z_th + Z_line + Z_return|.

Assumptions: equal winding impedances (one three-phase unit or three equal units; a
larger lighting unit on C–A raises the A and C figures) and each half of the tapped
winding at half its impedance (the half-winding leakage of a centre-tapped unit is
larger, which lowers the figure: the result is an upper bound for the maximum). At the
transformer, A–N is 5/(4·√3) = 0.69 and B–N 2/3 = 0.67 of the three-phase figure.
"""

from __future__ import annotations

import math

import numpy as np

SQRT3 = math.sqrt(3.0)
K_AN = 5.0 / 12.0  # Thévenin share of Z_Δ, A (or C) to neutral
K_BN = 3.0 / 4.0  # Thévenin share of Z_Δ, B (high leg) to neutral


def high_leg_faults_a(voltage_ll_v, z_wye_ohm, z_line_ohm=0.0, z_return_ohm=0.0, c=1.0):
    """Line-to-neutral fault currents [A] of a high-leg delta: (A or C to N, B to N).

    Parameters
    ----------
    voltage_ll_v : float
        Line-to-line voltage of the delta [V] (240).
    z_wye_ohm : complex or array
        Per-phase (wye-equivalent) impedance of source and transformer at the
        secondary terminals [Ω].
    z_line_ohm, z_return_ohm : complex or array
        One line conductor and the return (neutral or grounding conductor) from the
        transformer to the fault [Ω].
    c : float
        Voltage factor (1 nominal).

    Returns
    -------
    i_ac_n_a, i_b_n_a : float or ndarray
        A (or C) to neutral, and B (high leg) to neutral [A].

    Raises
    ------
    ValueError
        Non-positive voltage or factor, or a zero total impedance.

    Examples
    --------
    Invented: 75 kVA, 240 V, 3 %Z at its terminals, infinite bus:
    Z_Y = 0.03 · 240² / 75,000 = 0.02304 Ω; three-phase 240 / (√3 · 0.02304) = 6014 A.

    >>> ia, ib = high_leg_faults_a(240.0, 0.02304)
    >>> round(float(ia)), round(float(ib))
    (4167, 4009)

    References
    ----------
    IEEE Std 141-1993 (Red Book) ch. 4 (network reduction, Thévenin equivalent);
    NFPA 70-2023 408.3(E)(1), 110.15 (the high leg, B, 208 V to neutral).
    """
    v = float(voltage_ll_v)
    if not (math.isfinite(v) and v > 0 and c > 0):
        raise ValueError(f"voltage_ll_v, c: got {voltage_ll_v!r}, {c!r}; expected values > 0")
    zd = 3.0 * np.asarray(z_wye_ohm, complex)
    tail = np.asarray(z_line_ohm, complex) + np.asarray(z_return_ohm, complex)
    z_a = K_AN * zd + tail
    z_b = K_BN * zd + tail
    if np.any(np.abs(z_a) <= 0) or np.any(np.abs(z_b) <= 0):
        raise ValueError("z_wye_ohm: the total impedance to the fault must be above 0 Ω")
    i_a = c * (v / 2.0) / np.abs(z_a)
    i_b = c * (SQRT3 / 2.0 * v) / np.abs(z_b)
    return (i_a if i_a.ndim else float(i_a)), (i_b if i_b.ndim else float(i_b))
