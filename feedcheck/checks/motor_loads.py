"""Motors in their panels' loads (NFPA 70-2023 430.24): each motor's table full-load
current on the lines it takes, 100 % of every motor plus 25 % of the largest, once per
panel. Called by :func:`feedcheck.checks.context.build_context` when the loads are rolled
up; the checks of the motors themselves are in :mod:`feedcheck.checks.motors`."""

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
    line_v: float  # voltage the FLC is drawn at [V]


def motor_volts(m: Motor, v) -> tuple[float, bool]:
    """Voltage the motor's current is drawn at on its panel [V], and whether it is a
    line-to-neutral load (a single-phase motor rated near the panel's neutral voltage)."""
    ln = (
        m.phases == 1
        and v.neutral_v is not None
        and m.voltage_v is not None
        and abs(m.voltage_v - v.neutral_v) < abs(m.voltage_v - v.line_v)
    )
    return (v.neutral_v if ln else v.line_v), ln


def add_motor_loads(job: Job, book, own: dict) -> dict[str, tuple[list[MotorLoad], float]]:
    """Add every motor to its panel's own load (430.24) and return, per panel, the motors'
    shares and the 25 % adder of the largest motor [VA] (for the calculation sheet).

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
        non[list(big.lines)] += adder / big.va * big.flc_a if big.va > 0 else 0.0
        added = sum(s.va for s in shares) + adder
        own[pid] = replace(
            o,
            va=o.va + added,
            w=o.w + pf * added,
            phase_cont_a=tuple(map(float, cont)),
            phase_non_a=tuple(map(float, non)),
        )
        out[pid] = (shares, adder)
    return out


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
