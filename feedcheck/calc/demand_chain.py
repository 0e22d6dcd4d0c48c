"""Demand load of a panel or feeder as one visible chain of steps.

Method (NFPA 70 Article 220 Part III standard calculation and 430.24), each step applied
once, in this order, every intermediate kept for the calculation sheet:

1. **Connected** load by kind: lighting, receptacle, motor, heating, other [VA].
2. **Demand factors**: each kind's connected total through its tiers (Table 220.42 for
   lighting by occupancy, 220.44 / Table 220.44 for receptacles; 100 % where no tiers
   are given). The tiers are parameters (from the rule book), never read here.
3. **Largest motor**: + 25 % of the largest motor's load (430.24). Once.
4. **Continuous**: + 25 % of the continuous part of the non-motor loads after their
   demand factors (215.2(A)(1), 210.19(A)(1)). Motors are never counted here: their
   125 % is step 3 (largest motor) and 430.24 takes the other motors at 100 %, so a
   motor marked continuous is not raised again (the double count of issue 13).

The design load is the demand load plus steps 3 and 4.

References
----------
.. [1] NFPA 70 National Electrical Code 2017: Table 220.42 (renumbered 220.45 in
   2023), 220.44 and Table 220.44, 220.51; 430.24; 215.2(A)(1), 210.19(A)(1).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np

KINDS = ("lighting", "receptacle", "motor", "heating", "other")

Tiers = Sequence[tuple[float, float, float]]  # (from_va, to_va, factor)


def tiered_demand_va(connected_va, tiers: Tiers):
    """Demand [VA] of a connected total through demand-factor tiers.

    Method: the portion of the total between ``from_va`` and ``to_va`` counts at
    ``factor`` (Table 220.42, Table 220.44 structure). Tiers must start at 0 VA, be
    contiguous and end at infinity.

    Examples
    --------
    Invented receptacle total of 14,400 VA, tiers of 220.44 (10 kVA at 100 %, rest 50 %):

    >>> float(tiered_demand_va(14_400, [(0, 10_000, 1.0), (10_000, float("inf"), 0.5)]))
    12200.0
    """
    c = _nonneg("connected_va", connected_va)
    t = [(float(a), float(b), float(f)) for a, b, f in tiers]
    if (
        not t
        or t[0][0] != 0
        or not np.isinf(t[-1][1])
        or any(t[k][1] != t[k + 1][0] for k in range(len(t) - 1))
        or any(not (0 <= f <= 1.25) for _, _, f in t)
    ):
        raise ValueError(
            f"tiers: got {tiers!r}; expected contiguous (from_va, to_va, "
            "factor) rows from 0 to inf with factors in 0..1.25"
        )
    out = np.zeros_like(c)
    for lo, hi, f in t:
        out = out + f * np.clip(c - lo, 0.0, hi - lo)
    return out if out.ndim else float(out)


@dataclass(frozen=True)
class DemandChain:
    """Every step of the demand arithmetic (arrays: one value per panel).

    Attributes
    ----------
    connected_va : dict kind -> VA
        Step 1, connected load by kind.
    connected_total_va : VA
        Sum of step 1.
    demand_va : dict kind -> VA
        Step 2, after demand factors, by kind.
    demand_total_va : VA
        Sum of step 2.
    largest_motor_va : VA
        The largest single motor's load.
    largest_motor_adder_va : VA
        Step 3: 25 % of ``largest_motor_va`` (430.24), counted once.
    continuous_demand_va : VA
        Continuous part of the non-motor loads after their demand factors.
    continuous_adder_va : VA
        Step 4: 25 % of ``continuous_demand_va`` (215.2(A)(1)).
    design_va : VA
        ``demand_total_va + largest_motor_adder_va + continuous_adder_va``.
    largest_motor_factor, continuous_factor : -
        The factors the chain used (1.25 unless a rule book says otherwise), for the
        printed steps.
    """

    connected_va: dict
    connected_total_va: float | np.ndarray
    demand_va: dict
    demand_total_va: float | np.ndarray
    largest_motor_va: float | np.ndarray
    largest_motor_adder_va: float | np.ndarray
    continuous_demand_va: float | np.ndarray
    continuous_adder_va: float | np.ndarray
    design_va: float | np.ndarray
    largest_motor_factor: float = 1.25
    continuous_factor: float = 1.25


def demand_chain(
    connected_va: Mapping[str, object],
    continuous_va: Mapping[str, object],
    largest_motor_va,
    tiers: Mapping[str, Tiers] | None = None,
    largest_motor_factor: float = 1.25,
    continuous_factor: float = 1.25,
) -> DemandChain:
    """Demand and design load of a panel as one chain of steps, each applied once.

    Parameters
    ----------
    connected_va : mapping kind -> float or array
        Connected load of each kind [VA] (kinds: lighting, receptacle, motor, heating,
        other; a missing kind is 0). Motors at their table full-load current × voltage.
    continuous_va : mapping kind -> float or array
        Continuous part of each non-motor kind's connected load [VA] (≤ its connected
        load). A ``"motor"`` entry is refused: see step 4.
    largest_motor_va : float or array
        Load of the largest single motor [VA] (≤ the motor total).
    tiers : mapping kind -> tiers, optional
        Demand-factor tiers of the kinds that have them (rows from the rule book).
    largest_motor_factor, continuous_factor : float
        The 430.24 and 215.2(A)(1) factors (1.25; rule rows ``df-motor-largest`` and
        ``df-continuous`` of the demand factor table); the adders are factor − 1.

    Returns
    -------
    DemandChain

    Raises
    ------
    ValueError
        Unknown kind, negative load, continuous part above the connected load,
        continuous motors, largest motor above the motor total.

    Examples
    --------
    Invented panel: 18,000 VA continuous lighting, one 28,300 VA motor.

    >>> r = demand_chain({"lighting": 18_000, "motor": 28_300}, {"lighting": 18_000},
    ...                  28_300)
    >>> float(r.demand_total_va), float(r.largest_motor_adder_va), float(r.design_va)
    (46300.0, 7075.0, 57875.0)

    References
    ----------
    NFPA 70-2017 Table 220.42, 220.44; 430.24; 215.2(A)(1).
    """
    tiers = dict(tiers or {})
    _check_kinds(connected_va, continuous_va, tiers, largest_motor_factor, continuous_factor)
    conn = {k: _nonneg(f"connected_va[{k}]", connected_va.get(k, 0.0)) for k in KINDS}
    shape = np.broadcast_shapes(*(v.shape for v in conn.values()))
    conn = {k: np.broadcast_to(v, shape).astype(float) for k, v in conn.items()}
    big = _nonneg("largest_motor_va", largest_motor_va)
    if np.any(big > conn["motor"] * (1 + 1e-9)):
        raise ValueError("largest_motor_va: above the connected motor load")
    dem = {
        k: (np.asarray(tiered_demand_va(conn[k], tiers[k])) if k in tiers else conn[k])
        for k in KINDS
    }
    cont_dem = _continuous_demand_va(continuous_va, conn, dem, shape)
    dem_total = sum(dem.values())
    motor_add = (float(largest_motor_factor) - 1.0) * big
    cont_add = (float(continuous_factor) - 1.0) * cont_dem
    return DemandChain(
        {k: _scalar(v) for k, v in conn.items()},
        _scalar(sum(conn.values())),
        {k: _scalar(v) for k, v in dem.items()},
        _scalar(dem_total),
        _scalar(big),
        _scalar(motor_add),
        _scalar(cont_dem),
        _scalar(cont_add),
        _scalar(dem_total + motor_add + cont_add),
        float(largest_motor_factor),
        float(continuous_factor),
    )


def _continuous_demand_va(continuous_va, connected, demand, shape) -> np.ndarray:
    """The continuous loads after their kinds' demand factors: each kind's continuous
    part takes the same share of its connected load as the kind's demand does."""
    total = np.zeros(shape)
    for kind, value in continuous_va.items():
        part = _nonneg(f"continuous_va[{kind}]", value)
        if np.any(part > connected[kind] * (1 + 1e-9)):
            raise ValueError(f"continuous_va[{kind}]: above the connected {kind} load")
        ratio = np.divide(
            demand[kind], connected[kind], out=np.zeros(shape), where=connected[kind] > 0
        )
        total = total + part * ratio  # its share after the kind's demand factors
    return total


def _check_kinds(connected_va, continuous_va, tiers, largest_motor_factor, continuous_factor):
    for name, m in (
        ("connected_va", connected_va),
        ("continuous_va", continuous_va),
        ("tiers", tiers),
    ):
        bad = set(m) - set(KINDS)
        if bad:
            raise ValueError(
                f"{name}: unknown kind {sorted(bad)[0]!r}; expected one of " + ", ".join(KINDS)
            )
    if "motor" in continuous_va or "motor" in tiers:
        raise ValueError(
            "continuous_va/tiers: motors take 125 % of the largest motor "
            "(430.24), not a continuous or demand factor"
        )
    for name, f_ in (
        ("largest_motor_factor", largest_motor_factor),
        ("continuous_factor", continuous_factor),
    ):
        if not 1.0 <= float(f_) <= 2.0:
            raise ValueError(f"{name}: got {f_!r}; expected a factor from 1 to 2 (1.25)")


def _scalar(x):
    x = np.asarray(x, dtype=float)
    return x if x.ndim else float(x)


def _nonneg(name, x):
    a = np.asarray(x, dtype=float)
    if not np.all(np.isfinite(a) & (a >= 0)):
        raise ValueError(f"{name}: got {x!r}; expected finite loads ≥ 0 VA")
    return a
