"""Conductor protection and equipment grounding conductor.

NFPA 70-2023 Table 240.6(A), 240.4(D), Table 250.122 and Ch. 9 Table 8 (areas).
"""

import numpy as np
import pytest

from feedcheck.calc.sizes import SIZES
from tests.kernels import (
    conductor_protection,
    device_min_for_load_a,
    device_protects_conductor,
    egc_size,
    max_device_a,
    next_standard_rating_a,
)

# NFPA 70-2023 Table 250.122, device A -> (Cu, Al)
T250_122 = {
    15: ("14 AWG", "12 AWG"),
    20: ("12 AWG", "10 AWG"),
    60: ("10 AWG", "8 AWG"),
    100: ("8 AWG", "6 AWG"),
    200: ("6 AWG", "4 AWG"),
    300: ("4 AWG", "2 AWG"),
    400: ("3 AWG", "1 AWG"),
    500: ("2 AWG", "1/0 AWG"),
    600: ("1 AWG", "2/0 AWG"),
    800: ("1/0 AWG", "3/0 AWG"),
    1000: ("2/0 AWG", "4/0 AWG"),
    1200: ("3/0 AWG", "250 kcmil"),
    1600: ("4/0 AWG", "350 kcmil"),
    2000: ("250 kcmil", "400 kcmil"),
    2500: ("350 kcmil", "600 kcmil"),
    3000: ("400 kcmil", "600 kcmil"),
    4000: ("500 kcmil", "750 kcmil"),
    5000: ("700 kcmil", "1250 kcmil"),
    6000: ("800 kcmil", "1250 kcmil"),
}


@pytest.mark.parametrize("device", list(T250_122))
def test_egc_table_rows(device):
    cu, al = T250_122[device]
    assert egc_size(float(device), "cu").size == cu  # NFPA 70-2023 Table 250.122
    assert egc_size(float(device), "al").size == al


def test_egc_row_is_not_exceeding():
    assert egc_size(225.0).size == "4 AWG"  # 225 A falls in the 300 A row (Table 250.122)


def test_egc_proportional_increase():
    """250.122(B): 200 A device, phase upsized 3/0 → 350 kcmil Cu for voltage drop.

    Hand: 6 AWG (26.24 kcmil) × 350/167.8 = 54.73 kcmil → 2 AWG (66.36 kcmil) is the smallest
    at least that (areas NFPA 70 Ch. 9 Table 8)."""
    r = egc_size(200.0, "cu", phase_size="350 kcmil", phase_min_size="3/0 AWG")
    ratio = 350_000 / 167_800  # areas, NFPA 70 Ch. 9 Table 8
    assert r.ratio == pytest.approx(ratio, rel=2e-3)
    assert SIZES["6 AWG"].area_kcmil * ratio <= SIZES[r.size].area_kcmil
    assert r.size == "2 AWG"
    assert "egc-proportional" in r.rule_ids


def test_egc_never_larger_than_phase():
    # 250.122(A): 60 A device would need 10 AWG; circuit of 12 AWG (tap-like) caps it
    r = egc_size(60.0, "cu", phase_size="12 AWG")
    assert r.size == "12 AWG" and r.capped_at_phase


def test_egc_parallel_one_per_raceway():
    r = egc_size(800.0, "cu", sets=3)
    assert r.size == "1/0 AWG" and r.per_raceway == 3 and "egc-parallel" in r.rule_ids


def test_egc_bad_input():
    with pytest.raises(ValueError, match="device_a"):
        egc_size(7000.0)


def test_next_standard_rating():
    # NFPA 70-2023 Table 240.6(A)
    got = next_standard_rating_a(np.array([14.0, 15.0, 101.0, 226.0, 601.0, 801.0]))
    assert got.tolist() == [15.0, 15.0, 110.0, 250.0, 700.0, 1000.0]
    with pytest.raises(ValueError, match="largest standard"):
        next_standard_rating_a(7000.0)


def test_next_size_up_and_over_800():
    # 240.4(B): 164 A conductor may take 175 A; 240.4(C): 850 A conductor not on 1000 A
    assert max_device_a(164.3, "3/0 AWG", "cu") == 175.0
    assert max_device_a(790.0, "600 kcmil", "cu") == 800.0
    assert max_device_a(850.0, "600 kcmil", "cu") == 800.0
    assert max_device_a(1000.0, "600 kcmil", "cu") == 1000.0


@pytest.mark.parametrize(
    "size,mat,limit",
    [
        ("14 AWG", "cu", 15),
        ("12 AWG", "cu", 20),
        ("10 AWG", "cu", 30),
        ("12 AWG", "al", 15),
        ("10 AWG", "al", 25),
    ],
)
def test_small_conductor_limits(size, mat, limit):
    # NFPA 70-2023 240.4(D): even a large corrected ampacity does not raise the limit
    assert max_device_a(60.0, size, mat) == limit
    c = conductor_protection(float(limit) + 5, 60.0, size, mat)
    assert not c.ok and c.rule_id.startswith("nec-240.4(D)")


def test_vectorised_protection():
    dev = np.array([175.0, 200.0, 20.0])
    amp = np.array([164.3, 164.3, 25.0])
    sizes = np.array(["3/0 AWG", "3/0 AWG", "12 AWG"])
    assert device_protects_conductor(dev, amp, sizes, "cu").tolist() == [True, False, True]


def test_device_for_load():
    # 215.3: 1.25 × 120 + 40 = 190 A -> 200 A standard (Table 240.6(A))
    assert device_min_for_load_a(120.0, 40.0) == 190.0
    assert next_standard_rating_a(device_min_for_load_a(120.0, 40.0)) == 200.0
