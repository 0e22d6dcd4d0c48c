"""Through-fault current of the utility's service transformer (the source of a service).

The infinite-bus method: with no impedance ahead of the transformer, its secondary
bolted three-phase fault current is its rated current divided by its per-unit
impedance, I = S / (√3 · V_LL · Z_pu) (single-phase: S / (V · Z_pu)). A stated
primary short-circuit power adds the primary system's impedance, referred to the
secondary, as a complex series impedance (each split by its own X/R).
"""

from __future__ import annotations

import numpy as np

from .constants import SQRT3


def _positive(name: str, value, allow_inf: bool = False) -> np.ndarray:
    a = np.asarray(value, dtype=float)
    bad = ~(a > 0) | (np.isinf(a) & (not allow_inf))
    if np.any(bad):
        raise ValueError(f"{name} must be a positive number, got {value!r}")
    return a


def _out(a):
    return a.item() if np.ndim(a) == 0 else a


def service_through_fault(
    rating_va, voltage_ll_v, z_pct, x_r, phases, primary_sc_va=np.inf, primary_x_r=10.0
):
    """Bolted fault current at a service transformer's secondary terminals and its X/R.

    Method: the transformer's impedance Z_T = (Z% / 100) · V² / S at the secondary
    voltage, plus the primary system's Z_P = V² / S_sc (referred to the secondary; a
    single-phase transformer takes two primary lines, so its loop carries 2 · Z_P),
    each split into R and X by its X/R and summed as complex numbers; then
    I = V / (√3 · |Z|) three-phase, V / |Z_loop| single-phase. With an infinite
    primary (``primary_sc_va = inf``) this is the infinite-bus formula
    I = S / (√3 · V · Z_pu) (IEEE Std 141-1993 §4.5; IEEE Std 242-2001 ch. 2).

    Parameters
    ----------
    rating_va : float or array
        Transformer rating [VA].
    voltage_ll_v : float or array
        Secondary line-to-line voltage [V] (240 for a 120/240 V single-phase unit).
    z_pct : float or array
        Nameplate percent impedance [%].
    x_r : float or array
        Transformer X/R [-].
    phases : int
        1 or 3.
    primary_sc_va : float or array
        Three-phase short-circuit power available at the primary [VA]; ``inf``
        for an infinite bus.
    primary_x_r : float or array
        X/R of the primary system [-].

    Returns
    -------
    (fault_a, x_r)
        Symmetrical bolted fault current at the secondary terminals [A] and the
        X/R of the combined impedance [-].

    Raises
    ------
    ValueError
        A rating, voltage, impedance or X/R not positive, or phases not 1 or 3.

    Notes
    -----
    The nameplate %Z is used as given (no tolerance): a utility that states a
    minimum impedance for its maximum fault should have that figure entered.

    Examples
    --------
    1500 kVA, 480 V, 5.75 %, infinite bus: 1804 A × 100 / 5.75 = 31.4 kA
    (the infinite-bus example of IEEE Std 141-1993 §4.5 form, I_fl / Z_pu):

    >>> i, xr = service_through_fault(1.5e6, 480.0, 5.75, 6.0, 3)
    >>> round(i)
    31378
    >>> round(xr, 3)
    6.0

    References
    ----------
    IEEE Std 141-1993 (Red Book) §4.5, short-circuit current of a transformer fed
    from an infinite bus; IEEE Std 242-2001 (Buff Book) ch. 2.
    """
    if phases not in (1, 3):
        raise ValueError(f"phases must be 1 or 3, got {phases!r}")
    s = _positive("rating_va", rating_va)
    v = _positive("voltage_ll_v", voltage_ll_v)
    z = _positive("z_pct", z_pct) / 100.0
    xr = _positive("x_r", x_r)
    ssc = _positive("primary_sc_va", primary_sc_va, allow_inf=True)
    xrp = _positive("primary_x_r", primary_x_r)
    zt_mag = z * v**2 / s  # 3ph: per phase; 1ph: the loop
    zp_mag = v**2 / ssc * (1.0 if phases == 3 else 2.0)
    zt = zt_mag / np.sqrt(1 + xr**2) * (1 + 1j * xr)
    zp = zp_mag / np.sqrt(1 + xrp**2) * (1 + 1j * xrp)
    total = zt + zp
    fault = v / ((SQRT3 if phases == 3 else 1.0) * np.abs(total))
    return _out(fault), _out(total.imag / total.real)
