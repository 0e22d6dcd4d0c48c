"""Transformer checks in the feed walk: protection, secondary-conductor arrangements,
grounding electrode conductor and bonding jumper, against the code rows by hand."""

from __future__ import annotations

import pytest

from feedcheck.runner import run_job
from feedcheck.tables import load_table

JOB = """
[project]
name = "transformer checks"

[source]
voltage = "480 V delta"
available_fault = "30 kA"
x_r = 6

[[transformer]]
id = "T1"
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5 %"
x_r = 3
primary_device = "{pdev}"
{sdev}

[[run]]
id = "S1"
from = "T1"
to = "P1"
length = "{length}"
conductors = "{cond}"
sets = {sets}
insulation = "75 degC"
ground = "4 AWG Cu"
{rdev}

[[panel]]
id = "P1"
rating = "225 A"
main_device = "{main}"
interrupting = "22 kA"
load = "40 kVA"
"""


def _run(
    write_job,
    pdev="100 A",
    sdev="",
    length="8 ft",
    cond="4/0 AWG Cu",
    sets=1,
    rdev="",
    main="200 A",
):
    text = JOB.format(
        pdev=pdev, sdev=sdev, length=length, cond=cond, sets=sets, rdev=rdev, main=main
    )
    return run_job(write_job(text))


def _find(res, subject, check):
    return [f for f in res.findings if f.subject == subject and f.check.startswith(check)]


def test_ten_foot_arrangement(write_job):
    # NFPA 70-2023 240.21(C)(2): ≤ 10 ft, ampacity ≥ the device it ends in and ≥ 1/10 of the
    # primary device × (480/208). 4/0 Cu at 75 °C: 230 A (Table 310.16) ≥ 200 A main and
    # ≥ 100 × 480/208 / 10 = 23.1 A → ok.
    res = _run(write_job)
    f = _find(res, "S1", "secondary conductors (10 ft")[0]
    assert f.status == "ok" and f.rule_id == "xfmr-secondary-10ft"
    assert f.limit == pytest.approx(200.0)
    assert f.value == pytest.approx(230.0)


def test_twenty_five_foot_arrangement_fails_small_conductors(write_job):
    # 240.21(C)(6): ≤ 25 ft, ampacity ≥ 1/3 × primary device × ratio. Primary 225 A:
    # 225 × 480/208 / 3 = 173.1 A; 2 AWG Cu at 75 °C carries 115 A (Table 310.16) → fail.
    res = _run(write_job, pdev="225 A", length="20 ft", cond="2 AWG Cu", main="100 A")
    f = _find(res, "S1", "secondary conductors (25 ft")[0]
    assert f.status == "fail"
    assert f.limit == pytest.approx(225 * 480 / 208 / 3, rel=1e-9)


def test_long_secondary_without_device_fails(write_job):
    res = _run(write_job, length="40 ft")
    f = _find(res, "S1", "secondary conductor length")[0]
    assert f.status == "fail" and f.rule_id == "xfmr-secondary-25ft"


def test_device_at_transformer_protects_the_secondary_conductors(write_job):
    res = _run(
        write_job, sdev='secondary_device = "250 A"', length="60 ft", rdev='device = "225 A"'
    )
    assert not _find(res, "S1", "secondary conductor length")
    assert _find(res, "S1", "secondary conductor protection")[0].status == "info"


def test_grounding_electrode_conductor_rows(write_job):
    # NFPA 70 Table 250.66 (rows read in one secondary copy only): 4/0 Cu is "over 3/0
    # through 350" → 2 AWG Cu / 1/0 Al; two sets of 4/0 (423.2 kcmil) → "over 350 through
    # 600" → 1/0 Cu / 3/0 Al.
    one = _find(_run(write_job), "T1", "grounding electrode")[0]
    assert "2 AWG Cu or 1/0 AWG Al" in one.note
    two = _find(_run(write_job, sets=2, cond="4/0 AWG Cu"), "T1", "grounding electrode")[0]
    assert "1/0 AWG Cu or 3/0 AWG Al" in two.note


def test_gec_table_cells():
    # NFPA 70 Table 250.66 (read in one secondary copy only): Cu 2 AWG or smaller → 8 Cu / 6 Al;
    # over 600 through 1100 kcmil Cu → 2/0 Cu / 4/0 Al; over 1100 → 3/0 Cu / 250 Al.
    t = load_table("grounding_electrode_conductor").data.set_index("row")
    assert (t.loc[1, "gec_cu"], t.loc[1, "gec_al"]) == ("8 AWG", "6 AWG")
    assert t.loc[1, "cu_up_to_kcmil"] == pytest.approx(66.36)  # 2 AWG, Ch. 9 Table 8
    assert (t.loc[6, "cu_up_to_kcmil"], t.loc[6, "gec_cu"], t.loc[6, "gec_al"]) == (
        1100,
        "2/0 AWG",
        "4/0 AWG",
    )
    assert (t.loc[7, "gec_cu"], t.loc[7, "gec_al"]) == ("3/0 AWG", "250 kcmil")


def test_secondary_arrangement_limits_in_rules_table():
    # 10 ft = 3.048 m and 25 ft = 7.62 m (240.21(C)(2), (C)(6)); 1 ft = 0.3048 m exactly.
    t = load_table("check_rules").data.set_index("rule_id")
    assert t.loc["xfmr-secondary-10ft", "limit"] == pytest.approx(3.048, abs=0.002)
    assert t.loc["xfmr-secondary-25ft", "limit"] == pytest.approx(7.62, abs=1e-9)


def test_primary_only_arrangement_limit(write_job):
    # Table 450.3(B) primary only, ≥ 9 A: 125 % of 90.2 A = 112.8 A → next standard 125 A.
    res = _run(write_job, pdev="150 A", rdev='device = "200 A"')
    f = _find(res, "T1", "primary device")[0]
    assert f.status == "fail" and f.limit == 125.0 and f.rule_id == "xfmr-prot-primary-only-9a"


def test_non_standard_device_rating_is_a_warning(write_job):
    # NFPA 70-2023 240.6(A): 110 A is a standard rating, 105 A is not.
    res = _run(write_job, pdev="105 A")
    f = _find(res, "T1", "primary device standard rating")[0]
    assert f.status == "warn" and f.rule_id == "device-standard-rating"
    assert not _find(_run(write_job, pdev="110 A"), "T1", "primary device standard rating")
