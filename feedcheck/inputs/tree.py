"""Build the feed tree (:class:`~feedcheck.model.Tree`) once, when the job is read.

Nodes are the source, transformers and panels; runs are the edges. A transformer
with no run into it hangs directly on the source (zero-length connection).
"""

from __future__ import annotations

from collections.abc import Sequence

from ..model import SOURCE_ID, Panel, Run, Source, Transformer, Tree, VoltageSystem


def build_tree(
    source: Source,
    transformers: Sequence[Transformer],
    runs: Sequence[Run],
    panels: Sequence[Panel],
) -> Tree:
    """Order the feed from the source down; assumes the feed rules passed."""
    kind = {SOURCE_ID: "source"}
    kind.update({t.id: "transformer" for t in transformers})
    kind.update({p.id: "panel" for p in panels})
    parent_run: dict[str, Run | None] = {SOURCE_ID: None}
    parent_node: dict[str, str | None] = {SOURCE_ID: None}
    for run in runs:
        parent_run[run.to_id] = run
        parent_node[run.to_id] = run.from_id
    for t in transformers:
        if t.id not in parent_node:
            parent_node[t.id] = SOURCE_ID
            parent_run[t.id] = None
    children: dict[str, list[str]] = {}
    for n, p in parent_node.items():
        if p is not None:
            children.setdefault(p, []).append(n)
    order: list[str] = []
    stack = [SOURCE_ID]
    while stack:  # depth-first, children in file order
        n = stack.pop()
        order.append(n)
        stack.extend(reversed(children.get(n, [])))
    tx = {t.id: t for t in transformers}
    # a single-phase panel (e.g. "208 V 1ph") on two lines of a three-phase feed
    own_v = {p.id: p.voltage for p in panels if p.voltage is not None and p.voltage.phases == 1}
    voltage_of: dict[str, VoltageSystem] = {}
    upstream: dict[str, str | None] = {}
    distance: dict[str, float] = {}
    for n in order:
        p = parent_node[n]
        run = parent_run.get(n)
        distance[n] = 0.0 if p is None else distance[p] + (run.length_m if run else 0.0)
        if n == SOURCE_ID:
            voltage_of[n] = source.voltage
            upstream[n] = None
        elif kind[n] == "transformer":
            voltage_of[n] = tx[n].secondary
            upstream[n] = n
        else:
            voltage_of[n] = voltage_of[p]
            if n in own_v and voltage_of[p].phases == 3:
                voltage_of[n] = own_v[n]
            upstream[n] = upstream[p]
    return Tree(tuple(order), kind, parent_node, parent_run, voltage_of, upstream, distance)
