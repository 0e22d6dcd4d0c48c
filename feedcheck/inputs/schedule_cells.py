"""Column parsers of a panel schedule: every bad cell collected (vectorised: each
distinct cell text is parsed once and the result spread over the rows that hold it)."""

from __future__ import annotations

import numpy as np

from ..errors import ProblemList

MAX_PROBLEMS = 100  # bad cells listed one by one; the rest are counted
# control characters (tab, LF and CR are cell separators, never inside a number)
CONTROL_RE = r"[\x00-\x1f\x7f]"
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
        self.assumed_copper = np.zeros(n, dtype=bool)  # set by the conductor columns

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
        import pandas as pd

        if key not in self.found:
            return np.full(self.n, np.nan if default is None else default)
        codes, uniq = self.col(key)
        s = pd.Series(uniq, dtype=object)
        # a control character (a NUL byte …) is never part of a number: refused, not dropped
        control = s.str.contains(CONTROL_RE, regex=True).to_numpy(bool)
        if pre:  # removed before spaces are: a part of the cell with its own number
            s = s.str.replace(pre, "", regex=True, case=False)
        clean = s.str.replace(r"[,_\s]", "", regex=True)
        if strip:
            clean = clean.str.replace(strip, "", regex=True, case=False)
        v = pd.to_numeric(clean, errors="coerce").to_numpy(float)
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


def truthy() -> dict[str, object]:
    return {**{k: True for k in _TRUE}, **{k: False for k in _FALSE}}
