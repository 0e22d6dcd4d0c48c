"""Available fault current at every node: maximum and minimum three-phase (ohmic
method), minimum line-to-ground, asymmetry, the point-to-point figure beside it,
equipment ratings, the instantaneous-trip check and the marking figures."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..calc import conductor as ck
from ..calc import fault as fk
from ..calc import fault_lg as lg
from ..calc import transformer as tk
from ..calc.constants import SQRT3
from ..calc.sizes import AWG_KCMIL_ORDER, METRIC_ORDER, SIZES
from ..render.display import bolted_fault_words
from .context import Context
from .fault_buildup import record_buildups
from .fault_duty import (
    describe_methods,
    flag_return_paths,
    motor_contribution,
    node_duty,
    record_duty,
    split_ln_source_ohm,
    transformer_loop_ohm,
    worst_case_figures,
    z0_ratio,
)
from .impedance import (
    branch_parts,
    fault_assumptions,
    run_impedance_ohm,
    run_return_impedance_ohm,
    source_impedance,
    summed,
)
from .taps import run_device


def _kA(a: float) -> str:
    return f"{a / 1000:,.2f} kA"


def check_faults(ctx: Context) -> None:
    job, tree = ctx.job, ctx.tree
    fa = fault_assumptions(ctx)
    order = list(tree.order)
    pos = {n: i for i, n in enumerate(order)}
    parent = np.array(tree.parent_index())
    v_node = np.array([tree.voltage_of[n].line_v for n in order])
    vb = job.source.voltage.line_v

    zs = source_impedance(job)
    parts_max = branch_parts(ctx, fa, fa.cond_c_max, "max")
    parts_min = branch_parts(ctx, fa, None, "min")
    b_max, b_min = summed(parts_max), summed(parts_min)

    def referred(branches):
        arr = np.zeros(len(order), dtype=complex)
        for n, z in branches.items():
            arr[pos[n]] = z * (vb / tree.voltage_of[n].line_v) ** 2
        return arr

    zb_max, zb_min = referred(b_max), referred(b_min)
    # a single-phase transformer on a three-phase node draws through two source lines:
    # loop = 2·Z_parent, per-phase equivalent 2·Z_parent/√3 (instead of Z_parent)
    for t in job.transformers:
        p = tree.parent_node[t.id]
        if t.secondary.phases == 1 and tree.voltage_of[p].phases == 3:
            for zb in (zb_max, zb_min):
                zp = fk.cumulative_impedance_ohm(parent, zb, zs)[pos[p]]
                zb[pos[t.id]] += (2 / SQRT3 - 1) * zp
    rf = _walk_3ph(job, parent, v_node, zb_max, zb_min, zs, fa, vb)
    ohmic_max_no_motor = rf.fault_max_a
    motor_node = motor_contribution(ctx, fa, vb)  # every motor on the same system
    fault_max = rf.fault_max_a + motor_node
    finite = np.isfinite(fault_max)
    peak = np.full(len(order), np.inf)
    asym = np.full(len(order), np.inf)
    peak[finite] = fk.peak_current_a(fault_max[finite], rf.x_r[finite])
    asym[finite] = fk.asymmetric_rms_half_cycle_a(fault_max[finite], rf.x_r[finite])

    _describe_3ph(ctx, fa)
    lg_min = _line_to_ground(ctx, fa, order, pos, parent, zb_min, zs, vb)
    ptp = _point_to_point(ctx, fa, order, rf)
    _primary_terminals(ctx, fa, pos, rf, vb)
    z_node_max = {n: complex(rf.z_max_ohm[i] * (v_node[i] / vb) ** 2) for i, n in enumerate(order)}
    worst = worst_case_figures(ctx, fa, z_node_max, dict(zip(order, motor_node, strict=True)))
    describe_methods(ctx, fa, worst)
    flag_return_paths(ctx)

    figs = _Figures(
        rf, fault_max, motor_node, ohmic_max_no_motor, peak, asym, lg_min, ptp, worst, v_node, vb
    )
    when = _calc_date(ctx)
    for i, n in enumerate(order):
        _record_node(ctx, fa, figs, i, n, when)
    record_buildups(ctx, fa, zs, (parts_max, parts_min), rf, motor_node)


def _describe_3ph(ctx: Context, fa) -> None:
    ctx.method(
        "Three-phase bolted fault, complex ohmic method: source + transformer (%Z, X/R)"
        " + conductors summed as complex impedances, I = c·V_LL/(√3·|Z|)",
        "IEEE Std 141-1993 (Red Book) ch. 4",
    )
    ctx.method("Peak current i_p = κ·√2·I, κ = 1.02 + 0.98·e^(−3R/X)", "IEC 60909-0:2016 §8.1")
    ctx.method(
        "Half-cycle asymmetrical RMS current I·√(1 + 2·e^(−2π/(X/R)))",
        "IEEE Std C37.010 / IEEE Std 141 ch. 4 (DC offset decaying with X/R)",
    )
    ctx.assume(
        f"Fault maximum: transformer impedance at −{fa.tolerance_pct:g} % tolerance, "
        f"conductors at {fa.cond_c_max:g} °C; minimum: +{fa.tolerance_pct:g} %, "
        f"each run's conductors at its insulation's rated temperature, at least "
        f"{fa.cond_c_min:g} °C (tables/fault_assumptions.csv; NFPA 70 Table 310.4(1))."
    )
    if ctx.job.options.voltage_factor != "none":
        ctx.assume(
            f"IEC 60909 voltage factors applied: c_max = {fa.c_max:g}, c_min = {fa.c_min:g}."
        )
    else:
        ctx.assume("No voltage factor applied to fault currents (c = 1, nominal voltage).")


@dataclass(frozen=True)
class _Figures:
    """The walk's figures per node (arrays in tree order; dicts by node id)."""

    rf: _Walk
    fault_max: np.ndarray
    motor_node: np.ndarray
    ohmic_no_motor: np.ndarray
    peak: np.ndarray
    asym: np.ndarray
    lg_min: dict
    ptp: dict
    worst: dict
    v_node: np.ndarray
    vb: float


def _record_node(ctx: Context, fa, g: _Figures, i: int, n: str, when: str) -> None:
    """Node values, the point-to-point finding, the sheet and the duty of one node."""
    rf, tree = g.rf, ctx.tree
    node = ctx.nodes[n]
    node.values.update(
        {
            "fault_max_a": float(g.fault_max[i]),
            "fault_min_a": float(rf.fault_min_a[i]),
            "x_r": float(rf.x_r[i]),
            "peak_a": float(g.peak[i]),
            "asym_rms_a": float(g.asym[i]),
        }
    )
    if g.motor_node[i] > 0:
        node.values["fault_motor_a"] = float(g.motor_node[i])
    if n in g.lg_min:
        node.values["fault_lg_min_a"] = g.lg_min[n]
    if n in g.ptp:
        _ptp_finding(ctx, fa, n, g.ptp[n], float(g.ohmic_no_motor[i]))
    if n == "source":
        return
    _sheet_steps(ctx, fa, g, i, n)
    first = "3ph" if tree.voltage_of[n].phases == 3 else "ll"
    faults = {first: float(g.fault_max[i])}
    x_rs = {first: float(rf.x_r[i])}
    if n in g.worst:
        faults.update(g.worst[n].faults_a)
        x_rs.update(g.worst[n].x_r)
        for case, key in (("ln", "fault_ln_max_a"), ("lg", "fault_lg_max_a")):
            if case in g.worst[n].faults_a:
                node.values[key] = g.worst[n].faults_a[case]
    record_duty(ctx, n, node_duty(ctx, n, faults, x_rs), when)


def _ptp_finding(ctx: Context, fa, n: str, ptp_a: float, ohmic_a: float) -> None:
    values = ctx.nodes[n].values
    values["fault_ptp_a"] = ptp_a
    diff = float(fk.percent_difference(ptp_a, ohmic_a))
    values["fault_ptp_diff_pct"] = diff
    ok = abs(diff) <= fa.ptp_disagree_pct
    ctx.add(
        n,
        "point-to-point vs ohmic",
        diff,
        fa.ptp_disagree_pct,
        "%",
        "ok" if ok else "warn",
        "fault-ptp-disagree",
        f"point-to-point {_kA(ptp_a)} vs ohmic {_kA(ohmic_a)}"
        + (
            ""
            if ok
            else "; the point-to-point method adds impedance magnitudes (no X/R) and "
            "reads low where conductor resistance dominates — the ohmic figure is the "
            "one used for ratings; review the impedance data if the gap surprises you"
        ),
    )


def _sheet_steps(ctx: Context, fa, g: _Figures, i: int, n: str) -> None:
    rf, tree, vb, v_node = g.rf, ctx.tree, g.vb, g.v_node
    motor_node, fault_max, peak, lg_min, ptp = g.motor_node, g.fault_max, g.peak, g.lg_min, g.ptp
    sh = ctx.sheet(n, tree.kind[n], "")
    z_max_node = rf.z_max_ohm[i] * (v_node[i] / vb) ** 2
    z_min_node = rf.z_min_ohm[i] * (v_node[i] / vb) ** 2
    v = tree.voltage_of[n]
    form = "I = c·V_LL / (√3·|Z|)" if v.phases == 3 else "I = c·V / |Z_loop| (Z_loop = √3·Z)"
    bolted = bolted_fault_words(v.phases)
    sh.step(
        "Total impedance to this node, maximum case",
        "Z = Z_source + Z_transformer + Σ Z_runs (referred to this voltage)",
        f"{z_max_node.real * 1e3:.3f} + j{z_max_node.imag * 1e3:.3f} mΩ",
        abs(z_max_node) * 1e3,
        "mΩ",
        "fault-z-tolerance",
    )
    sh.step(
        f"Maximum {bolted} fault current",
        form,
        f"{fa.c_max:g} × {v.line_v:g} / (√3 × {abs(z_max_node) * 1e3:.3f} mΩ)"
        + (f" + motors {motor_node[i]:.0f} A" if motor_node[i] > 0 else ""),
        float(fault_max[i]),
        "A",
        "fault-cond-temp-max",
    )
    sh.step(
        f"Minimum {bolted} fault current",
        form,
        f"{fa.c_min:g} × {v.line_v:g} / (√3 × {abs(z_min_node) * 1e3:.3f} mΩ)",
        float(rf.fault_min_a[i]),
        "A",
        "fault-cond-temp-min",
    )
    sh.step(
        "X/R and peak",
        "κ = 1.02 + 0.98·e^(−3/(X/R)); i_p = κ·√2·I_max",
        f"X/R = {rf.x_r[i]:.2f}",
        float(peak[i]),
        "A",
        "iec60909-kappa",
    )
    if n in lg_min:
        sh.step(
            "Minimum line-to-ground fault current",
            "I = 3·V_LN / |Z1 + Z2 + Z0|"
            if v.kind == "wye"
            else "I = V_LN / |Z_LN,source + Σ(Z_phase + Z_return)|",
            f"V_LN = {v.neutral_v:g} V",
            lg_min[n],
            "A",
            "fault-z0-ratio-min",
        )
    if n in ptp:
        sh.step(
            "Point-to-point figure (second method)",
            "I = I_start · Π 1/(1 + f)",
            "f = √3·L·I/(C·n·V) per run",
            ptp[n],
            "A",
            "fault-ptp-disagree",
        )


@dataclass(frozen=True)
class _Walk:
    z_max_ohm: np.ndarray
    z_min_ohm: np.ndarray
    x_r: np.ndarray
    fault_max_a: np.ndarray
    fault_min_a: np.ndarray


def _walk_3ph(job, parent, v_node, zb_max, zb_min, zs, fa, vb) -> _Walk:
    """The vectorised radial walk below the source; the source node itself carries the
    job's stated fault current (infinite for an infinite bus)."""
    sub_parent = np.where(parent[1:] > 0, parent[1:] - 1, -1)
    rf = fk.radial_fault_3ph(
        sub_parent,
        v_node[1:],
        zb_max[1:],
        zb_min[1:],
        zs,
        zs,
        fa.c_max,
        fa.c_min,
        base_voltage_ll_v=vb,
    )
    src = job.source
    return _Walk(
        np.concatenate([[zs], rf.z_max_ohm]),
        np.concatenate([[zs], rf.z_min_ohm]),
        np.concatenate([[src.x_r], rf.x_r]),
        np.concatenate([[src.fault_a], rf.fault_max_a]),
        np.concatenate([[src.fault_a], rf.fault_min_a]),
    )


def _primary_terminals(ctx: Context, fa, pos, rf, vb) -> None:
    """Fault current at the far end of a run that feeds a transformer (its primary
    terminals): the parent's total impedance plus the run, referred to the base."""
    tree = ctx.tree
    for t in ctx.job.transformers:
        run = tree.parent_run.get(t.id)
        if run is None:
            continue
        p = tree.parent_node[t.id]
        pv = tree.voltage_of[p]
        k = 2 / SQRT3 if t.primary.phases == 1 else 1.0  # loop on two lines, per-phase eq.
        out = {}
        for case, temp, z_parent, c in (
            ("max", fa.cond_c_max, rf.z_max_ohm, fa.c_max),
            ("min", fa.min_c(run), rf.z_min_ohm, fa.c_min),
        ):
            z_run_b = k * run_impedance_ohm(run, temp, ctx.rules.conductors) * (vb / pv.line_v) ** 2
            z_b = z_parent[pos[p]] + z_run_b
            out[case] = float(fk.fault_current_3ph_a(vb, z_b, c)) * vb / pv.line_v
        values = ctx.nodes[t.id].values
        values["fault_primary_max_a"], values["fault_primary_min_a"] = out["max"], out["min"]
        ctx.add(
            run.id,
            "fault current at the far end (transformer primary)",
            out["max"],
            None,
            "A",
            "info",
            "fault-marking",
            f"{t.id} primary terminals: maximum "
            f"{_kA(out['max'])}, minimum {_kA(out['min'])} (complex ohmic method)",
        )


def _calc_date(ctx: Context) -> str:
    """The job's own date, else the calculation date the command handed in (checks never
    read the clock)."""
    if ctx.job.project.date:
        return str(ctx.job.project.date)
    return ctx.calc_date or "on a date not given"


def _line_to_ground(ctx, fa, order, pos, parent, zb_min, zs, vb) -> dict[str, float]:
    """Minimum line-to-ground current at every node below a grounded secondary
    (wye: symmetrical components; 120/240 V: line-to-neutral loop)."""
    job, tree = ctx.job, ctx.tree
    z_total_min = fk.cumulative_impedance_ohm(parent, zb_min, zs)
    n_nodes = len(order)
    lg_parent = parent.copy()
    root_z1 = np.zeros(n_nodes, dtype=complex)
    root_z0 = np.zeros(n_nodes, dtype=complex)
    b1 = np.zeros(n_nodes, dtype=complex)
    b0 = np.zeros(n_nodes, dtype=complex)
    in_scope = np.zeros(n_nodes, dtype=bool)
    tx = {t.id: t for t in job.transformers}
    for n in order:
        i = pos[n]
        v = tree.voltage_of[n]
        if v.neutral_v is None or tree.upstream_transformer[n] is None:
            lg_parent[i] = -1
            continue
        in_scope[i] = True
        if tree.kind[n] == "transformer":
            t = tx[n]
            lg_parent[i] = -1
            z1 = complex(z_total_min[i] * (v.line_v / vb) ** 2)  # per-phase (equivalent)
            if v.kind == "wye":
                zt_min = transformer_loop_ohm(t, fa.tolerance_pct, "min")
                root_z1[i] = z1
                ratio = z0_ratio(t, fa, "min")
                root_z0[i] = complex(lg.transformer_zero_sequence_ohm(zt_min, ratio))
            else:  # 120/240 V: half-winding model at 120 V
                zt_loop = transformer_loop_ohm(t, fa.tolerance_pct, "min")
                root_z1[i] = split_ln_source_ohm(z1, zt_loop)
        else:
            run = tree.parent_run[n]
            zp = run_impedance_ohm(run, fa.min_c(run), ctx.rules.conductors)
            zr = run_return_impedance_ohm(run, fa.min_c(run), ctx.rules.conductors)
            if v.kind == "wye":
                b1[i] = zp
                b0[i] = complex(lg.run_zero_sequence_ohm(zp, zr))
            else:
                b1[i] = zp + zr
    out: dict[str, float] = {}
    if not in_scope.any():
        return out
    # wye: V_LL/√3 (208Y/120 V → 120.09 V, consistent with the three-phase figure);
    # 120/240 V: half the line voltage
    vln = np.array([_v_ln(tree.voltage_of[n]) for n in order])
    wye = np.array([tree.voltage_of[n].kind == "wye" for n in order])
    # walk only the nodes below grounded secondaries (each transformer is a root there)
    keep = np.flatnonzero(in_scope)
    new_index = np.full(n_nodes, -1)
    new_index[keep] = np.arange(keep.size)
    sub_parent = np.where(lg_parent[keep] >= 0, new_index[np.maximum(lg_parent[keep], 0)], -1)
    i_wye = np.zeros(n_nodes)
    i_split = np.zeros(n_nodes)
    sel_w = keep[wye[keep]]
    if sel_w.size:
        i_wye[keep] = lg.radial_fault_lg_a(
            sub_parent,
            vln[keep],
            np.where(wye[keep], b1[keep], 1e-9),
            np.where(wye[keep], b0[keep], 1e-9),
            np.where(wye[keep], root_z1[keep], 1e-9),
            np.where(wye[keep], root_z0[keep], 1e-9),
            fa.c_min,
        )
    if (~wye[keep]).any():
        z_split = fk.cumulative_impedance_ohm(sub_parent, b1[keep], root_z1[keep])
        i_split[keep] = fa.c_min * vln[keep] / np.abs(z_split)
    ctx.method(
        "Line-to-ground fault by symmetrical components, I = 3·V_LN/|Z1 + Z2 + Z0|; "
        "delta–wye transformer Z0 = k·Z1_T; run Z0 = Z_phase + 3·Z_return",
        "IEEE Std 141-1993 ch. 4; IEC 60909-0 §7.1.3",
    )
    for n in order:
        i = pos[n]
        if in_scope[i]:
            out[n] = float(i_wye[i] if wye[i] else i_split[i])
    # sequence impedances from the grounded secondary to every node, once for all panels
    z1_total = fk.cumulative_impedance_ohm(lg_parent, b1, root_z1)
    z0_total = fk.cumulative_impedance_ohm(lg_parent, b0, root_z0)
    _instantaneous_checks(ctx, fa, out, pos, z1_total, z0_total)
    return out


def _v_ln(v) -> float:
    if v.kind == "wye":
        return v.line_v / SQRT3
    return v.neutral_v or 1.0


def _pickup(ctx, device_a: float, given: float | None) -> tuple[float, float, str]:
    if given is not None:
        return given / device_a, 0.0, "setting given in the job"
    table = ctx.rules.rows("instantaneous_pickup")
    row = next(
        (
            r
            for r in table
            if str(r["device_type"]).startswith("breaker-tm")
            and r["rating_from_a"] < device_a <= r["rating_to_a"]
        ),
        table[0],
    )
    ctx.assume(
        "Instantaneous pick-up of feeder devices: typical thermal-magnetic breaker "
        "multiple from tables/instantaneous_pickup.csv unless the job gives "
        "instantaneous_trip (common practice — check the device's curve)."
    )
    return float(row["multiple"]), float(row["tolerance_pct"]), str(row["rule_id"])


def _instantaneous_checks(ctx, fa, lg_min, pos, z1_total, z0_total) -> None:
    """Does the device feeding each panel trip instantaneously for a far-end ground fault?"""
    job, tree = ctx.job, ctx.tree
    for p in job.panels:
        if p.id not in lg_min:
            continue
        run = tree.parent_run[p.id]
        up = tree.parent_node[p.id]
        device, _where = run_device(job, run)  # the one rule of checks/taps.py
        if device is None:
            continue
        mult, tol, rid = _pickup(ctx, device, p.instantaneous_a)
        chk = lg.instantaneous_trip_check(lg_min[p.id], device, mult, tol)
        note = (
            f"minimum line-to-ground {_kA(lg_min[p.id])} vs instantaneous pick-up "
            f"{_kA(chk.required_a)} ({mult:g} × {device:g} A"
            + (f" + {tol:g} % tolerance" if tol else "")
            + ")"
        )
        if not chk.trips:
            up_i = pos[up]
            note += "; " + _trip_fixes(
                ctx, fa, p.id, run, chk.required_a, z1_total[up_i], z0_total[up_i]
            )
        ctx.add(
            p.id,
            "ground fault trips instantaneously",
            lg_min[p.id],
            chk.required_a,
            "A",
            "ok" if chk.trips else "warn",
            rid,
            note,
        )


def _trip_fixes(ctx, fa, panel_id, run, required_a, z_up1, z_up0) -> str:
    """What would make the device trip: a shorter run or a larger grounding conductor.
    ``z_up1``, ``z_up0``: positive- and zero-sequence impedance up to the run's start."""
    v = ctx.tree.voltage_of[panel_id]
    data = ctx.rules.conductors
    zp = run_impedance_ohm(run, fa.min_c(run), data) / run.length_m
    zr = run_return_impedance_ohm(run, fa.min_c(run), data) / run.length_m
    # wye: Z1 + Z2 + Z0 upstream; 120/240 V loop written in the same 3·V/|A + 3L·(zp + zr)|
    a = 2 * z_up1 + z_up0 if v.kind == "wye" else 3 * z_up1
    max_len = float(lg.max_length_for_trip_m(_v_ln(v), a, zp, zr, required_a, fa.c_min))
    parts = [
        f"it would trip with the run at most {ctx.length(max_len, pair=True)}"
        if max_len > 0
        else "no run length would make it trip"
    ]
    material = run.ground_material if run.ground is not None else run.material
    order = AWG_KCMIL_ORDER if run.size.system == "awg" else METRIC_ORDER
    names = [s for s in order if SIZES[s].area_mm2 <= run.size.area_mm2 * (1 + 1e-9)]
    r, x = ck.ac_impedance_ohm_per_m(
        np.array(names), material, run.raceway, fa.min_c(run), data=data
    )
    idx = lg.smallest_return_for_trip(
        _v_ln(v),
        a,
        run.length_m,
        zp,
        np.asarray(r) / run.sets,
        np.asarray(x) / run.sets,
        required_a,
        fa.c_min,
    )
    if idx >= 0:
        parts.append(f"or with a {names[idx]} {material.capitalize()} grounding conductor")
    parts.append("or with a lower instantaneous setting")
    return ", ".join(parts)


def _point_to_point(ctx, fa, order, rf) -> dict[str, float]:
    """Point-to-point figure at every node below a transformer (second method)."""
    job, tree = ctx.job, ctx.tree
    tx = {t.id: t for t in job.transformers}
    out: dict[str, float] = {}
    for n in order:
        kind = tree.kind[n]
        if kind == "source":
            continue
        v = tree.voltage_of[n]
        if kind == "transformer":
            t = tx[n]
            if tree.parent_node[n] != "source" or tree.parent_run[n] is not None:
                continue  # chained transformers: the method's transformer step is not applied
            rated = tk.rated_current_a(t.rating_va, t.secondary.line_v, t.secondary.phases)
            src = job.source.fault_a
            if t.secondary.phases == 1 and job.source.voltage.phases == 3:
                src = src * SQRT3 / 2  # line-to-line fault on a three-phase source
            out[n] = fa.c_max * float(  # the ohmic maximum's voltage factor
                fk.ptp_secondary_current_a(
                    rated,
                    t.z_pct,
                    fa.tolerance_pct,
                    None if math.isinf(src) else src,
                    t.primary.line_v,
                    t.secondary.line_v,
                )
            )
            continue
        p = tree.parent_node[n]
        if p not in out:
            continue
        run = tree.parent_run[n]
        r, x = ck.ac_impedance_ohm_per_m(
            run.size.name, run.material, run.raceway, fa.cond_c_max, data=ctx.rules.conductors
        )
        c = float(fk.conductor_constant_a_ft_per_v(float(r), float(x)))
        kind_ptp = "3ph" if v.phases == 3 else "1ph-ll"
        out[n] = float(
            fk.ptp_chain_a(out[p], [run.length_m], [c], [run.sets], v.line_v, kind_ptp)[0]
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
