"""Panel checks from the job: demand load against bus and main device."""

from __future__ import annotations

from ..calc.power import current_from_apparent_power_a
from ..model import LOW_VOLTAGE_MAX_V, Panel
from .context import Context
from .demand_sheet import demand_chain_steps
from .loads import phase_design_steps


def check_panel(ctx: Context, panel: Panel) -> None:
    sheet = ctx.sheet(panel.id, "panel", f"Panel {panel.id}")
    system = ctx.tree.voltage_of[panel.id]
    sheet.inputs += [
        ("Voltage", system.text),
        ("Bus rating", f"{panel.rating_a:g} A"),
        (
            "Main device",
            f"{panel.main_device_a:g} A" if panel.main_device_a else "none (main lugs)",
        ),
        (
            "Interrupting rating",
            f"{panel.interrupting_a / 1000:g} kA" if panel.interrupting_a else "not given",
        ),
    ]
    check_panel_protection(ctx, panel)
    load = ctx.loads[panel.id]
    if load.va <= 0:
        ctx.add(
            panel.id,
            "demand load",
            0.0,
            None,
            "VA",
            "info",
            "panel-bus-load",
            'no load given (add load = "… kVA" or a schedule) — load checks skipped',
        )
        return
    i_load = current_from_apparent_power_a(load.va, system.voltage_ll_v, system.phases)
    sheet.inputs.append(
        (
            "Demand load",
            f"{load.va / 1000:.1f} kVA "
            f"({load.continuous_va / 1000:.1f} kVA continuous), pf {load.pf:.2f}",
        )
    )
    sheet.step(
        "Demand current, balanced average",
        "I = S / (√3 · V_LL)" if system.phases == 3 else "I = S / V",
        f"{load.va:,.0f} / ({'√3 · ' if system.phases == 3 else ''}{system.voltage_ll_v:g})",
        i_load,
        "A",
    )
    demand_chain_steps(ctx, panel, sheet)
    if panel.id in ctx.motor_loads:
        from .motors import panel_motor_steps

        panel_motor_steps(sheet, *ctx.motor_loads[panel.id])
    from .motor_sheet import node_adder_step

    node_adder_step(ctx, panel.id, sheet)
    i_design, phase = phase_design_steps(ctx, panel.id, sheet, "panel-bus-load")
    ctx.nodes[panel.id].values.update(
        {"load_va": load.va, "load_a": i_load, "design_current_a": i_design}
    )
    for rid, what, rating in (
        ("panel-bus-load", "bus rating", panel.rating_a),
        ("panel-main-load", "main device", panel.main_device_a),
    ):
        if not rating:
            continue
        ctx.compare(
            panel.id,
            f"load vs {what}",
            i_design,
            rating,
            "A",
            "at_most",
            rid,
            f"design current of the heaviest phase ({phase}) {i_design:.1f} A "
            f"(continuous at 125 %) vs {what} {rating:g} A",
        )
    if panel.main_device_a:
        _main_device_vs_bus(ctx, panel)


def _main_device_vs_bus(ctx: Context, panel: Panel) -> None:
    """The panel's main device rated at most its bus (rule panel-main-bus)."""
    ctx.compare(
        panel.id,
        "main device vs bus",
        panel.main_device_a,
        panel.rating_a,
        "A",
        "at_most",
        "panel-main-bus",
        f"main device {panel.main_device_a:g} A on a {panel.rating_a:g} A bus",
    )


def check_panel_protection(ctx: Context, panel: Panel) -> None:
    """NFPA 70-2023 408.36: the device protecting the bus (the panel's main, or the device
    protecting the run into it, :func:`~feedcheck.checks.taps.bus_device`) rated at most
    the bus. A panel with a main and a load is held by ``check_panel``'s "main device vs
    bus" finding; this covers main-lugs panels and panels without a load."""
    if panel.main_device_a is not None:
        if ctx.loads[panel.id].va <= 0:
            _main_device_vs_bus(ctx, panel)
        return
    from .taps import bus_device

    ctx.method("Panelboard protected by a device rated at most its bus", "NFPA 70-2023 408.36")
    device, what = bus_device(ctx, panel.id)
    if device is None:
        ctx.add(
            panel.id,
            "bus protection",
            None,
            panel.rating_a,
            "A",
            "fail",
            "panel-bus-protection",
            f"main-lugs panel {panel.id} with {what}: a panelboard is protected by a "
            f"device rated at most its {panel.rating_a:g} A bus; add a main device or a "
            "device on the run into it",
        )
        return
    ctx.compare(
        panel.id,
        "bus protection",
        device,
        panel.rating_a,
        "A",
        "at_most",
        "panel-bus-protection",
        f"main-lugs {panel.rating_a:g} A bus protected by the {device:g} A {what}"
        + (
            ""
            if device <= panel.rating_a + 1e-9
            else f"; add a main device of at most {panel.rating_a:g} A or reduce that device"
        ),
    )


def check_standard_ratings(ctx: Context) -> None:
    """Every device rating in the job should be a standard rating (240.6(A)); a setting
    of an adjustable-trip breaker may not be, so this is a warning."""
    std = {float(run) for run in ctx.rules.device_ratings_a}
    job = ctx.job
    # Table 240.6(A) lists low-voltage ratings: a primary device over 1000 V is not held
    devices = [
        (tx.id, "primary device", tx.primary_device_a)
        for tx in job.transformers
        if tx.primary.voltage_ll_v <= LOW_VOLTAGE_MAX_V
    ]
    devices += [(tx.id, "secondary device", tx.secondary_device_a) for tx in job.transformers]
    devices += [(run.id, "device", run.device_a) for run in job.runs]
    devices += [(panel.id, "main device", panel.main_device_a) for panel in job.panels]
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
