"""The voltage at a point of a starting motor's path (impedance divider, IEEE Std 399-1997
ch. 9 impedance method; Ohm's law for the resistive hand case)."""

from __future__ import annotations

import pytest

from feedcheck.calc.motor_starting import motor_starting_voltage_pct, voltage_on_path_pct


def test_resistive_divider_by_hand():
    """E = 277 V, I_LR = 277 A at pf 1 → Z_m = 1 Ω; path 0.5 Ω, the point after 0.25 Ω:
    V = E·(0.25 + 1)/(0.5 + 1) = 83.33 % (voltage divider, hand calculation)."""
    assert voltage_on_path_pct(277, 277, 1.0, 0.5, 0.0, 0.25, 0.0) == pytest.approx(
        100 * 1.25 / 1.5
    )


def test_ends_of_the_path():
    """At the source 100 %; at the end of the path the terminal voltage of the same
    divider (IEEE Std 399-1997 ch. 9)."""
    args = (277, 600, 0.3, 0.02, 0.04)
    assert voltage_on_path_pct(*args, 0.0, 0.0) == pytest.approx(100.0)
    assert voltage_on_path_pct(*args, 0.02, 0.04) == pytest.approx(
        motor_starting_voltage_pct(*args)
    )


def test_further_along_is_lower():
    """Monotonic: the further along the path, the deeper the dip."""
    vals = [
        voltage_on_path_pct(277, 600, 0.3, 0.02, 0.04, f * 0.02, f * 0.04) for f in (0, 0.3, 0.7, 1)
    ]
    assert vals == sorted(vals, reverse=True)
