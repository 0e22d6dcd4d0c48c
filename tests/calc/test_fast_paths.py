"""Scalar fast paths of vectorised kernels give what the array path gives (vector =
scalar; identity between two ways of the same computation, no published value)."""

import itertools

import numpy as np
import pytest

from feedcheck.calc.fault_duty import governing_duty_a


def test_governing_duty_scalar_equals_array():
    values = (None, 0.0, 4150.0, 4448.0, 9000.0, 1e6)
    for combo in itertools.product(values, repeat=4):
        if all(v is None for v in combo):
            continue
        arr = governing_duty_a(*(None if v is None else np.array([v]) for v in combo))
        for one in (
            governing_duty_a(*combo),
            governing_duty_a(*(None if v is None else np.float64(v) for v in combo)),
        ):
            assert type(one.duty_a) is float and type(one.case) is str
            assert (one.duty_a, one.case, one.cases) == (
                float(arr.duty_a[0]),
                arr.case[0],
                arr.cases,
            )


@pytest.mark.parametrize("bad", [float("nan"), float("inf"), -1.0])
def test_governing_duty_scalar_refuses_what_the_array_refuses(bad):
    with pytest.raises(ValueError) as a:
        governing_duty_a(100.0, bad)
    with pytest.raises(ValueError) as b:
        governing_duty_a(np.array(100.0), np.array(bad))
    assert str(a.value).split(", got")[0] == str(b.value).split(", got")[0]


def test_current_from_apparent_power_scalar_equals_array():
    from feedcheck.calc.power import current_from_apparent_power_a

    rng = np.random.default_rng(3)
    for va in [0.0, 1.0, 45e3, 7, *rng.uniform(0, 5e6, 200).tolist()]:
        for v in (120.0, 208.0, 240.0, 480.0, 13800.0, *rng.uniform(1, 35e3, 5).tolist()):
            for ph in (1, 3):
                one = current_from_apparent_power_a(va, v, ph)
                arr = current_from_apparent_power_a(np.array([va]), np.array([v]), ph)
                assert type(one) is float and one == float(arr[0])


@pytest.mark.parametrize(("v", "ph"), [(0.0, 3), (-1.0, 3), (float("nan"), 1), (208.0, 2)])
def test_current_from_apparent_power_scalar_refuses_as_the_array(v, ph):
    from feedcheck.calc.power import current_from_apparent_power_a

    with pytest.raises(ValueError) as a:
        current_from_apparent_power_a(100.0, v, ph)
    with pytest.raises(ValueError) as b:
        current_from_apparent_power_a(np.float64(100.0), np.float64(v), np.int64(ph))
    assert str(a.value).split(", got")[0] == str(b.value).split(", got")[0]


def test_voltage_drops_of_plain_floats_equal_the_array_forms():
    from feedcheck.calc.vdrop import voltage_drop_approximate_v, voltage_drop_exact_circuit_v

    rng = np.random.default_rng(11)
    n = 3000
    cols = (
        rng.uniform(0, 800, n),  # current [A]
        rng.uniform(1e-5, 3e-3, n),  # r [Ω/m]
        rng.uniform(5e-5, 3e-4, n),  # x [Ω/m]
        rng.uniform(0, 300, n),  # length [m]
        rng.uniform(-1, 1, n),  # pf (negative: leading)
    )
    volts = rng.choice([120.0, 208.0, 240.0, 480.0, 600.0], n) * rng.uniform(0.8, 1.05, n)
    kinds = rng.choice(["3ph", "1ph2w", "1ph3w", "ln4w"], n)
    sets = rng.integers(1, 5, n)
    compared = 0
    for j in range(n):
        i, r, x, length, pf = (float(c[j]) for c in cols)
        kind, s, v = str(kinds[j]), int(sets[j]), float(volts[j])
        one = voltage_drop_approximate_v(i, r, x, length, pf, kind, s)
        arr = voltage_drop_approximate_v(*(np.float64(a) for a in (i, r, x, length, pf)), kind, s)
        assert type(one) is float and one == arr
        try:
            want = voltage_drop_exact_circuit_v(
                np.float64(v), np.float64(i), np.float64(r), np.float64(x), np.float64(length),
                np.float64(pf), kind, s,
            )  # fmt: skip
        except ValueError:
            with pytest.raises(ValueError):
                voltage_drop_exact_circuit_v(v, i, r, x, length, pf, kind, s)
            continue
        got = voltage_drop_exact_circuit_v(v, i, r, x, length, pf, kind, s)
        assert type(got) is float and got == want
        compared += 1
    assert compared > n // 2
