"""Bad input of the standby source (issue 14 item 4): [generator] and [transfer_switch].
Each case breaks one valid job in one place and expects one message naming the key,
exit 2 and nothing written. The job is an invented scenario (no real site, firm or
person), never an oracle for a computed value."""

from __future__ import annotations

import pytest

from . import assert_rejected, cli, line_of

STANDBY = """\
[project]
name = "Birch Hollow cold store (invented)"

[source]
voltage = "480Y/277 V"
available_fault = "25 kA"
x_r = 6

[[run]]
id = "SVC"
from = "source"
to = "MDP"
length = "30 ft"
conductors = "350 kcmil Cu"
sets = 2
neutral = "350 kcmil Cu"

[[panel]]
id = "MDP"
rating = "600 A"
main_device = "600 A"
interrupting = "35 kA"
load = "200 kVA"

[transfer_switch]
id = "ATS"
panel = "MDP"
rating = "600 A"
withstand = "35 kA"

[generator]
id = "GEN"
rating = "250 kVA"
voltage = "480Y/277 V"
subtransient = "15 %"
x_r = 12
length = "50 ft"
conductors = "500 kcmil Cu"
ground = "1 AWG Cu"
device = "400 A"
"""

# (case id, text to replace, replacement, message tail, line locator)
CASES = [
    ("generator-without-switch", "[transfer_switch]\nid = \"ATS\"\npanel = \"MDP\"\n"
     "rating = \"600 A\"\nwithstand = \"35 kA\"\n", "",
     "transfer_switch got (missing); expected a [transfer_switch] table with the [generator] "
     "(a standby source needs both)", None),
    ("subtransient-missing", 'subtransient = "15 %"\n', "",
     "generator.subtransient got (missing); expected a value for 'subtransient' (required)",
     "[generator]"),
    ("subtransient-absurd", '"15 %"', '"150 %"',
     "generator.subtransient got '150 %'; expected an X\"d from 5 % to 50 %", "150 %"),
    ("generator-rating-absurd", '"250 kVA"', '"50 MVA"',
     "generator.rating got '50 MVA'; expected a generator rating from 1 kVA to 10 MVA",
     "50 MVA"),
    ("generator-kw-above-kva", 'x_r = 12', 'x_r = 12\nkw = "300 kW"',
     "generator.kw got '300 kW'; expected a kW rating above zero and not above the kVA "
     "rating", "300 kW"),
    ("generator-unknown-key", 'x_r = 12', 'x_r = 12\nreactance = "15 %"',
     "generator.reactance got 'reactance'; expected one of the keys id, rating, kw, voltage, "
     "subtransient, x_r, length", "reactance"),
    ("generator-voltage-mismatch", 'voltage = "480Y/277 V"\nsubtransient',
     'voltage = "208Y/120 V"\nsubtransient',
     "generator.voltage got '208Y/120 V'; expected the normal source's voltage "
     "'480Y/277 V' (the switch selects between two feeds of one system)", '"208Y/120 V"'),
    ("switch-panel-unknown", 'panel = "MDP"', 'panel = "MCC"',
     "transfer_switch.panel got 'MCC'; expected the id of a [[panel]] of the job", "MCC"),
    ("switch-panel-a-table", 'panel = "MDP"', "panel = {a = 1}",
     "transfer_switch.panel got \"{'a': 1}\"; expected a non-empty text in quotes",
     "panel = {a = 1}"),
    ("switch-rating-missing", 'rating = "600 A"\nwithstand', 'withstand',
     "transfer_switch.rating got (missing); expected a value for 'rating' (required)",
     "[transfer_switch]"),
    ("switch-withstand-absurd", '"35 kA"\n\n[generator]', '"500 kA"\n\n[generator]',
     "transfer_switch.withstand got '500 kA'; expected a withstand and closing rating from "
     "1 kA to 200 kA", "500 kA"),
    ("switch-id-taken", 'id = "ATS"', 'id = "SVC"',
     "transfer_switch.id got 'SVC'; expected an id no other element of the job uses",
     'id = "SVC"\npanel'),
    ("generator-conductors-missing", 'conductors = "500 kcmil Cu"\n', "",
     "generator.conductors got (missing); expected a value for 'conductors' (required)",
     "[generator]"),
]  # fmt: skip


@pytest.mark.parametrize(
    ("old", "new", "tail", "at"), [c[1:] for c in CASES], ids=[c[0] for c in CASES]
)
def test_bad_standby_key(tmp_path, old, new, tail, at):
    assert STANDBY.count(old) == 1, old
    text = STANDBY.replace(old, new, 1)
    job = tmp_path / "job.toml"
    job.write_text(text, encoding="utf-8")
    out = tmp_path / "out.json"
    r = cli("check", job, "--format", "json", "--out", out)
    (line,) = assert_rejected(r, out, n=1)
    where = f"{job}:{line_of(text, at)}" if at else f"{job}"
    assert line.startswith(f"error: {where}: {tail}"), line


def test_the_valid_standby_job_checks(tmp_path):
    job = tmp_path / "job.toml"
    job.write_text(STANDBY, encoding="utf-8")
    r = cli("check", job, "--format", "json")
    assert r.exit_code in (0, 1), r.output
