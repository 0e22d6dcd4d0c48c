"""``feedcheck calc fault`` through click's CliRunner."""

from __future__ import annotations

import math

import pytest
from click.testing import CliRunner

from feedcheck import CAUTION
from feedcheck.commands.calc_fault import fault_command

BASE = [
    "--rating",
    "75kVA",
    "--primary",
    "480 V delta",
    "--secondary",
    "208Y/120 V",
    "--impedance",
    "5.1%",
    "--x-r",
    "3.5",
]
# the former spellings --kva and --z keep working (hidden aliases)
BASE_OLD = [
    "--kva",
    "75kVA",
    "--primary",
    "480 V delta",
    "--secondary",
    "208Y/120 V",
    "--z",
    "5.1%",
    "--x-r",
    "3.5",
]


def _run(args):
    return CliRunner().invoke(fault_command, args)


def _figure(text, label, section):
    part = text.split(f"At the {section}:")[1]
    line = next(ln for ln in part.splitlines() if ln.strip().startswith(label))
    return float(line.split(label)[1].split("A")[0].replace(",", ""))


def test_infinite_source_terminals_match_formula():
    """At the terminals with an infinite primary: I·100/(%Z·(1 − 0.075)) for the maximum
    (IEEE Std 141-1993 ch. 4; IEEE Std C57.12.00-2021 cl. 9 tolerance) and I·100/(%Z·1.075)
    for the minimum."""
    res = _run(BASE)
    assert res.exit_code == 0, res.output
    rated = 75e3 / (math.sqrt(3) * 208.0)
    assert _figure(res.output, "three-phase maximum", "secondary terminals") == pytest.approx(
        rated * 100 / (5.1 * 0.925), abs=0.6
    )
    assert _figure(res.output, "three-phase minimum", "secondary terminals") == pytest.approx(
        rated * 100 / (5.1 * 1.075), abs=0.6
    )
    assert CAUTION in res.output


def test_full_run_prints_every_figure():
    res = _run(
        [
            *BASE,
            "--source-fault",
            "30kA",
            "--source-x-r",
            "6",
            "--length",
            "95 ft",
            "--size",
            "4/0 AWG",
            "--material",
            "cu",
            "--raceway",
            "steel",
            "--ground",
            "4 AWG",
            "--device",
            "225A",
            "--motor-flc",
            "30A",
        ]
    )
    assert res.exit_code == 0, res.output
    for text in (
        "line-to-ground min",
        "peak (κ·√2·I)",
        "asym. RMS",
        "point-to-point",
        "At the end of run:",
        "with motors",
        "Device 225 A",
    ):
        assert text in res.output
    end_max = _figure(res.output, "three-phase maximum", "end of run")
    term_max = _figure(res.output, "three-phase maximum", "secondary terminals")
    assert end_max < term_max
    assert _figure(res.output, "point-to-point", "end of run") <= end_max


def test_split_phase_secondary():
    res = _run(
        [
            "--rating",
            "50kVA",
            "--primary",
            "480 V",
            "--secondary",
            "120/240 V",
            "--impedance",
            "2.0%",
            "--x-r",
            "1.6",
            "--tolerance",
            "0%",
        ]
    )
    assert res.exit_code == 0, res.output
    i_ll = _figure(res.output, "line-to-line maximum", "secondary terminals")
    assert i_ll == pytest.approx(50e3 / 240 * 100 / 2.0, abs=0.6)  # IEEE Std 141-1993 ch. 4
    # half-winding model: I_LN = S/(V_LN·|1.5·%R + j1.2·%X|/100), fuse makers'
    # point-to-point application literature (common practice, no standard)
    r = 2.0 / math.sqrt(1 + 1.6**2)
    i_ln = 50e3 / (120 * abs(1.5 * r + 1.2j * 1.6 * r) / 100)
    assert 1.33 * i_ll < i_ln < 1.67 * i_ll  # the note's range
    assert _figure(res.output, "line-to-neutral max", "secondary terminals") == pytest.approx(
        i_ln, abs=1
    )


def test_help_has_example_and_caution():
    res = _run(["--help"])
    assert res.exit_code == 0
    assert "Example:" in res.output and "licensed" in res.output


@pytest.mark.parametrize(
    ("extra", "code", "msg"),
    [
        (["--length", "95 ft"], 2, "--length and --size"),
        (["--impedance", "abc"], 2, "--impedance"),
        (["--tolerance", "-5%"], 2, "tolerance_pct"),
        (["--source-fault", "-3kA"], 2, "greater than zero"),
        (["--ground", "4 AWG"], 2, "--ground needs a run"),
    ],
)
def test_bad_input_exit_2(extra, code, msg):
    res = _run([*BASE, *extra])
    assert res.exit_code == code
    assert msg in res.output


def test_registered_in_cli():
    from feedcheck.cli import main

    res = CliRunner().invoke(main, ["calc", "fault", *BASE])
    assert res.exit_code == 0, res.output


def test_former_spellings_give_the_same_figures():
    new = _run([*BASE, "--length", "95 ft", "--size", "4/0 AWG", "--ground", "4 AWG"])
    old = _run([*BASE_OLD, "--length", "95 ft", "--size", "4/0 AWG", "--ground", "4 AWG"])
    assert new.exit_code == old.exit_code == 0, old.output
    assert new.output == old.output


def test_former_spellings_are_hidden_and_named_in_their_errors():
    help_text = _run(["--help"]).output
    assert "--rating" in help_text and "--impedance" in help_text
    assert "--kva" not in help_text.replace("--rating 75kVA", "") and "--z " not in help_text
    bad = _run([*BASE_OLD[:6], "--z", "abc"])
    assert bad.exit_code == 2 and "'--z'" in bad.output


@pytest.mark.parametrize(
    ("args", "msg"),
    [
        ([*BASE, "--kva", "75kVA"], "give --rating once (--kva is its former spelling)"),
        ([*BASE, "--z", "5%"], "give --impedance once (--z is its former spelling)"),
        (BASE[2:], "Missing option '--rating'"),
        ([*BASE[:6], "--x-r", "3.5"], "Missing option '--impedance'"),
    ],
)
def test_both_or_neither_spelling_is_a_usage_error(args, msg):
    res = _run(args)
    assert res.exit_code == 2
    assert msg in res.output


def test_quick_figures_are_the_feed_walk_figures():
    """calc fault runs the checks of `feedcheck check` on an in-memory one-transformer job:
    its figures are the walk's on the same job built by hand (the figures themselves are
    held against IEEE Std 141 ch. 4 and IEC 60909-0 in tests/reference/)."""
    from pathlib import Path

    from feedcheck.calc.sizes import SIZES
    from feedcheck.checks import check_job
    from feedcheck.commands.calc_fault import compute
    from feedcheck.inputs.tree import build_tree
    from feedcheck.model import Job, Options, Panel, Project, Run, Source, Transformer
    from feedcheck.units import parse_voltage_system

    prim, sec = parse_voltage_system("480 V delta"), parse_voltage_system("208Y/120 V")
    length_m = 95 * 0.3048
    source = Source(prim, 30e3, 6.0)
    transformers = (Transformer("T1", "source", 75e3, prim, sec, 5.1, 3.5, 110.0, None),)
    runs = (
        Run(
            "R1",
            "T1",
            "P1",
            length_m,
            SIZES["4/0 AWG"],
            "cu",
            1,
            75.0,
            "steel",
            30.0,
            3,
            SIZES["4 AWG"],
            "cu",
            225.0,
            None,
        ),
    )
    panels = (Panel("P1", 225.0, None, None, None, None, None, 0.0, 1.0),)
    job = Job(
        Path("quick.toml"),
        Project("quick", date="2026-12-02"),
        source,
        transformers,
        runs,
        panels,
        build_tree(source, transformers, runs, panels),
        (),
        Options(impedance_tolerance_pct=7.5),
    )
    nodes = {n.id: n.values for n in check_job(job).nodes}
    quick = compute(
        75e3,
        prim,
        sec,
        5.1,
        3.5,
        30e3,
        6.0,
        7.5,
        "none",
        length_m,
        SIZES["4/0 AWG"],
        "cu",
        "steel",
        1,
        SIZES["4 AWG"],
        None,
        None,
        225.0,
    )["rows"]
    for row, node in zip(quick, ("T1", "P1"), strict=True):
        v = nodes[node]
        for mine, walk in (
            ("max_a", "fault_max_a"),
            ("min_a", "fault_min_a"),
            ("x_r", "x_r"),
            ("peak_a", "peak_a"),
            ("asym_a", "asym_rms_a"),
            ("ptp_a", "fault_ptp_a"),
            ("lg_min_a", "fault_lg_min_a"),
            ("lg_max_a", "fault_lg_max_a"),
            ("duty_a", "fault_duty_a"),
        ):
            assert row[mine] == pytest.approx(v[walk], rel=1e-12), (node, mine)


CHECK_JOB = """
[project]
name = "calc fault vs check (invented)"

[source]
voltage = "480 V delta"
available_fault = "30 kA"
x_r = 6

[[transformer]]
id = "T1"
rating = "75 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "5.1 %"
x_r = 3.5
primary_device = "110 A"

[[run]]
id = "R1"
from = "T1"
to = "P1"
length = "95 ft"
conductors = "4/0 AWG Cu"
raceway = "steel"
ground = "4 AWG Cu"
device = "225 A"

[[panel]]
id = "P1"
rating = "225 A"
load = "10 kVA"

[[motor]]
id = "M1"
panel = "P1"
full_load = "30 A"

[options]
voltage_factor = "{vf}"
"""


@pytest.mark.parametrize(("factors", "vf"), [("none", "none"), ("iec-10pct", "iec60909-10pct")])
def test_calc_fault_prints_the_figures_of_check(write_job, factors, vf):
    """`feedcheck calc fault` and `feedcheck check` on the same job print the same figures
    (to the ampere printed)."""
    import json

    from feedcheck.cli import main

    doc = json.loads(
        CliRunner()
        .invoke(main, ["check", str(write_job(CHECK_JOB.format(vf=vf))), "--format", "json"])
        .stdout
    )
    nodes = {n["id"]: n for n in doc["nodes"]}
    res = _run(
        [
            *BASE,
            "--source-fault",
            "30kA",
            "--source-x-r",
            "6",
            "--length",
            "95 ft",
            "--size",
            "4/0 AWG",
            "--ground",
            "4 AWG",
            "--motor-flc",
            "30A",
            "--factors",
            factors,
        ]
    )
    assert res.exit_code == 0, res.output
    for section, nid in (("secondary terminals", "T1"), ("end of run", "P1")):
        n = nodes[nid]
        for label, key in (
            ("with motors", "fault_max_a"),
            ("three-phase minimum", "fault_min_a"),
            ("line-to-ground min", "fault_lg_min_a"),
            ("line-to-ground max", "fault_lg_max_a"),
            ("point-to-point", "fault_ptp_a"),
            ("interrupting duty", "fault_duty_a"),
        ):
            assert _figure(res.output, label, section) == pytest.approx(n[key], abs=0.51)
