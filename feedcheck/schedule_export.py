"""Exports of checked schedules: one row per circuit with its status and reason.

CSV, XLSX or JSON by the output file's suffix; written atomically (a temporary file
beside the target, renamed on success, removed on any error or interrupt). Text cells
that a spreadsheet would read as a formula (``= + - @``, tab, carriage return) get a
leading quote in CSV and XLSX. Renderers compute nothing: figures come from
:class:`~feedcheck.schedule_checks.ScheduleResult`.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np

from .io_atomic import atomic_path

FORMATS = (".csv", ".xlsx", ".json")
_FORMULA_START = r"^[=+\-@\t\r]"
_FORMULA_CHARS = np.array(["=", "+", "-", "@", "\t", "\r"])


def neutralise_column(values: np.ndarray) -> np.ndarray:
    """Prefix text cells starting like a formula with ``'`` (vectorised).

    Examples
    --------
    >>> neutralise_column(np.array(["=1+1", "ok", "@SUM(A1)"], dtype=object)).tolist()
    ["'=1+1", 'ok', "'@SUM(A1)"]
    """
    import pandas as pd
    from pandas.api.types import infer_dtype

    values = np.asarray(values, dtype=object)
    if infer_dtype(values, skipna=False) == "string":
        # every cell is text: test the first character in C (numpy U1 keeps one char)
        hit = np.isin(values.astype("U1"), _FORMULA_CHARS)
        out = values.copy()
        if hit.any():
            out[hit] = "'" + values[hit]
        return out
    s = pd.Series(values, dtype=object)
    hit = s.str.match(_FORMULA_START, na=False).to_numpy(bool)  # non-text cells: no match
    out = s.to_numpy(object).copy()
    out[hit] = "'" + s[hit].astype(str).to_numpy(object)
    return out


def circuits_frame(results) -> pd.DataFrame:  # noqa: F821 - pandas imported lazily
    """All circuits of all results, with the file they came from."""
    import pandas as pd

    frames = []
    for r in results:
        f = r.circuits.copy()
        f.insert(0, "file", r.path.name)
        frames.append(f)
    if not frames:
        return pd.DataFrame()
    return pd.concat(frames, ignore_index=True) if len(frames) > 1 else frames[0]


def _safe_frame(df):
    out = df.copy()
    for col in out.columns:
        if out[col].dtype == np.float64:
            out[col] = out[col].round(6)
        elif out[col].dtype == object:
            out[col] = neutralise_column(out[col].to_numpy(object))
    return out


def write_results(results, target: str | Path, caution: str = "") -> None:
    """Write every circuit of ``results`` to ``target`` (.csv, .xlsx or .json), atomically."""
    target = Path(target)
    suffix = target.suffix.lower()
    if suffix not in FORMATS:
        raise ValueError(f"output: got {target.name!r}; expected a .csv, .xlsx or .json file")
    df = circuits_frame(results)
    with atomic_path(target) as tmp:
        if suffix == ".csv":
            _safe_frame(df).to_csv(tmp, index=False, lineterminator="\n")
        elif suffix == ".xlsx":
            _write_xlsx(results, df, tmp, caution)
        else:
            tmp.write_text(_json(results, caution), encoding="utf-8")


def _write_xlsx(results, df, tmp: Path, caution: str) -> None:
    import openpyxl

    wb = openpyxl.Workbook(write_only=True)
    ws = wb.create_sheet("circuits")
    safe = _safe_frame(df)
    ws.append(list(safe.columns))
    for row in safe.itertuples(index=False, name=None):
        ws.append([_xl(v) for v in row])
    pt = wb.create_sheet("panels")
    import pandas as pd

    panels = pd.concat([r.panels.assign(file=r.path.name) for r in results], ignore_index=True)
    panels = _safe_frame(panels)
    pt.append(list(panels.columns))
    for row in panels.itertuples(index=False, name=None):
        pt.append([_xl(v) for v in row])
    if caution:
        pt.append([])
        pt.append([caution])
    wb.save(tmp)


def _xl(v):
    if isinstance(v, (np.floating, float)):
        return None if not math.isfinite(float(v)) else float(v)
    if isinstance(v, (np.integer,)):
        return int(v)
    if isinstance(v, (np.bool_,)):
        return bool(v)
    return v


def _json(results, caution: str) -> str:
    out = {"caution": caution, "files": []}
    for r in results:
        out["files"].append({
            "file": r.path.name,
            "system": r.system,
            "totals": {k: _xl(v) for k, v in r.totals.items()},
            "panels": json.loads(r.panels.to_json(orient="records")),
            "circuits": json.loads(r.circuits.to_json(orient="records")),
            "findings": [f.as_dict() for f in r.findings if f.status in ("fail", "warn")],
        })
    return json.dumps(out, indent=1, ensure_ascii=False) + "\n"
