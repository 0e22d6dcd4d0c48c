"""``feedcheck calc rated-current`` and ``feedcheck calc regulation``: the transformer
quick figures, formula shown.

Thin: parse the options, call :mod:`feedcheck.calc.transformer`, print. The kernel
module is imported inside the commands, so ``feedcheck calc …`` starts fast.
"""

from __future__ import annotations

import click

from .. import CAUTION
from .params import APPARENT_POWER, CONTEXT, IMPEDANCE_PCT, X_R, QuantityType


@click.command("rated-current", context_settings=CONTEXT, epilog=CAUTION)
@click.option("--rating", required=True, type=APPARENT_POWER, help="Apparent power, e.g. 75kVA.")
@click.option(
    "--voltage",
    required=True,
    type=QuantityType("voltage"),
    help="Line-to-line voltage, e.g. 208V (240V for a 120/240 V winding).",
)
@click.option("--phases", type=click.Choice(["1", "3"]), default="3", show_default=True)
def rated_current_command(rating, voltage, phases):
    """Rated (full-load) current of a transformer winding.

    \b
    Example:
      feedcheck calc rated-current --rating 75kVA --voltage 208V
      → 208.2 A   I = S / (√3 · V_LL) = 75,000 VA / (√3 × 208 V)
    """
    from ..calc.transformer import rated_current_a

    ph = int(phases)
    i = rated_current_a(rating, voltage, ph)
    form = "S / (√3 · V_LL)" if ph == 3 else "S / V"
    sub = f"{rating:,.0f} VA / ({'√3 × ' if ph == 3 else ''}{voltage:g} V)"
    click.echo(f"{i:.1f} A   I = {form} = {sub}")


@click.command("regulation", context_settings=CONTEXT, epilog=CAUTION)
@click.option("--impedance", required=True, type=IMPEDANCE_PCT, help="Nameplate %Z, e.g. 5.1%.")
@click.option("--x-r", "x_r", required=True, type=X_R, help="X/R ratio, e.g. 3.5.")
@click.option("--load", "load_va", type=APPARENT_POWER, help="Load, e.g. 60kVA (with --rating).")
@click.option("--rating", "rating_va", type=APPARENT_POWER, help="Transformer rating, e.g. 75kVA.")
@click.option(
    "--pf",
    type=click.FloatRange(0.05, 1.0),
    default=0.9,
    show_default=True,
    help="Load power factor (lagging).",
)
def regulation_command(impedance, x_r, load_va, rating_va, pf):
    """Transformer voltage regulation at a load and power factor.

    Both the exact phasor form and the usual %R/%X approximation (receiving end
    at rated voltage). Without --load/--rating, full load.

    \b
    Example:
      feedcheck calc regulation --impedance 5.1% --x-r 3.5 --load 60kVA --rating 75kVA --pf 0.9
    """
    from ..calc.transformer import (
        impedance_parts_pct,
        regulation_pct_approximate,
        regulation_pct_exact,
    )

    if (load_va is None) != (rating_va is None):
        raise click.UsageError("give both --load and --rating, or neither (full load)")
    n = 1.0 if load_va is None else load_va / rating_va
    r, x = impedance_parts_pct(impedance, x_r)
    ex = regulation_pct_exact(r, x, n, pf)
    ap = regulation_pct_approximate(r, x, n, pf)
    click.echo(f"%R = {r:.3f} %, %X = {x:.3f} %, load n = {n:.3f}, pf = {pf:g} lagging")
    click.echo(
        f"exact:        {ex:.3f} %   (|1 + n(r cos φ + x sin φ) + j n(x cos φ − r sin φ)|"
        " − 1) · 100"
    )
    click.echo(f"approximate:  {ap:.3f} %   n(%R cos φ + %X sin φ) + n²(%X cos φ − %R sin φ)²/200")
