"""Shared state of one check run: the job, its tree, loads, and what checks emit."""

from __future__ import annotations

from collections.abc import Iterator, Mapping, Sequence
from contextlib import contextmanager
from dataclasses import dataclass, field, replace
from functools import cached_property

from ..calc.power import current_from_apparent_power_a
from ..findings import Finding, Status
from ..model import Job, Tree
from ..render.display import Display
from ..results import NodeResult, Sheet
from ..rulebook import RowUse, RuleBook, current_rulebook
from .compare import TOLERANCE, Direction, compare
from .loads import PhaseLoad, roll_up_phases


@dataclass
class Load:
    """Demand load at a node, own plus everything downstream of it."""

    va: float = 0.0
    continuous_va: float = 0.0
    w: float = 0.0  # real power, to derive the combined power factor
    # own load per line (A, B, C) at the node's voltage [A] when known (schedules);
    # None: spread evenly over the node's lines
    phase_cont_a: tuple[float, float, float] | None = None
    phase_non_a: tuple[float, float, float] | None = None
    lighting_va: float | None = None  # connected general lighting of a schedule [VA]
    chain: object = None  # calc.demand_chain.DemandChain of a schedule, for the sheet
    # the schedule's largest-motor 25 % on lines A, B, C [A] (part of phase_non_a)
    motor_adder_a: tuple[float, float, float] | None = None

    @property
    def pf(self) -> float:
        return self.w / self.va if self.va > 0 else 1.0


@dataclass
class Context:
    """One check run. ``rules`` is the rule book: every table as typed records, and
    ``rules.rule(rule_id)`` the one way to fetch a rule row."""

    job: Job
    tree: Tree
    loads: dict[str, Load]
    rules: RuleBook
    findings: list[Finding] = field(default_factory=list)
    sheets: dict[str, Sheet] = field(default_factory=dict)
    nodes: dict[str, NodeResult] = field(default_factory=dict)
    run_values: dict[str, dict[str, float]] = field(default_factory=dict)
    assumptions: list[str] = field(default_factory=list)
    methods: list[tuple[str, str]] = field(default_factory=list)
    calc_date: str | None = None  # ISO date of the calculation, handed in by the command
    phases: dict[str, PhaseLoad] = field(default_factory=dict)  # line currents per node
    lighting_minimum: list = field(default_factory=list)  # 220.12 figures (checks/lighting)
    chains: dict = field(default_factory=dict)  # panel id -> DemandChain of its schedule
    reading_rows: list[RowUse] = field(default_factory=list)  # see reading()
    reading_by_subject: list[Mapping[str, Sequence[RowUse]]] = field(default_factory=list)
    # node or run id -> unconfirmed rows its impedance path reads (checks/impedance.py)
    impedance_rows: dict[str, tuple[RowUse, ...]] = field(default_factory=dict)
    motor_loads: dict = field(default_factory=dict)  # panel id -> motors' 430.24 shares
    # node id -> NodeAdders: the one largest-motor 25 % of every node above a motor panel
    node_motor_adders: dict = field(default_factory=dict)
    ampacity_row_cache: dict = field(default_factory=dict)  # see ampacity_rows()
    # rule id -> its RowUse; id(RowUse) -> (RowUse, its note or None when confirmed):
    # unconfirmed_notes()
    cited_row_cache: dict = field(default_factory=dict, repr=False)
    seen_cache: dict = field(default_factory=dict, repr=False)  # method(), assume()
    row_note_cache: dict = field(default_factory=dict, repr=False)

    @cached_property
    def panel_by_id(self) -> dict:
        """The job's panels by id (looked up once per node, not by a scan of them all)."""
        return _first_by_id(self.job.panels)

    @cached_property
    def transformer_by_id(self) -> dict:
        return _first_by_id(self.job.transformers)

    @cached_property
    def run_by_id(self) -> dict:
        return _first_by_id(self.job.runs)

    def length(self, length_m: float, decimals: int | None = None, pair: bool = False) -> str:
        """A length [m] for a note or a sheet, in the unit the job is written in (``pair``:
        the other unit beside it in brackets)."""
        display = Display(getattr(self.job, "length_unit", "ft"))
        return display.length_pair(length_m) if pair else display.length(length_m, None, decimals)

    def design_factor(self) -> float:
        """The continuous-load factor (rule device-continuous-125)."""
        return self.rules.protection.continuous_factor

    def feed_currents_a(self, node: str) -> tuple[float, float]:
        """Continuous and noncontinuous current [A] of the heaviest line of the feed
        into ``node`` (on the lines of what feeds it), continuous at 125 %."""
        ph = self.phases[node]
        k = ph.feed_heaviest(self.design_factor())
        return float(ph.feed_cont_a[k]), float(ph.feed_non_a[k])

    @contextmanager
    def reading(
        self, *uses: RowUse, by_subject: Mapping[str, Sequence[RowUse]] | None = None
    ) -> Iterator[None]:
        """Findings added inside this block are computed from the rows ``uses`` (from
        :meth:`RuleBook.row_use` and friends), and those about a subject of
        ``by_subject`` from that subject's rows too: each unconfirmed row puts its note
        on them. The rule row a finding cites (its ``rule_id``) is always read; it need
        not be named here."""
        n, m = len(self.reading_rows), len(self.reading_by_subject)
        self.reading_rows.extend(uses)
        if by_subject:
            self.reading_by_subject.append(by_subject)
        try:
            yield
        finally:
            del self.reading_rows[n:]
            del self.reading_by_subject[m:]

    def unconfirmed_notes(self, rule_id: str, subject: str = "") -> tuple[str, ...]:
        """Notes of the unconfirmed rows a finding about ``subject`` citing ``rule_id``
        rests on: the rows being read (:meth:`reading`) and the rule row itself."""
        uses = list(self.reading_rows)
        for rows in self.reading_by_subject:
            uses += rows.get(subject, ())
        try:  # the rule book's rows do not change during a check: each looked at once
            cited = self.cited_row_cache[rule_id]
        except KeyError:
            cited = self.cited_row_cache[rule_id] = self.rules.rule_use(rule_id)
        if cited is not None:
            uses.append(cited)
        notes, known = [], self.row_note_cache
        for u in uses:  # by identity: the entry holds the row, so its id is not reused
            hit = known.get(id(u))
            if hit is None or hit[0] is not u:
                hit = known[id(u)] = (u, None if u.confirmed else u.note())
            if hit[1] is not None:
                notes.append(hit[1])
        return tuple(dict.fromkeys(notes)) if notes else ()

    def ampacity_rows(self, run, size: str | None = None) -> tuple[RowUse, ...]:
        """The ampacity table rows a figure of ``run`` (or of ``size`` in its place)
        reads (:meth:`RuleBook.ampacity_uses`)."""
        key = (size or run.size.name, run.material, run.raceway == "free-air")
        rows = self.ampacity_row_cache.get(key)
        if rows is None:  # the same few sizes recur over a building's runs: read once
            rows = self.ampacity_row_cache[key] = self.rules.ampacity_uses(*key)
        return rows

    def add(
        self,
        subject: str,
        check: str,
        value,
        limit,
        unit: str,
        status: Status,
        rule_id: str,
        note: str = "",
    ) -> Finding:
        f = Finding(
            subject,
            check,
            _f(value),
            _f(limit),
            unit,
            status,
            rule_id,
            note,
            self.unconfirmed_notes(rule_id, subject),
        )
        self.findings.append(f)
        return f

    def compare(
        self,
        subject: str,
        check: str,
        value,
        limit,
        unit: str,
        direction: Direction,
        rule_id: str,
        note: str = "",
        *,
        fail_status: str = "fail",
        tolerance: float = TOLERANCE,
    ) -> Finding:
        """:func:`~feedcheck.checks.compare.compare` ``value`` with ``limit`` and keep the
        Finding (arguments in the order of :meth:`add`; the status comes from the test)."""
        rule = {"rule_id": rule_id, "status": fail_status}
        f = compare(value, limit, direction, rule, subject, check, unit, note, tolerance=tolerance)
        notes = self.unconfirmed_notes(rule_id, subject)
        if notes:
            f = replace(f, unconfirmed=notes)
        self.findings.append(f)
        return f

    def sheet(self, element_id: str, kind: str, title: str) -> Sheet:
        """The element's sheet (made on first use); a sheet never goes untitled: without
        a title it is called by its kind and id until a check gives one."""
        sh = self.sheets.get(element_id)
        if sh is None:
            default = (
                kind.capitalize() if element_id == kind else f"{kind.capitalize()} {element_id}"
            )
            sh = self.sheets[element_id] = Sheet(element_id, kind, title or default)
        elif title:
            sh.title = title
        return sh

    def method(self, name: str, source: str) -> None:
        _add_once(self.methods, (name, source), self.seen_cache)

    def assume(self, text: str) -> None:
        _add_once(self.assumptions, text, self.seen_cache)

    def load_current_a(self, node: str) -> float:
        v = self.tree.voltage_of[node]
        return current_from_apparent_power_a(self.loads[node].va, v.voltage_ll_v, v.phases)


def _add_once(items: list, item, seen_cache: dict) -> None:
    """Append ``item`` to ``items`` unless it is there: looked up in a set kept beside
    the list (rebuilt when the list changed other than here), not by a scan of it (a
    building states a thousand assumptions, one per run)."""
    seen = seen_cache.get(id(items))
    if seen is None or seen[0] is not items or seen[2] != len(items):
        seen = seen_cache[id(items)] = [items, set(items), len(items)]
    if item not in seen[1]:
        items.append(item)
        seen[1].add(item)
        seen[2] += 1


def _first_by_id(items) -> dict:
    """``{id: item}``, the first item of each id (as a scan for it would find)."""
    out: dict = {}
    for item in items:
        out.setdefault(item.id, item)
    return out


def _f(v):
    if v is None:
        return None
    try:
        return float(v)
    except (TypeError, ValueError):
        return v


def build_context(
    job: Job,
    panel_loads: dict[str, Load] | None = None,
    calc_date: str | None = None,
    rules: RuleBook | None = None,
) -> Context:
    """The job's tree plus demand loads rolled up from the panels (own load + downstream).

    ``rules``: the rule book to check against (default: the tables in force,
    shipped or ``--tables DIR``)."""
    tree = job.tree
    book = rules if rules is not None else current_rulebook()
    own: dict[str, Load] = {n: Load() for n in tree.order}
    for p in job.panels:
        if panel_loads and p.id in panel_loads:
            own[p.id] = panel_loads[p.id]
        elif p.load_va is not None:
            own[p.id] = Load(p.load_va, p.continuous_va, p.load_va * p.pf)
    minima = _add_minimum_lighting(job, book, own)
    from .motor_loads import add_motor_loads

    motor_loads, adders = add_motor_loads(job, book, own)
    loads = {n: Load(o.va, o.continuous_va, o.w) for n, o in own.items()}
    for n in reversed(tree.order):
        parent = tree.parent_node[n]
        if parent is not None:
            loads[parent].va += loads[n].va
            loads[parent].continuous_va += loads[n].continuous_va
            loads[parent].w += loads[n].w
    ctx = Context(job, tree, loads, book, calc_date=calc_date)
    ctx.phases = roll_up_phases(job, tree, own)
    from .motor_loads import one_adder_per_node

    ctx.node_motor_adders = one_adder_per_node(job, adders, loads, ctx.phases)
    ctx.lighting_minimum = minima
    ctx.motor_loads = motor_loads
    ctx.chains = {n: o.chain for n, o in own.items() if o.chain is not None}
    return ctx


def _add_minimum_lighting(job: Job, book: RuleBook, own: dict[str, Load]) -> list:
    """Add each panel's shortfall below the 220.12 minimum lighting to its own load
    (continuous, pf 1, evenly over its lines); the figures for the report."""
    from dataclasses import replace

    from .lighting import minimum_lighting
    from .loads import line_share_v, lines_of

    lighting = {n: o.lighting_va for n, o in own.items() if o.lighting_va is not None}
    minima = minimum_lighting(job, book, lighting)
    for m in minima:
        short = m.used_va - (m.scheduled_va or 0.0)
        if short <= 0:
            continue
        o = own[m.panel_id]
        v = job.tree.voltage_of[m.panel_id]
        k = lines_of(v)
        extra = [short / k / line_share_v(v) if j < k else 0.0 for j in range(3)]
        cont = o.phase_cont_a
        own[m.panel_id] = replace(
            o,
            va=o.va + short,
            continuous_va=o.continuous_va + short,
            w=o.w + short,
            phase_cont_a=None
            if cont is None
            else tuple(a + b for a, b in zip(cont, extra, strict=True)),
        )
    return minima
