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
    rows = [
        [n.id, n.kind, n.voltage, *[figure_cell(k, n.values.get(k)) for k in keys]]
        for n in results.nodes
    ]
    widths = [max(len(str(r[i])) for r in [header, *rows]) for i in range(len(header))]
    return [
        "  ".join(
            str(c).ljust(w) if i < 3 else str(c).rjust(w)
            for i, (c, w) in enumerate(zip(r, widths, strict=True))
        ).rstrip()
        for r in [header, *rows]
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
# where textwrap may break inside a word: a hyphen after two letters or after
# letter-hyphen-letter, or a run of hyphens (its em-dash); text without one wraps
# only at spaces
_HYPHEN_BREAK = re.compile(r"[^\d\W]{2}-|[^\d\W]-[^\d\W]-|--")


def _fill(text: str, rest: str) -> str:
    """``text`` wrapped at 96 columns, indented six spaces (``rest``: the indent of
    the lines after the first). Most notes are words between single plain spaces
    (no leading or trailing space, no other whitespace, no hyphen the wrapper may break
    at, no word longer than a line): those are wrapped here, word by word, as the
    wrapper wraps them (it gives the same text more slowly); any other text goes to the
    wrapper."""
    if (
        text
        and text == text.strip()
        and not any(c in text for c in _SPACE_KINDS)
        and not _HYPHEN_BREAK.search(text)
        and "  " not in text
    ):
        if len(text) <= 96 - 6:
            return "      " + text
        words = text.split(" ")
        if max(map(len, words)) <= 96 - max(6, len(rest)):
            return _greedy(words, rest)
    return _WRAPPERS[rest].fill(text)


def _greedy(words: list[str], rest: str) -> str:
    """Words onto lines of at most 96 columns, first indented six spaces, the others
    ``rest``: each line takes the next word while it fits after one space
    (``textwrap``'s rule for words between single spaces; the space at a break is
    dropped)."""
    lines, indent, line, used = [], "      ", [words[0]], len(words[0])
    for w in words[1:]:
        if used + 1 + len(w) <= 96 - len(indent):
            line.append(w)
            used += 1 + len(w)
        else:
            lines.append(indent + " ".join(line))
            indent, line, used = rest, [w], len(w)
    lines.append(indent + " ".join(line))
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
