"""The terminal summary of ``feedcheck check`` (no computation here): node figures,
schedule totals, failing and warning findings (all with ``--all``), assumptions."""

from __future__ import annotations

import io
import re
import textwrap

from .. import CAUTION
from ..results import Results
from .display import (
    FIGURES,
    MISSING,
    TERMINAL,
    TERMINAL_FIGURES,
    Display,
    display_for,
    figure_cell,
    finding_figures,
    fixed,
    status_word,
    unconfirmed_line,
)

PHASE_KEYS = ("phase_a_va", "phase_b_va", "phase_c_va")


def _node_table(results: Results) -> list[str]:
    keys = [k for k in TERMINAL_FIGURES if any(k in n.values for n in results.nodes)]
    header = ["node", "kind", "voltage", *[FIGURES[k].column for k in keys]]
    table = [header] + [
        [
            str(c)
            for c in (n.id, n.kind, n.voltage, *[figure_cell(k, n.values.get(k)) for k in keys])
        ]
        for n in results.nodes
    ]
    widths = [max(map(len, col)) for col in zip(*table, strict=True)]
    return [
        "  ".join(
            [c.ljust(w) for c, w in zip(r[:3], widths, strict=False)]
            + [c.rjust(w) for c, w in zip(r[3:], widths[3:], strict=True)]
        ).rstrip()
        for r in table
    ]


# figures held per source position (normal / standby): key, column, decimals, scale
POSITION_COLUMNS = (
    ("fault_max_a", "Isc max kA", 2, 1e-3),
    ("fault_duty_a", "duty kA", 2, 1e-3),
    ("fault_min_a", "Isc min kA", 2, 1e-3),
    ("vdrop_pct", "drop %", 2, 1.0),
)


def _position_table(results: Results) -> list[str]:
    """Below a transfer switch: each figure normal / standby and the governing one."""
    nodes = [n for n in results.nodes if "fault_max_governs" in n.values]
    if not nodes:
        return []
    header = ["node (normal / standby)", *[c for _, c, _, _ in POSITION_COLUMNS]]
    rows = []
    for n in nodes:
        v, cells = n.values, [n.id]
        for key, _, dec, scale in POSITION_COLUMNS:
            gov = v.get(key.rsplit("_", 1)[0] + "_governs", "")
            pair = f"{fixed(v.get(key), dec, scale)} / {fixed(v.get('standby_' + key), dec, scale)}"
            cells.append(f"{pair} ({gov})" if gov else pair)
        rows.append(cells)
    widths = [max(len(r[i]) for r in [header, *rows]) for i in range(len(header))]
    lines = [
        "source positions: the governing one in brackets (maximum and duty: the larger, "
        "minimum: the smaller, drop: the larger)"
    ]
    for r in [header, *rows]:
        lines.append("  ".join(c.ljust(w) for c, w in zip(r, widths, strict=True)).rstrip())
    return lines


def _phase_keys(nodes: dict, panel_id: str) -> tuple[str, ...]:
    """Per-phase load keys of a panel: two on a single-phase system, three otherwise
    (``nodes``: each node by id, the first of an id)."""
    node = nodes.get(panel_id)
    return PHASE_KEYS[:2] if node is not None and node.phases == 1 else PHASE_KEYS


def _schedule_line(nodes: dict, panel_id: str, totals: dict) -> str:
    def kva(key: str) -> str:
        return fixed(totals.get(key, 0), 1, 1e-3)

    phases = "/".join(kva(k) for k in _phase_keys(nodes, panel_id) if k in totals)
    return (
        f"schedule {panel_id}: {int(totals.get('circuits', 0))} circuits, demand "
        f"{kva('demand_va')} kVA (continuous at 125 %: {kva('design_va')} kVA), phases "
        f"{phases} kVA, imbalance {fixed(totals.get('imbalance_pct', 0), 1)} %; "
        f"{int(totals.get('fail_circuits', 0))} circuits fail, "
        f"{int(totals.get('warn_circuits', 0))} warn"
    )


def finding_head(f, display: Display) -> str:
    """The first line of a finding in the terminal summary (status, subject, check,
    figures, rule), without its note; the workbench shows the same line."""
    fig = ""
    if f.value is not None and isinstance(f.value, float):
        value, limit = finding_figures(f.value, f.limit, f.unit, display, TERMINAL)
        fig = f"{value} vs {limit}" if limit else value
    what = f"{f.check}: {fig}" if fig else f.check
    return f"{status_word(f.status):4}  {f.subject}  {what}  [{f.rule_id}]"


def _finding_lines(f, display: Display) -> str:
    head = finding_head(f, display) + "\n"
    note = _fill(f.note, "      ")
    for u in f.unconfirmed:
        note += "\n" + _fill("unconfirmed: " + u, "        ")
    return head + note + "\n"


_WRAPPERS = {
    rest: textwrap.TextWrapper(width=96, initial_indent="      ", subsequent_indent=rest)
    for rest in ("      ", "        ")
}
_SPACE_KINDS = ("\t", "\n", "\x0b", "\x0c", "\r")
_LETTER = re.compile(r"[^\d\W]")  # textwrap's "letter" (a word character, not a digit)


def _fill(text: str, rest: str) -> str:
    """``text`` wrapped at 96 columns, indented six spaces (``rest``: the indent of
    the lines after the first). Most notes fit on one line as they are (no leading,
    trailing or other than plain spaces): those are indented without the wrapper. Most
    longer ones are words between single plain spaces (no ``--``, no piece longer than
    a line): those are cut into the wrapper's pieces (:func:`_chunks`) and put on lines
    by its rule (:func:`_greedy`) here, which gives the same text faster; any other text
    goes to the wrapper."""
    if text and text == text.strip() and not any(c in text for c in _SPACE_KINDS):
        if len(text) <= 96 - 6:
            return "      " + text
        if "  " not in text and "--" not in text:
            chunks = _chunks(text)
            if max(map(len, chunks)) <= 96 - max(6, len(rest)):
                return _greedy(chunks, rest)
    return _WRAPPERS[rest].fill(text)


def _letter(c: str) -> bool:
    return _LETTER.match(c) is not None


def _hyphen_ends_piece(w: str, p: int) -> bool:
    """Whether textwrap ends a piece of word ``w`` after its hyphen at ``p``: two letters
    (or letter, hyphen, letter) before it, a letter, an optional hyphen and a letter after
    it (``TextWrapper.wordsep_re``, hyphenated words)."""
    n = len(w)
    before = (p >= 2 and _letter(w[p - 2]) and _letter(w[p - 1])) or (
        p >= 3 and _letter(w[p - 3]) and w[p - 2] == "-" and _letter(w[p - 1])
    )
    after = (p + 1 < n and _letter(w[p + 1])) and (
        (p + 2 < n and _letter(w[p + 2])) or (p + 3 < n and w[p + 2] == "-" and _letter(w[p + 3]))
    )
    return before and after


def _chunks(text: str) -> list[str]:
    """The pieces textwrap cuts ``text`` into when its words are separated by single
    spaces and it holds no ``--``: each word (cut after a hyphen where the wrapper cuts
    hyphenated words: every piece at least one character before its hyphen), a space
    between words."""
    out: list[str] = []
    for word in text.split(" "):
        if out:
            out.append(" ")
        start = 0
        if "-" in word:
            for p in range(1, len(word)):
                if word[p] == "-" and p > start and _hyphen_ends_piece(word, p):
                    out.append(word[start : p + 1])
                    start = p + 1
        out.append(word[start:])
    return out


def _greedy(chunks: list[str], rest: str) -> str:
    """Pieces onto lines of at most 96 columns, the first indented six spaces, the others
    ``rest``: each line takes the next piece while it fits; a space at the start or the
    end of a line is dropped (``TextWrapper._wrap_chunks`` for pieces no longer than a
    line)."""
    lines: list[str] = []
    i, n = 0, len(chunks)
    while i < n:
        indent = rest if lines else "      "
        width = 96 - len(indent)
        if lines and chunks[i] == " ":
            i += 1
        line: list[str] = []
        used = 0
        while i < n and used + len(chunks[i]) <= width:
            line.append(chunks[i])
            used += len(chunks[i])
            i += 1
        if line and line[-1] == " ":
            line.pop()
        if line:
            lines.append(indent + "".join(line))
    return "\n".join(lines)


def render_text(results: Results, show_all: bool = False) -> str:
    """The summary as text for a terminal (``show_all``: passing and info findings too)."""
    out = io.StringIO()
    display = display_for(results)
    j = results.job_summary
    out.write(f"{j['name']}  (rev {j['revision'] or MISSING}, rules {j['rules']})\n\n")
    out.write("\n".join(_node_table(results)) + "\n\n")
    if positions := _position_table(results):
        out.write("\n".join(positions) + "\n\n")
    nodes: dict = {}
    for n in results.nodes:  # by id, the first of an id (as a search from the start)
        nodes.setdefault(n.id, n)
    for pid, sr in results.schedules.items():
        out.write(_schedule_line(nodes, pid, sr.totals) + "\n")
        for notice in getattr(sr, "notices", None) or ():
            out.write(f"  notice: {notice}\n")
    if results.schedules:
        out.write("\n")
    for f in results.sorted_findings():
        if show_all or f.status in ("fail", "warn") or f.unconfirmed:
            out.write(_finding_lines(f, display))
    c = results.counts()
    out.write(
        f"\n{c['fail']} fail, {c['warn']} warn, {c['ok']} ok, {c['info']} info"
        + ("" if show_all else "   (--all lists every finding)")
        + "\n"
    )
    if results.unconfirmed():
        out.write(unconfirmed_line(len(results.unconfirmed())) + " (listed above)\n")
    for a in results.assumptions:
        out.write(f"assumed: {a}\n")
    out.write(f"\n{CAUTION}\n")
    return out.getvalue()
