"""Drawings for the PDF report (reportlab.graphics): the one-line diagram, the
voltage profile and the fault-current chart. They draw figures from the
results (node figures, and the feed's description in ``results.diagram``);
they compute none. Figures are formatted by :mod:`feedcheck.render.display`.

The one-line diagram is in :mod:`.one_line`.
"""

from __future__ import annotations

import math
import os
from dataclasses import dataclass
from pathlib import Path

from reportlab.graphics.shapes import Circle, Drawing, Line, PolyLine, Rect, String
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from ..display import (
    DEFAULT_DISPLAY,
    Display,
    fixed,
    percent,
    plain,
)

GREY = colors.Color(0.45, 0.45, 0.45)
LIGHT = colors.Color(0.88, 0.88, 0.88)


@dataclass(frozen=True)
class Fonts:
    regular: str
    bold: str
    full_unicode: bool


_FONTS: Fonts | None = None
_FALLBACK_TEXT = {"Σ": "sum ", "φ": "phi", "→": "->", "θ": "theta", "₀": "0", "≈": "~"}
_FONT_DIRS = (
    "/usr/share/fonts/truetype/dejavu",
    "/usr/share/fonts/dejavu",
    "/usr/share/fonts/TTF",
    "/Library/Fonts",
    "C:/Windows/Fonts",
)


def fonts() -> Fonts:
    """Register the report fonts once: DejaVu Sans where installed (covers √ Σ φ Ω),
    else the Vera font that ships with reportlab (a few symbols spelt out)."""
    global _FONTS
    if _FONTS is not None:
        return _FONTS
    from reportlab.pdfbase import pdfmetrics
    from reportlab.pdfbase.ttfonts import TTFont

    for d in _FONT_DIRS:
        reg, bold = Path(d) / "DejaVuSans.ttf", Path(d) / "DejaVuSans-Bold.ttf"
        if reg.is_file() and bold.is_file():
            pdfmetrics.registerFont(TTFont("FC-Sans", str(reg)))
            pdfmetrics.registerFont(TTFont("FC-Sans-Bold", str(bold)))
            _FONTS = Fonts("FC-Sans", "FC-Sans-Bold", True)
            return _FONTS
    import reportlab

    base = Path(os.path.dirname(reportlab.__file__)) / "fonts"
    pdfmetrics.registerFont(TTFont("FC-Sans", str(base / "Vera.ttf")))
    pdfmetrics.registerFont(TTFont("FC-Sans-Bold", str(base / "VeraBd.ttf")))
    _FONTS = Fonts("FC-Sans", "FC-Sans-Bold", False)
    return _FONTS


def txt(s: object) -> str:
    """Text safe for the registered font (spells out glyphs the fallback lacks)."""
    s = str(s)
    if fonts().full_unicode:
        return s
    for a, b in _FALLBACK_TEXT.items():
        s = s.replace(a, b)
    return s


# ------------------------------------------------------------------ charts


def nice_ticks(lo: float, hi: float, n: int = 5) -> list[float]:
    """Round tick values covering [lo, hi] (about n of them)."""
    if not (math.isfinite(lo) and math.isfinite(hi)) or hi <= lo:
        hi = lo + 1.0
    raw = (hi - lo) / max(n, 1)
    mag = 10 ** math.floor(math.log10(raw))
    step = next(m * mag for m in (1, 2, 2.5, 5, 10) if m * mag >= raw)
    first = math.floor(lo / step) * step
    ticks = []
    t = first
    while t <= hi + step * 1e-9:
        ticks.append(round(t, 10))
        t += step
    if ticks[-1] < hi:
        ticks.append(round(t, 10))
    return ticks


def _axes(d, x0, y0, w, h, xt, yt, xlabel, ylabel, xfmt, yfmt):
    f = fonts()
    d.add(Rect(x0, y0, w, h, strokeColor=colors.black, fillColor=None, strokeWidth=0.8))

    def sx(v):
        return x0 + (v - xt[0]) / (xt[-1] - xt[0]) * w

    def sy(v):
        return y0 + (v - yt[0]) / (yt[-1] - yt[0]) * h

    for t in xt:
        d.add(Line(sx(t), y0, sx(t), y0 + h, strokeColor=LIGHT, strokeWidth=0.5))
        d.add(String(sx(t), y0 - 10, xfmt(t), fontName=f.regular, fontSize=7, textAnchor="middle"))
    for t in yt:
        d.add(Line(x0, sy(t), x0 + w, sy(t), strokeColor=LIGHT, strokeWidth=0.5))
        d.add(
            String(x0 - 4, sy(t) - 2.5, yfmt(t), fontName=f.regular, fontSize=7, textAnchor="end")
        )
    d.add(
        String(
            x0 + w / 2, y0 - 22, txt(xlabel), fontName=f.regular, fontSize=8, textAnchor="middle"
        )
    )
    lab = String(0, 0, txt(ylabel), fontName=f.regular, fontSize=8, textAnchor="middle")
    from reportlab.graphics.shapes import Group

    g = Group(lab)
    g.transform = (0, 1, -1, 0, x0 - 34, y0 + h / 2)
    d.add(g)
    return sx, sy


_DASHES = (None, [4, 2], [1, 2], [6, 2, 1, 2], [3, 3], [8, 3])


PROFILE_LABELS_PER_CHART = 16


def voltage_profile_charts(
    results,
    display: Display = DEFAULT_DISPLAY,
    width: float = 500.0,
    height: float = 260.0,
    max_labels: int = PROFILE_LABELS_PER_CHART,
) -> list[Drawing]:
    """Voltage (% of nominal) against distance from the source (in the display's
    length unit) along each path to a panel, in charts of at most about
    ``max_labels`` labelled nodes (paths kept whole, in feed order) on one shared
    scale; empty when no node carries ``voltage_pct``."""
    nodes = list(results.nodes)
    have = {n.id: n for n in nodes if n.values.get("voltage_pct") is not None}
    if not have:
        return []
    by_id = {n.id: n for n in nodes}
    parents = {n.parent for n in nodes if n.parent}
    leaves = [n for n in nodes if n.id in have and (n.id not in parents or n.kind == "panel")]
    paths = []
    for leaf in leaves:
        path, cur = [], leaf
        while cur is not None:
            if cur.id in have:
                path.append(cur)
            cur = by_id.get(cur.parent) if cur.parent else None
        paths.append(list(reversed(path)))
    vs = [n.values["voltage_pct"] for n in have.values()]
    ds = [display.length_value(n.distance_m) for n in have.values()]
    yt = nice_ticks(min(min(vs), 100.0 - 1.0) - 0.2, max(max(vs), 100.0))
    xt = nice_ticks(0.0, max(max(ds), 1.0))
    groups: list[list] = [[]]
    shown: set[str] = set()
    for path in paths:
        ids = {n.id for n in path}
        if groups[-1] and len(shown | ids) > max_labels:
            groups.append([])
            shown = set()
        groups[-1].append(path)
        shown |= ids
    return [_profile_part(g, xt, yt, display, width, height) for g in groups]


def voltage_profile_chart(
    results, display: Display = DEFAULT_DISPLAY, width: float = 500.0, height: float = 260.0
) -> Drawing | None:
    """The first part of :func:`voltage_profile_charts` (None without figures)."""
    parts = voltage_profile_charts(results, display, width, height)
    return parts[0] if parts else None


def _profile_part(paths, xt, yt, display: Display, width: float, height: float) -> Drawing:
    f = fonts()
    have = {n.id: n for path in paths for n in path}
    d = Drawing(width, height)
    x0, y0, w, h = 52, 34, width - 70, height - 46
    sx, sy = _axes(
        d,
        x0,
        y0,
        w,
        h,
        xt,
        yt,
        f"distance from the source ({display.length_unit})",
        "voltage (% of nominal)",
        plain,
        plain,
    )
    for i, path in enumerate(paths):
        pts = []
        for n in path:
            pts += [sx(display.length_value(n.distance_m)), sy(n.values["voltage_pct"])]
        if len(pts) >= 4:
            d.add(
                PolyLine(
                    pts,
                    strokeColor=colors.black,
                    strokeWidth=1,
                    strokeDashArray=_DASHES[i % len(_DASHES)],
                )
            )
    placed: list[tuple[float, float, float, float]] = []  # label boxes already drawn
    for n in have.values():
        x, y = sx(display.length_value(n.distance_m)), sy(n.values["voltage_pct"])
        d.add(Circle(x, y, 2.2, fillColor=colors.black, strokeColor=colors.black))
        label = txt(f"{n.id} {percent(n.values['voltage_pct'])}")
        w = stringWidth(label, f.regular, 6.5)
        lx, ly = _free_spot(x + 3, y + 3, w, 7.0, placed)
        placed.append((lx, ly, lx + w, ly + 7.0))
        d.add(String(lx, ly, label, fontName=f.regular, fontSize=6.5))
    return d


def _free_spot(x: float, y: float, w: float, h: float, placed) -> tuple[float, float]:
    """First of a few positions near (x, y) where a w × h label overlaps no placed one."""
    for dx, dy in (
        (0, 0),
        (0, -h - 4),
        (0, h),
        (0, -2 * h - 4),
        (0, 2 * h),
        (-w - 6, 0),
        (-w - 6, -h - 4),
    ):
        bx, by = x + dx, y + dy
        if all(bx + w < a or bx > c or by + h < b or by > e for a, b, c, e in placed):
            return bx, by
    return x, y


# the bars of each node: figure, legend, fill (the bolted maximum is line-to-line on a
# single-phase node, marked 1φ)
FAULT_BARS = (
    ("fault_max_a", "maximum bolted (three-phase; 1φ: line-to-line)", GREY),
    ("fault_duty_a", "interrupting duty (governing case × MF)", colors.black),
    ("fault_min_a", "minimum", colors.white),
)
FAULT_ROW_H = 22.0
FAULT_ROWS_PER_CHART = 24  # 24 × 22 pt + axes and legend stays well inside a letter page


def _finite(v) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)


def fault_current_charts(
    results, width: float = 500.0, rows_per_chart: int = FAULT_ROWS_PER_CHART
) -> list[Drawing]:
    """Maximum bolted, governing interrupting duty and minimum fault current at each
    node as grouped bars (kA), in feed order, split into charts of at most
    ``rows_per_chart`` nodes that share one scale (so bars on different pages
    compare); single-phase nodes are marked 1φ (their bolted fault is line-to-line);
    empty when no node carries any of the figures."""
    keys = [k for k, _, _ in FAULT_BARS]
    rows = [n for n in results.nodes if any(_finite(n.values.get(k)) for k in keys)]
    if not rows:
        return []
    vals = [n.values[k] for n in rows for k in keys if _finite(n.values.get(k))]
    xt = nice_ticks(0.0, max(vals) / 1000.0)
    step = max(1, int(rows_per_chart))
    return [_fault_chart_part(rows[i : i + step], xt, width) for i in range(0, len(rows), step)]


def fault_current_chart(results, width: float = 500.0) -> Drawing | None:
    """The first part of :func:`fault_current_charts` (None without figures)."""
    parts = fault_current_charts(results, width)
    return parts[0] if parts else None


def _fault_chart_part(rows, xt, width: float) -> Drawing:
    f = fonts()
    row_h = FAULT_ROW_H
    height = row_h * len(rows) + 70
    d = Drawing(width, height)
    x0, y0, w, h = 70, 34, width - 130, row_h * len(rows)
    sx, _ = _axes(d, x0, y0, w, h, xt, [0.0, 1.0], "fault current (kA)", "", plain, lambda t: "")
    for i, n in enumerate(rows):
        yc = y0 + h - row_h * (i + 0.5)
        name = f"{n.id} 1φ" if getattr(n, "phases", None) == 1 else n.id
        d.add(String(x0 - 4, yc - 3, txt(name), fontName=f.bold, fontSize=7.5, textAnchor="end"))
        for j, (k, _, fill) in enumerate(FAULT_BARS):
            v = n.values.get(k)
            if not _finite(v):
                continue
            x1, yb = sx(v / 1000.0), yc + 4.5 - 6.2 * j
            d.add(
                Rect(
                    x0, yb, x1 - x0, 5.2, fillColor=fill, strokeColor=colors.black, strokeWidth=0.5
                )
            )
            d.add(String(x1 + 3, yb + 0.4, fixed(v, 2, 1e-3), fontName=f.regular, fontSize=5.8))
    lx, ly = x0, height - 12
    for _, label, fill in FAULT_BARS:
        d.add(Rect(lx, ly, 10, 7, fillColor=fill, strokeColor=colors.black, strokeWidth=0.6))
        d.add(String(lx + 14, ly + 1, label, fontName=f.regular, fontSize=7))
        lx += 24 + stringWidth(label, f.regular, 7)
    return d
