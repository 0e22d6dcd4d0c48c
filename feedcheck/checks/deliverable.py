"""Can the feed deliver its load at all? The source's own drop, and collapse.

The voltage walk (:mod:`.vdrop`) starts from the voltage at the source point under the
job's whole demand: the source impedance (from its available fault current and X/R)
carries the load current, and its drop by the exact phasor form is taken off before the
first transformer. Where a source, a transformer or a run cannot deliver its load (no
real receiving voltage: the load current is beyond what the impedance can pass), the
answer is a failing finding and a voltage of zero below it — never a negative voltage
or a drop of thousands of percent.
"""

from __future__ import annotations

import math

from ..calc import vdrop as vk
from ..calc.constants import SQRT3
from ..calc.power import current_from_apparent_power_a
from .context import Context
from .impedance import source_impedance

COLLAPSED_PCT = 100.0  # conductor drop handed below a node whose voltage collapsed


def source_voltage_pct(ctx: Context, rule_id: str) -> float:
    """Voltage at the source point under the job's total demand [% of nominal].

    The source impedance Z_s = V_LL / (√3 · I_sc), split by X/R (IEEE Std 141-1993
    ch. 4), carries the total demand current; its drop is the exact phasor form
    (IEEE Std 141-1993 ch. 3) with the source's open-circuit voltage at nominal. An
    infinite source drops nothing. Returns 0 and adds a failing finding when the
    source cannot deliver the load.
    """
    job = ctx.job
    src = job.source
    load = ctx.loads["source"]
    z = source_impedance(job)
    if load.va <= 0 or z == 0 or not math.isfinite(abs(z)):
        return 100.0
    v_ll, phases = src.voltage.voltage_ll_v, src.voltage.phases
    current = current_from_apparent_power_a(load.va, v_ll, phases)
    if phases == 3:
        kind, r, x = "3ph", z.real, z.imag
    else:  # single-phase loop: I_sc = V / Z_loop, Z_loop = √3 · Z_s; two conductors
        kind, r, x = "1ph2w", z.real * SQRT3 / 2, z.imag * SQRT3 / 2
    sheet = ctx.sheet("source", "source", "")
    try:
        drop_v = float(vk.voltage_drop_exact_circuit_v(v_ll, current, r, x, 1.0, load.pf, kind))
    except ValueError:
        drop_v = math.inf
    if not drop_v < v_ll:
        ctx.add(
            "source",
            "source voltage under load",
            0.0,
            None,
            "%",
            "fail",
            rule_id,
            f"the source ({src.fault_a:,.0f} A available fault current) cannot deliver "
            f"{current:,.0f} A at power factor {load.pf:.2f}: no real voltage remains",
        )
        return 0.0
    pct = 100.0 * (1.0 - drop_v / v_ll)
    if src.given_as == "generator":
        return _generator_held(ctx, pct, current, load.pf)
    sheet.step(
        "Voltage at the source point under the total demand (source impedance)",
        "Z_s = V_LL / (√3 · I_sc); VD exact phasor form with I = S / (√3·V_LL)",
        f"|Z_s| = {abs(z) * 1e3:.4f} mΩ, I = {current:,.1f} A, cos θ = {load.pf:.3f}",
        pct,
        "% of nominal",
        rule_id,
    )
    return pct


def _generator_held(ctx: Context, pct: float, current: float, pf: float) -> float:
    """A generator's regulator holds its terminal voltage in steady state: the drop is
    counted from its terminals. The drop of the whole demand through X"d is the dip
    when the load is taken at once (information)."""
    ctx.add(
        "source",
        "voltage dip on taking the whole load at once",
        100.0 - pct,
        None,
        "%",
        "info",
        "generator-dip",
        f"{current:,.0f} A at power factor {pf:.2f} through the generator's subtransient "
        "impedance; in steady state its voltage regulator holds the terminal voltage, "
        "so the drops below are counted from its terminals (common practice, no source)",
    )
    return 100.0


def transformer_collapsed(ctx: Context, node: str, t, load, rule_id: str) -> None:
    """A failing finding: the transformer leaves no real secondary voltage under its load."""
    ctx.add(
        node,
        "transformer voltage under load",
        0.0,
        None,
        "%",
        "fail",
        rule_id,
        f"{t.id} cannot deliver {load.va / 1000:.1f} kVA "
        f"({load.va / t.rating_va:.1f} × its rating through {t.z_pct:g} %Z): "
        "no real secondary voltage remains",
    )
