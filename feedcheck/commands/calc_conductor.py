"""``feedcheck calc ampacity`` and ``feedcheck calc size``: one run's ampacity chain, and
the smallest conductor meeting every criterion.

Thin: parse options, call :mod:`feedcheck.calc.ampacity` / :mod:`feedcheck.calc.selection`,
print. Kernels are imported inside the command bodies so the CLI starts fast.
"""

from __future__ import annotations

import click

from .. import CAUTION
from .params import (
    CONTEXT,
    CURRENT,
    LENGTH,
    MATERIAL,
    PERCENT,
    RACEWAY,
    SIZE,
    TIME,
    QuantityType,
    current_carrying_option,
    sets_option,
    temperature_option,
)

LOAD = QuantityType("current", must_be_positive=False)  # a load may be 0 A; checked below


AMPACITY_HELP = f"""Allowable ampacity of one conductor run, shown as a chain of factors.

Table value at the insulation column (30 °C, up to three current-carrying
conductors; single conductors in free air with --free-air), ambient correction
sqrt((Tc - Ta)/(Tc - 30)), adjustment for more than three current-carrying
conductors, parallel sets, then the cap at the termination column's table value.
Each line names the rule it follows.

\b
Example:
  feedcheck calc ampacity --size "3/0 AWG" --material cu --insulation 90degC \\
      --ambient 40degC --current-carrying 6 --termination 75degC

{CAUTION}
"""

SIZE_HELP = f"""Smallest conductor that meets the load, the protective device, the voltage-drop
limit and the short-circuit withstand; names the criterion that governed.

The device defaults to the next standard rating at or above 125 % of the
continuous load plus the noncontinuous load. Voltage drop is checked when
--length and --voltage are given; withstand when --fault and --clearing are.

\b
Example:
  feedcheck calc size --continuous 150A --noncontinuous 30A --material cu \\
      --insulation 90degC --ambient 40degC --current-carrying 6 \\
      --length "120 ft" --voltage 208V --limit 3% --fault 18kA --clearing 0.05s

{CAUTION}
"""


INSULATION_HELP = "Insulation temperature column (60, 75 or 90 degC)."
TERMINATION_HELP = "Termination temperature column (60, 75 or 90 degC)."


def _column(value: float, option: str) -> float:
    if value not in (60.0, 75.0, 90.0):
        raise click.BadParameter(
            f"got {value:g} °C; expected 60, 75 or 90 degC (a table column)", param_hint=option
        )
    return value


@click.command("ampacity", help=AMPACITY_HELP, context_settings=CONTEXT, epilog=CAUTION)
@click.option("--size", "size", type=SIZE, required=True, help="Conductor size, e.g. '3/0 AWG'.")
@click.option("--material", type=MATERIAL, default="cu", show_default=True)
@temperature_option("--insulation", "75degC", INSULATION_HELP)
@temperature_option("--ambient", "30degC")
@current_carrying_option("Current-carrying conductors in the raceway or cable.")
@temperature_option(
    "--termination", "75degC", "Termination temperature column (60, 75 or 90 degC)."
)
@sets_option()
@click.option("--free-air", is_flag=True, help="Single conductors in free air (Table 310.17).")
@temperature_option(
    "--rooftop-adder", "0degC", "Temperature added to the ambient for a sunlit rooftop raceway."
)
@click.option("--continuous", type=CURRENT, default=None, help="Continuous load, e.g. 120A.")
@click.option("--noncontinuous", type=CURRENT, default=None, help="Noncontinuous load.")
def ampacity_command(
    size,
    material,
    insulation,
    ambient,
    current_carrying,
    termination,
    sets,
    free_air,
    rooftop_adder,
    continuous,
    noncontinuous,
):
    from ..calc.ampacity import ampacity_chain
    from ..rulebook import current_rulebook

    ins = _column(insulation, "--insulation")
    term = _column(termination, "--termination")
    try:
        chain = ampacity_chain(
            size.name,
            material.lower(),
            ins,
            ambient,
            current_carrying,
            term,
            sets,
            free_air,
            rooftop_adder,
            continuous or 0.0,
            noncontinuous or 0.0,
            tables=current_rulebook().ampacity,
        )
    except ValueError as exc:
        raise click.UsageError(str(exc)) from None
    click.echo(
        f"Ampacity of {chain.sets} × {chain.size} {chain.material}"
        + (
            " (interpolated: metric size, not a code table value)"
            if chain.method == "interpolated"
            else ""
        )
    )
    for label, value, unit, rid in chain.steps():
        shown = f"{value:.3f}" if unit == "" else f"{value:.1f} {unit}"
        click.echo(f"  {label:<48} {shown:>12}   [{rid}]")
    click.echo(f"  governed by: {chain.governed_by}")
    if continuous is not None or noncontinuous is not None:
        click.echo(
            "  needed before adjustment (125 % cont. + noncont.): "
            f"{chain.required_before_a:.1f} A -> "
            f"{'ok' if chain.ok_before else 'NOT MET'}   [continuous-125]"
        )
        click.echo(
            f"  needed after correction (load): {chain.required_after_a:.1f} A"
            f" -> {'ok' if chain.ok_after else 'NOT MET'}   [load-after-derating]"
        )
    click.echo(CAUTION, err=True)


@click.command("size", help=SIZE_HELP, context_settings=CONTEXT, epilog=CAUTION)
@click.option(
    "--continuous",
    type=LOAD,
    default="0A",
    show_default=True,
    help="Continuous load (3 h or more), e.g. 150A.",
)
@click.option(
    "--noncontinuous", type=LOAD, default="0A", show_default=True, help="Noncontinuous load."
)
@click.option("--material", type=MATERIAL, default="cu", show_default=True)
@temperature_option("--insulation", "75degC", INSULATION_HELP)
@temperature_option("--ambient", "30degC")
@current_carrying_option()
@temperature_option(
    "--termination", None, "Termination column; default by circuit rating and size (110.14(C))."
)
@sets_option()
@click.option("--raceway", type=RACEWAY, default="steel", show_default=True)
@click.option("--device", type=CURRENT, default=None, help="Overcurrent device rating.")
@click.option("--length", type=LENGTH, default=None, help="One-way run length, e.g. '120 ft'.")
@click.option(
    "--voltage",
    type=click.STRING,
    default=None,
    help="Nominal line-to-line (3-phase) or line (1-phase) voltage, e.g. 208V.",
)
@click.option("--phases", type=click.Choice(["1", "3"]), default="3", show_default=True)
@click.option("--pf", type=click.FloatRange(min=0.01, max=1.0), default=0.9, show_default=True)
@click.option(
    "--limit",
    type=PERCENT,
    default="3%",
    show_default=True,
    help="Voltage-drop limit in percent of nominal.",
)
@click.option("--fault", type=CURRENT, default=None, help="Available fault current.")
@click.option("--clearing", type=TIME, default=None, help="Device clearing time.")
@click.option(
    "--withstand-insulation",
    type=click.Choice(["thermoplastic", "thermoset"]),
    default="thermoplastic",
    show_default=True,
)
@click.option("--metric", is_flag=True, help="Choose among metric sizes (mm2).")
def size_command(
    continuous,
    noncontinuous,
    material,
    insulation,
    ambient,
    current_carrying,
    termination,
    sets,
    raceway,
    device,
    length,
    voltage,
    phases,
    pf,
    limit,
    fault,
    clearing,
    withstand_insulation,
    metric,
):
    from ..calc.selection import select_conductor
    from ..rulebook import current_rulebook

    ins, term, volts = _checked_size_inputs(
        insulation, termination, continuous, noncontinuous, fault, clearing, voltage, length
    )
    try:
        selection = select_conductor(
            continuous,
            noncontinuous,
            material.lower(),
            ins,
            ambient,
            current_carrying,
            term,
            sets,
            raceway.lower(),
            device,
            length or 0.0,
            volts,
            int(phases),
            pf,
            limit,
            fault,
            clearing,
            withstand_insulation,
            system="metric" if metric else "awg",
            data=current_rulebook().sizing,
        )
    except ValueError as exc:
        raise click.UsageError(str(exc)) from None
    _echo_selection(selection, material.lower(), limit, fault, clearing)
    click.echo(CAUTION, err=True)


def _checked_size_inputs(
    insulation, termination, continuous, noncontinuous, fault, clearing, voltage, length
):
    """The insulation and termination columns and the voltage in volts, once the options
    that go together have been checked (UsageError / BadParameter otherwise)."""
    from ..units import UnitParseError, parse_quantity

    ins = _column(insulation, "--insulation")
    term = None if termination is None else _column(termination, "--termination")
    if continuous < 0 or noncontinuous < 0:
        raise click.UsageError("--continuous and --noncontinuous must be 0 A or more")
    if continuous + noncontinuous <= 0:
        raise click.UsageError("give a load: --continuous and/or --noncontinuous above 0 A")
    if (fault is None) != (clearing is None):
        raise click.UsageError("--fault and --clearing go together")
    volts = None
    if voltage is not None:
        try:
            volts = parse_quantity(voltage, "voltage")
        except UnitParseError as exc:
            raise click.BadParameter(
                f"got {exc.value!r}; expected {exc.expected}", param_hint="--voltage"
            ) from None
    if (length is None) != (volts is None):
        raise click.UsageError("--length and --voltage go together (voltage-drop check)")
    return ins, term, volts


def _echo_selection(selection, material: str, limit, fault, clearing) -> None:
    click.echo(
        f"Selected: {selection.sets} × {selection.size} {material} on a "
        f"{selection.device_a:g} A device (terminations {selection.termination_c:g} °C)"
    )
    click.echo(f"Governing criterion: {selection.governing}")
    for criterion, name in selection.minimum_by_criterion:
        click.echo(f"  smallest meeting {criterion:<13} {name}")
    click.echo(
        f"  allowable ampacity {selection.chain.final_a:.1f} A; largest device it permits "
        f"{selection.max_device_a:g} A"
    )
    if selection.vdrop_pct is not None:
        click.echo(f"  voltage drop {selection.vdrop_pct:.2f} % (limit {limit:g} %)")
    if selection.withstand_a is not None:
        click.echo(
            f"  withstand {selection.withstand_a / 1000:.1f} kA for {clearing:g} s "
            f"(available {fault / 1000:.1f} kA)"
        )
    click.echo("  rules: " + ", ".join(dict.fromkeys(selection.rule_ids)))
