"""Bad, broken and hostile input: shared job text and helpers for the catalogue tests.

The job below is an invented scenario (no real site, firm or person) used only as a
valid starting point that each case breaks in one place; it is never an oracle for a
computed value.
"""

from __future__ import annotations

from pathlib import Path

from click.testing import CliRunner, Result

GOOD = """\
[project]
name = "Orchard Row test bench (invented)"
prepared_by = "Test fixture"

[source]
voltage = "480 V delta"
phases = 3
available_fault = "25 kA"
x_r = 5

[[transformer]]
id = "TX1"
from = "source"
rating = "112.5 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "4.6 %"
x_r = 4
primary_device = "175 A"
secondary_device = "400 A"

[[run]]
id = "W-A"
from = "TX1"
to = "PA"
length = "60 ft"
conductors = "500 kcmil Cu"
sets = 1
insulation = "75 degC"
raceway = "steel"
ambient = "30 degC"
current_carrying = 3
ground = "3 AWG Cu"
device = "400 A"

[[panel]]
id = "PA"
rating = "400 A"
main_device = "400 A"
interrupting = "22 kA"
load = "60 kVA"
continuous = "20 kVA"
power_factor = 0.9

[[run]]
id = "W-B"
from = "PA"
to = "PB"
length = "120 ft"
conductors = "2 AWG Cu"
raceway = "pvc"
ground = "8 AWG Cu"
device = "100 A"

[[panel]]
id = "PB"
rating = "100 A"
main_device = "100 A"
interrupting = "10 kA"
load = "20 kVA"
"""


def cli(*args: str) -> Result:
    """Run the feedcheck CLI in-process; stdout and stderr are kept apart."""
    from feedcheck.cli import main

    return CliRunner().invoke(main, [str(a) for a in args])


def error_lines(result: Result) -> list[str]:
    return [ln for ln in result.stderr.splitlines() if ln.startswith("error: ")]


def assert_no_traceback(result: Result) -> None:
    exc = result.exception
    assert exc is None or isinstance(exc, SystemExit), repr(exc)
    assert "Traceback" not in result.output


def assert_rejected(result: Result, out: Path | None = None, n: int | None = None) -> list[str]:
    """Exit 2, a message per problem on stderr, nothing on stdout, no output file."""
    assert_no_traceback(result)
    assert result.exit_code == 2, (result.exit_code, result.output)
    assert result.stdout == ""
    lines = error_lines(result)
    assert lines, result.stderr
    if n is not None:
        assert len(lines) == n, lines
        word = "problem" if n == 1 else "problems"
        assert result.stderr.rstrip().endswith(f"{n} {word} in the input; nothing was written.")
    if out is not None:
        assert not out.exists()
        assert not list(out.parent.glob(f".{out.name}.*.part"))
    return lines


def line_of(text: str, fragment: str | tuple[str, int]) -> int:
    """1-based number of the line where ``fragment`` appears in ``text``; a tuple
    ``(fragment, n)`` picks its n-th appearance."""
    frag, nth = fragment if isinstance(fragment, tuple) else (fragment, 1)
    pos = -1
    for _ in range(nth):
        pos = text.index(frag, pos + 1)
    return text[:pos].count("\n") + 1
