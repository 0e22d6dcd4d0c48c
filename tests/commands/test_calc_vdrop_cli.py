"""``feedcheck calc voltage-drop`` through click's CliRunner."""

from __future__ import annotations

import math
import re

import pytest
from click.testing import CliRunner

from feedcheck import CAUTION
from feedcheck.commands.calc_vdrop import voltage_drop_command

BASE = [
    "--current",
    "150A",
    "--length",
    "200 ft",
    "--size",
    "3/0 AWG",
    "--material",
    "cu",
    "--raceway",
    "steel",
    "--system",
    "208Y/120 V",
    "--pf",
    "0.9",
]


def run(args):
    return CliRunner().invoke(voltage_drop_command, args)


def figures(output: str) -> dict[str, tuple[float, float]]:
    got = {}
    m = re.search(r"= ([\d.]+) V  \(([\d.]+) % of", output)
    got["approx"] = (float(m.group(1)), float(m.group(2)))
    m = re.search(r"Exact phasor: VD = ([\d.]+) V  \(([\d.]+) %", output)
    got["exact"] = (float(m.group(1)), float(m.group(2)))
    return got


def test_table9_hand_value_three_phase():
    """250 kcmil Cu in steel, NFPA 70-2023 Ch. 9 Table 9: R 0.054, XL 0.052 Ω/kft at
    75 °C. 200 A, pf 0.85, 300 ft, 480 V three-phase: √3·200·(0.054·0.85 + 0.052·0.5268)·0.3."""
    hand = math.sqrt(3) * 200 * (0.054 * 0.85 + 0.052 * math.sqrt(1 - 0.85**2)) * 0.300
    res = run(
        [
            "--current",
            "200 A",
            "--length",
            "300 ft",
            "--size",
            "250 kcmil",
            "--system",
            "480 V delta",
            "--pf",
            "0.85",
        ]
    )
    assert res.exit_code == 0, res.output
    f = figures(res.output)
    assert f["approx"][0] == pytest.approx(hand, abs=0.0005 + 1e-3 * hand)
    assert f["approx"][1] == pytest.approx(100 * hand / 480, abs=0.005)
    assert f["exact"][0] >= f["approx"][0]
    assert "k × I × (R cos θ + X sin θ) × L / sets" in res.output
    assert CAUTION in res.output


def test_example_from_help_with_max_length_and_units():
    res = run([*BASE, "--limit", "3%", "--max-length"])
    assert res.exit_code == 0, res.output
    # 3/0 AWG Cu in steel, NFPA 70 Ch. 9 Table 9: R 0.079, XL 0.052 Ω/kft
    ze = 0.079 * 0.9 + 0.052 * math.sqrt(1 - 0.81)
    hand = math.sqrt(3) * 150 * ze * 0.200
    assert figures(res.output)["approx"][0] == pytest.approx(hand, abs=0.0005 + 1e-3 * hand)
    m = re.search(
        r"Longest run within 3 % \(approximate form\): ([\d.]+) m \((\d+) ft\)", res.output
    )
    assert m, res.output
    assert float(m.group(1)) / 0.3048 == pytest.approx(
        0.03 * 208 / (math.sqrt(3) * 150 * ze) * 1000, rel=2e-3
    )
    assert "within" in res.output
    # the same run given in metres gives the same figures
    metric = run([a if a != "200 ft" else "60.96 m" for a in BASE])
    assert figures(metric.output) == figures(run(BASE).output)


def test_sets_halve_the_drop_and_limit_reports_exceedance():
    one = figures(run([*BASE, "--length", "400 ft"]).output)["approx"][0]
    two = figures(run([*BASE, "--length", "400 ft", "--sets", "2"]).output)["approx"][0]
    assert two == pytest.approx(one / 2, abs=0.002)
    res = run([*BASE, "--length", "400 ft", "--limit", "3 %"])
    assert res.exit_code == 0  # informational limits: reported, not an error
    assert "exceeds" in res.output


def test_single_phase_circuits_use_their_nominal():
    res = run(
        [
            "--current",
            "40 A",
            "--length",
            "100 ft",
            "--size",
            "8 AWG",
            "--system",
            "120/240 V",
            "--pf",
            "1",
        ]
    )
    assert res.exit_code == 0, res.output
    assert "circuit 1ph3w" in res.output and "nominal 240 V" in res.output
    # 8 AWG Cu, NFPA 70 Ch. 9 Table 9: R 0.78 Ω/kft; pf 1 → 2·40·0.78·0.1 = 6.24 V
    assert figures(res.output)["approx"][0] == pytest.approx(6.24, abs=0.01)
    ln = run(
        [
            "--current",
            "16 A",
            "--length",
            "100 ft",
            "--size",
            "12 AWG",
            "--pf",
            "1",
            "--system",
            "208Y/120 V",
            "--circuit",
            "ln4w",
        ]
    )
    assert ln.exit_code == 0 and "nominal 120 V" in ln.output
    # 12 AWG Cu, Table 9: R 2.0 Ω/kft → 2·16·2.0·0.1 = 6.4 V = 5.33 % of 120 V
    assert figures(ln.output)["approx"] == pytest.approx((6.4, 5.33), abs=0.01)


@pytest.mark.parametrize(
    "args, text",
    [
        ([*BASE[:2], "--length", "200", *BASE[4:]], "length"),
        ([*BASE[:2], "--length", "200 kg", *BASE[4:]], "length"),
        ([*BASE, "--pf", "1.3"], "pf"),
        ([*BASE, "--circuit", "1ph3w"], "1ph3w"),
        (
            [
                "--current",
                "150A",
                "--length",
                "200 ft",
                "--size",
                "3/0 AWG",
                "--system",
                "480 V delta",
                "--circuit",
                "ln4w",
            ],
            "neutral",
        ),
        (
            ["--current", "150A", "--length", "200 ft", "--size", "13 AWG", "--system", "480 V"],
            "size",
        ),
        ([*BASE, "--sets", "0"], "sets"),
        (
            [
                "--current",
                "5000 A",
                "--length",
                "2000 ft",
                "--size",
                "12 AWG",
                "--system",
                "208Y/120 V",
            ],
            "cannot be delivered",
        ),
    ],
)
def test_bad_input_exits_2(args, text):
    res = run(args)
    assert res.exit_code == 2
    assert text in (res.output + res.stderr)
    assert "Traceback" not in res.output + res.stderr


def test_help_has_example_and_caution():
    res = run(["--help"])
    assert res.exit_code == 0
    assert "feedcheck calc voltage-drop --current" in res.output
    assert "licensed electrician or engineer" in res.output
