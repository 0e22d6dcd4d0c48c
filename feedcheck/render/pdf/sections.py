"""Sections of the PDF report as reportlab platypus flowables.

Every section renders what :class:`~feedcheck.results.Results` carries — node
figures, findings, calculation sheets, schedules, tables, methods — and
computes nothing. Node figures and schedule columns not known here still
appear, under a label made from their key.
"""

from __future__ import annotations

import math
import re
from xml.sax.saxutils import escape

from reportlab.lib import colors
from reportlab.lib.styles import ParagraphStyle
from reportlab.pdfbase.pdfmetrics import stringWidth
from reportlab.platypus import CondPageBreak, Flowable, Paragraph, Spacer, Table, TableStyle

from ... import CAUTION
from ..display import (
    DEFAULT_DISPLAY,
    MISSING,
    STATUS_MEANING,
    Display,
    amps,
    display_for,
    figure_label,
    finding_figures,
    fixed,
    is_flagged,
    kilovoltamps,
    milliohms,
    node_figure,
    number,
    status_word,
    unconfirmed_line,
    whole_or_number,
)
from .drawing import fonts, txt

WIDTH = 528.0  # frame width in points (US letter, 42 pt margins)
FAIL_BG = colors.Color(0.97, 0.80, 0.80)
WARN_BG = colors.Color(1.0, 0.92, 0.70)
HEAD_BG = colors.Color(0.86, 0.86, 0.86)
GRID = colors.Color(0.55, 0.55, 0.55)
SHORT_CAUTION = (
    "An aid, not an approval: verify against the locally adopted code; "
    "a licensed electrician or engineer must review."
)

# schedule column: (header, width weight, decimals or None for text)
SCHEDULE_COLUMNS: dict[str, tuple[str, float, int | None]] = {
    "circuit": ("Ckt", 0.6, None),
    "description": ("Description", 1.8, None),
    "poles": ("Pol", 0.55, 0),
    "phase": ("Ph", 0.65, None),
    "kind": ("Kind", 1.45, None),
    "continuous": ("Cont", 0.8, None),
    "load_va": ("Load VA", 0.95, 0),
    "pf": ("PF", 0.8, 2),
    "current_a": ("I A", 0.75, 1),
    "breaker_a": ("Brkr A", 0.75, 0),
    "size": ("Wire", 1.3, None),
    "ground": ("EGC", 1.15, None),
    "length_m": ("Len", 0.75, None),  # header and figure in the display's length unit
    "ampacity_a": ("Amp A", 0.75, 0),
    "vdrop_pct": ("Drop %", 0.95, 2),
    "total_vdrop_pct": ("Total %", 0.85, 2),
    "status": ("Status", 1.15, None),
    "reason": ("Reason", 2.05, None),
    "row": ("Row", 0.75, None),
}


_STYLES: dict[str, ParagraphStyle] = {}


def styles() -> dict[str, ParagraphStyle]:
    """The paragraph styles of the report (made once, after the fonts are registered)."""
    if _STYLES:
        return _STYLES
    f = fonts()
    base = ParagraphStyle("fc-body", fontName=f.regular, fontSize=9, leading=11.5)

    def style(name: str, size: float, leading: float, bold: bool = False, **kw):
        font = f.bold if bold else f.regular
        return ParagraphStyle(
            name, parent=base, fontName=font, fontSize=size, leading=leading, **kw
        )

    _STYLES.update(
        {
            "body": base,
            "small": style("fc-small", 7.5, 9),
            "cell": style("fc-cell", 7.8, 9.4),
            "cellb": style("fc-cellb", 7.8, 9.4, bold=True),
            "sched": style("fc-sched", 6.8, 8),
            "schedb": style("fc-schedb", 6.8, 8, bold=True),
            "note": style("fc-note", 7, 8.4, textColor=colors.Color(0.3, 0.3, 0.3)),
            "h1": style("fc-h1", 14, 18, bold=True, spaceAfter=6, keepWithNext=1),
            "h2": style("fc-h2", 10.5, 13, bold=True, spaceBefore=8, spaceAfter=3, keepWithNext=1),
            # a heading over a table that may split: kept with it by a conditional break
            # (keepWithNext would carry a long table whole to the next page)
            "h2t": style("fc-h2t", 10.5, 13, bold=True, spaceBefore=8, spaceAfter=3),
            "title": style("fc-title", 22, 27, bold=True),
            "subtitle": style("fc-sub", 12, 16),
            "box": style(
                "fc-box",
                9,
                12,
                borderColor=colors.black,
                borderWidth=1,
                borderPadding=6,
                spaceBefore=10,
                spaceAfter=10,
            ),
        }
    )
    return _STYLES


# Text the user wrote may be of any length: a schedule cell shows its first
# SCHEDULE_CELL_CHARS characters, any other paragraph its first PARAGRAPH_CHARS, with an
# ellipsis (the whole text stays in the embedded inputs and results).
SCHEDULE_CELL_CHARS = 160
PARAGRAPH_CHARS = 1500


def p(text: object, style: str = "cell") -> Paragraph:
    """Paragraph of plain (escaped) text, clipped to ``PARAGRAPH_CHARS`` with an ellipsis."""
    return paragraph(escape(txt(_clip(text, PARAGRAPH_CHARS))), styles()[style])


# A report repeats the same few texts in the same styles thousands of times (column
# heads, status words, wire sizes): reportlab parses each paragraph's markup anew, so
# the parse is kept per (markup, style) and each paragraph gets its own copy of the
# fragments. Cleared when it grows past PARSED_LIMIT entries.
PARSED_LIMIT = 100_000
_PARSED: dict[tuple[str, str], tuple] = {}


class _Para(Paragraph):
    """A paragraph that keeps its lines per width: a table wraps each cell to learn the
    row heights, again to draw it, and again in every pass and every part of a split
    table (a long table's remainder is measured whole after each page); the lines at a
    width depend only on the paragraph, so they are broken once per width."""

    def wrap(self, availWidth, availHeight):
        kept = self.__dict__.get("_fc_lines")
        if kept is not None and kept[0] == availWidth:
            _, self.width, self._wrapWidths, self.blPara, self.height = kept
            return self.width, self.height
        w, h = super().wrap(availWidth, availHeight)
        if "blPara" in self.__dict__ and self.width == availWidth:
            self._fc_lines = (availWidth, self.width, self._wrapWidths, self.blPara, self.height)
        return w, h


def paragraph(markup: str, style: ParagraphStyle) -> Paragraph:
    """``Paragraph(markup, style)``, its markup parsed once per (markup, style)."""
    key = (markup, style.name)
    parsed = _PARSED.get(key)
    if parsed is None or parsed[1] is not style:
        para = _Para(markup, style)
        if len(_PARSED) >= PARSED_LIMIT:
            _PARSED.clear()
        _PARSED[key] = (para.text, style, para.style, [f.clone() for f in para.frags])
        return para
    text, _, parsed_style, frags = parsed
    return _Para(text, parsed_style, frags=[f.clone() for f in frags])


TABLE_HEAD_ROOM = 90.0  # a table heading starts a page unless this much room is left


def fitted(text: object, style: str, width: float) -> str | Paragraph:
    """A table cell of plain text: the text itself where the paragraph would print it
    on one line as written (no markup, single spaces, narrower than ``width``, the cell's
    width less its padding), else the paragraph. The table draws such a text in the
    style's font at the paragraph's baseline, much faster (its table carries the style:
    ``grid_table(..., font=style)``)."""
    shown = txt(_clip(text, PARAGRAPH_CHARS))
    st = styles()[style]
    if shown == " ".join(shown.split()) and stringWidth(shown, st.fontName, st.fontSize) < width:
        return shown
    return paragraph(escape(shown), st)


def table_heading(text: str) -> list:
    """A heading over a table that may split across pages (a conditional break keeps it
    off a page foot)."""
    return [CondPageBreak(TABLE_HEAD_ROOM), p(text, "h2t")]


def status_cell(status: str, width: float) -> str | Paragraph:
    """The status word in a cell ``width`` wide (bold when it fails or warns)."""
    if is_flagged(status):
        return p(status_word(status), "cellb")
    return fitted(status_word(status), "cell", width)


def grid_table(
    rows,
    widths,
    header=True,
    status_col: int | None = None,
    statuses=(),
    pad: float = 3,
    font: str | None = None,
):
    """A ruled table; rows whose status is fail/warn get a tinted status cell
    (the status word carries the meaning without colour). Cells of plain text
    (:func:`fitted`) are drawn in the paragraph style ``font``."""
    t = Table(rows, colWidths=widths, repeatRows=1 if header else 0)
    cmds = [
        ("GRID", (0, 0), (-1, -1), 0.4, GRID),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("LEFTPADDING", (0, 0), (-1, -1), pad),
        ("RIGHTPADDING", (0, 0), (-1, -1), pad),
        ("TOPPADDING", (0, 0), (-1, -1), 2),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
    ]
    if font is not None:
        st = styles()[font]
        cmds.append(("FONT", (0, 0), (-1, -1), st.fontName, st.fontSize, st.leading))
    if header:
        cmds.append(("BACKGROUND", (0, 0), (-1, 0), HEAD_BG))
    if status_col is not None:
        for i, s in enumerate(statuses, start=1 if header else 0):
            bg = {"fail": FAIL_BG, "warn": WARN_BG}.get(s)
            if bg is not None:
                cmds.append(("BACKGROUND", (status_col, i), (status_col, i), bg))
                cmds.append(("LINEBEFORE", (0, i), (0, i), 2.5, colors.black))
    t.setStyle(TableStyle(cmds))
    return t


def headed(cells: list[str]) -> list[Paragraph]:
    return [p(c, "cellb") for c in cells]


# -------------------------------------------------------------------- cover


def _clip(s: str, n: int) -> str:
    s = str(s)
    return s if len(s) <= n else s[: n - 1] + "…"


def cover(results, heading, before_tables: list = ()) -> list:
    j = results.job_summary
    c = results.counts()
    out = [
        heading("Feed calculation report", "cover", 0, "title"),
        Spacer(1, 4),
        p("Sizing and checks of a low-voltage transformer feed", "subtitle"),
        Spacer(1, 18),
    ]
    rows = [
        ("Project", j.get("name", "")),
        ("Site", j.get("site", "")),
        ("Prepared by", j.get("prepared_by", "")),
        ("Date", j.get("date", "")),
        ("Revision", j.get("revision", "") or MISSING),
        ("Rule set", j.get("rules", "")),
        ("Job file", f"{j.get('file', '')}  (sha256 {results.job_sha256[:16]})"),
        ("Made with", f"feedcheck {j.get('feedcheck_version', '')}"),
    ]
    extra = [
        (figure_label(k)[0], f"{number(v)} {figure_label(k)[1]}".strip())
        for k, v in j.items()
        if k
        not in (
            "name",
            "site",
            "prepared_by",
            "date",
            "revision",
            "rules",
            "file",
            "feedcheck_version",
        )
    ]
    out.append(
        grid_table(
            [[p(a, "cellb"), p(b, "body")] for a, b in rows + extra], [110, WIDTH - 110], False
        )
    )
    out += [Spacer(1, 14), p("Summary of checks", "h2")]
    order = ("fail", "warn", "ok", "info")
    cells = [
        [p(f"{status_word(s, loud=True)}: {c.get(s, 0)}", "h2") for s in order],
        [p(STATUS_MEANING[s], "small") for s in order],
    ]
    t = Table(cells, colWidths=[WIDTH / 4] * 4)
    cmds = [("BOX", (i, 0), (i, 1), 1, colors.black) for i in range(4)]
    if c.get("fail"):
        cmds.append(("BACKGROUND", (0, 0), (0, 1), FAIL_BG))
    if c.get("warn"):
        cmds.append(("BACKGROUND", (1, 0), (1, 1), WARN_BG))
    t.setStyle(TableStyle(cmds))
    out.append(t)
    out.append(paragraph(escape(txt(CAUTION)), styles()["box"]))
    out += list(before_tables)
    out += [Spacer(1, 4), p("Tables in force (versions)", "h2")]
    trows = [headed(["table", "origin", "edition", "sha256 (first 16)"])]
    for tb in results.provenance:
        trows.append(
            [
                p(tb.name, "note"),
                p(tb.origin, "note"),
                p(_clip(tb.edition, 60), "note"),
                p(tb.sha256[:16], "note"),
            ]
        )
    out.append(grid_table(trows, [150, 56, 202, 120]))
    return out


# ------------------------------------------------------------ findings


def findings_summary(results, page_of, heading) -> list:
    out = [heading("Summary of findings", "findings", 0, "h1")]
    c = results.counts()
    shown = [f for f in results.sorted_findings() if f.status in ("fail", "warn") or f.unconfirmed]
    out.append(
        p(
            f"{c['fail']} failing and {c['warn']} warning checks are listed here, failures "
            f"first; {c['ok']} passing checks and {c['info']} information figures appear on "
            "each element's calculation sheet (page in the last column). "
            + unconfirmed_line(len(results.unconfirmed()))
            + " (rows of the tables not confirmed in a published copy; such checks are "
            "listed here too, each naming its rows).",
            "body",
        )
    )
    out.append(Spacer(1, 6))
    if not shown:
        out.append(p("No check failed and none gave a warning.", "h2"))
        return out
    out.append(findings_table(shown, page_of, with_subject=True, display=display_for(results)))
    return out


def _check_cell(f) -> list:
    cell = [p(f.check, "cellb")]
    if f.note:
        cell.append(p(f.note, "note"))
    cell += [p(f"Unconfirmed: {u}", "note") for u in f.unconfirmed]
    return cell


def findings_table(findings, page_of=None, with_subject=False, display=DEFAULT_DISPLAY):
    head = (
        ["status"]
        + (["element"] if with_subject else [])
        + ["check", "figure", "limit", "rule id"]
        + (["page"] if page_of else [])
    )
    widths = [40, 50, 184, 62, 62, 120] if with_subject else [40, 208, 70, 70, 140]
    if page_of:
        widths.append(32)
    widths = [w * WIDTH / sum(widths) for w in widths]
    room = [w - 6 for w in widths]  # the text width of each column (padding 3 each side)
    rows = [headed(head)]
    for f in findings:
        value, limit = finding_figures(f.value, f.limit, f.unit, display)
        row = [status_cell(f.status, room[0])]
        if with_subject:
            row.append(p(f.subject, "cellb"))
        row.append(_check_cell(f))
        figures = [value or MISSING, limit or MISSING, f.rule_id]
        if page_of:
            figures.append(page_of(f.subject))
        last = room[-len(figures) :]  # the page: a text, or a cell drawn at the end
        row += [
            t if isinstance(t, Flowable) else fitted(t, "cell", w)
            for t, w in zip(figures, last, strict=True)
        ]
        rows.append(row)
    statuses = [f.status for f in findings]
    return grid_table(rows, widths, status_col=0, statuses=statuses, font="cell")


# --------------------------------------------------------- calculation sheets


def node_figures_table(node):
    """The node's figures, labelled for people (the JSON keys stay in the JSON)."""
    rows = [headed(["figure", "value", "unit"])]
    widths = [300, 110, WIDTH - 410]
    for k, v in node.values.items():
        cells = node_figure(k, v)  # label, figure, unit
        rows.append([fitted(c, "cell", w - 6) for c, w in zip(cells, widths, strict=True)])
    return grid_table(rows, widths, font="cell")


def sheet_section(
    sheet, node, findings, tables_by_name, heading, display: Display = DEFAULT_DISPLAY
) -> list:
    out = [heading(f"Calculation sheet — {sheet.title}", f"sheet:{sheet.element_id}", 1, "h1")]
    if sheet.inputs:
        out += table_heading("Inputs")
        rows = [[p(a, "cellb"), fitted(b, "cell", WIDTH - 176)] for a, b in sheet.inputs]
        out.append(grid_table(rows, [170, WIDTH - 170], False, font="cell"))
    if sheet.steps:
        out += table_heading("Calculation")
        rows = [headed(["#", "step", "formula and substituted values", "result", "rule id"])]
        for i, s in enumerate(sheet.steps, start=1):
            res = number(s.result)
            rows.append(
                [
                    fitted(str(i), "cell", 12),
                    p(s.label, "cellb"),
                    [p(s.formula), p("= " + s.substituted, "note")],
                    p(f"{res} {s.unit}".strip(), "cellb"),
                    fitted(s.rule_id or MISSING, "cell", WIDTH - 416),
                ]
            )
        out.append(grid_table(rows, [18, 112, 210, 70, WIDTH - 410], font="cell"))
    if sheet.buildup is not None:
        out += buildup_section(sheet.buildup)
    if findings:
        out += table_heading("Checks: figure, limit, status")
        out.append(findings_table(findings, display=display))
    if node is not None and node.values:
        out += table_heading("Figures at this node")
        out.append(node_figures_table(node))
    if sheet.tables_used:
        out += table_heading("Tables used")
        rows = [headed(["table", "title", "edition", "sha256"])]
        widths = [130, 200, 100, WIDTH - 430]
        for name in sheet.tables_used:
            tb = tables_by_name.get(name)
            cells = (name, tb.title, tb.edition, tb.sha256[:16]) if tb else (name, "", "", MISSING)
            rows.append([fitted(c, "cell", w - 6) for c, w in zip(cells, widths, strict=True)])
        out.append(grid_table(rows, widths, font="cell"))
    return out


def buildup_section(b) -> list:
    """The node's impedance build-up: components, their R and X in both cases referred to
    the node's voltage, the sums and the fault figures they give."""
    out = table_heading(f"Impedance build-up, per phase, referred to {b.voltage}")
    rows = [headed(["component", "max case", "R mΩ", "X mΩ", "min case", "R mΩ", "X mΩ"])]
    for r in b.rows:
        rows.append(
            [
                p(r.component),
                p(r.max_case),
                *ohm_pair(r.z_max_ohm),
                p(r.min_case),
                *ohm_pair(r.z_min_ohm),
            ]
        )
    rows.append(
        [
            p("Sum (source to this node)", "cellb"),
            p(""),
            *ohm_pair(b.z_max_ohm, "cellb"),
            p(""),
            *ohm_pair(b.z_min_ohm, "cellb"),
        ]
    )
    out.append(grid_table(rows, [200, 52, 46, 46, 52, 46, WIDTH - 442]))
    motors = f" + motors {amps(b.motor_a, 0)}" if b.motor_a > 0 else ""
    for case, c, z, ohmic, total in (
        ("Maximum", b.c_max, b.z_max_abs_ohm, b.fault_ohmic_max_a, b.fault_max_a),
        ("Minimum", b.c_min, b.z_min_abs_ohm, b.fault_min_a, b.fault_min_a),
    ):
        more = f"{motors} = {amps(total, 0)}" if case == "Maximum" and motors else ""
        out.append(
            p(
                f"{case}: |Z| = {milliohms(z)} mΩ; I = c·V_LL/(√3·|Z|) = {number(c)} × "
                f"{number(b.voltage_v)} V / (√3 × {milliohms(z)} mΩ) = {amps(ohmic, 0)}{more}",
                "small",
            )
        )
    return out


def ohm_pair(z: complex, style: str = "cell") -> list:
    return [p(milliohms(z.real), style), p(milliohms(z.imag), style)]


# ------------------------------------------------------------ schedules


def _cell_text(col: str, v, decimals, display: Display) -> str:
    if v is None or (isinstance(v, float) and math.isnan(v)):
        return ""
    if col == "status":
        return status_word(v)
    if col == "continuous":
        return "yes" if bool(v) else ""
    numeric = isinstance(v, (int, float)) and not isinstance(v, bool)
    if col == "length_m" and numeric:
        return display.length_figure(v)
    if decimals is not None and numeric:
        return fixed(v, decimals)
    if isinstance(v, float):
        return number(v)
    return str(v)


def _column_header(col: str, display: Display) -> str:
    if col == "length_m":
        return f"{SCHEDULE_COLUMNS[col][0]} {display.length_unit}"
    if col in SCHEDULE_COLUMNS:
        return SCHEDULE_COLUMNS[col][0]
    return figure_label(col)[0]


def schedule_table(circuits, panel_id: str = "", display: Display = DEFAULT_DISPLAY):
    """Panel schedule as a table: known columns in a fixed order, others after
    (a column that only repeats the panel's id is left out). Rows flagged
    ``fail``/``warn`` carry the status word, a tint and a bar."""
    if "size" in circuits.columns and "material" in circuits.columns:  # "12 AWG Cu"
        circuits = circuits.assign(
            size=circuits["size"].astype(str) + " " + circuits["material"].astype(str).str.title()
        ).drop(columns=["material"])
    cols = [c for c in SCHEDULE_COLUMNS if c in circuits.columns]
    cols += [c for c in circuits.columns if c not in SCHEDULE_COLUMNS]
    cols = [c for c in cols if not (panel_id and (circuits[c].astype(str) == panel_id).all())]
    weights = [SCHEDULE_COLUMNS.get(c, (c, 1.2, None))[1] for c in cols]
    scale = WIDTH / sum(weights)
    pad = 1.5
    room = [w * scale - 2 * pad for w in weights]  # the text width of each column
    rows = [[p(_column_header(c, display), "schedb") for c in cols]]
    statuses = []
    for rec in circuits.to_dict("records"):
        st = str(rec.get("status", "")).lower()
        statuses.append(st)
        row = []
        for c, width in zip(cols, room, strict=True):
            dec = SCHEDULE_COLUMNS.get(c, ("", 0, None))[2]
            text = _clip(_cell_text(c, rec.get(c), dec, display), SCHEDULE_CELL_CHARS)
            bold = c == "status" and is_flagged(st)
            row.append(p(text, "schedb") if bold else fitted(text, "sched", width))
        rows.append(row)
    sc = cols.index("status") if "status" in cols else None
    widths = [w * scale for w in weights]
    return grid_table(rows, widths, status_col=sc, statuses=statuses, pad=pad, font="sched")


def review_order(circuits, schedule):
    """The circuits in circuit order (panel by panel), with the columns a reviewer reads
    beside them (continuous, power factor, grounding conductor) where the results
    carry them."""
    review = getattr(schedule, "review", None)
    if review is not None and len(review) == len(circuits):
        circuits = circuits.join(review[[c for c in review.columns if c not in circuits]])
    keys = [k for k in ("panel", "circuit") if k in circuits.columns]
    return circuits.sort_values(keys, kind="stable") if keys else circuits


TOTALS_PER_ROW = 3


def totals_block(totals: dict):
    """A panel's totals as a compact block of label / figure pairs, three to a row."""
    cells = []
    for k, v in totals.items():
        if re.fullmatch(r"[a-z0-9_]+", str(k)):
            label, shown, unit = node_figure(str(k), v)
            shown = whole_or_number(v) if unit in ("VA", "") else shown
            if unit == "VA" and isinstance(v, (int, float)):
                shown, unit = kilovoltamps(v).rsplit(" ", 1)
        else:
            label, shown, unit = str(k), whole_or_number(v), ""
        cells.append((label, f"{shown} {unit}".strip()))
    rows = []
    for i in range(0, len(cells), TOTALS_PER_ROW):
        row = []
        for label, text in cells[i : i + TOTALS_PER_ROW]:
            row += [p(label, "note"), p(text, "cellb")]
        row += [p("")] * (2 * TOTALS_PER_ROW - len(row))
        rows.append(row)
    w = WIDTH / TOTALS_PER_ROW
    return grid_table(rows, [w * 0.62, w * 0.38] * TOTALS_PER_ROW, False)


def schedule_section(panel_id, schedule, heading, display: Display = DEFAULT_DISPLAY) -> list:
    out = [heading(f"Panel schedule — {panel_id}", f"sched:{panel_id}", 1, "h1")]
    circuits = getattr(schedule, "circuits", None)
    if circuits is not None and len(circuits):
        out.append(schedule_table(review_order(circuits, schedule), panel_id, display))
    else:
        out.append(p("No circuits in this schedule.", "body"))
    totals = getattr(schedule, "totals", None) or {}
    if totals:
        out += table_heading("Panel totals")
        out.append(totals_block(totals))
    notices = list(getattr(schedule, "notices", None) or ())
    if notices:  # what the reader skipped or did not understand: never dropped in silence
        out.append(p("Reading notices", "h2"))
        out.extend(p(f"• {n}", "body") for n in notices)
    return out
