"""The "next size that passes" suggested by a failing run, verified: the suggested size
(and device, when the run's device is too small for its load) is substituted and the
run's conductor checks are run again; the first size that passes them all is suggested.

Checks re-run with the substitution: ampacity before and after corrections
(215.2(A)(1)), device vs load (215.3), device protects conductors (240.4), phase
conductor withstand (ICEA P-32-382), and the ampacity a declared or implied tap rule
needs (240.21(B), (C)). Voltage drop is not re-run here (its own check names the size
it needs); the grounding conductor is re-sized with the phase conductors (250.122(B)).
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from ..calc.ampacity import ampacity_chain, termination_c_for
from ..calc.protection import (
    conductor_protection,
    device_min_for_load_a,
    next_standard_rating_a,
    standard_ratings_a,
)
from ..calc.selection import Selection, select_conductor, smallest_size
from ..calc.sizes import AWG_KCMIL_ORDER, METRIC_ORDER, SIZES
from ..model import Run
from .context import Context


@dataclass(frozen=True)
class RunDuty:
    """What a run carries and how it is installed, for re-running its checks."""

    cont_a: float
    non_a: float
    device_a: float | None
    cc: int
    rooftop_c: float


def _failures(ctx: Context, run: Run, name: str, duty: RunDuty) -> list[str]:
    """Names of the run's conductor checks that fail with ``name`` substituted."""
    from .taps import tap_needs_a
    from .withstand import phase_withstand_passes

    sub = replace(run, size=SIZES[name])
    term = run.termination_c
    if term is None:
        basis = duty.device_a if duty.device_a is not None else duty.cont_a + duty.non_a
        term = float(termination_c_for(basis, name))
    try:
        chain = ampacity_chain(
            name,
            run.material,
            run.insulation_c,
            run.ambient_c,
            duty.cc,
            term,
            run.sets,
            run.raceway == "free-air",
            duty.rooftop_c,
            duty.cont_a,
            duty.non_a,
            tables=ctx.rules.ampacity,
        )
    except ValueError:
        return ["ampacity"]
    out = []
    if not chain.ok_before:
        out.append("ampacity before corrections")
    if not chain.ok_after:
        out.append("ampacity after corrections")
    if duty.device_a is not None:
        prot = conductor_protection(
            duty.device_a, chain.final_a, name, run.material, tables=ctx.rules.protection
        )
        if not prot.ok:
            out.append("device protects conductors")
    if chain.final_a < tap_needs_a(ctx, sub) - 1e-9:
        out.append("tap rule ampacity")
    load = duty.cont_a + duty.non_a
    if not phase_withstand_passes(ctx, sub, SIZES[name], load, chain.corrected_a):
        out.append("withstand")
    return out


def select_for_duty(ctx: Context, run: Run, duty: RunDuty, term: float | None) -> Selection:
    """Smallest conductor of the run's material and system for its load and device."""
    return _for_duty(select_conductor, ctx, run, duty, term)


def smallest_for_duty(ctx: Context, run: Run, duty: RunDuty, term: float | None) -> str:
    """The size :func:`select_for_duty` selects, alone (its ampacity chain not built)."""
    return _for_duty(smallest_size, ctx, run, duty, term)


def _for_duty(kernel, ctx: Context, run: Run, duty: RunDuty, term: float | None):
    """``kernel`` (``select_conductor`` or ``smallest_size``: the same arguments) called
    with the run's installation and ``duty``."""
    return kernel(
        duty.cont_a,
        duty.non_a,
        run.material,
        run.insulation_c,
        run.ambient_c,
        duty.cc,
        termination_c=term,
        sets=run.sets,
        raceway=run.raceway,
        device_a=duty.device_a,
        rooftop_adder_c=duty.rooftop_c,
        system=run.size.system,
        data=ctx.rules.sizing,
    )


def next_passing(ctx: Context, run: Run, duty: RunDuty) -> str:
    """Text naming the smallest size (and device) with which every conductor check of the
    run passes, starting from the smallest size meeting load and device."""
    device = duty.device_a
    device_text = ""
    if device is not None:
        need = float(device_min_for_load_a(duty.cont_a, duty.non_a, tables=ctx.rules.protection))
        if device < need - 1e-9:
            largest = float(standard_ratings_a(tables=ctx.rules.protection)[-1])
            if need > largest + 1e-9:
                return (
                    f"no standard device carries {need:,.0f} A (largest {largest:g} A): "
                    "split the load over more feeders"
                )
            device = float(next_standard_rating_a(need, tables=ctx.rules.protection))
            device_text = f" with a {device:g} A device"
    duty = replace(duty, device_a=device)
    try:
        sel = select_for_duty(ctx, run, duty, run.termination_c)
    except ValueError as exc:
        return f"no size found with {run.sets} set(s): {exc}"
    order = AWG_KCMIL_ORDER if run.size.system == "awg" else METRIC_ORDER
    start = order.index(sel.size) if sel.size in order else 0
    for name in order[start:]:
        if not _failures(ctx, run, name, duty):
            return (
                f"next size that passes every conductor check of this run: {name} "
                f"{run.material.capitalize()}{device_text} (verified by re-running them)"
            )
    return (
        f"no size with {run.sets} set(s){device_text} passes every conductor check "
        "of this run: more sets, a faster device or a shorter run"
    )
