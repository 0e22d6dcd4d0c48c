"""Conductor size designations: names, areas and the trade's spellings.

AWG areas come from the published diameter formula
``d [in] = 0.005 · 92^((36 − n)/39)`` (n = 0, −1, −2, −3 for 1/0 … 4/0) and
``A [cmil] = (d [mil])²``; kcmil sizes are areas by definition
(1 kcmil = 1000 cmil = 0.506 707 mm²); metric sizes are nominal mm² (IEC 60228).

References
----------
ASTM B258 (AWG diameters); NFPA 70 Chapter 9 Table 8 (areas, agree within 0.1 %);
IEC 60228 (nominal metric cross-sections).
"""

from __future__ import annotations

import difflib
import math
import re
from dataclasses import dataclass

import numpy as np

MM2_PER_KCMIL = 0.506_707_479  # π/4 · (0.0254 mm)² · 1e6 cmil … exact by definition of the mil

AWG_NAMES = ("14", "12", "10", "8", "6", "4", "3", "2", "1", "1/0", "2/0", "3/0", "4/0")
KCMIL_SIZES = (250, 300, 350, 400, 500, 600, 700, 750, 800, 900, 1000, 1250, 1500, 1750, 2000)
METRIC_SIZES = (1.5, 2.5, 4, 6, 10, 16, 25, 35, 50, 70, 95, 120, 150, 185, 240, 300, 400, 500, 630)


def awg_diameter_in(gauge):
    """Diameter [in] of a solid round AWG wire of gauge number n (0 for 1/0, −3 for 4/0).

    Examples
    --------
    >>> round(float(awg_diameter_in(36)), 4)
    0.005
    >>> round(float(awg_diameter_in(-3)), 4)
    0.46
    """
    return 0.005 * 92.0 ** ((36.0 - np.asarray(gauge, dtype=float)) / 39.0)


def awg_area_kcmil(gauge):
    """Area [kcmil] of AWG gauge n from the diameter formula (d in mil, squared, /1000)."""
    d_mil = awg_diameter_in(gauge) * 1000.0
    return d_mil**2 / 1000.0


def _awg_number(name: str) -> int:
    return -(int(name[0]) - 1) if "/" in name else int(name)


@dataclass(frozen=True, order=True)
class Size:
    """A conductor size.

    Attributes
    ----------
    area_mm2 : float
        Cross-sectional area [mm²] (first, so sizes sort by area).
    name : str
        Canonical spelling: ``"12 AWG"``, ``"4/0 AWG"``, ``"250 kcmil"``, ``"95 mm2"``.
    system : str
        ``"awg"`` (AWG and kcmil) or ``"metric"``.
    """

    area_mm2: float
    name: str
    system: str

    @property
    def area_kcmil(self) -> float:
        return self.area_mm2 / MM2_PER_KCMIL

    @property
    def area_cmil(self) -> float:
        return self.area_kcmil * 1000.0

    def __str__(self) -> str:
        return self.name


def _build() -> dict[str, Size]:
    sizes: dict[str, Size] = {}
    for n in AWG_NAMES:
        area = float(awg_area_kcmil(_awg_number(n))) * MM2_PER_KCMIL
        sizes[f"{n} AWG"] = Size(area, f"{n} AWG", "awg")
    for k in KCMIL_SIZES:
        sizes[f"{k} kcmil"] = Size(k * MM2_PER_KCMIL, f"{k} kcmil", "awg")
    for m in METRIC_SIZES:
        label = f"{m:g} mm2"
        sizes[label] = Size(float(m), label, "metric")
    return sizes


SIZES: dict[str, Size] = _build()
AWG_KCMIL_ORDER: tuple[str, ...] = tuple(n for n, s in SIZES.items() if s.system == "awg")
METRIC_ORDER: tuple[str, ...] = tuple(n for n, s in SIZES.items() if s.system == "metric")

_ZEROS = {"0": "1/0", "00": "2/0", "000": "3/0", "0000": "4/0"}
_AWG_RE = re.compile(r"^#?\s*(\d{1,2}|[1-4]/0|0{1,4})\s*(awg|ga|gauge)?$")
_KCMIL_RE = re.compile(r"^(\d{3,4}(?:\.0+)?)\s*(kcmil|mcm|kcm)$")
_MM2_RE = re.compile(r"^(\d+(?:\.\d+)?)\s*(mm2|mm²|mm\^2|sq\.?\s*mm|mm)$")


class SizeError(ValueError):
    """A size designation that is not one we know; carries a suggestion."""

    def __init__(self, text: str, expected: str) -> None:
        super().__init__(f"got {text!r}; expected {expected}")
        self.text = text
        self.expected = expected


def parse_size(text: str) -> Size:
    """Read a conductor size as the trade writes it.

    Accepts ``12 AWG``, ``#12``, ``4/0``, ``4/0 AWG``, ``0000``, ``250 kcmil``,
    ``250MCM``, ``95 mm2``, ``95 mm²``. A bare number other than ``n/0`` is
    ambiguous (10 AWG or 10 mm²?) and rejected with both readings suggested.

    Examples
    --------
    >>> parse_size("0000").name
    '4/0 AWG'
    >>> parse_size("250MCM").name
    '250 kcmil'
    >>> parse_size("95 mm²").name
    '95 mm2'
    """
    raw = str(text)
    s = " ".join(raw.strip().lower().replace("awg", " awg").split())
    if m := _AWG_RE.match(s):
        num, tag = m.group(1), m.group(2)
        num = _ZEROS.get(num, num)
        if "/" in num or tag or s.startswith("#"):
            key = f"{num} AWG"
            if key in SIZES:
                return SIZES[key]
        else:
            choices = [c for c in (f"{num} AWG", f"{num} mm2") if c in SIZES]
            if choices:
                raise SizeError(
                    raw, "a size with its system, e.g. " + " or ".join(repr(c) for c in choices)
                )
    if m := _KCMIL_RE.match(s):
        key = f"{int(float(m.group(1)))} kcmil"
        if key in SIZES:
            return SIZES[key]
    if m := _MM2_RE.match(s):
        key = f"{float(m.group(1)):g} mm2"
        if key in SIZES:
            return SIZES[key]
    close = _neighbours(s) or difflib.get_close_matches(raw.strip(), list(SIZES), n=2, cutoff=0.5)
    hint = (" — did you mean " + " or ".join(repr(c) for c in close) + "?") if close else ""
    raise SizeError(
        raw, "a standard size: 14 AWG … 4/0 AWG, 250 … 2000 kcmil, or 1.5 … 630 mm2" + hint
    )


def _neighbours(s: str) -> list[str]:
    """For a non-standard kcmil or mm² figure, the standard sizes just below and above it."""
    for rx, order, unit in ((_KCMIL_RE, KCMIL_SIZES, "kcmil"), (_MM2_RE, METRIC_SIZES, "mm2")):
        if (m := rx.match(s)) and math.isfinite(x := float(m.group(1))):
            below = [v for v in order if v < x][-1:]
            above = [v for v in order if v > x][:1]
            return [f"{v:g} {unit}" for v in below + above]
    return []


def next_larger(size: Size, steps: int = 1) -> Size | None:
    """The standard size ``steps`` above ``size`` in the same system, or None."""
    order = AWG_KCMIL_ORDER if size.system == "awg" else METRIC_ORDER
    i = order.index(size.name) + steps
    return SIZES[order[i]] if 0 <= i < len(order) else None


def smallest_at_least(area_mm2: float, system: str = "awg") -> Size | None:
    """The smallest standard size whose area is at least ``area_mm2`` [mm²]."""
    order = AWG_KCMIL_ORDER if system == "awg" else METRIC_ORDER
    for name in order:
        if SIZES[name].area_mm2 >= area_mm2 * (1 - 1e-9):
            return SIZES[name]
    return None


def is_finite_area(x: float) -> bool:
    return math.isfinite(x) and x > 0
