"""The transfer switch and the generator themselves: the switch's current rating and
its withstand and closing rating, the generator's first-cycle fault current (on its
sheet) and its size against the demand it takes over (information)."""

from __future__ import annotations

from ..calc.constants import SQRT3
from ..calc.standby import generator_fault_a
from ..findings import Finding
from ..model import Job
from ..results import DiagramStandby, Results, Sheet
from .compare import compare

GENERATOR_FAULT_SOURCE = "IEEE Std 141-1993 ch. 4; IEEE Std 242-2001 ch. 2"
# sources of the switch checks (from memory: the clause numbers of the 2023 edition)
SWITCH_RATING_SOURCE = "common practice, no source (UL 1008 rates the switch's current)"
SWITCH_WITHSTAND_SOURCE = (
    "NFPA 70-2023 110.10, 700.5(E), 701.5(D); UL 1008 withstand and closing rating"
)


def standby_source_fault(gen) -> float:
    """The generator's first-cycle fault current at its terminals [A]."""
    v = gen.voltage
    return float(generator_fault_a(gen.rating_va, v.voltage_ll_v, gen.xdss_pct, gen.x_r, v.phases))


def check_switch_and_generator(job: Job, normal: Results, standby: Results) -> None:
    """Add the switch's and the generator's findings, sheet and method to ``normal``."""
    gen, ts = job.generator, job.transfer_switch
    node = next(n for n in normal.nodes if n.id == ts.panel_id).values
    normal.findings += [
        _switch_rating(ts, node),
        _switch_withstand(ts, node),
        _generator_fault(job),
        _generator_size(job, node),
        _generator_ground_fault(job),
    ]
    normal.sheets[gen.id] = _generator_sheet(job)
    normal.assumptions.append(
        f"Standby position: generator {gen.id}'s first-cycle (subtransient) current is used "
        "for the maximum and the minimum figures; its current then falls toward the "
        "transient and steady-state values (held up only by its excitation support), so "
        "a time-delayed trip on generator power needs the manufacturer's decrement curve."
    )
    normal.methods.append(
        (
            f"Standby position: generator {gen.id} through transfer switch {ts.id} feeds "
            f"{ts.panel_id} and everything below it; the generator is a source of "
            'I = I_rated / x"d (first cycle) with its X/R, and every figure below the '
            "switch is computed for both positions (maximum duty: the worse; minimum "
            "fault and trip checks: the lesser; drops: each)",
            GENERATOR_FAULT_SOURCE,
        )
    )


def _switch_rating(ts, node: dict) -> Finding:
    current = node.get("design_current_a", node.get("load_a"))
    return compare(
        current,
        ts.rating_a,
        "at_most",
        {"rule_id": "ats-rating", "status": "fail"},
        ts.id,
        "transfer switch rating vs load",
        "A",
        f"design current of {ts.panel_id} (continuous at 125 %) vs the switch's "
        f"{ts.rating_a:g} A rating ({SWITCH_RATING_SOURCE})",
    )


def _switch_withstand(ts, node: dict) -> Finding:
    duty = max(node.get(k, 0.0) for k in ("fault_max_a", "standby_fault_max_a"))
    check = "transfer switch withstand vs available fault"
    if ts.withstand_a is None:
        return Finding(
            ts.id,
            check,
            duty,
            None,
            "A",
            "warn",
            "ats-withstand",
            "not evaluated: the switch's withstand and closing rating is not given "
            f"(transfer_switch.withstand); the available fault at the switch is "
            f"{duty / 1000:.2f} kA ({SWITCH_WITHSTAND_SOURCE})",
        )
    governs = node.get("fault_max_governs", "normal")
    return compare(
        duty,
        ts.withstand_a,
        "at_most",
        {"rule_id": "ats-withstand", "status": "fail"},
        ts.id,
        check,
        "A",
        f"maximum available fault at the switch ({governs} position governs) vs its "
        f"withstand and closing rating ({SWITCH_WITHSTAND_SOURCE})",
    )


def _generator_fault(job: Job) -> Finding:
    gen = job.generator
    return Finding(
        gen.id,
        "generator fault contribution",
        standby_source_fault(gen),
        None,
        "A",
        "info",
        "generator-fault",
        f'I = I_rated / |z"| = {_rated_a(gen):.1f} A / {_z_pu(gen):.4f} at the terminals, '
        f'first cycle (x"d {gen.xdss_pct / 100:g} with R = X"d / {gen.x_r:g}; '
        f"{GENERATOR_FAULT_SOURCE})",
    )


def _generator_size(job: Job, node: dict) -> Finding:
    gen, ts = job.generator, job.transfer_switch
    load = node.get("load_va", 0.0)
    kw = (
        f"; its {gen.rating_w / 1000:g} kW rating is to be held against the real load"
        if gen.rating_w
        else ""
    )
    return Finding(
        gen.id,
        "generator size vs demand (information)",
        load,
        gen.rating_va,
        "VA",
        "info",
        "generator-size",
        f"demand of {ts.panel_id} and below {load / 1000:.1f} kVA is "
        f"{100 * load / gen.rating_va:.0f} % of the generator's {gen.rating_va / 1000:g} kVA"
        f"{kw}; motor starting and load steps decide a generator's size as much as the "
        "demand (information, not a pass)",
    )


def _generator_ground_fault(job: Job) -> Finding:
    gen = job.generator
    return Finding(
        gen.id,
        "line-to-ground fault on the generator",
        None,
        None,
        "A",
        "warn",
        "generator-lg",
        "not computed: a line-to-ground fault on the generator's own system needs its "
        "negative- and zero-sequence reactances and its neutral grounding "
        "(IEEE Std 242-2001 ch. 2, symmetrical components); the standby position's "
        "line-to-ground figures and instantaneous-trip checks on that system are not "
        "evaluated (those below a delta-wye transformer are)",
    )


def _z_pu(gen) -> float:
    return gen.xdss_pct / 100 * (1 + 1 / gen.x_r**2) ** 0.5


def _z_pu(gen) -> float:
    """|z"| per unit: x"d with the armature resistance X"d / (X/R)."""
    return gen.xdss_pct / 100 * (1 + 1 / gen.x_r**2) ** 0.5


def _rated_a(gen) -> float:
    v = gen.voltage
    return gen.rating_va / (SQRT3 * v.voltage_ll_v if v.phases == 3 else v.voltage_ll_v)


def _generator_sheet(job: Job) -> Sheet:
    gen = job.generator
    sh = Sheet(gen.id, "generator", f"Standby generator {gen.id}")
    sh.inputs += [
        (
            "Rating",
            f"{gen.rating_va / 1000:g} kVA"
            + (f", {gen.rating_w / 1000:g} kW" if gen.rating_w else ""),
        ),
        ("Voltage", gen.voltage.text),
        ('Subtransient reactance X"d', f"{gen.xdss_pct:g} %, X/R {gen.x_r:g}"),
        ("Transfer switch", f"{job.transfer_switch.id} at {job.transfer_switch.panel_id}"),
    ]
    rated = _rated_a(gen)
    sh.step(
        "Rated current",
        "I_rated = S / (√3 · V_LL)",
        f"{gen.rating_va:,.0f} / (√3 · {gen.voltage.voltage_ll_v:g})",
        rated,
        "A",
    )
    sh.step(
        "First-cycle fault current at the terminals",
        'I = I_rated / |z"|, |z"| = x"d · √(1 + (R/X)²)',
        f"{rated:,.1f} / {_z_pu(gen):.4f}",
        standby_source_fault(gen),
        "A",
        "generator-fault",
    )
    return sh


def diagram_standby(job: Job, standby: Results) -> DiagramStandby:
    """The switch and the generator as the one-line draws them."""
    gen, ts = job.generator, job.transfer_switch
    normal_run = next(r.id for r in job.runs if r.to_id == ts.panel_id)
    return DiagramStandby(
        ts.id,
        ts.rating_a,
        ts.panel_id,
        normal_run,
        gen.id,
        gen.rating_va,
        gen.xdss_pct,
        standby.diagram.run(gen.id),
        standby_source_fault(gen),
    )
