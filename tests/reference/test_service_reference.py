"""The service transformer's through-fault (feedcheck.calc.service) against published
worked examples of the infinite-bus method, and its limiting cases."""

from __future__ import annotations

import math

import numpy as np
import pytest

from feedcheck.calc.service import service_through_fault


def test_infinite_bus_1500_kva_480_v():
    # J. Phillips, "Short Circuit Calculations - Infinite Bus Method" (brainfiller.com,
    # 7 Nov 2006): 1500 kVA, 480Y/277 V, 5.75 % → FLA 1804 A, I_sc = 1804 × 100 / 5.75
    # = 31,374 A (the FLA rounded to whole amperes; the unrounded figure is 31,378 A).
    # Method: IEEE Std 141-1993 §4.5 (infinite source, I = I_FL / Z_pu).
    i, _ = service_through_fault(1.5e6, 480.0, 5.75, 6.0, 3)
    assert i == pytest.approx(31_374, rel=2e-4)


def test_single_phase_infinite_bus():
    # single-phase: I = kVA × 1000 / E_L-L × 100 / %Z (the point-to-point method's first
    # steps; IEEE Std 141-1993 ch. 4 for rated current S/V); 50 kVA 120/240 V, 2 %:
    # 208.3 A × 50 = 10,417 A (from memory of the method's single-phase form)
    i, _ = service_through_fault(50e3, 240.0, 2.0, 3.0, 1)
    assert i == pytest.approx(10_417, rel=1e-4)


def test_finite_primary_lowers_the_fault_and_infinite_is_the_limit():
    # common practice, no source: adding the primary system's impedance can only lower
    # the through-fault; a very strong primary approaches the infinite-bus figure
    inf_i, inf_xr = service_through_fault(1e6, 480.0, 5.75, 6.0, 3)
    sc = np.array([50e6, 250e6, 1e9, 1e15])
    i, xr = service_through_fault(1e6, 480.0, 5.75, 6.0, 3, sc, 10.0)
    assert np.all(np.diff(i) > 0)
    assert np.all(i < inf_i)
    assert i[-1] == pytest.approx(inf_i, rel=1e-6)
    assert xr[-1] == pytest.approx(inf_xr, rel=1e-6)


def test_finite_primary_by_hand():
    # series impedances (IEEE Std 141-1993 ch. 4): at 480 V, 250 MVA at X/R 10 is
    # 0.0009216 Ω; 1000 kVA 5.75 % at X/R 6 is 0.013248 Ω; summed as complex numbers
    v = 480.0
    zp = v**2 / 250e6 * complex(1, 10) / math.sqrt(101)
    zt = 0.0575 * v**2 / 1e6 * complex(1, 6) / math.sqrt(37)
    want = v / (math.sqrt(3) * abs(zp + zt))
    i, xr = service_through_fault(1e6, v, 5.75, 6.0, 3, 250e6, 10.0)
    assert i == pytest.approx(want, rel=1e-12)
    assert xr == pytest.approx((zp + zt).imag / (zp + zt).real, rel=1e-12)


def test_vector_equals_scalar_and_bad_input():
    ratings = np.array([75e3, 500e3, 2500e3])
    vec, _ = service_through_fault(ratings, 480.0, 5.0, 5.0, 3)
    for r, got in zip(ratings, vec, strict=True):
        assert service_through_fault(r, 480.0, 5.0, 5.0, 3)[0] == pytest.approx(got)
    for bad in (dict(rating_va=0), dict(z_pct=-1), dict(x_r=float("nan"))):
        args = dict(rating_va=1e6, voltage_ll_v=480.0, z_pct=5.0, x_r=5.0, phases=3) | bad
        with pytest.raises(ValueError):
            service_through_fault(**args)
    with pytest.raises(ValueError):
        service_through_fault(1e6, 480.0, 5.0, 5.0, 2)
