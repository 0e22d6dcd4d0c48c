"""One place for the voltage-drop limits: the rule rows and the job's own figures."""

from __future__ import annotations

import pytest

from feedcheck.checks.drop_rules import drop_limits


def test_recommended_rows():
    lim = drop_limits()
    # NFPA 70-2017 215.2(A)(1) IN No. 2 and 210.19(A)(1) IN No. 4: 3 % feeder or branch,
    # 5 % total (informational: warnings)
    assert {k: (v.max_pct, v.status) for k, v in lim.items()} == {
        "feeder": (3.0, "warn"),
        "branch": (3.0, "warn"),
        "total": (5.0, "warn"),
    }


def test_mandatory_rows_and_job_figures():
    lim = drop_limits("mandatory", branch_pct=2.5)
    # ASHRAE/IES 90.1-2010 8.4.1.1: feeders 2 %; 90.1-2013 addendum c: combined 5 %
    assert (lim["feeder"].max_pct, lim["feeder"].status) == (2.0, "fail")
    assert (lim["total"].max_pct, lim["total"].rule_id) == (5.0, "vd-energy-total-5")
    assert (lim["branch"].max_pct, lim["branch"].rule_id, lim["branch"].status) == (
        2.5,
        "vd-job-branch",
        "fail",
    )


def test_unknown_choice_raises():
    with pytest.raises(ValueError, match="voltage_drop"):
        drop_limits("strict")
