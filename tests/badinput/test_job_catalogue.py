# ruff: noqa: E501  (expected messages are quoted whole; wrapping them hides them)
"""Catalogue of bad job files, each run through ``feedcheck check`` (exit code 2).

Every case breaks the valid job in :mod:`badinput` in one place and asserts the
complete set of messages: one ``error:`` line per problem, of the form
``error: <file>:<line>: <key path> got '<value>'; expected <what is accepted>``,
the closing count line, nothing on stdout, no ``--out`` file and no temporary file.

Limits chosen (rule for absurd magnitudes)
------------------------------------------
A value is an **input error** (exit 2) when it cannot describe a low-voltage
distribution feed at all, or lies outside the range where the tool's methods hold;
anything physically possible but unwise is left to the checks (a ``warn`` or
``fail`` finding, exit 0 or 1). The ranges in ``feedcheck/inputs/ranges.py``:

* run length: > 0 and at most 2000 m (6560 ft); beyond that the short-line
  impedance model and the feeder-scale drop limits stop being a sensible study
  (a 5 km run is refused);
* transformer impedance: 0.5 % to 25 % (distribution units are about 1-10 %;
  900 % is refused); rating 1 kVA to 5000 kVA, in VA/kVA/MVA only (W, hp or var
  are refused, since pint cannot tell them apart from VA);
* device, panel and main ratings: 1 A to 6000 A (largest standard rating,
  NFPA 70 240.6(A)); interrupting ratings 1 kA to 300 kA (common practice, no
  source: the highest listed current-limiting fuse ratings);
* available fault current at the primary: 100 A to 1000 kA, or ``"infinite"``;
* system voltages: 100 V to 1000 V line to line ("low voltage" is 1000 V and less);
  the source and a transformer's primary also up to 35 kV (medium voltage);
* NaN, infinity (except an infinite bus), zero and negative values are refused
  wherever a positive quantity is meant; numbers need a unit; a decimal comma
  (``"1,5 m"``) is refused instead of being read as 15 m.
"""

from __future__ import annotations

import pytest

from . import GOOD, assert_rejected, cli, line_of

# (case id, text to replace, replacement, [(message tail, line locator or None)])
# A locator is a fragment of the broken file whose line the message must name;
# None means the message has no line (it is about the whole file or a missing table).
LEN = "a length with a unit, e.g. '85 ft or 26 m'"
PCT = "a percent with a unit, e.g. '5.75 %'"
CUR = "a current with a unit, e.g. '225 A or 22 kA'"
TEMP = "a temperature with a unit, e.g. '35 degC'"
APPARENT = "an apparent power in VA, kVA or MVA, e.g. '75 kVA' (not W, hp or var)"
SIZES = "a standard size: 14 AWG … 4/0 AWG, 250 … 2000 kcmil, or 1.5 … 630 mm2"
VSYS = (
    "a system voltage such as '480 V delta', '208Y/120 V', '480Y/277 V', "
    "'120/240 V' (single-phase three-wire), '240/120 V high-leg delta', '240 V' or '480 V'"
)
NODE = "the id of the source, a transformer or a panel"
INSIDE = "a path inside the job file's folder (no absolute paths, no '..')"

# fmt: off
CASES = [
    ('length-wrong-dim', 'length = "60 ft"', 'length = "75 kVA"',
     [(f"run[1].length got '75 kVA'; expected {LEN}", 'length = "75 kVA"')]),
    ('length-bare-number', 'length = "60 ft"', 'length = 60',
     [(f"run[1].length got '60'; expected {LEN} (a bare number has no unit)", 'length = 60')]),
    ('length-no-unit-text', 'length = "60 ft"', 'length = "60"',
     [(f"run[1].length got '60'; expected {LEN} (the unit is missing)", 'length = "60"')]),
    ('length-zero', 'length = "60 ft"', 'length = "0 ft"',
     [(f"run[1].length got '0 ft'; expected {LEN} (greater than zero)", '0 ft')]),
    ('length-negative', 'length = "60 ft"', 'length = "-60 ft"',
     [(f"run[1].length got '-60 ft'; expected {LEN} (greater than zero)", '-60 ft')]),
    ('length-nan', 'length = "60 ft"', 'length = "nan ft"',
     [(f"run[1].length got 'nan ft'; expected {LEN} (not NaN)", 'nan ft')]),
    ('length-inf', 'length = "60 ft"', 'length = "inf ft"',
     [(f"run[1].length got 'inf ft'; expected {LEN} (a finite number)", 'inf ft')]),
    ('length-overflow', 'length = "60 ft"', 'length = "1e400 ft"',
     [(f"run[1].length got '1e400 ft'; expected {LEN} (a finite number)", '1e400 ft')]),
    ('length-5km', 'length = "60 ft"', 'length = "5 km"',
     [("run[1].length got '5 km'; expected a run length up to 2000 m (6560 ft); longer feeds need a different study", '5 km')]),
    ('length-decimal-comma', 'length = "60 ft"', 'length = "1,5 m"',
     [("run[1].length got '1,5 m'; expected a number followed by a unit (use '.' for decimals, e.g. '1.5 m')", '1,5 m')]),
    ('length-not-a-unit', 'length = "60 ft"', 'length = "60 paces"',
     [(f"run[1].length got '60 paces'; expected {LEN} ('paces' is not a unit)", '60 paces')]),
    ('length-empty-text', 'length = "60 ft"', 'length = ""',
     [("run[1].length got (missing); expected a number followed by a unit (use '.' for decimals, e.g. '1.5 m')", 'length = ""')]),
    ('length-toml-date', 'length = "60 ft"', 'length = 2026-11-30',
     [(f"run[1].length got '2026-11-30'; expected {LEN} ('-11-30' is not a unit)", 'length = 2026')]),
    ('ambient-temperature-difference', 'ambient = "30 degC"', 'ambient = "35 delta_degC"',
     [(f"run[1].ambient got '35 delta_degC'; expected {TEMP} ('delta_degC' does not convert)", 'delta_degC')]),
    ('ambient-below-range', 'ambient = "30 degC"', 'ambient = "-300 degC"',
     [("run[1].ambient got '-300 degC'; expected an ambient from -40 degC to below the insulation rating", '-300 degC')]),
    ('ambient-at-insulation', 'ambient = "30 degC"', 'ambient = "75 degC"',
     [("run[1].ambient got '75 degC'; expected an ambient from -40 degC to below the insulation rating", 'ambient = "75 degC"')]),
    ('impedance-900-pct', 'impedance = "4.6 %"', 'impedance = "900 %"',
     [("transformer[1].impedance got '900 %'; expected a percent impedance from 0.5 % to 25 % (distribution transformers are 1-10 %)", '900 %')]),
    ('impedance-fraction', 'impedance = "4.6 %"', 'impedance = "0.046"',
     [(f"transformer[1].impedance got '0.046'; expected {PCT} (the unit is missing)", '0.046')]),
    ('impedance-nan', 'impedance = "4.6 %"', 'impedance = "nan %"',
     [(f"transformer[1].impedance got 'nan %'; expected {PCT} (not NaN)", 'nan %')]),
    ('rating-kw', 'rating = "112.5 kVA"', 'rating = "112.5 kW"',
     [(f"transformer[1].rating got '112.5 kW'; expected {APPARENT}", '112.5 kW')]),
    ('rating-hp', 'rating = "112.5 kVA"', 'rating = "150 hp"',
     [(f"transformer[1].rating got '150 hp'; expected {APPARENT}", '150 hp')]),
    ('rating-absurd', 'rating = "112.5 kVA"', 'rating = "1e30 kVA"',
     [("transformer[1].rating got '1e30 kVA'; expected a rating from 1 kVA to 5000 kVA", '1e30 kVA')]),
    ('panel-load-kvar', 'load = "60 kVA"', 'load = "60 kvar"',
     [(f"panel[1].load got '60 kvar'; expected {APPARENT}", '60 kvar')]),
    ('x-r-nan', 'x_r = 4', 'x_r = nan',
     [("transformer[1].x_r got 'nan'; expected a number from 0.1 to 50", 'x_r = nan')]),
    ('x-r-infinite', 'x_r = 4', 'x_r = inf',
     [("transformer[1].x_r got 'inf'; expected a number from 0.1 to 50", 'x_r = inf')]),
    ('x-r-quoted', 'x_r = 5', 'x_r = "five"',
     [("source.x_r got 'five'; expected a number from 0.1 to 100 (no quotes)", 'five')]),
    ('sets-fraction', 'sets = 1', 'sets = 2.5',
     [("run[1].sets got '2.5'; expected a whole number from 1 to 20 (no quotes)", 'sets = 2.5')]),
    ('sets-zero', 'sets = 1', 'sets = 0',
     [("run[1].sets got '0'; expected a whole number from 1 to 20", 'sets = 0')]),
    ('phases-two', 'phases = 3', 'phases = 2',
     [("source.phases got '2'; expected 1 or 3", 'phases = 2')]),
    ('phases-conflict', 'phases = 3', 'phases = 1',
     [("source.phases got '1'; expected 3 to match the 3-phase voltage '480 V delta'", 'phases = 1')]),
    ('power-factor-over-one', 'power_factor = 0.9', 'power_factor = 1.5',
     [("panel[1].power_factor got '1.5'; expected a number from 0.05 to 1", '1.5')]),
    ('continuous-over-load', 'continuous = "20 kVA"', 'continuous = "90 kVA"',
     [("panel[1].continuous got '90 kVA'; expected at most the panel's load", '90 kVA')]),
    ('fault-absurdly-small', 'available_fault = "25 kA"', 'available_fault = "1e-9 A"',
     [("source.available_fault got '1e-9 A'; expected an available fault current from 100 A to 1000 kA, or 'infinite'", '1e-9 A')]),
    ('fault-absurdly-large', 'available_fault = "25 kA"', 'available_fault = "5000 kA"',
     [("source.available_fault got '5000 kA'; expected an available fault current from 100 A to 1000 kA, or 'infinite'", '5000 kA')]),
    ('fault-wrong-dim', 'available_fault = "25 kA"', 'available_fault = "25 kVA"',
     [(f"source.available_fault got '25 kVA'; expected {CUR}", '25 kVA')]),
    ('fault-both-forms', 'available_fault = "25 kA"', 'available_fault = "25 kA"\nshort_circuit_mva = "20 MVA"',
     [("source.short_circuit_mva got '20 MVA'; expected either available_fault or short_circuit_mva, not both", 'short_circuit_mva')]),
    ('device-absurd', '\ndevice = "400 A"', '\ndevice = "1e9 A"',
     [("run[1].device got '1e9 A'; expected an ampere rating from 1 A to 6000 A", '1e9 A')]),
    ('interrupting-absurd', 'interrupting = "22 kA"', 'interrupting = "1e9 kA"',
     [("panel[1].interrupting got '1e9 kA'; expected an interrupting rating from 1 kA to 300 kA", '1e9 kA')]),
    ('source-voltage-over-35kv', 'voltage = "480 V delta"', 'voltage = "69 kV delta"',
     [("source.voltage got '69 kV delta'; expected a low-voltage system from 100 V to 1000 V line to line or a medium voltage up to 35 kV", '69 kV')]),
    ('panel-voltage-medium', 'load = "20 kVA"', 'load = "20 kVA"\nvoltage = "13.8 kV"',
     [("panel[2].voltage got '13.8 kV'; expected a low-voltage system from 100 V to 1000 V line to line (medium voltage only at the source and a transformer's primary)", '13.8 kV')]),
    ('voltage-unparseable', 'voltage = "480 V delta"', 'voltage = "480 Volts-ish"',
     [(f"source.voltage got '480 Volts-ish'; expected {VSYS}", 'Volts-ish')]),
    ('wye-ratio-wrong', 'secondary = "208Y/120 V"', 'secondary = "208Y/100 V"',
     [(f"transformer[1].secondary got '208Y/100 V'; expected {VSYS} (line voltage ≈ √3 × neutral voltage)", '208Y/100 V')]),
    ('rooftop-negative', 'sets = 1', 'sets = 1\nrooftop_height = "-1 in"',
     [("run[1].rooftop_height got '-1 in'; expected a height above the roof of zero or more", 'rooftop_height')]),
    ('flag-not-bool', 'sets = 1', 'sets = 1\nharmonic_neutral = "yes"',
     [("run[1].harmonic_neutral got 'yes'; expected true or false", 'harmonic_neutral')]),
    ('tap-off-step', 'secondary_device = "400 A"', 'secondary_device = "400 A"\ntap = "+3 %"',
     [("transformer[1].tap got '+3 %'; expected a no-load tap of -5, -2.5, 0, +2.5 or +5 %", 'tap =')]),
    ('tap-unsigned', 'secondary_device = "400 A"', 'secondary_device = "400 A"\ntap = "2.5 %"',
     [("transformer[1].tap got '2.5 %'; expected a signed no-load tap, \"+2.5 %\" (above normal: lowers the secondary, as on the nameplate) or \"-2.5 %\" (below normal: raises it), or \"0\"; an unsigned tap and the words boost, buck, raise, lower and ± are ambiguous", 'tap =')]),
    ('tap-boost', 'secondary_device = "400 A"', 'secondary_device = "400 A"\ntap = "2.5 % boost"',
     [("transformer[1].tap got '2.5 % boost'; expected a signed no-load tap, \"+2.5 %\" (above normal: lowers the secondary, as on the nameplate) or \"-2.5 %\" (below normal: raises it), or \"0\"; an unsigned tap and the words boost, buck, raise, lower and ± are ambiguous", 'tap =')]),
    ('size-5-0', 'conductors = "500 kcmil Cu"', 'conductors = "5/0 AWG Cu"',
     [(f"run[1].conductors got '5/0 AWG Cu'; expected {SIZES} — did you mean '4/0 AWG' or '3/0 AWG'?", '5/0')]),
    ('size-bare-250', 'conductors = "500 kcmil Cu"', 'conductors = "250 Cu"',
     [(f"run[1].conductors got '250 Cu'; expected {SIZES} — did you mean '250 kcmil'?", '250 Cu')]),
    ('size-ambiguous-10', 'conductors = "2 AWG Cu"', 'conductors = "10 Cu"',
     [("run[2].conductors got '10 Cu'; expected a size with its system, e.g. '10 AWG' or '10 mm2'", '10 Cu')]),
    ('size-odd-kcmil', 'conductors = "500 kcmil Cu"', 'conductors = "255 kcmil Cu"',
     [(f"run[1].conductors got '255 kcmil Cu'; expected {SIZES} — did you mean '250 kcmil' or '300 kcmil'?", '255 kcmil')]),
    ('size-16-awg', 'conductors = "2 AWG Cu"', 'conductors = "16 AWG Cu"',
     [(f"run[2].conductors got '16 AWG Cu'; expected {SIZES} — did you mean '6 AWG' or '1 AWG'?", '16 AWG')]),
    ('size-96-mm2', 'conductors = "500 kcmil Cu"', 'conductors = "96 mm2 Cu"',
     [(f"run[1].conductors got '96 mm2 Cu'; expected {SIZES} — did you mean '95 mm2' or '120 mm2'?", '96 mm2')]),
    ('size-no-material', 'conductors = "500 kcmil Cu"', 'conductors = "500 kcmil"',
     [("run[1].conductors got '500 kcmil'; expected a size followed by its material, e.g. '4/0 AWG Cu' or '95 mm2 Al'", 'conductors = "500 kcmil"')]),
    ('size-unknown-material', 'conductors = "500 kcmil Cu"', 'conductors = "500 kcmil Fe"',
     [("run[1].conductors got '500 kcmil Fe'; expected a size followed by its material, e.g. '4/0 AWG Cu' or '95 mm2 Al'", '500 kcmil Fe')]),
    ('ground-number', 'ground = "3 AWG Cu"', 'ground = 3',
     [("run[1].ground got '3'; expected a size and material in quotes, e.g. '4/0 AWG Cu'", 'ground = 3')]),
    ('raceway-unknown', 'raceway = "steel"', 'raceway = "plastic"',
     [("run[1].raceway got 'plastic'; expected one of steel, aluminum, pvc, cable, free-air", 'plastic')]),
    ('insulation-105', 'insulation = "75 degC"', 'insulation = "105 degC"',
     [("run[1].insulation got '105 degC'; expected '60 degC', '75 degC', '90 degC' or an insulation type such as 'THHN' or 'XHHW-2'", '105 degC')]),
    ('unknown-to', 'to = "PB"', 'to = "PX"',
     [(f"run[2].to got 'PX'; expected {NODE}", 'to = "PX"'), ("panel[2].id got 'PB'; expected a [[run]] with to = 'PB' feeding it", 'id = "PB"')]),
    ('unknown-from-case', 'from = "PA"', 'from = "pa"',
     [(f"run[2].from got 'pa'; expected {NODE}", 'from = "pa"')]),
    ('duplicate-id', 'id = "W-B"', 'id = "PA"',
     [("panel[1].id got 'PA'; expected a unique id (run[2] has it already)", 'id = "PA"')]),
    ('reserved-id', 'id = "TX1"', 'id = "source"',
     [("transformer[1].id got 'source'; expected an id other than 'source' (reserved)", 'id = "source"'), (f"run[1].from got 'TX1'; expected {NODE}", 'from = "TX1"')]),
    ('id-with-space', 'id = "PB"', 'id = "P B"',
     [("panel[2].id got 'P B'; expected an id of letters, digits, '-', '_' or '.' (at most 40, starting with a letter or digit)", 'id = "P B"'), (f"run[2].to got 'PB'; expected {NODE} — did you mean 'P B'?", 'to = "PB"')]),
    ('run-to-itself', 'to = "PB"', 'to = "PA"',
     [("run[2].to got 'PA'; expected a different element than its 'from'", ('to = "PA"', 2)), ("run[2].to got 'PA'; expected one run into 'PA' (radial feed; run[1] feeds it)", ('to = "PA"', 2)), ("panel[2].id got 'PB'; expected a [[run]] with to = 'PB' feeding it", 'id = "PB"')]),
    ('service-run-ground', 'from = "TX1"', 'from = "source"',
     [("run[1].ground got '3 AWG Cu'; expected no ground on service conductors (from = 'source'): state their grounded conductor as neutral (250.24(C)); the electrode conductor and main bonding jumper go under [source]", 'ground = "3 AWG Cu"')]),
    ('panel-voltage-mismatch', 'interrupting = "10 kA"', 'interrupting = "10 kA"\nvoltage = "120/240 V"',
     [("panel[2].voltage got '120/240 V'; expected the voltage of the feed that reaches it (208Y/120 V)", '120/240 V')]),
    ('primary-voltage-mismatch', 'primary = "480 V delta"', 'primary = "208Y/120 V"',
     [("transformer[1].primary got '208Y/120 V'; expected the voltage of what feeds it (480 V delta)", 'primary = "208Y/120 V"')]),
    ('phases-mismatch', 'secondary = "208Y/120 V"', 'secondary = "120/240 V"',
     [("transformer[1].secondary got '120/240 V'; expected a 3-phase secondary like the 3-phase primary (480 V delta)", '120/240 V')]),
    ('misspelt-key', 'rating = "100 A"', 'ratting = "100 A"',
     [("panel[2].ratting got 'ratting'; expected one of the keys id, rating, main_device, interrupting, voltage, schedule, load, continuous, power_factor, instantaneous_trip, occupancy, area, device_type, columns, phases_connected, series_rating, series_upstream, series_upstream_device — did you mean 'rating'?", 'ratting'), ("panel[2].rating got (missing); expected a value for 'rating' (required)", ('[[panel]]', 2))]),
    ('missing-required', 'primary_device = "175 A"\n', '',
     [("transformer[1].primary_device got (missing); expected a value for 'primary_device' (required)", '[[transformer]]')]),
    ('single-bracket-transformer', '[[transformer]]', '[transformer]',
     [("transformer got '[transformer]'; expected [[transformer]] (double brackets: one block per transformer)", '[transformer]'), (f"run[1].from got 'TX1'; expected {NODE}", 'from = "TX1"')]),
    ('rules-unknown', 'prepared_by = "Test fixture"', 'rules = "eu"',
     [("project.rules got 'eu'; expected 'na' (the rule set shipped in tables/; use --tables DIR for local amendments)", 'rules = "eu"')]),
    ('schedule-absolute', 'load = "20 kVA"', 'load = "20 kVA"\nschedule = "/etc/passwd"',
     [(f"panel[2].schedule got '/etc/passwd'; expected {INSIDE}", '/etc/passwd')]),
    ('schedule-dotdot', 'load = "20 kVA"', 'load = "20 kVA"\nschedule = "../x.csv"',
     [(f"panel[2].schedule got '../x.csv'; expected {INSIDE}", '../x.csv')]),
    ('schedule-backslash', 'load = "20 kVA"', 'load = "20 kVA"\nschedule = "C:\\\\x.csv"',
     [(f"panel[2].schedule got 'C:\\\\x.csv'; expected {INSIDE} written with '/' between folders", 'schedule =')]),
    ('schedule-kind', 'load = "20 kVA"', 'load = "20 kVA"\nschedule = "pb.txt"',
     [("panel[2].schedule got 'pb.txt'; expected a .csv or .xlsx schedule file", 'pb.txt')]),
]
# fmt: on


@pytest.mark.parametrize(
    ("old", "new", "expected"), [c[1:] for c in CASES], ids=[c[0] for c in CASES]
)
def test_bad_job(tmp_path, old, new, expected):
    assert GOOD.count(old) >= 1, old
    text = GOOD.replace(old, new, 1)
    job = tmp_path / "job.toml"
    job.write_text(text, encoding="utf-8")
    out = tmp_path / "out.json"
    r = cli("check", job, "--format", "json", "--out", out)
    lines = assert_rejected(r, out, n=len(expected))
    want = [
        f"error: {job}:{line_of(text, at)}: {tail}" if at else f"error: {job}: {tail}"
        for tail, at in expected
    ]
    assert sorted(lines) == sorted(want)


def test_case_count_and_ids_unique():
    ids = [c[0] for c in CASES]
    assert len(ids) == len(set(ids)) and len(ids) >= 60


def test_missing_schedule_file(tmp_path):
    text = GOOD.replace('load = "20 kVA"', 'load = "20 kVA"\nschedule = "pb.csv"')
    job = tmp_path / "job.toml"
    job.write_text(text, encoding="utf-8")
    r = cli("check", job)
    (line,) = assert_rejected(r, n=1)
    assert line == (
        f"error: {job}:{line_of(text, 'pb.csv')}: panel[2].schedule got 'pb.csv'; "
        f"expected an existing schedule file in {tmp_path} (not found)"
    )


def test_all_problems_in_one_run(tmp_path):
    """Eight independent mistakes: eight messages, one run, in file order per section."""
    text = (
        GOOD.replace('length = "60 ft"', 'length = "60"')
        .replace('impedance = "4.6 %"', 'impedance = "4.6 kVA"')
        .replace('to = "PB"', 'to = "PX"')
        .replace('raceway = "pvc"', 'raceway = "clay"')
        .replace("power_factor = 0.9", "power_factor = 9")
        .replace('conductors = "2 AWG Cu"', 'conductors = "2 AWG"')
        .replace("x_r = 5", "x_r = -5")
        .replace('name = "Orchard', 'nmae = "Orchard')
    )
    job = tmp_path / "job.toml"
    job.write_text(text, encoding="utf-8")
    out = tmp_path / "r.csv"
    r = cli("check", job, "--format", "csv", "--out", out)
    lines = assert_rejected(r, out)
    keys = [ln.split(": ", 2)[2].split(" got ")[0] for ln in lines]
    for k in (
        "run[1].length",
        "transformer[1].impedance",
        "run[2].to",
        "run[2].raceway",
        "panel[1].power_factor",
        "run[2].conductors",
        "source.x_r",
        "project.nmae",
        "project.name",
    ):
        assert k in keys, (k, lines)
