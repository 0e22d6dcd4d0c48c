"""Motor starting: the voltage at a motor's terminals and the current it draws while it
starts across the line, by the impedance-divider method.

The locked rotor is a constant impedance Z_m = (V_rated / I_LR)∠acos(pf_start) in series
with the path impedance from the source (source + transformer + runs); prior load on the
path is neglected. Per phase, line-to-neutral; a single-phase motor takes the loop
resistance and reactance of both conductors. Floats or numpy arrays in SI units.

References
----------
.. [1] IEEE Std 399-1997 (Brown Book) ch. 9, motor-starting studies (the impedance method).
.. [2] IEEE Std 141-1993 (Red Book) ch. 3 (voltage dips from motor starting).
"""

from __future__ import annotations

import numpy as np

from .vdrop import _finite, _out


def motor_starting_current_a(
    sending_v, locked_rotor_a, starting_pf, r_path_ohm, x_path_ohm, rated_v=None
):
    """Starting current of a motor drawn through the path impedance (impedance divider).

    The locked-rotor motor is a constant impedance Z_m = V_rated / I_LR at the angle
    acos(starting pf); the current is E_s / |Z_path + Z_m|. Per phase, line-to-neutral.

    Parameters
    ----------
    sending_v : float or array
        Open-circuit source voltage, line-to-neutral [V].
    locked_rotor_a : float or array
        Locked-rotor current at rated voltage [A] (given, or a multiple of full-load
        current from ``tables/motor_locked_rotor.csv``), > 0.
    starting_pf : float or array
        Power factor of the locked rotor [-], in (0, 1].
    r_path_ohm, x_path_ohm : float or array
        Total resistance and reactance from the source to the motor terminals, per phase
        (source + transformer + runs) [Ω].
    rated_v : float or array, optional
        Motor rated voltage, line-to-neutral [V], at which ``locked_rotor_a`` is
        given; defaults to ``sending_v``.

    Returns
    -------
    current_a : float or ndarray
        Starting current [A].

    Examples
    --------
    >>> round(motor_starting_current_a(277, 600, 0.3, 0.0, 0.0))
    600
    """
    z_path, z_m, es = _motor_impedances(
        sending_v, locked_rotor_a, starting_pf, r_path_ohm, x_path_ohm, rated_v
    )
    return _out(es / np.abs(z_path + z_m))


def _motor_impedances(sending_v, locked_rotor_a, starting_pf, r_path_ohm, x_path_ohm, rated_v):
    es = _finite("sending_v", sending_v, strict=True)
    ilr = _finite("locked_rotor_a", locked_rotor_a, strict=True)
    pf = _finite("starting_pf", starting_pf, strict=True)
    if np.any(pf > 1):
        raise ValueError(f"starting_pf must be in (0, 1], got {starting_pf!r}")
    vr = es if rated_v is None else _finite("rated_v", rated_v, strict=True)
    r = _finite("r_path_ohm", r_path_ohm)
    x = _finite("x_path_ohm", x_path_ohm)
    zm = (vr / ilr) * (pf + 1j * np.sqrt(1.0 - pf**2))
    return r + 1j * x, zm, es


def motor_starting_voltage_pct(
    sending_v, locked_rotor_a, starting_pf, r_path_ohm, x_path_ohm, rated_v=None
):
    """Voltage at the motor terminals while starting, percent of the motor's rated voltage.

    Impedance-divider method: the locked rotor is a constant impedance
    Z_m = (V_rated / I_LR)∠acos(pf_start) in series with the path impedance
    Z_path (source + transformer + runs); V_t = E_s · |Z_m| / |Z_path + Z_m|.
    Prior load on the path is neglected.

    Parameters
    ----------
    sending_v, locked_rotor_a, starting_pf, r_path_ohm, x_path_ohm, rated_v
        As in :func:`motor_starting_current_a` (per phase, line-to-neutral; for a
        single-phase motor give the loop resistance and reactance of both conductors).

    Returns
    -------
    voltage_pct : float or ndarray
        Terminal voltage during starting [% of ``rated_v``]; the dip is 100 minus this
        when the source sits at rated voltage.

    Notes
    -----
    A constant-impedance locked rotor draws less than its rated-voltage locked-rotor
    current when the terminal voltage sags, which the divider captures. The same figure
    follows from the exact phasor form
    (:func:`feedcheck.calc.vdrop.receiving_voltage_exact_v`) fed the divider's
    current at the starting power factor — the tests check that the two agree.

    Examples
    --------
    A motor drawing 600 A locked-rotor at pf 0.3 on 277 V through 0.02 + j0.04 Ω:

    >>> round(motor_starting_voltage_pct(277, 600, 0.3, 0.02, 0.04), 2)
    91.26

    References
    ----------
    IEEE Std 399-1997 (Brown Book) ch. 9, motor-starting studies (the impedance method);
    IEEE Std 141-1993 ch. 3 (voltage dips from motor starting).
    """
    z_path, z_m, es = _motor_impedances(
        sending_v, locked_rotor_a, starting_pf, r_path_ohm, x_path_ohm, rated_v
    )
    vr = es if rated_v is None else np.asarray(rated_v, dtype=float)
    vt = es * np.abs(z_m) / np.abs(z_path + z_m)
    return _out(100.0 * vt / vr)


def voltage_on_path_pct(
    sending_v, locked_rotor_a, starting_pf, r_path_ohm, x_path_ohm, r_to_ohm, x_to_ohm
):
    """Voltage at a point of a starting motor's path, percent of the sending voltage.

    Impedance divider as in :func:`motor_starting_voltage_pct`: the point lies after
    ``r_to_ohm + j·x_to_ohm`` of the path's ``r_path_ohm + j·x_path_ohm`` (source side);
    V = E_s · |Z_path − Z_to + Z_m| / |Z_path + Z_m|. Everything else fed from that point
    sees this voltage while the motor starts (prior load neglected). The whole path
    (``Z_to = Z_path``) gives the terminal voltage, the source (``Z_to = 0``) 100 %.

    Examples
    --------
    The motor of :func:`motor_starting_voltage_pct`, the point halfway along its path:

    >>> round(voltage_on_path_pct(277, 600, 0.3, 0.02, 0.04, 0.01, 0.02), 2)
    95.63
    >>> round(voltage_on_path_pct(277, 600, 0.3, 0.02, 0.04, 0.02, 0.04), 2)
    91.26
    """
    z_path, z_m, _es = _motor_impedances(
        sending_v, locked_rotor_a, starting_pf, r_path_ohm, x_path_ohm, None
    )
    z_to = _finite("r_to_ohm", r_to_ohm) + 1j * _finite("x_to_ohm", x_to_ohm)
    return _out(100.0 * np.abs(z_path - z_to + z_m) / np.abs(z_path + z_m))


__all__ = ["motor_starting_current_a", "motor_starting_voltage_pct", "voltage_on_path_pct"]
