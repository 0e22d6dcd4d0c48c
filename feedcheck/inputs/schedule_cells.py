"""Column parsers of a panel schedule: every bad cell collected (vectorised: each
distinct cell text is parsed once and the result spread over the rows that hold it)."""

from __future__ import annotations

import re

import numpy as np

from ..errors import ProblemList

MAX_PROBLEMS = 100  # bad cells listed one by one; the rest are counted
# control characters (tab, LF and CR are cell separators, never inside a number)
CONTROL_RE = r"[\x00-\x1f\x7f]"
SMALL_COLUMN = 2000  # up to this many cells: factorised without pandas
_CONTROL = re.compile(CONTROL_RE)
_SEPARATORS = re.compile(r"[,_\s]")
_SQUEEZE = re.compile(r"[\s°]|deg")
# a plain decimal of at most 15 digits: Python's float gives what pandas.to_numeric does
_PLAIN = re.compile(r"[+-]?(?=\.?\d)\d*\.?\d*")
_TRUE = {"yes", "y", "true", "t", "1", "x", "c", "cont", "continuous"}
_FALSE = {"no", "n", "false", "f", "0", "", "-", "nc"}


def factorised(raw: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Column cells as (codes, distinct stripped texts): ``texts[codes]`` is the column.

    Every parse and test below runs once per distinct text, not once per cell.
    A short column of texts is numbered in plain Python (pandas' fixed cost per call
    outweighs the work there); the result is the same.
    """
    if len(raw) <= SMALL_COLUMN:
        cells = raw.tolist()
        if all(type(t) is str for t in cells):
            seen: dict[str, int] = {}
            codes = np.array([seen.setdefault(t.strip(), len(seen)) for t in cells], np.intp)
            return codes, np.array([*seen, None], dtype=object)[:-1]
    import pandas as pd

    codes, uniq = pd.factorize(raw)
    if len(codes) and codes.min() < 0:  # a missing cell (short CSV row): text as pandas does
        codes, uniq = pd.factorize(pd.Series(raw, dtype=object).astype(str).to_numpy(object))
    texts = pd.Series(uniq, dtype=object).astype(str).to_numpy(object)
    stripped = np.array([t.strip() for t in texts] + [None], dtype=object)[:-1]
    s_codes, s_uniq = pd.factorize(stripped)
    return s_codes[codes], np.asarray(s_uniq, dtype=object)


class Cells:
    """Column parsers that collect problems for every bad cell (vectorised: each distinct
    cell text is parsed once and the result spread over the rows that hold it)."""

    def __init__(
        self,
        cols: dict[int, tuple[np.ndarray, np.ndarray]],
        n: int,
        found,
        rows: np.ndarray,
        problems: ProblemList,
    ):
        self.cols = cols  # column position -> (codes, distinct stripped texts)
        self.n = n
        self.found = found
        self.rows = rows
        self.problems = problems
        self.count = 0
        self.assumed_copper = np.zeros(n, dtype=bool)  # set by the conductor columns
        # None: a column holding a "-" is read all through pandas (as one file's column
        # is); False: each text read alone (alike files read together, where a file with
        # a "-" in a number column is read on its own instead)
        self.signed: bool | None = None

    def col(self, key: str) -> tuple[np.ndarray, np.ndarray]:
        return self.cols[self.found[key][0]]

    def text(self, key: str, default: str = "") -> np.ndarray:
        if key not in self.found:
            return np.full(self.n, default, dtype=object)
        codes, uniq = self.col(key)
        return uniq[codes]  # cells are stripped text

    def bad(self, key: str, mask, values, expected: str) -> None:
        """``values``: the column's cells, or its (codes, texts)."""
        idx = np.flatnonzero(np.asarray(mask))
        if not len(idx):
            return
        _pos, header, _unit = self.found[key]
        shown = idx[: max(0, MAX_PROBLEMS - self.count)]
        if isinstance(values, tuple):
            codes, uniq = values
            vals = uniq[codes[shown]]
        else:
            vals = np.asarray(values, dtype=object)[shown]
        for i, v in zip(shown, vals, strict=True):
            self.problems.add(f"row {self.rows[i]}, column '{header}'", v, expected)
        self.count += len(idx)

    def number(
        self,
        key: str,
        expected: str,
        lo: float,
        hi: float,
        default: float | None,
        integer: bool = False,
        strip: str = "",
        pre: str = "",
    ) -> np.ndarray:
        if key not in self.found:
            return np.full(self.n, np.nan if default is None else default)
        codes, uniq = self.col(key)
        texts = uniq.tolist()
        # a control character (a NUL byte …) is never part of a number: refused, not dropped
        control = np.array([_CONTROL.search(t) is not None for t in texts], dtype=bool)
        if pre:  # removed before spaces are: a part of the cell with its own number
            rx = re.compile(pre, re.I)
            texts = [rx.sub("", t) for t in texts]
        clean = [_SEPARATORS.sub("", t) for t in texts]
        if strip:
            rx = re.compile(strip, re.I)
            clean = [rx.sub("", t) for t in clean]
        v = _to_numbers(clean, self.signed)
        empty = uniq == ""
        if default is not None:
            v[empty] = default
        v[control] = np.nan
        ok = np.isfinite(v) & (v >= lo) & (v <= hi)
        if integer:
            ok &= v == np.floor(v)
        self.bad(key, (~ok & (~empty | (default is None)))[codes], (codes, uniq), expected)
        v[~ok] = np.nan  # a bad cell is never computed with (poles -1 or 1e9 …)
        return v[codes]

    def choice(
        self, key: str, mapping: dict[str, object], expected: str, default, squeeze: bool = False
    ) -> np.ndarray:
        if key not in self.found:
            return np.full(self.n, default, dtype=object)
        codes, uniq = self.col(key)
        low = [t.lower() for t in uniq.tolist()]
        if squeeze:
            low = [_SQUEEZE.sub("", t) for t in low]
        low = np.array([*low, None], dtype=object)[:-1]
        mapped = np.array([mapping.get(u) if u else default for u in low] + [None], dtype=object)[
            :-1
        ]
        missing = np.array([m is None or m != m for m in mapped.tolist()], dtype=bool)
        self.bad(key, (missing & (low != ""))[codes], (codes, uniq), expected)
        return mapped[codes]

    def conductor(self, key: str, required: bool) -> dict[str, np.ndarray]:
        """Conductor cells read as the trade writes them
        (:func:`~feedcheck.inputs.schedule_conductor.parse_conductor_cell`): ``size``,
        ``material``, ``insulation_c`` (NaN: not in the cell), ``ground_size``,
        ``ground_material`` and ``assumed`` (no material written: copper)."""
        from .schedule_conductor import parse_conductor_cell

        names = ("size", "material", "insulation_c", "ground_size", "ground_material", "assumed")
        if key not in self.found:
            out = {k: np.full(self.n, "", dtype=object) for k in names}
            out["insulation_c"] = np.full(self.n, np.nan)
            out["assumed"] = np.zeros(self.n, dtype=bool)
            return out
        codes, uniq = self.col(key)
        parsed = [parse_conductor_cell(u) if u else ("", "", None, "", "", "", False) for u in uniq]
        problem = np.array([p[5] for p in parsed] + [None], dtype=object)[:-1]
        if required:
            problem[uniq == ""] = "a conductor size and material"
        for why in dict.fromkeys(x for x in problem.tolist() if x):
            self.bad(
                key,
                (problem == why)[codes],
                (codes, uniq),
                "a conductor such as '12 AWG Cu', '500 MCM CU THHN' or '3#12, 1#12G'; "
                f"could not read {why}",
            )
        cols = list(zip(*parsed, strict=True)) if parsed else [[]] * 7
        out = {}
        for j, k in enumerate(names[:5]):
            vals = [np.nan if v is None else v for v in cols[j]] if k == "insulation_c" else cols[j]
            arr = np.array([*vals, None], dtype=object)[:-1]
            out[k] = arr[codes]
        out["insulation_c"] = out["insulation_c"].astype(float)
        out["assumed"] = (
            np.array([*cols[6], False], dtype=bool)[:-1][codes] & (problem == "")[codes]
        )
        return out


def _to_numbers(texts: list[str], signed: bool | None = None) -> np.ndarray:
    """Texts as numbers (NaN where not a number), as ``pandas.to_numeric`` reads them;
    plain short decimals without pandas (the common case: its fixed cost dominates).
    ``signed`` None: whether any text holds a "-" (pandas' "-0" is 0.0 or -0.0 by the
    column, so such a column is read all through pandas)."""
    out = np.full(len(texts), np.nan)
    rest = []
    if signed is None:
        signed = any("-" in t for t in texts)
    for i, t in enumerate(texts):
        if not signed and _PLAIN.fullmatch(t) and sum(ch.isdigit() for ch in t) <= 15:
            out[i] = float(t)
        elif t:
            rest.append(i)
    if rest:
        import pandas as pd

        out[rest] = pd.to_numeric(
            pd.Series([texts[i] for i in rest], dtype=object), errors="coerce"
        ).to_numpy(float)
    return out


def truthy() -> dict[str, object]:
    return {**{k: True for k in _TRUE}, **{k: False for k in _FALSE}}
