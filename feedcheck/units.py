"""Units at the edges: one pint registry for the package, parsing helpers.

The registry is created lazily, once (pint's own guidance: one registry per
application). Kernels never see pint; parsers here turn a user's text such as
``"85 ft"`` into a float in SI (metres) and say clearly what was wrong otherwise.

Apparent, real and reactive power share one dimension in pint: the caller keeps
them in separately named fields (``rating_va``, ``load_w``, ``load_var``).
A horsepower here is 746 W (the electrical horsepower of motor nameplates).
"""

from __future__ import annotations

import math
import re
from functools import lru_cache

from .model import VoltageSystem
from .units_fast import fast_convert

# Digits may be grouped by thousands with "," (1,200 ft) or by "_" (1_200 ft); a comma
# in any other place ("1,5 m", a decimal comma) is refused rather than misread as 15 m.
_NUMBER = (
    r"[-+]?(?:[0-9]{1,3}(?:,[0-9]{3})+(?:\.[0-9]*)?|[0-9]+(?:_[0-9]+)*(?:\.[0-9]*)?|\.[0-9]+)"
    r"(?:[eE][-+]?[0-9]+)?|[-+]?inf(?:inity)?|nan"
)
_QTY_RE = re.compile(rf"^\s*(?P<num>{_NUMBER})\s*(?P<unit>.*?)\s*$", re.IGNORECASE)

# Dimension name -> (pint dimensionality string, SI unit the kernels use, example)
DIMENSIONS: dict[str, tuple[str, str, str]] = {
    "length": ("[length]", "m", "85 ft or 26 m"),
    "power": ("[length] ** 2 * [mass] / [time] ** 3", "VA", "75 kVA"),
    "current": ("[current]", "A", "225 A or 22 kA"),
    "voltage": ("[length] ** 2 * [mass] / [current] / [time] ** 3", "V", "480 V"),
    "temperature": ("[temperature]", "degC", "35 degC"),
    "percent": ("", "percent", "5.75 %"),
    "time": ("[time]", "s", "0.05 s or 3 cycles"),
    "area": ("[length] ** 2", "mm**2", "95 mm2 or 250 kcmil"),
}

_UNIT_ALIASES = {
    "°c": "degC",
    "ºc": "degC",
    "c": "degC",
    "degc": "degC",
    "deg c": "degC",
    "°f": "degF",
    "degf": "degF",
    "f": "degF",
    "mm2": "mm**2",
    "mm²": "mm**2",
    "sq mm": "mm**2",
    "mcm": "kcmil",
    "kcmil": "kcmil",
    "kva": "kVA",
    "mva": "MVA",
    "va": "VA",
    "kw": "kW",
    "w": "W",
    "kvar": "kvar",
    "var": "var",
    "ka": "kA",
    "a": "A",
    "v": "V",
    "kv": "kV",
    "hz": "Hz",
    "cycles": "cycle",
    "cycle": "cycle",
    "cy": "cycle",
    "hp": "hp",
}


FOOT_M = 0.3048  # metres per international foot (exact by definition)
_FT = ("m", FOOT_M)
_DEGC = ("degC", 1.0)
# Unit words a schedule column header may carry ("load [kVA]", "length (m)"), lower case:
# word -> (unit of the column's values once scaled, factor). A bare length is in feet.
SCHEDULE_HEADER_UNITS: dict[str, dict[str, tuple[str, float]]] = {
    "load": {
        "va": ("VA", 1.0),
        "kva": ("VA", 1e3),
        "w": ("W", 1.0),
        "kw": ("W", 1e3),
        "a": ("A", 1.0),
    },
    "length": {
        "": _FT,
        "ft": _FT,
        "feet": _FT,
        "foot": _FT,
        **dict.fromkeys(("m", "metre", "meter", "metres", "meters"), ("m", 1.0)),
    },
    "current": {"": ("A", 1.0), "a": ("A", 1.0)},
    "temperature": {"": _DEGC, "c": _DEGC, "degc": _DEGC},
}

_APPARENT_RE = re.compile(r"^(?:[kMG]?VA|(?:kilo|mega|giga)?volt_?ampere)$")


@lru_cache(maxsize=1)
def registry():
    """The package's single pint UnitRegistry (created on first use)."""
    ureg = _new_registry()
    ureg.define("var = volt * ampere = VAr")
    ureg.define("kvar = 1000 * var")
    ureg.define("cycle = second / 60")  # one cycle of a 60 Hz system
    # Electrical horsepower (746 W), as on motor nameplates and in the motor tables.
    ureg.define("hp = 746 * watt = HP")
    return ureg


def _new_registry():
    """pint's default registry, from pint's on-disk cache of its parsed definitions when
    one can be kept (the user's cache folder); built from the definition files when the
    cache cannot be read or written (a read-only home), silently: same units either way."""
    import pint

    try:
        return pint.UnitRegistry(autoconvert_offset_to_baseunit=True, cache_folder=":auto:")
    except Exception:  # an unusable cache folder: no cache
        return pint.UnitRegistry(autoconvert_offset_to_baseunit=True)


def Q_(value, unit: str):
    """A pint Quantity from a value and a known unit (fast path; no string parsing)."""
    return registry().Quantity(value, unit)


class UnitParseError(ValueError):
    """A value's text could not be read as a quantity of the expected kind."""

    def __init__(self, value: str, expected: str) -> None:
        super().__init__(f"got {value!r}; expected {expected}")
        self.value = value
        self.expected = expected


def split_number_unit(text: str) -> tuple[float, str]:
    """Split ``"85 ft"`` into ``(85.0, "ft")``; raise UnitParseError when no number leads."""
    m = _QTY_RE.match(str(text))
    if not m or re.match(r"[,_.0-9]", m.group("unit")):
        raise UnitParseError(
            str(text), "a number followed by a unit (use '.' for decimals, e.g. '1.5 m')"
        )
    num = m.group("num").replace("_", "").replace(",", "")
    return float(num), m.group("unit")


def _normalise_unit(unit: str) -> str:
    u = unit.strip()
    return _UNIT_ALIASES.get(u.lower(), u)


def parse_quantity(
    text: object,
    dimension: str,
    *,
    allow_bare: bool = False,
    must_be_positive: bool = True,
    allow_inf: bool = False,
    apparent_only: bool = False,
) -> float:
    """Parse a user value to a float in the SI unit of ``dimension``.

    Parameters
    ----------
    text : str or number
        What the user wrote: ``"85 ft"``, ``"5.75 %"``, ``"35 degC"``.
    dimension : str
        One of :data:`DIMENSIONS` (``length`` → m, ``power`` → VA, ``current`` → A,
        ``voltage`` → V, ``temperature`` → °C, ``percent`` → %, ``time`` → s,
        ``area`` → mm²).
    allow_bare : bool
        Accept a bare number and read it in the SI unit (used for ``x_r``-like inputs
        only; lengths, powers and currents always need a unit).
    must_be_positive : bool
        Reject zero and negative values (not applied to temperatures).
    allow_inf : bool
        Accept ``"infinite"`` / ``inf`` (an infinite bus).
    apparent_only : bool
        For ``power``: accept only apparent-power units (VA, kVA, MVA). Pint cannot
        tell W, VA and var apart, so ``"75 kW"`` or ``"75 hp"`` would otherwise be
        read silently as 75 kVA.

    Returns
    -------
    float
        The value in the SI unit listed above (percent stays in percent).

    Raises
    ------
    UnitParseError
        With the expected form, for a wrong dimension, missing unit, NaN, infinity or
        a non-positive value.

    Examples
    --------
    >>> round(parse_quantity("85 ft", "length"), 4)
    25.908
    >>> parse_quantity("5.75 %", "percent")
    5.75
    >>> parse_quantity("75 kVA", "power")
    75000.0
    >>> parse_quantity("35 degC", "temperature")
    35.0
    """
    example = DIMENSIONS[dimension][2]
    expected = f"a {dimension} with a unit, e.g. {example!r}"
    if allow_inf and isinstance(text, str) and text.strip().lower() in ("infinite", "inf"):
        return math.inf
    value, unit = _number_and_unit(text, expected, allow_bare=allow_bare, allow_inf=allow_inf)
    if not unit:
        if not allow_bare:
            raise UnitParseError(str(text), expected + " (the unit is missing)")
        result = value
    elif apparent_only and not _APPARENT_RE.match(unit):
        raise UnitParseError(
            str(text), f"an apparent power in VA, kVA or MVA, e.g. {example!r} (not W, hp or var)"
        )
    elif dimension == "percent":
        if unit not in ("%", "percent", "pct"):
            raise UnitParseError(str(text), expected)
        result = value
    else:
        result = _convert(value, unit, dimension, str(text), expected)
        if dimension == "temperature":
            return result
    if must_be_positive and not result > 0:
        raise UnitParseError(str(text), expected + " (greater than zero)")
    return result


def _number_and_unit(
    text: object, expected: str, *, allow_bare: bool, allow_inf: bool
) -> tuple[float, str]:
    """The number and the (alias-resolved) unit a user wrote; refuses NaN, and infinity
    unless allowed."""
    if isinstance(text, bool):
        raise UnitParseError(str(text), expected)
    if isinstance(text, (int, float)):
        if not allow_bare:
            raise UnitParseError(str(text), expected + " (a bare number has no unit)")
        value, unit = float(text), ""
    else:
        value, unit = split_number_unit(str(text))
    if math.isnan(value):
        raise UnitParseError(str(text), expected + " (not NaN)")
    if math.isinf(value) and not allow_inf:
        raise UnitParseError(str(text), expected + " (a finite number)")
    return value, _normalise_unit(unit)


def _convert(value: float, unit: str, dimension: str, text: str, expected: str) -> float:
    """``value`` in ``unit`` converted to the SI unit of ``dimension``: the units users
    type most without building the registry (:mod:`feedcheck.units_fast`), pint otherwise."""
    fast = fast_convert(value, unit, dimension)
    if fast is not None:
        if not math.isfinite(fast):
            raise UnitParseError(text, expected + " (a finite number)")
        return fast
    ureg = registry()
    si_unit = DIMENSIONS[dimension][1]
    shown = unit if len(unit) <= 40 else unit[:37] + "..."
    try:
        q = Q_(value, unit)
    except Exception:
        raise UnitParseError(text, expected + f" ({shown!r} is not a unit)") from None
    target = ureg.Unit("degC" if dimension == "temperature" else si_unit)
    if q.dimensionality != target.dimensionality:
        raise UnitParseError(text, expected)
    try:
        # a temperature difference (delta_degC) has the same dimension as a
        # temperature but cannot be converted to one: refuse it, do not crash
        converted = float(q.to(target).magnitude)
    except Exception:
        raise UnitParseError(text, expected + f" ({shown!r} does not convert)") from None
    if not math.isfinite(converted):
        raise UnitParseError(text, expected + " (a finite number)")
    return converted


_VS_EXPECTED = (
    "a system voltage such as '480 V delta', '208Y/120 V', '480Y/277 V', "
    "'120/240 V' (single-phase three-wire), '240/120 V high-leg delta', '240 V' or '480 V'"
)
_WYE_RE = re.compile(r"^\s*(\d+(?:\.\d+)?)\s*Y\s*/\s*(\d+(?:\.\d+)?)\s*(k?V)?\s*$", re.IGNORECASE)
# 240/120 V four-wire delta with the high leg (208 V to neutral): "240/120 V high-leg
# delta" (also "delta high-leg", "high leg", "highleg")
_HIGH_LEG_RE = re.compile(
    r"^\s*(\d+(?:\.\d+)?)\s*/\s*(\d+(?:\.\d+)?)\s*V?\s+"
    r"(?:high[- ]?leg\s+delta|delta\s+high[- ]?leg)\s*$",
    re.IGNORECASE,
)
_SPLIT_RE = re.compile(r"^\s*(\d+(?:\.\d+)?)\s*/\s*(\d+(?:\.\d+)?)\s*V?\s*$", re.IGNORECASE)
_PLAIN_RE = re.compile(
    r"^\s*(\d+(?:\.\d+)?)\s*(k?V)\s*(delta|d|wye|single|1ph|3ph)?\s*$", re.IGNORECASE
)


def parse_voltage_system(text: object, phases: int | None = None) -> VoltageSystem:
    """Parse a nominal system voltage.

    ``"208Y/120 V"`` → three-phase wye; ``"480 V delta"`` → three-phase delta;
    ``"120/240 V"`` or ``"240/120 V"`` → single-phase three-wire; ``"240 V"`` →
    three-phase if ``phases`` is 3, otherwise single-phase two-wire.

    Examples
    --------
    >>> parse_voltage_system("208Y/120 V").voltage_ln_v
    120.0
    >>> parse_voltage_system("120/240 V").kind
    'split'
    >>> parse_voltage_system("480 V delta").phases
    3
    >>> parse_voltage_system("240/120 V high-leg delta").kind
    'highleg'
    >>> parse_voltage_system("13.8 kV").voltage_ll_v  # medium voltage: kV spelled out
    13800.0
    """
    s = str(text)
    if m := _WYE_RE.match(s):
        k = 1000.0 if (m.group(3) or "").lower() == "kv" else 1.0
        ll, ln = k * float(m.group(1)), k * float(m.group(2))
        if not (0 < ln < ll) or abs(ll / ln - math.sqrt(3)) > 0.05:
            raise UnitParseError(s, _VS_EXPECTED + " (line voltage ≈ √3 × neutral voltage)")
        return VoltageSystem(ll, ln, 3, "wye", s)
    if m := _HIGH_LEG_RE.match(s):
        a, b = float(m.group(1)), float(m.group(2))
        ll, ln = max(a, b), min(a, b)
        if ln <= 0 or abs(ll / ln - 2) > 0.05:
            raise UnitParseError(
                s, _VS_EXPECTED + " (high-leg delta: line voltage = 2 × neutral, e.g. 240/120 V)"
            )
        return VoltageSystem(ll, ln, 3, "highleg", s)
    if m := _SPLIT_RE.match(s):
        a, b = float(m.group(1)), float(m.group(2))
        ll, ln = max(a, b), min(a, b)
        if ln <= 0 or abs(ll / ln - 2) > 0.05:
            raise UnitParseError(s, _VS_EXPECTED + " (split-phase: line voltage = 2 × neutral)")
        return VoltageSystem(ll, ln, 1, "split", s)
    if m := _PLAIN_RE.match(s):
        v = float(m.group(1)) * (1000.0 if m.group(2).lower() == "kv" else 1.0)
        tag = (m.group(3) or "").lower()
        if v <= 0:
            raise UnitParseError(s, _VS_EXPECTED)
        if tag in ("delta", "d", "3ph"):
            return VoltageSystem(v, None, 3, "delta", s)
        if tag == "wye":
            return VoltageSystem(v, v / math.sqrt(3), 3, "wye", s)
        if tag in ("single", "1ph") or phases == 1:
            return VoltageSystem(v, None, 1, "single", s)
        return VoltageSystem(v, None, 3 if phases in (None, 3) else phases, "line", s)
    raise UnitParseError(s, _VS_EXPECTED)
