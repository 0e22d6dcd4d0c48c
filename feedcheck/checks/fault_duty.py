"""Interrupting duty at every node: the maximum line-to-neutral fault of a 120/240 V
centre-tapped secondary (half-winding model), the maximum line-to-ground fault below a
delta–wye transformer (zero-sequence ratio), motor contribution from every motor on the
same system, the governing case, the X/R asymmetry factor against the device's test
conditions, and the interrupting-rating and marking findings held against the result.

Called by :func:`feedcheck.checks.fault.check_faults` with the walk's total impedances;
the kernels are :mod:`feedcheck.calc.fault_split_phase` and
:mod:`feedcheck.calc.fault_duty`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from ..calc.constants import SQRT3
from ..calc.fault import motor_contribution_a, x_r_ratio
from ..calc.fault_duty import (
    TestConditionRow,
    asymmetry_multiplying_factor,
    fault_lg_delta_wye_a,
    governing_duty_a,
    test_condition_row,
)
from ..calc.fault_high_leg import K_AN
from ..calc.fault_split_phase import half_winding_impedance_ohm, split_phase_fault
from ..calc.memo import memoised
from ..model import DEVICE_FAMILIES, SOURCE_ID, Transformer
from ..render.display import kiloamps  # a fault current in a note: "12.35 kA", "unlimited"
from .compare import passes
from .context import Context
from .high_leg import max_per_leg
from .impedance import (
    FaultAssumptions,
    run_impedance_ohm,
    run_return_impedance_ohm,
    service_transformer_ohm,
    transformer_fault_impedances_ohm,
)
from .series import series_rating_a

CASE_WORDS = {
    "3ph": "three-phase",
    "ll": "line-to-line",
    "ln": "line-to-neutral",
    "lg": "line-to-ground",
}
DEFAULT_FAMILY = "molded-case"


@dataclass
class DutyFigures:
    """Maximum figures by case at one node [A] and the X/R of each case's loop."""

    faults_a: dict[str, float] = field(default_factory=dict)
    x_r: dict[str, float] = field(default_factory=dict)


def z0_ratio(t: Transformer, fa: FaultAssumptions, case: str) -> float:
    """The job's zero-sequence ratio when given, else the rule row for the case."""
    if t.z0_ratio is not None:
        return t.z0_ratio
    return fa.z0_ratio_max if case == "max" else fa.z0_ratio_min


def transformer_loop_ohm(t: Transformer, tolerance_pct: float, case: str) -> complex:
    """Transformer impedance at its secondary voltage for the case [Ω]: per phase for a
    three-phase unit, the whole-winding loop for a single-phase one."""
    zmax, zmin = transformer_fault_impedances_ohm(
        t.rating_va, t.secondary.voltage_ll_v, t.z_pct, t.x_r, tolerance_pct, t.secondary.phases
    )
    return complex(zmax if case == "max" else zmin)


def split_ln_source_ohm(z_total_eq_ohm: complex, zt_loop_ohm: complex) -> complex:
    """Line-to-neutral impedance at a 120/240 V secondary's terminals, at 120 V [Ω].

    ``z_total_eq_ohm``: the walk's per-phase-equivalent total at the transformer node
    (loop/√3, at 240 V), transformer included; ``zt_loop_ohm``: the transformer's loop.
    The source loop Z_src = √3·Z_total − Z_T refers to the half winding by 1/4; the
    winding takes the half-winding model (1.5·R_T + j1.2·X_T)/4."""
    z_src = upstream_part(SQRT3 * z_total_eq_ohm, zt_loop_ohm)
    return complex(z_src / 4.0 + half_winding_impedance_ohm(zt_loop_ohm))


def upstream_part(z_total_ohm: complex, z_transformer_ohm: complex) -> complex:
    """The source's part of a total impedance: total − transformer, round-off below zero
    cleared (an infinite source leaves 0)."""
    z = complex(z_total_ohm) - complex(z_transformer_ohm)
    return complex(max(z.real, 0.0), max(z.imag, 0.0))


def path_impedances(ctx: Context, conductor_c: float | None, ground: bool) -> dict[str, complex]:
    """Cumulative impedance of one conductor (phase, or the return path when ``ground``)
    from each node's upstream transformer to the node [Ω, at the node's voltage]."""
    tree, data = ctx.tree, ctx.rules.conductors
    service = service_transformer_ohm(ctx.job) is not None
    out: dict[str, complex] = {}
    for n in tree.order:
        if tree.kind[n] != "panel" or (tree.upstream_transformer[n] is None and not service):
            out[n] = 0j
            continue
        run = tree.parent_run[n]
        z = (
            run_return_impedance_ohm(run, conductor_c, data)
            if ground
            else run_impedance_ohm(run, conductor_c, data)
        )
        out[n] = out[tree.parent_node[n]] + z
    return out


def motor_contribution(ctx: Context, fa: FaultAssumptions, base_v: float) -> np.ndarray:
    """Motor contribution at every node [A, at the node's voltage].

    Every motor on the same system (same upstream transformer, or the source's own
    system) adds to every fault on that system; a motor on a system further down adds to
    the nodes above its transformer, as before. Added without the impedance between the
    motor and the fault (the conservative choice for the maximum)."""
    tree = ctx.tree
    order = list(tree.order)
    pos = {n: i for i, n in enumerate(order)}
    ancestors = {n: _ancestors(tree, n) for n in order}
    at_base = np.zeros(len(order))
    for m in ctx.job.motors:
        i_m = float(motor_contribution_a(m.full_load_a, fa.motor_multiple))
        i_b = i_m * tree.voltage_of[m.panel_id].voltage_ll_v / base_v
        system = tree.upstream_transformer[m.panel_id]
        for n in order:
            same = tree.upstream_transformer[n] == system
            if same or n in ancestors[m.panel_id]:
                at_base[pos[n]] += i_b
    v_node = np.array([tree.voltage_of[n].voltage_ll_v for n in order])
    return at_base * base_v / v_node


def _ancestors(tree, n: str) -> set[str]:
    out = {n}
    p = tree.parent_node[n]
    while p is not None:
        out.add(p)
        p = tree.parent_node[p]
    return out


def worst_case_figures(
    ctx: Context, fa: FaultAssumptions, z_total_max: dict[str, complex], motor_a: dict
) -> dict[str, DutyFigures]:
    """Maximum line-to-neutral (120/240 V) and line-to-ground (delta–wye) figures at every
    node below a transformer. ``z_total_max``: the walk's total impedance at each node (per
    phase or per-phase equivalent, at the node's voltage); ``motor_a``: contribution per
    node, added at full magnitude to every case (conservative)."""
    tree = ctx.tree
    tx = {t.id: t for t in ctx.job.transformers}
    z_line = path_impedances(ctx, fa.cond_c_max, ground=False)
    z_ret = path_impedances(ctx, fa.cond_c_max, ground=True)
    svc = service_transformer_ohm(ctx.job)
    out: dict[str, DutyFigures] = {}
    wye: list = []  # (figures, node, kernel arguments, loop impedance): _wye_lg
    for n in tree.order:
        tid = tree.upstream_transformer[n]
        if tid is None:
            kind = tree.voltage_of[n].kind
            if svc is not None and kind == "wye":
                out[n] = _service_lg(ctx, fa, n, svc, z_total_max, z_line, z_ret, motor_a)
            elif svc is not None and kind == "split":
                out[n] = _service_ln(ctx, fa, n, svc, z_total_max, z_line, motor_a)
            continue
        t, v = tx[tid], tree.voltage_of[n]
        zt = transformer_loop_ohm(t, fa.tolerance_pct, "max")
        fig = DutyFigures()
        if t.secondary.kind == "highleg" and v.kind in ("highleg", "split"):
            # four-wire delta (and 120/240 V panels on its A-C legs): checks/high_leg.py
            i_ln, _i_high = max_per_leg(ctx, n, v, z_total_max[tid], z_line[n], fa.c_max)
            fig.faults_a["ln"] = i_ln + motor_a.get(n, 0.0)
            fig.x_r["ln"] = float(x_r_ratio(3 * K_AN * z_total_max[tid] + 2 * z_line[n]))
        elif v.kind == "split":
            z_src = upstream_part(SQRT3 * z_total_max[tid], zt)
            f = split_phase_fault(
                t.rating_va, v.voltage_ll_v, t.z_pct, t.x_r, "max", fa.tolerance_pct,
                z_src, z_line[n], z_line[n], c=fa.c_max,
            )  # fmt: skip
            fig.faults_a["ln"] = float(f.fault_ln_a) + motor_a.get(n, 0.0)
            fig.x_r["ln"] = float(f.x_r_ln)
        elif v.kind == "wye":
            z_src = upstream_part(z_total_max[tid], zt)
            k = z0_ratio(t, fa, "max")
            args = (v.voltage_ll_v / SQRT3, z_src, zt, k, z_line[n], z_ret[n])
            z_sum = 2 * (z_src + zt + z_line[n]) + k * zt + z_line[n] + 3 * z_ret[n]
            wye.append((fig, n, args, z_sum))
        out[n] = fig
    _wye_lg(wye, fa.c_max, motor_a)
    return out


def _wye_lg(wye: list, c_max: float, motor_a: dict) -> None:
    """The line-to-ground maxima of the wye nodes (figures, node, kernel arguments, loop
    impedance), in one call of each kernel: they work element by element, so each
    figure is the one a call per node gives (node by node when one refuses)."""
    if not wye:
        return
    cols = list(zip(*(a for _, _, a, _ in wye), strict=True))
    try:
        i_all = np.atleast_1d(fault_lg_delta_wye_a(*map(np.array, cols), c=c_max)).tolist()
        xr_all = np.atleast_1d(x_r_ratio(np.array([z for *_, z in wye]))).tolist()
    except ValueError:  # the message names the one node's figure
        i_all = [float(fault_lg_delta_wye_a(*a, c=c_max)) for _, _, a, _ in wye]
        xr_all = [float(x_r_ratio(z)) for *_, z in wye]
    for (fig, n, _, _), i, xr in zip(wye, i_all, xr_all, strict=True):
        fig.faults_a["lg"] = float(i) + motor_a.get(n, 0.0)
        fig.x_r["lg"] = float(xr)


def _service_lg(ctx, fa, n, zt, z_total_max, z_line, z_ret, motor_a) -> DutyFigures:
    """Line-to-ground maximum at a node of a 480Y/277 V or 208Y/120 V service: the
    utility's transformer (delta–wye) as the zero-sequence source, k = rule
    fault-z0-ratio-max (the 120/240 V line-to-neutral case needs the transformer's
    half-winding and is not taken at a service)."""
    v = ctx.tree.voltage_of[n]
    z_src = upstream_part(z_total_max[SOURCE_ID], zt)
    k = fa.z0_ratio_max
    i = fault_lg_delta_wye_a(v.voltage_ll_v / SQRT3, z_src, zt, k, z_line[n], z_ret[n], c=fa.c_max)
    z_sum = 2 * (z_src + zt + z_line[n]) + k * zt + z_line[n] + 3 * z_ret[n]
    fig = DutyFigures()
    fig.faults_a["lg"] = float(i) + motor_a.get(n, 0.0)
    fig.x_r["lg"] = float(x_r_ratio(z_sum))
    return fig


def _service_ln(ctx, fa, n, zt_loop, z_total_max, z_line, motor_a) -> DutyFigures:
    """Line-to-neutral maximum at a node of a 120/240 V service: the utility's
    centre-tapped transformer by the half-winding model, nominal %Z (as the source's
    through-fault); with only the available fault current, the whole source loop is
    taken as that transformer's."""
    v = ctx.tree.voltage_of[n]
    svc = ctx.job.source.service
    if svc is not None:
        rating, z_pct, x_r = svc.rating_va, svc.z_pct, svc.x_r
    else:  # an equivalent transformer of the source loop (any rating gives the same ohms)
        rating = 100e3
        z_pct = abs(zt_loop) * rating / v.voltage_ll_v**2 * 100.0
        x_r = zt_loop.imag / zt_loop.real if zt_loop.real > 0 else 100.0
    z_src = upstream_part(SQRT3 * z_total_max[SOURCE_ID], zt_loop)
    f = split_phase_fault(
        rating, v.voltage_ll_v, z_pct, x_r, "max", 0.0, z_src, z_line[n], z_line[n], c=fa.c_max
    )
    fig = DutyFigures()
    fig.faults_a["ln"] = float(f.fault_ln_a) + motor_a.get(n, 0.0)
    fig.x_r["ln"] = float(f.x_r_ln)
    return fig


def describe_methods(ctx: Context, fa: FaultAssumptions, figures: dict[str, DutyFigures]):
    """Methods and assumptions of the worst-case duty, stated once."""
    kinds = {k for f in figures.values() for k in f.faults_a}
    if "ln" in kinds and any(t.secondary.kind == "split" for t in ctx.job.transformers):
        ctx.method(
            "Line-to-neutral fault of a 120/240 V centre-tapped secondary, half-winding "
            "model: Z_LN = Z_source/4 + (1.5·R_T + j1.2·X_T)/4 + Z_line + Z_neutral at 120 V, "
            "maximum and minimum",
            "fuse makers' point-to-point application literature (1.5 × %R, 1.2 × %X of the "
            "full winding; common practice, no standard); IEEE Std 141-1993 ch. 4",
        )
        ctx.assume(
            "120/240 V line-to-neutral maximum: the neutral is taken as the size of the "
            "phase conductors (a reduced neutral lowers the figure)."
        )
    if "lg" in kinds:
        ctx.method(
            "Line-to-ground maximum below a delta–wye transformer: I = 3·c·V_LN/|2·Z1 + Z0|, "
            "Z0 = k·Z_T (delta blocks the source) + Z_phase + 3·Z_return; k from the job's "
            "zero_sequence_ratio or rule fault-z0-ratio-max (fault-z0-ratio-min for the "
            "minimum)",
            "IEEE Std 141-1993 ch. 4; IEC 60909-0:2016 7.1.3",
        )
    ctx.method(
        "Interrupting duty: the largest of the three-phase, line-to-line, line-to-neutral "
        "and line-to-ground maxima, × the asymmetry multiplying factor when the X/R of that "
        "case is above the device's test X/R (peak basis for molded- and insulated-case "
        "breakers, half-cycle RMS for power breakers and fuses)",
        "NFPA 70-2023 110.9, 110.10, 110.24; IEEE Std 1015-2006 ch. 5; IEEE Std 242-2001 "
        "ch. 5; IEEE Std C37.13-2008; UL 489 test power factors (tables/"
        "device_test_power_factor.csv)",
    )
    if ctx.job.motors:
        ctx.assume(
            f"Motor contribution: {fa.motor_multiple:g} × full-load current of every motor "
            "on the same system (same transformer secondary), added to every fault on that "
            "system and to the nodes upstream of it, without the impedance between the "
            "motor and the fault (conservative for the maximum); added to every fault type."
        )


@dataclass(frozen=True)
class Duty:
    """The governing duty at one node: symmetrical figure, case, its X/R, the factor and
    the device row that set it, and the duty to compare with ratings."""

    sym_a: float
    case: str
    x_r: float
    mf: float
    row: TestConditionRow | None
    family: str

    @property
    def duty_a(self) -> float:
        return self.sym_a * self.mf


def governing(faults_a: dict[str, float], x_r: dict[str, float]) -> tuple[float, str, float]:
    """Largest maximum figure, its case and its X/R."""
    finite = {k: v for k, v in faults_a.items() if math.isfinite(v)}
    if len(finite) < len(faults_a):  # an infinite figure (infinite bus at the source)
        case = next(k for k, v in faults_a.items() if not math.isfinite(v))
        return math.inf, case, x_r.get(case, math.inf)
    g = governing_duty_a(**{f"fault_{k}_a": v for k, v in finite.items()})
    return float(g.duty_a), str(g.case), x_r.get(str(g.case), math.inf)


def panel_duty(ctx: Context, panel, faults_a: dict, x_r: dict) -> Duty:
    """Governing duty at a panel, with the asymmetry factor of its device family."""
    sym, case, xr = governing(faults_a, x_r)
    family = panel.device_type or DEFAULT_FAMILY
    if panel.device_type is None:
        ctx.assume(
            "Panels that state no device_type are taken as molded-case breakers (UL 489 "
            "test power factor by interrupting rating) for the X/R asymmetry factor."
        )
    if panel.interrupting_a is None or not math.isfinite(sym):
        return Duty(sym, case, xr, 1.0, None, family)
    row = _test_row(DEVICE_FAMILIES[family], panel.interrupting_a, book=ctx.rules)
    mf = float(_asymmetry_factor(xr, row.test_x_r, row.basis))
    return Duty(sym, case, xr, mf, row, family)


@memoised(records=("book",))
def _test_row(family: str, interrupting_a: float, *, book) -> TestConditionRow:
    """The device test-condition row of a family and interrupting rating (the rule
    book's rows; kept per distinct call: a building's panels share a few devices)."""
    rows = [TestConditionRow.from_record(r) for r in book.rows("device_test_power_factor")]
    return test_condition_row(family, interrupting_a, rows)


_asymmetry_factor = memoised(asymmetry_multiplying_factor)


def node_duty(ctx: Context, n: str, faults_a: dict, x_r: dict) -> Duty:
    """Governing duty at any node; panels get their device family's factor."""
    panel = ctx.panel_by_id.get(n)
    if panel is not None:
        return panel_duty(ctx, panel, faults_a, x_r)
    sym, case, xr = governing(faults_a, x_r)
    return Duty(sym, case, xr, 1.0, None, "")


def record_duty(ctx: Context, n: str, d: Duty, when: str) -> None:
    """Node values, the sheet's steps and the rating / marking findings of one node."""
    values = ctx.nodes[n].values
    values["fault_duty_sym_a"] = d.sym_a
    values["fault_duty_case"] = CASE_WORDS[d.case]
    values["fault_duty_x_r"] = d.x_r
    values["fault_duty_mf"] = d.mf
    values["fault_duty_a"] = d.duty_a
    if n != "source":
        _sheet_steps(ctx, n, d)
    ctx.add(
        n,
        "available fault current (marking)",
        d.sym_a,
        None,
        "A",
        "info",
        "fault-marking",
        f"maximum available fault current {kiloamps(d.sym_a)} ({CASE_WORDS[d.case]} governs), "
        f"complex ohmic method (IEEE Std 141), calculated {when}",
    )
    if ctx.tree.kind[n] == "panel":
        _check_interrupting(ctx, n, d)


def _sheet_steps(ctx: Context, n: str, d: Duty) -> None:
    sh = ctx.sheet(n, ctx.tree.kind[n], "")
    sh.step(
        "Governing maximum fault (interrupting duty)",
        "max(three-phase, line-to-line, line-to-neutral, line-to-ground)",
        f"{CASE_WORDS[d.case]} governs, X/R {d.x_r:.2f}",
        d.sym_a,
        "A",
        "panel-interrupting",
    )
    if d.row is not None:
        sh.step(
            "Asymmetry multiplying factor (X/R above the device's test X/R)",
            "peak: (1 + e^(−π/(X/R)))/(1 + e^(−π/(X/R)test)); "
            "rms: √(1 + 2e^(−2π/(X/R)))/√(1 + 2e^(−2π/(X/R)test)); MF ≥ 1",
            f"{d.family}, X/R {d.x_r:.2f} vs test {d.row.test_x_r:g} ({d.row.basis}): "
            f"MF = {d.mf:.3f}; duty {d.mf:.3f} × {d.sym_a:,.0f} A",
            d.duty_a,
            "A",
            d.row.rule_id,
        )


def _check_interrupting(ctx: Context, n: str, d: Duty) -> None:
    panel = ctx.panel_by_id[n]
    rating, series = series_rating_a(ctx, panel)  # 240.86: a combination's rating
    what = f"{CASE_WORDS[d.case]} maximum governs" + (f"; {series}" if series else "")
    if rating is None:
        ctx.add(
            n,
            "interrupting rating",
            d.duty_a,
            None,
            "A",
            "warn",
            "panel-interrupting",
            f"no interrupting rating given; it must be at least {kiloamps(d.duty_a)} ({what})",
        )
        return
    factor = (
        f"; X/R {d.x_r:.2f} above the {d.family} test X/R {d.row.test_x_r:g} "
        f"({d.row.rule_id}): MF {d.mf:.3f} × {kiloamps(d.sym_a)}"
        if d.row is not None and d.mf > 1.0
        else f"; X/R {d.x_r:.2f} within the {d.family} test X/R, MF 1"
        if d.row is not None
        else ""
    )
    ok = passes(rating, d.duty_a, "at_least", 0.0)
    ctx.compare(
        n,
        "interrupting rating",
        d.duty_a,
        rating,
        "A",
        "at_most",
        "series-rated" if series else "panel-interrupting",
        f"rating {kiloamps(rating)} vs duty {kiloamps(d.duty_a)} ({what}{factor})"
        + (
            ""
            if ok
            else f" — equipment rated at least {kiloamps(d.duty_a)} (or a series-rated "
            "combination tested for it) is needed (NFPA 70 110.9, 110.10)"
        ),
        tolerance=0.0,
    )


def flag_return_paths(ctx: Context) -> None:
    """State the phase-size return assumed where a run gives no grounding conductor, and
    flag a run that relies on its metal raceway as the ground-fault return path."""
    tree = ctx.tree
    service = service_transformer_ohm(ctx.job) is not None
    bare = [
        r
        for r in ctx.job.runs
        if r.ground is None
        and not (r.from_id == SOURCE_ID and service)  # service: returns on its neutral
        and (tree.upstream_transformer.get(r.to_id) is not None or service)
        and tree.voltage_of[r.to_id].voltage_ln_v is not None
    ]
    if not bare:
        return
    ctx.assume(
        "Line-to-ground return path: where a run gives no grounding conductor the return "
        "is taken as one conductor of the phase size ("
        + ", ".join(r.id for r in bare)
        + "); a smaller grounding conductor or a raceway return gives less current."
    )
    for r in bare:
        if r.raceway not in ("steel", "aluminum"):
            continue
        ctx.add(
            r.id,
            "ground-fault return path",
            None,
            None,
            "",
            "warn",
            "fault-return-raceway",
            f"no grounding conductor given: the {r.raceway} raceway would be the return path "
            "(250.118), whose impedance is not modelled; the minimum line-to-ground figure "
            "and the trip check assume a phase-size return — give the wire-type grounding "
            "conductor (ground = ...) to prove the effective ground-fault path (250.4(A)(5))",
        )
