"""The impedance build-up of every node: each component from the source down (source,
each run, each transformer) with its R and X in the maximum and the minimum case,
referred to the node's voltage (Z·(V_node/V_component)²), and the sums the node's fault
figures come from, so a reviewer can rebuild a figure by hand.

The components are the fault walk's own (:func:`.impedance.branch_parts`), so the sums
are those of the walk; the build-up adds nothing to the computation.
"""

from __future__ import annotations

from ..calc.constants import SQRT3
from ..results import ImpedanceBuildUp, ImpedanceRow
from .context import Context
from .impedance import BranchPart, FaultAssumptions


def _path(ctx: Context, n: str) -> list[str]:
    """Nodes from the first below the source down to ``n``."""
    out = []
    while n is not None and n != "source":
        out.append(n)
        n = ctx.tree.parent_node[n]
    return out[::-1]


def _component(ctx: Context, part: BranchPart) -> str:
    if part.kind == "transformer":
        t = ctx.transformer_by_id[part.element_id]
        return (
            f"transformer {t.id}: {t.rating_va / 1000:g} kVA, {t.z_pct:g} % Z, "
            f"X/R {t.x_r:g}, {t.primary.text} → {t.secondary.text}"
        )
    run = ctx.run_by_id[part.element_id]
    sets = f"{run.sets} × " if run.sets > 1 else ""
    return (
        f"run {run.id}: {sets}{run.size.name} {run.material.capitalize()}, "
        f"{ctx.length(run.length_m)}, {run.raceway}"
    )


def _case(fa: FaultAssumptions, part: BranchPart, which: str) -> str:
    if part.kind == "transformer":
        sign = "−" if which == "max" else "+"
        return f"Z {sign}{fa.tolerance_pct:g} %"
    return f"at {part.conductor_c:g} °C"


def node_buildup(ctx, fa, n, zs: complex, parts: tuple[dict, dict], figures) -> ImpedanceBuildUp:
    """The build-up of node ``n``; ``figures``: (maximum without motors, minimum, motor
    contribution) [A] of the walk, shown beside the sums."""
    tree = ctx.tree
    v = tree.voltage_of[n]
    vn, vb = v.voltage_ll_v, ctx.job.source.voltage.voltage_ll_v
    zs_n = zs * (vn / vb) ** 2
    rows = [ImpedanceRow(f"source: {ctx.job.source.voltage.text}", "", "", zs_n, zs_n)]
    z_max = z_min = zs_n
    for k in _path(ctx, n):
        f = (vn / tree.voltage_of[k].voltage_ll_v) ** 2
        pk = tree.parent_node[k]
        if tree.voltage_of[k].phases == 1 and tree.voltage_of[pk].phases == 3:
            extra = 2 / SQRT3 - 1
            rows.append(
                ImpedanceRow(
                    f"{k}: single-phase unit on two lines of a three-phase supply "
                    f"(supply side as a loop, (2/√3 − 1) × the sum above)",
                    "",
                    "",
                    extra * z_max,
                    extra * z_min,
                )
            )
            z_max, z_min = z_max + extra * z_max, z_min + extra * z_min
        for a, b in zip(parts[0][k], parts[1][k], strict=True):
            za, zb = a.z_ohm * f, b.z_ohm * f
            rows.append(
                ImpedanceRow(_component(ctx, a), _case(fa, a, "max"), _case(fa, b, "min"), za, zb)
            )
            z_max, z_min = z_max + za, z_min + zb
    ohmic_max_a, min_a, motor_a = figures
    return ImpedanceBuildUp(
        v.text,
        vn,
        tuple(rows),
        z_max,
        z_min,
        abs(z_max),
        abs(z_min),
        fa.c_max,
        fa.c_min,
        ohmic_max_a,
        motor_a,
        ohmic_max_a + motor_a,
        min_a,
    )


def record_buildups(ctx: Context, fa, zs: complex, parts: tuple[dict, dict], rf, motor) -> None:
    """Put each node's build-up on its sheet (the source has none: its figure is given)."""
    for i, n in enumerate(ctx.tree.order):
        if n == "source":
            continue
        figures = (float(rf.fault_max_a[i]), float(rf.fault_min_a[i]), float(motor[i]))
        sheet = ctx.sheet(n, ctx.tree.kind[n], "")
        sheet.buildup = node_buildup(ctx, fa, n, zs, parts, figures)
