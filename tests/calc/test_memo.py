"""Memoised kernels (feedcheck/calc/memo.py) give what the kernel gives, and keep a
result only for the very same call (identity between two ways of the same computation;
no published value is checked here)."""

import itertools

import numpy as np
import pytest

from feedcheck.calc.memo import memoised
from feedcheck.calc.selection import select_conductor, smallest_size
from feedcheck.rulebook import default_rulebook

BOOK = default_rulebook()


def _counting():
    calls = []

    @memoised
    def kernel(x, y=1, *, data):
        calls.append((x, y))
        return x * y

    return kernel, calls


def test_same_call_computed_once_and_types_kept_apart():
    k, calls = _counting()
    d = BOOK.conductors
    assert k(2.0, data=d) == 2.0 and k(2.0, data=d) == 2.0
    assert k(2, data=d) == 2 and type(k(2, data=d)) is int  # int apart from float
    assert k(True, data=d) == 1 and len(calls) == 3  # bool apart from int
    assert k(2.0, y=3.0, data=d) == 6.0 and len(calls) == 4
    assert k(np.float64(2.0), data=d) == 2.0 and len(calls) == 5  # numpy scalar: own type


def test_records_by_identity_not_equality():
    k, calls = _counting()
    a = default_rulebook().conductors
    b = type(a)(**{f: getattr(a, f) for f in a.__dataclass_fields__})  # equal, not same
    k(1.0, data=a)
    k(1.0, data=b)
    assert len(calls) == 2


def test_arrays_pass_through_and_errors_are_not_kept():
    k, calls = _counting()
    x = np.array([1.0, 2.0])
    assert np.array_equal(k(x, data=BOOK), x) and np.array_equal(k(x, data=BOOK), x)
    assert len(calls) == 2 and k.cache_size() == 0

    seen = []

    @memoised
    def fails(x):
        seen.append(x)
        raise ValueError("no")

    for _ in range(2):
        with pytest.raises(ValueError):
            fails(1.0)
    assert len(seen) == 2


def test_smallest_size_is_the_size_select_conductor_selects():
    # common practice, no source: two ways of the same screen give the same size
    grid = itertools.product(
        (5.0, 40.0, 150.0, 380.0, 900.0),  # continuous [A]
        (0.0, 30.0),  # noncontinuous [A]
        ("cu", "al"),
        (60.0, 75.0, 90.0),
        (30.0, 45.0),  # ambient
        (3, 9),  # current-carrying
        (None, 75.0),  # termination
        (1, 2, 3),  # sets
        ("steel", "free-air"),
        (None, 800.0),  # device
    )
    compared = 0
    for cont, non, mat, ins, amb, cc, term, sets, rw, dev in grid:
        args = (cont, non, mat, ins, amb, cc, term, sets, rw, dev)
        try:
            want = select_conductor(*args, data=BOOK.sizing).size
        except ValueError as exc:
            with pytest.raises(ValueError) as got:
                smallest_size(*args, data=BOOK.sizing)
            assert str(got.value) == str(exc)
            continue
        assert smallest_size(*args, data=BOOK.sizing) == want, args
        compared += 1
    assert compared > 1000
