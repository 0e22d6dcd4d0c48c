"""The service checks (checks/service.py) and the walks rooted at a service, on the
Willow Yard sample (an invented scenario: demo data, never an oracle) with every
expected figure taken from the published tables and formulas named beside it."""

from __future__ import annotations

import math

import pytest

from feedcheck.runner import run_job


def _finding(res, subject, check):
    return next(f for f in res.findings if f.subject == subject and f.check == check)


@pytest.fixture(scope="module")
def willow():
    from tests.conftest import SAMPLES

    return run_job(SAMPLES / "willow_yard_service.toml")


def test_through_fault_is_the_infinite_bus_figure(willow):
    # IEEE Std 141-1993 §4.5: I = S/(√3·V·Z) = 750 kVA / (√3 · 480 V · 0.0575) = 15,689 A
    f = _finding(willow, "source", "service transformer through-fault")
    assert f.value == pytest.approx(750e3 / (math.sqrt(3) * 480 * 0.0575), rel=1e-9)
    assert f.value == pytest.approx(15_689, rel=1e-4)


def test_electrode_conductor_and_main_bonding_jumper(willow):
    # 2 sets × 350 kcmil Cu = 700 kcmil. NFPA 70-2023 Table 250.66: over 600 through
    # 1100 kcmil Cu → 2/0 AWG Cu (133.1 kcmil, Ch. 9 Table 8). Table 250.102(C)(1): over
    # 600 through 1100 kcmil Cu → 2/0 AWG Cu. The job states 2/0 AWG Cu for both.
    gec = _finding(willow, "source", "service grounding electrode conductor")
    mbj = _finding(willow, "source", "main bonding jumper")
    assert gec.limit == pytest.approx(133.1, rel=1e-3) and gec.status == "ok"
    assert mbj.limit == pytest.approx(133.1, rel=1e-3) and mbj.status == "ok"
    assert gec.rule_id == "gec-service" and mbj.rule_id == "mbj-service"


def test_grounded_conductor_per_raceway(willow):
    # 250.24(C)(2): each raceway's grounded conductor by the 350 kcmil in it; Table
    # 250.102(C)(1): over 3/0 AWG through 350 kcmil Cu → 2 AWG Cu (66.36 kcmil, Ch. 9 Table
    # 8), but parallel conductors are 1/0 AWG or larger (310.10(G)) → 105.6 kcmil
    f = _finding(willow, "SVC", "service grounded conductor")
    assert f.limit == pytest.approx(105.6, rel=1e-3)
    assert f.value == pytest.approx(350.0) and f.status == "ok"


def test_service_disconnect_protects_the_service_conductors(willow):
    # 230.90(A), 230.91: MDP's 600 A main protects SVC at its load end; 2 × 350 kcmil Cu
    # XHHW-2 at the 75 °C column (110.14(C)(1)(b), over 100 A) = 2 × 310 A = 620 A
    # (NFPA 70-2023 Table 310.16); 230.79(D): at least 60 A
    dev = _finding(willow, "SVC", "service device vs service conductors")
    assert dev.value == 600 and dev.status == "ok" and "service disconnect" in dev.note
    amp = _finding(willow, "SVC", "service conductor ampacity vs load")
    assert amp.value == pytest.approx(620.0) and amp.rule_id == "service-ampacity"
    least = _finding(willow, "SVC", "service disconnect rating")
    assert least.limit == 60 and least.status == "ok"
    # no equipment grounding conductor check on service conductors
    assert not [f for f in willow.findings if f.subject == "SVC" and f.rule_id == "run-egc-size"]


def test_drop_counts_from_the_service_point(willow):
    f = _finding(willow, "MDP", "conductor voltage drop since the service point")
    runs = {r["id"]: r for r in willow.runs}
    assert f.value == pytest.approx(runs["SVC"]["vdrop_pct"], rel=1e-9)


def test_line_to_ground_walk_starts_at_the_grounded_service(willow):
    nodes = {n.id: n.values for n in willow.nodes}
    # a bolted L-G at the service with Z0 = k·Z1 (rule fault-z0-ratio-min = 1.0) equals
    # the three-phase figure (IEEE Std 141-1993 ch. 4: I = 3V/(2Z1 + Z0))
    assert nodes["source"]["fault_lg_min_a"] == pytest.approx(nodes["source"]["fault_min_a"])
    assert 0 < nodes["MDP"]["fault_lg_min_a"] < nodes["source"]["fault_lg_min_a"]


def test_split_phase_service_line_to_neutral_at_the_terminals(write_job):
    # 120/240 V service, 50 kVA 2 %, X/R 1 (infinite primary). Half-winding model (fuse
    # makers' point-to-point literature: 1.5 × R, 1.2 × X of the full winding, at 120 V;
    # common practice, no standard): Z_T = 0.02 · 240²/50e3 = 0.02304 Ω at 45°,
    # Z_LN = (1.5·R + j1.2·X)/4, I_LN = 120/|Z_LN|
    text = """
[project]
name = "split service (invented)"
[source]
voltage = "120/240 V"
phases = 1
service_transformer = "50 kVA"
service_impedance = "2 %"
service_x_r = 1
[[run]]
id = "S"
from = "source"
to = "P"
length = "1 ft"
conductors = "4/0 AWG Cu"
current_carrying = 2
neutral = "4/0 AWG Cu"
[[panel]]
id = "P"
rating = "200 A"
main_device = "200 A"
interrupting = "22 kA"
load = "10 kVA"
"""
    res = run_job(write_job(text))
    zt = 0.02 * 240**2 / 50e3 / math.sqrt(2)  # R = X
    i_ln = 120 / abs(complex(1.5 * zt, 1.2 * zt) / 4)
    i_ll = 50e3 / (240 * 0.02)
    p = next(n for n in res.nodes if n.id == "P").values
    assert p["fault_max_a"] < i_ll  # the short run lowers the L-L figure a little
    duty = _finding(res, "P", "interrupting rating")
    assert "line-to-neutral maximum governs" in duty.note
    assert duty.value == pytest.approx(i_ln, rel=0.03)  # 1 ft of 4/0 Cu out and back
    src = next(n for n in res.nodes if n.id == "source").values
    # at the service point itself the same figure, with no run (half-winding model above)
    assert src["fault_ln_max_a"] == pytest.approx(i_ln, rel=1e-6)
    assert src["fault_ln_max_a"] >= src["fault_lg_min_a"]


def test_no_node_shows_a_minimum_above_its_maximum(willow):
    """At the source as at every node, the line-to-ground minimum is never above the
    largest maximum shown (the service's own maxima are recorded there too)."""
    for n in willow.nodes:
        v = n.values
        largest = max(v.get(k, 0.0) for k in ("fault_max_a", "fault_lg_max_a", "fault_ln_max_a"))
        assert v.get("fault_lg_min_a", 0.0) <= largest * (1 + 1e-9), n.id
    assert "fault_lg_max_a" in next(n for n in willow.nodes if n.id == "source").values
