"""Impedances of the feed's branches for the fault and voltage-drop walks.

All branch impedances are per phase of the wye equivalent, in ohms, at each node's
own voltage. For single-phase parts of the feed the loop impedance is carried as
its "per-phase equivalent" Z_loop/√3, so one three-phase formula
I = V_LL/(√3·|Z|) serves both (V/|Z_loop| for single-phase).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..calc import conductor as ck
from ..calc import fault as fk
from ..calc import fault_lg as lg
from ..calc.constants import SQRT3
from ..calc.memo import memoised
from ..model import SOURCE_ID, Job, Run
from ..rulebook import RowUse
from .context import Context

# the transformer's fault impedances at its tolerance: one nameplate, computed once
transformer_fault_impedances_ohm = memoised(fk.transformer_fault_impedances_ohm)
# R and X of one conductor: a building's runs share a few sizes, materials, raceways
ac_impedance_ohm_per_m = memoised(ck.ac_impedance_ohm_per_m)
# zero-sequence impedances and the instantaneous-trip comparison of the fault walk
run_zero_sequence_ohm = memoised(lg.run_zero_sequence_ohm)
transformer_zero_sequence_ohm = memoised(lg.transformer_zero_sequence_ohm)
instantaneous_trip_check = memoised(lg.instantaneous_trip_check)


@dataclass(frozen=True)
class FaultAssumptions:
    """The fault assumptions of one job: the rule book's rows, the job's own
    impedance tolerance where it gives one, c factors per its voltage-factor option."""

    tolerance_pct: float
    cond_c_max: float
    cond_c_min: float
    c_max: float
    c_min: float
    motor_multiple: float
    ptp_disagree_pct: float
    z0_ratio_max: float
    z0_ratio_min: float

    def min_c(self, run: Run) -> float:
        """Conductor temperature of a run for the minimum fault [°C]: the higher of its
        insulation's rated temperature (the most it may run at, NFPA 70-2023 Table
        310.4(1)) and rule fault-cond-temp-min."""
        return max(self.cond_c_min, run.insulation_c)


def fault_assumptions(ctx: Context) -> FaultAssumptions:
    rows = ctx.rules.fault
    opts = ctx.job.options
    iec = opts.voltage_factor in ("iec60909", "iec60909-10pct")
    c_max = rows.c_max_10pct if opts.voltage_factor == "iec60909-10pct" else rows.c_max_6pct
    given = opts.impedance_tolerance_pct
    return FaultAssumptions(
        tolerance_pct=given if given is not None else rows.z_tolerance_pct,
        cond_c_max=rows.cond_temp_max_c,
        cond_c_min=rows.cond_temp_min_c,
        c_max=c_max if iec else 1.0,
        c_min=rows.c_min if iec else 1.0,
        motor_multiple=rows.motor_multiple,
        ptp_disagree_pct=rows.ptp_disagree_pct,
        z0_ratio_max=rows.z0_ratio_max,
        z0_ratio_min=rows.z0_ratio_min,
    )


@memoised
def _conductors_ohm(size, material, raceway, conductor_c, length_m, sets, *, data) -> complex:
    """Impedance of ``length_m`` of ``sets`` parallel conductors of one phase [Ω]
    (kept per distinct call: runs alike in every one of these share it)."""
    r, x = ac_impedance_ohm_per_m(size, material, raceway, conductor_c, data=data)
    return complex(fk.branch_impedance_ohm(length_m, float(r), float(x), sets))


def run_impedance_ohm(run: Run, conductor_c: float, data: ck.ConductorData) -> complex:
    """Series impedance of a run per phase (one conductor, sets in parallel) [Ω]."""
    return _conductors_ohm(
        run.size.name, run.material, run.raceway, conductor_c, run.length_m, run.sets, data=data
    )


def run_return_impedance_ohm(run: Run, conductor_c: float, data: ck.ConductorData) -> complex:
    """Impedance of the run's return path for a ground fault: its equipment grounding
    conductor (one per raceway, so ``sets`` in parallel); the phase size when none is
    given (neutral return); service conductors return on their grounded conductor
    (``neutral``; 250.24(C)). The raceway as a parallel path is neglected (conservative
    for the minimum current)."""
    size = run.ground if run.ground is not None else run.size
    material = run.ground_material if run.ground is not None else run.material
    if run.from_id == SOURCE_ID and run.ground is None and run.neutral is not None:
        size, material = run.neutral, run.neutral_material
    return _conductors_ohm(
        size.name, material, run.raceway, conductor_c, run.length_m, run.sets, data=data
    )


def branch_impedances(
    ctx: Context, fa: FaultAssumptions, conductor_c: float | None, tx_case: str
) -> dict[str, complex]:
    """Branch impedance (per-phase equivalent, at the node's own voltage) of each node:
    the sum of its parts (:func:`branch_parts`).

    ``tx_case``: ``"max"`` (transformer Z at its lower tolerance) or ``"min"`` (upper)
    or ``"nominal"``; ``conductor_c`` None: each run at :meth:`FaultAssumptions.min_c`.
    A transformer's branch includes the run that feeds it (referred
    through its ratio) and, for a single-phase unit on a three-phase node, the extra
    source loop (added later, by the fault walk).
    """
    return summed(branch_parts(ctx, fa, conductor_c, tx_case))


def summed(parts: dict[str, list[BranchPart]]) -> dict[str, complex]:
    """Each node's branch impedance from its parts."""
    return {n: sum((p.z_ohm for p in ps), 0j) for n, ps in parts.items()}


@dataclass(frozen=True)
class BranchPart:
    """One component of a node's branch: the run into it or its transformer, per-phase
    equivalent at the node's own voltage, and the conductor temperature used [°C]
    (None for a transformer)."""

    element_id: str
    kind: str  # "run" | "transformer"
    z_ohm: complex
    conductor_c: float | None


def branch_parts(
    ctx: Context, fa: FaultAssumptions, conductor_c: float | None, tx_case: str
) -> dict[str, list[BranchPart]]:
    """The components of each node's branch (see :func:`branch_impedances`)."""
    job, tree, data = ctx.job, ctx.tree, ctx.rules.conductors
    tx = {t.id: t for t in job.transformers}
    out: dict[str, list[BranchPart]] = {}
    for n in tree.order:
        if n == "source":
            continue
        v = tree.voltage_of[n]
        run = tree.parent_run.get(n)
        temp_c = conductor_c if conductor_c is not None or run is None else fa.min_c(run)
        parts: list[BranchPart] = []
        if tree.kind[n] == "transformer":
            t = tx[n]
            tol = {"max": fa.tolerance_pct, "min": fa.tolerance_pct, "nominal": 0.0}[tx_case]
            zmax, zmin = transformer_fault_impedances_ohm(
                t.rating_va,
                t.secondary.voltage_ll_v,
                t.z_pct,
                t.x_r,
                tol,
                t.secondary.phases,
            )
            zt = complex(zmin if tx_case == "min" else zmax)
            if t.secondary.phases == 1:
                zt = zt / SQRT3
            if run is not None:
                parent_v = tree.voltage_of[tree.parent_node[n]]
                zr = run_impedance_ohm(run, temp_c, data)
                if t.primary.phases == 1:  # loop out and back on two lines
                    zr = 2 * zr / SQRT3
                zr = complex(fk.refer_impedance_ohm(zr, parent_v.voltage_ll_v, v.voltage_ll_v))
                parts.append(BranchPart(run.id, "run", zr, temp_c))
            parts.append(BranchPart(t.id, "transformer", zt, None))
        elif run is not None:
            zr = run_impedance_ohm(run, temp_c, data)
            z = 2 * zr / SQRT3 if v.phases == 1 else zr
            parts.append(BranchPart(run.id, "run", z, temp_c))
        out[n] = parts
    return out


def is_service(job: Job) -> bool:
    """True when the source is a service point: low voltage, with a run from it to a
    panel (the service equipment). A run from the source to a transformer is a primary
    feeder, as before; a medium-voltage source feeds transformers only."""
    if job.source.medium_voltage:
        return False
    panels = {p.id for p in job.panels}
    return any(r.from_id == SOURCE_ID and r.to_id in panels for r in job.runs)


def service_transformer_ohm(job: Job) -> complex | None:
    """The transformer part of a low-voltage service source with a neutral, at the source
    voltage [Ω]: per phase (three-phase) or the whole-winding loop (single-phase); None
    when the source is not a service (:func:`is_service`) or has no neutral.

    With the utility's transformer stated, its nameplate impedance (nominal); with only
    the available fault current, the whole source impedance is taken as the transformer's
    (the source's zero-sequence impedance is then k × Z1 by rule fault-z0-ratio-*)."""
    s = job.source
    v = s.voltage
    if not is_service(job) or v.voltage_ln_v is None:
        return None
    if s.service is not None:
        t = s.service
        mag = t.z_pct / 100.0 * v.voltage_ll_v**2 / t.rating_va
        return complex(mag / (1 + t.x_r**2) ** 0.5 * (1 + 1j * t.x_r))
    zs = source_impedance(job)
    return zs if v.phases == 3 else SQRT3 * zs


def source_impedance(job: Job) -> complex:
    """Source impedance, per phase (or per-phase equivalent), at the source voltage."""
    s = job.source
    return complex(fk.source_impedance_ohm(s.voltage.voltage_ll_v, s.fault_a, s.x_r))


def impedance_rows(ctx: Context) -> dict[str, tuple[RowUse, ...]]:
    """The unconfirmed table rows each node's and run's impedance path reads (every run
    from the source to it: phase conductors and grounding conductor), for the fault and
    voltage-drop findings about it (:meth:`Context.reading`)."""
    tree, book = ctx.tree, ctx.rules
    out: dict[str, tuple[RowUse, ...]] = {}
    unconfirmed: dict[str, list[RowUse]] = {}  # size -> its unconfirmed rows, read once
    for n in tree.order:
        parent = tree.parent_node[n]
        rows = list(out.get(parent, ())) if parent is not None else []
        run = tree.parent_run.get(n)
        if run is not None:
            for size in (run.size, run.ground) if run.ground is not None else (run.size,):
                if size.name not in unconfirmed:
                    uses = book.impedance_uses(size.name)
                    unconfirmed[size.name] = [u for u in uses if not u.confirmed]
                rows += unconfirmed[size.name]
            out[run.id] = tuple(dict.fromkeys(rows))
        out[n] = tuple(dict.fromkeys(rows))
    return out
