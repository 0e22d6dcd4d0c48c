"""Properties, limiting cases and error handling of the point-to-point kernels."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from feedcheck.calc import point_to_point as PTP
from feedcheck.calc.constants import M_PER_FT


def test_zero_length_run_keeps_the_current():
    """f = 0 for L = 0, so M = 1 (the method's definition, M = 1/(1 + f))."""
    assert PTP.ptp_factor(0.0, 9_000.0, 12_000.0, 1, 208.0) == 0.0
    assert PTP.ptp_chain_a(9_000.0, [0.0], [12_000.0], [1], 208.0)[0] == 9_000.0


def test_single_phase_factor_is_two_over_root_three_of_three_phase():
    """f_1ph = 2·L·I/(C·n·V) against f_3ph = √3·L·I/(C·n·V): the ratio is 2/√3."""
    three = PTP.ptp_factor(30.0, 8_000.0, 10_000.0, 1, 240.0, "3ph")
    single = PTP.ptp_factor(30.0, 8_000.0, 10_000.0, 1, 240.0, "1ph-ll")
    assert single / three == pytest.approx(2.0 / np.sqrt(3.0), rel=1e-12)


def test_infinite_primary_equals_no_primary():
    """An infinite primary gives the infinite-bus figure I·100/%Z."""
    bus = PTP.ptp_secondary_current_a(312.3, 3.4, 7.5)
    assert PTP.ptp_secondary_current_a(312.3, 3.4, 7.5, float("inf"), 480.0, 208.0) == bus


@settings(max_examples=60, deadline=None)
@given(
    start=st.floats(1e2, 1e5),
    feet=st.lists(st.floats(0.0, 500.0), min_size=1, max_size=6),
    c=st.floats(500.0, 30_000.0),
)
def test_chain_falls_run_by_run(start, feet, c):
    """The current never rises along a chain, and every step is I_k = I_(k-1)/(1 + f_k)."""
    lengths = np.array(feet) * M_PER_FT
    out = PTP.ptp_chain_a(start, lengths, c, 1, 208.0)
    assert np.all(np.diff(np.concatenate(([start], out))) <= 1e-9 * start)
    prev = start
    for length, got in zip(lengths, out, strict=True):
        assert got == pytest.approx(prev / (1.0 + PTP.ptp_factor(length, prev, c, 1, 208.0)))
        prev = got


def test_vector_equals_scalar():
    lengths = np.array([5.0, 20.0, 60.0])
    vec = PTP.ptp_factor(lengths, 9_000.0, 11_000.0, 2, 480.0)
    assert vec.tolist() == [PTP.ptp_factor(x, 9_000.0, 11_000.0, 2, 480.0) for x in lengths]
    r = np.array([1e-4, 2e-4])
    assert PTP.conductor_constant_a_ft_per_v(r, 1e-4).tolist() == [
        PTP.conductor_constant_a_ft_per_v(x, 1e-4) for x in r
    ]


@pytest.mark.parametrize(
    ("call", "match"),
    [
        (lambda: PTP.ptp_factor(1.0, 1e3, 1e4, 1, 208.0, "2ph"), "kind"),
        (lambda: PTP.ptp_factor(-1.0, 1e3, 1e4, 1, 208.0), "length_m"),
        (lambda: PTP.ptp_factor(1.0, 1e3, 0.0, 1, 208.0), "c_a_ft_per_v"),
        (lambda: PTP.conductor_constant_a_ft_per_v(0.0, 0.0), "zero"),
        (lambda: PTP.ptp_secondary_current_a(300.0, 2.0, 100.0), "tolerance_pct"),
        (lambda: PTP.percent_difference(1.0, 0.0), "reference"),
    ],
)
def test_bad_input_raises(call, match):
    with pytest.raises(ValueError, match=match):
        call()
