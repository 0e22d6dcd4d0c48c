"""Figures a person should never see (issue 15, item 3), held as properties over any float:
no ``inf``/``∞``/``nan``, no exponent, no ``-0``, no padded whole figure, and the shown text
reads back to the figure within the shown precision. Formatting only: no electrical
computation is checked here.
"""

from __future__ import annotations

import math
import re

from hypothesis import given
from hypothesis import strategies as st

from feedcheck.render.display import (
    MISSING,
    REPORT,
    TERMINAL,
    UNBOUNDED_BELOW,
    UNLIMITED,
    Display,
    finding_figures,
    fixed,
    number,
)

ANY = st.floats(allow_nan=True, allow_infinity=True)
FINITE = st.floats(allow_nan=False, allow_infinity=False, min_value=-1e12, max_value=1e12)
WORDS = {MISSING, UNLIMITED, UNBOUNDED_BELOW}


def _never_seen(text: str) -> None:
    assert "inf" not in text.lower() and "nan" not in text.lower() and "∞" not in text
    assert not re.search(r"\d[eE][-+]?\d", text), text
    assert not re.match(r"^-0(\.0*)?$", text), text


@given(ANY, st.sampled_from([REPORT, TERMINAL]))
def test_number_shows_no_forbidden_form(v, style):
    text = number(v, style)
    if text not in WORDS:
        _never_seen(text)


@given(ANY, st.integers(0, 4))
def test_fixed_shows_no_forbidden_form(v, decimals):
    text = fixed(v, decimals)
    if text not in WORDS:
        _never_seen(text)


@given(FINITE)
def test_number_reads_back(v):
    text = number(v)
    back = float(text.replace(",", ""))
    decimals = len(text.split(".")[1]) if "." in text else 0
    # what is shown is the figure rounded to what is shown (plus rounding noise below TINY)
    assert math.isclose(back, v, abs_tol=0.5 * 10**-decimals + 5e-7, rel_tol=1e-12)


@given(st.integers(-(10**9), 10**9))
def test_whole_figure_not_padded(n):
    assert number(float(n)) == f"{n:,}"


@given(ANY, ANY, st.sampled_from(["A", "%", "kcmil", "m", ""]), st.sampled_from(["m", "ft"]))
def test_finding_figures(value, limit, unit, length_unit):
    shown = finding_figures(value, limit, unit, Display(length_unit))
    for text, v in zip(shown, (value, limit), strict=True):
        _never_seen(text)
        if unit == "m" and isinstance(v, float) and math.isfinite(v):
            assert text.endswith(f" {length_unit}")
        if isinstance(v, float) and not math.isfinite(v):
            assert text in WORDS  # no unit after "unlimited" or a dash
