"""Run checks: ampacity chain, loads and devices, conductor protection, equipment
grounding conductor, parallel sets, short-circuit withstand and the transformer
secondary-conductor arrangements."""

from __future__ import annotations

from ..calc import ampacity as ak
from ..calc import protection as pk
from ..calc import selection as sk
from ..calc import withstand as wk
from ..calc.constants import M_PER_FT, SQRT3
from ..calc.power import current_from_apparent_power_a
from ..calc.sizes import SIZES
from ..model import Run
from .compare import passes
from .context import Context


def _loads(ctx: Context, run: Run) -> tuple[float, float, float]:
    """Continuous and noncontinuous load current on a run, and its power factor."""
    v = ctx.tree.voltage_of[run.from_id]
    load = ctx.loads[run.to_id]
    cont = current_from_apparent_power_a(load.continuous_va, v.line_v, v.phases)
    non = current_from_apparent_power_a(load.va - load.continuous_va, v.line_v, v.phases)
    return cont, non, load.pf


def _select(
    ctx: Context,
    run: Run,
    cont: float,
    non: float,
    device: float | None,
    term: float | None,
    cc: int,
    rooftop_c: float,
) -> sk.Selection:
    """Smallest conductor of the run's material and system for its load and device."""
    return sk.select_conductor(
        cont,
        non,
        run.material,
        run.insulation_c,
        run.ambient_c,
        cc,
        termination_c=term,
        sets=run.sets,
        raceway=run.raceway,
        device_a=device,
        rooftop_adder_c=rooftop_c,
        system=run.size.system,
        data=ctx.rules.sizing,
    )


def _next_passing(
    ctx: Context,
    run: Run,
    cont: float,
    non: float,
    device: float | None,
    term: float | None,
    cc: int,
    rooftop_c: float,
) -> str:
    try:
        sel = _select(ctx, run, cont, non, device, term, cc, rooftop_c)
    except ValueError as exc:
        return f"no size found with {run.sets} set(s): {exc}"
    return f"next size that passes: {sel.size} {run.material.capitalize()} ({sel.governing})"


def check_run(ctx: Context, run: Run) -> None:
    tree = ctx.tree
    sh = ctx.sheet(run.id, "run", f"Run {run.id} ({run.from_id} → {run.to_id})")
    sh.inputs += [
        ("From → to", f"{run.from_id} → {run.to_id}"),
        ("Length", f"{run.length_m / M_PER_FT:,.0f} ft ({run.length_m:,.1f} m)"),
        (
            "Conductors",
            f"{run.sets} × {run.size.name} {run.material.capitalize()}, "
            f"{run.insulation_c:g} °C insulation",
        ),
        ("Raceway", run.raceway),
        ("Ambient", f"{run.ambient_c:g} °C"),
        (
            "Current-carrying conductors",
            str(run.current_carrying) + (" + neutral (harmonics)" if run.harmonic_neutral else ""),
        ),
        (
            "Grounding conductor",
            f"{run.ground.name} {run.ground_material.capitalize()}" if run.ground else "not given",
        ),
        ("Device at the sending end", f"{run.device_a:g} A" if run.device_a else "none"),
    ]
    sh.uses(
        "ampacity_raceway",
        "adjustment_factors",
        "ampacity_rules",
        "protection_rules",
        "egc_size",
        "conductor_impedance_table9",
    )
    cont, non, _pf = _loads(ctx, run)
    device = run.device_a
    cc = run.current_carrying + (1 if run.harmonic_neutral else 0)
    rooftop_c, rooftop_rule = 0.0, ""
    if run.rooftop_mm is not None:
        rooftop_c, rooftop_rule = ak.rooftop_adder_c(
            run.rooftop_mm / 1000.0, tables=ctx.rules.ampacity
        )
        sh.step(
            "Rooftop raceway temperature adder",
            "added to the ambient",
            f"raceway {run.rooftop_mm:.0f} mm above the roof",
            rooftop_c,
            "°C",
            rooftop_rule,
        )
    if run.sets > 1 and run.size.area_kcmil < SIZES["1/0 AWG"].area_kcmil * (1 - 1e-9):
        ctx.add(
            run.id,
            "parallel conductors",
            run.size.area_kcmil,
            SIZES["1/0 AWG"].area_kcmil,
            "kcmil",
            "fail",
            "run-parallel-min",
            f"{run.sets} sets of {run.size.name}: conductors in parallel must be 1/0 AWG or larger",
        )
        return
    term = run.termination_c
    if term is None:
        basis = device if device is not None else cont + non
        term = float(ak.termination_c_for(basis, run.size.name))
        sh.step(
            "Termination temperature column",
            "110.14(C)(1): ≤ 100 A or 14–1 AWG → 60 °C, else 75 °C",
            f"circuit {basis:.0f} A, {run.size.name}",
            term,
            "°C",
            "term-60c-100a" if term == 60 else "term-75c-over-100a",
        )
    try:
        chain = ak.ampacity_chain(
            run.size.name,
            run.material,
            run.insulation_c,
            run.ambient_c,
            cc,
            term,
            run.sets,
            run.raceway == "free-air",
            rooftop_c,
            cont,
            non,
            tables=ctx.rules.ampacity,
        )
    except ValueError as exc:
        ctx.add(run.id, "ampacity", None, None, "A", "fail", "run-ampacity-after", str(exc))
        return
    for label, value, unit, rid in chain.steps():
        sh.step(label, "", "", round(value, 3) if isinstance(value, float) else value, unit, rid)
    ctx.run_values.setdefault(run.id, {}).update(
        {
            "ampacity_a": chain.final_a,
            "continuous_a": cont,
            "noncontinuous_a": non,
            "termination_c": term,
        }
    )
    fix = None

    def fix_text():
        nonlocal fix
        if fix is None:
            fix = _next_passing(ctx, run, cont, non, device, run.termination_c, cc, rooftop_c)
        return fix

    # load before and after corrections (215.2(A)(1))
    ok = chain.ok_before
    before_a = min(chain.base_per_set_a * chain.sets, chain.termination_cap_a)
    ctx.add(
        run.id,
        "ampacity vs 125 % continuous + noncontinuous",
        chain.required_before_a,
        before_a,
        "A",
        "ok" if ok else "fail",
        "run-ampacity-before",
        f"needs {chain.required_before_a:.1f} A before corrections"
        + ("" if ok else "; " + fix_text()),
    )
    ok = chain.ok_after
    ctx.add(
        run.id,
        "allowable ampacity vs load",
        cont + non,
        chain.final_a,
        "A",
        "ok" if ok else "fail",
        "run-ampacity-after",
        f"allowable {chain.final_a:.1f} A ({chain.governed_by} governs) for "
        f"{cont + non:.1f} A of load" + ("" if ok else "; " + fix_text()),
    )
    if device is not None:
        need = float(pk.device_min_for_load_a(cont, non, tables=ctx.rules.protection))
        ok = passes(device, need, "at_least")
        ctx.compare(
            run.id,
            "device vs load",
            device,
            need,
            "A",
            "at_least",
            "run-device-load",
            f"{device:g} A device for {100 * ctx.rules.protection.continuous_factor:g} % × "
            f"{cont:.1f} + {non:.1f} A"
            f" = {need:.1f} A" + ("" if ok else "; a larger device (and conductors) needed"),
        )
        prot = pk.conductor_protection(
            device, chain.final_a, run.size.name, run.material, tables=ctx.rules.protection
        )
        ctx.add(
            run.id,
            "device protects conductors",
            device,
            prot.max_device_a,
            "A",
            "ok" if prot.ok else "fail",
            prot.rule_id,
            prot.note + ("" if prot.ok else "; " + fix_text()),
        )
        _check_egc(ctx, run, device, cont, non, term, cc, rooftop_c)
    _check_withstand(ctx, run)
    if tree.kind[run.from_id] == "transformer":
        _check_secondary_arrangement(ctx, run, chain.final_a)


def _check_egc(ctx, run, device, cont, non, term, cc, rooftop_c) -> None:
    if run.ground is None:
        ctx.add(
            run.id,
            "grounding conductor",
            None,
            None,
            "",
            "info",
            "run-egc-size",
            "no equipment grounding conductor given (a metal raceway may serve; check 250.118)",
        )
        return
    try:
        minimum = _select(ctx, run, cont, non, device, term, cc, rooftop_c).size
    except ValueError:
        minimum = run.size.name
    if SIZES[minimum].area_mm2 > run.size.area_mm2:
        minimum = run.size.name
    need = pk.egc_size(
        device,
        run.ground_material,
        run.size.name,
        minimum,
        run.material,
        run.sets,
        tables=ctx.rules.protection,
    )
    ok = run.ground.area_mm2 >= SIZES[need.size].area_mm2 * (1 - 1e-9)
    ctx.add(
        run.id,
        "grounding conductor",
        run.ground.area_kcmil,
        SIZES[need.size].area_kcmil,
        "kcmil",
        "ok" if ok else "fail",
        "run-egc-size",
        f"{run.ground.name} given; at least {need.size} {need.material.capitalize()} "
        f"needed: {need.reasoning}",
    )
    ctx.sheet(run.id, "run", "").step(
        "Equipment grounding conductor",
        "Table 250.122 by device; × (installed / minimum phase area) when upsized",
        need.reasoning,
        need.size,
        "",
        "run-egc-size",
    )


def _check_withstand(ctx, run) -> None:
    values = ctx.nodes[run.from_id].values  # the governing (largest) case, issue 12
    up = values.get("fault_duty_sym_a", values.get("fault_max_a"))
    if up is None:
        return
    t = run.clearing_s or ctx.rules.rule("withstand-clearing-default").number("limit")
    if run.clearing_s is None:
        ctx.assume(
            f"Withstand checks use a clearing time of {t:g} s where the job gives none "
            "(common practice; state the device's actual clearing time)."
        )
    insulation = "thermoset" if run.insulation_c >= 90 else "thermoplastic"
    for role, size, material in (
        ("line", run.size, run.material),
        ("protective", run.ground, run.ground_material),
    ):
        if size is None:
            continue
        k = wk.k_constant(insulation, material, role, size.area_mm2, data=ctx.rules.withstand)
        area_total = size.area_mm2 * run.sets
        i_w = float(wk.withstand_current_a(area_total, t, k.k))
        ok = passes(up, i_w, "at_most", 0.0)
        what = "phase conductors" if role == "line" else "grounding conductor"
        ctx.compare(
            run.id,
            f"withstand, {what}",
            up,
            i_w,
            "A",
            "at_most",
            "run-withstand",
            f"{what} withstand {i_w / 1000:,.1f} kA for {t:g} s "
            f"(k = {k.k:g}, {insulation}, {k.rule_id}) vs {up / 1000:,.2f} kA available at "
            "the sending end" + ("" if ok else "; a faster device or larger conductor"),
            fail_status="warn",
            tolerance=0.0,
        )
    ctx.method(
        "Short-circuit withstand, adiabatic I²t = k²S²",
        "IEC 60364-4-43 434.5.2; IEC 60364-5-54 Annex A; IEC 60949",
    )


def _secondary_need_text(
    primary_a: float, ratio: float, divisor: float, by_ratio: float, end_a, with_end: bool
) -> str:
    """How the 240.21(C) required ampacity was found, with the figures actually used."""
    part = (
        f"primary device {primary_a:g} A × voltage ratio {ratio:.3f} ÷ {divisor:g}"
        f" = {by_ratio:.1f} A"
    )
    if with_end and end_a is not None:
        return f"the larger of {part} and the end device {end_a:g} A"
    return part


def _check_secondary_arrangement(ctx, run, ampacity: float) -> None:
    """Transformer secondary conductors without a device at the transformer: the 10 ft
    and 25 ft arrangements of 240.21(C)(2) and (C)(6)."""
    t = next(x for x in ctx.job.transformers if x.id == run.from_id)
    if run.device_a is not None:
        ctx.add(
            run.id,
            "secondary conductor protection",
            run.device_a,
            None,
            "A",
            "info",
            "run-device-protects",
            "secondary conductors protected by a device at the transformer (checked as a feeder)",
        )
        return
    ratio = t.primary.line_v / t.secondary.line_v
    rules = ctx.rules
    ten_m = rules.rule("xfmr-secondary-10ft").number("limit")
    tw5_m = rules.rule("xfmr-secondary-25ft").number("limit")
    panel = next((p for p in ctx.job.panels if p.id == run.to_id), None)
    end_device = panel.main_device_a if panel else None
    # 240.21(C)(2)(1)(b) and (C)(6)(1): ampacity at least a share (in %) of the primary
    # device times the voltage ratio, the shares read from their rule rows
    if run.length_m <= ten_m + 1e-9:
        share_pct = rules.rule("xfmr-secondary-10ft-ratio").number("limit")
        divisor = 100.0 / share_pct
        by_ratio = t.primary_device_a * ratio / divisor
        need = max(by_ratio, end_device or 0.0)
        rid, label = "xfmr-secondary-10ft", f"{ten_m / M_PER_FT:.0f} ft"
    elif run.length_m <= tw5_m + 1e-9:
        share_pct = rules.rule("xfmr-secondary-25ft-ratio").number("limit")
        divisor = 100.0 / share_pct
        by_ratio = t.primary_device_a * ratio / divisor
        need = by_ratio
        rid, label = "xfmr-secondary-25ft", f"{tw5_m / M_PER_FT:.0f} ft"
    else:
        ctx.add(
            run.id,
            "secondary conductor length",
            run.length_m,
            tw5_m,
            "m",
            "fail",
            "xfmr-secondary-25ft",
            f"{run.length_m / M_PER_FT:,.0f} ft of secondary conductors with no device at "
            f"the transformer: more than {tw5_m / M_PER_FT:.0f} ft needs a device at the "
            "transformer",
        )
        return
    ctx.compare(
        run.id,
        f"secondary conductors ({label} arrangement)",
        ampacity,
        need,
        "A",
        "at_least",
        rid,
        f"ampacity {ampacity:.0f} A vs required {need:.0f} A: "
        + _secondary_need_text(
            t.primary_device_a, ratio, divisor, by_ratio, end_device, rid == "xfmr-secondary-10ft"
        ),
    )
    if end_device is None:
        ctx.add(
            run.id,
            "secondary conductors end in one device",
            None,
            None,
            "",
            "fail",
            "xfmr-secondary-end-device",
            f"{run.to_id} has no main device; secondary "
            "conductors without protection at the transformer must end in one device",
        )
    else:
        end_pct = rules.rule("xfmr-secondary-end-device").number("limit")
        ctx.compare(
            run.id,
            "secondary conductors end in one device",
            end_device,
            ampacity * end_pct / 100.0,
            "A",
            "at_most",
            "xfmr-secondary-end-device",
            f"main device {end_device:g} A vs conductor ampacity {ampacity:.0f} A",
        )
