"""Issue 13 item 7: when the 60 °C termination rule governs a conductor, the finding and
the report's assumptions say so and name the key that changes it."""

from __future__ import annotations

from feedcheck.runner import run_job
from tests.checks.jobs import finding, job_text


def test_60c_rule_named_for_a_4_awg_feeder(check_json, write_job):
    """4 AWG Cu, 90 °C insulation, 70 A device, no termination key: 110.14(C)(1)(a)
    (≤ 100 A, 14–1 AWG) holds it to the 60 °C column, 70 A (NFPA 70-2023 Table 310.16);
    at 75 °C it would be 85 A."""
    text = job_text(
        conductors="4 AWG Cu", insulation=90, device=70, bus=100, load_kva=20, ground="8 AWG Cu"
    )
    doc = check_json(text)
    f = finding(doc, "R", "allowable ampacity vs load")
    assert f["value"] is not None and f["limit"] == 70.0  # 60 °C column, Table 310.16
    assert "110.14(C)(1)(a)" in f["note"] and 'termination = "75 degC"' in f["note"]
    results = run_job(write_job(text, "again.toml"))
    assert any("110.14(C)(1)(a)" in a and "[[run]] R" in a for a in results.assumptions)


def test_no_word_when_the_job_sets_the_termination(check_json):
    text = job_text(
        conductors="4 AWG Cu", insulation=90, device=70, bus=100, load_kva=20, ground="8 AWG Cu"
    ).replace('device = "70 A"', 'device = "70 A"\ntermination = "75 degC"')
    doc = check_json(text)
    f = finding(doc, "R", "allowable ampacity vs load")
    assert f["limit"] == 85.0  # 75 °C column, NFPA 70-2023 Table 310.16
    assert "110.14(C)(1)(a)" not in f["note"]
