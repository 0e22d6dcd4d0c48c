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


def describe_results(ctx: Context, results: Results) -> Results:
    """Fill the descriptive fields of ``results`` from the check context; return it."""
    tree = ctx.tree
    for node in results.nodes:
        node.phases = tree.voltage_of[node.id].phases
    results.diagram = feed_diagram(ctx)
    book = ctx.rules.tables
    results.provenance = [table_provenance(book[name]) for name in sorted(book)]
    results.tables_cited = tables_cited(ctx, results)
    results.job_sha256 = ctx.job.file_sha256
    results.length_unit = getattr(ctx.job, "length_unit", "ft")
    return results


# tables every feed walk reads (conductor impedance, fault assumptions, devices, EGC,
# withstand) and those read when the job has schedules, motors or panels
ALWAYS_READ = (
    "conductor_impedance_table9",
    "conductor_materials",
    "raceway_effects",
    "fault_assumptions",
    "device_ratings",
    "egc_size",
    "withstand_k",
    "insulation_types",
    "insulation_thickness",
    "check_rules",
    "voltage_drop_limits",
)
READ_WITH = {
    "schedules": (
        "demand_factors",
        "schedule_rules",
        "small_conductor_limits",
        "lighting_unit_loads",
    ),
    "motors": (
        "motor_flc_single_phase",
        "motor_flc_three_phase",
        "motor_locked_rotor",
        "motor_starting_limits",
        "motor_branch_device_max",
    ),
    "panels": ("device_test_power_factor", "instantaneous_pickup"),
}


def tables_cited(ctx: Context, results: Results) -> list[str]:
    """The tables this job's figures were read from: those its sheets name, those of
    every rule id a step or finding cites, and those every walk (or its schedules,
    motors, panels) reads; in the rule book's order."""
    book = ctx.rules
    names = set(ALWAYS_READ)
    rule_ids = {f.rule_id for f in results.findings}
    for sheet in results.sheets.values():
        names.update(sheet.tables_used)
        rule_ids.update(s.rule_id for s in sheet.steps)
    for rid in rule_ids:
        if rid and book.has_rule(rid):
            names.add(book.rule(rid).table)
    job = ctx.job
    for what, present in (
        ("schedules", bool(results.schedules)),
        ("motors", bool(job.motors)),
        ("panels", bool(job.panels)),
    ):
        if present:
            names.update(READ_WITH[what])
    return [n for n in sorted(book.tables) if n in names]


def _ratings(ctx: Context, node_id: str, kind: str) -> dict[str, float | str]:
    """Nameplate and device ratings of one node, SI figures with the unit in the key."""
    job = ctx.job
    if kind == "source":
        return {"fault_a": job.source.fault_a, "x_r": job.source.x_r}
    if kind == "transformer":
        t = ctx.transformer_by_id.get(node_id)
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
    p = ctx.panel_by_id.get(node_id)
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
    cols = [c for c in table.columns if c not in ("row_confidence", "rule_id")][:2]
    return " ".join(str(row[c]) for c in cols)


def table_provenance(table: Table) -> TableProvenance:
    """Where one table's figures come from, and how far each row was confirmed."""
    rows: tuple[tuple[str, str], ...] = ()
    if "row_confidence" in table.columns:
        rows = tuple(
            (_row_label(table, row), str(row["row_confidence"])) for row in table.records()
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
