"""The submittal-style PDF calculation report.

:func:`write_report` assembles cover, summary of findings, one-line diagram,
charts, one calculation sheet per element, panel schedules, methods and
assumptions, table provenance and cautions; every page carries the project,
its revision, "page X of Y" and a short caution line. The report is drawn in one
pass: the page numbers shown before their pages are drawn (contents, the page
column of the findings, each footer's total) are forms filled in at the end
(:mod:`.page_refs`).

The pages are drawn from :class:`~feedcheck.results.Results` alone (figures,
sheets, the feed's diagram description, table provenance, display units); the job
is read only for the files to embed.

The output is reproducible: with ``SOURCE_DATE_EPOCH`` set, the same job and
tables give the same bytes (reportlab's invariant mode, fixed dates, no random
ids). The job file, its schedules and the results JSON are embedded as file
attachments so ``feedcheck rerun`` can re-check the report.
"""

from __future__ import annotations

import io
from dataclasses import dataclass
from pathlib import Path
from xml.sax.saxutils import escape

from reportlab.lib.pagesizes import letter
from reportlab.platypus import (
    BaseDocTemplate,
    CondPageBreak,
    Frame,
    PageBreak,
    PageTemplate,
    Paragraph,
    Spacer,
)

from ... import __version__
from ..display import MISSING, display_for, node_caption
from . import back_matter as bm
from . import sections as sx
from .drawing import fault_current_charts, fonts, txt, voltage_profile_charts
from .embed import RESULTS_NAME, attach, input_attachments
from .front_matter import contents_section, responsibility_block
from .one_line import one_line_diagrams
from .page_refs import PageForms
from .tables_embed import table_attachments

MARGIN = 42.0
TOP = 60.0
BOTTOM = 54.0
SHEET_ROOM = 200.0  # a calculation sheet starts a new page unless this much room is left


@dataclass(frozen=True)
class ReportInfo:
    """What was written: the file, its page count, where each sheet and
    section starts (``anchors``: ``findings``, ``diagram``, ``sheet:T1`` …)."""

    path: Path
    pages: int
    sheet_pages: dict[str, int]
    anchors: dict[str, int]


class _Heading(Paragraph):
    """A heading that records its page and adds a PDF bookmark and outline entry."""

    def __init__(self, text: str, style, key: str, level: int, pages: dict[str, int]):
        super().__init__(escape(txt(text)), style)
        self._fc_key, self._fc_level, self._fc_pages = key, level, pages
        self._fc_outline = text

    def draw(self):
        self._fc_pages[self._fc_key] = self.canv.getPageNumber()
        self.canv.bookmarkPage(self._fc_key)
        self.canv.addOutlineEntry(self._fc_outline, self._fc_key, level=self._fc_level)
        super().draw()


class _Doc(BaseDocTemplate):
    def __init__(self, buf, results, **kw):
        super().__init__(
            buf,
            pagesize=letter,
            leftMargin=MARGIN,
            rightMargin=MARGIN,
            topMargin=TOP,
            bottomMargin=BOTTOM,
            invariant=1,
            **kw,
        )
        self.fc_results = results
        frame = Frame(
            MARGIN,
            BOTTOM,
            letter[0] - 2 * MARGIN,
            letter[1] - TOP - BOTTOM,
            id="body",
            leftPadding=0,
            rightPadding=0,
            topPadding=0,
            bottomPadding=0,
        )
        self.addPageTemplates([PageTemplate("page", [frame], onPage=self._decorate)])

    def _decorate(self, canv, doc):
        f = fonts()
        j = self.fc_results.job_summary
        w, h = letter
        canv.saveState()
        canv.setFont(f.bold, 8.5)
        left = f"{j.get('name', '')} — rev {j.get('revision') or MISSING}"
        canv.drawString(MARGIN, h - 34, txt(_clip(left, 95)))
        canv.setFont(f.regular, 8.5)
        canv.drawRightString(w - MARGIN, h - 34, "Feed calculation report")
        canv.setLineWidth(0.6)
        canv.line(MARGIN, h - 40, w - MARGIN, h - 40)
        canv.line(MARGIN, 40, w - MARGIN, 40)
        canv.setFont(f.regular, 7)
        canv.drawString(MARGIN, 29, txt(sx.SHORT_CAUTION))
        canv.doForm(PageForms.footer_name(doc.page))  # "page X of Y", filled in at the end
        canv.restoreState()


def _footer_page(canv, page: int, total: int) -> None:
    """The footer's "page X of Y" (drawn into the page's form once Y is known)."""
    canv.setFont(fonts().bold, 8.5)
    canv.drawRightString(letter[0] - MARGIN, 29, f"page {page} of {total}")


def _clip(s: str, n: int) -> str:
    return s if len(s) <= n else s[: n - 1] + "…"


def _page_of_factory(results, anchors, page_cell):
    """``page_of(subject)``: the page of the subject's calculation sheet or panel
    schedule (``page_cell(anchor)``) among ``anchors``, else a dash."""
    sheets = set(results.sheets)
    schedules = set(results.schedules or {})

    def page_of(subject: str):
        head = subject.split("/")[0]
        if "/" in subject and head in schedules and f"sched:{head}" in anchors:
            return page_cell(f"sched:{head}")  # a circuit: its panel schedule
        for cand in (subject, head):
            if cand in sheets and f"sheet:{cand}" in anchors:
                return page_cell(f"sheet:{cand}")
            if cand in schedules and f"sched:{cand}" in anchors:
                return page_cell(f"sched:{cand}")
        return MISSING

    return page_of


def _ordered_sheets(results) -> list:
    """Sheets in feed order: a node's feeding run just before the node."""
    done, order = set(), []
    for n in results.nodes:
        for key in (n.via_run, n.id):
            if key and key in results.sheets and key not in done:
                order.append(results.sheets[key])
                done.add(key)
    order += [s for k, s in results.sheets.items() if k not in done]
    return order


def _drawings_story(results, display, heading) -> list:
    """The one-line diagram and the two charts."""
    story = [PageBreak(), heading("One-line diagram", "diagram", 0, "h1")]
    story.append(
        sx.p(
            "Feed order from the source down; each node shows its ratings, its maximum bolted "
            "fault current, governing interrupting duty and minimum fault current and its "
            "voltage drop from the source (where the checks computed them), the run that "
            "feeds it and its motors. 1φ marks a single-phase node.",
            "body",
        )
    )
    story.append(Spacer(1, 6))
    sheets = one_line_diagrams(results, width=sx.WIDTH)
    for i, d in enumerate(sheets):
        if len(sheets) > 1:
            story.append(sx.p(f"One-line diagram, sheet {i + 1} of {len(sheets)}", "h2"))
        story += [d, Spacer(1, 4)]
    story += [CondPageBreak(330), heading("Voltage profile and fault current", "charts", 0, "h1")]
    profiles = voltage_profile_charts(results, display, width=sx.WIDTH)
    story += _charts_story(
        profiles,
        "Voltage along each path from the source to a panel",
        "Voltage along each path",
        "No voltage figures in these results.",
    )
    charts = fault_current_charts(results, width=sx.WIDTH)
    story.append(CondPageBreak(200))
    story += _charts_story(
        charts,
        "Fault current at each node",
        "Fault current at each node",
        "No fault-current figures in these results.",
    )
    return story


def _charts_story(charts: list, title: str, continued: str, none_text: str) -> list:
    """A chart section: its title, then each chart (a part title from the second on),
    or ``none_text`` when there is no chart."""
    story = [sx.p(title, "h2")]
    if not charts:
        story.append(sx.p(none_text, "body"))
    for i, chart in enumerate(charts):
        if i:
            part = f"{continued} (continued, part {i + 1} of {len(charts)})"
            story += [CondPageBreak(chart.height + 30), sx.p(part, "h2")]
        story.append(chart)
    return story


def _sheets_story(results, by_subject: dict, display, heading) -> list:
    """One calculation sheet per element, node figures without a sheet, other findings."""
    story = [CondPageBreak(320), heading("Calculation sheets", "sheets", 0, "h1")]
    nodes = {n.id: n for n in results.nodes}
    tables_by_name = {t.name: t for t in results.provenance}
    shown_subjects = set()
    for i, sheet in enumerate(_ordered_sheets(results)):
        if i:
            story.append(CondPageBreak(SHEET_ROOM))
        shown_subjects.add(sheet.element_id)
        story += sx.sheet_section(
            sheet,
            nodes.get(sheet.element_id),
            by_subject.get(sheet.element_id, []),
            tables_by_name,
            heading,
            display,
        )
        story.append(Spacer(1, 10))
    for n in results.nodes:
        if n.id not in results.sheets and n.values:
            story.append(CondPageBreak(200))
            title = f"Figures at {node_caption(n.id, n.kind)}"
            story.append(heading(title, f"node:{n.id}", 1, "h1"))
            story.append(sx.node_figures_table(n))
    rest = [f for s, fs in by_subject.items() if s not in shown_subjects for f in fs]
    rest = [f for f in rest if f.subject.split("/")[0] not in (results.schedules or {})]
    if rest:
        story.append(CondPageBreak(200))
        story.append(heading("Other findings", "other", 1, "h1"))
        story.append(sx.findings_table(rest, with_subject=True, display=display))
    return story


def _schedules_story(results, by_subject: dict, display, heading) -> list:
    if not results.schedules:
        return []
    story = [CondPageBreak(300), heading("Panel schedules", "schedules", 0, "h1")]
    for i, (pid, sched) in enumerate(results.schedules.items()):
        if i:
            story.append(CondPageBreak(250))
        story += sx.schedule_section(pid, sched, heading, display)
        rows = by_subject_prefix(by_subject, pid)
        if rows:
            story.append(sx.p("Circuit findings", "h2"))
            story.append(sx.findings_table(rows, with_subject=True, display=display))
        story.append(Spacer(1, 10))
    return story


class _Story:
    """The report's flowables for the one pass of :func:`render_pdf`: the body (one-line
    diagram to cautions) first, which gives every heading, then the front (cover,
    contents, summary of findings), whose page numbers are forms filled in at the end
    (``forms``). Every heading records its page in ``found`` as it is drawn."""

    def __init__(self, results, forms: PageForms):
        self.results, self.forms = results, forms
        self.found: dict[str, int] = {}
        self.display = display_for(results)
        self.by_subject: dict[str, list] = {}
        for f in results.sorted_findings():
            self.by_subject.setdefault(f.subject, []).append(f)

    def _heading_maker(self, titles: list):
        st = sx.styles()

        def heading(text, key, level, style):
            titles.append((text, key, level))
            return _Heading(text, st[style], key, level, self.found)

        return heading

    def _body(self, titles: list) -> list:
        r, d, by_subject = self.results, self.display, self.by_subject
        heading = self._heading_maker(titles)
        story = _drawings_story(r, d, heading)
        story += _sheets_story(r, by_subject, d, heading)
        story += _schedules_story(r, by_subject, d, heading)
        story += [CondPageBreak(300)]
        story += bm.methods_section(r, heading)
        story += [CondPageBreak(300)]
        story += bm.tables_section(r, heading)
        story += [CondPageBreak(300)]
        story += bm.cautions_section(heading)
        return story

    def flowables(self) -> list:
        """The whole report, in page order."""
        body_titles: list[tuple[str, str, int]] = []
        body = self._body(body_titles)
        anchors = {key for _, key, _ in body_titles}
        st = sx.styles()

        def page_cell(key: str, style: str = "cell", as_paragraph: bool = False):
            return self.forms.ref(key, st[style], as_paragraph)

        titles: list[tuple[str, str, int]] = []
        heading = self._heading_maker(titles)
        cover: list = sx.cover(self.results, heading, responsibility_block())
        page_of = _page_of_factory(self.results, anchors, page_cell)
        front: list = [PageBreak(), *sx.findings_summary(self.results, page_of, heading)]
        titles += body_titles
        anchors |= {key for _, key, _ in titles}  # every heading is drawn: each has a page
        contents = contents_section(titles, anchors, heading, page_cell)
        return [*cover, PageBreak(), *contents, *front, *body]


def by_subject_prefix(by_subject: dict, panel_id: str) -> list:
    return [f for s, fs in by_subject.items() if s.startswith(panel_id + "/") for f in fs]


def render_pdf(results) -> tuple[bytes, int, dict[str, int]]:
    """The report without attachments: (bytes, page count, anchor → page).

    One pass: the page numbers the front shows (contents, the page column of the
    findings) and each footer's page total are forms filled in after the last page
    (:mod:`.page_refs`)."""
    fonts()
    j = results.job_summary
    forms = PageForms()
    story = _Story(results, forms)
    buf = io.BytesIO()
    doc = _Doc(
        buf,
        results,
        title=f"Feed calculation report — {j.get('name', '')}",
        author=str(j.get("prepared_by", "")),
        subject=f"revision {j.get('revision', '')}; rules {j.get('rules', '')}",
        creator=f"feedcheck {__version__}",
        keywords="feedcheck report",
    )
    doc._doSave = 0  # saved below, once the forms are filled in (as multiBuild does)
    doc.build(story.flowables())
    total = doc.page
    forms.fill(doc.canv, story.found, _footer_page, total)
    doc.canv.save()
    return buf.getvalue(), total, dict(story.found)


def write_report(job, results, out_path: str | Path) -> ReportInfo:
    """Write the report PDF (atomically) with the inputs and results embedded."""
    from ...io_atomic import write_bytes_atomic
    from ..json_csv import render_json

    data, total, pages = render_pdf(results)
    files = input_attachments(job)
    files.append((RESULTS_NAME, render_json(results).encode("utf-8")))
    files += table_attachments(results)  # the user's own tables (--tables DIR), if any
    data = attach(data, files)
    write_bytes_atomic(out_path, data)
    sheets = {k.split(":", 1)[1]: v for k, v in pages.items() if k.startswith("sheet:")}
    return ReportInfo(Path(out_path), total, sheets, dict(pages))
