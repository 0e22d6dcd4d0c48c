"""Feed rules of a job: ids well formed and unique, every element fed from the source by
one run (a radial tree, no loops), and stated voltages matching the feed."""

from __future__ import annotations

import difflib
import re
from collections.abc import Sequence

from ..model import SOURCE_ID, Motor, Panel, Run, Source, Transformer, Tree
from .toml_reader import Reader

ID_RE = re.compile(r"^[A-Za-z0-9][A-Za-z0-9_.\-]{0,39}$")


def check_feed(
    r: Reader,
    transformers: Sequence[Transformer],
    runs: Sequence[Run],
    panels: Sequence[Panel],
    motors: Sequence[Motor],
    source: Source | None = None,
) -> None:
    """Collect every problem with ids and the shape of the feed into ``r``. A run may
    leave a low-voltage source (service conductors); a medium-voltage source feeds
    transformers only, with no run (medium-voltage conductors are not checked)."""
    malformed = _check_ids(r, transformers, runs, panels, motors)
    nodes = {SOURCE_ID: "source"}
    # an element wrongly named 'source' is reported above; it must not hide the source
    nodes.update({t.id: "transformer" for t in transformers if t.id != SOURCE_ID})
    nodes.update({p.id: "panel" for p in panels if p.id != SOURCE_ID})
    incoming = _check_runs(r, runs, nodes, source)
    _check_feeders(r, transformers, panels, motors, nodes, incoming, malformed)
    if not r.problems:
        _check_reachable(r, transformers, runs, panels, nodes, incoming)


def _check_ids(r: Reader, transformers, runs, panels, motors) -> set[str]:
    """Ids well formed, not 'source', unique; returns the malformed ones (reported once
    here, not again as unfed or unknown)."""
    seen: dict[str, str] = {}
    malformed: set[str] = set()
    for kind, coll in (
        ("transformer", transformers),
        ("run", runs),
        ("panel", panels),
        ("motor", motors),
    ):
        for i, e in enumerate(coll, start=1):
            if not e.id:
                continue
            if not ID_RE.match(e.id):
                malformed.add(e.id)
                r.add(
                    f"{kind}[{i}].id",
                    e.id,
                    "an id of letters, digits, '-', '_' or '.' "
                    "(at most 40, starting with a letter or digit)",
                )
            if e.id.lower() == SOURCE_ID:
                r.add(f"{kind}[{i}].id", e.id, "an id other than 'source' (reserved)")
            elif e.id in seen:
                r.add(f"{kind}[{i}].id", e.id, f"a unique id ({seen[e.id]} has it already)")
            else:
                seen[e.id] = f"{kind}[{i}]"
    return malformed


def _hint(target: str, ids: list[str]) -> str:
    close = difflib.get_close_matches(target, ids, n=1)
    return f" — did you mean {close[0]!r}?" if close else ""


def _check_runs(r: Reader, runs, nodes: dict[str, str], source) -> dict[str, list[str]]:
    """Each run's ends name known nodes; returns node id -> the runs into it."""
    all_ids = list(nodes)
    incoming: dict[str, list[str]] = {}
    for i, run in enumerate(runs, start=1):
        for key, target in (("from", run.from_id), ("to", run.to_id)):
            if target and target not in nodes:
                r.add(
                    f"run[{i}].{key}",
                    target,
                    "the id of the source, a transformer or a panel" + _hint(target, all_ids),
                )
        if run.to_id == SOURCE_ID:
            r.add(f"run[{i}].to", run.to_id, "a transformer or panel (nothing feeds the source)")
        if run.from_id and run.from_id == run.to_id:
            r.add(f"run[{i}].to", run.to_id, "a different element than its 'from'")
        if run.from_id == SOURCE_ID and source is not None and source.medium_voltage:
            r.add(
                f"run[{i}].from",
                run.from_id,
                f"a transformer or panel: the source is at {source.voltage.text}, and "
                "medium-voltage runs are not checked (give the transformer from = "
                "'source' and no run into it)",
            )
        if run.to_id in nodes:
            incoming.setdefault(run.to_id, []).append(f"run[{i}]")
    return incoming


def _check_feeders(r: Reader, transformers, panels, motors, nodes, incoming, malformed) -> None:
    """Transformers fed from the source or a panel, motors on panels, one run per node."""
    all_ids = list(nodes)
    for i, t in enumerate(transformers, start=1):
        if t.from_id not in nodes:
            hint = _hint(t.from_id, all_ids)
            r.add(f"transformer[{i}].from", t.from_id, "'source' or a panel id" + hint)
        elif nodes[t.from_id] == "transformer":
            r.add(f"transformer[{i}].from", t.from_id, "'source' or a panel id")
        if t.from_id != SOURCE_ID and not incoming.get(t.id):
            r.add(
                f"transformer[{i}].from",
                t.from_id,
                f"a [[run]] from {t.from_id!r} to {t.id!r} (the primary feeder)",
            )
    for i, m in enumerate(motors, start=1):
        if (m.panel_id and m.panel_id not in nodes) or nodes.get(m.panel_id) != "panel":
            r.add(f"motor[{i}].panel", m.panel_id, "the id of a panel")
    for nid, srcs in incoming.items():
        if len(srcs) > 1:
            r.add(f"{srcs[1]}.to", nid, f"one run into {nid!r} (radial feed; {srcs[0]} feeds it)")
    for i, p in enumerate(panels, start=1):
        if p.id and p.id not in incoming and p.id not in malformed:
            r.add(f"panel[{i}].id", p.id, "a [[run]] with to = " + repr(p.id) + " feeding it")


def _check_reachable(r: Reader, transformers, runs, panels, nodes, incoming) -> None:
    """Every node reached from the source (catches loops and islands)."""
    children: dict[str, list[str]] = {}
    for run in runs:
        children.setdefault(run.from_id, []).append(run.to_id)
    for t in transformers:
        if t.from_id == SOURCE_ID and t.id not in incoming:
            children.setdefault(SOURCE_ID, []).append(t.id)
    reached = {SOURCE_ID}
    stack = [SOURCE_ID]
    while stack:
        n = stack.pop()
        for c in children.get(n, []):
            if c not in reached:
                reached.add(c)
                stack.append(c)
    for nid, kind in nodes.items():
        if nid not in reached:
            idx = [e.id for e in (transformers if kind == "transformer" else panels)].index(nid) + 1
            r.add(
                f"{kind}[{idx}].id",
                nid,
                "an element fed from the source (this one is in a loop "
                "or not connected: the feed must be a tree)",
            )


def check_voltages(
    r: Reader, tree: Tree, transformers: Sequence[Transformer], panels: Sequence[Panel]
) -> None:
    """Each element's stated voltage must match the voltage of the node that feeds it."""
    for i, pn in enumerate(panels, start=1):
        if pn.voltage is not None:
            _check_panel_voltage(r, i, pn, tree.voltage_of[tree.parent_node[pn.id]])
    for i, t in enumerate(transformers, start=1):
        have = tree.voltage_of[tree.parent_node[t.id]]
        if t.primary and (
            abs(have.voltage_ll_v - t.primary.voltage_ll_v) > 0.5 or have.phases < t.primary.phases
        ):
            r.add(
                f"transformer[{i}].primary",
                t.primary.text,
                f"the voltage of what feeds it ({have.text})",
            )


def _check_panel_voltage(r: Reader, i: int, pn: Panel, have) -> None:
    """A panel's stated voltage against its feed; a single-phase panel on a three-phase
    feed (line voltage equal, a neutral only where the feed has one at that voltage) and
    its pair (120/240 V on a high-leg delta: C-A, beside the neutral tap)."""
    pair = pn.phases_connected
    if abs(have.voltage_ll_v - pn.voltage.voltage_ll_v) > 0.5 or have.phases < pn.voltage.phases:
        r.add(
            f"panel[{i}].voltage",
            pn.voltage.text,
            f"the voltage of the feed that reaches it ({have.text})",
        )
    elif pair and have.phases != 3:
        r.add(
            f"panel[{i}].phases_connected",
            f"{pair[0]}-{pair[1]}",
            f"no value: the feed ({have.text}) is not three-phase, the panel takes its lines",
        )
    elif have.kind == "highleg" and pn.voltage.kind == "split" and pair not in ("", "CA"):
        r.add(
            f"panel[{i}].phases_connected",
            f"{pair[0]}-{pair[1]}",
            '"C-A" or none: a 120/240 V panel on a high-leg delta takes the legs beside '
            "the neutral tap (B is the high leg, 208 V to neutral; 408.3(E)(1))",
        )
    elif pn.voltage.voltage_ln_v is not None and (
        have.voltage_ln_v is None or abs(have.voltage_ln_v - pn.voltage.voltage_ln_v) > 0.5
    ):
        have_n = "none" if have.voltage_ln_v is None else f"{have.voltage_ln_v:g} V"
        r.add(
            f"panel[{i}].voltage",
            pn.voltage.text,
            f"a voltage without a neutral, or a feed with a {pn.voltage.voltage_ln_v:g} V "
            f"neutral ({have.text} has {have_n})",
        )


def check_series(r: Reader, tree: Tree, runs: Sequence[Run], panels: Sequence[Panel]) -> None:
    """A series-rated panel names a run on its own feed (from the source down to it)."""
    by_id = {x.id: x for x in runs}
    for i, pn in enumerate(panels, start=1):
        if not pn.series_upstream_run:
            continue
        path, n = set(), pn.id
        while n is not None:
            run = tree.parent_run.get(n)
            if run is not None:
                path.add(run.id)
            n = tree.parent_node[n]
        if pn.series_upstream_run not in path:
            r.add(
                f"panel[{i}].series_upstream",
                pn.series_upstream_run,
                "the id of a run on the feed to this panel whose device is the line-side "
                "device of the series combination" + _hint(pn.series_upstream_run, sorted(path)),
            )
        elif by_id[pn.series_upstream_run].device_a is None:
            r.add(
                f"panel[{i}].series_upstream",
                pn.series_upstream_run,
                "a run with a device (the line-side device of the series combination)",
            )
