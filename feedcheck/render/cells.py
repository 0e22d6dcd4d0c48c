"""Spreadsheet formula guard for CSV and XLSX cells.

A text cell starting with ``= + - @``, a tab or a carriage return is read as a
formula by spreadsheet programs; exports prefix such cells with a quote.
"""

from __future__ import annotations

import re

import numpy as np

# first characters that make a spreadsheet read a cell as a formula (CSV/XLSX exports)
FORMULA_PREFIXES = ("=", "+", "-", "@", "\t", "\r")
_FORMULA_CHARS = np.array(FORMULA_PREFIXES)
_FORMULA_START = "^[" + re.escape("".join(FORMULA_PREFIXES)) + "]"


def neutralise_cell(v):
    """Prefix a text cell that a spreadsheet would read as a formula with a quote.

    >>> neutralise_cell("=1+1"), neutralise_cell("ok"), neutralise_cell(3.0)
    ("'=1+1", 'ok', 3.0)
    """
    if isinstance(v, str) and v[:1] in FORMULA_PREFIXES:
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
