"""Motor starting dip: each motor started across the line, its locked-rotor current
drawn through the source, transformers and runs to its panel, and through its own branch
run to its terminals; the dip at the panel (other loads) and at the terminals held
against the rows of ``tables/motor_starting_limits.csv``."""

from __future__ import annotations

import math

from ..calc import conductor as ck
from ..calc import motor_starting as ms
from ..calc.constants import SQRT3
from .context import Context
from .impedance import branch_impedances, fault_assumptions, source_impedance

OPERATING_C = 75.0  # conductor temperature for the dip (as for the steady-state drop)


def check_motor_starting(ctx: Context) -> None:
    job, tree = ctx.job, ctx.tree
    if not job.motors:
        return
    fa = fault_assumptions(ctx)
    branches = branch_impedances(ctx, fa, OPERATING_C, "nominal")
    zs = source_impedance(job)
    vb = job.source.voltage.line_v
    lr = ctx.rules.rows("motor_locked_rotor")
    lim = ctx.rules.rule("ms-motor-terminals")
    ctx.method(
        "Motor starting dip, impedance divider: V_t = E_s·|Z_m|/|Z_path + Z_m| with "
        "Z_m = V_rated/I_LR at the starting power factor",
        "IEEE Std 399-1997 ch. 9; IEEE Std 141-1993 ch. 3",
    )
    for m in job.motors:
        # path impedance from the source to the motor's panel, referred to the panel voltage
        n = m.panel_id
        chain = []
        while n is not None and n != "source":
            chain.append(n)
            n = tree.parent_node[n]
        z = zs
        for node in reversed(chain):
            z += branches[node] * (vb / tree.voltage_of[node].line_v) ** 2
        v = tree.voltage_of[m.panel_id]
        z_node = z * (v.line_v / vb) ** 2
        hp = m.hp if m.hp is not None else math.inf
        row = next(r for r in lr if r["hp_to"] >= hp) if m.hp is not None else lr[-1]
        i_lr = m.locked_rotor_a if m.locked_rotor_a else float(row["lr_multiple"]) * m.full_load_a
        pf_start = float(row["starting_pf"])
        phases = m.phases or v.phases
        if phases == 3:
            es = v.line_v / SQRT3
            zr, zx = z_node.real, z_node.imag
        elif v.phases == 3:  # a single-phase motor on two lines: the loop of both lines
            es = v.line_v
            zr, zx = 2 * z_node.real, 2 * z_node.imag
        else:
            es = v.line_v
            zr, zx = (z_node * SQRT3).real, (z_node * SQRT3).imag
        lr_text = f"locked rotor {i_lr:.0f} A" + (
            "" if m.locked_rotor_a else f", {row['lr_multiple']:g} × FLC typical"
        )
        bus = float(ms.motor_starting_voltage_pct(es, i_lr, pf_start, zr, zx, es))
        other = ctx.rules.rule("ms-other-loads")
        ctx.compare(
            m.id,
            "starting dip at the panel",
            100.0 - bus,
            other.number("max_dip_pct"),
            "%",
            "at_most",
            "ms-other-loads",
            f"{m.panel_id} at {bus:.1f} % while {m.id} starts ({lr_text}): other "
            "loads on the panel see this dip",
            fail_status=str(other["status"]),
        )
        br, bx, where = _motor_branch(ctx, m, phases)
        vt = float(ms.motor_starting_voltage_pct(es, i_lr, pf_start, zr + br, zx + bx, es))
        dip = 100.0 - vt
        ctx.compare(
            m.id,
            "motor starting dip",
            dip,
            lim.number("max_dip_pct"),
            "%",
            "at_most",
            "ms-motor-terminals",
            f"{vt:.1f} % of rated voltage {where} while starting ({lr_text})",
            fail_status=str(lim["status"]),
        )


def _motor_branch(ctx: Context, m, phases: int) -> tuple[float, float, str]:
    """R and X [Ω] of the motor's branch run as the dip divider sees it (per phase for
    three-phase, out and back for single-phase), and where the dip is computed."""
    if m.length_m is None or m.size is None:
        ctx.assume(
            f"{m.id}: starting dip computed at panel {m.panel_id}, its branch run not "
            "included (give length and conductors on [[motor]] for the terminals)"
        )
        return 0.0, 0.0, f"at {m.panel_id} (branch run not given: at the terminals it is lower)"
    r, x = ck.ac_impedance_ohm_per_m(
        m.size.name, m.material, m.raceway, OPERATING_C, data=ctx.rules.conductors
    )
    k = 1.0 if phases == 3 else 2.0
    return (
        k * float(r) * m.length_m,
        k * float(x) * m.length_m,
        f"at the motor terminals ({ctx.length(m.length_m)} of {m.size.name} "
        f"{m.material.capitalize()} from {m.panel_id})",
    )
