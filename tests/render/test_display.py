"""The display rules every renderer formats through: no infinity, minus zero or exponent
shown as a figure; status words; figure labels; lengths in the results' unit."""

from __future__ import annotations

import math
import re

import pytest

from feedcheck.render import display as D

# every figure a person reads: digits with optional sign, separators and decimals, or a word
SHOWN = re.compile(r"^(-?[0-9][0-9,]*(\.[0-9]+)?|unlimited|unbounded|–)$")


@pytest.mark.parametrize(
    "value",
    [
        math.inf,
        -math.inf,
        math.nan,
        None,
        0.0,
        -0.0,
        -1e-12,
        2.13e-14,
        4.5e-5,
        -3.3e-6,
        0.999_96,
        1.0,
        99.999,
        999.96,
        31.25,
        1e21,
        -123_456.7,
    ],
)
@pytest.mark.parametrize("style", [D.REPORT, D.TERMINAL])
def test_number_never_shows_inf_minus_zero_or_exponent(value, style):
    shown = D.number(value, style)
    assert SHOWN.match(shown), shown
    assert "e" not in shown.replace("unlimited", "").replace("unbounded", "")
    assert not re.fullmatch(r"-0(\.0*)?", shown)
    for dec in (0, 1, 2, 3):
        assert SHOWN.match(D.fixed(value, dec)), D.fixed(value, dec)
        assert not re.fullmatch(r"-0(\.0*)?", D.fixed(value, dec))


def test_number_keeps_three_or_four_significant_digits():
    assert D.number(208.21) == "208.2" and D.number(208.21, D.TERMINAL) == "208"
    assert D.number(0.01234) == "0.0123" and D.number(4.5e-5) == "0.000045"
    assert D.number(30_000.0) == "30,000" and D.number(2.5) == "2.50"
    assert D.number(float("inf")) == "unlimited" and D.number(None) == "–"
    assert D.fixed(-0.001, 2) == "0.00" and D.fixed(12_345.0, 2, 1e-3) == "12.35"
    assert D.kiloamps(math.inf) == "unlimited" and D.kiloamps(6_009.0) == "6.01 kA"


def test_precise_tells_nearly_equal_figures_apart():
    assert D.precise(6009.0) == "6009" and D.precise(6009.000001) == "6009.000001"
    assert D.precise("inf") == "unlimited" and D.precise(-0.0) == "0"
    assert "e" not in D.precise(1.5e-9) and "e" not in D.precise(1.5e15)


def test_status_words():
    assert [D.status_word(s) for s in ("fail", "warn", "ok", "info")] == [
        "FAIL",
        "WARN",
        "ok",
        "info",
    ]
    assert D.status_word("OK", loud=True) == "OK" and D.status_word("Fail") == "FAIL"
    assert D.is_flagged("warn") and not D.is_flagged("ok")


def test_lengths_in_metres_or_feet():
    # 1 ft = 0.3048 m exactly (international foot, 1959 international yard and pound
    # agreement)
    ft = D.Display("ft")
    assert ft.length_value(0.3048 * 250) == pytest.approx(250.0, rel=1e-12)
    assert ft.length(30.48) == "100 ft" and ft.length_pair(30.48) == "100 ft (30.5 m)"
    m = D.Display()
    assert m.length(12.19) == "12.2 m" and m.length_pair(12.19) == "12.2 m (40 ft)"
    assert m.length_figure(1234.56) == "1,234.6"
    with pytest.raises(ValueError, match="length unit"):
        D.Display("yd")


def test_figure_labels_known_and_generic():
    assert D.node_figure("fault_max_a", 12_345.0) == ("Fault current, maximum", "12.35", "kA")
    assert D.node_figure("fault_max_a", math.inf)[1] == "unlimited"
    assert D.node_figure("new_thing_ohm", 0.0123) == ("New thing", "0.0123", "Ω")
    assert D.figure_label("widget_margin_pct") == ("Widget margin", "%")
    assert all(k in D.FIGURES for k in D.TERMINAL_FIGURES)
    assert D.node_title("LP1", "panel", "208Y/120 V") == "LP1 — panel, 208Y/120 V"
    assert D.node_title("source", "source", "480 V") == "Source, 480 V"
