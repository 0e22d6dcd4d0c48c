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
    ``Paragraph(page, style)`` would be (``as_paragraph``), or as the table draws a
    plain text cell in ``style``'s font (its baseline ``fontSize`` below the top of
    the cell's text). The latter form is made for each place, its text at the very
    coordinates the table would have used (a translation would round them apart)."""

    def __init__(self, forms: PageForms, anchor: str, style, as_paragraph: bool):
        super().__init__()
        self.style, self._fc_forms = style, forms
        self._fc_anchor, self._fc_as_paragraph = anchor, as_paragraph

    def wrap(self, availWidth, availHeight):
        self.width, self.height = availWidth, self.style.leading
        return self.width, self.height

    def drawOn(self, canvas, x, y, _sW=0):
        if self._fc_as_paragraph:
            super().drawOn(canvas, x, y, _sW)  # translated to (x, y), as a paragraph is
        else:
            base = y + self.height - self.style.fontSize
            canvas.doForm(self._fc_forms.text_form(self._fc_anchor, self.style, x, base))

    def draw(self):
        self.canv.doForm(self._fc_forms.paragraph_form(self._fc_anchor, self.style))


class PageForms:
    """The forms of one report: the page of an anchor as a paragraph (one form per
    anchor and style), as a cell's text (one per place), and the footer's "page X of Y"
    of each page; :meth:`fill` draws them all at the end."""

    def __init__(self):
        self._paragraphs: dict[tuple[str, str], str] = {}
        self._texts: list[tuple[str, str, float, float]] = []
        self._styles: dict[str, object] = {}

    def ref(self, anchor: str, style, as_paragraph: bool = True) -> PageRef:
        self._styles[style.name] = style
        return PageRef(self, anchor, style, as_paragraph)

    def paragraph_form(self, anchor: str, style) -> str:
        key = (anchor, style.name)
        if key not in self._paragraphs:
            self._paragraphs[key] = f"fcPage{len(self._paragraphs)}"
        return self._paragraphs[key]

    def text_form(self, anchor: str, style, x: float, y: float) -> str:
        self._texts.append((anchor, style.name, x, y))
        return f"fcText{len(self._texts) - 1}"

    @staticmethod
    def footer_name(page: int) -> str:
        return f"fcFoot{page}"

    def fill(self, canv, pages: dict[str, int], footer, total: int) -> None:
        """Draw every form: the anchors' pages (``pages``: anchor → page) and
        ``footer(canv, page, total)`` for each of the ``total`` pages; call after the
        last page, before saving."""
        for (anchor, style_name), name in self._paragraphs.items():
            style = self._styles[style_name]
            canv.beginForm(name)
            para = Paragraph(str(pages[anchor]), style)
            _, h = para.wrap(1e6, 1e6)
            para.drawOn(canv, 0, style.leading - h)
            canv.endForm()
        for i, (anchor, style_name, x, y) in enumerate(self._texts):
            style = self._styles[style_name]
            canv.beginForm(f"fcText{i}")
            canv.setFont(style.fontName, style.fontSize, style.leading)
            canv.drawString(x, y, str(pages[anchor]))
            canv.endForm()
        for page in range(1, total + 1):
            canv.beginForm(self.footer_name(page))
            footer(canv, page, total)
            canv.endForm()
