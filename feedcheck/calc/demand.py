"""Demand load of panels from their circuits: the standard calculation method.

Pure functions on numpy arrays in SI units (VA, W). The demand factors are handed in
by the caller (rows of ``tables/demand_factors.csv``); nothing is read here.

Method (NFPA 70 Article 220, Part III, and 430.24):

* lighting: the tiers of Table 220.42 for the occupancy (Table 220.45 in the 2023
  edition), applied to the panel's total lighting load;
* receptacles: first 10 kVA at 100 %, the remainder at 50 % (220.44, Table 220.44);
* motors: 100 % of every motor plus 25 % of the largest (430.24);
* fixed electric space heating 100 % (220.51); other loads 100 % (220.40 basis);
* the continuous part is carried separately (its 125 % belongs to the feeder and
  device checks, 215.2(A)(1) and 210.19(A)(1)).

References
----------
.. [1] NFPA 70 National Electrical Code, 2017 numbering: 220.40, Table 220.42, 220.44
   and Table 220.44, 220.51; 430.24; 215.2(A)(1).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

KINDS = ("lighting", "receptacle", "motor", "heating", "other")


@dataclass(frozen=True)
class Tiers:
    """Demand factor tiers of one load kind: the factor ``factor[k]`` applies to the part
    of the kind's total between ``from_va[k]`` and ``to_va[k]`` [VA]."""

    from_va: np.ndarray
    to_va: np.ndarray
    factor: np.ndarray


FULL = Tiers(np.array([0.0]), np.array([np.inf]), np.array([1.0]))


def tiered_demand_va(connected_va, tiers: Tiers):
    """Demand of a kind's total connected load through its tiers.

    Method: D = Σ_k f_k · clip(S − from_k, 0, to_k − from_k) (the tier layout of
    NFPA 70 Table 220.42 and Table 220.44).

    Parameters
    ----------
    connected_va : float or array
        Total connected load of one kind [VA].
    tiers : Tiers
        The kind's tiers.

    Returns
    -------
    float or ndarray
        Demand load [VA].

    Examples
    --------
    >>> t = Tiers(np.array([0.0, 10e3]), np.array([10e3, np.inf]), np.array([1.0, 0.5]))
    >>> float(tiered_demand_va(16e3, t))   # our own example: 10 kVA + 6 kVA at 50 %
    13000.0
    """
    s = np.asarray(connected_va, dtype=float)
    out = np.zeros_like(s, dtype=float)
    for lo, hi, f in zip(tiers.from_va, tiers.to_va, tiers.factor, strict=True):
        out += f * np.clip(s - lo, 0.0, hi - lo)
    return out


@dataclass(frozen=True)
class PanelDemand:
    """Demand figures of every panel (row j = panel code j).

    ``connected_va`` is (panels, 5), one column per kind of :data:`KINDS`;
    ``circuit_factor`` is the demand factor each circuit's load was counted at.
    """

    connected_va: np.ndarray
    demand_va: np.ndarray
    continuous_va: np.ndarray
    real_w: np.ndarray
    largest_motor_va: np.ndarray
    circuit_factor: np.ndarray


def panel_demand(
    kind_code,
    load_va,
    continuous,
    pf,
    panel_code,
    n_panels: int,
    tiers: dict[str, Tiers],
    largest_motor_factor: float,
) -> PanelDemand:
    """Connected load by kind, demand, continuous demand, real power and the largest motor
    of each panel, from its circuits.

    Method: NFPA 70 Article 220 Part III and 430.24 (module docstring). A circuit's
    demand is its load times its kind's overall factor on its panel (demand ÷ connected),
    so the continuous and real-power parts carry the same factors.

    Parameters
    ----------
    kind_code : int array
        Index of each circuit's kind in :data:`KINDS`.
    load_va : float array
        Connected load of each circuit [VA].
    continuous : bool array
        Circuit load is continuous (3 h or more).
    pf : float array
        Power factor of each circuit's load.
    panel_code : int array
        Panel number of each circuit (0 … n_panels − 1).
    n_panels : int
        Number of panels.
    tiers : dict of Tiers
        Tiers by kind name; a kind not given counts at 100 %.
    largest_motor_factor : float
        Factor of the largest motor of a panel (1.25 by 430.24).

    Returns
    -------
    PanelDemand

    Examples
    --------
    Our own panel: 16 kVA of receptacles and two motors of 3 and 5 kVA.

    >>> rec = Tiers(np.array([0.0, 10e3]), np.array([10e3, np.inf]), np.array([1.0, 0.5]))
    >>> d = panel_demand(np.array([1, 2, 2]), np.array([16e3, 3e3, 5e3]),
    ...                  np.array([False, False, True]), np.array([1.0, 0.8, 0.8]),
    ...                  np.array([0, 0, 0]), 1, {"receptacle": rec}, 1.25)
    >>> float(d.demand_va[0]), float(d.continuous_va[0])   # 13 + 8 + 1.25 kVA
    (22250.0, 5781.25)
    """
    kind_code = np.asarray(kind_code, dtype=np.int64)
    load_va = np.asarray(load_va, dtype=float)
    panel_code = np.asarray(panel_code, dtype=np.int64)
    nk = len(KINDS)
    conn = np.bincount(
        panel_code * nk + kind_code, weights=load_va, minlength=nk * n_panels
    ).reshape(n_panels, nk)
    dem = np.empty_like(conn)
    for j, k in enumerate(KINDS):
        dem[:, j] = tiered_demand_va(conn[:, j], tiers.get(k, FULL))
    motor = kind_code == KINDS.index("motor")
    largest = np.zeros(n_panels)
    if motor.any():
        np.maximum.at(largest, panel_code[motor], load_va[motor])
    dem[:, KINDS.index("motor")] += (largest_motor_factor - 1.0) * largest
    factor = np.divide(dem, conn, out=np.zeros_like(dem), where=conn > 0)
    circ_factor = factor[panel_code, kind_code]
    circ_dem = load_va * circ_factor
    cont_va = np.bincount(
        panel_code, weights=np.where(continuous, circ_dem, 0.0), minlength=n_panels
    )
    w = np.bincount(panel_code, weights=circ_dem * np.asarray(pf, float), minlength=n_panels)
    return PanelDemand(conn, dem.sum(axis=1), cont_va, w, largest, circ_factor)
