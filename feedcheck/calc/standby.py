"""The standby source: a synchronous generator's first-cycle fault current.

In the first-cycle (subtransient) network a synchronous generator is a voltage behind
its subtransient reactance X"d (IEEE Std 141-1993 ch. 4; IEEE Std 242-2001 ch. 2): at
its terminals the bolted three-phase fault current is its rated current divided by the
per-unit reactance, I = I_rated / x"d, with the machine's X/R splitting the impedance.
"""

from __future__ import annotations

import numpy as np

from .constants import SQRT3
from .service import _out, _positive


def generator_fault_a(rating_va, voltage_ll_v, xdss_pct, x_r=np.inf, phases=3):
    """Symmetrical three-phase fault current at a generator's terminals [A].

    Method: I_rated = S / (√3 · V_LL) (single-phase S / V), then I = I_rated / |z"|
    with z" = x"d / (X/R) + j x"d, x"d = X"d% / 100 on the machine's own rating. With
    the resistance neglected (``x_r`` infinite) this is the published
    I = I_rated / x"d (IEEE Std 141-1993 ch. 4; IEEE Std 242-2001 ch. 2).

    Parameters
    ----------
    rating_va : float or array
        Generator rating [VA].
    voltage_ll_v : float or array
        Rated line-to-line voltage [V].
    xdss_pct : float or array
        Subtransient reactance X"d [%] on the generator's rating.
    x_r : float or array
        The generator's X/R (its armature resistance R = X"d / (X/R)); infinite
        (default): resistance neglected.
    phases : int
        3 (default) or 1.

    Returns
    -------
    float or ndarray
        First-cycle symmetrical fault current at the terminals [A].

    Raises
    ------
    ValueError
        When a figure is not positive or ``phases`` is not 1 or 3.

    Notes
    -----
    No decrement: the figure is the first-cycle current (the largest, for interrupting
    duty); the current falls toward the transient and synchronous values afterwards,
    held up by the excitation system, which this figure does not model.

    Examples
    --------
    >>> round(generator_fault_a(500e3, 480.0, 12.0))
    5012
    >>> round(generator_fault_a(500e3, 480.0, 12.0, x_r=15.0))
    5001

    References
    ----------
    IEEE Std 141-1993 (Red Book) ch. 4; IEEE Std 242-2001 (Buff Book) ch. 2.
    """
    if phases not in (1, 3):
        raise ValueError(f"phases must be 1 or 3, got {phases!r}")
    s = _positive("rating_va", rating_va)
    v = _positive("voltage_ll_v", voltage_ll_v)
    x = _positive("xdss_pct", xdss_pct)
    xr = _positive("x_r", x_r, allow_inf=True)
    rated = s / (SQRT3 * v) if phases == 3 else s / v
    z_pu = (x / 100.0) * np.sqrt(1.0 + 1.0 / xr**2)
    return _out(np.asarray(rated / z_pu, dtype=float))
