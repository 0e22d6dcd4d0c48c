"""A job's panel schedules checked together: one frame per kind of panel, not one per panel.

The schedule checks cost a fixed amount per call (pandas frames, factorising, one
Series per column) whatever the schedule's size, while the per-circuit work is a few
microseconds: a 1,000-panel job spent most of its check in those fixed costs. Here the
schedules of every panel sharing a voltage system, an occupancy and a load unit are
joined into one frame with a ``panel`` column (the multi-panel form the schedule checks
already accept), checked once with each panel's own feeder drop, bus and main ratings,
and split back into one :class:`~feedcheck.checks.schedules.ScheduleResult` per panel:
the same figures, findings and order as checking each panel on its own
(``tests/checks/test_schedule_batch.py`` holds the two against each other).

A group of one panel, or a group whose joined check reports bad input (a conductor the
table lacks: the message must name the panel's own file), is checked panel by panel.
Files the reader read together are consecutive rows of its one frame
(:func:`~feedcheck.inputs.schedule_alike.cut_from`): their rows are taken as they are, not
joined again; each result's frames are cut out of the group's when first read, and a
summary reads a few columns without the cut (``ScheduleResult.column``).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..model import Job, Schedule, VoltageSystem
from ..rulebook import RuleBook
from .schedules import (
    Later,
    ScheduleDemand,
    ScheduleResult,
    _rule_rows,
    check_frame,
    check_schedule,
    panel_findings_each,
    schedule_demand,
    schedule_result,
    totals_of_record,
)


@dataclass
class _Group:
    system: VoltageSystem
    occupancy: str
    ids: list[str]
    joined: Schedule | None = None  # None: checked panel by panel
    demand: ScheduleDemand | None = None


class ScheduleBatch:
    """Every schedule of a job: demand first (for the feed walk), circuit checks after."""

    def __init__(self, job: Job, schedules: dict[str, Schedule], book: RuleBook):
        self.job, self.schedules, self.book = job, schedules, book
        self.panels = {p.id: p for p in job.panels}
        groups: dict[tuple, _Group] = {}
        for pid, s in schedules.items():
            v, occ = job.tree.voltage_of[pid], self.panels[pid].occupancy
            key = (v, occ, s.load_unit)
            groups.setdefault(key, _Group(v, occ, [])).ids.append(pid)
        self.groups = list(groups.values())
        self.demands: dict[str, ScheduleDemand] = {}
        for g in self.groups:
            if len(g.ids) > 1:
                g.joined = _join([schedules[p] for p in g.ids])
                g.demand = schedule_demand(g.joined, g.system, g.occupancy, book)
            else:
                pid = g.ids[0]
                self.demands[pid] = schedule_demand(schedules[pid], g.system, g.occupancy, book)

    def loads(self) -> dict:
        """Each panel's demand load for the feed walk, ``{panel_id: Load}``."""
        out = {}
        for g in self.groups:
            if g.demand is not None:
                out.update(g.demand.loads)
            else:
                out[g.ids[0]] = self.demands[g.ids[0]].load
        return {pid: out[pid] for pid in self.schedules}

    def check(self, drops: dict[str, float], limits: dict) -> dict[str, ScheduleResult]:
        """Every panel's checked schedule, in the order the schedules were given."""
        out: dict[str, ScheduleResult] = {}
        for g in self.groups:
            done = None
            if g.joined is not None:
                try:
                    done = self._check_joined(g, drops, limits)
                except InputError:
                    done = None  # re-checked one by one: the message names the file
            if done is None:
                done = {pid: self._check_one(pid, g, drops, limits) for pid in g.ids}
            out.update(done)
        return {pid: out[pid] for pid in self.schedules}

    def _check_one(self, pid, g: _Group, drops, limits) -> ScheduleResult:
        p = self.panels[pid]
        return check_schedule(
            self.schedules[pid],
            g.system,
            feeder_drop_pct=drops.get(pid, 0.0),
            occupancy=g.occupancy,
            bus_a=p.rating_a,
            main_a=p.main_device_a,
            limits=limits,
            demand=self.demands.get(pid)
            or schedule_demand(self.schedules[pid], g.system, g.occupancy, self.book),
            rules=self.book,
        )

    def _check_joined(self, g: _Group, drops, limits) -> dict[str, ScheduleResult]:
        """The group's circuits in one frame (the steps of check_schedule), split back
        per panel."""
        demand, rules = g.demand, _rule_rows(self.book)
        drop = {pid: drops.get(pid, 0.0) for pid in g.ids}
        k = check_frame(g.joined, g.system, drop, limits, demand, self.book, rules)
        loads = demand.loads
        starts = np.searchsorted(demand.panel_code, np.arange(len(g.ids) + 1))
        records = k.panels.to_dict("records")  # once for the group, not per panel
        ratings = [self.panels[pid] for pid in demand.panel_ids]
        each = panel_findings_each(
            k.panels,
            k.imbalance,
            k.per_phase,
            rules,
            g.system,
            [p.rating_a for p in ratings],
            [p.main_device_a for p in ratings],
        )
        out = {}
        column, panel_column = _columns(k.circuits), _columns(k.panels)
        for j, pid in enumerate(demand.panel_ids):
            a, b = int(starts[j]), int(starts[j + 1])
            findings = each[j]
            out[pid] = schedule_result(
                self.schedules[pid],
                g.system,
                (
                    _later_rows(k.circuits, a, b, column),
                    _totals_of(records[j], g.occupancy, g.system),
                    _later_rows(k.panels, j, j + 1, panel_column),
                ),
                (k.q["panel"][a:b], k.q["circuit"][a:b], _slice_found(k.found, a, b), findings),
                loads[pid],
                {pid: loads[pid]},
                _later_rows(k.review, a, b),
            )
        return out


def _join(schedules: list[Schedule]) -> Schedule:
    """One schedule holding the circuits of several one-panel schedules, in order."""
    import pandas as pd

    from ..inputs.schedule_alike import cut_from

    frames = [s.circuits for s in schedules]
    cut = cut_from(schedules)  # the reader's one frame, its rows taken as they are
    circuits = _rows(*cut) if cut is not None else _stacked(frames)
    if circuits is None:
        circuits = pd.concat(frames, ignore_index=True)
    panels = tuple(p for s in schedules for p in s.panels)
    # each panel's spares and spaces as its own file counted them
    spaces = {
        p: (getattr(s, "spaces", {}) or {}).get(p, (0, 0)) for s in schedules for p in s.panels
    }
    return Schedule(schedules[0].path, circuits, schedules[0].load_unit, panels, spaces=spaces)


def _stacked(frames: list):
    """``pd.concat(frames, ignore_index=True)`` column by column, when every frame has
    the same unique columns holding numpy arrays of the same plain dtypes and a default
    index (then it is the same frame: ``tests/checks/test_schedule_batch.py``); None
    otherwise (and on a pandas without the column accessor), for ``pd.concat`` to join
    them. A thousand one-panel frames of a column each per block cost pandas' join plan
    far more."""
    import pandas as pd

    first = frames[0]
    cols = first.columns
    if getattr(first, "_get_column_array", None) is None or not cols.is_unique:
        return None  # pandas 2.x: _get_column_array(i), one column's array
    parts: list[list] = [[] for _ in range(len(cols))]
    for f in frames:
        index = f.index
        plain = type(index) is pd.RangeIndex and index.start == 0 and index.step == 1
        if not plain or f.attrs or not (f.columns is cols or f.columns.equals(cols)):
            return None
        for i, part in enumerate(parts):
            a = f._get_column_array(i)
            if type(a) is not np.ndarray or a.dtype.kind not in "biufO":
                return None
            if part and a.dtype != part[0].dtype:
                return None
            part.append(a)
    data = {c: np.concatenate(part) for c, part in zip(cols, parts, strict=True)}
    return pd.DataFrame(data, columns=cols)


def _rows(frame, a: int, b: int):
    """Rows ``a:b`` of a group's frame numbered from 0: the values of
    ``frame.iloc[a:b].reset_index(drop=True)``, sharing the group's arrays instead of
    copying them (a checked frame is read, never changed in place)."""
    import pandas as pd

    part = frame.iloc[a:b].copy(deep=False)
    part.index = pd.RangeIndex(b - a)
    return part


def _later_rows(frame, a: int, b: int, column=None):
    """:func:`_rows`, cut out when first read (None stays None); ``column`` (name → the
    group's whole column, :func:`_columns`) lets a reader take a column's rows without
    the cut (``ScheduleResult.column``)."""
    if frame is None:
        return None
    return Later(lambda: _rows(frame, a, b), None if column is None else (column, a, b))


def _columns(frame):
    """name → the frame's column as an array, each fetched once."""
    got: dict = {}

    def column(name: str) -> np.ndarray:
        if name not in got:
            got[name] = frame[name].to_numpy()
        return got[name]

    return column


def _slice_found(found: list, a: int, b: int) -> list:
    """The rule failures of circuits ``a:b`` renumbered from 0 (rules without one
    dropped), as :func:`~feedcheck.checks.schedule_rules.apply_rules` gives them."""
    out = []
    for name, rid, idx, vals, lims, unit, status, texts in found:
        lo, hi = np.searchsorted(idx, (a, b))  # idx ascends (np.flatnonzero)
        if hi > lo:
            part = slice(lo, hi)
            out.append(
                (name, rid, idx[part] - a, vals[part], lims[part], unit, status, texts[part])
            )
    return out


def _totals_of(record: dict, occupancy: str, system: VoltageSystem) -> dict:
    """One panel's totals (its record of the group's panel table), as
    :func:`feedcheck.checks.schedules.panel_totals` gives them for a one-panel schedule."""
    return totals_of_record(record, occupancy, system)


def check_files(items, feeder_drop_pct, occupancy, bus_a, main_a, book: RuleBook) -> list:
    """Schedules of ``feedcheck schedule`` (``items``: (schedule, system) in file order)
    checked as :func:`~feedcheck.checks.schedules.check_schedule` checks each alone,
    but the one-panel files alike in system and load unit in one frame (the fixed cost
    per check paid once per group, not once per file). Returns, per item, its
    ScheduleResult or the InputError its check raised.
    """
    from ..errors import InputError

    out: list = [None] * len(items)
    groups: dict[tuple, dict[str, int]] = {}
    for i, (s, system) in enumerate(items):
        g = groups.setdefault((system, s.load_unit), {})
        if len(s.panels) == 1 and s.panels[0] not in g:
            g[s.panels[0]] = i
        else:  # several panels in the file, or a panel id met before: alone
            out[i] = _alone(s, system, feeder_drop_pct, occupancy, bus_a, main_a, book)
    for (system, _unit), members in groups.items():
        done = None
        if len(members) > 1:
            try:
                panel_opts = (feeder_drop_pct, occupancy, bus_a, main_a)
                done = _joined_files(items, members, system, panel_opts, book)
            except InputError:
                done = None  # each file on its own: the message names its file
        for pid, i in members.items():
            if done is not None:
                out[i] = done[pid]
            else:
                s = items[i][0]
                out[i] = _alone(s, system, feeder_drop_pct, occupancy, bus_a, main_a, book)
    return out


def _alone(s, system, feeder_drop_pct, occupancy, bus_a, main_a, book):
    from ..errors import InputError
    from . import schedules  # looked up at each call (a test may stand in for it)

    try:
        check = schedules.check_schedule
        return check(s, system, feeder_drop_pct, occupancy, bus_a, main_a, rules=book)
    except InputError as exc:
        return exc


def _joined_files(items, members, system, panel_opts, book) -> dict:
    """One-panel files checked in one frame, split back per file."""
    from .drop_rules import drop_limits
    from .schedules import panel_totals

    feeder_drop_pct, occupancy, bus_a, main_a = panel_opts
    scheds = [items[i][0] for i in members.values()]
    joined = _join(scheds)
    demand = schedule_demand(joined, system, occupancy, book)
    rules = _rule_rows(book)
    k = check_frame(joined, system, feeder_drop_pct, drop_limits(rules=book), demand, book, rules)
    loads = demand.loads
    totals = panel_totals(k.panels, occupancy, system)
    starts = np.searchsorted(demand.panel_code, np.arange(len(scheds) + 1))
    n = len(scheds)
    each = panel_findings_each(
        k.panels, k.imbalance, k.per_phase, rules, system, [bus_a] * n, [main_a] * n
    )
    out = {}
    column, panel_column = _columns(k.circuits), _columns(k.panels)
    for j, (pid, i) in enumerate(members.items()):
        a, b = int(starts[j]), int(starts[j + 1])
        findings = each[j]
        out[pid] = schedule_result(
            items[i][0],
            system,
            (
                _later_rows(k.circuits, a, b, column),
                totals[j],
                _later_rows(k.panels, j, j + 1, panel_column),
            ),
            (k.q["panel"][a:b], k.q["circuit"][a:b], _slice_found(k.found, a, b), findings),
            loads[pid],
            {pid: loads[pid]},
            _later_rows(k.review, a, b),
        )
    return out
