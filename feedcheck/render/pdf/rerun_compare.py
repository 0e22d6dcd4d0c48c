"""Hold a re-run's results against the results embedded in a report.

``feedcheck rerun`` takes the inputs out of a report (:mod:`.embed`), checks them
again and compares here every node figure and every finding with the embedded
results (relative tolerance 1e-9), and names the tables whose content changed.
Both sides are results as parsed from :func:`feedcheck.render.json_csv.render_json`.
Nothing here computes an electrical figure.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..display import precise

RTOL = 1e-9

# node keys that name or place a node rather than give a figure
_NODE_TEXT_KEYS = ("id", "kind", "voltage", "parent", "via_run")


@dataclass(frozen=True)
class Difference:
    """One figure that differs between the report and the re-run."""

    element: str
    figure: str
    report_value: object
    rerun_value: object

    def __str__(self) -> str:
        return (
            f"{self.element}: {self.figure}: report {_show(self.report_value)}, "
            f"rerun {_show(self.rerun_value)}"
        )


def _num(v):
    """A JSON figure as a float (``"inf"`` strings included), or None."""
    if isinstance(v, bool):
        return None
    if isinstance(v, (int, float)):
        return float(v)
    if v in ("inf", "-inf"):
        return float(v)
    return None


def _same(a, b) -> bool:
    fa, fb = _num(a), _num(b)
    if fa is not None and fb is not None:
        if math.isinf(fa) or math.isinf(fb):
            return fa == fb
        return math.isclose(fa, fb, rel_tol=RTOL, abs_tol=0.0) or fa == fb
    return a == b


def _show(v) -> str:
    return precise(v) if v is None or _num(v) is not None else str(v)


def _finding_keys(findings: list[dict]) -> dict[tuple[str, str, int], dict]:
    seen: dict[tuple[str, str], int] = {}
    out = {}
    for f in findings:
        k = (str(f.get("subject")), str(f.get("check")))
        seen[k] = seen.get(k, 0) + 1
        out[(*k, seen[k])] = f
    return out


def compare_results(report: dict, rerun: dict) -> tuple[int, list[Difference]]:
    """Compare every node figure and every finding (relative tolerance 1e-9).

    Parameters
    ----------
    report, rerun : dict
        Results as parsed from :func:`feedcheck.render.json_csv.render_json`.

    Returns
    -------
    (compared, differences)
        How many figures were compared, and each one that differs, with its
        element, figure name, report value and re-run value.
    """
    diffs: list[Difference] = []
    compared = 0
    rep_nodes = {n["id"]: n for n in report.get("nodes", [])}
    new_nodes = {n["id"]: n for n in rerun.get("nodes", [])}
    for nid in [*rep_nodes, *[n for n in new_nodes if n not in rep_nodes]]:
        a, b = rep_nodes.get(nid), new_nodes.get(nid)
        if a is None or b is None:
            compared += 1
            diffs.append(
                Difference(nid, "node", "present" if a else None, "present" if b else None)
            )
            continue
        keys = [k for k in a if k not in _NODE_TEXT_KEYS]
        keys += [k for k in b if k not in _NODE_TEXT_KEYS and k not in a]
        for k in keys:
            compared += 1
            if not _same(a.get(k), b.get(k)):
                diffs.append(Difference(nid, k, a.get(k), b.get(k)))
    rep_f = _finding_keys(report.get("findings", []))
    new_f = _finding_keys(rerun.get("findings", []))
    for key in [*rep_f, *[k for k in new_f if k not in rep_f]]:
        subject, check, nth = key
        name = check if nth == 1 else f"{check} #{nth}"
        a, b = rep_f.get(key), new_f.get(key)
        compared += 1
        if a is None or b is None:
            diffs.append(
                Difference(
                    subject, f"finding '{name}'", a and a.get("status"), b and b.get("status")
                )
            )
            continue
        for field in ("value", "limit", "status", "rule_id", "unit"):
            if not _same(a.get(field), b.get(field)):
                diffs.append(Difference(subject, f"{name} ({field})", a.get(field), b.get(field)))
    return compared, diffs


def _tables(results: dict) -> dict[str, dict]:
    tables = results.get("tables", [])
    if not isinstance(tables, list):
        return {}
    return {t["name"]: t for t in tables if isinstance(t, dict) and isinstance(t.get("name"), str)}


def table_changes(report: dict, rerun: dict) -> list[str]:
    """Tables whose content (sha256) differs between the report and the re-run."""
    old, new = _tables(report), _tables(rerun)
    out = []
    for name in sorted(set(old) & set(new)):
        if old[name].get("sha256") != new[name].get("sha256"):
            out.append(
                f"table {name}: report used {str(old[name].get('sha256'))[:12]} "
                f"({old[name].get('origin')}), rerun used {str(new[name].get('sha256'))[:12]} "
                f"({new[name].get('origin')})"
            )
    return out
