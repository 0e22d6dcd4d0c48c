"""Adiabatic withstand: tabulated k vs the IEC formula, ICEA vs IEC, round trips."""

import numpy as np
import pytest

from feedcheck.calc.withstand import min_area_mm2, withstand_current_a
from feedcheck.tables import load_table
from tests.kernels import k_adiabatic, k_constant, withstand_current_icea_a


def test_tabulated_k_matches_annex_a_formula():
    """Every k row against k = √(Qc(β+20)/ρ20 · ln((β+θf)/(β+θi))) (IEC 60364-5-54:2011
    Annex A; Qc, β, ρ20 from IEC 60949 / IACS): within 1.5 % (tables round k)."""
    for r in load_table("withstand_k").data.itertuples(index=False):
        assert k_adiabatic(r.material, r.initial_c, r.final_c) == pytest.approx(r.k, rel=0.015)


def test_icea_and_iec_agree():
    # ICEA P-32-382 and IEC 60949 model the same adiabatic heating: within 2 %
    for mat in ("cu", "al"):
        k = k_adiabatic(mat, 90.0, 250.0)
        iec = withstand_current_a(107.2, 0.5, k)
        icea = withstand_current_icea_a(107.2, 0.5, mat, 90.0, 250.0)
        assert icea == pytest.approx(iec, rel=0.02)


def test_round_trip():
    k = k_constant("thermoplastic", "cu").k
    s = min_area_mm2(25_000.0, 0.1, k)
    assert withstand_current_a(s, 0.1, k) == pytest.approx(25_000.0)


def test_withstand_scales_with_area_and_inverse_root_time():
    k = 143.0
    a = withstand_current_a(np.array([50.0, 100.0]), np.array([0.4, 0.1]), k)
    assert a[1] / a[0] == pytest.approx(2 * 2)


def test_large_thermoplastic_uses_lower_k():
    # IEC 60364-4-43 Table 43A: PVC > 300 mm² has k 103 (Cu) instead of 115
    assert (
        k_constant("thermoplastic", "cu", area_mm2=400.0).k
        < k_constant("thermoplastic", "cu", area_mm2=240.0).k
    )


@pytest.mark.parametrize(
    "call,match",
    [
        (lambda: withstand_current_a(95.0, 6.0, 143.0), "5 s"),
        (lambda: withstand_current_a(-1.0, 0.1, 143.0), "area_mm2"),
        (lambda: min_area_mm2(1e4, 0.0, 143.0), "clearing_s"),
        (lambda: k_constant("paper", "cu"), "insulation"),
        (lambda: k_adiabatic("cu", 100.0, 90.0), "final_c"),
    ],
)
def test_bad_input(call, match):
    with pytest.raises(ValueError, match=match):
        call()


def test_large_protective_conductor_has_a_k_row():
    # Found by tests/fuzz/fuzz_inputs.py (seed 11): a 750 kcmil (380 mm²) insulated
    # protective conductor had no k row. IEC 60364-5-54 Table A.54.2 (from memory): PVC
    # over 300 mm², 30 → 140 °C: k = 133 (Cu), 88 (Al); checked here against the Annex A
    # formula as the other rows are.
    from tests.kernels import k_adiabatic, k_constant

    for material, k_tab in (("cu", 133.0), ("al", 88.0)):
        row = k_constant("thermoplastic", material, "protective", 380.0)
        assert row.k == k_tab
        assert float(k_adiabatic(material, 30.0, 140.0)) == pytest.approx(k_tab, rel=0.015)
