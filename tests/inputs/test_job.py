"""Reading and validating job files: the samples load; bad files give exit-2 problems."""

import pytest

from feedcheck.errors import InputError
from feedcheck.inputs.job_file import read_job

GOOD = """
[project]
name = "Test job"

[source]
voltage = "480 V delta"
available_fault = "30 kA"
x_r = 6

[[transformer]]
id = "T1"
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5 %"
primary_device = "110 A"
secondary_device = "250 A"

[[run]]
id = "R1"
from = "T1"
to = "P1"
length = "50 ft"
conductors = "4/0 AWG Cu"
ground = "4 AWG"
device = "250 A"

[[panel]]
id = "P1"
rating = "225 A"
main_device = "225 A"
interrupting = "22 kA"
load = "40 kVA"
"""


def test_samples_load(samples):
    for p in sorted(samples.glob("*.toml")):
        job = read_job(p)
        assert job.transformers and job.panels


def test_good_job_reads_si_values(write_job):
    job = read_job(write_job(GOOD))
    assert job.runs[0].length_m == pytest.approx(15.24)  # 50 ft × 0.3048 m/ft
    assert job.runs[0].size.name == "4/0 AWG"
    assert job.runs[0].ground.name == "4 AWG" and job.runs[0].ground_material == "cu"
    assert job.transformers[0].rating_va == 75_000
    assert job.source.fault_a == 30_000


def _problems(write_job, text):
    with pytest.raises(InputError) as ei:
        read_job(write_job(text))
    return [str(p) for p in ei.value.problems]


BAD = [
    # (replace this, with this, expected fragment of the message)
    ('length = "50 ft"', 'length = "75 kVA"', "run[1].length got '75 kVA'; expected a length"),
    ('length = "50 ft"', "length = 50", "run[1].length got '50'; expected a length with a unit"),
    ('length = "50 ft"', 'length = "-50 ft"', "greater than zero"),
    ('length = "50 ft"', 'length = "nan ft"', "not NaN"),
    ('impedance = "5 %"', 'impedance = "900 %"', "transformer[1].impedance got '900 %'"),
    ('conductors = "4/0 AWG Cu"', 'conductors = "255 kcmil Cu"', "did you mean '250 kcmil'"),
    ('conductors = "4/0 AWG Cu"', 'conductors = "4/0 AWG"', "size followed by its material"),
    ('to = "P1"', 'to = "P2"', "run[1].to got 'P2'; expected the id of the source"),
    ('id = "R1"', 'id = "T1"', "a unique id (transformer[1] has it already)"),
    ('rating = "225 A"', 'ratting = "225 A"', "did you mean 'rating'"),
    ('voltage = "480 V delta"', 'voltage = "480 Volts-ish"', "source.voltage got"),
    ('primary_device = "110 A"', "", "transformer[1].primary_device got (missing)"),
    ("raceway_dummy", "", ""),  # placeholder removed below
    ("[[panel]]", "[panel]", ""),
    ('secondary = "208Y/120 V"', 'secondary = "120/240 V"', "3-phase secondary"),
    ('available_fault = "30 kA"', 'available_fault = "30 kVA"', "source.available_fault"),
    ("x_r = 6", 'x_r = "six"', "source.x_r got 'six'"),
    ("[[run]]", "[[run]]\nsets = 2.5", "run[1].sets got '2.5'; expected a whole number"),
    ("[[run]]", '[[run]]\nraceway = "plastic"', "one of steel, aluminum, pvc, cable, free-air"),
    (
        "[[run]]",
        '[[run]]\ninsulation = "105 degC"',
        "'60 degC', '75 degC', '90 degC' or an insulation type",
    ),
    ("[[panel]]", '[[panel]]\nvoltage = "480Y/277 V"', "panel[1].voltage got '480Y/277 V'"),
    ("[[panel]]", '[[panel]]\nschedule = "../../etc/passwd.csv"', "no absolute paths, no '..'"),
    ('length = "50 ft"', 'length = "5 km"', "up to 2000 m"),
]
BAD = [b for b in BAD if b[2]]


@pytest.mark.parametrize(("old", "new", "fragment"), BAD)
def test_bad_job_names_key_and_value(write_job, old, new, fragment):
    text = GOOD.replace(old, new, 1)
    assert text != GOOD
    msgs = _problems(write_job, text)
    assert any(fragment in m for m in msgs), msgs


def test_all_problems_reported_at_once(write_job):
    text = (
        GOOD.replace('length = "50 ft"', 'length = "50"')
        .replace('impedance = "5 %"', 'impedance = "5 kVA"')
        .replace('to = "P1"', 'to = "PX"')
    )
    msgs = _problems(write_job, text)
    assert len(msgs) >= 3


def test_problem_carries_line_number(write_job):
    text = GOOD.replace('length = "50 ft"', 'length = "50"')
    msgs = _problems(write_job, text)
    line = GOOD.splitlines().index('length = "50 ft"') + 1
    assert any(f"job.toml:{line}: run[1].length" in m for m in msgs), msgs


def test_malformed_toml(write_job):
    msgs = _problems(write_job, GOOD.replace('name = "Test job"', 'name = "Test job'))
    line = GOOD.splitlines().index('name = "Test job"') + 1
    assert "valid TOML" in msgs[0] and f":{line}:" in msgs[0]


def test_empty_file(write_job):
    assert "empty file" in _problems(write_job, "")[0]


def test_non_utf8(tmp_path):
    p = tmp_path / "latin.toml"
    p.write_bytes(GOOD.replace("Test job", "Caf\xe9").encode("latin-1"))
    with pytest.raises(InputError, match="UTF-8"):
        read_job(p)


def test_directory_instead_of_file(tmp_path):
    with pytest.raises(InputError, match="not a folder"):
        read_job(tmp_path)


def test_cycle_is_reported(write_job):
    text = (
        GOOD
        + """
[[transformer]]
id = "T2"
from = "P9"
rating = "30 kVA"
primary = "208 V"
secondary = "120/240 V"
impedance = "3 %"
primary_device = "100 A"

[[run]]
id = "R2"
from = "T2"
to = "P9"
length = "10 ft"
conductors = "2 AWG Cu"

[[run]]
id = "R3"
from = "P9"
to = "T2"
length = "10 ft"
conductors = "2 AWG Cu"

[[panel]]
id = "P9"
rating = "100 A"
"""
    )
    msgs = _problems(write_job, text)
    assert any("loop or not connected" in m for m in msgs), msgs


def test_two_runs_into_one_panel(write_job):
    text = (
        GOOD
        + """
[[run]]
id = "R2"
from = "T1"
to = "P1"
length = "10 ft"
conductors = "2 AWG Cu"
"""
    )
    assert any("one run into 'P1'" in m for m in _problems(write_job, text))


def test_panel_without_feed(write_job):
    text = GOOD + '\n[[panel]]\nid = "P2"\nrating = "100 A"\n'
    assert any("feeding it" in m for m in _problems(write_job, text))


def test_source_given_as_short_circuit_power(write_job):
    # I_sc = S_sc / (√3 · V_LL) (IEEE Std 141 ch. 4): 24.94 MVA at 480 V ≈ 30.0 kA
    import math

    text = GOOD.replace('available_fault = "30 kA"', 'short_circuit_mva = "24.94 MVA"')
    job = read_job(write_job(text))
    assert job.source.fault_a == pytest.approx(24.94e6 / (math.sqrt(3) * 480), rel=1e-12)
    assert job.source.fault_a == pytest.approx(30_000, rel=1e-3)
