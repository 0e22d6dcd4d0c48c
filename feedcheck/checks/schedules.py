"""Panel schedule checks: every circuit at once (whole columns, no loop per row), phase
balance, connected and demand load.

Per circuit (rules in ``tables/schedule_rules.csv`` and ``tables/voltage_drop_limits.csv``):

* breaker vs load — at least 125 % of a continuous load, 100 % otherwise (210.20(A));
* conductor vs load — ampacity at the termination column before correction at least
  125 % continuous + 100 % noncontinuous (210.19(A)(1)(a)); after ambient correction and
  adjustment at least the load (210.19(A)(1)(b)); motor circuits 125 % of full-load
  current (430.22);
* conductor vs breaker — 240.4(B) next size up and the 240.4(D) small-conductor limits;
  motor circuits instead: inverse-time breaker at most 250 % of full-load current, next
  standard rating up permitted (430.52(C)(1));
* equipment grounding conductor vs breaker (Table 250.122, not larger than the circuit
  conductors), where a ground is given;
* branch voltage drop, and total drop adding the panel's feeder drop;
* poles vs the panel's phases, one-pole circuits only where a neutral exists.

Phases: circuits are mapped to phases by the usual panelboard numbering (odd numbers one
side, even the other; each pair of rows on the next phase: 1,2 → A; 3,4 → B; 5,6 → C;
7,8 → A … for three-phase, A/B alternating for single-phase three-wire; a multi-pole
circuit n takes spaces n, n+2, …) — common practice, no source.

Load of a circuit: ``[VA]`` as given; ``[W]`` divided by the power factor; ``[A]`` times
the circuit voltage (line-to-neutral for one pole, line-to-line for two, √3 · V_LL for
three poles on a three-phase panel). A multi-pole load is shared equally by its poles in
the per-phase totals (common practice, no source).

Demand load (``tables/demand_factors.csv``, kernel :mod:`feedcheck.calc.demand`):
lighting by occupancy (Table 220.42), receptacles 10 kVA at 100 % and the rest at 50 %
(220.44), motors 100 % plus 25 % of the largest (430.24), heating and other loads 100 %.
The continuous portion is carried separately; the feeder and panel checks apply its
125 %. It is computed once per panel (:func:`schedule_demand`): the runner hands the
same figures to the feed walk and to :func:`check_schedule`.

The per-circuit rules are data (:data:`feedcheck.checks.schedule_rules.CIRCUIT_RULES`),
their quantities come from :mod:`feedcheck.checks.schedule_circuits`.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from ..calc.demand import KINDS
from ..errors import ProblemList
from ..findings import SEVERITY, Finding
from ..model import Schedule, VoltageSystem
from ..rulebook import RuleBook, current_rulebook
from .context import Load
from .schedule_circuits import circuit_quantities
from .schedule_demand import (  # noqa: F401  (part of this interface)
    ScheduleDemand,
    _phase_of_space,
    demand_load,
    demand_tiers,
    schedule_demand,
)
from .schedule_rules import apply_rules, circuit_findings

if TYPE_CHECKING:
    import pandas as pd

CIRCUIT_COLUMNS = (
    "panel",
    "circuit",
    "description",
    "poles",
    "phase",
    "kind",
    "load_va",
    "current_a",
    "breaker_a",
    "size",
    "material",
    "length_m",
    "ampacity_a",
    "vdrop_pct",
    "total_vdrop_pct",
    "status",
    "reason",
    "row",
)


@dataclass
class ScheduleResult:
    """Checked schedule of one file (one panel, or several with a ``panel`` column).

    Attributes
    ----------
    circuits : DataFrame
        One row per circuit: :data:`CIRCUIT_COLUMNS`.
    totals : dict
        label → value for the (first) panel: connected, demand, continuous and design VA,
        per-phase VA, imbalance %, design current. For a multi-panel file see ``panels``.
    panels : DataFrame
        The same figures, one row per panel.
    findings : list of Finding
        One per failing or warning circuit check (subject ``"LP1/7"``) plus the panel ones.
        A plain list; :func:`check_schedule` builds it on first use (one object per
        failing circuit check is costly on a large schedule, and many callers only want
        the circuits table), then it is kept and may be changed like any list.
    demand : Load
        Demand load of the (first) panel, for the feed walk; ``demands`` has every panel.
    """

    path: Path
    system: str
    circuits: pd.DataFrame
    totals: dict
    panels: pd.DataFrame
    findings: list[Finding]
    demand: Load
    demands: dict[str, Load] = field(default_factory=dict)
    notices: list[str] = field(default_factory=list)  # from the reader (Schedule.notices)
    length_unit: str = "ft"  # as the schedule wrote lengths (exports show both)
    # for the report only (not in the JSON): continuous, pf and ground of each circuit
    review: object = None

    @property
    def exit_code(self) -> int:
        f = self.__dict__["_findings"]
        if isinstance(f, _Deferred):
            return 1 if f.any_fail else 0
        return 1 if any(f.status == "fail" for f in self.findings) else 0

    def column(self, table: str, name: str) -> np.ndarray:
        """One column of ``circuits`` or ``panels`` as an array: rows of the checked
        group's column while this file's frame is not cut out yet (a summary reads a few
        columns of every file), else the frame's."""
        v = self.__dict__["_" + table]
        if isinstance(v, Later) and v.rows is not None:
            column, a, b = v.rows
            return column(name)[a:b]
        return getattr(self, table)[name].to_numpy()

    def __getstate__(self) -> dict:
        """Copies and pickles hold the built list and frames."""
        _get_findings(self)
        for name in _LATER:
            getattr(self, name)
        return dict(self.__dict__)


class _Deferred:
    """Findings not built yet: ``build()`` makes the list; ``any_fail`` says whether it
    holds a failing one."""

    __slots__ = ("any_fail", "build")

    def __init__(self, build, any_fail: bool):
        self.build = build
        self.any_fail = any_fail


def _get_findings(self) -> list[Finding]:
    f = self.__dict__["_findings"]
    if isinstance(f, _Deferred):
        f = self.__dict__["_findings"] = f.build()
    return f


def _set_findings(self, value) -> None:
    self.__dict__["_findings"] = value


# the dataclass __init__ assigns ``findings`` through this property (a list, or _Deferred)
ScheduleResult.findings = property(
    _get_findings,
    _set_findings,  # type: ignore[assignment]
    doc="Findings: a list, built on first use.",
)


class Later:
    """A frame not cut out yet: ``build()`` makes it, on first use (a job's panels are
    checked in one frame; each panel's rows are cut out only when read)."""

    __slots__ = ("build", "rows")

    def __init__(self, build, rows=None):
        self.build = build
        self.rows = rows  # (column of the group's frame by name, a, b): its rows a:b


_LATER = ("circuits", "panels", "review")


def _later_property(name: str) -> property:
    key = "_" + name

    def get(self):
        v = self.__dict__[key]
        if isinstance(v, Later):
            v = self.__dict__[key] = v.build()
        return v

    def put(self, value) -> None:
        self.__dict__[key] = value

    return property(get, put, doc=f"{name}: a frame (or None), cut out on first use.")


# the dataclass __init__ assigns these through the properties (a value, or Later)
for _name in _LATER:
    setattr(ScheduleResult, _name, _later_property(_name))


# --------------------------------------------------------------------------- the check
def _rule_rows(book: RuleBook) -> dict[str, dict]:
    return {r["rule_id"]: r for r in book.rows("schedule_rules")}


def check_schedule(
    schedule: Schedule,
    system: VoltageSystem,
    feeder_drop_pct: float | dict[str, float] = 0.0,
    occupancy: str = "other",
    bus_a: float | None = None,
    main_a: float | None = None,
    limits: dict | None = None,
    demand: ScheduleDemand | None = None,
    rules: RuleBook | None = None,
) -> ScheduleResult:
    """Check every circuit of a schedule and total its panel(s).

    Parameters
    ----------
    schedule : Schedule
        From :func:`feedcheck.inputs.schedule_file.read_schedule`.
    system : VoltageSystem
        The panel's nominal system (``208Y/120 V``, ``120/240 V`` …).
    feeder_drop_pct : float or dict
        Voltage drop from the source to the panel [%] (one figure, or per panel id).
    occupancy : str
        Lighting demand occupancy: other, dwelling, hospital, hotel, warehouse.
    bus_a, main_a : float, optional
        Panel bus and main device ratings [A]; when given, held against the design
        current (demand with continuous at 125 %).
    limits : dict of DropLimit, optional
        The job's drop limits (:func:`feedcheck.checks.drop_rules.drop_limits`; its
        ``branch`` and ``total``); default: the recommended rule rows.
    demand : ScheduleDemand, optional
        Its demand from :func:`schedule_demand` (same system and occupancy), if known.
    rules : RuleBook, optional
        The rule book (default: the tables in force, shipped or ``--tables``).

    Returns ScheduleResult; raises InputError (a conductor the ampacity table does not
    list for its material) or ValueError (an unknown occupancy).

    Examples
    --------
    >>> import tempfile, pathlib
    >>> from feedcheck.inputs.schedule_file import read_schedule
    >>> from feedcheck.units import parse_voltage_system
    >>> d = pathlib.Path(tempfile.mkdtemp())
    >>> _ = (d / "LP1.csv").write_text("circuit,load [VA],breaker [A],conductor,length [ft]\\n"
    ...                                "1,1800,20,12 AWG Cu,60\\n2,2400,15,14 AWG Cu,40\\n")
    >>> r = check_schedule(read_schedule(d / "LP1.csv"), parse_voltage_system("208Y/120 V"))
    >>> r.circuits["status"].tolist(), r.totals["connected_va"]
    (['ok', 'fail'], 4200.0)
    """
    book = rules if rules is not None else current_rulebook()
    if limits is None:
        from .drop_rules import drop_limits

        limits = drop_limits(rules=book)
    if demand is None:
        demand = schedule_demand(schedule, system, occupancy, book)
    rules = _rule_rows(book)
    k = check_frame(schedule, system, feeder_drop_pct, limits, demand, book, rules)
    panels = k.panels
    findings = _panel_findings(
        panels, k.design_va, k.imbalance, k.per_phase, rules, system, bus_a, main_a
    )
    totals = _totals(panels, demand, k.imbalance, len(k.circuits), occupancy, system)
    demands = demand.loads
    return schedule_result(
        schedule,
        system,
        (k.circuits, totals, panels),
        (k.q["panel"], k.q["circuit"], k.found, findings),
        demands[str(panels["panel"].iat[0])],
        demands,
        k.review,
    )


@dataclass
class CheckedFrame:
    """Every circuit of a schedule (one panel or several) checked in one frame."""

    q: dict  # the circuit quantities (schedule_circuits.circuit_quantities)
    found: list  # the rule failures (schedule_rules.apply_rules)
    per_phase: np.ndarray  # (panels, 3) VA
    panels: pd.DataFrame  # one row per panel (with spares and spaces)
    design_va: np.ndarray
    imbalance: np.ndarray
    circuits: pd.DataFrame  # CIRCUIT_COLUMNS
    review: pd.DataFrame  # for the report: continuous, pf, ground (review_frame)


def check_frame(schedule, system, feeder_drop_pct, limits, demand, book, rules) -> CheckedFrame:
    """The circuit rules on every circuit and each panel's totals: the steps
    :func:`check_schedule` and the job's batch (checks/schedule_batch.py) share."""
    c = schedule.circuits
    q = circuit_quantities(
        c,
        schedule.load_unit,
        system,
        feeder_drop_pct,
        limits,
        ProblemList(str(schedule.path)),
        book,
    )
    statuses = {k: str(r["status"]) for k, r in rules.items()}
    sev, reason, found = apply_rules(q, len(c), statuses, limits)
    per_phase, phase_txt = _phases(q["poles"], q["circuit"], demand, system)
    panels, design_va, imbalance = _panel_table(demand, per_phase, sev, system)
    spaces = getattr(schedule, "spaces", {}) or {}
    panels["spares"] = [int(spaces.get(str(p), (0, 0))[0]) for p in panels["panel"]]
    panels["spaces"] = [int(spaces.get(str(p), (0, 0))[1]) for p in panels["panel"]]
    circuits = _circuits_frame(c, q, phase_txt, sev, reason)
    review = review_frame(c, q)
    return CheckedFrame(q, found, per_phase, panels, design_va, imbalance, circuits, review)


def schedule_result(
    schedule, system, tables, failures, demand: Load, demands, review=None
) -> ScheduleResult:
    """A checked schedule: ``tables`` = (circuits, totals, panels); ``failures`` = (panel
    and circuit columns, rule failures, panel findings); findings built on first use;
    ``review`` the report's columns of its circuits (:func:`review_frame`)."""
    circuits, totals, panels = tables
    panel, circuit, found, findings = failures
    any_fail = any(f[6] == "fail" for f in found) or any(f.status == "fail" for f in findings)
    return ScheduleResult(
        schedule.path,
        system.text,
        circuits,
        totals,
        panels,
        _Deferred(lambda: circuit_findings(panel, circuit, found) + findings, any_fail),
        demand,
        demands,
        list(getattr(schedule, "notices", ())),
        getattr(schedule, "length_unit", "ft"),
        review,
    )


def _phases(poles, circuit, demand: ScheduleDemand, system: VoltageSystem):
    """Per-phase VA of each panel (a multi-pole load shared equally by its poles) and the
    phase letters of each circuit: every space a circuit takes."""
    n = len(poles)
    counts = poles.astype(np.int64)
    owner = np.repeat(np.arange(n), counts)
    step = np.arange(len(owner)) - np.repeat(np.cumsum(counts) - counts, counts)
    space = circuit[owner].astype(np.int64) + 2 * step
    ph = _phase_of_space(space, system)
    n_pan = len(demand.panel_ids)
    per_phase = np.bincount(
        demand.panel_code[owner] * 3 + ph,
        weights=(demand.load_va / counts)[owner],
        minlength=3 * n_pan,
    ).reshape(n_pan, 3)
    letters = np.array(list("ABC"), dtype=object)
    phase_txt = np.full(n, "", dtype=object)
    for k in range(int(counts.max()) if n else 0):
        sel = step == k
        phase_txt[owner[sel]] = phase_txt[owner[sel]] + letters[ph[sel]]
    # the order people write: A-B-C, B-C, A-C (not the space order CAB)
    import pandas as pd

    codes, uniq = pd.factorize(phase_txt)
    tidy = np.array(["-".join(sorted(t)) for t in uniq] + [None], dtype=object)[:-1]
    phase_txt = tidy[codes] if n else phase_txt
    return per_phase, phase_txt


def _panel_table(demand: ScheduleDemand, per_phase, sev, system: VoltageSystem):
    """One row per panel: connected, demand, continuous and design load, phases, imbalance."""
    import pandas as pd

    from ..calc.power import current_from_apparent_power_a

    f = demand.figures
    codes, n_pan = demand.panel_code, len(demand.panel_ids)
    conn = f.connected_va
    design_va = f.demand_va + (demand.continuous_factor - 1.0) * f.continuous_va
    n_ph = 3 if system.phases == 3 else (2 if system.kind == "split" else 1)
    used = per_phase[:, :n_ph]
    dph = demand.design_phase_a()
    avg = used.mean(axis=1)
    imbalance = (
        np.divide(np.abs(used - avg[:, None]).max(axis=1), avg, out=np.zeros(n_pan), where=avg > 0)
        * 100.0
        if n_ph > 1
        else np.zeros(n_pan)
    )
    fail_n = np.bincount(codes, weights=sev == SEVERITY["fail"], minlength=n_pan)
    warn_n = np.bincount(codes, weights=sev == SEVERITY["warn"], minlength=n_pan)
    panels = pd.DataFrame(
        {
            "panel": np.asarray(demand.panel_ids, dtype=object),
            "circuits": np.bincount(codes, minlength=n_pan),
            "connected_va": conn.sum(axis=1),
            "demand_va": f.demand_va,
            "continuous_va": f.continuous_va,
            "design_va": design_va,
            # the heaviest line's design current (215.2(A)(1)), not the balanced average
            "design_current_a": dph[:, :n_ph].max(axis=1),
            "balanced_design_current_a": current_from_apparent_power_a(
                design_va, system.voltage_ll_v, system.phases
            ),
            "phase_a_design_a": dph[:, 0],
            "phase_b_design_a": dph[:, 1],
            "phase_c_design_a": dph[:, 2],
            "phase_a_va": per_phase[:, 0],
            "phase_b_va": per_phase[:, 1],
            "phase_c_va": per_phase[:, 2],
            "imbalance_pct": imbalance,
            "largest_motor_va": f.largest_motor_va,
            **{f"{k}_va": conn[:, j] for j, k in enumerate(KINDS)},
            "fail_circuits": fail_n.astype(int),
            "warn_circuits": warn_n.astype(int),
        }
    )
    return panels, design_va, imbalance


def _panel_findings(panels, design_va, imbalance, per_phase, rules, system, bus_a, main_a):
    """Phase balance of each panel, and its heaviest phase's design current against bus
    and main device."""
    n = len(panels)
    each = panel_findings_each(
        panels, imbalance, per_phase, rules, system, [bus_a] * n, [main_a] * n
    )
    return [f for one in each for f in one]


def panel_findings_each(panels, imbalance, per_phase, rules, system, bus_a, main_a):
    """The findings of :func:`_panel_findings`, one list per panel (row of ``panels``);
    ``bus_a`` and ``main_a``: each panel's ratings (None: not given)."""
    from .compare import compare

    n_ph = 3 if system.phases == 3 else (2 if system.kind == "split" else 1)
    imb = rules["sched-imbalance"]
    out: list[list[Finding]] = []
    design_a = panels["design_current_a"].to_numpy(float)
    line_a = panels[[f"phase_{x}_design_a" for x in "abc"]].to_numpy(float)
    for j, pid in enumerate(panels["panel"].tolist()):
        findings = [
            compare(
                float(imbalance[j]),
                float(imb["value"]),
                "at_most",
                imb,
                str(pid),
                "phase balance",
                "%",
                "largest phase deviation from the average phase load "
                f"(A {per_phase[j, 0] / 1e3:.1f} / B {per_phase[j, 1] / 1e3:.1f}"
                + (f" / C {per_phase[j, 2] / 1e3:.1f}" if n_ph == 3 else "")
                + " kVA)",
                tolerance=0.0,
            )
        ]
        i_d = float(design_a[j])
        heavy = "ABC"[int(np.argmax(line_a[j]))]
        for rid, what, rating in (
            ("panel-bus-load", "bus rating", bus_a[j]),
            ("panel-main-load", "main device", main_a[j]),
        ):
            if rating:
                findings.append(
                    compare(
                        i_d,
                        float(rating),
                        "at_most",
                        {"rule_id": rid, "status": "fail"},
                        str(pid),
                        f"demand vs {what}",
                        "A",
                        f"design current of the heaviest phase ({heavy}) {i_d:.1f} A "
                        f"(continuous at 125 %) vs {what} {rating:g} A",
                    )
                )
        out.append(findings)
    return out


def _circuits_frame(c, q: dict, phase_txt, sev, reason):
    import pandas as pd

    status_names = np.array(["fail", "warn", "ok", "info"], dtype=object)
    return pd.DataFrame(
        {
            "panel": q["panel"],
            "circuit": q["circuit"],
            "description": c["description"].to_numpy(object),
            "poles": q["poles"],
            "phase": phase_txt,
            "kind": q["kind"],
            "load_va": q["load_va"],
            "current_a": q["current_a"],
            "breaker_a": q["breaker_a"],
            "size": q["size"],
            "material": q["material"],
            "length_m": q["length_m"],
            "ampacity_a": q["ampacity_a"],
            "vdrop_pct": q["vdrop_pct"],
            "total_vdrop_pct": q["total_vdrop_pct"],
            "status": status_names[sev],
            "reason": reason,
            "row": c["row"].to_numpy(),
        }
    )


def review_frame(c, q: dict):
    """What a reviewer reads beside each circuit besides the checked figures: whether it
    is continuous, its power factor and its grounding conductor as written."""
    import pandas as pd

    size = c["ground_size"].to_numpy(object)
    mat = np.char.capitalize(c["ground_material"].to_numpy(str).astype(str))
    ground = np.where(size != "", size.astype(str) + " " + mat, "")
    return pd.DataFrame({"continuous": q["continuous"], "pf": q["pf"], "ground": ground})


def _totals(panels, demand: ScheduleDemand, imbalance, n: int, occupancy: str, system) -> dict:
    """The (first) panel's figures, or the sums of a multi-panel file."""
    if len(panels) > 1:
        f = demand.figures
        return {
            "panels": len(panels),
            "circuits": n,
            "spares": int(panels["spares"].sum()),
            "spaces": int(panels["spaces"].sum()),
            "connected_va": float(f.connected_va.sum()),
            "demand_va": float(f.demand_va.sum()),
            "worst_imbalance_pct": float(imbalance.max()),
            "occupancy": occupancy,
            "system": system.text,
        }
    return panel_totals(panels, occupancy, system)[0]


def panel_totals(panels, occupancy: str, system) -> list[dict]:
    """Each panel's figures as the totals of a one-panel schedule (Python numbers):
    :func:`totals_of_record` of each record, converted a column at a time."""
    keys = [str(k) for k in panels.columns]
    if len(keys) != len(set(keys)) or keys != list(panels.columns):
        return [totals_of_record(row, occupancy, system) for row in panels.to_dict("records")]
    cols = []
    for k in keys:
        a = panels[k].to_numpy()
        if a.dtype.kind in "iuf":  # whole numbers stay whole, others floats
            cols.append(a.tolist())
        else:
            cols.append([totals_of_record({k: v}, "", system)[k] for v in a.tolist()])
    out = []
    for values in zip(*cols, strict=True):
        totals = dict(zip(keys, values, strict=True))
        totals["occupancy"] = occupancy
        totals["system"] = system.text
        out.append(totals)
    return out


def totals_of_record(row: dict, occupancy: str, system) -> dict:
    """One panel's record of the panel table as its totals: whole numbers stay whole
    (counts are never shown as 20.0), other numbers are floats."""
    totals = {
        k: (
            int(v)
            if isinstance(v, (int, np.integer)) and not isinstance(v, bool)
            else float(v)
            if isinstance(v, (float, np.floating))
            else v
        )
        for k, v in row.items()
    }
    totals["occupancy"] = occupancy
    totals["system"] = system.text
    return totals
