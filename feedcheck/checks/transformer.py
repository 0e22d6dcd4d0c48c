"""Transformer checks: rated currents, protection limits, loading, regulation,
secondary-conductor arrangement, grounding electrode conductor and bonding jumper."""

from __future__ import annotations

import math
from dataclasses import replace

from ..calc import transformer as tk
from ..calc.sizes import SIZES
from ..model import LOW_VOLTAGE_MAX_V, Transformer
from .compare import passes
from .context import Context


def check_transformer(ctx: Context, t: Transformer) -> None:
    sh = ctx.sheet(t.id, "transformer", f"Transformer {t.id}")
    ip, is_ = _rated_currents(ctx, t, sh)

    # --- overcurrent protection, 450.3(B) (450.3(A) over 1000 V)
    rules = list(ctx.rules.transformer_protection)
    ratings = ctx.rules.device_ratings_a
    sh.uses("transformer_protection", "device_ratings")
    arrangement = _arrangement(ctx, t, is_)
    if arrangement is None:
        return _check_loading(ctx, t, sh, ip, is_)
    for winding, rated, device in (
        ("primary", ip, t.primary_device_a),
        ("secondary", is_, t.secondary_device_a),
    ):
        if device is None:
            continue
        lim = tk.protection_limit(rated, winding, arrangement, rules, ratings)
        if not math.isfinite(lim.max_device_a):
            # no standard rating above the computed figure: the figure itself is the limit
            lim = replace(lim, max_device_a=lim.computed_a)
        _device_within_limit(ctx, t, sh, (winding, rated, device), lim, arrangement)
    _check_loading(ctx, t, sh, ip, is_)


def _rated_currents(ctx: Context, t: Transformer, sh) -> tuple[float, float]:
    """The nameplate on the sheet and the rated primary and secondary currents [A]."""
    ph = t.primary.phases
    sh.inputs += [
        ("Rating", f"{t.rating_va / 1000:g} kVA"),
        ("Primary", t.primary.text),
        ("Secondary", t.secondary.text),
        ("Impedance", f"{t.z_pct:g} %"),
        ("Primary device", f"{t.primary_device_a:g} A"),
        (
            "Secondary device",
            f"{t.secondary_device_a:g} A" if t.secondary_device_a else "none at the transformer",
        ),
    ]
    form = "S / (√3 · V_LL)" if ph == 3 else "S / V"
    k = "√3 · " if ph == 3 else ""
    ctx.method(
        "Rated current I = S/(√3·V) three-phase, S/V single-phase", "IEEE Std 141-1993 ch. 4"
    )
    out = []
    for winding, system in (("primary", t.primary), ("secondary", t.secondary)):
        rated = tk.rated_current_a(t.rating_va, system.voltage_ll_v, ph)
        sh.step(
            f"Rated {winding} current",
            f"I_{winding[0]} = {form}",
            f"{t.rating_va:,.0f} / ({k}{system.voltage_ll_v:g})",
            rated,
            "A",
        )
        out.append(rated)
    for winding, system, rated in (
        ("primary", t.primary, out[0]),
        ("secondary", t.secondary, out[1]),
    ):
        ctx.add(
            t.id,
            f"rated {winding} current",
            rated,
            None,
            "A",
            "info",
            "rated-current",
            f"{t.rating_va / 1000:g} kVA at {system.voltage_ll_v:g} V",
        )
    return out[0], out[1]


def _device_within_limit(ctx: Context, t: Transformer, sh, what, lim, arrangement) -> None:
    """A winding's device against its protection limit: the step and the finding;
    ``what`` is (winding, rated current, device rating)."""
    winding, rated, device = what
    how = (
        "next standard rating up permitted"
        if lim.next_size_up
        else "largest standard rating not above it"
    )
    sh.step(
        f"Largest {winding} device ({arrangement})",
        f"{lim.max_pct:g} % × I_{winding[0]} → {how}",
        f"{lim.max_pct:g} % × {rated:.1f} = {lim.computed_a:.1f} A",
        lim.max_device_a,
        "A",
        lim.rule_id,
    )
    note = (
        f"{device:g} A device within the {lim.max_device_a:g} A limit "
        f"({lim.max_pct:g} % of {rated:.1f} A, {arrangement})"
    )
    if not passes(device, lim.max_device_a, "at_most"):
        note = (
            f"{device:g} A exceeds the largest permitted {lim.max_device_a:g} A "
            f"({lim.max_pct:g} % of {rated:.1f} A, {arrangement}); use a device of "
            f"{lim.max_device_a:g} A or less"
        )
    ctx.compare(
        t.id, f"{winding} device", device, lim.max_device_a, "A", "at_most", lim.rule_id, note
    )


def _arrangement(ctx: Context, t: Transformer, rated_secondary_a: float) -> str | None:
    """The protection table's arrangement for ``t``: Table 450.3(B) (1000 V and less) by
    whether a secondary device is given; Table 450.3(A) 'any location' over 1000 V by
    the impedance band and the primary device type (a fuse when the job does not say:
    the lower limit). None when the table has no row (over 10 %): a warning says so."""
    if t.primary.voltage_ll_v <= LOW_VOLTAGE_MAX_V:
        ctx.method(
            "Transformer overcurrent protection limits", "NFPA 70-2023 450.3(B), Table 450.3(B)"
        )
        return "primary and secondary" if t.secondary_device_a else "primary only"
    ctx.method(
        "Transformer overcurrent protection over 1000 V, any location: primary by the "
        "rated impedance and the device (breaker or fuse), secondary of 1000 V or less at "
        "125 %",
        "NFPA 70-2023 450.3(A), Table 450.3(A)",
    )
    if t.z_pct > 10.0:
        ctx.add(
            t.id, "primary device", t.primary_device_a, None, "A", "warn",
            "xfmr-prot-mv-z10-fuse-primary",
            f"not evaluated: Table 450.3(A) has rows up to 10 % impedance ({t.z_pct:g} % "
            "given); size the protection by the engineer's study",
        )  # fmt: skip
        return None
    band = "Z up to 6 %" if t.z_pct <= 6.0 else "Z over 6 % up to 10 %"
    kind = t.primary_device_type or "fuse"
    if not t.primary_device_type:
        ctx.assume(
            f"{t.id}: primary device taken as a fuse (the lower limit of Table 450.3(A)); "
            "state primary_device_type = 'breaker' for a circuit breaker."
        )
    if t.secondary_device_a is None:
        ctx.add(
            t.id, "secondary device", None, 1.25 * rated_secondary_a, "A", "warn",
            f"xfmr-prot-mv-{'z6' if t.z_pct <= 6.0 else 'z10'}-{kind}-secondary",
            "Table 450.3(A) (any location) requires secondary protection at most 125 % of "
            f"{rated_secondary_a:.1f} A (next standard rating up); the job gives no "
            "secondary_device: state it (a main of the equipment the secondary conductors "
            "end at may serve, up to six devices, note 2)",
        )  # fmt: skip
    return f"over 1000 V any location {band} {kind}"


def _check_loading(ctx: Context, t: Transformer, sh, ip: float, is_: float) -> None:
    """Loading and regulation at the demand load, then grounding."""
    load = ctx.loads[t.id]
    x_r = t.x_r
    _x_r_input(ctx, t, sh)
    r_pct, x_pct = tk.impedance_parts_pct(t.z_pct, x_r)
    sh.step(
        "Resistance and reactance",
        "%R = %Z / √(1 + (X/R)²), %X = %R · X/R",
        f"{t.z_pct:g} / √(1 + {x_r:g}²) = {r_pct:.3f} %; {r_pct:.3f} × {x_r:g}",
        x_pct,
        "% (%X)",
    )
    n = load.va / t.rating_va
    rule = ctx.rules.rule("xfmr-loading")
    pct = 100.0 * n
    sh.step(
        "Loading",
        "demand kVA / rated kVA",
        f"{load.va / 1000:.1f} / {t.rating_va / 1000:g}",
        pct,
        "%",
        "xfmr-loading",
    )
    if load.va > 0:
        ok = passes(pct, rule.number("limit"), "at_most")
        ctx.compare(
            t.id,
            "loading",
            pct,
            rule.number("limit"),
            "%",
            "at_most",
            "xfmr-loading",
            f"demand {load.va / 1000:.1f} kVA on {t.rating_va / 1000:g} kVA"
            + ("" if ok else "; a larger transformer or less load is needed"),
            fail_status=rule["status"],
        )
    pf = load.pf
    reg_approx = tk.regulation_pct_approximate(r_pct, x_pct, n, pf)
    reg_exact = tk.regulation_pct_exact(r_pct, x_pct, n, pf)
    sh.step(
        "Regulation (approximate)",
        "n(%R cos φ + %X sin φ) + n²(%X cos φ − %R sin φ)²/200",
        f"n = {n:.3f}, cos φ = {pf:.3f}",
        reg_approx,
        "%",
    )
    sh.step(
        "Regulation (exact phasor)",
        "(|1 + n(r cos φ + x sin φ) + j n(x cos φ − r sin φ)| − 1) · 100",
        f"n = {n:.3f}, cos φ = {pf:.3f}",
        reg_exact,
        "%",
    )
    ctx.method(
        "Transformer regulation, exact phasor and %R/%X approximation (receiving end "
        "at rated voltage)",
        "IEEE Std C57.12.80 definition; standard series expansion",
    )
    node = ctx.nodes[t.id]
    node.values.update(
        {
            "rated_primary_a": ip,
            "rated_secondary_a": is_,
            "x_r_transformer": x_r,
            "loading_pct": pct,
            "regulation_pct": reg_exact,
            "regulation_approx_pct": reg_approx,
            "load_va": load.va,
        }
    )

    _check_grounding(ctx, t, sh)


def _x_r_input(ctx: Context, t: Transformer, sh) -> None:
    """The X/R on the sheet; a typical value is an assumption naming its row."""
    if t.x_r_typical:
        sh.uses("transformer_xr")
        ctx.assume(
            f"{t.id}: X/R {t.x_r:g} taken from the typical-value table ({t.x_r_typical_row}); "
            "use the nameplate or test report value where known."
        )
        sh.inputs.append(("X/R", f"{t.x_r:g} (typical, tables/transformer_xr.csv)"))
    else:
        sh.inputs.append(("X/R", f"{t.x_r:g}"))


def _secondary_runs(ctx: Context, t: Transformer):
    return [r for r in ctx.job.runs if r.from_id == t.id]


def _check_grounding(ctx: Context, t: Transformer, sh) -> None:
    runs = _secondary_runs(ctx, t)
    if not runs:
        return
    areas = [(r.size.area_kcmil * r.sets, r.material) for r in runs]
    total = sum(a for a, _ in areas)
    material = runs[0].material
    rows = ctx.rules.rows("grounding_electrode_conductor")
    sh.uses("grounding_electrode_conductor")
    row = tk.gec_row(total, material, rows)
    gec_cu, gec_al = row["gec_cu"], row["gec_al"]
    sh.step(
        "Largest ungrounded secondary conductor (sum of parallel sets and runs)",
        "Σ sets × area",
        " + ".join(f"{r.sets} × {r.size.name}" for r in runs),
        total,
        "kcmil",
        "gec-sds",
    )
    sh.step(
        "Grounding electrode conductor",
        "Table 250.66 row for that area",
        f"{total:.1f} kcmil {material.upper()} → row {row['row']}",
        f"{gec_cu} Cu or {gec_al} Al",
        "",
        "gec-sds",
    )
    ctx.add(
        t.id,
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
    sh.step(
        "System bonding jumper",
        f"Table 250.102(C)(1) ({sbj_pct:g} % of area above its rows)",
        f"{total:.1f} kcmil",
        sbj_text,
        "",
        "sbj-sds",
    )
    ctx.add(t.id, "system bonding jumper", None, None, "", "info", "sbj-sds", sbj_text)
