"""Impedances of the feed's branches for the fault and voltage-drop walks.

All branch impedances are per phase of the wye equivalent, in ohms, at each node's
own voltage. For single-phase parts of the feed the loop impedance is carried as
its "per-phase equivalent" Z_loop/√3, so one three-phase formula
I = V_LL/(√3·|Z|) serves both (V/|Z_loop| for single-phase).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..calc import conductor as ck
from ..calc import fault as fk
from ..model import Job, Run, Tree
from ..tables import load_table
from .transformer import transformer_x_r

SQRT3 = math.sqrt(3.0)


@dataclass(frozen=True)
class FaultAssumptions:
    tolerance_pct: float
    cond_c_max: float
    cond_c_min: float
    c_max: float
    c_min: float
    motor_multiple: float
    ptp_disagree_pct: float
    split_ln_multiplier: float
    z0_ratio_min: float


def fault_assumptions(job: Job) -> FaultAssumptions:
    rows = load_table("fault_assumptions").data.set_index("rule_id")["value"].astype(float)
    iec = job.options.voltage_factor == "iec60909"
    return FaultAssumptions(
        tolerance_pct=job.options.impedance_tolerance_pct,
        cond_c_max=rows["fault-cond-temp-max"],
        cond_c_min=rows["fault-cond-temp-min"],
        c_max=rows["fault-c-max-6pct"] if iec else 1.0,
        c_min=rows["fault-c-min"] if iec else 1.0,
        motor_multiple=rows["fault-motor-multiple"],
        ptp_disagree_pct=rows["fault-ptp-disagree"],
        split_ln_multiplier=rows["fault-split-ln-multiplier"],
        z0_ratio_min=rows["fault-z0-ratio-min"],
    )


def run_impedance_ohm(run: Run, conductor_c: float) -> complex:
    """Series impedance of a run per phase (one conductor, sets in parallel) [Ω]."""
    r, x = ck.ac_impedance_ohm_per_m(run.size.name, run.material, run.raceway, conductor_c)
    return complex(fk.branch_impedance_ohm(run.length_m, float(r), float(x), run.sets))


def run_return_impedance_ohm(run: Run, conductor_c: float) -> complex:
    """Impedance of the run's return path for a ground fault: its equipment grounding
    conductor (one per raceway, so ``sets`` in parallel); the phase size when none is
    given (neutral return). The raceway as a parallel path is neglected (conservative
    for the minimum current)."""
    size = run.ground if run.ground is not None else run.size
    material = run.ground_material if run.ground is not None else run.material
    r, x = ck.ac_impedance_ohm_per_m(size.name, material, run.raceway, conductor_c)
    return complex(fk.branch_impedance_ohm(run.length_m, float(r), float(x), run.sets))


def branch_impedances(
    job: Job, tree: Tree, fa: FaultAssumptions, conductor_c: float, tx_case: str
) -> dict[str, complex]:
    """Branch impedance (per-phase equivalent, at the node's own voltage) of each node.

    ``tx_case``: ``"max"`` (transformer Z at its lower tolerance) or ``"min"`` (upper)
    or ``"nominal"``. A transformer's branch includes the run that feeds it (referred
    through its ratio) and, for a single-phase unit on a three-phase node, the extra
    source loop (added later, by :func:`single_phase_on_three_phase`).
    """
    tx = {t.id: t for t in job.transformers}
    out: dict[str, complex] = {}
    for n in tree.order:
        if n == "source":
            continue
        v = tree.voltage_of[n]
        run = tree.parent_run.get(n)
        z = 0j
        if tree.kind[n] == "transformer":
            t = tx[n]
            tol = {"max": fa.tolerance_pct, "min": fa.tolerance_pct, "nominal": 0.0}[tx_case]
            zmax, zmin = fk.transformer_fault_impedances_ohm(
                t.rating_va,
                t.secondary.line_v,
                t.z_pct,
                transformer_x_r(t),
                tol,
                t.secondary.phases,
            )
            zt = complex(zmin if tx_case == "min" else zmax)
            if t.secondary.phases == 1:
                zt = zt / SQRT3
            if run is not None:
                parent_v = tree.voltage_of[tree.parent_node[n]]
                zr = run_impedance_ohm(run, conductor_c)
                if t.primary.phases == 1:  # loop out and back on two lines
                    zr = 2 * zr / SQRT3
                z += complex(fk.refer_impedance_ohm(zr, parent_v.line_v, v.line_v))
            z += zt
        elif run is not None:
            zr = run_impedance_ohm(run, conductor_c)
            z = 2 * zr / SQRT3 if v.phases == 1 else zr
        out[n] = z
    return out


def source_impedance(job: Job) -> complex:
    """Source impedance, per phase (or per-phase equivalent), at the source voltage."""
    s = job.source
    return complex(fk.source_impedance_ohm(s.voltage.line_v, s.fault_a, s.x_r))
