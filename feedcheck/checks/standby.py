"""The standby source: every figure below the transfer switch for each position.

The normal position is the job as written. The standby position is the same job cut
to the transfer switch's panel and everything below it, fed from the generator (a
source of fault current I_rated / x"d with the generator's X/R, through the
generator's own run). The standby walk runs the same checks; its findings that differ
from the normal position's (faults, interrupting duty, trip checks, drops, starting
dips, the generator's conductors) join the job's findings, marked with the position.
So the maximum duty held against a rating is the worst over the positions, the
minimum fault and the trip checks the least, and the drop is checked for each.
"""

from __future__ import annotations

import copy
from dataclasses import replace

from ..findings import Finding
from ..inputs.tree import build_tree
from ..model import SOURCE_ID, Job, Source
from ..results import Results
from .standby_checks import check_switch_and_generator, diagram_standby, standby_source_fault

STANDBY = "standby"
NORMAL = "normal"
# node figures held per position: key -> which position governs ("max" or "min")
POSITION_FIGURES = {
    "fault_max_a": "max",
    "fault_duty_a": "max",
    "fault_min_a": "min",
    "fault_lg_min_a": "min",
    "vdrop_pct": "max",
    "conductor_vdrop_pct": "max",  # the feeder drop branch circuits add to
}
LG_FIGURES = ("fault_lg_min_a",)
# checks resting on a line-to-ground figure: not evaluated on the generator's system
LG_CHECKS = ("ground fault trips instantaneously", "withstand, grounding conductor")
# the standby walk's findings at the source that concern the generator
SOURCE_CHECKS = ("source voltage under load", "voltage dip on taking the whole load at once")


def below(job: Job, top: str) -> list[str]:
    """``top`` and every node fed through it, in feed order."""
    tree, out = job.tree, []
    for n in tree.order:
        p = n
        while p is not None and p != top:
            p = tree.parent_node[p]
        if p == top:
            out.append(n)
    return out


def standby_job(job: Job) -> Job:
    """The job in the standby position: the switch's panel and its feed, from the
    generator."""
    gen, ts = job.generator, job.transfer_switch
    keep = set(below(job, ts.panel_id))
    source = Source(gen.voltage, standby_source_fault(gen), gen.x_r, given_as="generator")
    runs = [gen.run] + [r for r in job.runs if r.to_id in keep and r.to_id != ts.panel_id]
    transformers = [t for t in job.transformers if t.id in keep]
    panels = [p for p in job.panels if p.id in keep]
    motors = [m for m in job.motors if m.panel_id in keep]
    tree = build_tree(source, transformers, runs, panels)
    return replace(
        job,
        source=source,
        runs=tuple(runs),
        transformers=tuple(transformers),
        panels=tuple(panels),
        motors=tuple(motors),
        tree=tree,
        generator=None,
        transfer_switch=None,
    )


def add_standby(job: Job, normal: Results, panel_loads, calc_date, rules, check_job) -> Results:
    """Check the standby position (with ``check_job``, the feed walk) and add its
    figures and findings to ``normal``."""
    sjob = standby_job(job)
    standby = check_job(sjob, copy.deepcopy(panel_loads), calc_date, rules)
    keep = set(below(job, job.transfer_switch.panel_id))
    on_gen = generator_system(sjob)
    _merge_nodes(normal, standby, keep, on_gen)
    normal.findings.extend(_standby_findings(job, normal, standby, on_gen))
    normal.runs.extend(
        {**r, "position": STANDBY} for r in standby.runs if r["id"] == job.generator.id
    )
    check_switch_and_generator(job, normal, standby)
    _position_steps(normal, job.generator.id, keep)
    normal.diagram = replace(normal.diagram, standby=diagram_standby(job, standby))
    return normal


def governs_key(key: str) -> str:
    """The node key naming the governing position of a figure: fault_max_governs."""
    return key.rsplit("_", 1)[0] + "_governs"


def generator_system(sjob: Job) -> set[str]:
    """Nodes and runs on the generator's own system (no transformer between): their
    line-to-ground figures need the generator's sequence reactances (not computed)."""
    tree = sjob.tree
    nodes = {n for n in tree.order if tree.upstream_transformer[n] is None}
    return nodes | {r.id for r in sjob.runs if r.from_id in nodes}


def _merge_nodes(normal: Results, standby: Results, keep: set[str], on_gen: set[str]) -> None:
    """Each figure of :data:`POSITION_FIGURES` in the standby position beside the
    normal one, and the position that governs it (ties go to the normal position);
    no standby line-to-ground figure on the generator's system."""
    by_id = {n.id: n for n in standby.nodes}
    for node in normal.nodes:
        other = by_id.get(node.id)
        if node.id not in keep or other is None:
            continue
        for key, sense in POSITION_FIGURES.items():
            s = other.values.get(key)
            if not isinstance(s, float) or (key in LG_FIGURES and node.id in on_gen):
                continue
            node.values["standby_" + key] = s
            n = node.values.get(key)
            if not isinstance(n, float):
                node.values[governs_key(key)] = STANDBY
                continue
            worse = s > n if sense == "max" else s < n
            node.values[governs_key(key)] = STANDBY if worse else NORMAL


def _standby_findings(job: Job, normal: Results, standby: Results, on_gen) -> list[Finding]:
    """The standby walk's findings that differ from the normal position's, marked;
    none resting on a line-to-ground figure of the generator's system."""
    gen, ts = job.generator, job.transfer_switch
    seen = {(f.subject, f.check, f.value, f.limit, f.status) for f in normal.findings}
    where = f"standby position (generator {gen.id} through {ts.id}): "
    out = []
    for f in standby.findings:
        if f.check.startswith("service") or (
            f.subject == SOURCE_ID and f.check not in SOURCE_CHECKS
        ):
            continue  # the generator's run is no service
        if f.check in LG_CHECKS and f.subject in on_gen:
            continue  # stated once by the generator's line-to-ground warning
        if (f.subject, f.check, f.value, f.limit, f.status) in seen:
            continue  # the same in both positions
        subject = gen.id if f.subject == SOURCE_ID else f.subject
        out.append(replace(f, subject=subject, check=f.check + " (standby)", note=where + f.note))
    return out


POSITION_LABELS = {
    "fault_max_a": ("maximum fault", "the larger"),
    "fault_duty_a": ("interrupting duty", "the larger"),
    "fault_min_a": ("minimum fault", "the smaller"),
    "fault_lg_min_a": ("minimum line-to-ground fault", "the smaller"),
    "vdrop_pct": ("voltage drop", "the larger"),
    "conductor_vdrop_pct": ("conductor drop since the source", "the larger"),
}


def _position_steps(results: Results, gen_id: str, keep: set[str]) -> None:
    """On the generator's sheet: each node's figure in both positions and the one
    that governs."""
    sheet = results.sheets[gen_id]
    for node in results.nodes:
        if node.id not in keep:
            continue
        for key, (label, rule) in POSITION_LABELS.items():
            v = node.values
            if governs_key(key) not in v:
                continue
            unit, scale = ("%", 1.0) if key.endswith("_pct") else ("kA", 1e-3)
            sheet.step(
                f"{node.id}: {label}",
                f"governing position: {rule} of normal and standby",
                f"normal {_fmt(v.get(key), scale)} {unit}, "
                f"standby {_fmt(v['standby_' + key], scale)} {unit}",
                v[governs_key(key)],
            )


def _fmt(value, scale: float) -> str:
    return "–" if not isinstance(value, float) else f"{value * scale:.2f}"
