"""Available fault current at every node: maximum and minimum three-phase (ohmic
method), minimum line-to-ground, asymmetry, the point-to-point figure beside it,
equipment ratings, the instantaneous-trip check and the marking figures."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..calc.conductor import ac_impedance_ohm_per_m
from ..calc.constants import SQRT3
from ..calc.fault import (
    asymmetric_rms_half_cycle_a,
    cumulative_impedance_ohm,
    fault_current_3ph_a,
    peak_current_a,
    radial_fault_3ph,
)
from ..calc.fault_lg import max_length_for_trip_m, radial_fault_lg_a, smallest_return_for_trip
from ..calc.sizes import AWG_KCMIL_ORDER, METRIC_ORDER, SIZES
from ..render.display import bolted_fault_words
from .context import Context
from .fault_buildup import record_buildups
from .fault_duty import (
    describe_methods,
    flag_return_paths,
    kiloamps,
    motor_contribution,
    node_duty,
    record_duty,
    split_ln_source_ohm,
    transformer_loop_ohm,
    worst_case_figures,
    z0_ratio,
)
from .high_leg import min_root_ohm
from .impedance import (  # the zero-sequence and trip kernels memoised there
    branch_parts,
    fault_assumptions,
    instantaneous_trip_check,
    run_impedance_ohm,
    run_return_impedance_ohm,
    run_zero_sequence_ohm,
    service_transformer_ohm,
    source_impedance,
    summed,
    transformer_zero_sequence_ohm,
)
from .point_to_point import point_to_point_a, ptp_finding
from .taps import feeder_device, run_device


def check_faults(ctx: Context) -> None:
    job, tree = ctx.job, ctx.tree
    fa = fault_assumptions(ctx)
    order = list(tree.order)
    pos = {node: at for at, node in enumerate(order)}
    parent = np.array(tree.parent_index())
    v_node = np.array([tree.voltage_of[node].voltage_ll_v for node in order])
    vb = job.source.voltage.voltage_ll_v

    zs = source_impedance(job)
    parts_max = branch_parts(ctx, fa, fa.cond_c_max, "max")
    parts_min = branch_parts(ctx, fa, None, "min")
    b_max, b_min = summed(parts_max), summed(parts_min)

    def referred(branches):
        arr = np.zeros(len(order), dtype=complex)
        for node, z_branch in branches.items():
            arr[pos[node]] = z_branch * (vb / tree.voltage_of[node].voltage_ll_v) ** 2
        return arr

    zb_max, zb_min = referred(b_max), referred(b_min)
    # a single-phase transformer or panel on a three-phase node draws through two source
    # lines: loop = 2·Z_parent, per-phase equivalent 2·Z_parent/√3 (instead of Z_parent)
    for node in order[1:]:
        upstream = tree.parent_node[node]
        if tree.voltage_of[node].phases == 1 and tree.voltage_of[upstream].phases == 3:
            for zb in (zb_max, zb_min):
                zp = cumulative_impedance_ohm(parent, zb, zs)[pos[upstream]]
                zb[pos[node]] += (2 / SQRT3 - 1) * zp
    rf = _walk_3ph(job, parent, v_node, zb_max, zb_min, zs, fa, vb)
    ohmic_max_no_motor = rf.fault_max_a
    motor_node = motor_contribution(ctx, fa, vb)  # every motor on the same system
    fault_max = rf.fault_max_a + motor_node
    finite = np.isfinite(fault_max)
    peak = np.full(len(order), np.inf)
    asym = np.full(len(order), np.inf)
    peak[finite] = peak_current_a(fault_max[finite], rf.x_r[finite])
    asym[finite] = asymmetric_rms_half_cycle_a(fault_max[finite], rf.x_r[finite])

    _describe_3ph(ctx, fa)
    lg_min = _line_to_ground(ctx, fa, order, pos, parent, zb_min, zs, vb)
    ptp = point_to_point_a(ctx, fa, order)
    _primary_terminals(ctx, fa, pos, rf, vb)
    z_node_max = {
        node: complex(rf.z_max_ohm[at] * (v_node[at] / vb) ** 2) for at, node in enumerate(order)
    }
    worst = worst_case_figures(ctx, fa, z_node_max, dict(zip(order, motor_node, strict=True)))
    describe_methods(ctx, fa, worst)
    flag_return_paths(ctx)

    figs = _Figures(
        rf, fault_max, motor_node, ohmic_max_no_motor, peak, asym, lg_min, ptp, worst, v_node, vb
    )
    when = _calc_date(ctx)
    for at, node in enumerate(order):
        _record_node(ctx, fa, figs, at, node, when)
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


def _record_node(ctx: Context, fa, figs: _Figures, at: int, node_id: str, when: str) -> None:
    """Node values, the point-to-point finding, the sheet and the duty of one node."""
    rf, tree = figs.rf, ctx.tree
    node = ctx.nodes[node_id]
    node.values.update(
        {
            "fault_max_a": float(figs.fault_max[at]),
            "fault_min_a": float(rf.fault_min_a[at]),
            "x_r": float(rf.x_r[at]),
            "peak_a": float(figs.peak[at]),
            "asym_rms_a": float(figs.asym[at]),
        }
    )
    if figs.motor_node[at] > 0:
        node.values["fault_motor_a"] = float(figs.motor_node[at])
    if node_id in figs.lg_min:
        node.values["fault_lg_min_a"] = figs.lg_min[node_id]
    if node_id in figs.ptp:
        ptp_finding(ctx, fa, node_id, figs.ptp[node_id], float(figs.ohmic_no_motor[at]))
    # the source too (its minimum is never shown above a maximum), but not a generator:
    # its own line-to-ground fault is not computed (README, standby source)
    at_generator = node_id == "source" and ctx.job.source.given_as == "generator"
    if node_id in figs.worst and not at_generator:
        for case, key in (("ln", "fault_ln_max_a"), ("lg", "fault_lg_max_a")):
            if case in figs.worst[node_id].faults_a:
                node.values[key] = figs.worst[node_id].faults_a[case]
    if node_id == "source":
        return
    _sheet_steps(ctx, fa, figs, at, node_id)
    first = "3ph" if tree.voltage_of[node_id].phases == 3 else "ll"
    faults = {first: float(figs.fault_max[at])}
    x_rs = {first: float(rf.x_r[at])}
    if node_id in figs.worst:
        faults.update(figs.worst[node_id].faults_a)
        x_rs.update(figs.worst[node_id].x_r)
    record_duty(ctx, node_id, node_duty(ctx, node_id, faults, x_rs), when)


def _sheet_steps(ctx: Context, fa, figs: _Figures, at: int, node_id: str) -> None:
    rf, tree, vb, v_node = figs.rf, ctx.tree, figs.vb, figs.v_node
    motor_node, fault_max, peak, lg_min, ptp = (
        figs.motor_node,
        figs.fault_max,
        figs.peak,
        figs.lg_min,
        figs.ptp,
    )
    sheet = ctx.sheet(node_id, tree.kind[node_id], "")
    z_max_node = rf.z_max_ohm[at] * (v_node[at] / vb) ** 2
    z_min_node = rf.z_min_ohm[at] * (v_node[at] / vb) ** 2
    system = tree.voltage_of[node_id]
    bolted = bolted_fault_words(system.phases)
    form = "I = c·V_LL / (√3·|Z|)" if system.phases == 3 else "I = c·V / |Z_loop| (Z_loop = √3·Z)"
    sheet.step(
        "Total impedance to this node, maximum case",
        "Z = Z_source + Z_transformer + Σ Z_runs (referred to this voltage)",
        f"{z_max_node.real * 1e3:.3f} + j{z_max_node.imag * 1e3:.3f} mΩ",
        abs(z_max_node) * 1e3,
        "mΩ",
        "fault-z-tolerance",
    )
    sheet.step(
        f"Maximum {bolted} fault current",
        form,
        f"{fa.c_max:g} × {system.voltage_ll_v:g} / (√3 × {abs(z_max_node) * 1e3:.3f} mΩ)"
        + (f" + motors {motor_node[at]:.0f} A" if motor_node[at] > 0 else ""),
        float(fault_max[at]),
        "A",
        "fault-cond-temp-max",
    )
    sheet.step(
        f"Minimum {bolted} fault current",
        form,
        f"{fa.c_min:g} × {system.voltage_ll_v:g} / (√3 × {abs(z_min_node) * 1e3:.3f} mΩ)",
        float(rf.fault_min_a[at]),
        "A",
        "fault-cond-temp-min",
    )
    sheet.step(
        "X/R and peak",
        "κ = 1.02 + 0.98·e^(−3/(X/R)); i_p = κ·√2·I_max",
        f"X/R = {rf.x_r[at]:.2f}",
        float(peak[at]),
        "A",
        "iec60909-kappa",
    )
    if node_id in lg_min:
        sheet.step(
            "Minimum line-to-ground fault current",
            "I = 3·V_LN / |Z1 + Z2 + Z0|"
            if system.kind == "wye"
            else "I = V_LN / |Z_LN,source + Σ(Z_phase + Z_return)|",
            f"V_LN = {system.voltage_ln_v:g} V",
            lg_min[node_id],
            "A",
            "fault-z0-ratio-min",
        )
    if node_id in ptp:
        sheet.step(
            "Point-to-point figure (second method)",
            "I = I_start · Π 1/(1 + f)",
            "f = √3·L·I/(C·n·V) per run",
            ptp[node_id],
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
    rf = radial_fault_3ph(
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
    for tx in ctx.job.transformers:
        run = tree.parent_run.get(tx.id)
        if run is None:
            continue
        upstream = tree.parent_node[tx.id]
        pv = tree.voltage_of[upstream]
        loop_factor = (
            2 / SQRT3 if tx.primary.phases == 1 else 1.0
        )  # loop on two lines, per-phase eq.
        out = {}
        for case, temp, z_parent, c_factor in (
            ("max", fa.cond_c_max, rf.z_max_ohm, fa.c_max),
            ("min", fa.min_c(run), rf.z_min_ohm, fa.c_min),
        ):
            z_run_b = (
                loop_factor
                * run_impedance_ohm(run, temp, ctx.rules.conductors)
                * (vb / pv.voltage_ll_v) ** 2
            )
            z_b = z_parent[pos[upstream]] + z_run_b
            out[case] = float(fault_current_3ph_a(vb, z_b, c_factor)) * vb / pv.voltage_ll_v
        values = ctx.nodes[tx.id].values
        values["fault_primary_max_a"], values["fault_primary_min_a"] = out["max"], out["min"]
        ctx.add(
            run.id,
            "fault current at the far end (transformer primary)",
            out["max"],
            None,
            "A",
            "info",
            "fault-marking",
            f"{tx.id} primary terminals: maximum "
            f"{kiloamps(out['max'])}, minimum {kiloamps(out['min'])} (complex ohmic method)",
        )


def _calc_date(ctx: Context) -> str:
    """The job's own date, else the calculation date the command handed in (checks never
    read the clock)."""
    if ctx.job.project.date:
        return str(ctx.job.project.date)
    return ctx.calc_date or "on a date not given"


@dataclass
class _SequenceNetwork:
    """Positive- and zero-sequence branches of the feed below grounded secondaries, one
    entry per node in walk order (each grounded transformer a root)."""

    parent: np.ndarray
    root_z1: np.ndarray
    root_z0: np.ndarray
    branch_z1: np.ndarray
    branch_z0: np.ndarray
    in_scope: np.ndarray


def _sequence_network(ctx, fa, order, pos, parent, z_total_min, vb) -> _SequenceNetwork:
    """Sequence impedances of every node below a grounded secondary (wye: Z1 and Z0;
    120/240 V: the line-to-neutral loop in Z1), for the minimum case."""
    tree = ctx.tree
    n_nodes = len(order)
    net = _SequenceNetwork(
        parent.copy(),
        *(np.zeros(n_nodes, dtype=complex) for _ in range(4)),
        np.zeros(n_nodes, dtype=bool),
    )
    transformers = {tx.id: tx for tx in ctx.job.transformers}
    service = service_transformer_ohm(ctx.job)  # a low-voltage service is a root of its own
    for node in order:
        at = pos[node]
        system = tree.voltage_of[node]
        below_root = tree.upstream_transformer[node] is not None or service is not None
        if system.voltage_ln_v is None or not below_root:
            net.parent[at] = -1
            continue
        net.in_scope[at] = True
        if tree.kind[node] in ("transformer", "source"):
            net.parent[at] = -1
            # per-phase (equivalent)
            z1 = complex(z_total_min[at] * (system.voltage_ll_v / vb) ** 2)
            if node in transformers:
                zt_min = transformer_loop_ohm(transformers[node], fa.tolerance_pct, "min")
                ratio = z0_ratio(transformers[node], fa, "min")
            else:
                zt_min, ratio = service, fa.z0_ratio_min
            if system.kind == "wye":
                net.root_z1[at] = z1
                net.root_z0[at] = complex(transformer_zero_sequence_ohm(zt_min, ratio))
            elif system.kind == "highleg":  # four-wire delta: both legs bounded (high_leg.py)
                net.root_z1[at] = min_root_ohm(z1)
            else:  # 120/240 V: half-winding model at 120 V
                net.root_z1[at] = split_ln_source_ohm(z1, zt_min)
            continue
        run = tree.parent_run[node]
        z_phase = run_impedance_ohm(run, fa.min_c(run), ctx.rules.conductors)
        z_return = run_return_impedance_ohm(run, fa.min_c(run), ctx.rules.conductors)
        if system.kind == "wye":
            net.branch_z1[at] = z_phase
            net.branch_z0[at] = complex(run_zero_sequence_ohm(z_phase, z_return))
        else:
            net.branch_z1[at] = z_phase + z_return
    return net


def _line_to_ground(ctx, fa, order, pos, parent, zb_min, zs, vb) -> dict[str, float]:
    """Minimum line-to-ground current at every node below a grounded secondary
    (wye: symmetrical components; 120/240 V: line-to-neutral loop)."""
    tree = ctx.tree
    z_total_min = cumulative_impedance_ohm(parent, zb_min, zs)
    net = _sequence_network(ctx, fa, order, pos, parent, z_total_min, vb)
    out: dict[str, float] = {}
    if not net.in_scope.any():
        return out
    # wye: V_LL/√3 (208Y/120 V → 120.09 V, consistent with the three-phase figure);
    # 120/240 V: half the line voltage
    vln = np.array([_v_ln(tree.voltage_of[node]) for node in order])
    wye = np.array([tree.voltage_of[node].kind == "wye" for node in order])
    current_a = _line_to_ground_a(net, vln, wye, fa.c_min)
    ctx.method(
        "Line-to-ground fault by symmetrical components, I = 3·V_LN/|Z1 + Z2 + Z0|; "
        "delta–wye transformer Z0 = k·Z1_T; run Z0 = Z_phase + 3·Z_return",
        "IEEE Std 141-1993 ch. 4; IEC 60909-0 §7.1.3",
    )
    for node in order:
        if net.in_scope[pos[node]]:
            out[node] = float(current_a[pos[node]])
    # sequence impedances from the grounded secondary to every node, once for all panels
    z1_total = cumulative_impedance_ohm(net.parent, net.branch_z1, net.root_z1)
    z0_total = cumulative_impedance_ohm(net.parent, net.branch_z0, net.root_z0)
    _instantaneous_checks(ctx, fa, out, pos, z1_total, z0_total)
    return out


def _line_to_ground_a(net: _SequenceNetwork, vln, wye, c_min) -> np.ndarray:
    """Line-to-ground current of every node in scope: symmetrical components on wye
    systems, the line-to-neutral loop on 120/240 V (0 outside the scope)."""
    n_nodes = net.in_scope.size
    # walk only the nodes below grounded secondaries (each transformer is a root there)
    keep = np.flatnonzero(net.in_scope)
    new_index = np.full(n_nodes, -1)
    new_index[keep] = np.arange(keep.size)
    sub_parent = np.where(net.parent[keep] >= 0, new_index[np.maximum(net.parent[keep], 0)], -1)
    i_wye = np.zeros(n_nodes)
    i_split = np.zeros(n_nodes)
    if keep[wye[keep]].size:
        i_wye[keep] = radial_fault_lg_a(
            sub_parent,
            vln[keep],
            np.where(wye[keep], net.branch_z1[keep], 1e-9),
            np.where(wye[keep], net.branch_z0[keep], 1e-9),
            np.where(wye[keep], net.root_z1[keep], 1e-9),
            np.where(wye[keep], net.root_z0[keep], 1e-9),
            c_min,
        )
    if (~wye[keep]).any():
        z_split = cumulative_impedance_ohm(sub_parent, net.branch_z1[keep], net.root_z1[keep])
        i_split[keep] = c_min * vln[keep] / np.abs(z_split)
    return np.where(wye, i_wye, i_split)


def _v_ln(system) -> float:
    if system.kind == "wye":
        return system.voltage_ll_v / SQRT3
    return system.voltage_ln_v or 1.0


def _pickup(ctx, device_a: float, given: float | None) -> tuple[float, float, str]:
    if given is not None:
        return given / device_a, 0.0, "setting given in the job"
    table = ctx.rules.rows("instantaneous_pickup")
    row = next(
        (
            candidate
            for candidate in table
            if str(candidate["device_type"]).startswith("breaker-tm")
            and candidate["rating_from_a"] < device_a <= candidate["rating_to_a"]
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
    for panel in job.panels:
        if panel.id not in lg_min:
            continue
        run = tree.parent_run[panel.id]
        up = tree.parent_node[panel.id]
        device, whose = _clearing_device(ctx, panel.id, run)
        if device is None:
            continue
        mult, tol, rid = _pickup(ctx, device, panel.instantaneous_a)
        chk = instantaneous_trip_check(lg_min[panel.id], device, mult, tol)
        note = (
            f"minimum line-to-ground {kiloamps(lg_min[panel.id])} vs instantaneous pick-up "
            f"{kiloamps(chk.required_a)} ({mult:g} × {device:g} A"
            + (f" + {tol:g} % tolerance" if tol else "")
            + ")"
            + whose
        )
        if not chk.trips:
            up_i = pos[up]
            note += "; " + _trip_fixes(
                ctx, fa, panel.id, run, chk.required_a, z1_total[up_i], z0_total[up_i]
            )
        ctx.add(
            panel.id,
            "ground fault trips instantaneously",
            lg_min[panel.id],
            chk.required_a,
            "A",
            "ok" if chk.trips else "warn",
            rid,
            note,
        )


def _clearing_device(ctx, panel_id: str, run) -> tuple[float | None, str]:
    """The device that must clear a ground fault at ``panel_id``'s end of ``run``, and
    words saying whose it is when it is not the run's own (a tap: the device of the
    conductors it is tapped from, NFPA 70-2023 240.21(B)). Where no device can be named
    the check is not evaluated: an ``info`` finding says so (never ``ok``)."""
    device, where = run_device(ctx, run)  # the one rule of checks/taps.py
    if device is not None:
        return device, ""
    if ctx.tree.kind.get(run.from_id) == "transformer":
        reason = (
            f"{run.id} has no device at its supply (transformer secondary conductors): a "
            "fault on its line side is cleared by the transformer's primary device alone"
        )
    elif where == "tap":
        up, what = feeder_device(ctx, run)
        if up is not None:
            return up, f"; {run.id} is a tap: the {what} must clear the fault"
        reason = f"{run.id} is a tap and {what}"
    else:
        reason = f"no device protects {run.id}"
    ctx.add(
        panel_id,
        "ground fault trips instantaneously",
        None,
        None,
        "A",
        "info",
        "inst-trip-not-evaluated",
        f"not evaluated: {reason}",
    )
    return None, ""


def _trip_fixes(ctx, fa, panel_id, run, required_a, z_up1, z_up0) -> str:
    """What would make the device trip: a shorter run or a larger grounding conductor.
    ``z_up1``, ``z_up0``: positive- and zero-sequence impedance up to the run's start."""
    system = ctx.tree.voltage_of[panel_id]
    data = ctx.rules.conductors
    zp = run_impedance_ohm(run, fa.min_c(run), data) / run.length_m
    zr = run_return_impedance_ohm(run, fa.min_c(run), data) / run.length_m
    # wye: Z1 + Z2 + Z0 upstream; 120/240 V loop written in the same 3·V/|A + 3L·(zp + zr)|
    z_upstream_loop = 2 * z_up1 + z_up0 if system.kind == "wye" else 3 * z_up1
    max_len = float(
        max_length_for_trip_m(_v_ln(system), z_upstream_loop, zp, zr, required_a, fa.c_min)
    )
    parts = [
        f"it would trip with the run at most {ctx.length(max_len, pair=True)}"
        if max_len > 0
        else "no run length would make it trip"
    ]
    material = run.ground_material if run.ground is not None else run.material
    order = AWG_KCMIL_ORDER if run.size.system == "awg" else METRIC_ORDER
    names = [name for name in order if SIZES[name].area_mm2 <= run.size.area_mm2 * (1 + 1e-9)]
    r_ohm_per_m, x_ohm_per_m = ac_impedance_ohm_per_m(
        np.array(names), material, run.raceway, fa.min_c(run), data=data
    )
    idx = smallest_return_for_trip(
        _v_ln(system),
        z_upstream_loop,
        run.length_m,
        zp,
        np.asarray(r_ohm_per_m) / run.sets,
        np.asarray(x_ohm_per_m) / run.sets,
        required_a,
        fa.c_min,
    )
    if idx >= 0:
        parts.append(f"or with a {names[idx]} {material.capitalize()} grounding conductor")
    parts.append("or with a lower instantaneous setting")
    return ", ".join(parts)
