"""The results as the page shows them: the same checks as ``feedcheck check`` (the
runner's one code path), input problems and findings as the terminal writes them, node
figures formatted by :mod:`feedcheck.render.display` in the job's unit.

Nothing here computes a figure: it places what the runner gives beside the element and
key it concerns.
"""

from __future__ import annotations

import re
import time
from pathlib import Path

from ..commands.errors import problem_line
from ..errors import InputError
from ..render.display import TERMINAL, display_for, finding_figures, node_figure, node_title
from ..render.text import finding_head

_PATH = re.compile(r"^([a-z_]+)(?:\[(\d+)\])?(?:\.([A-Za-z0-9_-]+))?")
_ROW = re.compile(r"\brow (\d+)")
# node figures the diagram shows, in order (those a node has)
NODE_FIGURES = (
    "load_va",
    "loading_pct",
    "fault_max_a",
    "fault_duty_a",
    "fault_min_a",
    "voltage_pct",
    "vdrop_pct",
)
# the key of an element a check is about (the check's name without "(standby)");
# a finding whose check is not listed points at its element only
CHECK_KEYS = {
    "allowable ampacity vs load": "conductors",
    "ampacity vs 125 % continuous + noncontinuous": "conductors",
    "device protects conductors": "device",
    "device vs load": "device",
    "feeder voltage drop": "length",
    "grounding conductor": "ground",
    "withstand, grounding conductor": "ground",
    "withstand, phase conductors": "conductors",
    "secondary conductor protection": "conductors",
    "primary device": "primary_device",
    "secondary device": "secondary_device",
    "loading": "rating",
    "winding loading (heaviest phase)": "rating",
    "demand vs bus rating": "rating",
    "load vs bus rating": "rating",
    "demand vs main device": "main_device",
    "load vs main device": "main_device",
    "main device vs bus": "main_device",
    "interrupting rating": "interrupting",
    "branch device": "device",
    "branch conductor ampacity": "conductors",
    "disconnect rating": "disconnect",
    "main bonding jumper": "main_bonding_jumper",
    "service grounding electrode conductor": "electrode_conductor",
    "transfer switch rating vs load": "rating",
    "transfer switch withstand vs available fault": "withstand",
}
NODE_STATUS_ORDER = ("fail", "warn", "ok")
MAX_SIDE_FIGURES = 6  # figures of a motor, switch or generator node


def element_index(elements: list[dict]) -> dict[str, tuple[str, int]]:
    """Element id → (kind, index) of the document's elements."""
    out: dict[str, tuple[str, int]] = {}
    for e in elements:
        if e.get("id"):
            out.setdefault(e["id"], (e["kind"], e["index"]))
    return out


def _schedule_panels(elements: list[dict], folder: Path) -> dict[str, tuple[str, int]]:
    """Schedule file path (as the reader names it) → (kind, index) of its panel."""
    out = {}
    for e in elements:
        sched = e["values"].get("schedule")
        if e["kind"] == "panel" and sched:
            out[str(folder / sched)] = ("panel", e["index"])
    return out


def input_error(problem, job_file: str, schedules: dict) -> dict:
    """One input problem: the CLI's line, and the element, key and line it concerns."""
    out = {"kind": None, "index": None, "key": None, "row": None, "line": problem.line}
    out["message"] = problem_line(problem)
    if problem.file == job_file and (m := _PATH.match(problem.where)):
        kind, n, key = m.groups()
        out["kind"] = kind
        out["index"] = int(n) - 1 if n else (0 if "[" not in problem.where else None)
        out["key"] = key
    elif problem.file in schedules:
        out["kind"], out["index"] = schedules[problem.file]
        out["key"] = "schedule"
        if m := _ROW.search(problem.where):
            out["row"] = int(m.group(1))
    return out


def _finding(f, display, ids: dict) -> dict:
    subject = f.subject.split("/", 1)[0]
    kind, index = ids.get(subject, (None, None))
    check = f.check.removesuffix(" (standby)")
    key = CHECK_KEYS.get(check)
    if "/" in f.subject and kind == "panel":
        key = "schedule"
    return {
        "status": f.status,
        "subject": f.subject,
        "check": f.check,
        "message": finding_head(f, display),
        "note": f.note,
        "rule_id": f.rule_id,
        "kind": kind,
        "index": index,
        "key": key,
    }


def _node(n, display, worst: dict) -> dict:
    figures = []
    for key in NODE_FIGURES:
        if key in n.values:
            label, shown, unit = node_figure(key, n.values[key])
            figures.append([label, f"{shown} {unit}".strip()])
    if n.parent is not None:
        figures.append(["Distance from the source", display.length(n.distance_m)])
    return {
        "id": n.id,
        "kind": n.kind,
        "parent": n.parent,
        "via": n.via_run,
        "title": node_title(n.id, n.kind, n.voltage),
        "figures": figures,
        "status": worst.get(n.id, "none"),
    }


def _worst_by_node(results) -> dict[str, str]:
    """Each node's worst evaluated status over its own findings and its feeding run's
    ("none" when nothing there was held against a limit)."""
    by_subject: dict[str, set] = {}
    for f in results.findings:
        by_subject.setdefault(f.subject.split("/", 1)[0], set()).add(f.status)
    out = {}
    for n in results.nodes:
        seen = by_subject.get(n.id, set()) | by_subject.get(n.via_run or "", set())
        out[n.id] = next((s for s in NODE_STATUS_ORDER if s in seen), "none")
    return out


def _own_node(node_id: str, kind: str, parent: str, title: str, own: list, display) -> dict:
    """A node drawn from an element's own findings: their figures (each once) and the
    worst evaluated status among them."""
    figures, seen = [], set()
    for f in own:
        if isinstance(f.value, float) and f.check not in seen:
            seen.add(f.check)
            shown, _ = finding_figures(f.value, f.limit, f.unit, display, TERMINAL)
            figures.append([f.check[:1].upper() + f.check[1:], shown])
    statuses = {f.status for f in own}
    return {
        "id": node_id,
        "kind": kind,
        "parent": parent,
        "via": None,
        "title": title,
        "figures": figures[:MAX_SIDE_FIGURES],
        "status": next((s for s in NODE_STATUS_ORDER if s in statuses), "none"),
    }


def side_nodes(job, results, display) -> list[dict]:
    """Elements the feed walk makes no node of, drawn beside the panel they hang on:
    each motor (under its panel), the transfer switch (at its panel) and the generator
    (at the switch). Their figures are those of their own findings."""
    if job is None:
        return []
    own: dict[str, list] = {}
    for f in results.sorted_findings():
        own.setdefault(f.subject, []).append(f)
    out = []
    for m in job.motors:
        rating = f"{m.hp:g} hp" if m.hp is not None else f"{m.full_load_a:g} A full-load"
        title = f"{m.id} — motor, {rating}"
        out.append(_own_node(m.id, "motor", m.panel_id, title, own.get(m.id, []), display))
    ats, gen = job.transfer_switch, job.generator
    if ats is not None and gen is not None:
        title = f"{ats.id} — transfer switch, {ats.rating_a:g} A, at {ats.panel_id}"
        out.append(
            _own_node(ats.id, "transfer_switch", ats.panel_id, title, own.get(ats.id, []), display)
        )
        title = f"{gen.id} — generator, {gen.rating_va / 1000:g} kVA (standby)"
        out.append(_own_node(gen.id, "generator", ats.id, title, own.get(gen.id, []), display))
    return out


def results_payload(results, elements: list[dict], started: float, job=None) -> dict:
    """RESULTS of a job that was read (see WORKBENCH_API.md); with the job, its motors
    and standby source are nodes too."""
    display = display_for(results)
    ids = element_index(elements)
    worst = _worst_by_node(results)
    return {
        "valid": True,
        "input_errors": [],
        "counts": results.counts(),
        "findings": [_finding(f, display, ids) for f in results.sorted_findings()],
        "nodes": [_node(n, display, worst) for n in results.nodes]
        + side_nodes(job, results, display),
        "unit": results.length_unit,
        "elapsed_ms": round((time.perf_counter() - started) * 1000),
    }


def invalid_payload(
    exc: InputError, job_file: str, elements: list[dict], folder: Path, started: float
) -> dict:
    """RESULTS of a job the readers refused: every problem as the CLI writes it."""
    schedules = _schedule_panels(elements, folder)
    return {
        "valid": False,
        "input_errors": [input_error(p, job_file, schedules) for p in exc.problems],
        "counts": {"fail": 0, "warn": 0, "ok": 0, "info": 0},
        "findings": [],
        "nodes": [],
        "unit": None,
        "elapsed_ms": round((time.perf_counter() - started) * 1000),
    }
