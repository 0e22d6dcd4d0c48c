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
    vb = job.source.voltage.voltage_ll_v
    lr = ctx.rules.rows("motor_locked_rotor")
    lim = ctx.rules.rule("ms-motor-terminals")
    starts = []  # (motor, E, I_LR, pf, path impedance, impedance to each node on the path)
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
        upto = {"source": zs}  # impedance from the source to each node of the path
        for node in reversed(chain):
            z += branches[node] * (vb / tree.voltage_of[node].voltage_ll_v) ** 2
            upto[node] = z
        v = tree.voltage_of[m.panel_id]
        z_node = z * (v.voltage_ll_v / vb) ** 2
        hp = m.hp if m.hp is not None else math.inf
        row = next(r for r in lr if r["hp_to"] >= hp) if m.hp is not None else lr[-1]
        i_lr = m.locked_rotor_a if m.locked_rotor_a else float(row["lr_multiple"]) * m.full_load_a
        pf_start = float(row["starting_pf"])
        phases = m.phases or v.phases
        # per phase (three-phase), the loop of both lines (single-phase on two lines)
        loop = 1.0 if phases == 3 else (2.0 if v.phases == 3 else SQRT3)
        es = v.voltage_ll_v / SQRT3 if phases == 3 else v.voltage_ll_v
        zr, zx = (z_node * loop).real, (z_node * loop).imag
        to_panel = loop * (v.voltage_ll_v / vb) ** 2
        starts.append(
            (m, es, i_lr, pf_start, z_node * loop, {k: to_panel * u for k, u in upto.items()})
        )
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
    _lighting_flicker(ctx, starts)


def lighting_panels(ctx: Context) -> list[str]:
    """Panels known to serve general lighting: a schedule with lighting circuits, or a
    220.12 minimum lighting load (occupancy and area). A panel given by ``load`` alone
    is not known to serve lighting."""
    found = [p for p, c in ctx.chains.items() if float(c.connected_va.get("lighting", 0)) > 0]
    found += [m.panel_id for m in ctx.lighting_minimum if m.used_va > 0]
    return list(dict.fromkeys(found))


def _lighting_flicker(ctx: Context, starts: list) -> None:
    """The dip at every panel serving lighting while each motor starts, held against row
    ms-lighting-flicker: the dip of the motor's path at the last node it shares with
    the lighting panel (the panel itself when it is on the path; beyond that node no
    starting current flows, prior load neglected). The worst motor per panel."""
    rule = ctx.rules.rule("ms-lighting-flicker")
    tree = ctx.tree
    for panel in lighting_panels(ctx):
        worst = None
        for m, es, i_lr, pf, z, upto in starts:
            n = panel
            while n not in upto:
                n = tree.parent_node[n] if n != "source" else "source"
            at = float(
                ms.voltage_on_path_pct(es, i_lr, pf, z.real, z.imag, upto[n].real, upto[n].imag)
            )
            if worst is None or at < worst[0]:
                worst = (at, m.id, n)
        if worst is None:
            continue
        at, mid, n = worst
        shared = "" if n == panel else f" (through {n}, which it shares with {mid}'s path)"
        ctx.compare(
            panel,
            "lighting dip while a motor starts",
            100.0 - at,
            rule.number("max_dip_pct"),
            "%",
            "at_most",
            "ms-lighting-flicker",
            f"{panel} serves lighting and dips to {at:.1f} % while {mid} starts{shared}; "
            f"{rule['note']}",
            fail_status=str(rule["status"]),
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
