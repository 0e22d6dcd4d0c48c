"""Selection: smallest size per criterion and the governing one (hand-checked cases)."""

import math

import pytest

from tests.kernels import select_conductor


def test_ampacity_governs_plain_feeder():
    """120 A continuous, Cu 75 °C, 30 °C: 1.25 × 120 = 150 A → 1/0 Cu (150 A, NFPA 70
    T310.16 75 °C, H); device 150 A; protection also 1/0."""
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
    s = select_conductor(0.0, 100.0, "cu", 75.0, length_m=150.0, voltage_v=208.0,
                         vdrop_max_pct=3.0, pf=0.9)
    assert s.governing == "voltage drop"
    assert s.vdrop_pct <= 3.0
    # one size smaller fails: √3·I·L·(R cosθ + X sinθ) > 3 % of 208 V (approximate form,
    # REFERENCES.md; R, X from NFPA 70 Ch. 9 Table 9 through the conductor kernel)
    from feedcheck.calc.sizes import AWG_KCMIL_ORDER
    from tests.kernels import ac_impedance_ohm_per_m

    smaller = AWG_KCMIL_ORDER[AWG_KCMIL_ORDER.index(s.size) - 1]
    r, x = ac_impedance_ohm_per_m(smaller, "cu", "steel", 75.0)
    vd = math.sqrt(3) * 100.0 * 150.0 * (r * 0.9 + x * math.sqrt(1 - 0.81))
    assert 100 * vd / 208.0 > 3.0


def test_withstand_governs_high_fault_slow_device():
    """30 kA for 0.5 s on thermoplastic Cu (k = 115): S ≥ 30000·√0.5/115 = 184.5 mm²
    → 400 kcmil (202.7 mm²); 350 kcmil (177.3 mm²) is too small. IEC 60364-4-43 Table 43A."""
    s = select_conductor(40.0, 0.0, "cu", 75.0, fault_a=30_000.0, clearing_s=0.5)
    assert 30000 * math.sqrt(0.5) / 115 == pytest.approx(184.47, rel=1e-3)
    assert s.size == "400 kcmil" and s.governing == "withstand"


def test_parallel_sets_skip_small_sizes():
    s = select_conductor(400.0, 0.0, "cu", 75.0, sets=2)
    assert s.sets == 2
    # 2 × 250 kcmil = 510 A ≥ 500 A at 75 °C (T310.16, H); device 500 A
    assert s.size == "250 kcmil" and s.device_a == 500.0


def test_metric_selection():
    s = select_conductor(60.0, 0.0, "cu", 90.0, system="metric")
    assert s.size.endswith("mm2") and s.chain.method == "interpolated"


@pytest.mark.parametrize("kwargs,match", [
    ({"device_a": 100.0}, "device_a"),
    ({"phases": 2}, "phases"),
    ({"fault_a": 1e4}, "clearing_s"),
    ({"pf": 0.0}, "pf"),
])
def test_bad_input(kwargs, match):
    with pytest.raises(ValueError, match=match):
        select_conductor(120.0, **kwargs)


def test_impossible_raises():
    with pytest.raises(ValueError, match="no standard size"):
        select_conductor(900.0, 0.0, "cu", 75.0)
