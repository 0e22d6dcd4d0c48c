"""The report's front matter besides the cover's figures: the responsibility block (blank
fields the reviewer fills in by hand; feedcheck approves nothing) and the contents page
with the page of every section, calculation sheet and schedule."""

from __future__ import annotations

from reportlab.platypus import Spacer, Table, TableStyle

from ..display import MISSING
from . import sections as sx

RESPONSIBILITY_FIELDS = ("Reviewed by", "Licence no.", "Date", "Signature")


def responsibility_block() -> list:
    """Blank fields for the person who reviews the figures (not an approval stamp)."""
    out = [
        Spacer(1, 8),
        sx.p("Review (to be completed by hand)", "h2"),
        sx.p(
            "Left blank for the licensed person who checks these figures against the "
            "locally adopted code. feedcheck fills in nothing here and approves nothing.",
            "small",
        ),
        Spacer(1, 3),
    ]
    rows = [[sx.p(f, "cellb"), ""] for f in RESPONSIBILITY_FIELDS]
    heights = [22] * (len(rows) - 1) + [44]  # room to write; more for a signature
    t = Table(rows, colWidths=[110, sx.WIDTH - 110], rowHeights=heights)
    t.setStyle(
        TableStyle(
            [
                ("GRID", (0, 0), (-1, -1), 0.6, sx.GRID),
                ("VALIGN", (0, 0), (-1, -1), "MIDDLE"),
                ("BACKGROUND", (0, 0), (0, -1), sx.HEAD_BG),
            ]
        )
    )
    out.append(t)
    return out


CONTENTS_ACROSS = 2  # entries of a section side by side


def contents_section(titles: list[tuple[str, str, int]], anchors, heading, page_cell):
    """The contents: each top-level heading with its page, the sheets and schedules under
    it two to a row. ``titles``: (text, anchor, level) in document order; ``anchors``:
    the anchors drawn in the report; ``page_cell(anchor, style, as_paragraph)``: the cell
    showing the anchor's page (a dash for any other)."""
    out = [heading("Contents", "contents", 0, "h1")]
    rows, styles, group = [], [], []

    def page(key: str, style: str):
        return page_cell(key, style, True) if key in anchors else sx.p(MISSING, style)

    def flush() -> None:
        for i in range(0, len(group), CONTENTS_ACROSS):
            row = []
            for text, key in group[i : i + CONTENTS_ACROSS]:
                row += [sx.p(text, "note"), page(key, "note")]
            row += [sx.p("")] * (2 * CONTENTS_ACROSS - len(row))
            rows.append(row)
            styles.append(1)
        group.clear()

    for text, key, level in titles:
        if key in ("cover", "contents"):
            continue
        if level == 0:
            flush()
            rows.append([sx.p(text, "cellb"), sx.p(""), sx.p(""), page(key, "cellb")])
            styles.append(0)
        else:
            group.append((text, key))
    flush()
    if rows:
        w = sx.WIDTH / CONTENTS_ACROSS
        t = sx.grid_table(rows, [w - 30, 30] * CONTENTS_ACROSS, False, pad=2)
        for i, level in enumerate(styles):
            if level == 0:
                t.setStyle([("SPAN", (0, i), (2, i)), ("BACKGROUND", (0, i), (-1, i), sx.HEAD_BG)])
        out.append(t)
    return out
