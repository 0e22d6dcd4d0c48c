"""``feedcheck calc fault``: available fault current at a transformer secondary and at the
end of one run — maximum and minimum, line-to-ground, asymmetry, and the point-to-point
figure beside the ohmic one.

Thin: parse the options, look up conductor R and X and the rule rows, call the kernels in
:mod:`feedcheck.calc.fault` and :mod:`feedcheck.calc.fault_lg`, print. Heavy modules are
imported inside the command.
"""

from __future__ import annotations

import math

import click

from .. import CAUTION
from .params import (
    APPARENT_POWER,
    CURRENT,
    IMPEDANCE_PCT,
    LENGTH,
    MATERIAL,
    RACEWAY,
    SIZE,
    VOLTAGE_SYSTEM,
    QuantityType,
    merge_spellings,
    old_spelling,
)

FT = 0.3048  # m per international foot (exact)
SOURCE_CURRENT = QuantityType("current", allow_inf=True)
TOLERANCE = QuantityType("percent", must_be_positive=False)
DEVICE_TYPES = ("breaker-tm", "breaker-tm-adj", "breaker-electronic", "fuse-time-delay",
                "fuse-fast")
FACTORS = {"none": None, "iec-6pct": "fault-c-max-6pct", "iec-10pct": "fault-c-max-10pct"}

HELP = f"""Available fault current at a transformer's secondary terminals and, with a
run, at the run's far end: maximum and minimum three-phase (single-phase: line-to-line
and line-to-neutral), minimum line-to-ground on a grounded secondary, X/R, peak and
half-cycle asymmetrical current, and the point-to-point figure beside the ohmic one.

\b
Maximum: transformer %Z at its lower tolerance, conductors at 20 °C.
Minimum: %Z at its upper tolerance, conductors at 75 °C (tables/fault_assumptions.csv).
Ohmic:   I = c·V_LL/(√3·|Z_source + Z_transformer + Z_run|)      (IEEE Std 141 ch. 4)
Line-to-ground: I = 3·c·V_LN/|Z1 + Z2 + Z0|, run Z0 = Z_phase + 3·Z_ground
Peak:    i_p = κ·√2·I, κ = 1.02 + 0.98·e^(−3R/X)                 (IEC 60909-0)
Asym.:   I·√(1 + 2·e^(−2π/(X/R))) at one half cycle
Point-to-point: f = √3·L·I/(C·n·V_LL), M = 1/(1 + f)

\b
Example:
  feedcheck calc fault --rating 75kVA --primary "480 V delta" --secondary "208Y/120 V" \\
      --impedance 5.1% --x-r 3.5 --source-fault 30kA --source-x-r 6 \\
      --length "95 ft" --size "4/0 AWG" --material cu --raceway steel --ground "4 AWG" \\
      --device 225A --device-type breaker-tm

{CAUTION}
"""


def _fail(msg: str) -> None:
    click.echo(f"error: {msg}", err=True)
    click.get_current_context().exit(2)


def _rule(rule_id: str) -> float:
    from ..tables import rule

    return float(rule("fault_assumptions", rule_id)["value"])


def _pickup(device_type: str, device_a: float) -> tuple[float, float, str]:
    from ..tables import load_table

    t = load_table("instantaneous_pickup").data
    rows = t[(t["device_type"] == device_type) & (t["rating_from_a"] <= device_a)
             & (device_a <= t["rating_to_a"])]
    if rows.empty:
        _fail(f"no row of tables/instantaneous_pickup.csv for --device-type {device_type} "
              f"at {device_a:g} A; give --pickup-multiple")
    row = rows.iloc[0]
    return float(row["multiple"]), float(row["tolerance_pct"]), str(row["rule_id"])


def compute(kva, primary, secondary, z, x_r, source_fault, source_x_r, tolerance_pct, factors,
            length_m, size, material, raceway, sets, ground, motor_flc):
    """Every figure the command prints, as a dict (no printing)."""
    from ..calc import fault as F
    from ..calc import fault_lg as G
    from ..calc.transformer import rated_current_a

    c_max = 1.0 if FACTORS[factors] is None else _rule(FACTORS[factors])
    c_min = 1.0 if FACTORS[factors] is None else _rule("fault-c-min")
    split = secondary.kind in ("split", "single")
    ph = 1 if split else 3
    vs, vp = secondary.line_v, primary.line_v
    zt_max, zt_min = F.transformer_fault_impedances_ohm(kva, vs, z, x_r, tolerance_pct, ph)
    zs = F.refer_impedance_ohm(F.source_impedance_ohm(vp, source_fault, source_x_r), vp, vs)
    out = dict(c_max=c_max, c_min=c_min, split=split, phases=ph, zs=zs, zt_max=zt_max,
               zt_min=zt_min, rated_a=rated_current_a(kva, vs, ph))
    run = None
    if length_m is not None:
        from ..calc.conductor import ac_impedance_ohm_per_m
        from ..rulebook import current_rulebook

        cd = current_rulebook().conductors
        t_max, t_min = _rule("fault-cond-temp-max"), _rule("fault-cond-temp-min")
        r20, x20 = ac_impedance_ohm_per_m(size.name, material, raceway, conductor_c=t_max, data=cd)
        rhot, xhot = ac_impedance_ohm_per_m(size.name, material, raceway, conductor_c=t_min, data=cd)
        run = dict(z_max=F.branch_impedance_ohm(length_m, r20, x20, sets),
                   z_min=F.branch_impedance_ohm(length_m, rhot, xhot, sets),
                   c_const=F.conductor_constant_a_ft_per_v(r20, x20), t_max=t_max, t_min=t_min)
        if ground is not None:  # one grounding conductor per raceway: the sets share the return
            rg, xg = ac_impedance_ohm_per_m(ground.name, material, raceway, conductor_c=t_min,
                                            data=cd)
            run["z_ground"] = F.branch_impedance_ohm(length_m, rg, xg, sets)
        out["run"] = run
    zero = 0j
    points = [("secondary terminals", zero, zero, zero)]
    if run is not None:
        points.append(("end of run", run["z_max"], run["z_min"], run.get("z_ground")))
    tol = tolerance_pct
    if split:
        m = _rule("fault-split-ln-multiplier")
        zll_max, zln_max = F.split_phase_source_ohm(zt_max, m)
        zll_min, zln_min = F.split_phase_source_ohm(zt_min, m)
        zs_ll = 2.0 * zs  # a single-phase unit draws through two source lines
        zs_ln = zs_ll * (secondary.neutral_v / vs) ** 2 if secondary.neutral_v else None
        out["ln_multiplier"] = m
        # the primary's line-to-line fault current feeds a single-phase unit: √3/2 × 3-phase
        ptp_ll = F.ptp_secondary_current_a(out["rated_a"], z, tol, source_fault * math.sqrt(3)
                                           / 2.0, vp, vs)
    else:
        ptp_ll = F.ptp_secondary_current_a(out["rated_a"], z, tol, source_fault, vp, vs)
    rows = []
    for name, zr_max, zr_min, zg in points:
        row = dict(name=name)
        if split:
            zmax, zmin = zs_ll + zll_max + 2 * zr_max, zs_ll + zll_min + 2 * zr_min
            row["max_a"] = F.fault_current_1ph_a(vs, zmax, c_max)
            row["min_a"] = F.fault_current_1ph_a(vs, zmin, c_min)
            if zs_ln is not None:
                vn = secondary.neutral_v
                row["ln_max_a"] = F.fault_current_1ph_a(vn, zs_ln + zln_max + 2 * zr_max, c_max)
                # minimum line-to-ground: back on the grounding conductor (or the neutral)
                zret = zr_min if zg is None else zg
                row["lg_min_a"] = F.fault_current_1ph_a(vn, zs_ln + zln_min + zr_min + zret,
                                                        c_min)
        else:
            zmax, zmin = zs + zt_max + zr_max, zs + zt_min + zr_min
            row["max_a"] = F.fault_current_3ph_a(vs, zmax, c_max)
            row["min_a"] = F.fault_current_3ph_a(vs, zmin, c_min)
            if secondary.grounded_wye and (zg is not None or name == "secondary terminals"):
                z0_t = G.transformer_zero_sequence_ohm(zt_min, _rule("fault-z0-ratio-min"))
                z1 = zs + zt_min + zr_min
                z0 = z0_t + (G.run_zero_sequence_ohm(zr_min, zg) if zg is not None else 0j)
                row["lg_min_a"] = G.fault_current_lg_a(secondary.neutral_v, z1, z0, c=c_min)
                row["z_lg_sum"] = 2 * z1 + z0
        row["x_r"] = F.x_r_ratio(zmax)
        row["peak_a"] = F.peak_current_a(row["max_a"], row["x_r"])
        row["asym_a"] = F.asymmetric_rms_half_cycle_a(row["max_a"], row["x_r"])
        rows.append(row)
    # point-to-point, maximum case (same tolerance and 20 °C impedance data as the ohmic max)
    rows[0]["ptp_a"] = c_max * ptp_ll
    if run is not None:
        kind, v = ("1ph-ll", vs) if split else ("3ph", vs)
        rows[1]["ptp_a"] = float(F.ptp_chain_a(rows[0]["ptp_a"], [length_m], [run["c_const"]],
                                               [sets], v, kind)[0])
    for row in rows:
        row["ptp_diff_pct"] = F.percent_difference(row["ptp_a"], row["max_a"])
    if motor_flc:
        mult = _rule("fault-motor-multiple")
        out["motor_a"] = F.motor_contribution_a(motor_flc, mult)
        out["motor_multiple"] = mult
    out["rows"] = rows
    out["ptp_warn_pct"] = _rule("fault-ptp-disagree")
    return out


@click.command("fault", help=HELP, context_settings={"help_option_names": ["-h", "--help"]})
@click.option("--rating", "rating_va", type=APPARENT_POWER, default=None,
              help="Transformer rating, e.g. 75kVA.  [required]")
@old_spelling("--kva", "kva_old", "--rating", APPARENT_POWER)
@click.option("--primary", type=VOLTAGE_SYSTEM, required=True, help='e.g. "480 V delta".')
@click.option("--secondary", type=VOLTAGE_SYSTEM, required=True,
              help='e.g. "208Y/120 V" or "120/240 V".')
@click.option("--impedance", "z_pct", type=IMPEDANCE_PCT, default=None,
              help="Nameplate impedance, e.g. 5.1%.  [required]")
@old_spelling("--z", "z_old", "--impedance", IMPEDANCE_PCT)
@click.option("--x-r", "x_r", type=click.FloatRange(min=0.0, min_open=True), default=None,
              help="Transformer X/R; default: typical value from tables/transformer_xr.csv.")
@click.option("--source-fault", type=SOURCE_CURRENT, default="infinite", show_default=True,
              help="Available three-phase fault current at the primary, e.g. 30kA, or infinite.")
@click.option("--source-x-r", type=click.FloatRange(min=0.0, min_open=True), default=6.0,
              show_default=True, help="Source X/R (assumed when not known).")
@click.option("--tolerance", "tolerance_pct", type=TOLERANCE, default=None,
              help="Impedance tolerance; default 7.5% (IEEE C57.12.00); 10% is common for "
                   "dry-type units.")
@click.option("--factors", type=click.Choice(list(FACTORS)), default="none", show_default=True,
              help="IEC 60909 voltage factors: none (c = 1), iec-6pct (c_max 1.05, c_min 0.95) "
                   "or iec-10pct (c_max 1.10, c_min 0.95).")
@click.option("--length", "length_m", type=LENGTH, default=None, help='Run length, e.g. "95 ft".')
@click.option("--size", type=SIZE, default=None, help='Phase conductor size, e.g. "4/0 AWG".')
@click.option("--material", type=MATERIAL, default="cu", show_default=True)
@click.option("--raceway", type=RACEWAY, default="steel", show_default=True)
@click.option("--sets", type=click.IntRange(min=1), default=1, show_default=True,
              help="Parallel sets (one grounding conductor in each raceway).")
@click.option("--ground", type=SIZE, default=None,
              help='Equipment grounding conductor size, e.g. "4 AWG" (same material as the '
                   'phases; the line-to-ground return path).')
@click.option("--motor-flc", type=CURRENT, default=None,
              help="Total full-load current of motors at the far end (adds 4 × FLC).")
@click.option("--device", "device_a", type=CURRENT, default=None,
              help="Rating of the device protecting the run, for the instantaneous-trip check.")
@click.option("--device-type", type=click.Choice(DEVICE_TYPES), default="breaker-tm",
              show_default=True, help="Picks the typical pickup multiple from "
                                      "tables/instantaneous_pickup.csv.")
@click.option("--pickup-multiple", type=click.FloatRange(min=0.0, min_open=True), default=None,
              help="Actual instantaneous setting as a multiple of --device (overrides the table).")
def fault_command(rating_va, kva_old, primary, secondary, z_pct, z_old, x_r, source_fault,
                  source_x_r, tolerance_pct, factors, length_m, size, material, raceway, sets,
                  ground, motor_flc, device_a, device_type, pickup_multiple):
    kva = merge_spellings("--rating", rating_va, "--kva", kva_old, required=True)
    z_pct = merge_spellings("--impedance", z_pct, "--z", z_old, required=True)
    run_opts = [length_m is not None, size is not None]
    if any(run_opts) and not all(run_opts):
        raise click.UsageError("give both --length and --size for a run, or neither")
    if ground is not None and length_m is None:
        raise click.UsageError("--ground needs a run (--length and --size)")
    if primary.phases == 1 and secondary.phases == 3:
        raise click.UsageError("a single-phase --primary cannot feed a three-phase --secondary")
    from ..errors import InputError
    from ..rulebook import current_rulebook

    try:
        x_src = "given" if x_r is not None else "typical, tables/transformer_xr.csv"
        x_r = x_r if x_r is not None else current_rulebook().transformer_xr.typical(kva)[0]
        tol_src = "given" if tolerance_pct is not None else "rule fault-z-tolerance"
        tolerance_pct = tolerance_pct if tolerance_pct is not None else _rule("fault-z-tolerance")
        res = compute(kva, primary, secondary, z_pct, x_r, source_fault, source_x_r,
                      tolerance_pct, factors, length_m, size, material.lower(), raceway.lower(),
                      sets, ground, motor_flc)
    except (ValueError, InputError) as exc:
        _fail(str(exc))
    out = click.echo
    split = res["split"]
    src = ("infinite" if math.isinf(source_fault)
           else f"{source_fault / 1e3:g} kA, X/R {source_x_r:g}")
    out(f"Transformer {kva / 1e3:g} kVA {primary.text} → {secondary.text}, %Z {z_pct:g} "
        f"(tolerance ±{tolerance_pct:g} %, {tol_src}), X/R {x_r:g} ({x_src}); source {src}")
    out(f"Rated secondary current {res['rated_a']:.1f} A; c_max = {res['c_max']:g}, "
        f"c_min = {res['c_min']:g}")
    if "run" in res:
        run = res["run"]
        out(f"Run: {length_m:.2f} m ({length_m / FT:.0f} ft) of {size.name} {material} in "
            f"{raceway}, {sets} set(s)" + (f", grounding conductor {ground.name}" if ground
                                           else "") + f"; R at {run['t_max']:g} °C (max) and "
            f"{run['t_min']:g} °C (min); C = {run['c_const']:.0f} A·ft/V")
    out("")
    head = "line-to-line" if split else "three-phase"
    for row in res["rows"]:
        out(f"At the {row['name']}:")
        out(f"  {head} maximum   {row['max_a']:>10,.0f} A   X/R {row['x_r']:.2f}")
        out(f"  {head} minimum   {row['min_a']:>10,.0f} A")
        if "ln_max_a" in row:
            out(f"  line-to-neutral max  {row['ln_max_a']:>10,.0f} A   (half winding, "
                f"{res['ln_multiplier']:g} × line-to-line at the terminals)")
        if "lg_min_a" in row:
            out(f"  line-to-ground min   {row['lg_min_a']:>10,.0f} A")
        out(f"  peak (κ·√2·I)        {row['peak_a']:>10,.0f} A")
        out(f"  asym. RMS ½ cycle    {row['asym_a']:>10,.0f} A")
        flag = "  (differs by more than " + f"{res['ptp_warn_pct']:g} %)" \
            if abs(row["ptp_diff_pct"]) > res["ptp_warn_pct"] else ""
        out(f"  point-to-point       {row['ptp_a']:>10,.0f} A   {row['ptp_diff_pct']:+.1f} % vs "
            f"ohmic maximum{flag}")
    if "motor_a" in res:
        last = res["rows"][-1]
        out(f"  with motors          {last['max_a'] + res['motor_a']:>10,.0f} A   "
            f"(+ {res['motor_multiple']:g} × {motor_flc:g} A FLC, added at full magnitude)")
    if device_a is not None:
        from ..calc.fault_lg import instantaneous_trip_check

        last = res["rows"][-1]
        if "lg_min_a" not in last:
            out("\nInstantaneous-trip check skipped: no line-to-ground figure (ungrounded or "
                "delta secondary, or no --ground for the run)")
        else:
            if pickup_multiple is not None:
                mult, tol, rid = pickup_multiple, 0.0, "given setting"
            else:
                mult, tol, rid = _pickup(device_type, device_a)
            chk = instantaneous_trip_check(last["lg_min_a"], device_a, mult, tol)
            verdict = ("trips instantaneously" if chk.trips
                       else "does NOT reach instantaneous pickup")
            out(f"\nDevice {device_a:g} A, pickup {mult:g} × (+{tol:g} %) = "
                f"{chk.required_a:,.0f} A ({rid}): minimum line-to-ground "
                f"{last['lg_min_a']:,.0f} A → {verdict} "
                f"(ratio {chk.margin:.2f})")
            if not chk.trips and "run" in res and "z_lg_sum" in last:
                _fix_hint(res, last, secondary, length_m, sets, chk.required_a)
    out("")
    out("Ohmic: I = c·V/|Z| with complex Z (source + transformer + run); line-to-ground by "
        "symmetrical components, delta–wye Z0 = transformer Z0 only.")
    out("Point-to-point: magnitudes add (no X/R), so it reads at or below the ohmic figure.")
    out(CAUTION)


def _fix_hint(res, last, secondary, length_m, sets, required_a) -> None:
    from ..calc import fault_lg as G

    run = res["run"]
    zp, zg = run["z_min"] / length_m, run["z_ground"] / length_m
    up = last["z_lg_sum"] - 3.0 * length_m * (zp + zg)
    lmax = G.max_length_for_trip_m(secondary.neutral_v, up, zp, zg, required_a, c=res["c_min"])
    rmax = G.max_return_resistance_for_trip_ohm_per_m(secondary.neutral_v, up, length_m, zp,
                                                      zg.imag, required_a, c=res["c_min"])
    click.echo(f"  would trip with this run up to {lmax:.1f} m ({lmax / FT:.0f} ft) long, or with "
               f"a return path of at most {rmax * 304.8 * sets:.4f} Ω per 1000 ft per "
               "grounding conductor" if rmax > 0 else
               f"  would trip with this run up to {lmax:.1f} m ({lmax / FT:.0f} ft) long; no "
               "grounding conductor alone fixes it")
