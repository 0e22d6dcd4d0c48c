"""The results as JSON (every node figure, run, schedule and finding) and the
findings as CSV, for machines and batch use (no computation here)."""

from __future__ import annotations

import csv
import io
import json

from .. import CAUTION
from ..results import Results
from .cells import neutralise_cell

FINDING_FIELDS = ("subject", "check", "value", "limit", "unit", "status", "rule_id", "note")


def render_json(results: Results) -> str:
    """:meth:`Results.to_dict` with the caution, as indented JSON (SI keys)."""
    d = results.to_dict()
    d["caution"] = CAUTION
    return json.dumps(d, indent=2, ensure_ascii=False) + "\n"


def render_csv(results: Results) -> str:
    """One row per finding, failures first; formula-like text cells neutralised."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(FINDING_FIELDS)
    for f in results.sorted_findings():
        d = f.as_dict()
        d["note"] = "; ".join([d["note"], *f.unconfirmed]) if f.unconfirmed else d["note"]
        w.writerow([neutralise_cell(d[k]) if d[k] is not None else "" for k in FINDING_FIELDS])
    return buf.getvalue()
