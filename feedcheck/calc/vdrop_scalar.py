"""One circuit's voltage drop in plain Python floats: the arithmetic of
:mod:`feedcheck.calc.vdrop` for a single figure, without building numpy arrays.

The feed walk computes one run at a time; numpy's cost per call is then most of the
work. These give the very figures the array forms give (the same IEEE operations in
the same order: ``p**2`` of an array is ``p·p``, ``np.sqrt`` and ``math.sqrt`` are both
correctly rounded) and return None for anything but valid plain floats, so that the
array form runs and raises its own message. Held equal to the array forms by
``tests/calc/test_fast_paths.py``.

References
----------
IEEE Std 141-1993 ch. 3 (approximate and exact voltage-drop forms).
"""

from __future__ import annotations

import math


def plain(*values) -> bool:
    """Whether every value is a plain Python float."""
    return all(type(v) is float for v in values)


def _cos_sin(pf: float) -> tuple[float, float] | None:
    if not (math.isfinite(pf) and abs(pf) <= 1.0):
        return None
    return abs(pf), (-1.0 if pf < 0 else 1.0) * math.sqrt(1.0 - pf * pf)


def _valid(k, sets, *nonneg: float) -> bool:
    ok_sets = type(sets) is int and sets >= 1
    return k is not None and ok_sets and all(math.isfinite(v) and v >= 0 for v in nonneg)


def approximate_v(current_a, r, x, length_m, pf, k, sets) -> float | None:
    """k·I·(R cos θ + X sin θ)·L / sets [V]; None when the array form must decide."""
    cs = _cos_sin(pf)
    if cs is None or not _valid(k, sets, current_a, r, x, length_m):
        return None
    cos, sin = cs
    return k * current_a * (r * cos + x * sin) * length_m / float(sets)


def exact_circuit_v(sending_v, current_a, r_per_m, x_per_m, length_m, pf, k, sets):
    """k · (E/k − E_r) of the exact phasor form [V]; None when the array form must
    decide (invalid input, or a load that cannot be delivered: it raises)."""
    cs = _cos_sin(pf)
    if cs is None or not _valid(k, sets, current_a, r_per_m, x_per_m, length_m):
        return None
    if not (math.isfinite(sending_v) and sending_v > 0):
        return None
    s = float(sets)
    r, x = r_per_m * length_m / s, x_per_m * length_m / s
    es = sending_v / k
    cos, sin = cs
    along = current_a * (r * cos + x * sin)
    across = current_a * (x * cos - r * sin)
    rad = es * es - across * across
    if rad < 0:
        return None
    er = math.sqrt(rad) - along
    if er <= 0:
        return None
    return k * (es - er)
