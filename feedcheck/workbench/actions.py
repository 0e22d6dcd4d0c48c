"""What the workbench does with one job: hold its text (and edited schedules) in
memory, check it with the runner, save it, write its report, start a new job, read and
write its schedules. Every file it writes is inside the job's folder, written
atomically; it opens no other path the page names.
"""

from __future__ import annotations

import csv
import io
import re
import threading
import time
from pathlib import Path

from ..errors import InputError, Problem
from .document import EditRefused, JobDocument
from .payload import invalid_payload, results_payload

MAX_GRID_CELLS = 500_000  # an edited schedule held in memory (cells)
_BARE_TOML = re.compile(r"[A-Za-z0-9][A-Za-z0-9 _.-]{0,120}\.toml")


class ActionRefused(ValueError):
    """A request the session refuses: HTTP status and message (and extra JSON)."""

    def __init__(self, status: int, message: str, **extra) -> None:
        super().__init__(message)
        self.status = status
        self.message = message
        self.extra = extra


def inside(folder: Path, name: str) -> Path:
    """``folder / name`` for a bare file name that stays in ``folder`` (links followed);
    raises ActionRefused otherwise."""
    if not name or "/" in name or "\\" in name or "\x00" in name or name in (".", ".."):
        raise ActionRefused(400, f"{name!r}: expected a bare file name in the job's folder")
    target = folder / name
    try:
        if target.resolve().parent != folder.resolve():
            raise ActionRefused(400, f"{name!r} leads outside the job's folder")
    except (OSError, RuntimeError):
        raise ActionRefused(400, f"{name!r} cannot be opened") from None
    return target


class Session:
    """One job edited in the browser (one per server; requests take its lock)."""

    def __init__(self, job_path: str | Path, calc_date: str, text: str, exists: bool) -> None:
        self.lock = threading.RLock()
        self.calc_date = calc_date
        self.written: set[str] = set()  # files this session wrote (the only downloads)
        self.rev = 0
        self._open(Path(job_path), text, exists)

    def _open(self, job_path: Path, text: str, exists: bool) -> None:
        self.job_path = job_path  # as the user named it: messages read as the CLI's
        self.folder = job_path.parent
        self.exists = exists
        self.doc = JobDocument(text)
        self.saved_text = text if exists else None
        self.grids: dict[str, list[list[str]]] = {}  # panel id → edited cells
        self.grids_saved: set[str] = set()
        self.job = None  # the job as parsed from the text (kept while a schedule is bad)
        self.results = None
        self.payload = self._check()

    # ------------------------------------------------------------ checking
    @property
    def dirty(self) -> bool:
        return self.doc.text != self.saved_text or any(
            p not in self.grids_saved for p in self.grids
        )

    def _check(self) -> dict:
        """Check the text in memory (and the edited schedules) as `feedcheck check` does."""
        from ..inputs.job_file import parse_job_data, read_job_text
        from ..runner import check_job_with_schedules, read_job_schedules

        started = time.perf_counter()
        text = self.doc.text
        elements = self.doc.elements()
        self.job = self.results = None
        try:
            data = read_job_text(text, self.job_path)
            job = parse_job_data(data, text, self.job_path)
            self.job = job  # its schedules stay reachable while one of them is bad
            grids = {pid: _cells(rows) for pid, rows in self.grids.items()}
            schedules = read_job_schedules(job, grids)
            results = check_job_with_schedules(job, schedules, self.calc_date)
        except InputError as exc:
            return invalid_payload(exc, str(self.job_path), elements, self.folder, started)
        self.results = results
        return results_payload(results, elements, started, job)

    def state(self) -> dict:
        return {
            "job": {
                "name": self.job_path.name,
                "exists": self.exists,
                "dirty": self.dirty,
                "unit": self.payload.get("unit"),
                "form_edits": self.doc.sections is not None,
                "text_only_reason": self.doc.why_text_only,
            },
            "rev": self.rev,
            "text": self.doc.text,
            "elements": self.doc.elements(),
            "results": self.payload,
        }

    # ------------------------------------------------------------ edits
    def edit(self, rev, edits) -> dict:
        if rev != self.rev:
            raise ActionRefused(409, "the job changed since this page read it", rev=self.rev)
        if not isinstance(edits, list) or not all(isinstance(e, dict) for e in edits):
            raise ActionRefused(400, "edits: expected a list of edit objects")
        before = self.doc.text
        try:
            for e in edits:
                self.doc.apply(e)
        except EditRefused as exc:
            self.doc.set_text(before)  # all of a request's edits or none
            raise ActionRefused(400, str(exc)) from None
        self.rev += 1
        self.payload = self._check()
        return self.state()

    # ------------------------------------------------------------ files
    def save(self) -> dict:
        from ..io_atomic import write_text_atomic

        _same_folder(self.job_path, self.folder)
        write_text_atomic(self.job_path, self.doc.text)
        self.saved_text = self.doc.text
        self.exists = True
        return {"saved": self.job_path.name, "bytes": len(self.doc.text.encode("utf-8"))}

    def report(self) -> dict:
        """The PDF report of the job as saved (it embeds the files it was made from)."""
        from ..commands.report import job_inputs
        from ..io_atomic import check_output
        from ..render.pdf.report import write_report
        from ..runner import load_and_check

        if not self.payload["valid"]:
            raise ActionRefused(
                400, "the job has input errors", errors=self.payload["input_errors"]
            )
        if self.dirty:
            raise ActionRefused(
                409,
                "save the job (and its edited schedules) first: the report carries "
                "the files as saved",
            )
        target = inside(self.folder, f"{self.job_path.stem}_report.pdf")
        job, results = load_and_check(self.job_path, self.calc_date)
        check_output(target, job_inputs(job))
        write_report(job, results, target)
        self.written.add(target.name)
        return {"file": target.name, "url": f"api/download/{target.name}"}

    def download(self, name: str) -> Path:
        if name not in self.written:
            raise ActionRefused(404, f"{name!r} is not a file this session wrote")
        target = inside(self.folder, name)
        if not target.is_file():
            raise ActionRefused(404, f"{name!r} is gone")
        return target

    def new(self, name) -> dict:
        from ..io_atomic import write_text_atomic
        from ..template import TEMPLATE

        if not isinstance(name, str) or not _BARE_TOML.fullmatch(name):
            raise ActionRefused(400, f"{name!r}: expected a bare file name ending in .toml")
        target = inside(self.folder, name)
        if target.exists() or target.is_symlink():
            raise ActionRefused(409, f"{name} exists: choose another name")
        write_text_atomic(target, TEMPLATE)
        self.rev += 1
        self._open(target, TEMPLATE, True)
        return self.state()

    # ------------------------------------------------------------ schedules
    def _schedule_path(self, panel) -> tuple[str, Path]:
        if self.job is None:
            raise ActionRefused(
                409, "the job file has input errors: its panels (and schedules) are not read"
            )
        for p in self.job.panels:
            if p.id == panel and p.schedule is not None:
                path = Path(p.schedule)
                _same_folder(path, self.folder, nested=True)
                return p.id, path
        raise ActionRefused(404, f"panel {panel!r} has no schedule")

    def schedule(self, panel) -> dict:
        from ..inputs.schedule_file import read_schedule_cells

        pid, path = self._schedule_path(panel)
        if pid in self.grids:
            cells = self.grids[pid]
        else:
            cells = [[str(c) for c in row] for row in read_schedule_cells(path).tolist()]
        status, messages = _row_status(self.results, pid, len(cells) - 1)
        if self.results is None:  # the job is not checked: mark the rows an error names
            for err in self.payload.get("input_errors", []):
                i = (err.get("row") or 0) - 2
                same = err.get("kind") == "panel" and self._panel_at(err.get("index")) == pid
                if same and 0 <= i < len(status):
                    status[i] = "fail"
                    messages[i] = "; ".join(m for m in (messages[i], err["message"]) if m)
        return {
            "panel": pid,
            "file": path.name,
            "columns": cells[0] if cells else [],
            "rows": cells[1:],
            "status": status,
            "messages": messages,
            "edited": pid in self.grids and pid not in self.grids_saved,
        }

    def edit_schedule(self, panel, columns, rows) -> dict:
        pid, _ = self._schedule_path(panel)
        grid = _grid(columns, rows)
        self.grids[pid] = grid
        self.grids_saved.discard(pid)
        self.rev += 1
        self.payload = self._check()
        state = self.state()
        if self.job is not None:  # a bad cell stays in the grid, to be fixed there
            state["schedule"] = self.schedule(pid)
        return state

    def _panel_at(self, index) -> str | None:
        panels = self.job.panels if self.job is not None else []
        return panels[index].id if isinstance(index, int) and 0 <= index < len(panels) else None

    def save_schedule(self, panel) -> dict:
        pid, path = self._schedule_path(panel)
        if pid not in self.grids:
            raise ActionRefused(409, f"the schedule of {pid} has no edits to save")
        if path.suffix.lower() == ".xlsx":
            _write_xlsx(path, self.grids[pid])
        else:
            from ..io_atomic import write_text_atomic

            buf = io.StringIO()
            csv.writer(buf, lineterminator="\n").writerows(self.grids[pid])
            write_text_atomic(path, buf.getvalue())
        self.grids_saved.add(pid)
        return {"saved": path.name}


def _same_folder(path: Path, folder: Path, nested: bool = False) -> None:
    real, base = path.resolve(), folder.resolve()
    if not (real.is_relative_to(base) if nested else real.parent == base):
        raise ActionRefused(400, f"{path.name} is outside the job's folder: not written")


def _grid(columns, rows) -> list[list[str]]:
    """The page's grid as cells (texts), header first; refused when not a table of texts."""
    if not isinstance(columns, list) or not isinstance(rows, list):
        raise ActionRefused(400, "columns and rows: expected lists")
    table = [columns, *rows]
    if not all(isinstance(r, list) for r in table):
        raise ActionRefused(400, "rows: expected a list of rows, each a list of cell texts")
    if sum(len(r) for r in table) > MAX_GRID_CELLS:
        raise ActionRefused(413, f"a schedule of at most {MAX_GRID_CELLS:,} cells")
    cells = []
    for r in table:
        if not all(isinstance(c, (str, int, float)) and not isinstance(c, bool) for c in r):
            raise ActionRefused(400, "cells: expected texts or numbers")
        cells.append([str(c) for c in r])
    return cells


def _cells(rows: list[list[str]]):
    """The grid as the schedule reader's array of cells (rows padded to one width)."""
    import numpy as np

    width = max((len(r) for r in rows), default=0) or 1
    out = np.empty((max(len(rows), 1), width), dtype=object)
    out[:] = ""
    for i, r in enumerate(rows):
        out[i, : len(r)] = r
    return out


def _row_status(results, pid: str, n_rows: int) -> tuple[list[str], list[str]]:
    """Per grid row (below the first): the worst circuit status and its reasons."""
    status, messages = [""] * n_rows, [""] * n_rows
    sr = None if results is None else results.schedules.get(pid)
    if sr is None:
        return status, messages
    order = {"fail": 0, "warn": 1, "ok": 2, "info": 3, "": 4}
    c = sr.circuits
    for row, st, reason in zip(c["row"], c["status"], c["reason"], strict=True):
        i = int(row) - 2  # the spreadsheet's row number; row 1 is the grid's first
        if 0 <= i < n_rows:
            if order.get(str(st), 4) < order.get(status[i], 4):
                status[i] = str(st)
            if reason and str(reason) not in messages[i]:
                messages[i] = f"{messages[i]}; {reason}" if messages[i] else str(reason)
    return status, messages


def _write_xlsx(path: Path, grid: list[list[str]]) -> None:
    """The first sheet's values replaced by the grid (other sheets and styles kept);
    a cell's text is stored as text (never a formula), a number as a number."""
    import openpyxl

    from ..io_atomic import atomic_path

    try:
        wb = openpyxl.load_workbook(path)
    except Exception as exc:  # a damaged workbook: say so, write nothing
        raise InputError(
            [Problem(str(path), "", type(exc).__name__, "a workbook that opens")]
        ) from None
    ws = wb.worksheets[0]
    for row in ws.iter_rows():
        for cell in row:
            if cell.value is not None:
                cell.value = None
    for i, r in enumerate(grid, start=1):
        for j, text in enumerate(r, start=1):
            if text == "":
                continue
            cell = ws.cell(row=i, column=j)
            if re.fullmatch(r"-?\d{1,15}", text):
                cell.value = int(text)
            elif re.fullmatch(r"-?(\d{1,15}\.\d{0,15}|\.\d{1,15})", text):
                cell.value = float(text)
            else:
                cell.value = text
                cell.data_type = "s"  # "=..." stays text: nothing typed is ever a formula
    with atomic_path(path) as tmp:
        wb.save(tmp)
