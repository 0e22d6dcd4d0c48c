"""Motors in their panels' loads (NFPA 70-2023 430.24): each motor's table full-load
current on the lines it takes, 100 % of every motor plus 25 % of the largest, once per
panel; and above the panels, once per node: a feeder, transformer or service serving
several motor panels carries 125 % of the largest motor below it and 100 % of the others
(430.24), so the 25 % of every other panel's largest motor (schedule motors included) is
taken off the rolled-up load of that node (:func:`one_adder_per_node`). Called by
:func:`feedcheck.checks.context.build_context` when the loads are rolled up; the checks
of the motors themselves are in :mod:`feedcheck.checks.motors`."""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from ..calc.constants import SQRT3
from ..model import Job, Motor

PAIRS = ((0, 1), (1, 2), (2, 0))  # lines A-B, B-C, C-A


@dataclass(frozen=True)
class MotorLoad:
    """One motor's share of its panel's load: FLC on its lines, and the VA it adds."""

    motor_id: str
    flc_a: float
    va: float
    lines: tuple[int, ...]
    drawn_at_v: float  # voltage the FLC is drawn at [V]


@dataclass(frozen=True)
class OwnAdder:
    """The largest-motor 25 % (430.24) a panel's own load includes."""

    panel_id: str
    motor: str  # the largest motor's id, or "" for a motor of the panel's schedule
    motor_va: float  # that motor's load [VA]
    va: float  # the 25 % in the panel's own load [VA]
    w: float  # its real power [W]
    lines_a: tuple[float, float, float]  # on lines A, B, C of the panel [A]


@dataclass(frozen=True)
class NodeAdders:
    """One node's 430.24 adder: the largest motor below it kept, the others' 25 % off."""

    kept: OwnAdder
    dropped: tuple[OwnAdder, ...]

    @property
    def dropped_va(self) -> float:
        return sum(d.va for d in self.dropped)


def motor_volts(m: Motor, v) -> tuple[float, bool]:
    """Voltage the motor's current is drawn at on its panel [V], and whether it is a
    line-to-neutral load (a single-phase motor rated near the panel's neutral voltage)."""
    ln = (
        m.phases == 1
        and v.voltage_ln_v is not None
        and m.voltage_v is not None
        and abs(m.voltage_v - v.voltage_ln_v) < abs(m.voltage_v - v.voltage_ll_v)
    )
    return (v.voltage_ln_v if ln else v.voltage_ll_v), ln


def add_motor_loads(job: Job, book, own: dict):
    """Add every motor to its panel's own load (430.24) and return, per panel, the motors'
    shares and the 25 % adder of the largest motor [VA] (for the calculation sheet), and
    per panel the :class:`OwnAdder` its own load now includes (job and schedule motors).

    Each motor draws its table FLC on its lines (three-phase: all three; single-phase:
    the least-loaded pair, or phase for a line-to-neutral motor) as noncontinuous load
    at the running power factor (rule motor-running-pf). The largest motor's 25 % is
    added once per panel: where the panel's schedule already counts a larger motor's
    25 %, the schedule's stands and none is added here.
    """
    from .loads import line_share_v, lines_of

    pf = book.rule("motor-running-pf").number("limit")
    factor = book.rule("motor-feeder-largest").number("limit") / 100.0
    out: dict[str, tuple[list[MotorLoad], float]] = {}
    adders = {p: a for p, o in own.items() if (a := _schedule_adder(p, o)) is not None}
    for pid in dict.fromkeys(m.panel_id for m in job.motors):
        if pid not in own:
            continue
        v = job.tree.voltage_of[pid]
        o, k = own[pid], lines_of(v)
        even = [1.0 / k / line_share_v(v) if j < k else 0.0 for j in range(3)]
        cont = np.array(o.phase_cont_a or [o.continuous_va * e for e in even], float)
        non = np.array(o.phase_non_a or [(o.va - o.continuous_va) * e for e in even], float)
        shares = []
        for m in (m for m in job.motors if m.panel_id == pid):
            share = _share(m, v, k, cont + non)
            non[list(share.lines)] += share.flc_a
            shares.append(share)
        big = max(shares, key=lambda s: s.va)
        chain = o.chain
        done = float(chain.largest_motor_va) if chain is not None else 0.0
        adder = (factor - 1.0) * big.va if big.va > done else 0.0
        if adder > 0 and chain is not None:
            adder -= float(chain.largest_motor_adder_va)
        mine = np.zeros(3)
        mine[list(big.lines)] = adder / big.va * big.flc_a if big.va > 0 else 0.0
        non += mine
        before = adders.get(pid)
        if adder > 0 or before is None:
            adders[pid] = OwnAdder(
                pid,
                big.motor_id,
                big.va,
                adder + (before.va if before else 0.0),
                pf * adder + (before.w if before else 0.0),
                tuple(map(float, mine + (before.lines_a if before else 0.0))),
            )
        added = sum(s.va for s in shares) + adder
        own[pid] = replace(
            o,
            va=o.va + added,
            w=o.w + pf * added,
            phase_cont_a=tuple(map(float, cont)),
            phase_non_a=tuple(map(float, non)),
        )
        out[pid] = (shares, adder)
    return out, adders


def _schedule_adder(pid: str, o) -> OwnAdder | None:
    """The 25 % of a schedule's largest motor in the panel's own load, if any."""
    chain = o.chain
    if chain is None or float(chain.largest_motor_adder_va) <= 0:
        return None
    va = float(chain.largest_motor_adder_va)
    lines = o.motor_adder_a or (0.0, 0.0, 0.0)
    return OwnAdder(pid, "", float(chain.largest_motor_va), va, o.pf * va, tuple(lines))


def one_adder_per_node(job: Job, adders: dict, loads: dict, phases: dict) -> dict:
    """430.24 above the panels: every node with two or more motor panels below it keeps
    the 25 % of the largest motor below it (by VA) and takes the other panels' 25 % off
    its rolled-up load, its line currents and the currents of the run into it. Returns
    node id -> :class:`NodeAdders` for the nodes changed (their calculation sheets).

    The 25 % taken off is on the lines it sits on at its panel when nothing but panels
    at the same voltage lies between; across a transformer or a single-phase panel a
    three-phase motor's 25 % is a balanced load, and a single-phase motor's is not taken
    off the line currents (its VA is): the heaviest phase then stays on the safe side.
    """
    tree = job.tree
    below: dict[str, list[OwnAdder]] = {}
    for a in adders.values():
        n = a.panel_id
        while n is not None:
            below.setdefault(n, []).append(a)
            n = tree.parent_node[n]
    out = {}
    for n, found in below.items():
        if len(found) < 2:
            continue
        kept = max(found, key=lambda a: a.motor_va)
        dropped = tuple(a for a in found if a is not kept)
        out[n] = NodeAdders(kept, dropped)
        loads[n].va -= sum(d.va for d in dropped)
        loads[n].w -= sum(d.w for d in dropped)
        ph = phases[n]
        parent = tree.parent_node[n]
        for d in dropped:
            ph.non_a = np.maximum(ph.non_a - _carried(job, phases, d, n, n), 0.0)
            if parent is not None:
                feed = _carried(job, phases, d, n, parent)
                ph.feed_non_a = np.maximum(ph.feed_non_a - feed, 0.0)
    return out


def _carried(job: Job, phases: dict, a: OwnAdder, n: str, at: str) -> np.ndarray:
    """Line currents of the 25 % ``a`` on the lines of ``at`` (``n`` or its parent),
    carried up from its panel (see :func:`one_adder_per_node`)."""
    from .loads import line_share_v, lines_of

    parent_of = job.tree.parent_node
    crossed, c = [], a.panel_id
    while c != n:
        crossed.append(c)
        c = parent_of[c]
    if at != n:
        crossed.append(n)
    tx = {t.id for t in job.transformers}
    same = all(c not in tx and not phases[c].single_phase_feed for c in crossed)
    lines = np.asarray(a.lines_a, float)
    if same:
        return lines
    v = job.tree.voltage_of[at]
    k = lines_of(v)
    if np.ptp(lines) > 1e-9 * max(1.0, lines.max()):  # single-phase: not taken off
        return np.zeros(3)
    return np.array([a.va / k / line_share_v(v) if j < k else 0.0 for j in range(3)])


def _share(m: Motor, v, k: int, load_a: np.ndarray) -> MotorLoad:
    volts, ln = motor_volts(m, v)
    if (m.phases or v.phases) == 3:
        return MotorLoad(m.id, m.full_load_a, SQRT3 * volts * m.full_load_a, (0, 1, 2), volts)
    if ln or k == 1:
        j = int(np.argmin(load_a[:k])) if ln else 0
        return MotorLoad(m.id, m.full_load_a, volts * m.full_load_a, (j,), volts)
    pairs = PAIRS if k == 3 else PAIRS[:1]
    pair = min(pairs, key=lambda p: load_a[list(p)].sum())
    return MotorLoad(m.id, m.full_load_a, volts * m.full_load_a, pair, volts)
