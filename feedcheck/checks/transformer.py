"""Transformer checks: rated currents, protection limits, loading, regulation,
secondary-conductor arrangement, grounding electrode conductor and bonding jumper."""

from __future__ import annotations

import math
from dataclasses import replace

from ..calc.sizes import SIZES
from ..calc.transformer import (
    gec_row,
    impedance_parts_pct,
    protection_limit,
    rated_current_a,
    regulation_pct_approximate,
    regulation_pct_exact,
)
from ..model import Transformer
from .compare import passes
from .context import Context


def check_transformer(ctx: Context, tx: Transformer) -> None:
    sheet = ctx.sheet(tx.id, "transformer", f"Transformer {tx.id}")
    sheet.inputs += _nameplate_inputs(tx)
    rated = _rated_currents(ctx, tx, sheet)
    _protection(ctx, tx, sheet, rated)
    _loading_and_regulation(ctx, tx, sheet, rated)
    _check_grounding(ctx, tx, sheet)


def _nameplate_inputs(tx: Transformer) -> list[tuple[str, str]]:
    return [
        ("Rating", f"{tx.rating_va / 1000:g} kVA"),
        ("Primary", tx.primary.text),
        ("Secondary", tx.secondary.text),
        ("Impedance", f"{tx.z_pct:g} %"),
        ("Primary device", f"{tx.primary_device_a:g} A"),
        (
            "Secondary device",
            f"{tx.secondary_device_a:g} A" if tx.secondary_device_a else "none at the transformer",
        ),
    ]


def _rated_currents(ctx: Context, tx: Transformer, sheet) -> tuple[float, float]:
    """Rated primary and secondary currents [A]: calculation steps and info findings."""
    phases = tx.primary.phases
    form = "S / (√3 · V_LL)" if phases == 3 else "S / V"
    factor = "√3 · " if phases == 3 else ""
    rated = []
    for winding, symbol, voltage_ll_v in (
        ("primary", "I_p", tx.primary.voltage_ll_v),
        ("secondary", "I_s", tx.secondary.voltage_ll_v),
    ):
        current_a = rated_current_a(tx.rating_va, voltage_ll_v, phases)
        sheet.step(
            f"Rated {winding} current",
            f"{symbol} = {form}",
            f"{tx.rating_va:,.0f} / ({factor}{voltage_ll_v:g})",
            round(current_a, 1),
            "A",
        )
        rated.append(current_a)
    ctx.method(
        "Rated current I = S/(√3·V) three-phase, S/V single-phase", "IEEE Std 141-1993 ch. 4"
    )
    for winding, current_a, voltage_ll_v in (
        ("primary", rated[0], tx.primary.voltage_ll_v),
        ("secondary", rated[1], tx.secondary.voltage_ll_v),
    ):
        ctx.add(
            tx.id,
            f"rated {winding} current",
            current_a,
            None,
            "A",
            "info",
            "rated-current",
            f"{tx.rating_va / 1000:g} kVA at {voltage_ll_v:g} V",
        )
    return rated[0], rated[1]


def _protection(ctx: Context, tx: Transformer, sheet, rated: tuple[float, float]) -> None:
    """Primary and secondary devices against the limits of 450.3(B)."""
    rules = list(ctx.rules.transformer_protection)
    ratings = ctx.rules.device_ratings_a
    sheet.uses("transformer_protection", "device_ratings")
    arrangement = "primary and secondary" if tx.secondary_device_a else "primary only"
    ctx.method("Transformer overcurrent protection limits", "NFPA 70-2023 450.3(B), Table 450.3(B)")
    for winding, rated_a, device_a in (
        ("primary", rated[0], tx.primary_device_a),
        ("secondary", rated[1], tx.secondary_device_a),
    ):
        if device_a is None:
            continue
        limit = protection_limit(rated_a, winding, arrangement, rules, ratings)
        if not math.isfinite(limit.max_device_a):
            # no standard rating above the computed figure: the figure itself is the limit
            limit = replace(limit, max_device_a=limit.computed_a)
        _device_within_limit(ctx, tx, sheet, winding, rated_a, device_a, limit, arrangement)


def _device_within_limit(ctx, tx, sheet, winding, rated_a, device_a, limit, arrangement):
    how = (
        "next standard rating up permitted"
        if limit.next_size_up
        else "largest standard rating not above it"
    )
    sheet.step(
        f"Largest {winding} device ({arrangement})",
        f"{limit.max_pct:g} % × I_{winding[0]} → {how}",
        f"{limit.max_pct:g} % × {rated_a:.1f} = {limit.computed_a:.1f} A",
        limit.max_device_a,
        "A",
        limit.rule_id,
    )
    ok = passes(device_a, limit.max_device_a, "at_most")
    note = (
        f"{device_a:g} A device within the {limit.max_device_a:g} A limit "
        f"({limit.max_pct:g} % of {rated_a:.1f} A, {arrangement})"
    )
    if not ok:
        note = (
            f"{device_a:g} A exceeds the largest permitted {limit.max_device_a:g} A "
            f"({limit.max_pct:g} % of {rated_a:.1f} A, {arrangement}); use a device of "
            f"{limit.max_device_a:g} A or less"
        )
    ctx.compare(
        tx.id,
        f"{winding} device",
        device_a,
        limit.max_device_a,
        "A",
        "at_most",
        limit.rule_id,
        note,
    )


def _loading_and_regulation(ctx: Context, tx: Transformer, sheet, rated) -> None:
    """Loading and regulation at the demand load; the node's transformer figures."""
    load = ctx.loads[tx.id]
    x_r = tx.x_r
    if tx.x_r_typical:
        sheet.uses("transformer_xr")
        ctx.assume(
            f"{tx.id}: X/R {x_r:g} taken from the typical-value table ({tx.x_r_typical_row}); "
            "use the nameplate or test report value where known."
        )
        sheet.inputs.append(("X/R", f"{x_r:g} (typical, tables/transformer_xr.csv)"))
    else:
        sheet.inputs.append(("X/R", f"{x_r:g}"))
    r_pct, x_pct = impedance_parts_pct(tx.z_pct, x_r)
    sheet.step(
        "Resistance and reactance",
        "%R = %Z / √(1 + (X/R)²), %X = %R · X/R",
        f"{tx.z_pct:g} / √(1 + {x_r:g}²) = {r_pct:.3f} %; {r_pct:.3f} × {x_r:g}",
        round(x_pct, 3),
        "% (%X)",
    )
    per_unit = load.va / tx.rating_va
    loading_pct = _loading(ctx, tx, sheet, load.va, per_unit)
    reg_approx, reg_exact = _regulation(ctx, sheet, r_pct, x_pct, per_unit, load.pf)
    ctx.nodes[tx.id].values.update(
        {
            "rated_primary_a": rated[0],
            "rated_secondary_a": rated[1],
            "x_r_transformer": x_r,
            "loading_pct": loading_pct,
            "regulation_pct": reg_exact,
            "regulation_approx_pct": reg_approx,
            "load_va": load.va,
        }
    )


def _loading(ctx: Context, tx: Transformer, sheet, load_va: float, per_unit: float) -> float:
    """Demand kVA against the rating (rule xfmr-loading); returns the loading [%]."""
    rule = ctx.rules.rule("xfmr-loading")
    loading_pct = 100.0 * per_unit
    sheet.step(
        "Loading",
        "demand kVA / rated kVA",
        f"{load_va / 1000:.1f} / {tx.rating_va / 1000:g}",
        round(loading_pct, 1),
        "%",
        "xfmr-loading",
    )
    if load_va > 0:
        ok = passes(loading_pct, rule.number("limit"), "at_most")
        ctx.compare(
            tx.id,
            "loading",
            loading_pct,
            rule.number("limit"),
            "%",
            "at_most",
            "xfmr-loading",
            f"demand {load_va / 1000:.1f} kVA on {tx.rating_va / 1000:g} kVA"
            + ("" if ok else "; a larger transformer or less load is needed"),
            fail_status=rule["status"],
        )
    return loading_pct


def _regulation(ctx: Context, sheet, r_pct, x_pct, per_unit, pf) -> tuple[float, float]:
    """Regulation at the demand load, approximate and exact [%]."""
    reg_approx = regulation_pct_approximate(r_pct, x_pct, per_unit, pf)
    reg_exact = regulation_pct_exact(r_pct, x_pct, per_unit, pf)
    sheet.step(
        "Regulation (approximate)",
        "n(%R cos φ + %X sin φ) + n²(%X cos φ − %R sin φ)²/200",
        f"n = {per_unit:.3f}, cos φ = {pf:.3f}",
        round(reg_approx, 3),
        "%",
    )
    sheet.step(
        "Regulation (exact phasor)",
        "(|1 + n(r cos φ + x sin φ) + j n(x cos φ − r sin φ)| − 1) · 100",
        f"n = {per_unit:.3f}, cos φ = {pf:.3f}",
        round(reg_exact, 3),
        "%",
    )
    ctx.method(
        "Transformer regulation, exact phasor and %R/%X approximation (receiving end "
        "at rated voltage)",
        "IEEE Std C57.12.80 definition; standard series expansion",
    )
    return reg_approx, reg_exact


def _secondary_runs(ctx: Context, tx: Transformer):
    return [run for run in ctx.job.runs if run.from_id == tx.id]


def _check_grounding(ctx: Context, tx: Transformer, sheet) -> None:
    runs = _secondary_runs(ctx, tx)
    if not runs:
        return
    total = sum(run.size.area_kcmil * run.sets for run in runs)
    material = runs[0].material
    rows = ctx.rules.rows("grounding_electrode_conductor")
    sheet.uses("grounding_electrode_conductor")
    row = gec_row(total, material, rows)
    gec_cu, gec_al = row["gec_cu"], row["gec_al"]
    sheet.step(
        "Largest ungrounded secondary conductor (sum of parallel sets and runs)",
        "Σ sets × area",
        " + ".join(f"{run.sets} × {run.size.name}" for run in runs),
        round(total, 1),
        "kcmil",
        "gec-sds",
    )
    sheet.step(
        "Grounding electrode conductor",
        "Table 250.66 row for that area",
        f"{total:.1f} kcmil {material.upper()} → row {row['row']}",
        f"{gec_cu} Cu or {gec_al} Al",
        "",
        "gec-sds",
    )
    ctx.add(
        tx.id,
        "grounding electrode conductor",
        SIZES[gec_cu].area_kcmil,
        None,
        "kcmil",
        "info",
        "gec-sds",
        f"at least {gec_cu} Cu or {gec_al} Al for "
        f"{total:.1f} kcmil {material.upper()} secondary conductors",
    )
    lim_col = "cu_up_to_kcmil" if material == "cu" else "al_up_to_kcmil"
    sbj_pct = ctx.rules.rule("sbj-sds").number("limit")
    if math.isinf(float(row[lim_col])) and total > 0:
        sbj_area = sbj_pct / 100.0 * total
        sbj_text = (
            f"at least {sbj_area:.0f} kcmil ({material.upper()}, {sbj_pct:g} % of {total:.0f})"
        )
    else:
        sbj_text = f"at least {gec_cu} Cu or {gec_al} Al"
    sheet.step(
        "System bonding jumper",
        f"Table 250.102(C)(1) ({sbj_pct:g} % of area above its rows)",
        f"{total:.1f} kcmil",
        sbj_text,
        "",
        "sbj-sds",
    )
    ctx.add(tx.id, "system bonding jumper", None, None, "", "info", "sbj-sds", sbj_text)
