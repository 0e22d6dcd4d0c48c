"""``feedcheck calc fault``: available fault current at a transformer secondary and at the
end of one run — maximum and minimum, line-to-ground, asymmetry, and the point-to-point
figure beside the ohmic one.

Thin: parse the options into an in-memory one-transformer job (source → transformer
``T`` → run ``R`` → panel ``P``), run the same checks as ``feedcheck check`` on it and
print their figures and the instantaneous-trip finding. Heavy modules are imported inside
the command.
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
DEVICE_TYPES = (
    "breaker-tm",
    "breaker-tm-adj",
    "breaker-electronic",
    "fuse-time-delay",
    "fuse-fast",
)
# --factors → the job option voltage_factor, and the c_max row it reads
FACTORS = {"none": "none", "iec-6pct": "iec60909", "iec-10pct": "iec60909-10pct"}
FACTOR_ROWS = {"iec-6pct": "fault-c-max-6pct", "iec-10pct": "fault-c-max-10pct"}

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

    rows = [
        r
        for r in load_table("instantaneous_pickup").records()
        if r["device_type"] == device_type and r["rating_from_a"] <= device_a <= r["rating_to_a"]
    ]
    if not rows:
        _fail(
            f"no row of tables/instantaneous_pickup.csv for --device-type {device_type} "
            f"at {device_a:g} A; give --pickup-multiple"
        )
    row = rows[0]
    return float(row["multiple"]), float(row["tolerance_pct"]), str(row["rule_id"])


def one_transformer_job(
    kva,
    primary,
    secondary,
    z,
    x_r,
    source_fault,
    source_x_r,
    tolerance_pct,
    factors,
    length_m,
    size,
    material,
    raceway,
    sets,
    ground,
    motor_flc,
    instantaneous_a=None,
    device_a=None,
):
    """The command's options as an in-memory job: the source, one transformer ``T`` and,
    with a run, the run ``R`` to a panel ``P`` (the motors and the device at ``P``)."""
    from pathlib import Path

    from ..inputs.tree import build_tree
    from ..model import Job, Motor, Options, Panel, Project, Run, Source, Transformer

    source = Source(primary, source_fault, source_x_r)
    tx = (Transformer("T", "source", kva, primary, secondary, z, x_r, 1.0, None),)
    runs, panels, motors = (), (), ()
    if length_m is not None:
        runs = (
            Run(
                "R",
                "T",
                "P",
                length_m,
                size,
                material,
                sets,
                75.0,
                raceway,
                30.0,
                3,
                ground,
                material,
                device_a,
                None,
            ),
        )
        panels = (
            Panel(
                "P",
                device_a or 1.0,
                None,
                None,
                None,
                None,
                None,
                0.0,
                1.0,
                instantaneous_a=instantaneous_a,
            ),
        )
        if motor_flc:
            motors = (Motor("M", "P", motor_flc, None, None),)
    return Job(
        Path("calc-fault.toml"),
        Project("feedcheck calc fault"),
        source,
        tx,
        runs,
        panels,
        build_tree(source, tx, runs, panels),
        motors,
        Options(impedance_tolerance_pct=tolerance_pct, voltage_factor=FACTORS[factors]),
    )


def compute(*args, **kwargs):
    """Every figure the command prints, as a dict (no printing), read from the results of
    the same checks as `feedcheck check` on :func:`one_transformer_job` (same arguments)."""
    import inspect

    from ..calc import fault as F
    from ..calc.transformer import rated_current_a
    from ..checks import check_job
    from ..rulebook import current_rulebook

    given = inspect.signature(one_transformer_job).bind(*args, **kwargs).arguments
    kva, secondary, factors = given["kva"], given["secondary"], given["factors"]
    length_m, motor_flc = given["length_m"], given["motor_flc"]
    size, material, raceway = given["size"], given["material"], given["raceway"]
    book = current_rulebook()
    job = one_transformer_job(*args, **kwargs)
    res = check_job(job, rules=book)
    nodes = {n.id: n.values for n in res.nodes}
    split = secondary.kind in ("split", "single")
    c_max = 1.0 if factors == "none" else book.rule(FACTOR_ROWS[factors]).number()
    c_min = 1.0 if factors == "none" else book.fault.c_min
    out = dict(
        c_max=c_max,
        c_min=c_min,
        split=split,
        phases=1 if split else 3,
        rated_a=rated_current_a(kva, secondary.line_v, 1 if split else 3),
        ptp_warn_pct=book.fault.ptp_disagree_pct,
        findings=res.findings,
    )
    if length_m is not None:
        cd = book.conductors
        from ..calc.conductor import ac_impedance_ohm_per_m

        t_max = book.fault.cond_temp_max_c
        r20, x20 = ac_impedance_ohm_per_m(size.name, material, raceway, conductor_c=t_max, data=cd)
        out["run"] = dict(
            c_const=F.conductor_constant_a_ft_per_v(r20, x20),
            t_max=t_max,
            t_min=max(book.fault.cond_temp_min_c, 75.0),
        )
    rows = []
    for name, nid in (("secondary terminals", "T"), ("end of run", "P")):
        if nid not in nodes:
            continue
        v = nodes[nid]
        motor = v.get("fault_motor_a", 0.0)
        row = dict(
            name=name,
            max_a=v["fault_max_a"] - motor,
            min_a=v["fault_min_a"],
            x_r=v["x_r"],
            peak_a=v["peak_a"],
            asym_a=v["asym_rms_a"],
            ptp_a=v["fault_ptp_a"],
            ptp_diff_pct=v["fault_ptp_diff_pct"],
            with_motor_a=v["fault_max_a"],
            motor_a=motor,
            duty_a=v["fault_duty_a"],
            duty_case=v["fault_duty_case"],
        )
        for key, mine in (
            ("fault_ln_max_a", "ln_max_a"),
            ("fault_lg_min_a", "lg_min_a"),
            ("fault_lg_max_a", "lg_max_a"),
        ):
            if key in v:
                row[mine] = v[key]
        rows.append(row)
    if motor_flc:
        out["motor_multiple"] = book.fault.motor_multiple
        if length_m is None:  # no panel to hang the motors on: added at full magnitude
            rows[0]["motor_a"] = float(F.motor_contribution_a(motor_flc, book.fault.motor_multiple))
            rows[0]["with_motor_a"] = rows[0]["max_a"] + rows[0]["motor_a"]
    out["rows"] = rows
    return out


@click.command("fault", help=HELP, context_settings={"help_option_names": ["-h", "--help"]})
@click.option(
    "--rating",
    "rating_va",
    type=APPARENT_POWER,
    default=None,
    help="Transformer rating, e.g. 75kVA.  [required]",
)
@old_spelling("--kva", "kva_old", "--rating", APPARENT_POWER)
@click.option("--primary", type=VOLTAGE_SYSTEM, required=True, help='e.g. "480 V delta".')
@click.option(
    "--secondary", type=VOLTAGE_SYSTEM, required=True, help='e.g. "208Y/120 V" or "120/240 V".'
)
@click.option(
    "--impedance",
    "z_pct",
    type=IMPEDANCE_PCT,
    default=None,
    help="Nameplate impedance, e.g. 5.1%.  [required]",
)
@old_spelling("--z", "z_old", "--impedance", IMPEDANCE_PCT)
@click.option(
    "--x-r",
    "x_r",
    type=click.FloatRange(min=0.0, min_open=True),
    default=None,
    help="Transformer X/R; default: typical value from tables/transformer_xr.csv.",
)
@click.option(
    "--source-fault",
    type=SOURCE_CURRENT,
    default="infinite",
    show_default=True,
    help="Available three-phase fault current at the primary, e.g. 30kA, or infinite.",
)
@click.option(
    "--source-x-r",
    type=click.FloatRange(min=0.0, min_open=True),
    default=6.0,
    show_default=True,
    help="Source X/R (assumed when not known).",
)
@click.option(
    "--tolerance",
    "tolerance_pct",
    type=TOLERANCE,
    default=None,
    help="Impedance tolerance; default 7.5% (IEEE C57.12.00); 10% is common for dry-type units.",
)
@click.option(
    "--factors",
    type=click.Choice(list(FACTORS)),
    default="none",
    show_default=True,
    help="IEC 60909 voltage factors: none (c = 1), iec-6pct (c_max 1.05, c_min 0.95) "
    "or iec-10pct (c_max 1.10, c_min 0.95).",
)
@click.option("--length", "length_m", type=LENGTH, default=None, help='Run length, e.g. "95 ft".')
@click.option("--size", type=SIZE, default=None, help='Phase conductor size, e.g. "4/0 AWG".')
@click.option("--material", type=MATERIAL, default="cu", show_default=True)
@click.option("--raceway", type=RACEWAY, default="steel", show_default=True)
@click.option(
    "--sets",
    type=click.IntRange(min=1),
    default=1,
    show_default=True,
    help="Parallel sets (one grounding conductor in each raceway).",
)
@click.option(
    "--ground",
    type=SIZE,
    default=None,
    help='Equipment grounding conductor size, e.g. "4 AWG" (same material as the '
    "phases; the line-to-ground return path).",
)
@click.option(
    "--motor-flc",
    type=CURRENT,
    default=None,
    help="Total full-load current of motors at the far end (adds 4 × FLC).",
)
@click.option(
    "--device",
    "device_a",
    type=CURRENT,
    default=None,
    help="Rating of the device protecting the run, for the instantaneous-trip check.",
)
@click.option(
    "--device-type",
    type=click.Choice(DEVICE_TYPES),
    default="breaker-tm",
    show_default=True,
    help="Picks the typical pickup multiple from tables/instantaneous_pickup.csv.",
)
@click.option(
    "--pickup-multiple",
    type=click.FloatRange(min=0.0, min_open=True),
    default=None,
    help="Actual instantaneous setting as a multiple of --device (overrides the table).",
)
def fault_command(
    rating_va,
    kva_old,
    primary,
    secondary,
    z_pct,
    z_old,
    x_r,
    source_fault,
    source_x_r,
    tolerance_pct,
    factors,
    length_m,
    size,
    material,
    raceway,
    sets,
    ground,
    motor_flc,
    device_a,
    device_type,
    pickup_multiple,
):
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
        inst_a = None
        if device_a is not None:
            if pickup_multiple is not None:
                pickup = (pickup_multiple, 0.0, "given setting")
            else:
                pickup = _pickup(device_type, device_a)
            inst_a = device_a * pickup[0] * (1 + pickup[1] / 100.0)
        res = compute(
            kva,
            primary,
            secondary,
            z_pct,
            x_r,
            source_fault,
            source_x_r,
            tolerance_pct,
            factors,
            length_m,
            size,
            material.lower(),
            raceway.lower(),
            sets,
            ground,
            motor_flc,
            inst_a,
            device_a,
        )
    except (ValueError, InputError) as exc:
        _fail(str(exc))
    out = click.echo
    src = (
        "infinite" if math.isinf(source_fault) else f"{source_fault / 1e3:g} kA, X/R {source_x_r:g}"
    )
    out(
        f"Transformer {kva / 1e3:g} kVA {primary.text} → {secondary.text}, %Z {z_pct:g} "
        f"(tolerance ±{tolerance_pct:g} %, {tol_src}), X/R {x_r:g} ({x_src}); source {src}"
    )
    out(
        f"Rated secondary current {res['rated_a']:.1f} A; c_max = {res['c_max']:g}, "
        f"c_min = {res['c_min']:g}"
    )
    if "run" in res:
        run = res["run"]
        out(
            f"Run: {length_m:.2f} m ({length_m / FT:.0f} ft) of {size.name} {material} in "
            f"{raceway}, {sets} set(s)"
            + (f", grounding conductor {ground.name}" if ground else "")
            + f"; R at {run['t_max']:g} °C (max) and "
            f"{run['t_min']:g} °C (min); C = {run['c_const']:.0f} A·ft/V"
        )
    out("")
    _print_rows(res, motor_flc)
    if device_a is not None:
        _print_trip(res, device_a, pickup)
        if ground is None and length_m is not None:
            click.echo(
                "  (no --ground: the return is taken as a conductor of the phase size; "
                "a smaller grounding conductor or a raceway return gives less current)"
            )
    out("")
    out(
        "Ohmic: I = c·V/|Z| with complex Z (source + transformer + run); line-to-ground by "
        "symmetrical components, delta–wye Z0 = transformer Z0 only."
    )
    out("Point-to-point: magnitudes add (no X/R), so it reads at or below the ohmic figure.")
    out(CAUTION)


def _print_rows(res, motor_flc) -> None:
    out = click.echo
    head = "line-to-line" if res["split"] else "three-phase"
    for row in res["rows"]:
        out(f"At the {row['name']}:")
        out(f"  {head} maximum   {row['max_a']:>10,.0f} A   X/R {row['x_r']:.2f}")
        out(f"  {head} minimum   {row['min_a']:>10,.0f} A")
        if "ln_max_a" in row:
            out(
                f"  line-to-neutral max  {row['ln_max_a']:>10,.0f} A   (half winding: "
                "1.5 × %R, 1.2 × %X)"
            )
        if "lg_max_a" in row:
            out(f"  line-to-ground max   {row['lg_max_a']:>10,.0f} A")
        if "lg_min_a" in row:
            out(f"  line-to-ground min   {row['lg_min_a']:>10,.0f} A")
        out(f"  peak (κ·√2·I)        {row['peak_a']:>10,.0f} A")
        out(f"  asym. RMS ½ cycle    {row['asym_a']:>10,.0f} A")
        flag = (
            "  (differs by more than " + f"{res['ptp_warn_pct']:g} %)"
            if abs(row["ptp_diff_pct"]) > res["ptp_warn_pct"]
            else ""
        )
        out(
            f"  point-to-point       {row['ptp_a']:>10,.0f} A   {row['ptp_diff_pct']:+.1f} % vs "
            f"ohmic maximum{flag}"
        )
        if motor_flc:
            out(
                f"  with motors          {row['with_motor_a']:>10,.0f} A   "
                f"(+ {res['motor_multiple']:g} × {motor_flc:g} A FLC, added at full magnitude)"
            )
        out(f"  interrupting duty    {row['duty_a']:>10,.0f} A   ({row['duty_case']} governs)")


def _print_trip(res, device_a, pickup) -> None:
    """The instantaneous-trip line from the check's own finding at the end of the run."""
    mult, tol, rid = pickup
    hit = [
        f
        for f in res["findings"]
        if f.subject == "P" and f.check == "ground fault trips instantaneously"
    ]
    if not hit:
        click.echo(
            "\nInstantaneous-trip check skipped: no line-to-ground figure at the end of "
            "a run (ungrounded or delta secondary, or no run given)"
        )
        return
    f = hit[0]
    verdict = "trips instantaneously" if f.status == "ok" else "does NOT reach instantaneous pickup"
    click.echo(
        f"\nDevice {device_a:g} A, pickup {mult:g} × (+{tol:g} %) = {f.limit:,.0f} A "
        f"({rid}): minimum line-to-ground {f.value:,.0f} A → {verdict} "
        f"(ratio {f.value / f.limit:.2f})"
    )
    if f.status != "ok" and "; " in f.note:
        click.echo("  " + f.note.split("; ", 1)[1])
