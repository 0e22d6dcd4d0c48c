"""The report's back matter: methods and assumptions, the provenance of the tables the
figures were read from (the other tables in force listed compactly), and the cautions."""

from __future__ import annotations

from xml.sax.saxutils import escape

from reportlab.platypus import Paragraph

from ... import CAUTION
from ..display import MISSING
from .drawing import txt
from .sections import WIDTH, grid_table, headed, p, styles

# --------------------------------------------- methods, tables, cautions


def methods_section(results, heading) -> list:
    out = [heading("Methods and assumptions", "methods", 0, "h1")]
    if results.methods:
        rows = [headed(["method", "published source"])]
        rows += [[p(m), p(s)] for m, s in results.methods]
        out.append(grid_table(rows, [300, WIDTH - 300]))
    else:
        out.append(p("No method was recorded by the checks.", "body"))
    out.append(p("Assumptions", "h2"))
    if results.assumptions:
        out += [p(f"• {a}", "body") for a in results.assumptions]
    else:
        out.append(p("No assumption was made beyond the job's inputs and the tables.", "body"))
    return out


def tables_section(results, heading) -> list:
    out = [heading("Table provenance", "tables", 0, "h1")]
    out.append(
        p(
            "Each data table the checks read, with the document it follows. Tables of "
            "confidence other than 'published' must be checked against the source before "
            "the figures that use them are relied on.",
            "body",
        )
    )
    cited = set(getattr(results, "tables_cited", ()) or ())
    shown = [tb for tb in results.provenance if not cited or tb.name in cited]
    for tb in shown:
        rows = [
            ("Title", tb.title),
            ("Source", tb.source),
            ("Edition", tb.edition),
            ("Confidence", tb.confidence),
            ("Basis", tb.basis or MISSING),
            ("Conditions", tb.conditions or MISSING),
            ("Origin", f"{tb.origin} copy, sha256 {tb.sha256}"),
        ]
        out.append(p(tb.name, "h2"))
        out.append(grid_table([[p(a, "cellb"), p(b)] for a, b in rows], [80, WIDTH - 80], False))
    rest = [tb for tb in results.provenance if tb not in shown]
    if rest:
        out.append(p("Other tables in force (no step or finding of this job cites them)", "h2"))
        trows = [headed(["table", "title", "confidence", "sha256 (first 16)"])]
        trows += [
            [
                p(tb.name, "note"),
                p(tb.title, "note"),
                p(tb.confidence, "note"),
                p(tb.sha256[:16], "note"),
            ]
            for tb in rest
        ]
        out.append(grid_table(trows, [130, 230, 80, WIDTH - 440]))
    return out


CAUTION_POINTS = (
    "These results are an aid to design and review, not an approval. Every figure must be "
    "verified against the electrical code adopted where the work is done, with its local "
    "amendments.",
    "A licensed electrician or engineer must review the figures, the inputs and the "
    "conclusions before anything is bought, built or energised.",
    "The figures are only as good as the inputs: conductor lengths, sizes, nameplate "
    "impedances and loads should be confirmed on site and against the equipment supplied.",
    "This tool does not cover the safety of the work on site: isolation, testing for "
    "absence of voltage, protective equipment and safe work practices are outside it.",
    "Tables marked 'common practice' or 'from memory — verify' on the table provenance "
    "page have not been confirmed against a published source.",
)


def cautions_section(heading) -> list:
    out = [heading("Cautions", "cautions", 0, "h1")]
    out.append(Paragraph(escape(txt(CAUTION)), styles()["box"]))
    out += [p(f"• {c}", "body") for c in CAUTION_POINTS]
    return out
