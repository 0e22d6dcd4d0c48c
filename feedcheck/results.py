"""What a check run hands to the renderers: per-node figures, calculation sheets,
findings. Renderers (CLI, PDF, exports) show these; they compute nothing."""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from .findings import Finding, count_by_status, sort_findings


def _plain(v):
    """numpy scalars → Python numbers (for JSON)."""
    return v.item() if hasattr(v, "item") else v


@dataclass(frozen=True)
class CalcStep:
    """One line of a calculation sheet: formula, substituted values, result."""

    label: str
    formula: str
    substituted: str
    result: float | str
    unit: str = ""
    rule_id: str = ""


@dataclass
class Sheet:
    """Calculation sheet for one element (transformer, run or panel)."""

    element_id: str
    kind: str
    title: str
    inputs: list[tuple[str, str]] = field(default_factory=list)
    steps: list[CalcStep] = field(default_factory=list)
    tables_used: list[str] = field(default_factory=list)

    def step(
        self, label: str, formula: str, substituted: str, result, unit: str = "", rule_id: str = ""
    ) -> None:
        self.steps.append(CalcStep(label, formula, substituted, result, unit, rule_id))

    def uses(self, *table_names: str) -> None:
        for t in table_names:
            if t not in self.tables_used:
                self.tables_used.append(t)


@dataclass
class NodeResult:
    """Figures at one node (source, transformer secondary or panel).

    ``values`` keys carry their unit: ``fault_max_a``, ``vdrop_pct`` …
    """

    id: str
    kind: str
    voltage: str
    nominal_v: float
    distance_m: float
    parent: str | None
    via_run: str | None
    values: dict[str, float] = field(default_factory=dict)


@dataclass
class Results:
    job_summary: dict
    nodes: list[NodeResult]
    findings: list[Finding]
    sheets: dict[str, Sheet]
    tables: list[dict]
    assumptions: list[str] = field(default_factory=list)
    methods: list[tuple[str, str]] = field(default_factory=list)
    schedules: dict = field(default_factory=dict)
    runs: list[dict] = field(default_factory=list)

    @property
    def exit_code(self) -> int:
        return 1 if any(f.status == "fail" for f in self.findings) else 0

    def counts(self) -> dict[str, int]:
        return count_by_status(self.findings)

    def sorted_findings(self) -> list[Finding]:
        return sort_findings(self.findings)

    def to_dict(self) -> dict:
        def clean(v):
            if isinstance(v, float) and not math.isfinite(v):
                return None if math.isnan(v) else ("inf" if v > 0 else "-inf")
            return v

        return {
            "job": self.job_summary,
            "nodes": [
                {
                    "id": n.id,
                    "kind": n.kind,
                    "voltage": n.voltage,
                    "voltage_v": n.nominal_v,
                    "distance_m": round(n.distance_m, 6),
                    "parent": n.parent,
                    "via_run": n.via_run,
                    **{k: clean(v) for k, v in n.values.items()},
                }
                for n in self.nodes
            ],
            "runs": [{k: clean(v) for k, v in r.items()} for r in self.runs],
            "schedules": {
                pid: {
                    "totals": {k: clean(_plain(v)) for k, v in sr.totals.items()},
                    "circuits": [
                        {k: clean(_plain(v)) for k, v in row.items()}
                        for row in sr.circuits.to_dict("records")
                    ],
                }
                for pid, sr in self.schedules.items()
            },
            "findings": [f.as_dict() for f in self.sorted_findings()],
            "counts": self.counts(),
            "tables": self.tables,
        }
