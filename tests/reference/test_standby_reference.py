"""The generator's first-cycle fault current against the published formula.

IEEE Std 141-1993 (Red Book) ch. 4 and IEEE Std 242-2001 (Buff Book) ch. 2: in the
first-cycle network a synchronous generator is a voltage behind its subtransient
reactance X"d, so at its terminals I = I_rated / x"d (x"d per unit on its own rating,
resistance neglected). The hand figures below are worked from that formula.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from feedcheck.calc.standby import generator_fault_a


def test_three_phase_hand_figure():
    # IEEE Std 141-1993 ch. 4 / IEEE Std 242-2001 ch. 2: I = I_rated / x"d
    # 500 kVA, 480 V, X"d = 12 %: I_rated = 500 000 / (√3 · 480) = 601.4 A,
    # I = 601.4 / 0.12 = 5011.7 A (by hand)
    assert generator_fault_a(500e3, 480.0, 12.0) == pytest.approx(5011.7, rel=1e-4)


def test_single_phase_hand_figure():
    # same formula on a single-phase machine: 50 kVA, 240 V, X"d = 20 %:
    # I_rated = 50 000 / 240 = 208.3 A, I = 208.3 / 0.20 = 1041.7 A (by hand)
    assert generator_fault_a(50e3, 240.0, 20.0, phases=1) == pytest.approx(1041.7, rel=1e-4)


def test_armature_resistance_lowers_the_figure_slightly():
    # with R = X"d / (X/R) the impedance is x"d · √(1 + 1/(X/R)²): at X/R 15 the figure
    # is 0.22 % below I_rated / x"d (by hand: √(1 + 1/225) = 1.00222)
    ratio = generator_fault_a(500e3, 480.0, 12.0, x_r=15.0) / generator_fault_a(500e3, 480.0, 12.0)
    assert ratio == pytest.approx(1 / 1.00222, rel=1e-5)


def test_vector_equals_scalar_and_limits():
    ratings = np.array([100e3, 500e3, 2e6])
    vec = generator_fault_a(ratings, 480.0, 14.0, x_r=20.0)
    for i, s in enumerate(ratings):
        assert vec[i] == pytest.approx(generator_fault_a(s, 480.0, 14.0, x_r=20.0))
    assert np.all(np.diff(vec) > 0)  # a larger machine gives more current
    assert generator_fault_a(500e3, 480.0, 10.0) > generator_fault_a(500e3, 480.0, 20.0)
    for bad in (0.0, -5.0, math.nan):
        with pytest.raises(ValueError):
            generator_fault_a(500e3, 480.0, bad)
    with pytest.raises(ValueError):
        generator_fault_a(500e3, 480.0, 12.0, phases=2)
