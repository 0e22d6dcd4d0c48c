"""checks/transformer.py through the whole feed walk: rated currents, NFPA 70 450.3(B)
device limits and the 250.66 grounding electrode conductor.

Unit under test (invented): 75 kVA, 480 V delta → 208Y/120 V.
"""

from __future__ import annotations

import math

import pytest

from tests.checks.jobs import finding, job_text


def test_rated_currents(check_json):
    doc = check_json(job_text())
    # I = S/(√3·V_LL), IEEE Std 141-1993 ch. 4: 75,000/(√3·480) = 90.21 A; /(√3·208) = 208.2 A
    assert finding(doc, "T", "rated primary current")["value"] == pytest.approx(
        75e3 / (math.sqrt(3) * 480), rel=1e-9
    )
    assert finding(doc, "T", "rated secondary current")["value"] == pytest.approx(
        75e3 / (math.sqrt(3) * 208), rel=1e-9
    )


def test_primary_and_secondary_protection_limits(check_json):
    doc = check_json(job_text(primary_device=150, secondary_device='secondary_device = "300 A"'))
    prim = finding(doc, "T", "primary device")
    # NFPA 70-2023 Table 450.3(B), primary and secondary protection: primary ≤ 250 % of
    # 90.21 A = 225.5 A, no next-size-up for the 250 % cell → 225 A (Table 240.6(A))
    assert prim["limit"] == 225.0
    assert prim["status"] == "ok"
    sec = finding(doc, "T", "secondary device")
    # NFPA 70-2023 Table 450.3(B): secondary ≤ 125 % of 208.2 A = 260.2 A; Note 1 permits the
    # next standard rating up → 300 A (Table 240.6(A))
    assert sec["limit"] == 300.0
    assert sec["status"] == "ok"


def test_primary_device_over_the_250_percent_limit_fails(check_json):
    doc = check_json(job_text(primary_device=250))
    prim = finding(doc, "T", "primary device")
    assert prim["limit"] == 225.0  # NFPA 70-2023 Table 450.3(B), 250 % × 90.21 A → 225 A
    assert prim["status"] == "fail"


def test_secondary_device_over_the_limit_fails(check_json):
    doc = check_json(job_text(secondary_device='secondary_device = "350 A"'))
    sec = finding(doc, "T", "secondary device")
    assert sec["limit"] == 300.0  # NFPA 70-2023 Table 450.3(B) Note 1, next size up 300 A
    assert sec["status"] == "fail"


@pytest.mark.parametrize(("device", "status"), [(125, "ok"), (150, "fail")])
def test_primary_only_protection(check_json, device, status):
    doc = check_json(job_text(primary_device=device, secondary_device=""))
    prim = finding(doc, "T", "primary device")
    # NFPA 70-2023 Table 450.3(B), primary protection only, current ≥ 9 A: 125 % of 90.21 A
    # = 112.8 A; Note 1 permits the next standard rating up → 125 A (Table 240.6(A))
    assert prim["limit"] == 125.0
    assert prim["status"] == status


@pytest.mark.parametrize(
    ("conductors", "sets", "gec_kcmil"),
    [
        # NFPA 70-2023 Table 250.66 (from memory): over 3/0 through 350 kcmil Cu → 2 AWG Cu;
        # 2 AWG area 66,360 cmil (NFPA 70-2023 Ch. 9 Table 8)
        ("250 kcmil Cu", 1, 66.36),
        # over 350 through 600 kcmil Cu → 1/0 AWG Cu, 105,600 cmil (Ch. 9 Table 8)
        ("500 kcmil Cu", 1, 105.6),
        # 2 × 250 = 500 kcmil of parallel sets, summed per 250.66 → 1/0 AWG Cu
        ("250 kcmil Cu", 2, 105.6),
    ],
)
def test_grounding_electrode_conductor(check_json, conductors, sets, gec_kcmil):
    doc = check_json(
        job_text(
            conductors=conductors,
            sets=sets,
            device=800,
            bus=800,
            secondary_device='secondary_device = "800 A"',
            kva=300,
            primary_device=600,
            ground="1/0 AWG Cu",
        )
    )
    gec = finding(doc, "T", "grounding electrode conductor")
    assert gec["value"] == pytest.approx(gec_kcmil, rel=2e-3)  # Ch. 9 Table 8 area, rounded
    assert gec["status"] == "info"
