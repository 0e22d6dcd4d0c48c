"""Bad input of the service and medium-voltage keys (issue 14 items 1 and 2): each case
breaks one valid job in one place and expects one message naming the key, exit 2 and
nothing written. The jobs are invented scenarios (no real site, firm or person), never
an oracle for a computed value."""

from __future__ import annotations

import pytest

from . import assert_rejected, cli, line_of

SERVICE = """\
[project]
name = "Quarry Lane workshop service (invented)"

[source]
voltage = "480Y/277 V"
service_transformer = "750 kVA"
service_impedance = "5.75 %"
service_x_r = 6

[[run]]
id = "SVC"
from = "source"
to = "MDP"
length = "30 ft"
conductors = "350 kcmil Cu"
sets = 3
neutral = "350 kcmil Cu"

[[panel]]
id = "MDP"
rating = "1000 A"
main_device = "800 A"
interrupting = "42 kA"
load = "400 kVA"
"""

MEDIUM = """\
[project]
name = "Quarry Lane substation (invented)"

[source]
voltage = "13.8 kV"
short_circuit = "250 MVA"
x_r = 15

[[transformer]]
id = "TS"
from = "source"
rating = "750 kVA"
primary = "13800 V delta"
secondary = "480Y/277 V"
impedance = "5.75 %"
x_r = 6
primary_device = "65 A"
primary_device_type = "fuse"
secondary_device = "1200 A"

[[run]]
id = "SEC"
from = "TS"
to = "SWB"
length = "20 ft"
conductors = "400 kcmil Cu"
sets = 3
ground = "3/0 AWG Cu"
device = "1200 A"

[[panel]]
id = "SWB"
rating = "1200 A"
main_device = "1200 A"
interrupting = "42 kA"
load = "500 kVA"
"""

# (case id, base job, text to replace, replacement, message tail, line locator)
CASES = [
    ("service-with-fault", SERVICE, "service_x_r = 6", 'service_x_r = 6\navailable_fault = "30 kA"',
     "source.available_fault got '30 kA'; expected no available_fault with service_transformer "
     "(the through-fault is computed from the service transformer; its X/R is service_x_r)",
     "available_fault"),
    ("service-rating-absurd", SERVICE, '"750 kVA"', '"50 MVA"',
     "source.service_transformer got '50 MVA'; expected a service transformer rating from "
     "1 kVA to 10 MVA", "50 MVA"),
    ("service-impedance-missing", SERVICE, 'service_impedance = "5.75 %"\n', "",
     "source.service_impedance got (missing); expected a value for 'service_impedance' "
     "(required)", "[source]"),
    ("service-impedance-absurd", SERVICE, '"5.75 %"', '"75 %"',
     "source.service_impedance got '75 %'; expected a percent impedance from 0.5 % to 25 %",
     "75 %"),
    ("primary-sc-without-x-r", SERVICE, "service_x_r = 6",
     'service_x_r = 6\nprimary_short_circuit = "500 MVA"',
     "source.primary_x_r got (missing); expected the primary system's X/R (e.g. 10) when "
     "finite", "[source]"),
    ("service-key-alone", SERVICE.replace(
        'service_transformer = "750 kVA"\nservice_impedance = "5.75 %"\nservice_x_r = 6',
        'available_fault = "30 kA"\nx_r = 6'), "x_r = 6", 'x_r = 6\nprimary_x_r = 8',
     "source.primary_x_r got '8'; expected this key only with service_transformer", "primary_x_r"),
    ("service-ground", SERVICE, 'neutral = "350 kcmil Cu"', 'ground = "1/0 AWG Cu"',
     "run[1].ground got '1/0 AWG Cu'; expected no ground on service conductors (from = "
     "'source'): state their grounded conductor as neutral (250.24(C)); the electrode "
     "conductor and main bonding jumper go under [source]", "1/0 AWG"),
    ("electrode-conductor-unparseable", SERVICE, "service_x_r = 6",
     'service_x_r = 6\nelectrode_conductor = 4',
     "source.electrode_conductor got '4'; expected a size and material in quotes, e.g. "
     "'4/0 AWG Cu'", "electrode_conductor"),
    ("sc-both-spellings", MEDIUM, 'short_circuit = "250 MVA"',
     'short_circuit = "250 MVA"\nshort_circuit_mva = "250 MVA"',
     "source.short_circuit_mva got '250 MVA'; expected short_circuit alone", "short_circuit_mva"),
    ("medium-voltage-run", MEDIUM, 'secondary_device = "1200 A"\n',
     'secondary_device = "1200 A"\n\n[[run]]\nid = "MV1"\nfrom = "source"\nto = "TS"\n'
     'length = "100 ft"\nconductors = "2 AWG Cu"\n',
     "run[1].from got 'source'; expected a transformer or panel: the source is at 13.8 kV, "
     "and medium-voltage runs are not checked (give the transformer from = 'source' and no "
     "run into it)", 'from = "source"\nto = "TS"'),
    ("series-rating-alone", MEDIUM, 'load = "500 kVA"', 'load = "500 kVA"\nseries_rating = "65 kA"',
     "panel[1].series_upstream got (missing); expected a value with the other series_* keys "
     "(240.86(B))", '[[panel]]'),
    ("primary-device-type", MEDIUM, 'primary_device_type = "fuse"', 'primary_device_type = "relay"',
     "transformer[1].primary_device_type got 'relay'; expected 'fuse' or 'breaker'", "relay"),
    ("mv-electrode-conductor", MEDIUM, "x_r = 15", 'x_r = 15\nelectrode_conductor = "2/0 AWG Cu"',
     "source.electrode_conductor got '2/0 AWG Cu'; expected no electrode_conductor at a "
     "medium-voltage source", "electrode_conductor"),
]  # fmt: skip


@pytest.mark.parametrize(
    ("base", "old", "new", "tail", "at"), [c[1:] for c in CASES], ids=[c[0] for c in CASES]
)
def test_bad_topology_key(tmp_path, base, old, new, tail, at):
    assert base.count(old) >= 1, old
    text = base.replace(old, new, 1)
    job = tmp_path / "job.toml"
    job.write_text(text, encoding="utf-8")
    out = tmp_path / "out.json"
    r = cli("check", job, "--format", "json", "--out", out)
    (line,) = assert_rejected(r, out, n=1)
    where = f"{job}:{line_of(text, at)}" if at else f"{job}"
    assert line == f"error: {where}: {tail}"


@pytest.mark.parametrize("base", [SERVICE, MEDIUM], ids=["service", "medium"])
def test_the_valid_jobs_check(tmp_path, base):
    job = tmp_path / "job.toml"
    job.write_text(base, encoding="utf-8")
    r = cli("check", job, "--format", "json")
    assert r.exit_code in (0, 1), r.output


def test_a_table_as_panel_id_beside_a_service_run(tmp_path):
    # found by tests/fuzz/fuzz_inputs.py: a panel id that is a table, with a run from the
    # source, once raised a TypeError while the service-run rule looked for panels
    text = SERVICE.replace('id = "MDP"', "id = {}", 1)
    job = tmp_path / "job.toml"
    job.write_text(text, encoding="utf-8")
    lines = assert_rejected(cli("check", job))
    assert any("panel[1].id" in ln for ln in lines), lines
