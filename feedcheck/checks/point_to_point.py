"""The point-to-point figure at every node below a transformer fed from the source: the
second method held beside the ohmic maximum (a warning when they differ by more than the
fault-assumptions row ``fault-ptp-disagree``). Kernels: :mod:`feedcheck.calc.point_to_point`."""

from __future__ import annotations

import math

from ..calc.conductor import ac_impedance_ohm_per_m
from ..calc.constants import SQRT3
from ..calc.memo import memoised
from ..calc.point_to_point import (
    conductor_constant_a_ft_per_v,
    percent_difference,
    ptp_chain_a,
    ptp_secondary_current_a,
)
from ..calc.transformer import rated_current_a
from .context import Context
from .fault_duty import kiloamps
from .impedance import FaultAssumptions


def point_to_point_a(ctx: Context, fa: FaultAssumptions, order) -> dict[str, float]:
    """Point-to-point figure at every node below a transformer (second method)."""
    job, tree = ctx.job, ctx.tree
    transformers = {tx.id: tx for tx in job.transformers}
    out: dict[str, float] = {}
    for node in order:
        kind = tree.kind[node]
        if kind == "source":
            continue
        if kind == "transformer":
            if tree.parent_node[node] != "source" or tree.parent_run[node] is not None:
                continue  # chained transformers: the method's transformer step is not applied
            out[node] = fa.c_max * _secondary_start_a(job, transformers[node], fa)
            continue
        upstream = tree.parent_node[node]
        if upstream not in out:
            continue
        out[node] = _end_of_run_a(
            ctx, fa, tree.parent_run[node], tree.voltage_of[node], out[upstream]
        )
    if out:
        ctx.method(
            "Point-to-point method (second figure): f = √3·L·I/(C·n·V_LL) three-phase, "
            "2·L·I/(C·n·V_LL) single-phase; M = 1/(1 + f); C = 1000/|Z per 1000 ft| "
            "from the same conductor impedance data",
            "published point-to-point method of fuse manufacturers' application "
            "literature; conductor data NFPA 70 Ch. 9 Table 9",
        )
    return out


def _secondary_start_a(job, tx, fa: FaultAssumptions) -> float:
    """The method's starting figure at a transformer fed from the source (before the
    voltage factor)."""
    rated = rated_current_a(tx.rating_va, tx.secondary.voltage_ll_v, tx.secondary.phases)
    source_a = job.source.fault_a
    if tx.secondary.phases == 1 and job.source.voltage.phases == 3:
        source_a = source_a * SQRT3 / 2  # line-to-line fault on a three-phase source
    return float(  # the ohmic maximum's voltage factor is applied by the caller
        ptp_secondary_current_a(
            rated,
            tx.z_pct,
            fa.tolerance_pct,
            None if math.isinf(source_a) else source_a,
            tx.primary.voltage_ll_v,
            tx.secondary.voltage_ll_v,
        )
    )


def _end_of_run_a(ctx: Context, fa: FaultAssumptions, run, system, start_a: float) -> float:
    """The figure at the end of one run, from the figure at its head."""
    c_value = _conductor_constant(
        run.size.name, run.material, run.raceway, fa.cond_c_max, data=ctx.rules.conductors
    )
    kind = "3ph" if system.phases == 3 else "1ph-ll"
    return _one_step_a(start_a, run.length_m, c_value, run.sets, system.voltage_ll_v, kind)


@memoised
def _one_step_a(start_a, length_m, c_value, sets, voltage_ll_v, kind) -> float:
    """One run of the point-to-point chain (kept per distinct call: the runs below alike
    transformers start from the same figure)."""
    return float(ptp_chain_a(start_a, [length_m], [c_value], [sets], voltage_ll_v, kind)[0])


@memoised
def _conductor_constant(size: str, material: str, raceway: str, conductor_c: float, *, data):
    """The conductor constant C of one size, material and raceway (kept per distinct
    call: a building's runs share a few)."""
    r_ohm_per_m, x_ohm_per_m = ac_impedance_ohm_per_m(
        size, material, raceway, conductor_c, data=data
    )
    return float(conductor_constant_a_ft_per_v(float(r_ohm_per_m), float(x_ohm_per_m)))


def ptp_finding(
    ctx: Context, fa: FaultAssumptions, node: str, ptp_a: float, ohmic_a: float
) -> None:
    """The point-to-point figure on the node and its difference from the ohmic maximum."""
    values = ctx.nodes[node].values
    values["fault_ptp_a"] = ptp_a
    diff = float(percent_difference(ptp_a, ohmic_a))
    values["fault_ptp_diff_pct"] = diff
    ok = abs(diff) <= fa.ptp_disagree_pct
    ctx.add(
        node,
        "point-to-point vs ohmic",
        diff,
        fa.ptp_disagree_pct,
        "%",
        "ok" if ok else "warn",
        "fault-ptp-disagree",
        f"point-to-point {kiloamps(ptp_a)} vs ohmic {kiloamps(ohmic_a)}"
        + (
            ""
            if ok
            else "; the point-to-point method adds impedance magnitudes (no X/R) and "
            "reads low where conductor resistance dominates — the ohmic figure is the "
            "one used for ratings; review the impedance data if the gap surprises you"
        ),
    )
