"""240/120 V four-wire delta with a high leg (issue 14 item 5): the marking and position
notes, the per-leg fault figures and the per-leg drops of a run.

* 110.15: the high leg (208 V to neutral) is durably marked orange or otherwise where
  the neutral is present; 408.3(E)(1): it is the B phase in panelboards. Both are
  stated once per high-leg node (info findings citing rules high-leg-marking and
  high-leg-position).
* 120 V loads belong on the legs beside the neutral tap (A and C): a one-pole schedule
  circuit in a B space fails (rule sched-high-leg, checks/schedule_circuits.py) and a
  120/240 V panel fed from the system takes C-A (checks/loads.py, inputs/feed_rules.py).
* Faults per leg (calc/fault_high_leg.py): A or C to neutral and B to neutral, maximum
  (node values ``fault_ln_max_a``, ``fault_high_leg_max_a``); the minimum line-to-
  neutral loop uses the lower bound of both legs (:data:`MIN_ROOT_SHARE`).
* Drops per leg of a run (``vdrop_a_pct``, ``vdrop_b_pct``, ``vdrop_c_pct``): A and C as
  120 V circuits, 2 · I_leg · Z · L / 120 V (all of the leg's current taken back on the
  neutral: an upper bound); B, which carries only line-to-line and three-phase load,
  √3 · I_B · Z · L / 240 V.
"""

from __future__ import annotations

import math

from ..calc import fault_high_leg as hl
from ..model import HIGH_LEG

# share of Z_Δ = 3·Z_Y behind a 120 V source that bounds both the A/C-N and the B-N loop
# from below (B-N: 208 V behind 3/4·Z_Δ ≡ 120 V behind √3/4·Z_Δ, with the conductors
# scaled down by 1/√3 ≤ 1): the minimum line-to-neutral fault of the trip check
MIN_ROOT_SHARE = max(hl.K_AN, hl.K_BN / math.sqrt(3.0))


def min_root_ohm(z_wye_ohm: complex) -> complex:
    """Thévenin impedance at 120 V for the minimum line-to-neutral walk [Ω]."""
    return MIN_ROOT_SHARE * 3.0 * complex(z_wye_ohm)


def note_high_legs(ctx) -> None:
    """The marking (110.15) and position (408.3(E)(1)) notes, once per high-leg node."""
    for n in ctx.tree.order:
        v = ctx.tree.voltage_of[n]
        if v.kind != "highleg":
            continue
        high_v = math.sqrt(3.0) / 2.0 * v.voltage_ll_v
        ctx.add(
            n,
            "high-leg marking",
            high_v,
            None,
            "V",
            "info",
            "high-leg-marking",
            f"{v.text}: the high leg ({high_v:.0f} V to neutral) is durably marked orange or "
            "by other effective means wherever the neutral is present (110.15)",
        )
        ctx.add(
            n,
            "high-leg position",
            None,
            None,
            "",
            "info",
            "high-leg-position",
            f"the high leg is the {HIGH_LEG} phase of panelboards and switchboards "
            f"(408.3(E)(1)); 120 V loads go on A and C, beside the neutral tap",
        )


def max_per_leg(ctx, n: str, v, z_wye_ohm: complex, z_line_ohm: complex, c: float):
    """A/C-N and B-N maximum fault currents at node ``n`` [A] (neutral of phase size),
    with the node value of the high leg and the sheet steps."""
    i_a, i_b = hl.high_leg_faults_a(v.voltage_ll_v, z_wye_ohm, z_line_ohm, z_line_ohm, c)
    sh = ctx.sheet(n, ctx.tree.kind[n], "")
    if v.kind == "split":  # a 120/240 V panel on the A-C legs: no high leg in it
        sh.step(
            "Line to neutral fault, maximum (on the A-C legs of a high-leg delta)",
            "I = c·(V_LL/2) / |5/12·Z_Δ + Z_line + Z_neutral|, Z_Δ = 3·Z_Y",
            f"{c:g} × {v.voltage_ll_v / 2:g} V",
            round(float(i_a)),
            "A",
        )
        return float(i_a), float(i_b)
    ctx.nodes[n].values["fault_high_leg_max_a"] = float(i_b)
    zd = 3.0 * complex(z_wye_ohm)
    sh.step(
        "A or C to neutral fault, maximum (high-leg delta)",
        "I = c·(V_LL/2) / |5/12·Z_Δ + Z_line + Z_neutral|, Z_Δ = 3·Z_Y",
        f"{c:g} × {v.voltage_ll_v / 2:g} / |{hl.K_AN:.4f} × {abs(zd) * 1e3:.3f} mΩ + "
        f"2 × {abs(z_line_ohm) * 1e3:.3f} mΩ|",
        round(float(i_a)),
        "A",
    )
    sh.step(
        f"High leg ({HIGH_LEG}) to neutral fault, maximum",
        "I = c·(√3/2·V_LL) / |3/4·Z_Δ + Z_line + Z_neutral|",
        f"{c:g} × {math.sqrt(3) / 2 * v.voltage_ll_v:.1f} / |0.75 × {abs(zd) * 1e3:.3f} mΩ + "
        f"2 × {abs(z_line_ohm) * 1e3:.3f} mΩ|",
        round(float(i_b)),
        "A",
    )
    ctx.method(
        "Line-to-neutral faults of a 240/120 V high-leg delta: Thévenin equivalent of the "
        "delta windings (Z_Δ = 3·Z_Y, the tapped winding in halves): A or C to neutral "
        "5/12·Z_Δ behind V_LL/2, high leg to neutral 3/4·Z_Δ behind √3/2·V_LL",
        "IEEE Std 141-1993 ch. 4 (network reduction); equal winding impedances assumed",
    )
    ctx.assume(
        "High-leg delta: equal winding impedances, the tapped winding split in halves of "
        "half its impedance (an upper bound of the maximum line-to-neutral figures), the "
        "neutral the size of the phase conductors."
    )
    return float(i_a), float(i_b)


def leg_drops(ctx, run, ph, r: float, x: float, pf: float) -> None:
    """Per-leg drops of a run on a high-leg system [% of the leg's voltage]."""
    feed = ph.feed_cont_a + ph.feed_non_a
    z = (r * pf + x * math.sqrt(max(0.0, 1.0 - pf * pf))) * run.length_m / run.sets
    v = ctx.tree.voltage_of[run.from_id]
    out = {}
    for j, leg in enumerate("ABC"):
        if leg == HIGH_LEG:
            out[leg] = math.sqrt(3.0) * feed[j] * z / v.voltage_ll_v * 100.0
        else:
            out[leg] = 2.0 * feed[j] * z / v.voltage_ln_v * 100.0
    values = ctx.run_values.setdefault(run.id, {})
    values.update({f"vdrop_{k.lower()}_pct": float(p) for k, p in out.items()})
    ctx.sheet(run.id, "run", "").step(
        "Drop per leg (high-leg delta)",
        "A, C: 2·I·Z·L / 120 V (all of the leg's current back on the neutral); "
        f"{HIGH_LEG}: √3·I·Z·L / {v.voltage_ll_v:g} V",
        ", ".join(f"{k} {feed[j]:.1f} A" for j, k in enumerate("ABC")),
        ", ".join(f"{k} {p:.2f} %" for k, p in out.items()),
        "",
    )
