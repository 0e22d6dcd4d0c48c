"""Motor checks from the table full-load current (NFPA 70-2023 Article 430).

* 430.6(A)(1): the full-load current (FLC) that sizes conductors and devices is the one
  of Table 430.248 / 430.250 by horsepower and voltage (looked up when the job is read,
  :mod:`feedcheck.inputs.motor_keys`); the calculation sheet names the row and column;
* 430.22: the motor's branch conductors (when the job gives them) carry at least 125 %
  of the FLC;
* 430.24: the motors add to their panel's load, 100 % of every FLC plus 25 % of the
  largest motor's, once per panel (:func:`feedcheck.checks.motor_loads.add_motor_loads`,
  called when the loads are rolled up);
* 430.52(C)(1), Table 430.52: the branch short-circuit and ground-fault device is at
  most the table percent of the FLC, or the next higher standard rating (Exception 1);
* 430.110(A): the disconnecting means is rated at least 115 % of the FLC.

A figure the job does not give (branch conductors, device, disconnect) is a warning
naming the key, never a pass. Limits come from ``tables/motor_rules.csv`` and
``tables/motor_branch_device_max.csv``.
"""

from __future__ import annotations

from ..calc import ampacity as ak
from ..calc import motors as mk
from ..model import MOTOR_DEVICES, Motor
from .context import Context
from .motor_loads import MotorLoad


def check_motors(ctx: Context) -> None:
    """The motor rules for every motor (the 430.24 steps are on the panels' sheets)."""
    for m in ctx.job.motors:
        sheet = ctx.sheet(m.id, "motor", f"Motor {m.id} (on {m.panel_id})")
        _flc(ctx, m, sheet)
        _branch_conductor(ctx, m, sheet)
        _branch_device(ctx, m, sheet)
        _disconnect(ctx, m, sheet)


def _flc(ctx: Context, m: Motor, sheet) -> None:
    v = ctx.tree.voltage_of[m.panel_id]
    phases = m.phases or v.phases
    if m.kw is not None:
        rating = f"{m.kw:g} kW = {m.hp:.2f} hp (746 W/hp)"
    else:
        rating = "not given" if m.hp is None else f"{m.hp:g} hp"
    sheet.inputs += [
        ("Rating", rating),
        ("Phases, voltage", f"{phases}-phase, {(m.voltage_v or v.voltage_ll_v):g} V on {v.text}"),
    ]
    if m.nameplate_a is not None:
        sheet.inputs.append(("Nameplate full-load current", f"{m.nameplate_a:g} A (overload only)"))
    if m.flc_basis == "table":
        title = "Table 430.248" if phases == 1 else "Table 430.250"
        row_hp = m.flc_row_hp if m.flc_row_hp is not None else m.hp
        sheet.step(
            "Full-load current from the table (430.6(A)(1))",
            f"NFPA 70 {title}: {row_hp:g} hp row, {m.flc_column_v:g} V column",
            f"row {m.flc_rule_id}",
            m.full_load_a,
            "A",
            m.flc_rule_id,
        )
        if taken_up(m):
            ctx.add(
                m.id,
                "full-load current from the table",
                m.full_load_a,
                None,
                "A",
                "info",
                "motor-flc-table",
                f"{m.kw:g} kW = {m.hp:.2f} hp lies between the rows of {title}: the next "
                f"larger row, {row_hp:g} hp, gives {m.full_load_a:g} A (the larger current, "
                "430.6(A)(1)); the 430.52 device limit rests on it too: check the device "
                "against the motor's nameplate and the maker's data",
            )
        return
    ctx.add(
        m.id,
        "full-load current from the table",
        m.full_load_a,
        None,
        "A",
        "warn",
        "motor-flc-table",
        f"no hp or kw given: sized from the {m.full_load_a:g} A typed in; 430.6(A)(1) sizes "
        "conductors and devices from Table 430.248/430.250 (give hp = … on [[motor]])",
    )
    sheet.step("Full-load current (as typed, no horsepower)", "—", "", m.full_load_a, "A")


def taken_up(m: Motor) -> bool:
    """A kW rating that lies between horsepower rows (the next larger row taken)."""
    return m.kw is not None and m.flc_row_hp is not None and m.flc_row_hp > m.hp * 1.01


def _branch_conductor(ctx: Context, m: Motor, sheet) -> None:
    rule = ctx.rules.rule("motor-branch-conductor")
    need = rule.number("limit") / 100.0 * m.full_load_a
    if m.size is None:
        ctx.add(
            m.id,
            "branch conductor ampacity",
            None,
            need,
            "A",
            "warn",
            "motor-branch-conductor",
            f"not checked: the branch conductors are not given (length and conductors on "
            f"[[motor]] {m.id}); they need at least {need:.1f} A (430.22)",
        )
        return
    by_rule = m.termination_c is None
    term = float(ak.termination_c_for(need, m.size.name)) if by_rule else m.termination_c
    amp = float(
        ak.ampacity_a(
            m.size.name,
            m.material,
            75.0,
            termination_c=term,
            free_air=m.raceway == "free-air",
            tables=ctx.rules.ampacity,
        )
    )
    sheet.step(
        "Branch conductor ampacity needed (430.22)",
        f"{rule.number('limit'):g} % × FLC",
        f"{rule.number('limit') / 100:g} × {m.full_load_a:g} A",
        need,
        "A",
        "motor-branch-conductor",
    )
    ctx.compare(
        m.id,
        "branch conductor ampacity",
        amp,
        need,
        "A",
        "at_least",
        "motor-branch-conductor",
        f"{m.size.name} {m.material.capitalize()}: {amp:g} A at the {term:g} °C column "
        f"({'110.14(C)(1)' if by_rule else 'termination as given'}, 30 °C, 3 conductors) "
        f"vs {rule.number('limit'):g} % of {m.full_load_a:g} A"
        + (
            '; termination = "75 degC" on [[motor]] changes it where the equipment is rated so'
            if by_rule and term < 75
            else ""
        ),
        fail_status=str(rule["status"]),
    )


def _branch_device(ctx: Context, m: Motor, sheet) -> None:
    v = ctx.tree.voltage_of[m.panel_id]
    kind = m.motor_type or ("single-phase" if (m.phases or v.phases) == 1 else "squirrel-cage")
    row = next(r for r in ctx.rules.rows("motor_branch_device_max") if r["motor_type"] == kind)
    pct = float(row[MOTOR_DEVICES[m.device_type]])
    fuse = "fuse" in m.device_type
    std = ctx.rules.protection.fuse_a if fuse else ctx.rules.protection.breaker_a
    lim = mk.branch_device_max_a(m.full_load_a, pct, std)
    what = f"{m.device_type.replace('-', ' ')}, {kind} motor"
    sheet.step(
        "Largest branch short-circuit and ground-fault device (430.52(C)(1))",
        f"Table 430.52 {pct:g} % × FLC, next standard rating up (Exception No. 1)",
        f"{pct / 100:g} × {m.full_load_a:g} A = {float(lim.limit_a):.1f} A ({what})",
        float(lim.permitted_a),
        "A",
        str(row["rule_id"]),
    )
    if m.device_a is None:
        ctx.add(
            m.id,
            "branch device",
            None,
            float(lim.permitted_a),
            "A",
            "warn",
            "motor-branch-device",
            f"not checked: no device given (device = … on [[motor]] {m.id}); at most "
            f"{float(lim.permitted_a):g} A for {what}",
        )
        return
    ctx.compare(
        m.id,
        "branch device",
        m.device_a,
        float(lim.permitted_a),
        "A",
        "at_most",
        "motor-branch-device",
        f"{m.device_a:g} A {what}: Table 430.52 {pct:g} % of {m.full_load_a:g} A = "
        f"{float(lim.limit_a):.1f} A, next standard rating {float(lim.permitted_a):g} A",
    )


def _disconnect(ctx: Context, m: Motor, sheet) -> None:
    rule = ctx.rules.rule("motor-disconnect")
    need = rule.number("limit") / 100.0 * m.full_load_a
    sheet.step(
        "Disconnecting means rating needed (430.110(A))",
        f"{rule.number('limit'):g} % × FLC",
        f"{rule.number('limit') / 100:g} × {m.full_load_a:g} A",
        need,
        "A",
        "motor-disconnect",
    )
    if m.disconnect_a is None:
        ctx.add(
            m.id,
            "disconnect rating",
            None,
            need,
            "A",
            "warn",
            "motor-disconnect",
            f"not checked: no disconnect rating given (disconnect = … on [[motor]] {m.id}); "
            f"at least {need:.1f} A",
        )
        return
    ctx.compare(
        m.id,
        "disconnect rating",
        m.disconnect_a,
        need,
        "A",
        "at_least",
        "motor-disconnect",
        f"{m.disconnect_a:g} A vs {rule.number('limit'):g} % of {m.full_load_a:g} A",
    )


def panel_motor_steps(sheet, shares: list[MotorLoad], adder: float) -> None:
    """The 430.24 arithmetic of a panel's motors on its sheet: each FLC, their sum, the
    largest motor's 25 % (once)."""
    total = sum(s.va for s in shares)
    sheet.step(
        "Motors on the panel (430.24), 100 % of each table FLC",
        "Σ FLC × V (× √3 three-phase)",
        " + ".join(f"{s.motor_id} {s.flc_a:g} A" for s in shares),
        round(total),
        "VA",
        "motor-feeder-largest",
    )
    big = max(shares, key=lambda s: s.va)
    sheet.step(
        "Largest motor, + 25 % (430.24), once per panel",
        "0.25 × largest motor",
        f"0.25 × {big.va:,.0f} VA ({big.motor_id})"
        + ("" if adder > 0 else "; a larger motor's 25 % is already in the schedule"),
        round(adder),
        "VA",
        "motor-feeder-largest",
    )
