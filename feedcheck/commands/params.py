"""click parameter types for values with units (``--length "85 ft"``)."""

from __future__ import annotations

import click

from ..units import UnitParseError, parse_quantity, parse_voltage_system


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
    ) -> None:
        self.dimension = dimension
        self.name = dimension
        self.allow_bare = allow_bare
        self.must_be_positive = must_be_positive
        self.allow_inf = allow_inf

    def convert(self, value, param, ctx):
        if isinstance(value, float):
            return value
        try:
            return parse_quantity(
                value,
                self.dimension,
                allow_bare=self.allow_bare,
                must_be_positive=self.must_be_positive,
                allow_inf=self.allow_inf,
            )
        except UnitParseError as exc:
            self.fail(f"got {exc.value!r}; expected {exc.expected}", param, ctx)


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
CURRENT = QuantityType("current")
VOLTAGE = QuantityType("voltage")
TEMPERATURE = QuantityType("temperature", must_be_positive=False)
PERCENT = QuantityType("percent")
TIME = QuantityType("time")
SIZE = SizeType()
VOLTAGE_SYSTEM = VoltageSystemType()
MATERIAL = click.Choice(["cu", "al"], case_sensitive=False)
RACEWAY = click.Choice(["steel", "aluminum", "pvc", "cable", "free-air"], case_sensitive=False)
