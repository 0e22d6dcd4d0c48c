"""The compare helper: one tolerance, the rule's failure status, never ok when missing."""

from __future__ import annotations

import math

import pytest

from feedcheck.checks.compare import compare, passes

ROW = {"rule_id": "sched-imbalance", "status": "warn"}


@pytest.mark.parametrize(
    ("value", "limit", "direction", "expected"),
    [
        (200.0, 200.0, "at_most", True),
        (200.0 + 1e-10, 200.0, "at_most", True),  # within the rounding allowance
        (200.1, 200.0, "at_most", False),
        (199.9, 200.0, "at_least", False),
        (200.0 - 1e-10, 200.0, "at_least", True),
    ],
)
def test_passes(value, limit, direction, expected):
    assert passes(value, limit, direction) is expected


def test_failure_takes_the_rule_rows_status():
    assert compare(25.0, 20.0, "at_most", ROW, "LP1", "phase balance", "%").status == "warn"
    assert compare(25.0, 20.0, "at_most", "r-x", "LP1", "c", "%").status == "fail"
    ok = compare(15.0, 20.0, "at_most", ROW, "LP1", "phase balance", "%", "n")
    assert (ok.status, ok.rule_id, ok.value, ok.limit, ok.note) == (
        "ok",
        "sched-imbalance",
        15.0,
        20.0,
        "n",
    )


@pytest.mark.parametrize(("value", "limit"), [(None, 20.0), (math.nan, 20.0), (5.0, None)])
def test_missing_figure_is_never_ok(value, limit):
    f = compare(value, limit, "at_most", ROW, "LP1", "phase balance", "%", "balance")
    assert f.status == "warn"
    assert "not evaluated" in f.note and f.note.startswith("balance")


def test_unknown_direction_raises():
    with pytest.raises(ValueError, match="direction"):
        passes(1.0, 2.0, "below")
