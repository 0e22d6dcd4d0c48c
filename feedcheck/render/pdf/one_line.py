"""The one-line diagram of the report (reportlab.graphics), in our own drawing style.

A ladder: one row per node in feed order (source, transformers, panels), each indented
by its depth in the feed and fed by a line from its parent. Symbols: a circle with a
wave for the source, two overlapping circles for a transformer, a box for a panel.
Beside each symbol, in lines that wrap to the page: the node and its system (single-
phase nodes marked 1φ, with the count of failing and warning checks), its ratings
(source: available fault and X/R; transformer: kVA, %Z, X/R, connection, devices, tap;
panel: bus, main device or main lugs, interrupting rating), its fault figures (bolted
maximum, governing interrupting duty, minimum) and drop, the run that feeds it (sets,
size, grounding conductor, length in the job's unit, device). Each motor is a row of its
own under its panel (a circle marked M) with its phases, horsepower and the full-load
current used (and the table it came from).

Rows grow with their text, and the feed continues in further drawings, so a feed of any
size stays legible and every drawing fits a page. Figures come from the results (node
figures and ``results.diagram``) through :mod:`feedcheck.render.display`; nothing is
computed here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

from reportlab.graphics.shapes import Circle, Drawing, Line, PolyLine, Rect, String
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from ..display import (
    Display,
    amps,
    display_for,
    kiloamps,
    kilovoltamps,
    node_title,
    number,
    percent,
    service_caption,
    status_word,
)
from .drawing import GREY, LIGHT, fonts, txt

INDENT = 26.0
ROWS_PER_DRAWING = 16
MAX_DRAWING_H = 600.0  # inside a letter page's body with a heading above
LINE_H = {"head": 10.5, "rating": 9.0, "figs": 9.0, "sub": 8.2}
SIZE = {"head": 8.5, "rating": 7.4, "figs": 7.4, "sub": 6.8}
MIN_ROW_H = 34.0


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
    """A motor drawn as a row of its own under its panel (a diagram motor in node form)."""

    id: str
    parent: str
    motor: object
    kind: str = "motor"
    via_run: str | None = None
    voltage: str = ""
    values: dict = field(default_factory=dict)


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
    values: dict = field(default_factory=dict)


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


def _standby_text(row: _StandbyRow, display: Display) -> list[tuple[str, str]]:
    sb = row.standby
    if row.kind == "switch":
        return [
            ("head", f"{sb.switch_id} — transfer switch, {amps(sb.switch_rating_a, 0)}"),
            ("figs", f"normal: run {sb.normal_run} · standby: generator {sb.generator_id}"),
            ("sub", f"feeds {sb.panel_id} and everything below it in either position"),
        ]
    run = sb.generator_run
    sets = f"{run.sets} × " if run.sets > 1 else ""
    return [
        ("head", f"{sb.generator_id} — standby generator, {kilovoltamps(sb.rating_va)}"),
        ("figs", f'X"d {percent(sb.xdss_pct)} · Isc at terminals {kiloamps(sb.fault_a)}'),
        (
            "sub",
            f"to {sb.switch_id} by run {run.id}: {sets}{run.size} {run.material.capitalize()}, "
            f"{display.length_pair(run.length_m)}",
        ),
    ]


def _motor_text(row: _MotorRow) -> list[tuple[str, str]]:
    m = row.motor
    rating = f"{number(m.hp)} hp" if m.hp is not None else "hp not given"
    phases = f"{m.phases}-phase, " if m.phases else ""
    figs = f"{phases}{rating} · FLC {amps(m.full_load_a)} ({m.flc_source or 'nameplate'})"
    if m.locked_rotor_a is not None:
        figs += f" · locked rotor {amps(m.locked_rotor_a, 0)}"
    where = f"on panel {m.panel_id}" + (f" · {m.device}" if m.device else "")
    if m.disconnect_a is not None:
        where += f" · disconnect {amps(m.disconnect_a, 0)}"
    return [("head", f"{m.id} — motor"), ("figs", figs), ("sub", where)]


def _ratings(dn) -> list[str]:
    """The nameplate and device ratings of one diagram node, as parts of a line."""
    if dn is None:
        return []
    r = dn.ratings
    if dn.kind == "source":
        out = [f"available {kiloamps(r['fault_a'])}"] if "fault_a" in r else []
        return out + ([f"X/R {number(r['x_r'])}"] if "x_r" in r else [])
    if dn.kind == "transformer":
        out = [kilovoltamps(r["rating_va"])] if "rating_va" in r else []
        out += [f"{number(r['z_pct'])} % Z"] if "z_pct" in r else []
        out += [f"X/R {number(r['x_r'])}"] if "x_r" in r else []
        if "primary" in r and "secondary" in r:
            out.append(f"{r['primary']} → {r['secondary']}")
        if r.get("secondary_phases") == 1:
            out.append("single-phase")
        out += (
            [f"primary device {amps(r['primary_device_a'], 0)}"] if "primary_device_a" in r else []
        )
        if "secondary_device_a" in r:
            out.append(f"secondary device {amps(r['secondary_device_a'], 0)}")
        out += [f"tap {number(r['tap_pct'])} %"] if "tap_pct" in r else []
        return out
    out = [f"bus {amps(r['rating_a'], 0)}"] if "rating_a" in r else []
    out.append(f"main {amps(r['main_device_a'], 0)}" if "main_device_a" in r else "main lugs only")
    if "interrupting_a" in r:
        out.append(f"interrupting rating {kiloamps(r['interrupting_a'])}")
    if "instantaneous_a" in r:
        out.append(f"instantaneous {amps(r['instantaneous_a'], 0)}")
    return out


def _figures(node) -> list[str]:
    v, parts = node.values, []
    if "fault_max_a" in v:
        parts.append(f"Isc max {kiloamps(v['fault_max_a'])}")
    if "fault_duty_a" in v and v.get("fault_duty_case"):
        parts.append(f"duty {kiloamps(v['fault_duty_a'])} ({v['fault_duty_case']})")
    if "fault_min_a" in v:
        parts.append(f"min {kiloamps(v['fault_min_a'])}")
    if v.get("vdrop_pct") is not None:
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
    return parts


def _feed(node, run, display: Display) -> list[str]:
    if run is not None:
        sets = f"{run.sets} sets × " if run.sets > 1 else ""
        ground = f" + {run.ground} EGC" if run.ground else ""
        out = [
            f"fed by run {run.id}: {sets}{run.size} {run.material.capitalize()}{ground}",
            display.length_pair(run.length_m),
        ]
        if run.device_a is not None:
            out.append(f"device {amps(run.device_a, 0)}")
        return out
    if node.via_run:
        return [f"fed by run {node.via_run}"]
    if node.parent is not None:
        return [f"connected directly to {node.parent}"]
    return []


def _wrap(parts: list[str], font: str, size: float, width: float) -> list[str]:
    """Join parts with " · " into lines no wider than ``width`` (a part longer than a
    line is cut at a word)."""
    lines, cur = [], ""
    for part in parts:
        cand = f"{cur} · {part}" if cur else part
        if stringWidth(txt(cand), font, size) <= width or not cur:
            cur = cand
        else:
            lines.append(cur)
            cur = part
        while stringWidth(txt(cur), font, size) > width and " " in cur:
            words, head = cur.split(" "), ""
            while words and stringWidth(txt(f"{head} {words[0]}".strip()), font, size) <= width:
                head = f"{head} {words.pop(0)}".strip()
            if not head:
                head = words.pop(0)
            lines.append(head)
            cur = " ".join(words)
    if cur:
        lines.append(cur)
    return lines


def _node_text(node, results, flags, display: Display, width: float) -> list[tuple[str, str]]:
    """The lines beside a node: (style, text)."""
    if isinstance(node, _MotorRow):
        return _motor_text(node)
    if isinstance(node, _StandbyRow):
        return _standby_text(node, display)
    f = fonts()
    diagram = results.diagram
    head = node_title(node.id, node.kind, node.voltage)
    if getattr(node, "phases", None) == 1:
        head += " (1φ)"
    marks = {**flags.get(node.id, {})}
    for k, v in flags.get(node.via_run or "", {}).items():
        marks[k] = marks.get(k, 0) + v
    if marks:
        head += (
            "   ["
            + ", ".join(f"{marks[s]} {status_word(s)}" for s in ("fail", "warn") if s in marks)
            + "]"
        )
    run = diagram.run(node.via_run) if node.via_run else None
    caption = [service_caption(node.values)] if node.kind == "source" else []
    out = [("head", head)]
    for style, parts in (
        ("rating", _ratings(diagram.node(node.id))),
        ("figs", _figures(node)),
        ("sub", _feed(node, run, display) + [c for c in caption if c]),
    ):
        font = f.regular
        out += [(style, line) for line in _wrap(parts, font, SIZE[style], width)]
    return out


def _row_height(lines) -> float:
    return max(MIN_ROW_H, 6 + sum(LINE_H[s] for s, _ in lines))


def one_line_diagrams(results, width: float = 500.0) -> list[Drawing]:
    """One-line diagram of the feed as one or more drawings (at most 16 rows and
    :data:`MAX_DRAWING_H` points each), every node with its ratings and figures."""
    display = display_for(results)
    nodes = _rows(results)
    depth = _depths(nodes)
    flags: dict[str, dict[str, int]] = {}
    for fnd in getattr(results, "findings", ()):
        if fnd.status in ("fail", "warn"):
            c = flags.setdefault(fnd.subject.split("/")[0], {})
            c[fnd.status] = c.get(fnd.status, 0) + 1
    label_x = min(14 + (max(depth.values(), default=0) + 1) * INDENT + 18, width * 0.45)
    texts = [_node_text(n, results, flags, display, width - label_x - 2) for n in nodes]
    chunks, cur, h = [], [], 0.0
    for n, lines in zip(nodes, texts, strict=True):
        rh = _row_height(lines)
        if cur and (len(cur) >= ROWS_PER_DRAWING or h + rh > MAX_DRAWING_H):
            chunks.append(cur)
            cur, h = [], 0.0
        cur.append((n, lines, rh))
        h += rh
    if cur:
        chunks.append(cur)
    return [_draw_chunk(chunk, depth, label_x, width) for chunk in chunks]


def _draw_chunk(chunk, depth, label_x: float, width: float) -> Drawing:
    f = fonts()
    h = sum(rh for _, _, rh in chunk) + 8
    d = Drawing(width, h)
    pos, top = {}, h - 4
    for n, _, rh in chunk:
        pos[n.id] = (14 + depth[n.id] * INDENT + 10, top - 14)
        top -= rh
    half = {n.id: _symbol(d, n.kind, *pos[n.id]) for n, _, _ in chunk}
    for n, _, _ in chunk:
        if n.parent is None:
            continue
        x, y = pos[n.id]
        if n.parent in pos:
            px, py = pos[n.parent]
            ptop = py - half[n.parent]
        else:  # parent drawn in an earlier part
            px, ptop = 14 + depth.get(n.parent, 0) * INDENT + 10, h
        d.add(Line(px, ptop, px, y, strokeColor=colors.black, strokeWidth=1.2))
        d.add(Line(px, y, x - 9, y, strokeColor=colors.black, strokeWidth=1.2))
    for n, lines, _ in chunk:
        x, y = pos[n.id]
        d.add(
            Line(
                x + 12, y, label_x - 4, y, strokeColor=GREY, strokeWidth=0.4, strokeDashArray=[1, 2]
            )
        )
        ly = y + 6
        for style, text in lines:
            font = f.bold if style == "head" else f.regular
            color = GREY if style == "sub" else colors.black
            d.add(
                String(
                    label_x, ly - 3, txt(text), fontName=font, fontSize=SIZE[style], fillColor=color
                )
            )
            ly -= LINE_H[style]
    return d
