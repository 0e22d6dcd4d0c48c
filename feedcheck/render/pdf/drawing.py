"""Drawings for the PDF report (reportlab.graphics): the one-line diagram, the
voltage profile and the fault-current chart. They draw figures from the
results (node figures, and the feed's description in ``results.diagram``);
they compute none. Figures are formatted by :mod:`feedcheck.render.display`.

The one-line diagram is a ladder: one row per node in feed order (source,
transformers, panels), each indented by its depth in the feed, fed by a line
from its parent. Symbols: a circle with a wave for the source, two
overlapping circles for a transformer, a box for a panel. Rows have a fixed
height, so a feed of any size stays legible; long feeds continue in further
drawings.
"""

from __future__ import annotations

import math
import os
from dataclasses import dataclass, replace
from pathlib import Path

from reportlab.graphics.shapes import Circle, Drawing, Line, PolyLine, Rect, String
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from ..display import (
    DEFAULT_DISPLAY,
    Display,
    amps,
    display_for,
    fixed,
    kiloamps,
    node_title,
    percent,
    plain,
    service_caption,
    status_word,
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


# ------------------------------------------------------------ one-line diagram

ROW_H = 38.0
INDENT = 26.0
ROWS_PER_DRAWING = 16


def _depths(nodes) -> dict[str, int]:
    depth: dict[str, int] = {}
    for n in nodes:
        depth[n.id] = 0 if n.parent is None or n.parent not in depth else depth[n.parent] + 1
    return depth


def _symbol(d: Drawing, kind: str, x: float, y: float) -> float:
    """Draw a node symbol centred on (x, y); return its half height."""
    if kind == "source":
        d.add(Circle(x, y, 9, strokeColor=colors.black, fillColor=colors.white, strokeWidth=1))
        pts = []
        for i in range(13):
            t = i / 12
            pts += [x - 5 + 10 * t, y + 3 * math.sin(2 * math.pi * t)]
        d.add(PolyLine(pts, strokeColor=colors.black, strokeWidth=0.9))
        return 9.0
    if kind == "transformer":
        for dy in (4.5, -4.5):
            d.add(Circle(x, y + dy, 7, strokeColor=colors.black, fillColor=None, strokeWidth=1))
        return 11.5
    if kind in ("motor", "generator"):
        letter = "M" if kind == "motor" else "G"
        d.add(Circle(x, y, 7, strokeColor=colors.black, fillColor=colors.white, strokeWidth=1))
        d.add(String(x, y - 3, letter, fontName=fonts().bold, fontSize=8, textAnchor="middle"))
        return 7.0
    if kind == "switch":  # a transfer switch: a blade between two contacts
        for dx in (-6, 6):
            d.add(Circle(x + dx, y + 4, 1.6, strokeColor=colors.black, fillColor=colors.white))
        d.add(Circle(x, y - 5, 1.6, strokeColor=colors.black, fillColor=colors.black))
        d.add(Line(x, y - 5, x - 6, y + 4, strokeColor=colors.black, strokeWidth=1.2))
        return 7.0
    d.add(Rect(x - 9, y - 7, 18, 14, strokeColor=colors.black, fillColor=LIGHT, strokeWidth=1))
    d.add(Line(x - 5, y + 3, x + 5, y + 3, strokeColor=colors.black, strokeWidth=1.4))
    return 7.0


@dataclass(frozen=True)
class _MotorRow:
    """A motor drawn as a row under its panel (a diagram motor in node form)."""

    id: str
    parent: str
    motor: object
    kind: str = "motor"
    via_run: str | None = None
    voltage: str = ""


@dataclass(frozen=True)
class _StandbyRow:
    """The transfer switch or the generator of a standby source, drawn as a row: the
    switch between the normal feed and its panel, the generator under the switch."""

    id: str
    parent: str | None
    standby: object
    kind: str = "switch"
    via_run: str | None = None
    voltage: str = ""


def _rows(results) -> list:
    """The nodes in feed order, each panel's motors right after it; a standby source's
    transfer switch above its panel (the panel hung under it) and the generator beside."""
    motors: dict[str, list] = {}
    for m in getattr(results.diagram, "motors", ()):
        motors.setdefault(m.panel_id, []).append(m)
    sb = getattr(results.diagram, "standby", None)
    rows = []
    for n in results.nodes:
        if sb is not None and n.id == sb.panel_id:
            rows.append(_StandbyRow(sb.switch_id, n.parent, sb))
            rows.append(_StandbyRow(sb.generator_id, sb.switch_id, sb, "generator"))
            n = replace(n, parent=sb.switch_id)
        rows.append(n)
        rows += [_MotorRow(m.id, n.id, m) for m in motors.get(n.id, ())]
    return rows


def _standby_lines(row: _StandbyRow, display: Display) -> tuple[str, str, str]:
    sb = row.standby
    if row.kind == "switch":
        return (
            f"{sb.switch_id} — transfer switch, {amps(sb.switch_rating_a, 0)}",
            f"normal: run {sb.normal_run} · standby: generator {sb.generator_id}",
            f"feeds {sb.panel_id} and everything below it in either position",
        )
    run = sb.generator_run
    sets = f"{run.sets} × " if run.sets > 1 else ""
    return (
        f"{sb.generator_id} — standby generator, {plain(sb.rating_va / 1000)} kVA",
        f'X"d {percent(sb.xdss_pct)} · Isc at terminals {kiloamps(sb.fault_a)}',
        f"to {sb.switch_id} by run {run.id}: {sets}{run.size} {run.material.capitalize()}, "
        f"{display.length_pair(run.length_m)}",
    )


def _motor_lines(row: _MotorRow) -> tuple[str, str, str]:
    m = row.motor
    rating = f"{plain(m.hp)} hp" if m.hp is not None else "hp not given"
    phases = f"{m.phases}-phase, " if m.phases else ""
    figs = f"{phases}{rating} · FLC {amps(m.full_load_a)} ({m.flc_source or 'nameplate'})"
    if m.locked_rotor_a is not None:
        figs += f" · locked rotor {amps(m.locked_rotor_a, 0)}"
    return f"{m.id} — motor", figs, f"on panel {m.panel_id}"


def _node_lines(node, run, display: Display) -> tuple[str, str, str]:
    if isinstance(node, _MotorRow):
        return _motor_lines(node)
    if isinstance(node, _StandbyRow):
        return _standby_lines(node, display)
    head = node_title(node.id, node.kind, node.voltage)
    v = node.values
    parts = []
    if "fault_max_a" in v:
        parts.append(f"Isc max {kiloamps(v['fault_max_a'])}")
    if "fault_min_a" in v:
        parts.append(f"min {kiloamps(v['fault_min_a'])}")
    if "vdrop_pct" in v and v["vdrop_pct"] is not None:
        parts.append(f"drop {percent(v['vdrop_pct'])}")
    if node.kind == "transformer":
        if "rated_secondary_a" in v:
            parts.append(f"rated {amps(v['rated_secondary_a'])} secondary")
        if "loading_pct" in v:
            parts.append(f"loading {percent(v['loading_pct'], 0)}")
    if not parts and node.kind != "source":
        parts.append("no fault-current or voltage-drop figures in these results")
    if node.kind == "source" and "fault_max_a" not in v:
        parts.append("supply at the transformer primary")
    sub = ""
    if run is not None:
        sets = f"{run.sets} × " if run.sets > 1 else ""
        sub = (
            f"fed by run {run.id}: {sets}{run.size} {run.material.capitalize()}, "
            f"{display.length_pair(run.length_m)}"
        )
    elif node.via_run:
        sub = f"fed by run {node.via_run}"
    elif node.parent is not None:
        sub = f"connected directly to {node.parent}"
    elif node.kind == "source":
        sub = service_caption(v)
    return head, " · ".join(parts), sub


def one_line_diagrams(results, width: float = 500.0) -> list[Drawing]:
    """One-line diagram of the feed as one or more drawings (16 rows each).

    Each node is labelled with its maximum and minimum fault current and its
    voltage drop where the results carry them; each feeding run (from
    ``results.diagram``) with its sets, size, material and length.
    """
    f = fonts()
    display = display_for(results)
    nodes = _rows(results)
    depth = _depths(nodes)
    runs = {r.id: r for r in results.diagram.runs}
    max_depth = max(depth.values(), default=0)
    flags: dict[str, dict[str, int]] = {}
    for fnd in getattr(results, "findings", ()):
        if fnd.status in ("fail", "warn"):
            c = flags.setdefault(fnd.subject.split("/")[0], {})
            c[fnd.status] = c.get(fnd.status, 0) + 1
    label_x = min(14 + (max_depth + 1) * INDENT + 18, width * 0.45)
    drawings = []
    for start in range(0, len(nodes), ROWS_PER_DRAWING):
        chunk = nodes[start : start + ROWS_PER_DRAWING]
        h = ROW_H * len(chunk) + 8
        d = Drawing(width, h)
        pos = {}
        for i, n in enumerate(chunk):
            pos[n.id] = (14 + depth[n.id] * INDENT + 10, h - ROW_H * (i + 0.5) - 4)
        half = {}
        for n in chunk:
            x, y = pos[n.id]
            half[n.id] = _symbol(d, n.kind, x, y)
        for n in chunk:
            if n.parent is None:
                continue
            x, y = pos[n.id]
            if n.parent in pos:
                px, py = pos[n.parent]
                top = py - half[n.parent]
            else:  # parent drawn in an earlier part
                px = 14 + depth.get(n.parent, 0) * INDENT + 10
                top = h
            d.add(Line(px, top, px, y, strokeColor=colors.black, strokeWidth=1.2))
            d.add(Line(px, y, x - 9, y, strokeColor=colors.black, strokeWidth=1.2))
        for n in chunk:
            x, y = pos[n.id]
            head, figs, sub = _node_lines(n, runs.get(n.via_run) if n.via_run else None, display)
            marks = {**flags.get(n.id, {})}
            for k, v in flags.get(n.via_run or "", {}).items():
                marks[k] = marks.get(k, 0) + v
            if marks:
                counts = [f"{marks[s]} {status_word(s)}" for s in ("fail", "warn") if s in marks]
                head += "   [" + ", ".join(counts) + "]"
            d.add(
                Line(
                    x + 12,
                    y,
                    label_x - 4,
                    y,
                    strokeColor=GREY,
                    strokeWidth=0.4,
                    strokeDashArray=[1, 2],
                )
            )
            d.add(String(label_x, y + 6, txt(head), fontName=f.bold, fontSize=8.5))
            d.add(String(label_x, y - 4.5, txt(figs), fontName=f.regular, fontSize=7.8))
            if sub:
                d.add(
                    String(
                        label_x, y - 14, txt(sub), fontName=f.regular, fontSize=6.8, fillColor=GREY
                    )
                )
        drawings.append(d)
    return drawings


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


FAULT_ROW_H = 22.0
FAULT_ROWS_PER_CHART = 24  # 24 × 22 pt + axes and legend stays well inside a letter page


def _finite(v) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v)


def fault_current_charts(
    results, width: float = 500.0, rows_per_chart: int = FAULT_ROWS_PER_CHART
) -> list[Drawing]:
    """Maximum and minimum fault current at each node as paired bars (kA), in
    feed order, split into charts of at most ``rows_per_chart`` nodes that share
    one scale (so bars on different pages compare); empty when no node carries
    ``fault_max_a`` or ``fault_min_a``."""
    rows = [
        n
        for n in results.nodes
        if any(_finite(n.values.get(k)) for k in ("fault_max_a", "fault_min_a"))
    ]
    if not rows:
        return []
    vals = [
        n.values[k]
        for n in rows
        for k in ("fault_max_a", "fault_min_a")
        if _finite(n.values.get(k))
    ]
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
        d.add(String(x0 - 4, yc - 3, txt(n.id), fontName=f.bold, fontSize=7.5, textAnchor="end"))
        for k, dy, fill in (("fault_max_a", 2.5, GREY), ("fault_min_a", -6.5, colors.white)):
            v = n.values.get(k)
            if not _finite(v):
                continue
            x1 = sx(v / 1000.0)
            d.add(
                Rect(
                    x0,
                    yc + dy - 1,
                    x1 - x0,
                    7.5,
                    fillColor=fill,
                    strokeColor=colors.black,
                    strokeWidth=0.6,
                )
            )
            d.add(String(x1 + 3, yc + dy, fixed(v, 2, 1e-3), fontName=f.regular, fontSize=6.5))
    ly = height - 12
    d.add(Rect(x0, ly, 10, 7, fillColor=GREY, strokeColor=colors.black, strokeWidth=0.6))
    d.add(String(x0 + 14, ly + 1, "maximum (bolted three-phase)", fontName=f.regular, fontSize=7))
    d.add(
        Rect(x0 + 150, ly, 10, 7, fillColor=colors.white, strokeColor=colors.black, strokeWidth=0.6)
    )
    d.add(String(x0 + 164, ly + 1, "minimum", fontName=f.regular, fontSize=7))
    return d
