"""Current from apparent power: the one place the VA → A formula is written.

Pure functions on floats or numpy arrays in SI units (VA, V, A).

References
----------
.. [1] IEEE Std 141-1993 (Red Book), ch. 3: balanced three-phase power
   S = √3 · V_LL · I; single-phase S = V · I.
"""

from __future__ import annotations

import math

import numpy as np

from .constants import SQRT3


def current_from_apparent_power_a(va, voltage_ll_v, phases=3):
    """Line current drawn by an apparent power.

    Method: I = S / (√3 · V_LL) for three-phase, I = S / V for single-phase (for a
    120/240 V three-wire system, V is the 240 V line-to-line voltage).

    Parameters
    ----------
    va : float or array
        Apparent power [VA] (zero or more).
    voltage_ll_v : float or array
        Line-to-line voltage [V] (greater than zero).
    phases : int or array
        1 or 3.

    Returns
    -------
    float or ndarray
        Line current [A], the shape of the broadcast inputs (a float for scalars).

    Raises
    ------
    ValueError
        Phases other than 1 or 3, or a voltage that is not a positive finite number.

    Notes
    -----
    The divisor is formed first (k · V with k = √3 or 1), then S is divided by it, so
    the result is the same to the last bit wherever the formula was written out before.

    Examples
    --------
    >>> round(current_from_apparent_power_a(45e3, 480.0), 2)
    54.13
    >>> current_from_apparent_power_a(12e3, 240.0, phases=1)
    50.0

    References
    ----------
    IEEE Std 141-1993, ch. 3.
    """
    if type(phases) is int and type(voltage_ll_v) is float and type(va) in (float, int):
        # one figure: the same arithmetic without numpy (IEEE division either way)
        if phases not in (1, 3):
            raise ValueError(f"phases must be 1 or 3, got {phases!r}")
        if not (math.isfinite(voltage_ll_v) and voltage_ll_v > 0):
            raise ValueError(
                f"voltage_ll_v must be a finite number greater than zero, got {voltage_ll_v!r}"
            )
        return float(va) / ((SQRT3 if phases == 3 else 1.0) * voltage_ll_v)
    ph = np.asarray(phases)
    if not np.isin(ph, (1, 3)).all():
        raise ValueError(f"phases must be 1 or 3, got {phases!r}")
    v = np.asarray(voltage_ll_v, dtype=float)
    if not np.isfinite(v).all() or (v <= 0).any():
        raise ValueError(
            f"voltage_ll_v must be a finite number greater than zero, got {voltage_ll_v!r}"
        )
    k = np.where(ph == 3, SQRT3, 1.0)
    out = np.asarray(va, dtype=float) / (k * v)
    return float(out) if out.ndim == 0 else out
