"""The feed walk: source → transformers → runs → panels; emits findings and results.

Each domain's checks live in their own module; this module orders them and
assembles :class:`~feedcheck.results.Results`.
"""

from __future__ import annotations

import copy
from dataclasses import replace

from .. import __version__
from ..model import Job
from ..results import NodeResult, Results
from ..rulebook import RuleBook
from .conductors import check_run
from .context import Context, Load, build_context
from .fault import check_faults
from .high_leg import note_high_legs
from .impedance import fault_assumptions, impedance_rows
from .lighting import report_minimum_lighting
from .loads import check_transformer_phases, report_connections
from .motors import check_motors
from .panels import check_panel, check_standard_ratings
from .service import check_service, describe_source
from .summary import describe_results
from .transformer import check_transformer
from .vdrop import check_voltage_drop


def check_job(
    job: Job,
    panel_loads: dict[str, Load] | None = None,
    calc_date: str | None = None,
    rules: RuleBook | None = None,
) -> Results:
    """Run every check on a validated job and return the results.

    ``calc_date`` (ISO date) labels the fault-current marking when the job gives no date;
    the command supplies it (:func:`feedcheck.commands.clock.calc_date`), checks never
    read the clock. ``rules``: the rule book (default: the tables in force, shipped or
    ``--tables``).
    """
    if job.generator is not None and job.transfer_switch is not None:
        from .standby import add_standby

        normal = replace(job, generator=None, transfer_switch=None)
        loads = copy.deepcopy(panel_loads)
        results = check_job(normal, panel_loads, calc_date, rules)
        return add_standby(job, results, loads, calc_date, rules, check_job)
    ctx = build_context(job, panel_loads, calc_date, rules)
    tree = ctx.tree
    for n in tree.order:
        run = tree.parent_run.get(n)
        v = tree.voltage_of[n]
        ctx.nodes[n] = NodeResult(
            n,
            tree.kind[n],
            v.text,
            v.voltage_ll_v,
            tree.distance_m[n],
            tree.parent_node[n],
            run.id if run else None,
        )
    describe_source(ctx)
    for t in job.transformers:
        check_transformer(ctx, t)
        check_transformer_phases(ctx, t)
    report_connections(ctx)
    note_high_legs(ctx)
    for p in job.panels:
        check_panel(ctx, p)
    check_motors(ctx)
    report_minimum_lighting(ctx)
    check_standard_ratings(ctx)
    ctx.impedance_rows = impedance_rows(ctx)
    with ctx.reading(by_subject=ctx.impedance_rows):
        check_faults(ctx)
        check_voltage_drop(ctx)
    for run in job.runs:
        check_run(ctx, run)
    check_service(ctx)
    return describe_results(ctx, _results(ctx))


def _results(ctx: Context) -> Results:
    job = ctx.job
    summary = {
        "name": job.project.name,
        "site": job.project.site,
        "prepared_by": job.project.prepared_by,
        "date": job.project.date,
        "revision": job.project.revision,
        "rules": job.project.rules,
        "file": job.path.name,
        "feedcheck_version": __version__,
        "impedance_tolerance_pct": fault_assumptions(ctx).tolerance_pct,
        "voltage_factor": job.options.voltage_factor,
    }
    tables = ctx.rules.provenance()
    runs = [
        {
            "id": r.id,
            "from": r.from_id,
            "to": r.to_id,
            "length_m": r.length_m,
            "conductors": f"{r.size.name} {r.material.capitalize()}",
            "sets": r.sets,
            "ground": f"{r.ground.name} {r.ground_material.capitalize()}" if r.ground else None,
            "device_a": r.device_a,
            **ctx.run_values.get(r.id, {}),
        }
        for r in job.runs
    ]
    return Results(
        summary,
        [ctx.nodes[n] for n in ctx.tree.order],
        ctx.findings,
        ctx.sheets,
        tables,
        ctx.assumptions,
        ctx.methods,
        runs=runs,
    )


__all__ = ["Load", "check_job"]
