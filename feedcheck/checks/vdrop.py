"""Voltage drop from the source to every panel: transformer regulation (with its
tap) and each run's drop by the exact phasor form, the approximate form beside it;
limits as rules; the smallest conductor that would pass. The motor starting dip follows
(checks/motor_start.py)."""

from __future__ import annotations

import math

import numpy as np

from ..calc import conductor as ck
from ..calc import transformer as tk
from ..calc import vdrop as vk
from ..calc.sizes import AWG_KCMIL_ORDER, METRIC_ORDER, SIZES
from .compare import passes
from .context import Context
from .deliverable import COLLAPSED_PCT, source_voltage_pct, transformer_collapsed
from .drop_rules import DropLimit, job_drop_limits
from .high_leg import leg_drops
from .impedance import ac_impedance_ohm_per_m
from .loads import lines_of
from .motor_start import check_motor_starting

OPERATING_C = 75.0  # conductor temperature for steady-state drop (75 °C terminations)


def drop_limits(ctx: Context) -> dict[str, DropLimit]:
    """Feeder, branch and total limits for this job (rule rows, or the job's own)."""
    return job_drop_limits(ctx.job, ctx.rules)


def check_voltage_drop(ctx: Context) -> None:
    job, tree = ctx.job, ctx.tree
    limits = drop_limits(ctx)
    tx = {t.id: t for t in job.transformers}
    src_pct = source_voltage_pct(ctx, limits["feeder"].rule_id)
    v_pct: dict[str, float] = {"source": src_pct}
    cond_drop: dict[str, float] = {"source": 0.0}  # conductor drop since the transformer [%]
    ctx.method(
        "Voltage drop of a run, exact phasor form: VD = Es + IR cos θ + IX sin θ − "
        "√(Es² − (IX cos θ − IR sin θ)²); approximate form k·I·(R cos θ + X sin θ) "
        "shown beside it",
        "IEEE Std 141-1993 ch. 3; UFC 3-520-01",
    )
    ctx.method(
        "Transformer regulation with the primary held at its actual voltage: "
        "E_r = √(E_s² − b²) − a (per unit)",
        "IEEE Std C57.12.80 definition; IEEE Std 141-1993 ch. 3",
    )
    ctx.assume(
        "Steady-state voltage drop uses each node's demand load at its power factor, "
        f"conductors at {OPERATING_C:g} °C, and a source whose open-circuit voltage is "
        "nominal, less the drop of the total demand through the source impedance."
    )
    ctx.nodes["source"].values.update(
        {
            "voltage_pct": src_pct,
            "vdrop_pct": 100.0 - src_pct,
            "voltage_v": job.source.voltage.voltage_ll_v * src_pct / 100.0,
        }
    )
    for n in tree.order[1:]:
        p = tree.parent_node[n]
        v = tree.voltage_of[n]
        run = tree.parent_run.get(n)
        load = ctx.loads[n]
        pct = v_pct[p]
        sheet = ctx.sheet(n, tree.kind[n], "")
        if pct <= 0.0:  # the voltage collapsed upstream: nothing below can be computed
            v_pct[n], cond_drop[n] = 0.0, COLLAPSED_PCT
            _collapsed_upstream(ctx, n, limits)
            continue
        if run is not None:
            pv = tree.voltage_of[p]
            seg = _run_drop(ctx, run, pv, load, pct, limits, cond_drop[p])
            pct -= seg
            cond_drop_here = cond_drop[p] + seg
        else:
            cond_drop_here = cond_drop[p]
        if tree.kind[n] == "transformer":
            pct = _transformer_regulation(ctx, tx[n], load, pct, sheet)
            cond_drop_here = 0.0 if pct > 0.0 else COLLAPSED_PCT
        v_pct[n] = pct
        cond_drop[n] = cond_drop_here
        ctx.nodes[n].values.update(
            {
                "voltage_pct": pct,
                "vdrop_pct": 100.0 - pct,
                "conductor_vdrop_pct": cond_drop_here,
                "voltage_v": v.voltage_ll_v * pct / 100.0,
            }
        )
        if tree.kind[n] == "panel":
            _panel_total_finding(ctx, n, cond_drop_here, pct, limits["total"])
    check_motor_starting(ctx)


def _collapsed_upstream(ctx: Context, n: str, limits) -> None:
    """Figures and finding of a node below a collapsed voltage: nothing is computed."""
    ctx.nodes[n].values.update(
        {
            "voltage_pct": 0.0,
            "vdrop_pct": 100.0,
            "voltage_v": 0.0,
            "conductor_vdrop_pct": COLLAPSED_PCT,
        }
    )
    ctx.add(
        n,
        "voltage drop",
        None,
        None,
        "%",
        "info",
        limits["feeder"].rule_id,
        f"not computed: the voltage collapsed upstream of {n}",
    )


def _transformer_regulation(ctx: Context, t, load, pct: float, sheet) -> float:
    """Secondary voltage of a transformer under load [% of nominal] (0: collapsed), with
    its calculation step; ``pct`` the voltage applied to the primary [% of nominal]."""
    r_pct, x_pct = tk.impedance_parts_pct(t.z_pct, t.x_r)
    frac = load.va / t.rating_va
    # nameplate convention: a "+" tap (above normal) has more primary turns, so
    # the secondary sits lower: E_s = E_applied / (1 + tap) (calc/taps.py)
    sending = pct / 100.0 / (1 + t.tap_pct / 100.0)
    try:
        reg = tk.secondary_drop_pct_exact(r_pct, x_pct, frac, load.pf, sending)
    except ValueError:
        reg = 100.0 * sending  # no real secondary voltage: the load cannot be served
    if not 100 * sending - reg > 0.0:
        reg = 100.0 * sending
        transformer_collapsed(ctx, t.id, t, load, "xfmr-loading")
    sheet.step(
        "Secondary voltage under load (primary at its actual voltage, tap "
        f"{t.tap_pct:+g} %: + lowers the secondary, nameplate convention)",
        "E_r = √(E_s² − b²) − a; a = n(r cos φ + x sin φ), b = n(x cos φ − r sin φ)",
        f"E_s = {sending:.4f} pu, n = {frac:.3f}, cos φ = {load.pf:.3f}",
        100 * sending - reg,
        "% of nominal",
    )
    ctx.nodes[t.id].values["transformer_drop_pct"] = reg
    return 100 * sending - reg


def _panel_total_finding(ctx: Context, n: str, cond_drop: float, pct: float, lim) -> None:
    """The feeder conductors' drop since the transformer (or the service point),
    held against the total limit."""
    start = "transformer" if ctx.tree.upstream_transformer[n] else "service point"
    ctx.compare(
        n,
        f"conductor voltage drop since the {start}",
        cond_drop,
        lim.max_pct,
        "%",
        "at_most",
        lim.rule_id,
        f"{'feeder' if start == 'transformer' else 'service and feeder'} conductors "
        f"from the {start} to {n}: {cond_drop:.2f} % "
        f"(the panel stands at {pct:.2f} % of nominal including "
        f"{'transformer regulation' if start == 'transformer' else 'the source'}"
        f"); branch circuits must fit in the rest of the "
        f"{lim.max_pct:g} % total",
        fail_status=lim.status,
    )


def _run_drop(
    ctx: Context, run, pv, load, sending_pct: float, limits, upstream_pct: float = 0.0
) -> float:
    """Drop of one run [% of nominal], with its findings and calculation steps.

    The feeder limit is held against the feeder as a whole (issue 13 item 6): the runs
    from the transformer secondary (or the source) to the run's receiving end, this run
    included (``upstream_pct`` the conductor drop before it), as the informational
    notes of 215.2(A) count it."""
    kind = vk.circuit_of_system(pv.kind, pv.phases)
    ph = ctx.phases[run.to_id]
    if ph.single_phase_feed:  # a single-phase unit on two lines of a three-phase feed
        kind = "1ph2w"
    feed = ph.feed_cont_a + ph.feed_non_a
    current = float(feed.max()) if load.va > 0 else 0.0  # the heaviest line
    pf = load.pf
    r, x = ac_impedance_ohm_per_m(
        run.size.name, run.material, run.raceway, OPERATING_C, data=ctx.rules.conductors
    )
    r, x = float(r), float(x)
    sending_v = pv.voltage_ll_v * sending_pct / 100.0
    approx_v = float(vk.voltage_drop_approximate_v(current, r, x, run.length_m, pf, kind, run.sets))
    try:
        exact_v = (
            float(
                vk.voltage_drop_exact_circuit_v(
                    sending_v, current, r, x, run.length_m, pf, kind, run.sets
                )
            )
            if current > 0
            else 0.0
        )
    except ValueError:  # the run cannot carry this load at all: its voltage collapses
        _run_collapsed(ctx, run, pv, limits["feeder"], (current, pf, kind))
        return sending_pct
    pct = 100.0 * exact_v / pv.voltage_ll_v
    approx_pct = 100.0 * approx_v / pv.voltage_ll_v
    rid = limits["feeder"].rule_id
    _run_steps(ctx, run, pv, load, (r, x, current, pf, kind), (approx_v, exact_v, sending_v), rid)
    ctx.run_values.setdefault(run.id, {}).update(
        {
            "current_a": current,
            "vdrop_v": exact_v,
            "vdrop_pct": pct,
            "vdrop_approx_pct": approx_pct,
            "length_m": run.length_m,
        }
    )
    if pv.kind == "highleg":
        leg_drops(ctx, run, ph, r, x, pf)
    figures = (pct, approx_pct, current, pf, kind)
    _feeder_finding(ctx, run, pv, limits["feeder"], upstream_pct, figures)
    return pct


def _run_collapsed(ctx: Context, run, pv, lim, figures) -> None:
    """Finding and figures of a run that cannot deliver its load (the voltage collapses)."""
    current, pf, kind = figures
    ctx.add(
        run.id,
        "feeder voltage drop",
        100.0,
        lim.max_pct,
        "%",
        "fail",
        lim.rule_id,
        f"{current:.0f} A over {ctx.length(run.length_m)} of {run.size.name}: the "
        "load cannot be delivered (the voltage collapses); "
        + _smallest_passing(ctx, run, current, pf, kind, lim.max_pct, pv.voltage_ll_v),
    )
    ctx.run_values.setdefault(run.id, {}).update(
        {"current_a": current, "vdrop_pct": 100.0, "length_m": run.length_m}
    )


def _run_steps(ctx: Context, run, pv, load, run_figures, drops, rule_id: str) -> None:
    """The calculation steps of one run's drop on its sheet."""
    r, x, current, pf, kind = run_figures
    approx_v, exact_v, sending_v = drops
    ph = ctx.phases[run.to_id]
    feed = ph.feed_cont_a + ph.feed_non_a
    pct = 100.0 * exact_v / pv.voltage_ll_v
    sh = ctx.sheet(run.id, "run", f"Run {run.id} ({run.from_id} → {run.to_id})")
    kk = {"3ph": "√3", "1ph2w": "2", "1ph3w": "2", "ln4w": "2"}[kind]
    three = pv.phases == 3 and not ph.single_phase_feed
    sh.step(
        "Load current on the run (heaviest line)",
        "I = S / (√3·V_LL)" if three else "I = S / V_LL (single-phase)",
        f"{load.va:,.0f} VA / ({'√3 × ' if three else ''}{pv.voltage_ll_v:g} V)"
        + ("" if _balanced(feed, pv) else "; lines " + _lines_text(feed)),
        current,
        "A",
    )
    sh.step(
        f"R and X per conductor at {OPERATING_C:g} °C ({run.raceway})",
        "NFPA 70 Ch. 9 Table 9 (temperature-corrected)",
        f"r = {r * 304.8:.4f} Ω/kft, x = {x * 304.8:.4f} Ω/kft",
        "",
        "",
    )
    sh.step(
        "Voltage drop, approximate",
        f"VD = {kk} · I · L · (R cos θ + X sin θ) / sets",
        f"{kk} × {current:.1f} × {run.length_m:.1f} m × ({r * 1e3:.4f} × {pf:.3f} + "
        f"{x * 1e3:.4f} × {math.sqrt(max(0.0, 1 - pf * pf)):.3f}) mΩ/m / {run.sets}",
        approx_v,
        "V",
    )
    sh.step(
        "Voltage drop, exact phasor (used for checks)",
        "VD = Es + IR cos θ + IX sin θ − √(Es² − (IX cos θ − IR sin θ)²)",
        f"Es = {sending_v:.1f} V",
        exact_v,
        "V",
    )
    sh.step(
        "Percent drop",
        "VD / V_nominal × 100",
        f"{exact_v:.2f} / {pv.voltage_ll_v:g} × 100",
        pct,
        "%",
        rule_id,
    )


def _feeder_finding(ctx: Context, run, pv, lim, upstream_pct: float, figures) -> None:
    """The feeder-drop finding of a run: the feeder as a whole up to its receiving end."""
    pct, approx_pct, current, pf, kind = figures
    cum = upstream_pct + pct
    ok = passes(cum, lim.max_pct, "at_most")
    note = (
        f"{pct:.2f} % (approximate form {approx_pct:.2f} %) at {current:.0f} A over "
        f"{ctx.length(run.length_m)}"
    )
    if upstream_pct > 0:
        note += (
            f", plus {upstream_pct:.2f} % in the feeder runs before it: {cum:.2f} % for "
            "the feeder as a whole"
        )
        ctx.run_values[run.id]["feeder_vdrop_pct"] = cum
    if not ok:
        room = max(lim.max_pct - upstream_pct, 1e-6)
        note += "; " + _smallest_passing(ctx, run, current, pf, kind, room, pv.voltage_ll_v)
    ctx.compare(
        run.id,
        "feeder voltage drop",
        cum,
        lim.max_pct,
        "%",
        "at_most",
        lim.rule_id,
        note,
        fail_status=lim.status,
    )


def _balanced(feed, pv) -> bool:
    used = feed[: lines_of(pv)]
    return bool(used.max() - used.min() <= 1e-9 * max(1.0, used.max()))


def _lines_text(feed) -> str:
    return " / ".join(f"{x} {a:.1f} A" for x, a in zip("ABC", feed.tolist(), strict=True))


def _smallest_passing(ctx, run, current, pf, kind, limit_pct, nominal_v) -> str:
    order = AWG_KCMIL_ORDER if run.size.system == "awg" else METRIC_ORDER
    names = [s for s in order if SIZES[s].area_mm2 >= run.size.area_mm2 * (1 - 1e-9)]
    r, x = ck.ac_impedance_ohm_per_m(
        np.array(names), run.material, run.raceway, OPERATING_C, data=ctx.rules.conductors
    )
    r, x = np.asarray(r), np.asarray(x)  # candidates; the first is the run's own size
    idx = int(
        vk.min_conductor_index(
            current,
            r,
            x,
            run.length_m,
            pf,
            limit_pct / 100.0 * nominal_v,
            kind,
            run.sets,
        )
    )
    max_len = float(
        vk.max_length_m(
            current,
            r[0],
            x[0],
            pf,
            limit_pct / 100.0 * nominal_v,
            kind,
            run.sets,
        )
    )
    size_text = (
        f"smallest conductor that passes: {names[idx]} {run.material.capitalize()}"
        if idx >= 0
        else f"no {run.material.capitalize()} size up to {names[-1]} passes with {run.sets} set(s)"
    )
    return f"{size_text}; with {run.size.name} the run may be at most {ctx.length(max_len)}"
