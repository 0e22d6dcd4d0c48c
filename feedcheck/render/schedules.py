"""Exports of checked schedules: one row per circuit with its status and reason.

CSV, XLSX or JSON by the output file's suffix; written atomically (a temporary file
beside the target, renamed on success, removed on any error or interrupt). Text cells
that a spreadsheet would read as a formula (``= + - @``, tab, carriage return) get a
leading quote in CSV and XLSX. Renderers compute nothing: figures come from
:class:`~feedcheck.checks.schedules.ScheduleResult`. The formula guard is
:mod:`feedcheck.render.cells`.

For people: lengths also in the unit the schedule used (``length``, ``length_unit``;
``length_m`` stays for machines); the CSV gets a companion ``NAME.panels.csv`` with the
panel totals; the XLSX has a frozen, filtered header, number formats, a fill on fail and
warn cells, readable widths, a ``panels`` sheet and a ``notes`` sheet (caution and the
reader's notices). Every results file carries a marker (:func:`is_results_file`) so a
later run over the same folder skips it.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np

from ..io_atomic import atomic_path
from .cells import neutralise_column, xlsx_text

FORMATS = (".csv", ".xlsx", ".json")
XLSX_TITLE = "feedcheck schedule results"  # the XLSX marker (document title)
XLSX_MAX_ROWS = 1_048_575  # data rows under the header on one spreadsheet sheet
_CSV_MARKS = ("file,panel,circuit,", "file,panel,circuits,")  # results / panel totals
FOOT_M = 0.3048  # NIST SP 811 (2008) B.9: 1 ft = 0.3048 m exactly


def panels_csv_path(target: str | Path) -> Path:
    """The companion panel-totals file of a CSV export: ``results.csv`` → ``results.panels.csv``."""
    t = Path(target)
    return t.with_name(t.stem + ".panels.csv")


def is_results_file(path: Path) -> bool:
    """Whether ``path`` is a results file this command wrote (its marker), to be skipped
    when a folder is checked again."""
    import zipfile

    try:
        if path.suffix.lower() == ".csv":
            with open(path, "rb") as fh:
                head = fh.read(64).decode("utf-8", "replace").lstrip("\ufeff")
            return head.startswith(_CSV_MARKS)
        if path.suffix.lower() == ".xlsx":
            with zipfile.ZipFile(path) as zf:
                info = zf.getinfo("docProps/core.xml")
                if info.file_size > 100_000:
                    return False
                return XLSX_TITLE in zf.read(info).decode("utf-8", "replace")
    except (OSError, KeyError, ValueError, zipfile.BadZipFile):
        return False
    return False


def _people(r):
    """The circuits of one result with the length in the schedule's own unit beside
    ``length_m`` (display only)."""
    c = r.circuits
    if "length_m" not in c.columns:
        return c
    unit = getattr(r, "length_unit", "ft")
    at = list(c.columns).index("length_m")
    c = c.copy()
    c.insert(at, "length_unit", unit)
    c.insert(at, "length", (c["length_m"] / (FOOT_M if unit == "ft" else 1.0)).round(3))
    return c


def circuits_frame(results) -> pd.DataFrame:  # noqa: F821 - pandas imported lazily
    """All circuits of all results, with the file they came from."""
    import pandas as pd

    frames = []
    for r in results:
        f = _people(r)
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
    frames = [_people(r) for r in results]
    cols = list(frames[0].columns)
    dtypes = list(frames[0].dtypes)
    if not cols or not all(isinstance(c, str) for c in cols) or "file" in cols:
        return False
    from pandas.api.types import infer_dtype

    for f in frames:
        if list(f.columns) != cols or list(f.dtypes) != dtypes:
            return False
        for k, d in zip(cols, dtypes, strict=True):
            if (
                not isinstance(d, np.dtype)
                or d.kind not in "fiubO"
                or (d.kind == "f" and d != np.float64)
                or (d.kind == "O" and infer_dtype(f[k].to_numpy(), skipna=False) != "string")
            ):
                return False
    quote = _csv_quoter()
    with open(tmp, "w", encoding="utf-8", newline="") as fh:
        fh.write(",".join(quote(c) for c in ["file", *cols]) + "\n")
        for r, c in zip(results, frames, strict=True):
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
    if suffix == ".csv":
        # the circuits and, beside them, the panel totals: both or neither written
        with atomic_path(panels_csv_path(target)) as ptmp, atomic_path(target) as tmp:
            if not _write_csv_fast(results, tmp):
                _safe_frame(circuits_frame(results)).to_csv(tmp, index=False, lineterminator="\n")
            _safe_frame(panels_frame(results)).to_csv(ptmp, index=False, lineterminator="\n")
        return
    with atomic_path(target) as tmp:
        if suffix == ".xlsx":
            _write_xlsx(results, circuits_frame(results), tmp, caution)
        else:
            tmp.write_text(_json(results, caution), encoding="utf-8")


def panels_frame(results):
    """One row per panel of every result, its file first."""
    import pandas as pd

    frames = []
    for r in results:
        f = r.panels.copy()
        f.insert(0, "file", r.path.name)
        frames.append(f)
    return pd.concat(frames, ignore_index=True) if frames else pd.DataFrame()


# number formats of the XLSX columns (the rest: general)
_FORMATS = {
    "load_va": "#,##0",
    "current_a": "0.0",
    "breaker_a": "0",
    "length": "0.0",
    "length_m": "0.00",
    "ampacity_a": "0.0",
    "vdrop_pct": "0.00",
    "total_vdrop_pct": "0.00",
    "imbalance_pct": "0.0",
    "design_current_a": "0.0",
}
_FILLS = {"fail": "FFC7CE", "warn": "FFEB9C"}  # light red, light yellow


def _write_xlsx(results, df, tmp: Path, caution: str) -> None:
    import openpyxl

    if len(df) > XLSX_MAX_ROWS:
        raise ValueError(
            f"output: {len(df):,} circuits are more than one spreadsheet sheet holds "
            f"({XLSX_MAX_ROWS:,}); write a .csv instead"
        )
    wb = openpyxl.Workbook(write_only=True)
    wb.properties.title = XLSX_TITLE
    cut: list[str] = []
    _sheet(wb, "circuits", _safe_frame(df), cut)
    _sheet(wb, "panels", _safe_frame(panels_frame(results)), cut)
    notes = wb.create_sheet("notes")
    notes.column_dimensions["A"].width = 120
    for line in (
        [caution, ""]
        + [f"{r.path.name}: {n}" for r in results for n in getattr(r, "notices", [])]
        + cut
    ):
        notes.append([xlsx_text(line)[0]])
    wb.save(tmp)


def _sheet(wb, name: str, frame, cut: list[str]) -> None:
    """One sheet: frozen, filtered header, number formats, fills, widths."""
    from openpyxl.cell import WriteOnlyCell
    from openpyxl.styles import Font, PatternFill
    from openpyxl.utils import get_column_letter

    ws = wb.create_sheet(name)
    cols = list(frame.columns)
    ws.freeze_panes = "A2"
    last = get_column_letter(max(len(cols), 1))
    ws.auto_filter.ref = f"A1:{last}{len(frame) + 1}"
    for j, c in enumerate(cols):
        sample = frame[c].astype(str).str.len().head(200).max() if len(frame) else 0
        ws.column_dimensions[get_column_letter(j + 1)].width = min(
            max(len(str(c)), int(sample or 0)) + 2, 60
        )
    bold = Font(bold=True)
    head = []
    for c in cols:
        cell = WriteOnlyCell(ws, value=c)
        cell.font = bold
        head.append(cell)
    ws.append(head)
    fmt = [_FORMATS.get(c) for c in cols]
    fills = {k: PatternFill("solid", fgColor=v) for k, v in _FILLS.items()}
    status_at = cols.index("status") if "status" in cols else -1
    for i, row in enumerate(frame.itertuples(index=False, name=None)):
        out = []
        fill = fills.get(row[status_at]) if status_at >= 0 else None
        for j, v in enumerate(row):
            v = _xl(v)
            if isinstance(v, str):
                v, was_cut = xlsx_text(v)
                if was_cut:
                    cut.append(
                        f"{name} row {i + 2}, column '{cols[j]}': text cut to the cell limit"
                    )
            if fmt[j] is None and fill is None:
                out.append(v)
                continue
            cell = WriteOnlyCell(ws, value=v)
            if fmt[j] is not None:
                cell.number_format = fmt[j]
            if fill is not None and j in (status_at, status_at + 1):
                cell.fill = fill
            out.append(cell)
        ws.append(out)


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
                "notices": list(getattr(r, "notices", [])),
                "panels": json.loads(r.panels.to_json(orient="records")),
                "circuits": json.loads(_people(r).to_json(orient="records")),
                "findings": [f.as_dict() for f in r.findings if f.status in ("fail", "warn")],
            }
        )
    return json.dumps(out, indent=1, ensure_ascii=False) + "\n"
