"""Minimum general lighting load of an occupancy (NFPA 70 220.12).

Method: the general lighting load is not less than the occupancy's unit load (Table 220.12)
times the floor area computed from the outside dimensions. The scheduled (connected)
general lighting is compared with that minimum; the larger is the lighting load carried
into the demand chain, and a schedule below the minimum is flagged.

References
----------
.. [1] NFPA 70 National Electrical Code 2017, 220.12 and Table 220.12.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

M2_PER_FT2 = 0.09290304  # exact: (0.3048 m)^2


@dataclass(frozen=True)
class MinimumLighting:
    """Scheduled lighting against the Table 220.12 minimum.

    Attributes
    ----------
    scheduled_va : VA
        General lighting on the schedule.
    minimum_va : VA
        Unit load × area (220.12).
    used_va : VA
        The larger of the two (the lighting load the demand chain takes).
    below : bool or ndarray of bool
        The schedule is below the minimum.
    """

    scheduled_va: float | np.ndarray
    minimum_va: float | np.ndarray
    used_va: float | np.ndarray
    below: bool | np.ndarray


def unit_load_va_per_m2(va_per_ft2):
    """Unit load [VA/m²] of a unit load in VA/ft² (exact conversion).

    The code's own metric column is rounded (3.5 VA/ft² is printed as 39 VA/m², exactly
    37.67); use the column of the unit the job measures its area in.

    Examples
    --------
    >>> round(float(unit_load_va_per_m2(3.5)), 2)
    37.67
    """
    u = _nonneg("va_per_ft2", va_per_ft2)
    out = u / M2_PER_FT2
    return out if out.ndim else float(out)


def minimum_lighting_load(scheduled_va, area_m2, unit_va_per_m2) -> MinimumLighting:
    """Minimum general lighting load (220.12) and the load used.

    Parameters
    ----------
    scheduled_va : float or array
        General lighting on the panel schedule [VA].
    area_m2 : float or array
        Floor area from the outside dimensions [m²].
    unit_va_per_m2 : float or array
        Table 220.12 unit load of the occupancy [VA/m²].

    Returns
    -------
    MinimumLighting

    Examples
    --------
    Invented office floor of 1,000 m² at 39 VA/m² with 30 kVA of scheduled lighting:

    >>> r = minimum_lighting_load(30_000, 1_000, 39)
    >>> float(r.minimum_va), float(r.used_va), bool(r.below)
    (39000.0, 39000.0, True)

    References
    ----------
    NFPA 70-2017 220.12, Table 220.12.
    """
    s = _nonneg("scheduled_va", scheduled_va)
    a = _nonneg("area_m2", area_m2)
    u = _nonneg("unit_va_per_m2", unit_va_per_m2)
    m = a * u
    used = np.maximum(s, m)
    below = s < m * (1 - 1e-12)

    def f(x):
        return x if np.ndim(x) else x.item()

    return MinimumLighting(f(s * np.ones_like(used)), f(m * np.ones_like(used)), f(used), f(below))


def _nonneg(name, x):
    a = np.asarray(x, dtype=float)
    if not np.all(np.isfinite(a) & (a >= 0)):
        raise ValueError(f"{name}: got {x!r}; expected finite values ≥ 0")
    return a
