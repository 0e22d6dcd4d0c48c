"""click parameter types for values with units (``--length "85 ft"``)."""

from __future__ import annotations

import click

from ..model import MATERIALS, RACEWAYS
from ..units import UnitParseError, parse_quantity, parse_voltage_system

# the help options and width of every command
CONTEXT = {"help_option_names": ["-h", "--help"], "max_content_width": 100}


class QuantityType(click.ParamType):
    """A value with a unit, converted to the SI float the kernels take.

    ``QuantityType("length")`` turns ``"85 ft"`` into ``25.908`` (metres).
    """

    def __init__(
        self,
        dimension: str,
        *,
        allow_bare: bool = False,
        must_be_positive: bool = True,
        allow_inf: bool = False,
        apparent_only: bool = False,
        lo: float | None = None,
        hi: float | None = None,
        what: str = "",
    ) -> None:
        self.dimension = dimension
        self.name = dimension
        self.allow_bare = allow_bare
        self.must_be_positive = must_be_positive
        self.allow_inf = allow_inf
        self.apparent_only = apparent_only
        self.lo, self.hi, self.what = lo, hi, what

    def convert(self, value, param, ctx):
        if isinstance(value, float):
            return value
        try:
            out = parse_quantity(
                value,
                self.dimension,
                allow_bare=self.allow_bare,
                must_be_positive=self.must_be_positive,
                allow_inf=self.allow_inf,
                apparent_only=self.apparent_only,
            )
        except UnitParseError as exc:
            self.fail(f"got {exc.value!r}; expected {exc.expected}", param, ctx)
        if (self.lo is not None and out < self.lo) or (self.hi is not None and out > self.hi):
            self.fail(
                f"got {value!r}; expected {self.what or self.dimension} from "
                f"{self.lo:g} to {self.hi:g}",
                param,
                ctx,
            )
        return out


class RatioType(click.ParamType):
    """A plain finite number within a range (X/R ratios)."""

    name = "ratio"

    def __init__(self, lo: float, hi: float) -> None:
        self.lo, self.hi = lo, hi

    def convert(self, value, param, ctx):
        import math

        try:
            x = float(value)
        except (TypeError, ValueError):
            self.fail(
                f"got {value!r}; expected a number from {self.lo:g} to {self.hi:g}", param, ctx
            )
        if not (math.isfinite(x) and self.lo <= x <= self.hi):
            self.fail(
                f"got {value!r}; expected a number from {self.lo:g} to {self.hi:g}", param, ctx
            )
        return x


class VoltageSystemType(click.ParamType):
    """A nominal system voltage such as ``208Y/120 V`` or ``120/240 V``."""

    name = "voltage system"

    def convert(self, value, param, ctx):
        if not isinstance(value, str):
            return value
        try:
            return parse_voltage_system(value)
        except UnitParseError as exc:
            self.fail(f"got {exc.value!r}; expected {exc.expected}", param, ctx)


class SizeType(click.ParamType):
    """A conductor size as the trade writes it (``4/0 AWG``, ``250 kcmil``, ``95 mm2``)."""

    name = "size"

    def convert(self, value, param, ctx):
        from ..calc.sizes import Size, SizeError, parse_size

        if isinstance(value, Size):
            return value
        try:
            return parse_size(value)
        except SizeError as exc:
            self.fail(f"got {exc.text!r}; expected {exc.expected}", param, ctx)


LENGTH = QuantityType("length")
POWER = QuantityType("power")
APPARENT_POWER = QuantityType("power", apparent_only=True)
IMPEDANCE_PCT = QuantityType("percent", lo=0.5, hi=25.0, what="a transformer impedance in %")
X_R_RANGE = (0.1, 100.0)
X_R = RatioType(0.1, 100.0)
CURRENT = QuantityType("current")
VOLTAGE = QuantityType("voltage")
TEMPERATURE = QuantityType("temperature", must_be_positive=False)
PERCENT = QuantityType("percent")
TIME = QuantityType("time")
SIZE = SizeType()
VOLTAGE_SYSTEM = VoltageSystemType()
MATERIAL = click.Choice(list(MATERIALS), case_sensitive=False)
RACEWAY = click.Choice(list(RACEWAYS), case_sensitive=False)


SETS_HELP = "Conductors in parallel per phase."


def sets_option(help_text: str | None = SETS_HELP):
    """``--sets``: conductors in parallel per phase, a whole number from 1 (default 1)."""
    return click.option(
        "--sets", type=click.IntRange(min=1), default=1, show_default=True, help=help_text
    )


def current_carrying_option(help_text: str | None = None):
    """``--current-carrying``: current-carrying conductors together (default 3)."""
    return click.option(
        "--current-carrying",
        type=click.IntRange(min=1),
        default=3,
        show_default=True,
        help=help_text,
    )


def temperature_option(name: str, default: str | None, help_text: str | None = None):
    """A temperature option (``--insulation``, ``--ambient`` …) shown with its default."""
    return click.option(
        name, type=TEMPERATURE, default=default, show_default=default is not None, help=help_text
    )


def renamed_option(new: str, dest: str, old: str, old_dest: str, type_, help_text: str):
    """A required option ``new`` with its hidden former spelling ``old`` (both optional
    to click; the command merges them with :func:`merge_spellings`, required=True)."""

    def decorate(command):
        command = old_spelling(old, old_dest, new, type_)(command)
        return click.option(new, dest, type=type_, default=None, help=f"{help_text}  [required]")(
            command
        )

    return decorate


def old_spelling(old: str, dest: str, new: str, type_, **kwargs):
    """A hidden option ``old`` kept working as the former spelling of ``new``.

    The command merges the two with :func:`merge_spellings`; ``--help`` shows ``new``
    only, and an invalid value names the spelling the user typed.
    """
    return click.option(
        old,
        dest,
        type=type_,
        default=None,
        hidden=True,
        help=f"Former spelling of {new}.",
        **kwargs,
    )


def merge_spellings(new: str, new_value, old: str, old_value, *, required: bool = False):
    """The value given under ``new`` or its former spelling ``old``; both is a usage
    error, neither is a missing option when ``required``."""
    if new_value is not None and old_value is not None:
        raise click.UsageError(f"give {new} once ({old} is its former spelling)")
    value = new_value if new_value is not None else old_value
    if value is None and required:
        ctx = click.get_current_context()
        param = next(p for p in ctx.command.params if new in getattr(p, "opts", ()))
        raise click.MissingParameter(ctx=ctx, param=param)
    return value
