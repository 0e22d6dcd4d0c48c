"""Exports of checked schedules: one row per circuit with its status and reason.

CSV, XLSX or JSON by the output file's suffix; written atomically (a temporary file
beside the target, renamed on success, removed on any error or interrupt). Text cells
that a spreadsheet would read as a formula (``= + - @``, tab, carriage return) get a
leading quote in CSV and XLSX. Renderers compute nothing: figures come from
:class:`~feedcheck.checks.schedules.ScheduleResult`. The formula guard is
:mod:`feedcheck.render.cells`.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np

from ..io_atomic import atomic_path
from .cells import neutralise_column

FORMATS = (".csv", ".xlsx", ".json")


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


CSV_CHUNK_ROWS = 100_000


def _csv_quoter():
    """Text → the cell as the standard CSV writer writes it (quoted where needed)."""
    import csv
    import io

    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")  # the dialect pandas' to_csv uses by default

    def quote(text: str) -> str:
        buf.seek(0)
        buf.truncate()
        w.writerow([text, ""])  # a second (empty) field: never the lone-empty-field case
        return buf.getvalue()[:-2]

    return quote


def _csv_cells(values: np.ndarray, quote) -> np.ndarray | None:
    """Cells of one column as ``to_csv`` renders them after :func:`_safe_frame` (floats
    rounded to 6 places, NaN empty, formula-like text neutralised), each distinct value
    formatted once; None for a column kind this path does not handle."""
    import pandas as pd
    from pandas.api.types import infer_dtype

    if values.dtype == np.float64:
        bits = np.ascontiguousarray(values.round(6)).view(np.int64)
        codes, uniq = pd.factorize(bits)
        u = uniq.view(np.float64)
        txt = u.astype(str).astype(object)  # what pandas does for float blocks
        txt[np.isnan(u)] = ""
    elif values.dtype.kind in "iu":
        codes, uniq = pd.factorize(values)
        txt = np.asarray(uniq).astype(str).astype(object)
    elif values.dtype.kind == "b":
        codes, txt = values.astype(np.intp), np.array(["False", "True"], dtype=object)
    elif values.dtype == object and infer_dtype(values, skipna=False) == "string":
        codes, uniq = pd.factorize(values)
        txt = np.array(
            [quote(u) for u in neutralise_column(np.asarray(uniq, dtype=object))] + [None],
            dtype=object,
        )[:-1]
    else:
        return None
    return txt[codes]


def _write_csv_fast(results, tmp: Path) -> bool:
    """Write the circuits CSV byte for byte as ``_safe_frame(...).to_csv`` would, a chunk
    of rows at a time without building one frame of every circuit; False (nothing
    written) when the results hold a column this path does not handle."""
    results = list(results)
    if not results:
        return False
    cols = list(results[0].circuits.columns)
    dtypes = list(results[0].circuits.dtypes)
    if not cols or not all(isinstance(c, str) for c in cols) or "file" in cols:
        return False
    from pandas.api.types import infer_dtype

    for r in results:
        if list(r.circuits.columns) != cols or list(r.circuits.dtypes) != dtypes:
            return False
        for k, d in zip(cols, dtypes, strict=True):
            if (
                not isinstance(d, np.dtype)
                or d.kind not in "fiubO"
                or (d.kind == "f" and d != np.float64)
                or (
                    d.kind == "O"
                    and infer_dtype(r.circuits[k].to_numpy(), skipna=False) != "string"
                )
            ):
                return False
    quote = _csv_quoter()
    with open(tmp, "w", encoding="utf-8", newline="") as fh:
        fh.write(",".join(quote(c) for c in ["file", *cols]) + "\n")
        for r in results:
            c = r.circuits
            name = quote(neutralise_column(np.array([r.path.name], dtype=object))[0])
            for start in range(0, len(c), CSV_CHUNK_ROWS):
                part = c.iloc[start : start + CSV_CHUNK_ROWS]
                cells = [_csv_cells(part[k].to_numpy(), quote) for k in cols]
                if any(x is None for x in cells):
                    return False
                lists = [[name] * len(part)] + [x.tolist() for x in cells]
                fh.write("\n".join(map(",".join, zip(*lists, strict=True))) + "\n")
    return True


def write_results(results, target: str | Path, caution: str = "") -> None:
    """Write every circuit of ``results`` to ``target`` (.csv, .xlsx or .json), atomically."""
    target = Path(target)
    suffix = target.suffix.lower()
    if suffix not in FORMATS:
        raise ValueError(f"output: got {target.name!r}; expected a .csv, .xlsx or .json file")
    with atomic_path(target) as tmp:
        if suffix == ".csv":
            if not _write_csv_fast(results, tmp):
                _safe_frame(circuits_frame(results)).to_csv(tmp, index=False, lineterminator="\n")
        elif suffix == ".xlsx":
            _write_xlsx(results, circuits_frame(results), tmp, caution)
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
        out["files"].append(
            {
                "file": r.path.name,
                "system": r.system,
                "totals": {k: _xl(v) for k, v in r.totals.items()},
                "panels": json.loads(r.panels.to_json(orient="records")),
                "circuits": json.loads(r.circuits.to_json(orient="records")),
                "findings": [f.as_dict() for f in r.findings if f.status in ("fail", "warn")],
            }
        )
    return json.dumps(out, indent=1, ensure_ascii=False) + "\n"
