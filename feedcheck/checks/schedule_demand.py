"""Connected and demand load of every panel of a schedule, computed once per panel
(:func:`schedule_demand`): the runner hands the same figures to the feed walk and to the
circuit checks (:func:`feedcheck.checks.schedules.check_schedule`).

Demand (``tables/demand_factors.csv``, kernel :mod:`feedcheck.calc.demand`): lighting by
occupancy (Table 220.42), receptacles 10 kVA at 100 % and the rest at 50 % (220.44),
motors 100 % plus 25 % of the largest (430.24), heating and other loads 100 %. The
continuous portion is carried separately; the feeder and panel checks apply its 125 %.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property

import numpy as np

from ..calc.demand import KINDS, PanelDemand, Tiers, panel_demand
from ..model import OCCUPANCIES, Schedule, VoltageSystem
from ..rulebook import RuleBook, current_rulebook
from .context import Load
from .schedule_circuits import circuit_electrics


def _phase_of_space(space: np.ndarray, system: VoltageSystem) -> np.ndarray:
    n_ph = 3 if system.phases == 3 else (2 if system.kind == "split" else 1)
    return ((space - 1) // 2) % n_ph


def demand_tiers(
    occupancy: str = "other", rules: RuleBook | None = None
) -> dict[str, list[tuple[float, float, float]]]:
    """Demand tiers by load kind from ``tables/demand_factors.csv`` for an occupancy.

    Examples
    --------
    >>> demand_tiers()["receptacle"]
    [(0.0, 10000.0, 1.0), (10000.0, inf, 0.5)]
    """
    if occupancy not in OCCUPANCIES:
        raise ValueError(f"occupancy: got {occupancy!r}; expected one of {', '.join(OCCUPANCIES)}")
    book = rules if rules is not None else current_rulebook()
    out: dict[str, list[tuple[float, float, float]]] = {}
    for r in book.rows("demand_factors"):
        if r["kind"] == "lighting" and r["occupancy"] != occupancy:
            continue
        out.setdefault(str(r["kind"]), []).append(
            (float(r["from_va"]), float(r["to_va"]), float(r["factor"]))
        )
    return out


@dataclass(frozen=True)
class ScheduleDemand:
    """Demand of every panel of one schedule, computed once (:func:`schedule_demand`)."""

    occupancy: str
    load_va: np.ndarray  # per circuit [VA]
    panel_code: np.ndarray  # per circuit
    panel_ids: tuple[str, ...]
    figures: PanelDemand
    continuous_factor: float
    # demand current on lines A, B, C of each panel [A], continuous / noncontinuous
    phase_cont_a: np.ndarray | None = None  # (panels, 3)
    phase_non_a: np.ndarray | None = None
    continuous_by_kind_va: np.ndarray | None = None  # (panels, kinds) connected
    tiers: dict | None = None  # demand tiers by kind (for the chain on the sheet)
    motor_factor: float = 1.25  # rule df-motor-largest, as panel_demand used it
    # the largest motor's 25 % (430.24) on lines A, B, C of each panel [A], part of
    # phase_non_a (spread over the motor circuits as the demand factor spreads it)
    phase_motor_adder_a: np.ndarray | None = None

    def chain(self, j: int):
        """The demand arithmetic of panel ``j`` as one chain (calc/demand_chain.py)."""
        from ..calc.demand_chain import demand_chain

        f = self.figures
        conn = {k: float(f.connected_va[j, i]) for i, k in enumerate(KINDS)}
        cont = {
            k: float(self.continuous_by_kind_va[j, i]) for i, k in enumerate(KINDS) if k != "motor"
        }
        return demand_chain(
            conn,
            cont,
            float(f.largest_motor_va[j]),
            self.tiers,
            self.motor_factor,
            self.continuous_factor,
        )

    def chains(self) -> list:
        """Every panel's demand chain (:meth:`chain`), the arithmetic done once on arrays
        (one value per panel: the kernel is vectorised, element by element the same
        operations) and split per panel; panel by panel when the kernel refuses them
        (its message then names the one panel's value, as :meth:`chain` gives it)."""
        from ..calc.demand_chain import DemandChain, demand_chain

        f = self.figures
        try:
            ch = demand_chain(
                {k: f.connected_va[:, i].astype(float) for i, k in enumerate(KINDS)},
                {
                    k: self.continuous_by_kind_va[:, i].astype(float)
                    for i, k in enumerate(KINDS)
                    if k != "motor"
                },
                np.asarray(f.largest_motor_va, dtype=float),
                self.tiers,
                self.motor_factor,
                self.continuous_factor,
            )
        except ValueError:
            return [self.chain(j) for j in range(len(self.panel_ids))]
        conn = {k: np.asarray(v).tolist() for k, v in ch.connected_va.items()}
        dem = {k: np.asarray(v).tolist() for k, v in ch.demand_va.items()}
        cols = [
            np.asarray(v).tolist()
            for v in (
                ch.connected_total_va,
                ch.demand_total_va,
                ch.largest_motor_va,
                ch.largest_motor_adder_va,
                ch.continuous_demand_va,
                ch.continuous_adder_va,
                ch.design_va,
            )
        ]
        return [
            DemandChain(
                {k: v[j] for k, v in conn.items()},
                cols[0][j],
                {k: v[j] for k, v in dem.items()},
                *(c[j] for c in cols[1:]),
                ch.largest_motor_factor,
                ch.continuous_factor,
            )
            for j in range(len(self.panel_ids))
        ]

    @cached_property
    def loads(self) -> dict[str, Load]:
        """Each panel's demand load, ``{panel_id: Load}`` (worked out once: the feed walk
        and the circuit checks read the same loads, which no one changes in place)."""
        f = self.figures
        n = len(self.panel_ids)
        chains = [None] * n if self.tiers is None else self.chains()

        def rows(a):
            return [None] * n if a is None else [tuple(r) for r in np.asarray(a).tolist()]

        lighting = f.connected_va[:, KINDS.index("lighting")].astype(float).tolist()
        return {
            pid: Load(va, cva, w, pc, pn, light, chain, motor)
            for pid, va, cva, w, pc, pn, light, chain, motor in zip(
                self.panel_ids,
                np.asarray(f.demand_va, dtype=float).tolist(),
                np.asarray(f.continuous_va, dtype=float).tolist(),
                np.asarray(f.real_w, dtype=float).tolist(),
                rows(self.phase_cont_a),
                rows(self.phase_non_a),
                lighting,
                chains,
                rows(self.phase_motor_adder_a),
                strict=True,
            )
        }

    def design_phase_a(self) -> np.ndarray:
        """Design current of every line of every panel (continuous at 125 %) [A]."""
        return self.continuous_factor * self.phase_cont_a + self.phase_non_a

    @property
    def load(self) -> Load:
        """Demand load of the (first) panel, for the feed walk."""
        return self.loads[self.panel_ids[0]]


def schedule_demand(
    schedule: Schedule,
    system: VoltageSystem,
    occupancy: str = "other",
    rules: RuleBook | None = None,
) -> ScheduleDemand:
    """Connected and demand load of every panel of a schedule (no circuit checks)."""
    import pandas as pd

    tiers = demand_tiers(occupancy, rules)
    c = schedule.circuits
    _v, load_va, current_a, _k = circuit_electrics(c, schedule.load_unit, system)
    codes, ids = pd.factorize(pd.Series(c["panel"].to_numpy(object)))
    kcode = np.asarray(pd.Categorical(c["kind"].to_numpy(object), categories=KINDS).codes)
    # a motor is never also "continuous": 430.24 takes its 125 % as the largest motor
    # (calc/demand_chain.py step 3), so the 125 % of 215.2(A)(1) is not applied again
    motor = kcode == KINDS.index("motor")
    cont = c["continuous"].to_numpy(bool) & ~motor
    figures = panel_demand(
        kcode,
        load_va,
        cont,
        c["pf"].to_numpy(float),
        codes,
        len(ids),
        {k: _tiers(rows) for k, rows in tiers.items()},
        tiers["motor-largest"][0][2],
    )
    dem_a = current_a * figures.circuit_factor  # demand current on each pole of a circuit
    args = (c["poles"].to_numpy(), c["circuit"].to_numpy(), np.asarray(codes), len(ids), system)
    return ScheduleDemand(
        occupancy,
        load_va,
        np.asarray(codes),
        tuple(str(p) for p in ids),
        figures,
        tiers["continuous"][0][2],
        _line_currents(np.where(cont, dem_a, 0.0), *args),
        _line_currents(np.where(cont, 0.0, dem_a), *args),
        np.bincount(
            np.asarray(codes) * len(KINDS) + kcode,
            weights=np.where(cont, load_va, 0.0),
            minlength=len(KINDS) * len(ids),
        ).reshape(len(ids), len(KINDS)),
        {k: rows for k, rows in tiers.items() if k in KINDS and k != "motor"},
        tiers["motor-largest"][0][2],
        _line_currents(np.where(motor, current_a * (figures.circuit_factor - 1.0), 0.0), *args),
    )


def _line_currents(current_a, poles, circuit, codes, n_pan: int, system) -> np.ndarray:
    """Current on lines A, B, C of each panel [A]: each circuit's current on every
    line of its spaces (a two-pole 208 V load draws S / 208 V on both of its lines)."""
    counts = np.asarray(poles).astype(np.int64)
    owner = np.repeat(np.arange(len(counts)), counts)
    step = np.arange(len(owner)) - np.repeat(np.cumsum(counts) - counts, counts)
    ph = _phase_of_space(np.asarray(circuit)[owner].astype(np.int64) + 2 * step, system)
    # two-wire: the one line stands for the pair, so a two-pole circuit counts once
    once = counts[owner] if system.phases != 3 and system.kind != "split" else 1
    return np.bincount(
        codes[owner] * 3 + ph, weights=current_a[owner] / once, minlength=3 * n_pan
    ).reshape(n_pan, 3)


def _tiers(rows: list[tuple[float, float, float]]) -> Tiers:
    """Tiers of one kind from its (from_va, to_va, factor) rows."""
    lo, hi, f = (np.array(col, float) for col in zip(*rows, strict=True))
    return Tiers(lo, hi, f)


def demand_load(schedule: Schedule, system: VoltageSystem, occupancy: str = "other") -> Load:
    """Demand load of a one-panel schedule (for the feed walk), without the circuit
    checks; the same figures as ``check_schedule(...).demand``."""
    return schedule_demand(schedule, system, occupancy).load
