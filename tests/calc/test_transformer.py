import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from feedcheck.calc import transformer as tk
from feedcheck.tables import load_table


@pytest.mark.parametrize(
    ("kva", "volts", "phases", "amps"),
    [
        # I = S/(√3·V_LL) (IEEE Std 141-1993 ch. 4); by hand:
        # 75,000/(√3·208) = 208.2, 75,000/(√3·480) = 90.2
        (75, 208, 3, 208.2),
        (75, 480, 3, 90.2),
        # I = S/V single-phase (IEEE Std 141-1993 ch. 4), by hand: 25,000/240 = 104.17
        (25, 240, 1, 104.2),
        # 300 kVA at 208 V: 833 A (Cooper Bussmann, Electrical Plan Review, 2005,
        # Part II point-to-point example, Fault #1 step 1)
        (300, 208, 3, 833),
    ],
)
def test_rated_current(kva, volts, phases, amps):
    assert tk.rated_current_a(kva * 1e3, volts, phases) == pytest.approx(
        amps, abs=0.5 * 10 ** (-len(str(amps).split(".")[1]) if "." in str(amps) else 0.5)
    )


def test_rated_current_vector_equals_scalar():
    s = np.array([45e3, 75e3, 112.5e3])
    v = np.array([208, 480, 208])
    vec = tk.rated_current_a(s, v, 3)
    assert vec == pytest.approx([tk.rated_current_a(a, b, 3) for a, b in zip(s, v, strict=True)])


@pytest.mark.parametrize("bad", [0, -75e3, math.nan, math.inf])
def test_rated_current_rejects_bad_rating(bad):
    with pytest.raises(ValueError, match="rating_va"):
        tk.rated_current_a(bad, 208)


def test_phases_must_be_one_or_three():
    with pytest.raises(ValueError, match="phases"):
        tk.rated_current_a(75e3, 208, 2)


def test_impedance_in_ohms_matches_per_unit_definition():
    # IEEE Std 141-1993 ch. 4: Z_ohm = Z_pu · V²/S; for 75 kVA 208 V 5 %: 0.05 · 208²/75000
    z = tk.transformer_impedance_ohm(75e3, 208, 5.0, 3.0)
    assert abs(z) == pytest.approx(0.05 * 208**2 / 75e3, rel=1e-12)
    assert z.imag / z.real == pytest.approx(3.0, rel=1e-12)


def test_regulation_exact_matches_phasor_definition_for_published_problem_data():
    # Problem data from a published exercise (11 kV/415 V, 100 kVA, R = 0.0142 Ω and
    # X = 0.0569 Ω referred to the secondary, 0.8 pf lagging). The expected value is worked
    # here from the definition of regulation (IEEE C57.12.80: no-load minus full-load voltage
    # over full-load voltage) with complex arithmetic, independent of the code under test.
    v = 415 / math.sqrt(3)
    i = 100e3 / (math.sqrt(3) * 415)
    phi = math.acos(0.8)
    e = abs(v + i * complex(math.cos(phi), -math.sin(phi)) * complex(0.0142, 0.0569))
    expected = (e - v) / v * 100
    zb = 415**2 / 100e3
    r_pct, x_pct = 0.0142 / zb * 100, 0.0569 / zb * 100
    assert tk.regulation_pct_exact(r_pct, x_pct, 1.0, 0.8) == pytest.approx(expected, rel=1e-12)
    assert tk.regulation_pct_approximate(r_pct, x_pct, 1.0, 0.8) == pytest.approx(
        expected, rel=2e-3
    )


def test_regulation_at_unity_pf_is_mostly_resistive():
    # limiting case: unity pf, %R = 1, %X = 5: approx = 1 + 25/200 = 1.125 % (formula by hand)
    assert tk.regulation_pct_approximate(1.0, 5.0, 1.0, 1.0) == pytest.approx(1.125)


@settings(max_examples=60, deadline=None)
@given(st.floats(0.5, 8), st.floats(0.5, 10), st.floats(0.0, 1.2), st.floats(0.5, 1.0))
def test_exact_and_approximate_regulation_agree(z, xr, n, pf):
    r, x = tk.impedance_parts_pct(z, xr)
    ex = tk.regulation_pct_exact(r, x, n, pf)
    ap = tk.regulation_pct_approximate(r, x, n, pf)
    # the approximation drops terms of order (n·z/100)^3: agreement within that
    assert abs(ex - ap) <= 3 * (n * z / 100) ** 3 * 100 + 1e-9


def test_zero_load_gives_zero_regulation():
    assert tk.regulation_pct_exact(1.5, 4.7, 0.0, 0.8) == 0.0
    assert tk.secondary_drop_pct_exact(1.5, 4.7, 0.0, 0.8) == 0.0


def test_bad_power_factor_raises():
    with pytest.raises(ValueError, match="power factor"):
        tk.regulation_pct_exact(1, 5, 1, 1.2)


RULES = None


def _rules():
    return (
        load_table("transformer_protection").data.to_dict("records"),
        load_table("device_ratings").data["rating_a"].to_numpy(float),
    )


@pytest.mark.parametrize(
    ("i_rated", "winding", "arrangement", "rule_id", "max_device"),
    [
        # NFPA 70-2023 Table 450.3(B): primary only, ≥ 9 A: 125 %, next size up (note 1)
        # 75 kVA at 480 V: 90.2 A × 1.25 = 112.8 A → next standard 125 A (240.6(A))
        (90.21, "primary", "primary only", "xfmr-prot-primary-only-9a", 125),
        # primary and secondary: primary 250 % → 225.5 A → largest standard not above: 225 A
        (90.21, "primary", "primary and secondary", "xfmr-prot-both-primary", 225),
        # secondary 125 %, next size up: 208.2 × 1.25 = 260.2 A → 300 A
        (208.18, "secondary", "primary and secondary", "xfmr-prot-both-secondary-9a", 300),
        # primary only, 2–9 A: 167 %, no rounding up: 5 A → 8.35 A → 6 A standard fuse
        (5.0, "primary", "primary only", "xfmr-prot-primary-only-2a", 6),
        # primary only, < 2 A: 300 %: 1.5 A → 4.5 A → 3 A standard fuse
        (1.5, "primary", "primary only", "xfmr-prot-primary-only-0a", 3),
        # secondary < 9 A: 167 %: 8 A → 13.36 A → 10 A
        (8.0, "secondary", "primary and secondary", "xfmr-prot-both-secondary-0a", 10),
        # exact standard size: 100 A × 1.25 = 125 A stays 125 A
        (100.0, "primary", "primary only", "xfmr-prot-primary-only-9a", 125),
    ],
)
def test_protection_limits(i_rated, winding, arrangement, rule_id, max_device):
    rules, ratings = _rules()
    lim = tk.protection_limit(i_rated, winding, arrangement, rules, ratings)
    assert lim.rule_id == rule_id
    assert lim.max_device_a == max_device


def test_standard_rating_helpers():
    ratings = [15, 20, 25, 30]
    assert tk.next_standard_rating_a(21, ratings) == 25
    assert tk.next_standard_rating_a(20, ratings) == 20
    assert tk.next_standard_rating_a(31, ratings) == math.inf
    assert tk.largest_standard_at_most_a(24.9, ratings) == 20
    assert tk.largest_standard_at_most_a(10, ratings) == 0.0
