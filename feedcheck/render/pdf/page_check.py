"""Vouch for the printed pages: re-render a report's pages from the re-run and
compare their extracted text (pypdf) with the report's, page by page.

The embedded results can match a re-run while a page was edited after the
report was written (6,009 A printed as 9,009 A); this comparison reads what a
person reads. Each differing page is named with the first word that differs
and a few words before it. Nothing here computes an electrical figure.
"""

from __future__ import annotations

import io
import re
from dataclasses import dataclass

_CALC_DATE = re.compile(r"calculated (\d{4}-\d{2}-\d{2})")
_FIGURE = re.compile(r"\d")


@dataclass(frozen=True)
class PageDifference:
    """One page whose text differs: the first differing word on each side."""

    page: int
    context: str
    report_word: str
    rerun_word: str

    def __str__(self) -> str:
        what = "figure" if _FIGURE.search(self.report_word + self.rerun_word) else "text"
        return (
            f"page {self.page}: first differing {what} after '{self.context}': "
            f"the page shows '{self.report_word}', the re-run prints '{self.rerun_word}'"
        )


def report_calc_date(results: dict) -> str | None:
    """The calculation date the report's fault-current marking names (a job without
    its own date is dated by the day the report was made), or None."""
    for f in results.get("findings", []):
        if isinstance(f, dict) and f.get("rule_id") == "fault-marking":
            m = _CALC_DATE.search(str(f.get("note", "")))
            if m:
                return m.group(1)
    return None


def page_texts(pdf) -> list[str]:
    """Extracted text of every page of a PDF (a path or bytes)."""
    import logging

    from pypdf import PdfReader

    logging.getLogger("pypdf").setLevel(logging.ERROR)
    reader = PdfReader(io.BytesIO(pdf) if isinstance(pdf, bytes) else str(pdf))
    return [page.extract_text() or "" for page in reader.pages]


def _first_difference(page: int, a: str, b: str) -> PageDifference:
    wa, wb = a.split(), b.split()
    i = 0
    while i < min(len(wa), len(wb)) and wa[i] == wb[i]:
        i += 1
    context = " ".join(wa[max(0, i - 6) : i])[-80:]
    unit = lambda w, k: " ".join(w[k : k + 2]) if k < len(w) else "(nothing)"  # noqa: E731
    return PageDifference(page, context, unit(wa, i), unit(wb, i))


def compare_pages(report_texts: list[str], rerun_texts: list[str]) -> list[PageDifference | str]:
    """Each page whose text differs (first differing word), and a line when the
    page counts differ."""
    out: list[PageDifference | str] = []
    for i, (a, b) in enumerate(zip(report_texts, rerun_texts, strict=False)):
        if a.split() != b.split():
            out.append(_first_difference(i + 1, a, b))
    if len(report_texts) != len(rerun_texts):
        out.append(
            f"the report has {len(report_texts)} pages, the re-rendered report {len(rerun_texts)}"
        )
    return out


def check_pages(report_pdf, results) -> tuple[int, list[PageDifference | str]]:
    """Re-render the pages from ``results`` (the re-run) and compare them with
    the report's pages; (pages compared, differences)."""
    from .report import render_pdf

    data, _, _ = render_pdf(results)
    mine, theirs = page_texts(report_pdf), page_texts(data)
    return len(mine), compare_pages(mine, theirs)
