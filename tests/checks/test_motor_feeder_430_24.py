"""430.24 above the panel level: a feeder (and the transformer above it) serving two
motor panels carries 125 % of the largest motor it serves plus 100 % of the others, one
25 % adder per node, never one per panel below it (NFPA 70-2023 430.24). Read back from
the JSON of ``feedcheck check``.

Table values used (NFPA 70 Table 430.250, three-phase, 208 V column; read in the 2008
edition's table and believed unchanged in NFPA 70-2023, from memory): 10 hp 30.8 A,
25 hp 74.8 A.
"""

from __future__ import annotations

import math

import pytest

from tests.checks.jobs import job_text, node, run

FLC_10HP_208 = 30.8  # NFPA 70 Table 430.250, 10 hp, 208 V (from memory)
FLC_25HP_208 = 74.8  # NFPA 70 Table 430.250, 25 hp, 208 V (from memory)

BRANCH = """
[[run]]
id = "R{n}"
from = "P"
to = "P{n}"
length = "20 ft"
conductors = "2/0 AWG Cu"
insulation = "75 degC"
raceway = "pvc"
ground = "6 AWG Cu"
device = "150 A"

[[panel]]
id = "P{n}"
rating = "225 A"
interrupting = "65 kA"

[[motor]]
id = "M{n}"
panel = "P{n}"
hp = {hp}
"""


def _job(second_hp=10, schedule_motor: str = "") -> str:
    return (
        job_text(
            kva=150, primary_device=250, device=400, conductors="500 kcmil Cu", ground="3 AWG Cu"
        )
        + BRANCH.format(n=1, hp=25)
        + BRANCH.format(n=2, hp=second_hp)
        + schedule_motor
    )


def test_feeder_over_two_motor_panels_counts_one_adder(check_json):
    """Hand calculation, 430.24: the feeder R into P serves 60 kVA of other load
    (60,000 / (√3 × 208) = 166.5 A per line), the 25 hp motor at 125 % and the 10 hp
    motor at 100 %: 166.5 + 1.25 × 74.8 + 30.8 = 290.8 A, not 298.5 A (two adders)."""
    doc = check_json(_job())
    other = 60_000 / (math.sqrt(3) * 208)
    hand = other + 1.25 * FLC_25HP_208 + FLC_10HP_208
    assert hand == pytest.approx(290.84, abs=0.01)
    for n in ("P", "T"):  # the panel fed by the feeder and the transformer above it
        assert node(doc, n)["design_current_a"] == pytest.approx(hand, rel=1e-6), n
    va = 60_000 + math.sqrt(3) * 208 * (1.25 * FLC_25HP_208 + FLC_10HP_208)
    assert node(doc, "P")["load_va"] == pytest.approx(va, rel=1e-6)
    # each motor panel still carries its own motor at 125 % (430.22 / 430.24 alone)
    assert node(doc, "P2")["design_current_a"] == pytest.approx(1.25 * FLC_10HP_208, rel=1e-6)
    assert node(doc, "P1")["design_current_a"] == pytest.approx(1.25 * FLC_25HP_208, rel=1e-6)


def test_the_largest_motor_below_is_the_one_kept(check_json):
    """Swap the sizes: the 25 hp motor is now on P2; the node still keeps exactly its
    25 % (430.24 names the highest rated motor, wherever it is)."""
    doc = check_json(_job(second_hp=25))
    other = 60_000 / (math.sqrt(3) * 208)
    hand = other + 1.25 * FLC_25HP_208 + FLC_25HP_208
    assert node(doc, "P")["design_current_a"] == pytest.approx(hand, rel=1e-6)


def test_feeder_run_current_carries_one_adder(check_json):
    """The run R from T to P is the feeder: its design current is the same hand figure."""
    doc = check_json(_job())
    hand = 60_000 / (math.sqrt(3) * 208) + 1.25 * FLC_25HP_208 + FLC_10HP_208
    r = run(doc, "R")
    assert r["noncontinuous_a"] == pytest.approx(hand, rel=1e-6)
    assert r["current_a"] == pytest.approx(hand, rel=1e-6)


SCHEDULE = (
    "Circuit,Description,Poles,Kind,Continuous,Load [A],Power factor,Breaker [A],"
    "Conductor,Insulation,Length [ft],Ground\n"
    "1,Fan (10 hp),3,motor,no,30.8,0.85,70,8 AWG Cu,75,30,10 AWG Cu\n"
)


def test_a_schedule_motor_takes_part_in_the_one_adder(check_json, tmp_path):
    """P2's 10 hp motor is a circuit of its schedule (its own 25 % in the schedule's
    demand chain): above P2 the feeder still counts only the 25 hp motor's 25 %
    (430.24, one adder per node, schedule motors included)."""
    (tmp_path / "P2.csv").write_text(SCHEDULE, encoding="utf-8")
    text = _job().replace(
        'id = "M2"\npanel = "P2"\nhp = 10\n', 'id = "M1b"\npanel = "P1"\nhp = 10\n'
    )
    text = text.replace('id = "P2"\n', 'id = "P2"\nschedule = "P2.csv"\n')
    # P1: 25 hp + 10 hp (job motors); P2: a 10 hp schedule circuit at 30.8 A
    doc = check_json(text)
    hand = 60_000 / (math.sqrt(3) * 208) + 1.25 * FLC_25HP_208 + 2 * FLC_10HP_208
    assert node(doc, "P")["design_current_a"] == pytest.approx(hand, rel=1e-6)
    assert node(doc, "P2")["design_current_a"] == pytest.approx(1.25 * FLC_10HP_208, rel=1e-6)


def test_single_phase_motor_loads_its_pair_up_the_feed(check_json):
    """A single-phase 5 hp motor at 208 V (30.8 A, NFPA 70 Table 430.248, 208 V column,
    from memory) alone on three-phase panel P1, under P with 60 kVA balanced: it loads
    two lines of P1 and of P (the feeder R and transformer T) with 125 % × 30.8 A
    (430.24, the largest motor) and the third none; the heaviest phase governs (215.2(A)(1)
    by the heaviest line): 60,000 / (√3 × 208) + 1.25 × 30.8 = 205.0 A."""
    text = job_text(ground="3 AWG Cu") + BRANCH.format(n=1, hp=5).replace(
        "hp = 5\n", "hp = 5\nphases = 1\n"
    )
    doc = check_json(text)
    hand = 60_000 / (math.sqrt(3) * 208) + 1.25 * 30.8
    assert node(doc, "P1")["design_current_a"] == pytest.approx(1.25 * 30.8, rel=1e-6)
    for n in ("P", "T"):
        assert node(doc, n)["design_current_a"] == pytest.approx(hand, rel=1e-6), n
    assert run(doc, "R")["current_a"] == pytest.approx(hand, rel=1e-6)
    assert run(doc, "R1")["current_a"] == pytest.approx(1.25 * 30.8, rel=1e-6)
    # the balanced average is lower: the single-phase load is not spread over three lines
    avg = node(doc, "P")["load_va"] / (math.sqrt(3) * 208)
    assert avg < hand - 5


def test_a_single_phase_panel_motor_drops_its_adder_on_its_own_lines(check_json):
    """P1: 25 hp three-phase (74.8 A); P2: 5 hp single-phase at 208 V (30.8 A, Table
    430.248, from memory) on two lines. Above them only the 25 hp motor's 25 % counts
    (430.24): the heaviest line of P carries 166.5 + 1.25 × 74.8 + 30.8 A."""
    text = _job(second_hp=5).replace('panel = "P2"\nhp = 5\n', 'panel = "P2"\nhp = 5\nphases = 1\n')
    doc = check_json(text)
    hand = 60_000 / (math.sqrt(3) * 208) + 1.25 * FLC_25HP_208 + 30.8
    assert node(doc, "P")["design_current_a"] == pytest.approx(hand, rel=1e-6)
    assert node(doc, "P2")["design_current_a"] == pytest.approx(1.25 * 30.8, rel=1e-6)
