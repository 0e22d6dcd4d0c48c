"""What changed between two revisions of a job: inputs (job keys, schedules,
tables) and, as a result, figures and findings. Used by ``feedcheck compare``.

Each side is a :class:`Revision`: the input files by name (job file first),
and the results as parsed from :func:`feedcheck.render.json_csv.render_json`.
Nothing here computes an electrical figure.
"""

from __future__ import annotations

import difflib
import tomllib
from dataclasses import dataclass

from .display import precise
from .pdf.rerun_compare import compare_results

MAX_SCHEDULE_LINES = 12


@dataclass(frozen=True)
class Revision:
    label: str
    job_name: str
    files: dict[str, bytes]  # job file and schedules, by path relative to the job
    results: dict


def _flatten(doc: dict) -> dict[str, object]:
    """{'panel P1.load': '20 kVA', 'source.x_r': 8, …} from a parsed job file."""
    out: dict[str, object] = {}
    for section, body in doc.items():
        if isinstance(body, dict):
            for k, v in body.items():
                out[f"{section}.{k}"] = v
        elif isinstance(body, list):
            for i, item in enumerate(body):
                if not isinstance(item, dict):
                    continue
                name = f"{section} {item.get('id', f'#{i + 1}')}"
                for k, v in item.items():
                    if k != "id":
                        out[f"{name}.{k}"] = v
        else:
            out[section] = body
    return out


def _show(v) -> str:
    if v is None:
        return "(none)"
    if isinstance(v, (int, float)) and not isinstance(v, bool):
        return precise(v)
    return repr(v) if isinstance(v, str) else str(v)


def job_changes(old: Revision, new: Revision) -> list[str]:
    """Job keys added, removed or changed (arrays of tables named by their id)."""

    def parse(rev: Revision) -> dict:
        raw = rev.files[rev.job_name]
        if rev.job_name.lower().endswith(".xlsx"):  # a job workbook: the same data
            from ..inputs.workbook_file import workbook_data

            return _flatten(workbook_data(raw, rev.job_name).data)
        return _flatten(tomllib.loads(raw.decode("utf-8-sig")))

    from ..errors import InputError

    try:
        a, b = parse(old), parse(new)
    except (tomllib.TOMLDecodeError, UnicodeDecodeError, KeyError, InputError) as exc:
        return [f"job file: cannot be compared key by key ({type(exc).__name__})"]
    lines = []
    for key in [*a, *[k for k in b if k not in a]]:
        if key not in b:
            lines.append(f"job {key}: removed (was {_show(a[key])})")
        elif key not in a:
            lines.append(f"job {key}: added {_show(b[key])}")
        elif a[key] != b[key]:
            lines.append(f"job {key}: {_show(a[key])} → {_show(b[key])}")
    return lines


def schedule_changes(old: Revision, new: Revision) -> list[str]:
    """Schedule files added, removed or changed, with their changed lines."""
    sa = {k: v for k, v in old.files.items() if k != old.job_name}
    sb = {k: v for k, v in new.files.items() if k != new.job_name}
    lines = []
    for name in sorted(set(sa) | set(sb)):
        if name not in sb:
            lines.append(f"schedule {name}: removed")
        elif name not in sa:
            lines.append(f"schedule {name}: added")
        elif sa[name] != sb[name]:
            la = sa[name].decode("utf-8-sig", "replace").splitlines()
            lb = sb[name].decode("utf-8-sig", "replace").splitlines()
            diff = [
                d
                for d in difflib.unified_diff(la, lb, lineterm="", n=0)
                if d[:1] in "+-" and d[:3] not in ("+++", "---")
            ]
            lines.append(f"schedule {name}: {len(diff)} line(s) changed")
            lines += [f"    {d}" for d in diff[:MAX_SCHEDULE_LINES]]
            if len(diff) > MAX_SCHEDULE_LINES:
                lines.append(f"    … {len(diff) - MAX_SCHEDULE_LINES} more")
    return lines


def table_changes(old: Revision, new: Revision) -> list[str]:
    """Tables whose content (sha256) or origin changed, or that only one side used."""

    def tables(rev):
        return {t["name"]: t for t in rev.results.get("tables", []) if isinstance(t, dict)}

    a, b = tables(old), tables(new)
    lines = []
    for name in sorted(set(a) | set(b)):
        if name not in b:
            lines.append(f"table {name}: used only by {old.label}")
        elif name not in a:
            lines.append(f"table {name}: used only by {new.label}")
        elif a[name].get("sha256") != b[name].get("sha256"):
            lines.append(
                f"table {name}: content changed ({a[name].get('origin')} "
                f"{str(a[name].get('sha256'))[:12]} → {b[name].get('origin')} "
                f"{str(b[name].get('sha256'))[:12]})"
            )
    return lines


def result_changes(old: Revision, new: Revision) -> tuple[list[str], list[str], int]:
    """(figure changes, finding changes, figures compared)."""
    n, diffs = compare_results(old.results, new.results)
    figures, findings = [], []
    for d in diffs:
        line = f"{d.element}: {d.figure}: {_show(d.report_value)} → {_show(d.rerun_value)}"
        is_finding = d.figure.startswith("finding") or d.figure.endswith(")")
        (findings if is_finding else figures).append(line)
    return figures, findings, n
