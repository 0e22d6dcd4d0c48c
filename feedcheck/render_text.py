"""Render results for the terminal, as JSON and as CSV (no computation here)."""

from __future__ import annotations

import csv
import io
import json
import math
import textwrap

from . import CAUTION
from .results import Results

# (key, header, scale, decimals): node figures shown when any node has them
NODE_COLUMNS = (
    ("load_va", "load kVA", 1e-3, 1),
    ("fault_max_a", "Isc max kA", 1e-3, 2),
    ("fault_min_a", "Isc min kA", 1e-3, 2),
    ("fault_lg_min_a", "I L-G min kA", 1e-3, 2),
    ("x_r", "X/R", 1, 2),
    ("peak_a", "peak kA", 1e-3, 2),
    ("fault_ptp_a", "p-t-p kA", 1e-3, 2),
    ("voltage_pct", "V %", 1, 2),
    ("vdrop_pct", "drop %", 1, 2),
)
STATUS_WORD = {"fail": "FAIL", "warn": "WARN", "ok": "ok", "info": "info"}


def number(v: float) -> str:
    """A figure for people: thousands separators, no exponent, 3–4 significant digits."""
    if math.isinf(v):
        return "∞"
    a = abs(v)
    if a >= 100:
        return f"{v:,.0f}"
    if a >= 10:
        return f"{v:.1f}"
    if a >= 1:
        return f"{v:.2f}"
    return f"{v:.3g}"


def _fmt(v, scale, dec) -> str:
    if v is None:
        return "–"
    if isinstance(v, float) and math.isinf(v):
        return "∞"
    return f"{v * scale:,.{dec}f}"


def _phase_keys(totals: dict) -> tuple[str, ...]:
    from .units import UnitParseError, parse_voltage_system

    try:
        three = parse_voltage_system(str(totals.get("system", ""))).phases == 3
    except UnitParseError:
        three = True
    return ("phase_a_va", "phase_b_va", "phase_c_va") if three else ("phase_a_va", "phase_b_va")


def render_text(results: Results, show_all: bool = False) -> str:
    out = io.StringIO()
    j = results.job_summary
    out.write(f"{j['name']}  (rev {j['revision'] or '–'}, rules {j['rules']})\n\n")
    cols = [c for c in NODE_COLUMNS if any(c[0] in n.values for n in results.nodes)]
    header = ["node", "kind", "voltage", *[c[1] for c in cols]]
    rows = [
        [n.id, n.kind, n.voltage, *[_fmt(n.values.get(c[0]), c[2], c[3]) for c in cols]]
        for n in results.nodes
    ]
    widths = [max(len(str(r[i])) for r in [header, *rows]) for i in range(len(header))]
    for r in [header, *rows]:
        out.write(
            "  ".join(
                str(c).ljust(w) if i < 3 else str(c).rjust(w)
                for i, (c, w) in enumerate(zip(r, widths, strict=True))
            ).rstrip()
        )
        out.write("\n")
    out.write("\n")
    for pid, sr in results.schedules.items():
        t = sr.totals
        out.write(
            f"schedule {pid}: {int(t.get('circuits', 0))} circuits, demand "
            f"{t.get('demand_va', 0) / 1000:.1f} kVA (continuous at 125 %: "
            f"{t.get('design_va', 0) / 1000:.1f} kVA), phases "
            + "/".join(f"{t[k] / 1000:.1f}" for k in _phase_keys(t) if k in t)
            + f" kVA, imbalance {t.get('imbalance_pct', 0):.1f} %; "
            f"{int(t.get('fail_circuits', 0))} circuits fail, "
            f"{int(t.get('warn_circuits', 0))} warn\n"
        )
    if results.schedules:
        out.write("\n")
    shown = [f for f in results.sorted_findings() if show_all or f.status in ("fail", "warn")]
    for f in shown:
        fig = ""
        if f.value is not None and isinstance(f.value, float):
            fig = number(f.value)
            if f.limit is not None:
                fig += f" vs {number(f.limit)}"
            fig += f" {f.unit}".rstrip()
        out.write(f"{STATUS_WORD[f.status]:4}  {f.subject}  {f.check}: {fig}  [{f.rule_id}]\n")
        out.write(
            textwrap.fill(f.note, width=96, initial_indent="      ", subsequent_indent="      ")
            + "\n"
        )
    c = results.counts()
    out.write(
        f"\n{c['fail']} fail, {c['warn']} warn, {c['ok']} ok, {c['info']} info"
        + ("" if show_all else "   (--all lists every finding)")
        + "\n"
    )
    for a in results.assumptions:
        out.write(f"assumed: {a}\n")
    out.write(f"\n{CAUTION}\n")
    return out.getvalue()


def render_json(results: Results) -> str:
    d = results.to_dict()
    d["caution"] = CAUTION
    return json.dumps(d, indent=2, ensure_ascii=False) + "\n"


FINDING_FIELDS = ("subject", "check", "value", "limit", "unit", "status", "rule_id", "note")


# first characters that make a spreadsheet read a cell as a formula (CSV/XLSX exports)
FORMULA_PREFIXES = ("=", "+", "-", "@", "\t", "\r")


def neutralise_cell(v):
    """Prefix a text cell that a spreadsheet would read as a formula with a quote."""
    if isinstance(v, str) and v[:1] in FORMULA_PREFIXES:
        return "'" + v
    return v


def render_csv(results: Results) -> str:
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(FINDING_FIELDS)
    for f in results.sorted_findings():
        d = f.as_dict()
        w.writerow([neutralise_cell(d[k]) if d[k] is not None else "" for k in FINDING_FIELDS])
    return buf.getvalue()
