"""checks/conductors.py through the whole feed walk: NFPA 70 Table 310.16 ampacity with
the 310.15(B) ambient and 310.15(C)(1) adjustment factors, 110.14(C) terminations,
240.4(B) protection, and the Table 250.122 equipment grounding conductor.
"""

from __future__ import annotations

import math

import pytest

from tests.checks.jobs import finding, job_text, run

# 3/0 AWG Cu, NFPA 70-2023 Table 310.16: 165 / 200 / 225 A at 60 / 75 / 90 °C
CU_3_0 = {60: 165.0, 75: 200.0, 90: 225.0}


def _allowable(doc):
    return finding(doc, "R", "allowable ampacity vs load")["limit"]


def test_table_ampacity_at_75c(check_json):
    doc = check_json(job_text(conductors="3/0 AWG Cu", device=200, bus=225, load_kva=40))
    assert _allowable(doc) == CU_3_0[75]  # NFPA 70-2023 Table 310.16, 75 °C column
    assert run(doc, "R")["ampacity_a"] == CU_3_0[75]


def test_ambient_correction_90c_insulation(check_json):
    """90 °C insulation at 45 °C ambient: 225 A × √((90 − 45)/(90 − 30)) = 194.9 A
    (NFPA 70-2023 310.15(B) equation; Table 310.15(B)(1) prints 0.87 for 41–45 °C, i.e.
    195.8 A); below the 200 A 75 °C termination limit, so the corrected column governs."""
    doc = check_json(
        job_text(
            conductors="3/0 AWG Cu", insulation=90, ambient=45, device=175, bus=225, load_kva=40
        )
    )
    expected = CU_3_0[90] * math.sqrt((90 - 45) / (90 - 30))
    assert _allowable(doc) == pytest.approx(expected, rel=1e-9)
    assert _allowable(doc) == pytest.approx(CU_3_0[90] * 0.87, rel=5e-3)  # T310.15(B)(1)


def test_termination_limit_governs_at_40c(check_json):
    """Same conductor at 40 °C: 225 A × √(50/60) = 205.4 A, but 110.14(C)(1)(b) holds it
    to the 75 °C column, 200 A (NFPA 70-2023 Table 310.16)."""
    doc = check_json(
        job_text(
            conductors="3/0 AWG Cu", insulation=90, ambient=40, device=200, bus=225, load_kva=40
        )
    )
    assert _allowable(doc) == CU_3_0[75]


def test_more_than_three_current_carrying_conductors(check_json):
    """Six current-carrying conductors: 225 A × 0.80 = 180 A (NFPA 70-2023
    Table 310.15(C)(1), 4–6 conductors 80 %)."""
    doc = check_json(
        job_text(
            conductors="3/0 AWG Cu",
            insulation=90,
            current_carrying=6,
            device=175,
            bus=225,
            load_kva=40,
        )
    )
    assert _allowable(doc) == pytest.approx(CU_3_0[90] * 0.80, rel=1e-9)


@pytest.mark.parametrize(("device", "status"), [(300, "ok"), (350, "fail")])
def test_next_size_up_protection(check_json, device, status):
    """250 kcmil Cu at 75 °C = 255 A (NFPA 70-2023 Table 310.16); 240.4(B) permits the next
    standard rating up, 300 A (Table 240.6(A)), as long as it is 800 A or less."""
    doc = check_json(job_text(device=device, bus=400, load_kva=60))
    prot = finding(doc, "R", "device protects conductors")
    assert prot["limit"] == 300.0
    assert prot["status"] == status


@pytest.mark.parametrize(("ground", "status"), [("6 AWG Cu", "ok"), ("8 AWG Cu", "fail")])
def test_equipment_grounding_conductor_200a(check_json, ground, status):
    """200 A device → at least 6 AWG Cu (NFPA 70-2023 Table 250.122); 6 AWG is
    26,240 cmil (NFPA 70-2023 Ch. 9 Table 8)."""
    doc = check_json(
        job_text(conductors="3/0 AWG Cu", device=200, bus=225, load_kva=40, ground=ground)
    )
    egc = finding(doc, "R", "grounding conductor")
    assert egc["limit"] == pytest.approx(26.24, rel=2e-3)  # Ch. 9 Table 8 area, 3 digits
    assert egc["status"] == status


def test_equipment_grounding_conductor_aluminium(check_json):
    """400 A device → at least 1 AWG Al (NFPA 70-2023 Table 250.122); 1 AWG is
    83,690 cmil (NFPA 70-2023 Ch. 9 Table 8)."""
    doc = check_json(
        job_text(
            conductors="600 kcmil Al",
            device=400,
            bus=400,
            load_kva=100,
            ground="1 AWG Al",
            kva=150,
            primary_device=300,
            secondary_device='secondary_device = "600 A"',
        )
    )
    egc = finding(doc, "R", "grounding conductor")
    assert egc["limit"] == pytest.approx(83.69, rel=2e-3)
    assert egc["status"] == "ok"
