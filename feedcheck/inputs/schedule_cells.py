"""Column parsers of a panel schedule: every bad cell collected (vectorised: each
distinct cell text is parsed once and the result spread over the rows that hold it)."""

from __future__ import annotations

import numpy as np

from ..calc.sizes import SizeError, parse_size
from ..errors import ProblemList
from ..model import MATERIAL_WORDS

MAX_PROBLEMS = 100  # bad cells listed one by one; the rest are counted
SMALL_COLUMN = 2000  # up to this many cells: factorised without pandas
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
    ) -> np.ndarray:
        import pandas as pd

        if key not in self.found:
            return np.full(self.n, np.nan if default is None else default)
        codes, uniq = self.col(key)
        s = pd.Series(uniq, dtype=object)
        clean = s.str.replace(r"[,_\s]", "", regex=True)
        if strip:
            clean = clean.str.replace(strip, "", regex=True, case=False)
        v = pd.to_numeric(clean, errors="coerce").to_numpy(float)
        empty = uniq == ""
        if default is not None:
            v[empty] = default
        ok = np.isfinite(v) & (v >= lo) & (v <= hi)
        if integer:
            ok &= v == np.floor(v)
        self.bad(key, (~ok & (~empty | (default is None)))[codes], (codes, uniq), expected)
        return v[codes]

    def choice(
        self, key: str, mapping: dict[str, object], expected: str, default, squeeze: bool = False
    ) -> np.ndarray:
        import pandas as pd

        if key not in self.found:
            return np.full(self.n, default, dtype=object)
        codes, uniq = self.col(key)
        s = pd.Series(uniq, dtype=object).str.lower()
        if squeeze:
            s = s.str.replace(r"[\s°]|deg", "", regex=True)
        low = s.to_numpy(object)
        mapped = np.array([mapping.get(u) if u else default for u in low] + [None], dtype=object)[
            :-1
        ]
        self.bad(key, (pd.isna(mapped) & (low != ""))[codes], (codes, uniq), expected)
        return mapped[codes]

    def conductor(self, key: str, required: bool) -> tuple[np.ndarray, np.ndarray]:
        if key not in self.found:
            return np.full(self.n, "", dtype=object), np.full(self.n, "", dtype=object)
        codes, uniq = self.col(key)
        sizes, mats = [], []
        for u in uniq:
            parts = u.rsplit(None, 1)
            size = mat = None
            if len(parts) == 2 and parts[1].lower() in MATERIAL_WORDS:
                mat = MATERIAL_WORDS[parts[1].lower()]
                try:
                    size = parse_size(parts[0]).name
                except SizeError:
                    size = None
            sizes.append(size)
            mats.append(mat)
        bad = np.array([sz is None for sz in sizes]) & ((uniq != "") | required)
        self.bad(
            key,
            bad[codes],
            (codes, uniq),
            "a size and material such as '12 AWG Cu', '1/0 AWG Al' or '4 mm2 Cu'",
        )
        size_u = np.array([sz if sz is not None else "" for sz in sizes] + [None], dtype=object)[
            :-1
        ]
        mat_u = np.array([m if m is not None else "" for m in mats] + [None], dtype=object)[:-1]
        return size_u[codes], mat_u[codes]


def truthy() -> dict[str, object]:
    return {**{k: True for k in _TRUE}, **{k: False for k in _FALSE}}
