"""Page numbers known only at the end of the report, drawn in one pass.

The contents, the "page" column of the summary of findings and the page total of every
footer show page numbers of pages drawn later. Instead of building the report again
until the numbers settle, each such number is a named form (a PDF form XObject) placed
where the number goes and filled in once the last page is drawn: the number is drawn
inside the form exactly as the page would have drawn it there (same font, size, colour,
baseline), so the pages read and look as before. A number never changes the layout:
each one takes one line of its cell (a page number is short), as it did before.
"""

from __future__ import annotations

from reportlab.platypus import Flowable, Paragraph


class PageRef(Flowable):
    """The page of ``anchor`` in a table cell, one line high: drawn as the paragraph
    ``Paragraph(page, style)`` would be (``as_paragraph``) or as the table draws a
    plain text cell in ``style``'s font (the baseline ``fontSize`` below the cell's
    top inside its padding, as reportlab draws a string cell)."""

    def __init__(self, forms: PageForms, anchor: str, style, as_paragraph: bool):
        super().__init__()
        self.style, self._fc_anchor = style, anchor
        self._fc_name = forms.name_for(anchor, style, as_paragraph)

    def wrap(self, availWidth, availHeight):
        self.width, self.height = availWidth, self.style.leading
        return self.width, self.height

    def draw(self):
        self.canv.doForm(self._fc_name)


class PageForms:
    """The forms of one report: one per (anchor, style, kind) referred to, and the
    footer's "page X of Y" of each page; :meth:`fill` draws them all at the end."""

    def __init__(self):
        self._refs: dict[tuple, str] = {}

    def name_for(self, anchor: str, style, as_paragraph: bool) -> str:
        key = (anchor, style.name, as_paragraph)
        if key not in self._refs:
            self._refs[key] = f"fcPage{len(self._refs)}"
        return self._refs[key]

    def ref(self, anchor: str, style, as_paragraph: bool = True) -> PageRef:
        return PageRef(self, anchor, style, as_paragraph)

    @staticmethod
    def footer_name(page: int) -> str:
        return f"fcFoot{page}"

    def fill(self, canv, pages: dict[str, int], styles: dict, footer, total: int) -> None:
        """Draw every form: the referred anchors' pages (``pages``: anchor → page) and
        ``footer(canv, page, total)`` for each of the ``total`` pages; call after the
        last page, before saving."""
        by_name = {s.name: s for s in styles.values()}
        for (anchor, style_name, as_paragraph), name in self._refs.items():
            style = by_name[style_name]
            text = str(pages[anchor])
            canv.beginForm(name)
            if as_paragraph:
                para = Paragraph(text, style)
                _, h = para.wrap(1e6, 1e6)
                para.drawOn(canv, 0, style.leading - h)
            else:
                canv.setFont(style.fontName, style.fontSize, style.leading)
                canv.drawString(0, style.leading - style.fontSize, text)
            canv.endForm()
        for page in range(1, total + 1):
            canv.beginForm(self.footer_name(page))
            footer(canv, page, total)
            canv.endForm()
