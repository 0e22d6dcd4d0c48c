"""The submittal-style PDF calculation report.

:func:`write_report` assembles cover, summary of findings, one-line diagram,
charts, one calculation sheet per element, panel schedules, methods and
assumptions, table provenance and cautions; every page carries the project,
its revision, "page X of Y" and a short caution line. Page numbers of the
calculation sheets are known by building the document until they settle
(usually twice).

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
from .tables_embed import table_attachments

MARGIN = 42.0
TOP = 60.0
BOTTOM = 54.0
MAX_PASSES = 4
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


def _skip_draw(flowable):
    """A stand-in for ``flowable.drawOn`` in a pass that only lays out: nothing is
    drawn; a heading still records its page."""

    def draw_on(canv, x, y, _sW=0):
        if isinstance(flowable, _Heading):
            flowable._fc_pages[flowable._fc_key] = canv.getPageNumber()

    return draw_on


class _BodyFrame(Frame):
    """The body frame; with ``layout_only`` it places flowables (wrap, split, page
    breaks exactly as a drawn pass) without drawing them: the pass that learns the
    page numbers."""

    layout_only = False

    def _add(self, flowable, canv, trySplit=0):
        if not self.layout_only:
            return Frame._add(self, flowable, canv, trySplit)
        flowable.__dict__["drawOn"] = _skip_draw(flowable)  # past a Drawing's attribute check
        try:
            return Frame._add(self, flowable, canv, trySplit)
        finally:
            flowable.__dict__.pop("drawOn", None)

    add = _add


class _Doc(BaseDocTemplate):
    def __init__(self, buf, results, total_pages, layout_only=False, **kw):
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
        self.fc_total = total_pages
        frame = _BodyFrame(
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
        frame.layout_only = layout_only
        self.fc_layout_only = layout_only
        self.addPageTemplates([PageTemplate("page", [frame], onPage=self._decorate)])

    def _decorate(self, canv, doc):
        if self.fc_layout_only:
            return
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
        total = self.fc_total if self.fc_total else "?"
        canv.setFont(f.bold, 8.5)
        canv.drawRightString(w - MARGIN, 29, f"page {doc.page} of {total}")
        canv.restoreState()


def _clip(s: str, n: int) -> str:
    return s if len(s) <= n else s[: n - 1] + "…"


def _page_of_factory(results, pages: dict[str, int]):
    sheets = set(results.sheets)
    schedules = set(results.schedules or {})

    def page_of(subject: str) -> str:
        head = subject.split("/")[0]
        if "/" in subject and head in schedules and f"sched:{head}" in pages:
            return str(pages[f"sched:{head}"])  # a circuit: its panel schedule
        for cand in (subject, head):
            if cand in sheets and f"sheet:{cand}" in pages:
                return str(pages[f"sheet:{cand}"])
            if cand in schedules and f"sched:{cand}" in pages:
                return str(pages[f"sched:{cand}"])
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
    """The report's flowables for the passes of :func:`render_pdf`. The body (one-line
    diagram to cautions) shows no page number, so it is made once and placed by each
    pass, reportlab's multi-pass edits undone in between (as its ``multiBuild`` does);
    the front (cover, contents, summary of findings: page numbers of the pass before)
    is made again for each pass. Every heading records its page in ``found``."""

    def __init__(self, results):
        self.results = results
        self.found: dict[str, int] = {}
        self.display = display_for(results)
        self.by_subject: dict[str, list] = {}
        for f in results.sorted_findings():
            self.by_subject.setdefault(f.subject, []).append(f)
        self.body: list | None = None
        self.body_titles: list[tuple[str, str, int]] = []

    def _heading_maker(self, titles: list):
        st = sx.styles()

        def heading(text, key, level, style):
            titles.append((text, key, level))
            return _Heading(text, st[style], key, level, self.found)

        return heading

    def _make_body(self) -> list:
        r, d, by_subject = self.results, self.display, self.by_subject
        self.body_titles = titles = []
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

    def flowables(self, pages: dict[str, int], keep_body: bool) -> list:
        """The whole report for one pass; ``pages``: anchor → page of the pass before.
        Without ``keep_body`` the body is handed over (freed as it is drawn) and made
        again should another pass follow."""
        body = self.body if self.body is not None else self._make_body()
        self.body = body if keep_body else None
        titles: list[tuple[str, str, int]] = []
        heading = self._heading_maker(titles)
        cover: list = sx.cover(self.results, heading, responsibility_block())
        front: list = [PageBreak()]
        front += sx.findings_summary(self.results, _page_of_factory(self.results, pages), heading)
        titles += self.body_titles
        contents = contents_section(titles, pages, heading)
        return [*cover, PageBreak(), *contents, *front, *body]


def by_subject_prefix(by_subject: dict, panel_id: str) -> list:
    return [f for s, fs in by_subject.items() if s.startswith(panel_id + "/") for f in fs]


def render_pdf(results) -> tuple[bytes, int, dict[str, int]]:
    """The report without attachments: (bytes, page count, anchor → page).

    Passes are made until the page numbers settle (at most ``MAX_PASSES``): the first
    only lays the pages out (nothing drawn) to learn them, each later one draws the
    report with the numbers of the one before; the last is the report."""
    fonts()
    j = results.job_summary
    story = _Story(results)
    pages: dict[str, int] = {}
    total = 0
    data = b""
    for n in range(MAX_PASSES):
        buf = io.BytesIO()
        doc = _Doc(
            buf,
            results,
            total,
            layout_only=n == 0,
            title=f"Feed calculation report — {j.get('name', '')}",
            author=str(j.get("prepared_by", "")),
            subject=f"revision {j.get('revision', '')}; rules {j.get('rules', '')}",
            creator=f"feedcheck {__version__}",
            keywords="feedcheck report",
        )
        edits: list = []
        doc._multiBuildEdits = edits.append  # what placing changes, undone to place again
        story.found.clear()
        doc.build(story.flowables(pages, keep_body=n == 0))
        for undo, *args in edits:
            undo(*args)
        new_pages, new_total = dict(story.found), doc.page
        data = buf.getvalue()
        if n and new_pages == pages and new_total == total:
            break
        pages, total = new_pages, new_total
    return data, total, pages


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
