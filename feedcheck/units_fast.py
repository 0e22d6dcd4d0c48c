"""Unit conversion without building the pint registry, for the units users type most.

Building pint's registry from its definition files costs more than a quick ``calc``
command's whole work, so :func:`feedcheck.units.parse_quantity` first looks the unit up
here and builds the registry only for a unit this table does not hold (the fallback is
pint itself, so every unit pint knows is still accepted).

Each factor is the one pint's own conversion multiplies by, written as pint computes it
(``ft`` is 12 × 0.0254 m, one rounding different from 0.3048): the results are the same
floats, bit for bit; ``tests/test_units.py`` holds every entry against pint.
Temperatures with an offset (``degF``) are left to pint.
"""

from __future__ import annotations

_FT = 12 * 0.0254  # pint: foot = 12 inch, inch = 2.54 cm (the same rounding as pint)
_KCMIL_MM2 = 0.5067074790974977  # pint: kcmil = 1000 circular_mil → mm² (checked in tests)

# unit text (after the alias table of units.py) -> (dimension, factor to the SI unit)
FAST_UNITS: dict[str, tuple[str, float]] = {
    "m": ("length", 1.0),
    "km": ("length", 1000.0),
    "mm": ("length", 1e-3),
    "in": ("length", 0.0254),
    "ft": ("length", _FT),
    "feet": ("length", _FT),
    "foot": ("length", _FT),
    "meter": ("length", 1.0),
    "VA": ("power", 1.0),
    "kVA": ("power", 1000.0),
    "MVA": ("power", 1e6),
    "W": ("power", 1.0),
    "kW": ("power", 1000.0),
    "MW": ("power", 1e6),
    "var": ("power", 1.0),
    "kvar": ("power", 1000.0),
    "hp": ("power", 746.0),
    "A": ("current", 1.0),
    "kA": ("current", 1000.0),
    "mA": ("current", 1e-3),
    "V": ("voltage", 1.0),
    "kV": ("voltage", 1000.0),
    "degC": ("temperature", 1.0),
    "s": ("time", 1.0),
    "ms": ("time", 1e-3),
    "cycle": ("time", 1 / 60),
    "mm**2": ("area", 1.0),
    "kcmil": ("area", _KCMIL_MM2),
}


def fast_convert(value: float, unit: str, dimension: str) -> float | None:
    """``value`` in ``unit`` in the SI unit of ``dimension``, or None when this table
    cannot say (an unlisted unit, or one of another dimension: pint decides and words
    the error).

    Examples
    --------
    >>> fast_convert(75.0, "kVA", "power")
    75000.0
    >>> fast_convert(3.0, "ft", "current") is None
    True
    """
    hit = FAST_UNITS.get(unit)
    if hit is None or hit[0] != dimension:
        return None
    return value * hit[1]
