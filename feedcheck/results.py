"""What a check run hands to the renderers: per-node figures, calculation sheets,
findings, and what the renderers need to show them (the feed as a diagram, the
provenance of every table, the length unit). Renderers (CLI, PDF, exports) show
these; they compute nothing and read nothing else."""

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


@dataclass(frozen=True)
class ImpedanceRow:
    """One component of a node's impedance build-up, per phase (per-phase equivalent on
    single-phase parts), referred to the node's voltage, in the maximum and the minimum
    case, with the condition each case takes (temperature, tolerance)."""

    component: str
    max_case: str
    min_case: str
    z_max_ohm: complex
    z_min_ohm: complex


@dataclass(frozen=True)
class ImpedanceBuildUp:
    """Source to node, component by component, and the sums the node's fault figures
    come from: I = c·V_LL/(√3·|Z|) (+ motors for the maximum)."""

    voltage: str  # the node's system as written
    voltage_v: float  # line-to-line [V] the components are referred to
    rows: tuple[ImpedanceRow, ...]
    z_max_ohm: complex
    z_min_ohm: complex
    z_max_abs_ohm: float
    z_min_abs_ohm: float
    c_max: float
    c_min: float
    fault_ohmic_max_a: float  # c_max·V/(√3·|Z_max|)
    motor_a: float  # motor contribution added to it
    fault_max_a: float
    fault_min_a: float


@dataclass
class Sheet:
    """Calculation sheet for one element (transformer, run or panel)."""

    element_id: str
    kind: str
    title: str
    inputs: list[tuple[str, str]] = field(default_factory=list)
    steps: list[CalcStep] = field(default_factory=list)
    tables_used: list[str] = field(default_factory=list)
    buildup: ImpedanceBuildUp | None = None  # a node's impedance build-up (fault checks)

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
    phases: int | None = None  # 1 or 3: the node's system (None: not known)


@dataclass(frozen=True)
class DiagramNode:
    """One node of the feed as the one-line diagram shows it.

    ``ratings`` holds nameplate and device figures in SI with the unit in the key:
    source ``fault_a``, ``x_r``; transformer ``rating_va``, ``z_pct``, ``x_r``,
    ``primary``/``secondary`` (the systems as written), ``primary_phases``,
    ``secondary_phases``, ``primary_device_a``, ``secondary_device_a``, ``tap_pct``;
    panel ``rating_a`` (bus), ``main_device_a``, ``interrupting_a``,
    ``instantaneous_a``. A figure the job does not give is absent.
    """

    id: str
    kind: str  # "source" | "transformer" | "panel"
    voltage: str  # the system at the node as written (a transformer's secondary)
    voltage_v: float  # its line-to-line voltage [V]
    phases: int
    parent: str | None
    via_run: str | None
    ratings: dict[str, float | str] = field(default_factory=dict)


@dataclass(frozen=True)
class DiagramRun:
    """One run of conductors between two nodes."""

    id: str
    from_id: str
    to_id: str
    length_m: float
    size: str  # "4/0 AWG", "95 mm2"
    material: str  # "cu" | "al"
    sets: int
    device_a: float | None  # device protecting the run at its sending end
    ground: str | None  # equipment grounding conductor as written ("4 AWG Cu")


@dataclass(frozen=True)
class DiagramMotor:
    """A motor fed from a panel."""

    id: str
    panel_id: str
    full_load_a: float
    locked_rotor_a: float | None
    hp: float | None
    flc_source: str = ""  # "Table 430.250", or "nameplate" when typed in without hp
    phases: int | None = None
    device: str = ""  # branch device as given ("70 A inverse-time breaker"), "" if none
    disconnect_a: float | None = None


@dataclass(frozen=True)
class DiagramStandby:
    """A standby source as drawn: the transfer switch at the line side of ``panel_id``
    (normal feed ``normal_run``) and the generator feeding it through ``generator_run``."""

    switch_id: str
    switch_rating_a: float
    panel_id: str
    normal_run: str
    generator_id: str
    rating_va: float
    xdss_pct: float
    generator_run: DiagramRun
    fault_a: float  # first-cycle fault current at the generator's terminals [A]


@dataclass(frozen=True)
class Diagram:
    """The feed as drawn: nodes in feed order, runs, motors, a standby source."""

    nodes: tuple[DiagramNode, ...] = ()
    runs: tuple[DiagramRun, ...] = ()
    motors: tuple[DiagramMotor, ...] = ()
    standby: DiagramStandby | None = None

    def run(self, run_id: str | None) -> DiagramRun | None:
        """The run with this id (None when there is none)."""
        return next((r for r in self.runs if r.id == run_id), None)

    def node(self, node_id: str | None) -> DiagramNode | None:
        """The node with this id (None when there is none)."""
        return next((n for n in self.nodes if n.id == node_id), None)


@dataclass(frozen=True)
class TableProvenance:
    """Where a table's figures come from (its provenance header) and, for tables that
    rate each row, every row's confidence as (row, confidence) pairs."""

    name: str
    title: str
    source: str
    edition: str
    confidence: str
    basis: str
    conditions: str
    origin: str  # "shipped" or "user"
    sha256: str
    row_confidence: tuple[tuple[str, str], ...] = ()


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
    # for the renderers only (not part of to_dict(), whose keys are held stable):
    diagram: Diagram = field(default_factory=Diagram)
    provenance: list[TableProvenance] = field(default_factory=list)
    tables_cited: list[str] = field(default_factory=list)  # tables the figures read
    job_sha256: str = ""  # of the job file's bytes
    length_unit: str = "m"  # lengths shown to people: "m" or "ft"

    @property
    def exit_code(self) -> int:
        return 1 if any(f.status == "fail" for f in self.findings) else 0

    def counts(self) -> dict[str, int]:
        return count_by_status(self.findings)

    def unconfirmed(self) -> list[Finding]:
        """Findings whose figure is computed from a table row not confirmed in a
        published copy (each carries its notes), failures first."""
        return [f for f in self.sorted_findings() if f.unconfirmed]

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
                    "notices": list(getattr(sr, "notices", [])),
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
