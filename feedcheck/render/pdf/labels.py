"""A PDF sheet of fault-current labels (NFPA 70 110.24 marking of the maximum
available fault current): one label per node whose results carry a marking
figure, eight to a letter page, each with the figure, the calculation date, the
node and its voltage, and the caution that field marking follows the locally
adopted code. Figures come from the results; nothing here computes one. No
arc-flash figures: those need device clearing times this tool does not model.
"""

from __future__ import annotations

import io
import re
from dataclasses import dataclass

from reportlab.lib.pagesizes import letter
from reportlab.pdfgen.canvas import Canvas

from ..display import node_title
from .drawing import fonts, txt

MARKING_RULE = "fault-marking"
_DATE = re.compile(r"calculated (\d{4}-\d{2}-\d{2})")
COLS, ROWS = 2, 4
LABEL_CAUTION = (
    "Field marking follows the locally adopted code; verify the figure and have a "
    "licensed electrician or engineer review it before fixing this label."
)


@dataclass(frozen=True)
class Label:
    node_id: str
    title: str  # "P1 — panel, 208Y/120 V"
    fault_a: float
    date: str


def labels_from(results, default_date: str) -> list[Label]:
    """One label per node with a marking finding, in feed order."""
    marks = {
        f.subject: f
        for f in results.findings
        if f.rule_id == MARKING_RULE and "/" not in f.subject and f.value is not None
    }
    out = []
    for n in results.nodes:
        f = marks.get(n.id)
        if f is None or n.kind == "source":
            continue
        m = _DATE.search(f.note or "")
        date = m.group(1) if m else (results.job_summary.get("date") or default_date)
        out.append(Label(n.id, node_title(n.id, n.kind, n.voltage), float(f.value), str(date)))
    return out


def _draw_label(c: Canvas, lab: Label, x: float, y: float, w: float, h: float, project: str):
    f = fonts()
    c.setLineWidth(1.6)
    c.roundRect(x, y, w, h, 8)
    c.setLineWidth(0.6)
    c.roundRect(x + 5, y + 5, w - 10, h - 10, 5)
    c.setFillGray(0.15)
    c.rect(x + 5, y + h - 36, w - 10, 31 - 5 + 5, stroke=0, fill=1)
    c.setFillGray(1)
    c.setFont(f.bold, 10.5)
    c.drawCentredString(x + w / 2, y + h - 25, "MAXIMUM AVAILABLE FAULT CURRENT")
    c.setFillGray(0)
    c.setFont(f.bold, 26)
    c.drawCentredString(x + w / 2, y + h - 72, f"{round(lab.fault_a):,} A")
    c.setFont(f.regular, 10)
    c.drawCentredString(x + w / 2, y + h - 90, txt(lab.title))
    c.drawCentredString(x + w / 2, y + h - 105, f"calculated {lab.date}")
    c.setFont(f.regular, 7)
    c.drawCentredString(x + w / 2, y + h - 118, txt(project[:70]))
    c.setFont(f.regular, 6.2)
    words, line, lines = LABEL_CAUTION.split(), "", []
    for word in words:
        if len(line) + len(word) + 1 > 78:
            lines.append(line)
            line = word
        else:
            line = f"{line} {word}".strip()
    lines.append(line)
    for i, ln in enumerate(lines):
        c.drawCentredString(x + w / 2, y + 24 - 8 * i, ln)


def render_labels(labels: list[Label], project: str) -> bytes:
    """The label sheet as PDF bytes (reproducible: reportlab's invariant mode)."""
    fonts()
    buf = io.BytesIO()
    c = Canvas(buf, pagesize=letter, invariant=1)
    c.setTitle(f"Fault-current labels — {project}")
    c.setCreator("feedcheck")
    pw, ph = letter
    margin, gap = 36.0, 14.0
    w = (pw - 2 * margin - gap * (COLS - 1)) / COLS
    h = (ph - 2 * margin - 24 - gap * (ROWS - 1)) / ROWS
    per_page = COLS * ROWS
    pages = max(1, -(-len(labels) // per_page))
    for p in range(pages):
        f = fonts()
        c.setFont(f.regular, 7)
        c.drawString(margin, 22, txt(f"{project} — fault-current labels, sheet {p + 1} of {pages}"))
        c.drawRightString(pw - margin, 22, "an aid, not an approval")
        for k, lab in enumerate(labels[p * per_page : (p + 1) * per_page]):
            col, row = k % COLS, k // COLS
            x = margin + col * (w + gap)
            y = ph - margin - (row + 1) * h - row * gap
            _draw_label(c, lab, x, y, w, h, project)
        c.showPage()
    c.save()
    return buf.getvalue()
