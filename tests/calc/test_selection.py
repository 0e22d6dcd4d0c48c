"""Selection: smallest size per criterion and the governing one (hand-checked cases)."""

import math

import pytest

from tests.kernels import select_conductor


def test_ampacity_governs_plain_feeder():
    """120 A continuous, Cu 75 °C, 30 °C: 1.25 × 120 = 150 A → 1/0 Cu (150 A, NFPA 70-2023
    Table 310.16, 75 °C); device 150 A; protection also 1/0."""
    s = select_conductor(120.0, 0.0, "cu", 75.0)
    assert s.size == "1/0 AWG" and s.device_a == 150.0
    assert dict(s.minimum_by_criterion)["ampacity"] == "1/0 AWG"


def test_protection_governs_after_derating():
    """150 A cont + 30 A: device 225 A. 4/0 at 90 °C, 40 °C, 6 CCC: 260·√(50/60)·0.8 = 189.9 A
    ≥ 180 A load but next standard above 189.9 is 200 < 225 → 250 kcmil (290 → 211.8 A → 225)."""
    s = select_conductor(150.0, 30.0, "cu", 90.0, 40.0, 6)
    assert 260 * math.sqrt(50 / 60) * 0.8 < 200  # hand, NFPA 70 T310.16 + T310.15(C)(1)
    assert dict(s.minimum_by_criterion)["ampacity"] == "4/0 AWG"
    assert s.size == "250 kcmil" and s.governing == "protection"


def test_voltage_drop_governs_long_run():
    """100 A at 208 V three-phase over 150 m: the drop picks a size far above ampacity."""
    s = select_conductor(
        0.0, 100.0, "cu", 75.0, length_m=150.0, voltage_v=208.0, vdrop_max_pct=3.0, pf=0.9
    )
    assert s.governing == "voltage drop"

    # By hand, VD = √3·I·L·(R cos θ + X sin θ) (IEEE Std 141-1993 ch. 3) with NFPA 70-2023
    # Ch. 9 Table 9, Cu in steel conduit, Ω/kft: 4/0 R 0.063 XL 0.051 → 3.24 % (too much);
    # 250 kcmil R 0.054 XL 0.052 → 2.92 %, so 250 kcmil is the smallest that passes 3 %.
    def hand_pct(r_kft, x_kft):
        vd = math.sqrt(3) * 100.0 * 150.0 / 0.3048 / 1000 * (r_kft * 0.9 + x_kft * math.sqrt(0.19))
        return 100 * vd / 208.0

    assert hand_pct(0.063, 0.051) > 3.0 >= hand_pct(0.054, 0.052)
    assert s.size == "250 kcmil"
    assert s.vdrop_pct == pytest.approx(hand_pct(0.054, 0.052), rel=1e-3)


def test_withstand_governs_high_fault_slow_device():
    """30 kA for 0.5 s on thermoplastic Cu (k = 115): S ≥ 30000·√0.5/115 = 184.5 mm²
    → 400 kcmil (202.7 mm²); 350 kcmil (177.3 mm²) is too small. IEC 60364-4-43 Table 43A."""
    s = select_conductor(40.0, 0.0, "cu", 75.0, fault_a=30_000.0, clearing_s=0.5)
    # withstand of 400 kcmil (400 × 0.5067 mm², 1 kcmil = 0.5067 mm² by definition) by hand:
    # I = k·S/√t = 115 × 202.7 / √0.5 = 32.96 kA ≥ 30 kA (IEC 60364-4-43 434.5.2)
    assert s.withstand_a == pytest.approx(115 * 400 * 0.506707 / math.sqrt(0.5), rel=1e-3)
    assert s.size == "400 kcmil" and s.governing == "withstand"


def test_parallel_sets_skip_small_sizes():
    s = select_conductor(400.0, 0.0, "cu", 75.0, sets=2)
    assert s.sets == 2
    # 2 × 250 kcmil = 510 A ≥ 500 A at 75 °C (NFPA 70-2023 Table 310.16); device 500 A
    assert s.size == "250 kcmil" and s.device_a == 500.0


def test_metric_selection():
    s = select_conductor(60.0, 0.0, "cu", 90.0, system="metric")
    assert s.size.endswith("mm2") and s.chain.method == "interpolated"


@pytest.mark.parametrize(
    "kwargs,match",
    [
        ({"device_a": 100.0}, "device_a"),
        ({"phases": 2}, "phases"),
        ({"fault_a": 1e4}, "clearing_s"),
        ({"pf": 0.0}, "pf"),
    ],
)
def test_bad_input(kwargs, match):
    with pytest.raises(ValueError, match=match):
        select_conductor(120.0, **kwargs)


def test_impossible_raises():
    with pytest.raises(ValueError, match="no standard size"):
        select_conductor(900.0, 0.0, "cu", 75.0)
