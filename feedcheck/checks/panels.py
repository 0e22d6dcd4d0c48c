"""Panel checks from the job: demand load against bus and main device."""

from __future__ import annotations

from ..calc.power import current_from_apparent_power_a
from ..model import Panel
from .context import Context
from .loads import demand_chain_steps, phase_design_steps


def check_panel(ctx: Context, p: Panel) -> None:
    sh = ctx.sheet(p.id, "panel", f"Panel {p.id}")
    v = ctx.tree.voltage_of[p.id]
    sh.inputs += [
        ("Voltage", v.text),
        ("Bus rating", f"{p.rating_a:g} A"),
        ("Main device", f"{p.main_device_a:g} A" if p.main_device_a else "none (main lugs)"),
        (
            "Interrupting rating",
            f"{p.interrupting_a / 1000:g} kA" if p.interrupting_a else "not given",
        ),
    ]
    check_panel_protection(ctx, p)
    load = ctx.loads[p.id]
    if load.va <= 0:
        ctx.add(
            p.id,
            "demand load",
            0.0,
            None,
            "VA",
            "info",
            "panel-bus-load",
            'no load given (add load = "… kVA" or a schedule) — load checks skipped',
        )
        return
    i_load = current_from_apparent_power_a(load.va, v.line_v, v.phases)
    sh.inputs.append(
        (
            "Demand load",
            f"{load.va / 1000:.1f} kVA "
            f"({load.continuous_va / 1000:.1f} kVA continuous), pf {load.pf:.2f}",
        )
    )
    sh.step(
        "Demand current, balanced average",
        "I = S / (√3 · V_LL)" if v.phases == 3 else "I = S / V",
        f"{load.va:,.0f} / ({'√3 · ' if v.phases == 3 else ''}{v.line_v:g})",
        i_load,
        "A",
    )
    demand_chain_steps(ctx.chains.get(p.id), sh)
    i_design, phase = phase_design_steps(ctx, p.id, sh, "panel-bus-load")
    ctx.nodes[p.id].values.update(
        {"load_va": load.va, "load_a": i_load, "design_current_a": i_design}
    )
    for rid, what, rating in (
        ("panel-bus-load", "bus rating", p.rating_a),
        ("panel-main-load", "main device", p.main_device_a),
    ):
        if not rating:
            continue
        ctx.compare(
            p.id,
            f"load vs {what}",
            i_design,
            rating,
            "A",
            "at_most",
            rid,
            f"design current of the heaviest phase ({phase}) {i_design:.1f} A "
            f"(continuous at 125 %) vs {what} {rating:g} A",
        )
    if p.main_device_a:
        ctx.compare(
            p.id,
            "main device vs bus",
            p.main_device_a,
            p.rating_a,
            "A",
            "at_most",
            "panel-main-bus",
            f"main device {p.main_device_a:g} A on a {p.rating_a:g} A bus",
        )


def check_panel_protection(ctx: Context, p: Panel) -> None:
    """NFPA 70-2023 408.36: the device protecting the bus (the panel's main, or the device
    protecting the run into it, :func:`~feedcheck.checks.taps.bus_device`) rated at most
    the bus. A panel with a main and a load is held by ``check_panel``'s "main device vs
    bus" finding; this covers main-lugs panels and panels without a load."""
    if p.main_device_a is not None:
        if ctx.loads[p.id].va <= 0:
            ctx.compare(
                p.id,
                "main device vs bus",
                p.main_device_a,
                p.rating_a,
                "A",
                "at_most",
                "panel-main-bus",
                f"main device {p.main_device_a:g} A on a {p.rating_a:g} A bus",
            )
        return
    from .taps import bus_device

    ctx.method("Panelboard protected by a device rated at most its bus", "NFPA 70-2023 408.36")
    device, what = bus_device(ctx.job, p.id)
    if device is None:
        ctx.add(
            p.id,
            "bus protection",
            None,
            p.rating_a,
            "A",
            "fail",
            "panel-bus-protection",
            f"main-lugs panel {p.id} with {what}: a panelboard is protected by a "
            f"device rated at most its {p.rating_a:g} A bus; add a main device or a "
            "device on the run into it",
        )
        return
    ctx.compare(
        p.id,
        "bus protection",
        device,
        p.rating_a,
        "A",
        "at_most",
        "panel-bus-protection",
        f"main-lugs {p.rating_a:g} A bus protected by the {device:g} A {what}"
        + (
            ""
            if device <= p.rating_a + 1e-9
            else f"; add a main device of at most {p.rating_a:g} A or reduce that device"
        ),
    )


def check_standard_ratings(ctx: Context) -> None:
    """Every device rating in the job should be a standard rating (240.6(A)); a setting
    of an adjustable-trip breaker may not be, so this is a warning."""
    std = {float(r) for r in ctx.rules.device_ratings_a}
    job = ctx.job
    devices = [(t.id, "primary device", t.primary_device_a) for t in job.transformers]
    devices += [(t.id, "secondary device", t.secondary_device_a) for t in job.transformers]
    devices += [(r.id, "device", r.device_a) for r in job.runs]
    devices += [(p.id, "main device", p.main_device_a) for p in job.panels]
    for subject, what, rating in devices:
        if rating is not None and rating not in std:
            ctx.add(
                subject,
                f"{what} standard rating",
                rating,
                None,
                "A",
                "warn",
                "device-standard-rating",
                f"{rating:g} A is not a standard rating of "
                "fuses and inverse-time breakers (240.6(A)); fine only for an "
                "adjustable-trip setting",
            )
