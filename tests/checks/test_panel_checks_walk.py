"""checks/panels.py through the whole feed walk: design current with continuous load at
125 % against the bus and main device (NFPA 70-2023 215.2(A)(1), 408.30, 215.3, 408.36).
"""

from __future__ import annotations

import math

import pytest

from tests.checks.jobs import finding, job_text


def test_design_current_continuous_at_125_percent(check_json):
    """60 kVA of which 24 kVA continuous at 208 V three-phase: (1.25·24 + 36) kVA /
    (√3·208 V) = 183.2 A (NFPA 70-2023 215.2(A)(1)(a); I = S/(√3·V), IEEE Std 141-1993)."""
    doc = check_json(job_text(load_kva=60, continuous_kva=24, bus=225))
    f = finding(doc, "P", "load vs bus rating")
    assert f["value"] == pytest.approx((1.25 * 24e3 + 36e3) / (math.sqrt(3) * 208), rel=1e-9)
    assert f["limit"] == 225.0
    assert f["status"] == "ok"


def test_bus_overloaded_fails(check_json):
    doc = check_json(
        job_text(
            load_kva=60,
            continuous_kva=24,
            bus=175,
            device=175,
            conductors="3/0 AWG Cu",
            ground="6 AWG Cu",
        )
    )
    f = finding(doc, "P", "load vs bus rating")
    assert f["value"] > f["limit"] == 175.0  # 183.2 A > 175 A bus, 408.30
    assert f["status"] == "fail"


@pytest.mark.parametrize(("main", "status"), [(200, "ok"), (250, "fail")])
def test_main_device_at_most_the_bus(check_json, main, status):
    """NFPA 70-2023 408.36: the panelboard's overcurrent device not above its rating."""
    doc = check_json(job_text(bus=225, main_device=f'main_device = "{main} A"', load_kva=40))
    f = finding(doc, "P", "main device vs bus")
    assert f["limit"] == 225.0
    assert f["status"] == status
