"""Rows of a panel schedule that are not circuits, and the two-column panel form.

* **Two-column form**: a panel is often scheduled as it is built, odd circuits on the
  left half of a row and even ones on the right (the right half's columns in the same
  or mirrored order). The halves are unfolded into one circuit per row, left first;
  each keeps its spreadsheet row number.
* **Spares and spaces**: a row whose load is blank or 0 and which says ``spare`` or
  ``space`` (or has neither conductor nor length) is not a circuit. With a breaker it is
  a *spare*, without one a *space* (NFPA 70-2023 408.4(A): the directory names spare
  positions and spaces; from memory). Both count toward the panel's spaces, never its
  load (NFPA 70-2023 Art. 220 sums the loads served; a spare serves none).
* **Totals rows**: a row with a cell starting ``total``, ``subtotal``, ``grand total``,
  ``phase total`` … is skipped with a notice; a (grand) total's load is compared with
  the sum of the circuits' loads.
"""

from __future__ import annotations

import re

import numpy as np

from ..errors import ProblemList
from .schedule_header import _LOOKUP, _split_unit_word, normalise_header

TOTAL_RE = re.compile(
    r"^\s*(grand\s+|sub\s*-?\s*|phase\s+\w?\s*|panel\s+|connected\s+)?totals?\b", re.I
)
_SPARE_RE = re.compile(r"^\s*(spare|space)s?\b", re.I)
_NO_LOAD = {"", "0", "0.0", "-", "--", "—", "n/a", "na"}
_NO_DEVICE = {"", "0", "-", "--", "—", "n/a", "na", "space", "spc"}
CIRCUIT, SPARE, SPACE, TOTAL = 0, 1, 2, 3
# a stated total may be rounded: it differs when off by more than this share or 1 unit
TOTAL_TOLERANCE = 0.005  # common practice, no source


def _key(text: object) -> str | None:
    name, unit = normalise_header(text)
    return _LOOKUP.get(_split_unit_word(name, unit)[0])


def unfold_two_column(df, layout: str, notices: list[str], problems: ProblemList):
    """The table with one circuit per row, and each body row's spreadsheet row number.

    ``layout``: ``auto`` (detect a header whose two halves name the same columns, each
    with a circuit column), ``one-row`` or ``two-column``.
    """
    header = df[0].tolist()
    n_body = len(df) - 1
    rows = np.arange(2, n_body + 2)
    if layout == "one-row":
        return df, rows
    keys = [_key(h) for h in header]
    split = None
    if sum(k == "circuit" for k in keys) == 2:
        for cut in range(1, len(keys)):  # halves in the same or the mirrored order
            left = [i for i in range(cut) if keys[i] is not None]
            right = [i for i in range(cut, len(keys)) if keys[i] is not None]
            names = [keys[i] for i in left]
            if sorted(names) == sorted(keys[i] for i in right) and len(set(names)) == len(names):
                split = (left, {keys[i]: i for i in right})
                break
    if split is None:
        if layout == "two-column":
            problems.add(
                "row 1",
                ", ".join(map(str, header)),
                "a two-column panel form: two halves naming the same columns, each with a "
                "circuit column",
            )
            problems.raise_if_any()
        return df, rows
    left, right_of = split
    right = [right_of[keys[i]] for i in left]
    out = np.empty((2 * n_body + 1, len(left)), dtype=object)
    out[0] = [header[i] for i in left]
    out[1::2], out[2::2] = df[1:, left], df[1:, right]
    notices.append(
        f"two-column panel form: columns {left[0] + 1}–{left[-1] + 1} and "
        f"{min(right) + 1}–{max(right) + 1} read as one circuit per half-row"
    )
    return out, np.repeat(rows, 2)


def classify(column, found) -> np.ndarray:
    """CIRCUIT, SPARE, SPACE or TOTAL per body row; ``column(key)`` gives a column's
    cells as (codes, distinct texts)."""
    load = column("load")
    n = len(load[0])
    kind = np.full(n, CIRCUIT, dtype=np.int8)
    total = np.zeros(n, dtype=bool)
    for key in ("circuit", "description", "load", "breaker", "conductor"):
        if key in found:
            total |= _matches(column(key), TOTAL_RE)
    no_load = _in(load, _NO_LOAD)
    said = _matches(column("description"), _SPARE_RE) | _matches(column("circuit"), _SPARE_RE)
    said |= _matches(column("breaker"), _SPARE_RE) | _matches(load, _SPARE_RE)
    bare = _in(column("conductor"), _NO_LOAD) & _in(column("length"), _NO_LOAD)
    spare = no_load & (said | bare) & ~total
    kind[spare] = SPARE
    kind[spare & _in(column("breaker"), _NO_DEVICE)] = SPACE
    kind[total] = TOTAL
    return kind


def _per_text(column, test) -> np.ndarray:
    """``test`` of every cell of a column given as (codes, distinct texts), run once per
    distinct text."""
    codes, uniq = column
    return np.array([test(u) for u in uniq.tolist()] + [False], dtype=bool)[codes]


def _matches(column, rx: re.Pattern) -> np.ndarray:
    return _per_text(column, lambda u: bool(rx.match(str(u))))


def _in(column, words: set[str]) -> np.ndarray:
    return _per_text(column, lambda u: str(u).strip().lower() in words)


def set_aside(cols, rows, found, default_panel: str, notices: list[str]):
    """Split the body rows into circuits and the rest.

    Returns the circuit rows' mask, panel → (spare poles, space poles), and the totals
    rows as (row number, cell that names it, stated load text, panel text).
    """
    column = columns_of(cols, found, len(rows))

    def text(key: str) -> np.ndarray:
        codes, uniq = column(key)
        return uniq[codes]

    kind = classify(column, found)
    panel_cells = text("panel")
    panel = np.where(panel_cells == "", default_panel, panel_cells)
    spaces = panel_spaces(panel, kind, pole_counts(column))
    totals = []
    at_totals = np.flatnonzero(kind == TOTAL)
    named = {
        k: text(k)
        for k in ("circuit", "description", "load", "breaker", "conductor")
        if len(at_totals)
    }
    load = text("load")
    for i in at_totals:
        label = next((str(v[i]) for v in named.values() if TOTAL_RE.match(str(v[i]))), "total")
        totals.append((int(rows[i]), label, str(load[i]), str(panel_cells[i])))
    wired = wired_spares(cols, found, kind)
    note = spares_notice(int((kind == SPARE).sum()), int((kind == SPACE).sum()), int(wired.sum()))
    if note:
        notices.append(note)
    return (kind == CIRCUIT) | wired, spaces, totals


def columns_of(cols, found, n: int):
    """``column(key)``: a column's cells as (codes, distinct texts); all blank when the
    schedule has no such column."""
    blank = (np.zeros(n, dtype=np.intp), np.array([""], dtype=object))

    def column(key: str) -> tuple[np.ndarray, np.ndarray]:
        return cols[found[key][0]] if key in found else blank

    return column


def pole_counts(column) -> np.ndarray:
    """Each row's poles as the spaces count them (1 unless the cell says 2 or 3)."""
    codes, uniq = column("poles")
    return np.array([int(u) if u in ("1", "2", "3") else 1 for u in uniq] + [1])[codes]


def panel_spaces(panel, kind, poles) -> dict[str, tuple[int, int]]:
    """panel → (spare poles, space poles), the panels in the order met (totals rows
    aside); each panel's rows summed once."""
    ids = list(dict.fromkeys(panel[kind != TOTAL].tolist()))
    at = {pid: i for i, pid in enumerate(ids)}
    code = np.array([at.get(pid, -1) for pid in panel.tolist()] + [-1], dtype=np.intp)[:-1]
    mine = code >= 0
    sums = [
        np.bincount(code[mine], weights=(poles * (kind == k))[mine], minlength=len(ids))
        for k in (SPARE, SPACE)
    ]
    return {str(pid): (int(sums[0][i]), int(sums[1][i])) for i, pid in enumerate(ids)}


def wired_spares(cols, found, kind) -> np.ndarray:
    """Spares with their conductor and length given: each stays a circuit of no load (its
    breaker still protects that conductor and is checked); their blank loads read 0 (the
    load column of ``cols`` is changed in place)."""
    column = columns_of(cols, found, len(kind))
    wired = (kind != CIRCUIT) & (kind != TOTAL)
    wired &= ~_in(column("conductor"), _NO_LOAD) & ~_in(column("length"), _NO_LOAD)
    wired &= ~_in(column("breaker"), _NO_DEVICE)
    if wired.any() and "load" in found:
        load_cells = column("load")
        codes, uniq = load_cells
        zero = np.flatnonzero(uniq == "0")
        if not len(zero):
            uniq = np.append(uniq, np.array(["0"], dtype=object))
            zero = [len(uniq) - 1]
        codes = codes.copy()
        codes[wired & _in(load_cells, _NO_LOAD)] = zero[0]
        cols[found["load"][0]] = (codes, uniq)
    return wired


def spares_notice(n_spare: int, n_space: int, n_wired: int) -> str:
    """The notice on a file's spare and space rows ("" when it has none)."""
    if not (n_spare or n_space):
        return ""
    return f"{n_spare} spare and {n_space} space row(s) counted as the panel's spaces" + (
        f" ({n_wired} wired spare(s) kept as circuits of no load)" if n_wired else ""
    )


def compare_totals(totals, load_value, panel, scale: float, unit: str, notices: list[str]):
    """A notice per totals row; a (grand) total's stated load against the circuits' sum."""
    panels = list(dict.fromkeys(np.asarray(panel).tolist()))
    for row, label, stated, pan in totals:
        m = TOTAL_RE.match(label)
        word = (m.group(1) or "").strip().lower() if m else ""
        head = f"row {row} ('{label}') skipped as a totals row"
        if word.startswith(("sub", "phase")):
            notices.append(head)
            continue
        pid = pan or (panels[0] if len(panels) == 1 else "")
        mine = np.asarray(panel) == pid if pid else np.ones(len(load_value), dtype=bool)
        computed = float(np.nansum(np.asarray(load_value)[mine])) / scale
        try:
            value = float(stated.replace(",", "").replace(" ", ""))
        except ValueError:
            notices.append(f"{head}; its load {stated!r} was not read as a number")
            continue
        if not np.isfinite(value):
            notices.append(f"{head}; its load {stated!r} was not read as a number")
        elif abs(value - computed) > max(TOTAL_TOLERANCE * abs(computed), 1.0):
            notices.append(
                f"warning: {head}; it states {value:,.6g} {unit} but the circuits sum to "
                f"{computed:,.6g} {unit}"
                + (f" (panel {pid})" if pid else "")
                + ": a circuit may be missing or mistyped"
            )
        else:
            notices.append(f"{head}; it agrees with the circuits' sum ({computed:,.6g} {unit})")
