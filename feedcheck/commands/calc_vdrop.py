"""``feedcheck calc voltage-drop``: the drop of one run, approximate and exact.

Thin: parse the options, look up the conductor's R and X, call the kernels in
:mod:`feedcheck.calc.vdrop`, print. Heavy modules are imported inside the command.
"""

from __future__ import annotations

import click

from .. import CAUTION
from ..calc.constants import M_PER_FT
from .params import (
    CURRENT,
    LENGTH,
    MATERIAL,
    PERCENT,
    RACEWAY,
    SIZE,
    TEMPERATURE,
    VOLTAGE_SYSTEM,
    sets_option,
)

CIRCUIT_TEXT = {
    "3ph": "three-phase, line-to-line drop",
    "1ph2w": "single-phase two-wire, drop of the supply voltage",
    "1ph3w": "single-phase three-wire, balanced, line-to-line drop",
    "ln4w": "line-to-neutral load, neutral carrying the return current",
}

HELP = f"""Voltage drop of one conductor run, by the approximate (effective-impedance)
form and by the exact phasor form.

R and X of the conductor come from the package's conductor tables for the
size, material and raceway (per conductor, at the conductor temperature);
parallel sets divide them. The percent is of the system's nominal voltage:
line-to-line for three-phase and single-phase three-wire circuits,
line-to-neutral for --circuit ln4w.

\b
Circuit kinds (--circuit; default from --system):
  3ph    three-phase balanced load, k = 1.732
  1ph2w  single-phase two-wire (out and back), k = 2
  1ph3w  120/240 V single-phase three-wire, balanced (no neutral current), k = 2
  ln4w   line-to-neutral load, neutral carrying the full return current, k = 2

\b
Example:
  feedcheck calc voltage-drop --current 150A --length "200 ft" \\
      --size "3/0 AWG" --material cu --raceway steel \\
      --system "208Y/120 V" --pf 0.9 --limit 3% --max-length

Exceeding --limit is reported, not an error (the 3 %/5 % figures of NFPA 70 are
informational); exit code 2 means the input could not be used.

{CAUTION}
"""


def _nominal_v(system, circuit: str) -> float:
    """Voltage the drop is measured against; UsageError when the circuit does not fit."""
    if circuit == "3ph":
        if system.phases != 3:
            raise click.UsageError(
                f"--circuit 3ph needs a three-phase --system; got {system.text!r}"
            )
        return system.voltage_ll_v
    if circuit == "1ph3w":
        if system.kind != "split":
            raise click.UsageError(
                "--circuit 1ph3w needs a single-phase three-wire --system "
                f"such as '120/240 V'; got {system.text!r}"
            )
        return system.voltage_ll_v
    if circuit == "ln4w":
        if system.voltage_ln_v is None:
            raise click.UsageError(
                "--circuit ln4w needs a system with a neutral such as "
                f"'208Y/120 V' or '120/240 V'; got {system.text!r}"
            )
        return system.voltage_ln_v
    return system.voltage_ll_v


def _fail(msg: str) -> None:
    click.echo(f"error: {msg}", err=True)
    click.get_current_context().exit(2)


@click.command("voltage-drop", help=HELP, context_settings={"help_option_names": ["-h", "--help"]})
@click.option(
    "--current", "current_a", type=CURRENT, required=True, help="Load current, e.g. 150A."
)
@click.option(
    "--length",
    "length_m",
    type=LENGTH,
    required=True,
    help='One-way run length with a unit, e.g. "200 ft" or "61 m".',
)
@click.option("--size", type=SIZE, required=True, help='Conductor size, e.g. "3/0 AWG", "95 mm2".')
@click.option("--material", type=MATERIAL, default="cu", show_default=True)
@click.option("--raceway", type=RACEWAY, default="steel", show_default=True)
@click.option(
    "--system",
    type=VOLTAGE_SYSTEM,
    required=True,
    help='Nominal system voltage, e.g. "208Y/120 V", "480 V delta", "120/240 V".',
)
@click.option(
    "--pf",
    type=click.FloatRange(-1.0, 1.0),
    default=0.85,
    show_default=True,
    help="Load power factor; positive lagging, negative leading.",
)
@sets_option()
@click.option(
    "--circuit",
    type=click.Choice(list(CIRCUIT_TEXT)),
    default=None,
    help="Circuit kind (see above); default from --system.",
)
@click.option(
    "--limit",
    "limit_pct",
    type=PERCENT,
    default="3%",
    show_default=True,
    help="Drop to compare against, percent of nominal.",
)
@click.option(
    "--max-length",
    "want_max_length",
    is_flag=True,
    help="Also print the longest run within --limit.",
)
@click.option(
    "--conductor-temp",
    "conductor_c",
    type=TEMPERATURE,
    default="75 degC",
    show_default=True,
    help="Conductor temperature for R.",
)
def voltage_drop_command(**options):
    """(click passes every option by its name; see the decorators above)"""
    drop = _drop_figures(options)
    _echo_drop(options, drop)


def _drop_figures(options) -> dict:
    """The conductor's R and X, both drops and the longest run, for the options given."""
    from ..calc import vdrop

    try:
        from ..calc.conductor import ac_impedance_ohm_per_m
        from ..rulebook import current_rulebook
    except ImportError as exc:  # pragma: no cover - only while the tree is incomplete
        _fail(f"conductor impedance data are not available ({exc})")
    system, pf, sets = options["system"], options["pf"], options["sets"]
    current_a, length_m = options["current_a"], options["length_m"]
    circuit = options["circuit"] or vdrop.circuit_of_system(system.kind, system.phases)
    nominal_v = _nominal_v(system, circuit)
    try:
        r_m, x_m = (
            float(value)
            for value in ac_impedance_ohm_per_m(
                options["size"].name,
                options["material"].lower(),
                options["raceway"].lower(),
                conductor_c=options["conductor_c"],
                data=current_rulebook().conductors,
            )
        )
        approx_v = vdrop.voltage_drop_approximate_v(
            current_a, r_m, x_m, length_m, pf, circuit, sets
        )
        exact_v = vdrop.voltage_drop_exact_circuit_v(
            nominal_v, current_a, r_m, x_m, length_m, pf, circuit, sets
        )
        limit_v = options["limit_pct"] / 100.0 * nominal_v
        longest_m = (
            vdrop.max_length_m(current_a, r_m, x_m, pf, limit_v, circuit, sets)
            if options["want_max_length"]
            else None
        )
    except ValueError as exc:
        _fail(str(exc))
    return dict(
        circuit=circuit,
        nominal_v=nominal_v,
        r_m=r_m,
        x_m=x_m,
        approx_v=approx_v,
        exact_v=exact_v,
        approx_pct=vdrop.voltage_drop_pct(approx_v, nominal_v),
        exact_pct=vdrop.voltage_drop_pct(exact_v, nominal_v),
        factor=vdrop.circuit_factor(circuit),
        limit_v=limit_v,
        longest_m=longest_m,
    )


def _echo_drop(options, drop) -> None:
    current_a, length_m, pf = options["current_a"], options["length_m"], options["pf"]
    limit_pct, sets = options["limit_pct"], options["sets"]
    nominal_v, r_m, x_m = drop["nominal_v"], drop["r_m"], drop["x_m"]
    approx_pct, exact_pct = drop["approx_pct"], drop["exact_pct"]
    cos = abs(pf)
    sin = (1.0 - pf * pf) ** 0.5 * (-1.0 if pf < 0 else 1.0)
    lead = "leading" if pf < 0 else "lagging"
    out = click.echo
    out(
        f"Run: {options['size'].name} {options['material'].lower()} in "
        f"{options['raceway'].lower()}, {sets} set(s), {length_m:.2f} m "
        f"({length_m / M_PER_FT:.1f} ft) one way"
    )
    out(
        f"Load: {current_a:g} A at pf {cos:.3f} {lead}; system {options['system'].text}, "
        f"circuit {drop['circuit']} ({CIRCUIT_TEXT[drop['circuit']]}); nominal {nominal_v:g} V"
    )
    out(
        f"Conductor at {options['conductor_c']:g} °C: R = {r_m * 1e3:.4f} Ω/km, "
        f"X = {x_m * 1e3:.4f} Ω/km ({r_m * 304.8:.4f} / {x_m * 304.8:.4f} Ω per 1000 ft)"
    )
    out("")
    out("Approximate:  VD = k × I × (R cos θ + X sin θ) × L / sets")
    out(
        f"                 = {drop['factor']:.4f} × {current_a:g} A × ({r_m * 1e3:.4f} × "
        f"{cos:.4f} + {x_m * 1e3:.4f} × {sin:.4f}) Ω/km × {length_m / 1e3:.5f} km / {sets}"
    )
    out(f"                 = {drop['approx_v']:.3f} V  ({approx_pct:.2f} % of {nominal_v:g} V)")
    out(f"Exact phasor: VD = {drop['exact_v']:.3f} V  ({exact_pct:.2f} % of {nominal_v:g} V)")
    verdict = "within" if exact_pct <= limit_pct and approx_pct <= limit_pct else "exceeds"
    out(f"Limit {limit_pct:g} % ({drop['limit_v']:.2f} V): {verdict}")
    longest_m = drop["longest_m"]
    if longest_m is not None:
        shown = (
            "no limit (drop does not grow with length)"
            if longest_m == float("inf")
            else f"{longest_m:.1f} m ({longest_m / M_PER_FT:.0f} ft)"
        )
        out(f"Longest run within {limit_pct:g} % (approximate form): {shown}")
    out("")
    out(CAUTION)
