"""Command line: parse, call the library, render, map problems to exit codes.

Exit codes: 0 no failing check (warnings allowed), 1 at least one failing check,
2 the input could not be read or is invalid (nothing is written), 3 an internal error
(a fault in feedcheck; nothing is written).
"""

from __future__ import annotations

import functools
import sys
import textwrap

import click

from . import CAUTION, __version__
from .commands.errors import handle_input_errors
from .commands.params import APPARENT_POWER, IMPEDANCE_PCT, VOLTAGE_SYSTEM, X_R, QuantityType

CONTEXT = {"help_option_names": ["-h", "--help"], "max_content_width": 100}


@click.group(context_settings=CONTEXT, epilog=CAUTION)
@click.version_option(__version__, "-V", "--version", prog_name="feedcheck")
@click.option(
    "--tables",
    "tables_dir",
    type=click.Path(exists=True, file_okay=False),
    help="Folder of your own table copies (CSV with provenance header); a table "
    "found there replaces the shipped one of the same name.",
)
def main(tables_dir):
    """Size and check feeds from low-voltage distribution transformers.

    \b
    Typical use:
      feedcheck init my_job.toml          write a commented job template
      feedcheck check my_job.toml         check a job; summary in the terminal
      feedcheck check my_job.toml --format json > results.json
      feedcheck tables                    list the data tables and their sources
      feedcheck calc rated-current --rating 75kVA --voltage 208V

    Results are an aid: verify them against the locally adopted electrical code
    and have a licensed electrician or engineer review the work.
    """
    if tables_dir:
        from .tables import set_user_tables_dir

        set_user_tables_dir(tables_dir)


def _check_out_folder(value):
    """An output path whose folder does not exist is a usage error (exit 2)."""
    from pathlib import Path

    if value and not Path(value).resolve().parent.is_dir():
        raise click.BadParameter(
            f"got {value!r}; the folder {str(Path(value).parent)!r} does not exist",
            param_hint="--out",
        )
    return value


@main.command("check", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("job_file", type=click.Path(dir_okay=True, exists=False))
@click.option(
    "--format",
    "fmt",
    type=click.Choice(["text", "json", "csv"]),
    default="text",
    show_default=True,
    help="text summary, JSON (nodes + findings) or CSV (findings).",
)
@click.option(
    "--out",
    "out",
    type=click.Path(dir_okay=False),
    callback=lambda ctx, param, value: _check_out_folder(value),
    help="Write the JSON/CSV/text to this file (atomically) instead of stdout.",
)
@click.option("--all", "show_all", is_flag=True, help="Also list passing and info findings.")
@handle_input_errors
def check_cmd(job_file, fmt, out, show_all):
    """Check every element of a job file.

    \b
    Examples:
      feedcheck check sample_jobs/harbor_kitchen.toml
      feedcheck check job.toml --format json --out results.json
    Exit code 0: no failing check; 1: a check failed; 2: the input is invalid.
    """
    from .render.json_csv import render_csv, render_json
    from .render.text import render_text
    from .runner import run_job

    results = run_job(job_file)
    text = {"json": render_json, "csv": render_csv}.get(
        fmt, functools.partial(render_text, show_all=show_all)
    )(results)
    if out:
        from .io_atomic import write_text_atomic

        write_text_atomic(out, text)
        click.echo(f"wrote {out}", err=True)
    else:
        click.echo(text, nl=not text.endswith("\n"))
    sys.exit(results.exit_code)


@main.command("init", context_settings=CONTEXT, epilog=CAUTION)
@click.argument("path", type=click.Path(dir_okay=False), default="job.toml")
@click.option("--force", is_flag=True, help="Overwrite an existing file.")
def init_cmd(path, force):
    """Write a commented job-file template to PATH (default job.toml).

    \b
    Example:
      feedcheck init site_a.toml && feedcheck check site_a.toml
    """
    from pathlib import Path

    from .io_atomic import write_text_atomic
    from .template import TEMPLATE

    if not Path(path).resolve().parent.is_dir():
        click.echo(f"error: {path}: the folder {Path(path).parent} does not exist", err=True)
        sys.exit(2)
    if Path(path).exists() and not force:
        click.echo(f"error: {path} exists; use --force to overwrite it", err=True)
        sys.exit(2)
    write_text_atomic(path, TEMPLATE)
    click.echo(f"wrote {path} — edit it, then run: feedcheck check {path}")


@main.command("tables", context_settings=CONTEXT, epilog=CAUTION)
@click.option(
    "--verify",
    is_flag=True,
    help="Check every table (header, columns, units, monotonic order, gaps); "
    "exit 2 if any is broken.",
)
def tables_cmd(verify):
    """List the data tables with their source and confidence.

    \b
    Examples:
      feedcheck tables
      feedcheck --tables my_tables/ tables --verify
    """
    from .tables import verify_all

    good, bad = verify_all()
    for t in good:
        level, detail = _confidence_parts(t.confidence)
        click.echo(f"{t.name}  [{level}]  {t.origin}")
        click.echo(
            textwrap.fill(
                t.source, 96, initial_indent="    source: ", subsequent_indent="            "
            )
        )
        if detail:
            click.echo(
                textwrap.fill(
                    detail, 96, initial_indent="    note:   ", subsequent_indent="            "
                )
            )
    for exc in bad:
        for p in exc.problems:
            click.echo(f"error: {p}", err=True)
    if verify:
        click.echo(f"{len(good)} tables verified, {len(bad)} broken", err=True)
    sys.exit(2 if bad else 0)


def _confidence_parts(text: str) -> tuple[str, str]:
    """("published", "rows … from memory") from a table's confidence line."""
    from .tables import CONFIDENCE_LEVELS

    for level in CONFIDENCE_LEVELS:
        head = level.split(" —")[0]
        if text.lower().startswith(head):
            rest = text[len(level) if text.startswith(level) else len(head) :].strip(" ;")
            return level, rest.strip("()")
    return text, ""


@main.group("calc", context_settings=CONTEXT, epilog=CAUTION)
def calc():
    """Quick figures for spot checks (one value, formula shown)."""


@calc.command("rated-current", context_settings=CONTEXT, epilog=CAUTION)
@click.option("--rating", required=True, type=APPARENT_POWER, help="Apparent power, e.g. 75kVA.")
@click.option(
    "--voltage",
    required=True,
    type=QuantityType("voltage"),
    help="Line-to-line voltage, e.g. 208V (240V for a 120/240 V winding).",
)
@click.option("--phases", type=click.Choice(["1", "3"]), default="3", show_default=True)
def rated_current_cmd(rating, voltage, phases):
    """Rated (full-load) current of a transformer winding.

    \b
    Example:
      feedcheck calc rated-current --rating 75kVA --voltage 208V
      → 208.2 A   I = S / (√3 · V_LL) = 75,000 VA / (√3 × 208 V)
    """
    from .calc.transformer import rated_current_a

    ph = int(phases)
    i = rated_current_a(rating, voltage, ph)
    form = "S / (√3 · V_LL)" if ph == 3 else "S / V"
    sub = f"{rating:,.0f} VA / ({'√3 × ' if ph == 3 else ''}{voltage:g} V)"
    click.echo(f"{i:.1f} A   I = {form} = {sub}")


@calc.command("regulation", context_settings=CONTEXT, epilog=CAUTION)
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
def regulation_cmd(impedance, x_r, load_va, rating_va, pf):
    """Transformer voltage regulation at a load and power factor.

    Both the exact phasor form and the usual %R/%X approximation (receiving end
    at rated voltage). Without --load/--rating, full load.

    \b
    Example:
      feedcheck calc regulation --impedance 5.1% --x-r 3.5 --load 60kVA --rating 75kVA --pf 0.9
    """
    from .calc.transformer import (
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


def _register_optional() -> None:
    """Commands contributed by other modules."""
    from .commands import registry

    registry.register(main, calc)


_register_optional()

__all__ = ["VOLTAGE_SYSTEM", "main"]
