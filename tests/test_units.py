import math

import pytest

from feedcheck.units import UnitParseError, parse_quantity, parse_voltage_system


@pytest.mark.parametrize(
    ("text", "dim", "expected"),
    [
        ("85 ft", "length", 25.908),  # 1 ft = 0.3048 m exactly (international foot)
        ("26 m", "length", 26.0),
        ("75 kVA", "power", 75_000.0),
        ("5.75 %", "percent", 5.75),
        ("35 degC", "temperature", 35.0),
        ("95 degF", "temperature", 35.0),
        ("22 kA", "current", 22_000.0),
        ("0.5 MVA", "power", 500_000.0),
        ("3 cycle", "time", 0.05),
    ],
)
def test_parse_quantity(text, dim, expected):
    assert parse_quantity(text, dim) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(
    ("text", "dim", "match"),
    [
        ("75 kVA", "length", "length with a unit"),
        ("85", "length", "unit is missing"),
        (85, "length", "bare number"),
        ("-3 ft", "length", "greater than zero"),
        ("0 ft", "length", "greater than zero"),
        ("nan ft", "length", "not NaN"),
        ("inf ft", "length", "finite"),
        ("12 blargs", "length", "not a unit"),
        ("five ft", "length", "number followed by a unit"),
        ("5 kVA", "percent", "percent"),
    ],
)
def test_parse_quantity_errors(text, dim, match):
    with pytest.raises(UnitParseError, match=match):
        parse_quantity(text, dim)


def test_infinite_bus_allowed_only_when_asked():
    assert parse_quantity("infinite", "current", allow_inf=True) == math.inf
    with pytest.raises(UnitParseError):
        parse_quantity("infinite", "current")


@pytest.mark.parametrize(
    ("text", "line", "neutral", "phases", "kind"),
    [
        ("480 V delta", 480, None, 3, "delta"),
        ("208Y/120 V", 208, 120, 3, "wye"),
        ("480Y/277 V", 480, 277, 3, "wye"),
        ("120/240 V", 240, 120, 1, "split"),
        ("240/120 V", 240, 120, 1, "split"),
    ],
)
def test_voltage_systems(text, line, neutral, phases, kind):
    v = parse_voltage_system(text)
    assert (v.voltage_ll_v, v.voltage_ln_v, v.phases, v.kind) == (line, neutral, phases, kind)


def test_single_phase_plain_voltage_needs_phase_count():
    assert parse_voltage_system("240 V", phases=1).kind == "single"
    assert parse_voltage_system("240 V", phases=3).phases == 3


@pytest.mark.parametrize("text", ["208Y/100 V", "120/208 V", "480 kA", "delta", ""])
def test_bad_voltage_systems(text):
    with pytest.raises(UnitParseError):
        parse_voltage_system(text)


@pytest.mark.parametrize(
    ("text", "line", "neutral", "kind"),
    [
        ("13.8 kV", 13800.0, None, "line"),
        ("13800 V delta", 13800.0, None, "delta"),
        ("13.8Y/7.97 kV", 13800.0, 7970.0, "wye"),
        ("480 kV", 480e3, None, "line"),  # spelled right; the job reader refuses > 35 kV
    ],
)
def test_kilovolt_spellings(text, line, neutral, kind):
    v = parse_voltage_system(text)
    assert (v.voltage_ll_v, v.voltage_ln_v, v.kind) == (line, neutral, kind)


# ---- the conversion table used without the pint registry (feedcheck.units_fast)
def test_fast_units_match_pint_bit_for_bit():
    """Every entry of the fast table gives the float pint gives (the reference library:
    pint's own definitions, e.g. foot = 12 inch, inch = 2.54 cm; kcmil = 1000 cmil)."""
    import numpy as np

    from feedcheck.units import DIMENSIONS, Q_
    from feedcheck.units_fast import FAST_UNITS

    rng = np.random.default_rng(17)
    values = [*rng.uniform(0, 1e4, 300).round(3).tolist(), 0.1, 0.3, 85.0, 95.0, 1e-9, 1e12]
    for unit, (dimension, factor) in FAST_UNITS.items():
        si = "degC" if dimension == "temperature" else DIMENSIONS[dimension][1]
        for v in values:
            assert v * factor == float(Q_(v, unit).to(si).magnitude), (unit, v)


def test_fast_path_and_pint_fallback_agree_through_parse_quantity():
    # an unlisted unit (yd) still goes through pint: 1 yd = 0.9144 m (NIST SP 811, B.8)
    assert parse_quantity("3 yd", "length") == pytest.approx(2.7432, rel=1e-12)
    # a listed unit of the wrong kind is refused by pint's dimension check as before
    with pytest.raises(UnitParseError):
        parse_quantity("3 ft", "current")
    with pytest.raises(UnitParseError, match="finite"):
        parse_quantity("1e308 kA", "current")


def test_registry_without_a_writable_cache_folder(tmp_path):
    """pint's definition cache unusable (cache folder under a file): the registry is
    built from the definitions silently, and units still convert."""
    import os
    import subprocess
    import sys

    blocker = tmp_path / "file"
    blocker.write_text("")
    env = {**os.environ, "XDG_CACHE_HOME": str(blocker / "cache"), "HOME": str(blocker)}
    code = (
        "from feedcheck.units import registry, parse_quantity;"
        "registry();print(parse_quantity('3 yd', 'length'))"
    )
    out = subprocess.run(
        [sys.executable, "-W", "error", "-c", code], env=env, capture_output=True, text=True
    )
    assert out.returncode == 0, out.stderr
    assert float(out.stdout) == pytest.approx(2.7432, rel=1e-12)
