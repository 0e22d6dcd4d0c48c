"""What the renderers need besides the figures, put into the results where they are
assembled: each node's phases, the feed as a diagram description (nodes with their
ratings, runs with length, size, sets and device, motors), the provenance of every
table (with each row's confidence where the table gives one), the job file's
fingerprint and the length unit to display. Renderers read these and nothing else:
they never go back to the job, the tables or the disk.
"""

from __future__ import annotations

from ..results import (
    Diagram,
    DiagramMotor,
    DiagramNode,
    DiagramRun,
    Results,
    TableProvenance,
)
from ..tables import Table
from .context import Context

# today's reports show metres (feet beside them on the one-line diagram); a job's own
# unit system is not recorded by the job reader yet
DEFAULT_LENGTH_UNIT = "m"


def describe_results(ctx: Context, results: Results) -> Results:
    """Fill the descriptive fields of ``results`` from the check context; return it."""
    tree = ctx.tree
    for node in results.nodes:
        node.phases = tree.voltage_of[node.id].phases
    results.diagram = feed_diagram(ctx)
    book = ctx.rules.tables
    results.provenance = [table_provenance(book[name]) for name in sorted(book)]
    results.job_sha256 = ctx.job.file_sha256
    results.length_unit = DEFAULT_LENGTH_UNIT
    return results


def _ratings(ctx: Context, node_id: str, kind: str) -> dict[str, float | str]:
    """Nameplate and device ratings of one node, SI figures with the unit in the key."""
    job = ctx.job
    if kind == "source":
        return {"fault_a": job.source.fault_a, "x_r": job.source.x_r}
    if kind == "transformer":
        t = next((t for t in job.transformers if t.id == node_id), None)
        if t is None:
            return {}
        out: dict[str, float | str] = {
            "rating_va": t.rating_va,
            "z_pct": t.z_pct,
            "primary": t.primary.text,
            "secondary": t.secondary.text,
            "primary_phases": t.primary.phases,
            "secondary_phases": t.secondary.phases,
            "primary_device_a": t.primary_device_a,
        }
        if t.x_r is not None:
            out["x_r"] = t.x_r
        if t.secondary_device_a is not None:
            out["secondary_device_a"] = t.secondary_device_a
        if t.tap_pct:
            out["tap_pct"] = t.tap_pct
        return out
    p = next((p for p in job.panels if p.id == node_id), None)
    if p is None:
        return {}
    out = {"rating_a": p.rating_a}
    for key, value in (
        ("main_device_a", p.main_device_a),
        ("interrupting_a", p.interrupting_a),
        ("instantaneous_a", p.instantaneous_a),
    ):
        if value is not None:
            out[key] = value
    return out


def feed_diagram(ctx: Context) -> Diagram:
    """The feed as the one-line diagram draws it, in feed order."""
    tree, job = ctx.tree, ctx.job
    nodes = []
    for n in tree.order:
        run = tree.parent_run.get(n)
        v = tree.voltage_of[n]
        nodes.append(
            DiagramNode(
                id=n,
                kind=tree.kind[n],
                voltage=v.text,
                voltage_v=v.voltage_ll_v,
                phases=v.phases,
                parent=tree.parent_node[n],
                via_run=run.id if run else None,
                ratings=_ratings(ctx, n, tree.kind[n]),
            )
        )
    runs = tuple(
        DiagramRun(
            id=r.id,
            from_id=r.from_id,
            to_id=r.to_id,
            length_m=r.length_m,
            size=r.size.name,
            material=r.material,
            sets=r.sets,
            device_a=r.device_a,
            ground=f"{r.ground.name} {r.ground_material.capitalize()}" if r.ground else None,
        )
        for r in job.runs
    )
    motors = tuple(
        DiagramMotor(
            m.id,
            m.panel_id,
            m.full_load_a,
            m.locked_rotor_a,
            m.hp,
            _flc_source(m, job.tree.voltage_of[m.panel_id].phases),
            m.phases,
            f"{m.device_a:g} A {m.device_type.replace('-', ' ')}" if m.device_a is not None else "",
            m.disconnect_a,
        )
        for m in job.motors
    )
    return Diagram(tuple(nodes), runs, motors)


def _row_label(table: Table, row: dict) -> str:
    key = table.meta.get("key", "").strip()
    if key and key in row:
        return str(row[key])
    cols = [c for c in table.data.columns if c not in ("row_confidence", "rule_id")][:2]
    return " ".join(str(row[c]) for c in cols)


def table_provenance(table: Table) -> TableProvenance:
    """Where one table's figures come from, and how far each row was confirmed."""
    rows: tuple[tuple[str, str], ...] = ()
    if "row_confidence" in table.data.columns:
        rows = tuple(
            (_row_label(table, row), str(row["row_confidence"]))
            for row in table.data.to_dict("records")
        )
    meta = table.meta
    return TableProvenance(
        name=table.name,
        title=table.title,
        source=table.source,
        edition=meta.get("edition", ""),
        confidence=table.confidence,
        basis=meta.get("basis", ""),
        conditions=meta.get("conditions", ""),
        origin=table.origin,
        sha256=table.sha256,
        row_confidence=rows,
    )


def _flc_source(m, panel_phases: int) -> str:
    """Where a motor's full-load current comes from, as the diagram names it."""
    if m.flc_basis != "table":
        return "nameplate"
    return "Table 430.248" if (m.phases or panel_phases) == 1 else "Table 430.250"
