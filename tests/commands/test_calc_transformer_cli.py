"""``feedcheck calc rated-current`` and ``calc regulation`` live in
commands/calc_transformer.py; cli.py only assembles the groups."""

from __future__ import annotations

import math

import pytest
from click.testing import CliRunner

from feedcheck import cli
from feedcheck.commands import calc_transformer


def test_registered_from_their_own_module():
    calc = cli.main.commands["calc"]
    assert calc.commands["rated-current"] is calc_transformer.rated_current_command
    assert calc.commands["regulation"] is calc_transformer.regulation_command
    assert not hasattr(cli, "rated_current_cmd") and not hasattr(cli, "regulation_cmd")


def test_rated_current_figure():
    r = CliRunner().invoke(
        cli.main, ["calc", "rated-current", "--rating", "45kVA", "--voltage", "480V"]
    )
    assert r.exit_code == 0, r.output
    # I = S / (√3 · V_LL), IEEE Std 141-1993 ch. 3
    assert float(r.output.split(" A")[0]) == pytest.approx(45e3 / (math.sqrt(3) * 480), abs=0.05)
