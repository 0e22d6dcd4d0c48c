"""Many schedule files read together: alike files in one pass, not one pass each.

A building's schedules are often hundreds of small files under the same header. Read one
by one, each pays the reader's fixed costs (header matching, factorising every column,
the column parsers, one frame) for some thirty rows. :class:`ScheduleReader` reads each
file's cells as :func:`~.schedule_file.read_schedule` reads them, through the same guard
(size limit, regular file, UTF-8, no NUL byte): a plain CSV file (no quotes, LF or CR LF
line ends, every line as many cells as the header) is only split into lines, any other
goes through the CSV parser or the workbook reader. The files whose header row holds the
same cells (and that have the same column map and layout) are then read as one table:
one factorising of each column, each distinct cell text parsed once, one frame, split
back into one :class:`~feedcheck.model.Schedule` per file with the file's own row
numbers, panel id, spares, totals, notices and system.

A file is read on its own by :func:`~.schedule_file.read_schedule` (so that every message
is the one it gives) whenever the joined reading could differ from it: a file the guard
or the reader refuses, an edited grid, a file alone under its header, a header with a
problem or in the two-column form, and any file with a problem of its own (a bad cell, a
circuit number taken twice, a repeated header row, no circuit row, several systems) or a
zero written with a "-" in a number column (read there as the file's whole column is).
``tests/inputs/test_schedule_alike.py`` holds the two ways against each other, good and
bad files mixed, plain, CR LF, quoted and XLSX.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np

from ..errors import InputError, ProblemList
from ..model import Schedule
from ..units import SCHEDULE_HEADER_UNITS
from . import schedule_file
from .files import FileRefused, decode_utf8, read_bytes
from .schedule_cells import Cells, factorised
from .schedule_columns import electrical_columns, installation_columns
from .schedule_file import (
    PLAIN_CHARS,
    read_schedule,
    read_schedule_cells,
    schedule_kind,
    value_notices,
)
from .schedule_header import match_header
from .schedule_rows import (
    CIRCUIT,
    SPACE,
    SPARE,
    TOTAL,
    TOTAL_RE,
    classify,
    columns_of,
    compare_totals,
    pole_counts,
    spares_notice,
    unfold_two_column,
    wired_spares,
)


@dataclass
class _Entry:
    path: Path
    panel_id: str | None
    columns: dict | None
    layout: str
    cells: np.ndarray | None  # the cells read (or an edited grid given); None: not read
    lines: list[str] | None  # the lines of a plain CSV file (not in ``cells``)
    crlf: bool = False  # its lines ended with CR LF (read alone: read again from the file)
    given: bool = False  # ``cells`` is an edited grid (read alone)

    def header(self) -> tuple | None:
        """The header row's cells, the key of the file's group (None: read alone)."""
        if self.lines is not None:
            return tuple(self.lines[0].split(","))
        if self.cells is None or self.given or self.cells.shape[1] > schedule_file.MAX_COLUMNS:
            return None
        head = tuple(self.cells[0].tolist())
        return head if all(type(x) is str for x in head) else None

    def body(self) -> np.ndarray:
        """The cells below the header (of read cells: pandas or a workbook's)."""
        return self.cells[1:]

    def alone(self) -> Schedule | InputError:
        """The file read by read_schedule on its own (its cells not read again, unless
        its lines ended with CR LF, which the CSV parser reads)."""
        cells = self.cells
        if self.lines is not None:
            cells = None
            if not self.crlf:
                cells = np.empty((len(self.lines), self.lines[0].count(",") + 1), dtype=object)
                cells[:] = [line.split(",") for line in self.lines]  # as plain_csv splits
        try:
            return read_schedule(self.path, self.panel_id, self.columns, self.layout, cells)
        except InputError as exc:
            return exc


class ScheduleReader:
    """Schedules added one by one (:meth:`add`: the file guarded and its cells read),
    read together (:meth:`read`: each one's Schedule or InputError, in the order added)."""

    def __init__(self) -> None:
        self.entries: list[_Entry] = []

    def add(
        self,
        path: str | Path,
        panel_id: str | None = None,
        columns: dict[str, str] | None = None,
        layout: str = "auto",
        cells: np.ndarray | None = None,
    ) -> None:
        """A schedule as :func:`~.schedule_file.read_schedule` takes it (``cells``: an
        edited grid, read on its own): a plain CSV file split into lines, any other
        read into cells as read_schedule reads it (a file refused: read alone later)."""
        p = Path(path)
        if cells is not None:
            self.entries.append(_Entry(p, panel_id, columns, layout, cells, None, given=True))
            return
        lines, crlf = _plain_lines(p)
        read = None
        if lines is None:
            try:
                read = read_schedule_cells(p)
            except InputError:
                read = None  # read again alone, for its message
        self.entries.append(_Entry(p, panel_id, columns, layout, read, lines, crlf))

    def read(self) -> list[Schedule | InputError]:
        out: list = [None] * len(self.entries)
        groups: dict[tuple, list[int]] = {}
        for i, e in enumerate(self.entries):
            head = e.header()
            if head is None:
                out[i] = e.alone()
                continue
            key = (head, tuple(sorted((e.columns or {}).items())), e.layout)
            groups.setdefault(key, []).append(i)
        for members in groups.values():
            if len(members) == 1:
                out[members[0]] = self.entries[members[0]].alone()
                continue
            for i, got in zip(
                members, _read_alike([self.entries[i] for i in members]), strict=True
            ):
                out[i] = got
        return out


def read_schedule_files(paths, panel_ids=None, columns=None, layout="auto") -> list:
    """Each file's Schedule or InputError, as :func:`~.schedule_file.read_schedule` gives
    it, the alike files read together."""
    reader = ScheduleReader()
    for i, path in enumerate(paths):
        reader.add(path, panel_ids[i] if panel_ids else None, columns, layout)
    return reader.read()


def _plain_lines(p: Path) -> tuple[list[str] | None, bool]:
    """The lines of a plain CSV file the guard accepts, each of as many cells as the
    header (a file :func:`~.schedule_file.plain_csv` splits without the CSV parser, or
    one that differs from such a file only by CR LF line ends, which the parser reads as
    the same cells), and whether they ended with CR LF; None for anything else (read on
    its own, with its own message)."""
    if p.suffix.lower() != ".csv":
        return None, False
    try:
        raw = read_bytes(p, schedule_kind())
        text = decode_utf8(raw, "") if raw else ""
    except FileRefused:
        return None, False
    crlf = "\r" in text
    if crlf and text.count("\r") == text.count("\r\n"):
        text = text.replace("\r\n", "\n")
    if (
        not text.strip()
        or len(text) > PLAIN_CHARS
        or '"' in text
        or "\r" in text
        or "\x00" in text
        or text.count("\n") > schedule_file.MAX_ROWS
    ):
        return None, False
    lines = text[:-1].split("\n") if text.endswith("\n") else text.split("\n")
    commas = lines[0].count(",")
    if commas >= schedule_file.MAX_COLUMNS or "" in lines:
        return None, False
    if any(line.count(",") != commas for line in lines):
        return None, False
    return lines, crlf


class _Marks(Cells):
    """The column parsers marking the rows of bad cells (their files are read again on
    their own, for the messages); each text read as a file without a "-" reads it."""

    def __init__(self, cols, n: int, found, rows) -> None:
        super().__init__(cols, n, found, rows, ProblemList())
        self.signed = False
        self.marked = np.zeros(n, dtype=bool)

    def bad(self, key: str, mask, values, expected: str) -> None:
        self.marked |= np.asarray(mask, dtype=bool)

    def number(self, key: str, *args, **kwargs) -> np.ndarray:
        """As Cells.number, each text read alone; a zero written with a "-" marked (a
        file's column holding a "-" is read all through pandas, where "-0" reads 0.0 or
        -0.0 by the column's other cells: that file is read alone)."""
        v = super().number(key, *args, **kwargs)
        if key in self.found:
            codes, uniq = self.col(key)
            dash = np.array(["-" in u for u in uniq.tolist()] + [False], dtype=bool)[:-1]
            self.marked |= dash[codes] & (v == 0)
        return v


@dataclass
class _Body:
    """The group's rows: columns as (codes, texts), each row's file and row number."""

    cols: dict
    file_of: np.ndarray
    row_no: np.ndarray
    n_files: int

    def per_file(self, mask) -> np.ndarray:
        """Whether each file has a row in ``mask``."""
        return np.bincount(self.file_of[mask], minlength=self.n_files) > 0

    def counts(self, mask=None) -> np.ndarray:
        f = self.file_of if mask is None else self.file_of[mask]
        return np.bincount(f, minlength=self.n_files)

    def only(self, keep) -> _Body:
        sel = np.flatnonzero(keep)
        cols = {pos: (codes[sel], uniq) for pos, (codes, uniq) in self.cols.items()}
        return _Body(cols, self.file_of[sel], self.row_no[sel], self.n_files)


def _read_alike(entries: list[_Entry]) -> list[Schedule | InputError]:
    """Files of one header read as one table, split back per file."""
    head = entries[0].header()
    header = np.empty((1, len(head)), dtype=object)
    header[0] = head
    try:
        unfolded, _ = unfold_two_column(header, entries[0].layout, notes := [], ProblemList())
    except InputError:
        unfolded = None
    if unfolded is not header or notes:
        return [e.alone() for e in entries]
    sizes = np.array(
        [len(e.lines if e.lines is not None else e.cells) - 1 for e in entries], dtype=np.int64
    )
    file_of = np.repeat(np.arange(len(entries)), sizes)
    starts = np.concatenate([[0], np.cumsum(sizes)[:-1]])
    cells = _body_cells(entries, header.shape[1])
    row_no = np.arange(len(cells), dtype=np.int64) - starts[file_of] + 2
    cols = {pos: factorised(cells[:, pos]) for pos in range(cells.shape[1])}
    body = _Body(cols, file_of, row_no, len(entries))
    head = [str(x) for x in header[0].tolist()]
    found, notes_of = _header(head, body, entries[0].columns)
    if found is None:
        return [e.alone() for e in entries]
    body, bad = _circuit_rows(body, head, found)
    defaults = np.array([e.panel_id or e.path.stem for e in entries] + [None], dtype=object)[:-1]
    body, per_file, more_bad = _set_aside(body, found, defaults)
    bad |= more_bad
    c = _Marks(body.cols, len(body.row_no), found, body.row_no)
    values, systems, more_bad = _values(c, body, found, defaults)
    bad |= more_bad | body.per_file(c.marked)
    good = ~bad[body.file_of]
    frame = _frame(values, c, body.row_no, good)
    ends = np.cumsum(body.counts(good))
    rows, assumed = body.row_no[good], c.assumed_copper[good]
    panel, load = np.asarray(values["panel"])[good], values["load_value"][good]
    unit = found["load"][2] or "va"
    scale = SCHEDULE_HEADER_UNITS["load"].get(unit, ("VA", 1.0))[1]
    spaces, spare_notes, totals = per_file
    out: list = []
    for f, e in enumerate(entries):
        if bad[f]:
            out.append(e.alone())
            continue
        a, b = int(ends[f - 1]) if f else 0, int(ends[f])
        part = frame.iloc[a:b]
        part.index = _range(b - a)
        notices = [*notes_of(f), *spare_notes[f]]
        value_notices(found, rows[a:b], assumed[a:b], notices)
        compare_totals(totals[f], load[a:b], panel[a:b], scale, unit.upper(), notices)
        panels = tuple(dict.fromkeys(panel[a:b].tolist()))
        sched = Schedule(
            e.path,
            part,
            values["load_unit"],
            panels,
            tuple(notices),
            spaces[f],
            "ft" if found["length"][2] in ("", "ft", "feet", "foot") else "m",
            systems[f],
        )
        out.append(sched)
        mark_cut(sched, frame, a, b)
    return out


CUT = "_cut_from"  # a Schedule's attribute (not a field): the frame its rows were cut from


def mark_cut(schedule: Schedule, frame, a: int, b: int) -> None:
    """Note on ``schedule`` that its circuits are rows ``a:b`` of ``frame`` (with the
    blocks they hold now): a check of several such schedules takes the rows of the one
    frame instead of joining the pieces again (checks/schedule_batch.py)."""
    blocks = tuple(schedule.circuits._mgr.blocks)
    object.__setattr__(schedule, CUT, (frame, a, b, blocks))  # frozen: not a field


def cut_from(schedules: list) -> tuple | None:
    """``(frame, a, b)`` when the circuits of ``schedules`` are, in order, consecutive
    rows ``a:b`` of one frame (:func:`mark_cut`) and each still holds the blocks it was
    cut with (a column set or replaced since: None, the pieces are joined)."""
    first = getattr(schedules[0], CUT, None)
    if first is None:
        return None
    frame, start, end = first[0], first[1], first[1]
    for s in schedules:
        got = getattr(s, CUT, None)
        if got is None or got[0] is not frame or got[1] != end:
            return None
        now = s.circuits._mgr.blocks
        if len(now) != len(got[3]) or any(x is not y for x, y in zip(now, got[3], strict=True)):
            return None
        end = got[2]
    return frame, start, end


def _body_cells(entries: list[_Entry], width: int) -> np.ndarray:
    """The cells below the header of every file, in order: the lines of plain files
    next to each other split at once (each has the header's cells), read cells as read."""
    pieces, run = [], []

    def flush() -> None:
        if run:
            flat = ",".join(run).split(",")
            pieces.append(np.array([*flat, None], dtype=object)[:-1].reshape(-1, width))
            run.clear()

    for e in entries:
        if e.lines is not None:
            run.extend(e.lines[1:])
        else:
            flush()
            pieces.append(e.body())
    flush()
    return np.concatenate(pieces) if pieces else np.empty((0, width), dtype=object)


def _range(n: int):
    import pandas as pd

    return pd.RangeIndex(n)


def _header(head: list[str], body: _Body, columns):
    """The header matched once for the group (None: a problem, each file read alone),
    and each file's notices on its columns (those not understood are named only by the
    files holding a value under them)."""
    problems = ProblemList()
    with_values: list[str] = []
    found = match_header([head], lambda pos: True, problems, with_values, columns)
    if problems:
        return None, None
    without: list[str] = []
    match_header([head], lambda pos: False, ProblemList(), without, columns)
    if with_values == without:
        return found, lambda f: without
    filled = np.stack(
        [body.per_file((uniq != "")[codes]) for codes, uniq in body.cols.values()], axis=1
    )
    seen: dict[bytes, list[str]] = {}

    def notes_of(f: int) -> list[str]:
        key = filled[f].tobytes()
        if key not in seen:
            seen[key] = []
            has = filled[f]
            match_header([head], lambda pos: bool(has[pos]), ProblemList(), seen[key], columns)
        return seen[key]

    return found, notes_of


def _circuit_rows(body: _Body, head: list[str], found):
    """Blank rows dropped; files with a repeated header row or without a row marked."""
    blank = np.ones(len(body.row_no), dtype=bool)
    for codes, uniq in body.cols.values():
        blank &= (uniq == "")[codes]
    pos = found["circuit"][0]
    head_txt = head[pos].strip().lower()
    codes, uniq = body.cols[pos]
    rep = np.array([u.lower() == head_txt for u in uniq.tolist()] + [False], dtype=bool)[:-1]
    rep = rep[codes] & ~blank
    repeated = body.per_file(rep)
    body = body.only(~blank & ~rep)
    n = body.counts()
    return body, repeated | (n == 0) | (n > schedule_file.MAX_ROWS)


def _set_aside(body: _Body, found, defaults):
    """Spares, spaces and totals rows as :func:`~.schedule_rows.set_aside` sets them
    aside, per file: the circuit rows left, each file's spaces, notice and totals rows."""
    column = columns_of(body.cols, found, len(body.row_no))
    kind = classify(column, found)
    totals = _totals(body, column, kind)
    codes, uniq = column("panel")
    panel_cells = uniq[codes]
    panel = np.where(panel_cells == "", defaults[body.file_of], panel_cells)
    poles = pole_counts(column)
    wired = wired_spares(body.cols, found, kind)
    n_spare, n_space = body.counts(kind == SPARE), body.counts(kind == SPACE)
    spare_poles = np.bincount(body.file_of, poles * (kind == SPARE), body.n_files)
    space_poles = np.bincount(body.file_of, poles * (kind == SPACE), body.n_files)
    n_wired = body.counts(wired)
    spaces, notes = [], []
    if "panel" in found:
        spaces = _panel_spaces_each(panel, kind, poles, body.file_of, body.n_files)
    for f in range(body.n_files):
        if "panel" not in found:
            spaces.append({defaults[f]: (int(spare_poles[f]), int(space_poles[f]))})
        note = spares_notice(int(n_spare[f]), int(n_space[f]), int(n_wired[f]))
        notes.append([note] if note else [])
    body = body.only((kind == CIRCUIT) | wired)
    return body, (spaces, notes, totals), body.counts() == 0


def _panel_spaces_each(panel, kind, poles, file_of, n_files: int) -> list[dict]:
    """:func:`~.schedule_rows.panel_spaces` of every file at once: each file's panels in
    the order met (totals rows aside), their spare and space poles."""
    import pandas as pd

    pcode, puniq = pd.factorize(panel)
    n = max(len(puniq), 1)
    key = file_of.astype(np.int64) * n + pcode  # each file and panel its own number
    keys, first = np.unique(key[kind != TOTAL], return_index=True)
    at = np.minimum(np.searchsorted(keys, key), max(len(keys) - 1, 0))
    mine = (keys[at] == key) if len(keys) else np.zeros(len(key), dtype=bool)
    sums = [
        np.bincount(at[mine], weights=(poles * (kind == k))[mine], minlength=len(keys)).tolist()
        for k in (SPARE, SPACE)
    ]
    out: list[dict] = [{} for _ in range(n_files)]
    for j in np.argsort(first, kind="stable").tolist():  # the order met
        f, p = divmod(int(keys[j]), n)
        out[f][str(puniq[p])] = (int(sums[0][j]), int(sums[1][j]))
    return out


def _totals(body: _Body, column, kind) -> list[list]:
    """Each file's totals rows as (row number, cell that names it, stated load text,
    panel text), as :func:`~.schedule_rows.set_aside` lists them."""
    out: list[list] = [[] for _ in range(body.n_files)]
    at = np.flatnonzero(kind == TOTAL)
    if not len(at):
        return out

    def text(key: str) -> np.ndarray:
        codes, uniq = column(key)
        return uniq[codes]

    named = [text(k) for k in ("circuit", "description", "load", "breaker", "conductor")]
    load, panel = text("load"), text("panel")
    for i in at.tolist():
        label = next((str(v[i]) for v in named if TOTAL_RE.match(str(v[i]))), "total")
        row = (int(body.row_no[i]), label, str(load[i]), str(panel[i]))
        out[int(body.file_of[i])].append(row)
    return out


def _values(c: _Marks, body: _Body, found, defaults):
    """Every column typed as :func:`~.schedule_file.read_schedule` types it, bad cells
    marked; each file's system; files with a space taken twice or several systems
    marked."""
    values = electrical_columns(c, found)
    values.update(installation_columns(c))
    if "panel" in found:
        values["panel"] = c.text("panel")
        c.bad("panel", values["panel"] == "", None, "")
    else:
        values["panel"] = defaults[body.file_of]
    amb, ins = values["ambient_c"], values["insulation_c"]
    c.bad("ambient", ~(np.isnan(amb) | np.isnan(ins) | (amb < ins)), None, "")
    bad = body.per_file(_taken_twice(values, body, found))
    systems = [""] * body.n_files
    if "system" in found:
        texts = c.text("system")
        ends = np.cumsum(body.counts())
        for f in range(body.n_files):
            a, b = int(ends[f - 1]) if f else 0, int(ends[f])
            own = [t for t in dict.fromkeys(texts[a:b].tolist()) if t]
            bad[f] |= len(own) > 1
            systems[f] = own[0] if own else ""
    return values, systems, bad


def _taken_twice(values, body: _Body, found) -> np.ndarray:
    """Rows whose circuit takes a space another row of the same file and panel took (an
    n-pole circuit at space s takes s, s+2, ...), as
    :func:`~.schedule_columns.check_spaces` finds them."""
    circuit, poles = values["circuit"], values["poles"]
    valid = np.isfinite(circuit) & np.isfinite(poles)
    out = np.zeros(len(circuit), dtype=bool)
    if not valid.any():
        return out
    pan = body.file_of.astype(np.int64)  # each file and panel its own number
    if "panel" in found:
        codes, uniq = body.cols[found["panel"][0]]
        pan = pan * len(uniq) + codes
    n_pole = np.where(valid, poles, 1).astype(np.int64)
    idx = np.repeat(np.flatnonzero(valid), n_pole[valid])
    step = np.arange(len(idx)) - np.repeat(np.cumsum(n_pole[valid]) - n_pole[valid], n_pole[valid])
    key = pan[idx] * 10_000 + circuit[idx].astype(np.int64) + 2 * step
    order = np.argsort(key, kind="stable")
    ks = key[order]
    out[idx[order[1:][ks[1:] == ks[:-1]]]] = True
    return out


def _frame(v: dict, c: Cells, rows, good):
    """The good files' circuits as one frame (the columns and types of
    :func:`~.schedule_file.read_schedule`'s frame)."""
    import pandas as pd

    def g(a):
        return np.asarray(a)[good]

    return pd.DataFrame(
        {
            "panel": g(v["panel"]),
            "circuit": g(v["circuit"]).astype(np.int64),
            "description": g(c.text("description")),
            "poles": g(v["poles"]).astype(np.int64),
            "load_value": g(v["load_value"]),
            "pf": g(v["pf"]),
            "kind": g(v["kind"]),
            "continuous": g(v["continuous"]).astype(bool),
            "breaker_a": g(v["breaker_a"]),
            "size": g(v["size"]),
            "material": g(v["material"]),
            "insulation_c": g(v["insulation_c"]),
            "termination_c": g(v["termination_c"]),
            "ground_size": g(v["ground_size"]),
            "ground_material": g(v["ground_material"]),
            "current_carrying": g(v["current_carrying"]).astype(np.int64),
            "ambient_c": g(v["ambient_c"]),
            "raceway": g(v["raceway"]),
            "length_m": g(v["length_m"]),
            "row": g(rows),
        },
        copy=True,  # one block per type: each file's slice of it is cheaper to make and read
    )
