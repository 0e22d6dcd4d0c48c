"""The feed as a radial tree: nodes in topological order with their parents.

Nodes are the source, transformers and panels; runs are the edges. A transformer
with no run into it hangs directly on the source (zero-length connection).
"""

from __future__ import annotations

from dataclasses import dataclass

from .job import SOURCE_ID, Job, Run
from .units import VoltageSystem


@dataclass(frozen=True)
class Tree:
    order: tuple[str, ...]  # node ids, parents before children; order[0] == "source"
    kind: dict[str, str]  # node id -> "source" | "transformer" | "panel"
    parent_node: dict[str, str | None]
    parent_run: dict[str, Run | None]
    voltage_of: dict[str, VoltageSystem]  # voltage at the node (secondary for transformers)
    upstream_transformer: dict[str, str | None]
    distance_m: dict[str, float]

    def parent_index(self) -> list[int]:
        pos = {n: i for i, n in enumerate(self.order)}
        return [-1 if self.parent_node[n] is None else pos[self.parent_node[n]] for n in self.order]

    def children(self, node: str) -> list[str]:
        return [n for n in self.order if self.parent_node[n] == node]


def build_tree(job: Job) -> Tree:
    """Order the feed from the source down; assumes job validation passed."""
    kind = {SOURCE_ID: "source"}
    kind.update({t.id: "transformer" for t in job.transformers})
    kind.update({p.id: "panel" for p in job.panels})
    parent_run: dict[str, Run | None] = {SOURCE_ID: None}
    parent_node: dict[str, str | None] = {SOURCE_ID: None}
    for run in job.runs:
        parent_run[run.to_id] = run
        parent_node[run.to_id] = run.from_id
    for t in job.transformers:
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
    tx = {t.id: t for t in job.transformers}
    voltage_of: dict[str, VoltageSystem] = {}
    upstream: dict[str, str | None] = {}
    distance: dict[str, float] = {}
    for n in order:
        p = parent_node[n]
        run = parent_run.get(n)
        distance[n] = 0.0 if p is None else distance[p] + (run.length_m if run else 0.0)
        if n == SOURCE_ID:
            voltage_of[n] = job.source.voltage
            upstream[n] = None
        elif kind[n] == "transformer":
            voltage_of[n] = tx[n].secondary
            upstream[n] = n
        else:
            voltage_of[n] = voltage_of[p]
            upstream[n] = upstream[p]
    return Tree(tuple(order), kind, parent_node, parent_run, voltage_of, upstream, distance)
