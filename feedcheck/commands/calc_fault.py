"""``feedcheck calc fault``: available fault current at a transformer secondary and at the
end of one run — maximum and minimum, line-to-ground, asymmetry, and the point-to-point
figure beside the ohmic one.

Thin: parse the options into an in-memory one-transformer job (source → transformer
``T`` → run ``R`` → panel ``P``), run the same checks as ``feedcheck check`` on it and
print their figures and the instantaneous-trip finding. Heavy modules are imported inside
the command.
"""

from __future__ import annotations

import inspect
import math

import click

from .. import CAUTION
from ..calc.constants import M_PER_FT
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
    renamed_option,
    sets_option,
)

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


def _pickup(book, device_type: str, device_a: float) -> tuple[float, float, str]:
    """Typical instantaneous pick-up of the device type at its rating: (multiple,
    tolerance %, rule id) from tables/instantaneous_pickup.csv."""
    row = next(
        (
            row
            for row in book.rows("instantaneous_pickup")
            if row["device_type"] == device_type
            and row["rating_from_a"] <= device_a <= row["rating_to_a"]
        ),
        None,
    )
    if row is None:
        _fail(
            f"no row of tables/instantaneous_pickup.csv for --device-type {device_type} "
            f"at {device_a:g} A; give --pickup-multiple"
        )
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


ONE_TRANSFORMER_JOB = tuple(inspect.signature(one_transformer_job).parameters)


def compute(*args, **kwargs):
    """Every figure the command prints, as a dict (no printing), read from the results of
    the same checks as `feedcheck check` on :func:`one_transformer_job` (same arguments)."""
    from ..calc.fault import motor_contribution_a
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
    nodes = {node.id: node.values for node in res.nodes}
    split = secondary.kind in ("split", "single")
    c_max = 1.0 if factors == "none" else book.rule(FACTOR_ROWS[factors]).number()
    c_min = 1.0 if factors == "none" else book.fault.c_min
    out = dict(
        c_max=c_max,
        c_min=c_min,
        split=split,
        phases=1 if split else 3,
        rated_a=rated_current_a(kva, secondary.voltage_ll_v, 1 if split else 3),
        ptp_warn_pct=book.fault.ptp_disagree_pct,
        findings=res.findings,
    )
    if length_m is not None:
        cd = book.conductors
        from ..calc.conductor import ac_impedance_ohm_per_m
        from ..calc.point_to_point import conductor_constant_a_ft_per_v

        t_max = book.fault.cond_temp_max_c
        r20, x20 = ac_impedance_ohm_per_m(size.name, material, raceway, conductor_c=t_max, data=cd)
        out["run"] = dict(
            c_const=conductor_constant_a_ft_per_v(r20, x20),
            t_max=t_max,
            t_min=max(book.fault.cond_temp_min_c, 75.0),
        )
    rows = []
    for name, nid in (("secondary terminals", "T"), ("end of run", "P")):
        if nid not in nodes:
            continue
        values = nodes[nid]
        motor = values.get("fault_motor_a", 0.0)
        row = dict(
            name=name,
            max_a=values["fault_max_a"] - motor,
            min_a=values["fault_min_a"],
            x_r=values["x_r"],
            peak_a=values["peak_a"],
            asym_a=values["asym_rms_a"],
            ptp_a=values["fault_ptp_a"],
            ptp_diff_pct=values["fault_ptp_diff_pct"],
            with_motor_a=values["fault_max_a"],
            motor_a=motor,
            duty_a=values["fault_duty_a"],
            duty_case=values["fault_duty_case"],
        )
        for key, mine in (
            ("fault_ln_max_a", "ln_max_a"),
            ("fault_lg_min_a", "lg_min_a"),
            ("fault_lg_max_a", "lg_max_a"),
        ):
            if key in values:
                row[mine] = values[key]
        rows.append(row)
    if motor_flc:
        out["motor_multiple"] = book.fault.motor_multiple
        if length_m is None:  # no panel to hang the motors on: added at full magnitude
            rows[0]["motor_a"] = float(motor_contribution_a(motor_flc, book.fault.motor_multiple))
            rows[0]["with_motor_a"] = rows[0]["max_a"] + rows[0]["motor_a"]
    out["rows"] = rows
    return out


@click.command("fault", help=HELP, context_settings={"help_option_names": ["-h", "--help"]})
@renamed_option(
    "--rating", "rating_va", "--kva", "kva_old", APPARENT_POWER, "Transformer rating, e.g. 75kVA."
)
@click.option("--primary", type=VOLTAGE_SYSTEM, required=True, help='e.g. "480 V delta".')
@click.option(
    "--secondary", type=VOLTAGE_SYSTEM, required=True, help='e.g. "208Y/120 V" or "120/240 V".'
)
@renamed_option(
    "--impedance", "z_pct", "--z", "z_old", IMPEDANCE_PCT, "Nameplate impedance, e.g. 5.1%."
)
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
@sets_option("Parallel sets (one grounding conductor in each raceway).")
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
def fault_command(**options):
    """(click passes every option by its name; see the decorators above)"""
    options["kva"] = merge_spellings(
        "--rating", options.pop("rating_va"), "--kva", options.pop("kva_old"), required=True
    )
    options["z"] = merge_spellings(
        "--impedance", options.pop("z_pct"), "--z", options.pop("z_old"), required=True
    )
    _check_combinations(options)
    from ..errors import InputError

    try:
        job, given, pickup = _job_arguments(options)
        res = compute(**job)
    except (ValueError, InputError) as exc:
        _fail(str(exc))
    _print_inputs(job, given, res)
    click.echo("")
    _print_rows(res, job["motor_flc"])
    if job["device_a"] is not None:
        _print_trip(res, job["device_a"], pickup)
        if job["ground"] is None and job["length_m"] is not None:
            click.echo(
                "  (no --ground: the return is taken as a conductor of the phase size; "
                "a smaller grounding conductor or a raceway return gives less current)"
            )
    click.echo("")
    click.echo(
        "Ohmic: I = c·V/|Z| with complex Z (source + transformer + run); line-to-ground by "
        "symmetrical components, delta–wye Z0 = transformer Z0 only."
    )
    click.echo("Point-to-point: magnitudes add (no X/R), so it reads at or below the ohmic figure.")
    click.echo(CAUTION)


def _check_combinations(options) -> None:
    """Options that only make sense together (UsageError otherwise)."""
    has_length, has_size = options["length_m"] is not None, options["size"] is not None
    if has_length != has_size:
        raise click.UsageError("give both --length and --size for a run, or neither")
    if options["ground"] is not None and not has_length:
        raise click.UsageError("--ground needs a run (--length and --size)")
    if options["primary"].phases == 1 and options["secondary"].phases == 3:
        raise click.UsageError("a single-phase --primary cannot feed a three-phase --secondary")


def _job_arguments(options) -> tuple[dict, dict, tuple | None]:
    """The arguments of :func:`one_transformer_job` with the defaults filled from the rule
    book, where X/R and the tolerance came from, and the pick-up used (None without
    --device)."""
    from ..rulebook import current_rulebook

    book = current_rulebook()
    job = {name: options.get(name) for name in ONE_TRANSFORMER_JOB}
    given = {
        "x_r": "given" if job["x_r"] is not None else "typical, tables/transformer_xr.csv",
        "tolerance": "given" if job["tolerance_pct"] is not None else "rule fault-z-tolerance",
    }
    if job["x_r"] is None:
        job["x_r"] = book.transformer_xr.typical(job["kva"])[0]
    if job["tolerance_pct"] is None:
        job["tolerance_pct"] = book.rule("fault-z-tolerance").number()
    pickup = None
    device_a = job["device_a"]
    if device_a is not None:
        if options["pickup_multiple"] is not None:
            pickup = (options["pickup_multiple"], 0.0, "given setting")
        else:
            pickup = _pickup(book, options["device_type"], device_a)
        job["instantaneous_a"] = device_a * pickup[0] * (1 + pickup[1] / 100.0)
    job["material"], job["raceway"] = job["material"].lower(), job["raceway"].lower()
    return job, given, pickup


def _print_inputs(job, given, res) -> None:
    """The transformer, the source and the run as the figures were computed."""
    source_fault = job["source_fault"]
    source = (
        "infinite"
        if math.isinf(source_fault)
        else f"{source_fault / 1e3:g} kA, X/R {job['source_x_r']:g}"
    )
    click.echo(
        f"Transformer {job['kva'] / 1e3:g} kVA {job['primary'].text} → "
        f"{job['secondary'].text}, %Z {job['z']:g} (tolerance ±{job['tolerance_pct']:g} %, "
        f"{given['tolerance']}), X/R {job['x_r']:g} ({given['x_r']}); source {source}"
    )
    click.echo(
        f"Rated secondary current {res['rated_a']:.1f} A; c_max = {res['c_max']:g}, "
        f"c_min = {res['c_min']:g}"
    )
    if "run" in res:
        run, length_m, ground = res["run"], job["length_m"], job["ground"]
        click.echo(
            f"Run: {length_m:.2f} m ({length_m / M_PER_FT:.0f} ft) of {job['size'].name} "
            f"{job['material']} in {job['raceway']}, {job['sets']} set(s)"
            + (f", grounding conductor {ground.name}" if ground else "")
            + f"; R at {run['t_max']:g} °C (max) and "
            f"{run['t_min']:g} °C (min); C = {run['c_const']:.0f} A·ft/V"
        )


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
        diff = round(row["ptp_diff_pct"], 1) + 0.0  # + 0.0: never "-0.0"
        out(
            f"  point-to-point       {row['ptp_a']:>10,.0f} A   {diff:+.1f} % vs "
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
        finding
        for finding in res["findings"]
        if finding.subject == "P" and finding.check == "ground fault trips instantaneously"
    ]
    if not hit:
        click.echo(
            "\nInstantaneous-trip check skipped: no line-to-ground figure at the end of "
            "a run (ungrounded or delta secondary, or no run given)"
        )
        return
    finding = hit[0]
    verdict = (
        "trips instantaneously" if finding.status == "ok" else "does NOT reach instantaneous pickup"
    )
    click.echo(
        f"\nDevice {device_a:g} A, pickup {mult:g} × (+{tol:g} %) = {finding.limit:,.0f} A "
        f"({rid}): minimum line-to-ground {finding.value:,.0f} A → {verdict} "
        f"(ratio {finding.value / finding.limit:.2f})"
    )
    if finding.status != "ok" and "; " in finding.note:
        click.echo("  " + finding.note.split("; ", 1)[1])
