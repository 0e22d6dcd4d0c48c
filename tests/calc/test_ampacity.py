"""Properties of the ampacity kernels: monotonicity, vector = scalar, errors."""

import time

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from feedcheck.calc.ampacity import (
    ambient_factor,
    count_current_carrying,
    termination_c_for,
)
from feedcheck.calc.sizes import AWG_KCMIL_ORDER
from tests.kernels import ampacity_a, ampacity_chain, rooftop_adder_c

CU = list(AWG_KCMIL_ORDER)
COLS = [60.0, 75.0, 90.0]


@settings(max_examples=40, deadline=None)
@given(st.sampled_from(["cu", "al"]), st.sampled_from(COLS), st.booleans())
def test_ampacity_rises_with_size(mat, col, free_air):
    sizes = np.array(CU[1:] if mat == "al" else CU)
    a = ampacity_a(sizes, mat, col, 30.0, 3, col, free_air=free_air)
    assert np.all(np.diff(a) > 0)


@settings(max_examples=50, deadline=None)
@given(st.sampled_from(COLS), st.floats(-20.0, 55.0), st.floats(-20.0, 55.0))
def test_correction_falls_as_ambient_rises(tc, t1, t2):
    lo, hi = sorted((t1, t2))
    if hi >= tc:
        return
    assert ambient_factor(tc, lo) >= ambient_factor(tc, hi)


def test_factor_one_at_30c():
    assert ambient_factor(np.array(COLS), 30.0).tolist() == [1.0, 1.0, 1.0]


def test_vector_equals_scalar():
    rng = np.random.default_rng(1)
    n = 200
    sizes = rng.choice(CU[9:], n)  # 1/0 and larger so parallel sets are valid
    mats = rng.choice(["cu", "al"], n)
    ins = rng.choice(COLS, n)
    amb = rng.uniform(10, 55, n)
    ccc = rng.integers(1, 45, n)
    term = rng.choice([60.0, 75.0], n)
    sets = rng.integers(1, 4, n)
    vec = ampacity_a(sizes, mats, ins, amb, ccc, term, sets)
    for i in range(n):
        assert vec[i] == ampacity_a(sizes[i], mats[i], ins[i], amb[i], ccc[i], term[i], sets[i])


def test_large_schedule_is_fast():
    n = 200_000
    sizes = np.resize(np.array(CU), n)
    t0 = time.perf_counter()
    out = ampacity_a(sizes, "cu", 90.0, 40.0, 6, 75.0)
    assert out.shape == (n,)
    assert time.perf_counter() - t0 < 5.0  # numpy lookups, no per-row Python loop


def test_chain_matches_vector_kernel():
    c = ampacity_chain("350 kcmil", "al", 90.0, 43.0, 8, 75.0, 2)
    assert c.final_a == ampacity_a("350 kcmil", "al", 90.0, 43.0, 8, 75.0, 2)
    labels = [s[0] for s in c.steps()]
    assert labels[0].startswith("table ampacity") and labels[-1] == "allowable ampacity"
    assert all(s[3] for s in c.steps())


def test_termination_rule():
    # NFPA 70-2023 110.14(C)(1)
    assert termination_c_for(100.0, "3/0 AWG") == 60.0
    assert termination_c_for(150.0, "1 AWG") == 60.0
    assert termination_c_for(150.0, "1/0 AWG") == 75.0
    assert termination_c_for(90.0, "8 AWG", equipment_75c=True) == 75.0


def test_neutral_counting():
    assert count_current_carrying(3, neutral=True) == 3
    assert count_current_carrying(3, neutral=True, neutral_counts=True) == 4


def test_rooftop_2011_bands_and_xhhw2():
    # NFPA 70-2011 Table 310.15(B)(3)(c), from memory
    assert rooftop_adder_c(0.05, edition="2011")[0] == 22.0
    assert rooftop_adder_c(0.05)[0] == 0.0
    assert rooftop_adder_c(0.0, xhhw2=True)[0] == 0.0


@pytest.mark.parametrize(
    "kwargs,match",
    [
        ({"insulation_c": 80.0}, "insulation_c"),
        ({"termination_c": 70.0}, "termination_c"),
        ({"ambient_c": 90.0}, "ambient_c"),
        ({"current_carrying": 0}, "current_carrying"),
        ({"sets": 2, "size": "2 AWG"}, "1/0"),
        ({"sets": 0}, "sets"),
        ({"size": "1.5 mm2"}, "ampacity table"),
        ({"material": "brass"}, "material"),
    ],
)
def test_bad_input_raises(kwargs, match):
    args = {"size": "4/0 AWG", "material": "cu", "insulation_c": 90.0, "ambient_c": 30.0}
    args.update(kwargs)
    with pytest.raises(ValueError, match=match):
        ampacity_a(**args)
