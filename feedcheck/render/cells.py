"""Spreadsheet cell guards for CSV and XLSX exports.

Formula guard: a text cell starting with ``= + - @ |``, a tab or a carriage return (or
the fullwidth ``＝ ＋ － ＠``, some spreadsheet programs fold them to the ASCII ones) is
read as a formula or a command by spreadsheet programs, also behind invisible leading
characters (a byte-order mark, a zero-width space or joiner); exports prefix such cells
with a quote.

XLSX guard: characters the XLSX format cannot hold (control characters) are written as
``\\xNN`` text, and a text longer than a spreadsheet cell holds is cut with a visible
marker (:func:`xlsx_text`); the caller lists such cells.
"""

from __future__ import annotations

import re

import numpy as np

# first characters that make a spreadsheet read a cell as a formula (CSV/XLSX exports)
FORMULA_PREFIXES = ("=", "+", "-", "@", "|", "\t", "\r", "\uff1d", "\uff0b", "\uff0d", "\uff20")
# invisible characters a spreadsheet may skip before the first one
INVISIBLE_LEAD = ("\ufeff", "\u200b", "\u200c", "\u200d", "\u2060", "\u00ad")
_FORMULA_CHARS = np.array(FORMULA_PREFIXES + INVISIBLE_LEAD)
_INVISIBLE = "".join(INVISIBLE_LEAD)
_FORMULA_START = "^[" + re.escape(_INVISIBLE) + "]*[" + re.escape("".join(FORMULA_PREFIXES)) + "]"
_FORMULA_RE = re.compile(_FORMULA_START)

XLSX_CELL_MAX = 32_767  # characters a spreadsheet cell holds (the XLSX format's limit)
_XLSX_ILLEGAL = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f\x7f\ufffe\uffff]")


def neutralise_cell(v):
    """Prefix a text cell that a spreadsheet would read as a formula with a quote.

    >>> neutralise_cell("=1+1"), neutralise_cell("ok"), neutralise_cell(3.0)
    ("'=1+1", 'ok', 3.0)
    >>> neutralise_cell("\\ufeff=1+1"), neutralise_cell("\\uff1dSUM(A1)"), neutralise_cell("|x")
    ("'\\ufeff=1+1", "'＝SUM(A1)", "'|x")
    """
    if isinstance(v, str) and _FORMULA_RE.match(v):
        return "'" + v
    return v


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
        # every cell is text: test the first character in C (numpy U1 keeps one char);
        # a cell led by an invisible character is looked at whole
        hit = np.isin(values.astype("U1"), _FORMULA_CHARS)
        out = values.copy()
        if hit.any():
            idx = np.flatnonzero(hit)
            sure = np.array([bool(_FORMULA_RE.match(v)) for v in values[idx]], dtype=bool)
            idx = idx[sure]
            out[idx] = "'" + values[idx]
        return out
    s = pd.Series(values, dtype=object)
    hit = s.str.match(_FORMULA_START, na=False).to_numpy(bool)  # non-text cells: no match
    out = s.to_numpy(object).copy()
    out[hit] = "'" + s[hit].astype(str).to_numpy(object)
    return out


def xlsx_text(v: str) -> tuple[str, bool]:
    """Text as an XLSX cell can hold it, and whether it had to be cut.

    >>> xlsx_text("a\\x00b")
    ('a\\\\x00b', False)
    >>> t, cut = xlsx_text("x" * 40_000); len(t) <= XLSX_CELL_MAX, cut
    (True, True)
    """
    v = _XLSX_ILLEGAL.sub(lambda m: f"\\x{ord(m.group()):02x}", v)
    if len(v) <= XLSX_CELL_MAX:
        return v, False
    tail = f" … [cut: {len(v):,} characters, more than a spreadsheet cell holds]"
    return v[: XLSX_CELL_MAX - len(tail)] + tail, True
