# ruff: noqa: E501  (expected messages are quoted whole; wrapping them hides them)
"""Bad ``[[motor]]`` blocks: what Tables 430.248 / 430.250 cannot answer, and a
locked-rotor current below the full-load current, are input errors (exit code 2,
nothing written), each naming the key, the value and what is accepted.

The table facts the messages rest on (NFPA 70-2023 Tables 430.248 and 430.250, values
unchanged since the 1999 edition as far as the copies in tests/reference/tables show):
Table 430.250 lists 10 hp and 15 hp but nothing between; it ends at 500 hp; its
columns are 115, 200, 208, 230, 460, 575 and 2300 V, and its notes permit the 460 V
column for 440–480 V systems (no column serves 277 V or 380 V). Table 430.248 ends at
10 hp. 15 hp three-phase at 208 V: 46.2 A (Table 430.250).
"""

from __future__ import annotations

import pytest

from . import GOOD, assert_rejected, cli, line_of

MOTOR = """
[[motor]]
id = "M1"
panel = "PB"
hp = 15
"""

# (case id, text to replace in MOTOR, replacement, message tail, line locator)
CASES = [
    (
        "hp-between-rows",
        "hp = 15",
        "hp = 12",
        "motor[1].hp got '12'; expected a rating Table 430.250 (NFPA 70, 430.6(A)(1)) lists: hp: got 12 hp; expected a table row (between 10 and 15 hp: give the motor's rated horsepower)",
        "hp = 12",
    ),
    (
        "hp-beyond-table",
        "hp = 15",
        "hp = 600",
        "motor[1].hp got '600'; expected a rating Table 430.250 (NFPA 70, 430.6(A)(1)) lists: hp: got 600 hp; the table ends at 500 hp (use the nameplate and the maker's data)",
        "hp = 600",
    ),
    (
        "hp-and-kw",
        "hp = 15",
        "hp = 15\nkw = 11",
        "motor[1].kw got '11'; expected either hp or kw, not both",
        "kw = 11",
    ),
    (
        "single-phase-beyond-table",
        "hp = 15",
        "hp = 15\nphases = 1",
        "motor[1].hp got '15'; expected a rating Table 430.248 (NFPA 70, 430.6(A)(1)) lists: hp: got 15 hp; the table ends at 10 hp (use the nameplate and the maker's data)",
        "hp = 15",
    ),
    (
        "voltage-not-the-panels",
        "hp = 15",
        'hp = 15\nvoltage = "460 V"',
        "motor[1].voltage got '460 V'; expected a rated motor voltage within 10 % of panel PB's 208 V (208Y/120 V)",
        'voltage = "460 V"',
    ),
    (
        "locked-rotor-below-table-flc",
        "hp = 15",
        'hp = 15\nlocked_rotor = "40 A"',
        "motor[1].locked_rotor got '40 A'; expected a locked-rotor current at least the table full-load current (46.2 A, Table 430.250); typically 5 to 8 times it",
        'locked_rotor = "40 A"',
    ),
    (
        "locked-rotor-below-nameplate",
        "hp = 15",
        'full_load = "30.8 A"\nlocked_rotor = "20 A"',
        "motor[1].locked_rotor got '20 A'; expected a locked-rotor current at least the full-load current (30.8 A); typically 5 to 8 times it",
        'locked_rotor = "20 A"',
    ),
    (
        "no-rating",
        "hp = 15",
        'device = "60 A"',
        "motor[1].hp got (missing); expected the motor's horsepower (e.g. hp = 10) or kw, or its full_load",
        "[[motor]]",
    ),
    (
        "bad-device-type",
        "hp = 15",
        'hp = 15\ndevice_type = "fast fuse"',
        "motor[1].device_type got 'fast fuse'; expected one of inverse-time-breaker, instantaneous-breaker, time-delay-fuse, nontime-delay-fuse",
        'device_type = "fast fuse"',
    ),
    (
        "three-phase-on-single-phase-panel",
        "hp = 15",
        "hp = 15\nphases = 2",
        "motor[1].phases got '2'; expected 1 or 3",
        "phases = 2",
    ),
]


@pytest.mark.parametrize(("case", "old", "new", "tail", "at"), CASES, ids=[c[0] for c in CASES])
def test_bad_motor(tmp_path, case, old, new, tail, at):
    text = GOOD + MOTOR.replace(old, new, 1)
    job = tmp_path / "job.toml"
    job.write_text(text, encoding="utf-8")
    out = tmp_path / "out.json"
    r = cli("check", job, "--format", "json", "--out", out)
    (line,) = assert_rejected(r, out, n=1)
    assert line == f"error: {job}:{line_of(text, at)}: {tail}"


def test_motor_by_hp_alone_is_accepted(tmp_path):
    """A motor given by horsepower alone checks (exit 0 or 1, not 2)."""
    job = tmp_path / "job.toml"
    job.write_text(GOOD + MOTOR, encoding="utf-8")
    r = cli("check", job, "--format", "json")
    assert r.exit_code in (0, 1), r.output


def test_voltage_no_table_column(tmp_path):
    """277 V: no column of Table 430.248 (115, 200, 208, 230 V) serves it, and the notes'
    ranges (110–120, 220–240 V) do not reach it (NFPA 70-2023 Table 430.248, from memory)."""
    text = GOOD.replace('secondary = "208Y/120 V"', 'secondary = "480Y/277 V"').replace(
        'secondary_device = "400 A"', 'secondary_device = "150 A"'
    ) + MOTOR.replace("hp = 15", 'hp = 2\nphases = 1\nvoltage = "277 V"')
    job = tmp_path / "job.toml"
    job.write_text(text, encoding="utf-8")
    r = cli("check", job)
    (line,) = assert_rejected(r, n=1)
    at = line_of(text, 'voltage = "277 V"')
    assert line.startswith(
        f"error: {job}:{at}: motor[1].voltage got '277 V'; expected a voltage Table 430.248 (NFPA 70, 430.6(A)(1)) has a column for: "
    )


def test_template_motor_block_uncommented_checks(tmp_path):
    """`feedcheck init`'s commented [[motor]] block, uncommented, is a valid motor:
    10 hp at 200 V is 32.2 A (NFPA 70 Table 430.250, 2008 copy; 2023 from memory), so the
    disconnect needs 1.15 × 32.2 = 37.03 A (430.110(A))."""
    import json

    from feedcheck.template import TEMPLATE

    lines, on = [], False
    for line in TEMPLATE.splitlines():
        on = (on or line.startswith("# [[motor]]")) and not line.startswith("# [options]")
        lines.append(line[2:] if on and line.startswith("# ") else line)
    job = tmp_path / "job.toml"
    job.write_text("\n".join(lines), encoding="utf-8")
    r = cli("check", job, "--format", "json")
    assert r.exit_code in (0, 1), r.output
    doc = json.loads(r.stdout)
    f = next(
        x for x in doc["findings"] if x["subject"] == "EF-1" and x["check"] == "disconnect rating"
    )
    assert f["limit"] == pytest.approx(1.15 * 32.2)
