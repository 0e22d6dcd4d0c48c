"""Phase-by-phase loads of the feed: single-phase elements on three-phase panels and the
heaviest phase.

Every node (panel, transformer secondary, source) gets the current on each of its
lines, continuous and noncontinuous apart, own load plus everything it feeds; and every
element gets the current it draws on the lines of what feeds it (what the run into it
carries). Feeders, buses, mains and transformer windings are judged on the heaviest
line's design current (continuous part at 125 %), not on the balanced average
(NFPA 70-2023 215.2(A)(1), 210.19(A)(1)).

Method (:mod:`feedcheck.calc.phase_loading`):

* a panel's own load comes per line from its schedule (each circuit on the phases of
  its spaces), or, given as one figure in the job, spread evenly over its lines;
* a panel fed at its own voltage passes its line currents up unchanged;
* a single-phase transformer on a three-phase panel draws S / V_LL on the two lines
  of its pair (job key ``phases_connected``; when absent the pairs are assigned to
  balance and the report says so);
* a three-phase transformer passes its balanced part up as a three-phase load and the
  excess of each secondary phase over the lightest as a single-phase load: line to line
  on the primary pair of that phase's winding for a delta primary, line to neutral on
  the same phase for a wye primary (the winding pairing, e.g. a on AB, is an assumption
  stated in the report; it moves the excess between phases, not its size).
* currents on one line from several elements add arithmetically (an upper bound of the
  phasor sum; conservative for conductor, bus and device checks).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from ..calc.phase_loading import CONNECTIONS, UNSPECIFIED, assign_connections, element_current_a
from ..model import Job, Transformer, Tree, VoltageSystem

PAIR_OF_PHASE = ("AB", "BC", "CA")  # delta primary winding of secondary phase a, b, c
LETTERS = ("A", "B", "C")


def lines_of(v: VoltageSystem) -> int:
    """Number of ungrounded lines: 3 (three-phase), 2 (120/240 V), 1 (two-wire)."""
    return 3 if v.phases == 3 else (2 if v.kind == "split" else 1)


def line_share_v(v: VoltageSystem) -> float:
    """Volts per ampere of one line's share of a balanced load [V]: S = I · Σ V_line."""
    voltage_ll_v = v.voltage_ll_v
    return {3: voltage_ll_v / math.sqrt(3.0), 2: voltage_ll_v / 2.0, 1: voltage_ll_v}[lines_of(v)]


@dataclass
class PhaseLoad:
    """Line currents at a node and the currents its feed carries.

    ``cont_a``/``non_a``: continuous / noncontinuous current on lines A, B, C of the
    node's own voltage (transformers: the secondary) [A]; ``feed_cont_a``/``feed_non_a``
    the same on the lines of the node feeding it; ``connection`` the lines the element
    takes there (``ABC``, a pair, a phase), ``assigned`` True when chosen to balance.
    """

    lines: int
    cont_a: np.ndarray = field(default_factory=lambda: np.zeros(3))
    non_a: np.ndarray = field(default_factory=lambda: np.zeros(3))
    feed_cont_a: np.ndarray = field(default_factory=lambda: np.zeros(3))
    feed_non_a: np.ndarray = field(default_factory=lambda: np.zeros(3))
    connection: str = "ABC"
    assigned: bool = False
    single_phase_feed: bool = False  # a single-phase element on a three-phase node

    def design_a(self, factor: float) -> np.ndarray:
        return factor * self.cont_a + self.non_a

    def heaviest(self, factor: float) -> int:
        """Index of the line with the largest design current (first one on ties)."""
        return int(np.argmax(self.design_a(factor)[: self.lines]))

    def feed_heaviest(self, factor: float) -> int:
        return int(np.argmax(factor * self.feed_cont_a + self.feed_non_a))


def roll_up_phases(job: Job, tree: Tree, own: dict) -> dict[str, PhaseLoad]:
    """Line currents of every node (own load + downstream) and of every feed.

    ``own``: node id -> :class:`~feedcheck.checks.context.Load` of the node's own load
    (``phase_cont_a``/``phase_non_a`` when known per line, else spread evenly).
    """
    tx = {t.id: t for t in job.transformers}
    pairs = {p.id: p.phases_connected for p in job.panels}  # single-phase panels' pairs
    out: dict[str, PhaseLoad] = {}
    for n in tree.order:
        v = tree.voltage_of[n]
        k = lines_of(v)
        o = own[n]
        pload = PhaseLoad(k)
        if o.phase_cont_a is not None:
            pload.cont_a += np.asarray(o.phase_cont_a, float)
            pload.non_a += np.asarray(o.phase_non_a, float)
        else:
            pload.cont_a[:k] += o.continuous_va / k / line_share_v(v)
            pload.non_a[:k] += (o.va - o.continuous_va) / k / line_share_v(v)
        out[n] = pload
    children: dict[str, list[str]] = {n: [] for n in tree.order}  # tree.children, at once
    for n in tree.order:
        if tree.parent_node[n] is not None:
            children[tree.parent_node[n]].append(n)
    for p in reversed(tree.order):
        kids = children[p]
        if kids:
            _feed_children(tree, tx, p, kids, out, pairs)
    return out


def _feed_children(tree: Tree, tx: dict, p: str, kids: list[str], out: dict, pairs) -> None:
    """Currents each child draws on the lines of ``p``; added to ``p``'s lines."""
    pv = tree.voltage_of[p]
    parent = out[p]
    if pv.phases != 3:
        for c in kids:
            fc, fn = _single_phase_parent_feed(tree, tx.get(c), c, pv, out[c])
            _store(out[c], parent, fc, fn)
        return
    # three-phase node: every child as elements (VA, connection, continuous)
    elements: list[tuple[str, float, float, str]] = []  # (child, cont VA, non VA, conn)
    for c in kids:
        elements += _elements_of_child(tree, tx.get(c), c, out[c], pairs)
    va = [ce + ne for _, ce, ne, _ in elements]
    conn = assign_connections(va, [e[3] for e in elements], pv.voltage_ll_v) if elements else []
    by_child: dict[str, list] = {c: [] for c in kids}  # each child's elements, in order
    for element, used in zip(elements, conn, strict=True):
        by_child[element[0]].append((element, used))
    passed = {c: tx.get(c) is None and out[c].single_phase_feed for c in kids}  # own lines
    # the line currents of every element drawn through p's lines, in one call each (the
    # kernel works element by element: the same figures as one call per child)
    drawn = [e for c in kids if not passed[c] for e in by_child[c]]
    currents = _element_currents(drawn, pv.voltage_ll_v)
    at = 0
    for c in kids:
        fc, fn = np.zeros(3), np.zeros(3)
        for (_child, _ce, _ne, given), used in by_child[c]:
            ph = list(CONNECTIONS[used])
            if given in UNSPECIFIED or out[c].single_phase_feed:
                out[c].connection, out[c].assigned = used, given in UNSPECIFIED
            if passed[c]:
                _pass_lines(out[c], ph, fc, fn)  # a single-phase panel: its own lines
                continue
            fc[ph] += currents[0][at]
            fn[ph] += currents[1][at]
            at += 1
        _store(out[c], parent, fc, fn)


def _element_currents(elements: list, voltage_ll_v: float) -> tuple[np.ndarray, np.ndarray]:
    """Continuous and noncontinuous line current [A] of each (element, connection) of
    one child, in one call each."""
    if not elements:
        return np.zeros(0), np.zeros(0)
    used = np.array([u for _, u in elements], dtype=object)
    cont = np.array([e[1] for e, _ in elements], dtype=float)
    non = np.array([e[2] for e, _ in elements], dtype=float)
    return (
        np.atleast_1d(element_current_a(cont, used, voltage_ll_v)),
        np.atleast_1d(element_current_a(non, used, voltage_ll_v)),
    )


def _pass_lines(load: PhaseLoad, ph: list[int], fc, fn) -> None:
    """A single-phase panel's line currents onto the pair it takes: a two-wire panel's
    one current on both lines (S / V_LL), a three-wire panel's lines one to one."""
    for j, line in enumerate(ph):
        k = min(j, load.lines - 1)
        fc[line] += load.cont_a[k]
        fn[line] += load.non_a[k]


def _store(child: PhaseLoad, parent: PhaseLoad, fc, fn) -> None:
    child.feed_cont_a, child.feed_non_a = fc, fn
    parent.cont_a += fc
    parent.non_a += fn


def _elements_of_child(tree, t: Transformer | None, c: str, load: PhaseLoad, pairs: dict):
    """A child of a three-phase node as (child, cont VA, non VA, connection) elements."""
    v = tree.voltage_of[c]
    lv = line_share_v(v)
    cont_va, non_va = load.cont_a * lv, load.non_a * lv
    if t is None and v.phases == 1:  # a single-phase panel on a pair of lines
        load.single_phase_feed = True
        given = pairs.get(c, "") or "LL"
        if tree.voltage_of[tree.parent_node[c]].kind == "highleg" and v.kind == "split":
            given = "CA"  # 120 V legs beside the neutral tap (B is the high leg, 408.3(E)(1))
        return [(c, float(cont_va.sum()), float(non_va.sum()), given)]
    if t is None:  # a panel at the node's own voltage: its lines pass up unchanged
        return [(c, float(cont_va[j]), float(non_va[j]), LETTERS[j]) for j in range(3)]
    if t.primary.phases == 1:
        load.single_phase_feed = True
        given = getattr(t, "phases_connected", "") or "LL"
        return [(c, float(cont_va.sum()), float(non_va.sum()), given)]
    out = []
    bal_c, bal_n = 3 * cont_va.min(), 3 * non_va.min()
    out.append((c, float(bal_c), float(bal_n), "ABC"))
    wye = t.primary.kind == "wye"
    for j in range(3):
        ec, en = cont_va[j] - cont_va.min(), non_va[j] - non_va.min()
        if ec > 0 or en > 0:
            out.append((c, float(ec), float(en), LETTERS[j] if wye else PAIR_OF_PHASE[j]))
    return out


def _single_phase_parent_feed(tree, t, c: str, pv: VoltageSystem, load: PhaseLoad):
    """Line currents a child draws from a single-phase (two- or three-wire) node."""
    if t is None:  # a panel at the node's voltage
        return load.cont_a.copy(), load.non_a.copy()
    lv = line_share_v(tree.voltage_of[c])
    cont_va, non_va = float((load.cont_a * lv).sum()), float((load.non_a * lv).sum())
    fc, fn = np.zeros(3), np.zeros(3)
    if lines_of(pv) == 2 and abs(t.primary.voltage_ll_v - pv.voltage_ll_v) <= 0.5:
        lines, volts, load.connection = [0, 1], pv.voltage_ll_v, "AB"
    else:  # a two-wire node, or a line-to-neutral primary on 120/240 V
        lines = [1] if getattr(t, "phases_connected", "") == "B" else [0]
        volts = t.primary.voltage_ll_v
        load.connection = LETTERS[lines[0]]
    fc[lines] = cont_va / volts
    fn[lines] = non_va / volts
    return fc, fn


# ------------------------------------------------------------------ checks and sheets
def phase_design_steps(ctx, node: str, sheet, rule_id: str) -> tuple[float, str]:
    """Sheet steps with every line's continuous, noncontinuous and design current, and
    the heaviest line's design current [A] with its letter."""
    ph = ctx.phases[node]
    f = ctx.design_factor()
    design = ph.design_a(f)
    for j in range(ph.lines):
        sheet.step(
            f"Phase {LETTERS[j]} current",
            f"I_design = {100 * f:g} % · I_continuous + I_noncontinuous",
            f"{f:g} × {ph.cont_a[j]:.1f} + {ph.non_a[j]:.1f}",
            float(design[j]),
            "A",
        )
    k = ph.heaviest(f)
    value = float(design[k])
    sheet.step(
        "Design current (heaviest phase)",
        "max over the phases of I_design",
        f"phase {LETTERS[k]}",
        value,
        "A",
        rule_id,
    )
    return value, LETTERS[k]


def check_transformer_phases(ctx, t: Transformer) -> None:
    """Each secondary winding judged on its heaviest line's design current (continuous
    at 125 %) against the rated secondary current (rule xfmr-loading)."""
    from ..calc.power import current_from_apparent_power_a

    v = t.secondary
    ph = ctx.phases[t.id]
    if float((ph.cont_a + ph.non_a).sum()) <= 0:
        return
    rated = float(current_from_apparent_power_a(t.rating_va, v.voltage_ll_v, v.phases))
    sh = ctx.sheet(t.id, "transformer", f"Transformer {t.id}")
    from .motor_sheet import node_adder_step

    node_adder_step(ctx, t.id, sh)
    value, letter = phase_design_steps(ctx, t.id, sh, "xfmr-loading")
    rule = ctx.rules.rule("xfmr-loading")
    limit_a = rated * rule.number("limit") / 100.0
    ctx.nodes[t.id].values["design_current_a"] = value
    ctx.compare(
        t.id,
        "winding loading (heaviest phase)",
        value,
        limit_a,
        "A",
        "at_most",
        "xfmr-loading",
        f"phase {letter} secondary design current {value:.1f} A (continuous at 125 %) vs "
        f"{rule.number('limit'):g} % of the rated {rated:.1f} A",
        fail_status=rule["status"],
    )


def report_connections(ctx) -> None:
    """Say how single-phase units and panels sit on three-phase feeds; an assigned pair
    is an assumption of the report and an info finding naming the key that fixes it."""
    elements = [(t, "transformer", "Transformer") for t in ctx.job.transformers]
    elements += [(p, "panel", "Panel") for p in ctx.job.panels]
    for e, kind, title in elements:
        ph = ctx.phases.get(e.id)
        if ph is None:
            continue
        if not ph.single_phase_feed:
            if kind == "transformer":
                _say_unbalanced_primary(ctx, e, ph)
            continue
        pair = "-".join(ph.connection)
        sh = ctx.sheet(e.id, kind, f"{title} {e.id}")
        sh.inputs.append(("Lines taken on the feed", pair + (" (assigned)" if ph.assigned else "")))
        if ph.assigned:
            what = "unit" if kind == "transformer" else "panel"
            text = (
                f"{e.id}: single-phase {what} placed on lines {pair} of "
                f"{ctx.tree.parent_node[e.id]} to balance the phases (the job gives no "
                f'pair; set phases_connected = "{pair}" on [[{kind}]] {e.id} to fix it)'
            )
            ctx.assume(text)
            ctx.add(
                e.id, "lines taken on the feed", None, None, "", "info", "phase-connection", text
            )


def _say_unbalanced_primary(ctx, t: Transformer, ph: PhaseLoad) -> None:
    """State how an unbalanced three-phase secondary is carried to the primary."""
    load = ph.cont_a + ph.non_a
    if ph.lines != 3 or load.max() - load.min() <= 1e-9 * max(1.0, load.max()):
        return
    how = (
        "line to neutral on the same phase"
        if t.primary.kind == "wye"
        else "line to line on the primary pair of its winding (a on A-B, b on B-C, c on C-A)"
    )
    ctx.assume(
        f"{t.id}: the secondary phases are unequally loaded; the balanced part is carried "
        f"to the primary as a three-phase load and each phase's excess {how} "
        "(the winding pairing moves the excess between phases, not its size)"
    )
