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
from ..render.display import display_for, node_figure, node_title
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


def results_payload(results, elements: list[dict], started: float) -> dict:
    """RESULTS of a job that was read (see WORKBENCH_API.md)."""
    display = display_for(results)
    ids = element_index(elements)
    worst = _worst_by_node(results)
    return {
        "valid": True,
        "input_errors": [],
        "counts": results.counts(),
        "findings": [_finding(f, display, ids) for f in results.sorted_findings()],
        "nodes": [_node(n, display, worst) for n in results.nodes],
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
