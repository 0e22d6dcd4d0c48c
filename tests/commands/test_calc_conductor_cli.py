"""CLI: feedcheck calc ampacity / size, through click's CliRunner on the command objects."""

import math

import pytest
from click.testing import CliRunner

from feedcheck import CAUTION
from feedcheck.commands.calc_conductor import ampacity_command, size_command


@pytest.fixture
def runner():
    return CliRunner()


def test_ampacity_brief_example(runner):
    r = runner.invoke(
        ampacity_command,
        [
            "--size",
            "3/0 AWG",
            "--material",
            "cu",
            "--insulation",
            "90degC",
            "--ambient",
            "40degC",
            "--current-carrying",
            "6",
            "--termination",
            "75degC",
        ],
    )
    assert r.exit_code == 0, r.output
    out = r.stdout
    # hand: 225 × √(50/60) × 0.8 = 164.3 A (NFPA 70 T310.16, 310.15(B)(1), T310.15(C)(1))
    assert f"{225 * math.sqrt(50 / 60) * 0.8:.1f} A" in out
    for piece in (
        "225.0 A",
        "0.913",
        "0.800",
        "200.0 A",
        "[nec-310.16]",
        "[adj-4-6]",
        "[term-75c-over-100a]",
    ):
        assert piece in out
    assert CAUTION in r.stderr


def test_ampacity_continuous_lines(runner):
    r = runner.invoke(
        ampacity_command, ["--size", "3/0 AWG", "--insulation", "90degC", "--continuous", "170A"]
    )
    assert r.exit_code == 0
    assert "212.5 A -> NOT MET" in r.stdout  # 1.25 × 170 > 200 A at 75 °C


@pytest.mark.parametrize(
    "args,msg",
    [
        (["--size", "3/0 AWG", "--insulation", "80degC"], "60, 75 or 90"),
        (["--size", "7 AWG"], "size"),
        (["--size", "2 AWG", "--sets", "2"], "1/0"),
        (["--size", "4/0 AWG", "--ambient", "95degC", "--insulation", "90degC"], "ambient"),
        (["--size", "4/0 AWG", "--material", "fe"], "material"),
    ],
)
def test_ampacity_bad_input_exit_2(runner, args, msg):
    r = runner.invoke(ampacity_command, args)
    assert r.exit_code == 2
    assert msg in r.stderr
    assert "Traceback" not in r.output


def test_size_names_governing(runner):
    r = runner.invoke(
        size_command,
        [
            "--continuous",
            "150A",
            "--noncontinuous",
            "30A",
            "--insulation",
            "90degC",
            "--ambient",
            "40degC",
            "--current-carrying",
            "6",
            "--length",
            "120 ft",
            "--voltage",
            "208V",
            "--fault",
            "18kA",
            "--clearing",
            "0.05s",
        ],
    )
    assert r.exit_code == 0, r.output
    assert "Selected: 1 × 250 kcmil cu on a 225 A device" in r.stdout
    assert "Governing criterion: protection" in r.stdout
    assert "voltage drop" in r.stdout and "withstand" in r.stdout


@pytest.mark.parametrize(
    "args,msg",
    [
        ([], "give a load"),
        (["--continuous", "100A", "--fault", "10kA"], "--fault and --clearing"),
        (["--continuous", "100A", "--length", "10 m"], "--length and --voltage"),
        (["--continuous", "100A", "--device", "100A"], "device_a"),
        (["--continuous", "100A", "--length", "10 m", "--voltage", "lots"], "--voltage"),
    ],
)
def test_size_bad_input_exit_2(runner, args, msg):
    r = runner.invoke(size_command, args)
    assert r.exit_code == 2
    assert msg in r.stderr


@pytest.mark.parametrize("cmd", [ampacity_command, size_command])
def test_help_has_example_and_caution(runner, cmd):
    r = runner.invoke(cmd, ["--help"])
    assert r.exit_code == 0
    assert "Example:" in r.stdout and "feedcheck calc" in r.stdout
    assert "licensed electrician" in r.stdout
