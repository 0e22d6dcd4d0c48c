"""The impedance build-up of every node (issue 15, item 5): its components, summed here,
give the node's fault figures by the ohmic method

    I = c · V_LL / (√3 · |Z|)        IEEE Std 141-1993 (Red Book) ch. 4, eq. for the
                                     three-phase bolted fault (per-phase equivalent on
                                     single-phase parts: I = V / |Z_loop|, Z_loop = √3·Z)

for the maximum (plus the motor contribution) and the minimum case, on every sample job
and every golden job (three-phase, single-phase, single-phase units on three-phase
supplies, motors, several transformers in cascade).
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from feedcheck.runner import load_and_check

ROOT = Path(__file__).resolve().parents[2]
JOBS = sorted((ROOT / "sample_jobs").glob("*.toml")) + sorted(
    (ROOT / "tests" / "golden" / "jobs").glob("*/*.toml")
)


@pytest.mark.parametrize("path", JOBS, ids=[p.stem for p in JOBS])
def test_sums_give_the_node_figures(path):
    _, results = load_and_check(path)
    checked = 0
    for node in results.nodes:
        if node.id == "source":
            continue
        b = results.sheets[node.id].buildup
        assert b is not None, node.id
        z_max = sum((r.z_max_ohm for r in b.rows), 0j)
        z_min = sum((r.z_min_ohm for r in b.rows), 0j)
        assert z_max == pytest.approx(b.z_max_ohm, rel=1e-9)
        assert z_min == pytest.approx(b.z_min_ohm, rel=1e-9)
        v = node.nominal_v
        assert b.voltage_v == v
        motor = node.values.get("fault_motor_a", 0.0)
        i_max = b.c_max * v / (math.sqrt(3) * abs(z_max)) + motor
        i_min = b.c_min * v / (math.sqrt(3) * abs(z_min))
        assert i_max == pytest.approx(node.values["fault_max_a"], rel=1e-9), node.id
        assert i_min == pytest.approx(node.values["fault_min_a"], rel=1e-9), node.id
        # what the page prints is what the sums give
        assert b.fault_max_a == pytest.approx(node.values["fault_max_a"], rel=1e-12)
        assert b.z_max_abs_ohm == pytest.approx(abs(z_max), rel=1e-9)
        # every run and transformer on the way is a component of its own
        names = " ".join(r.component for r in b.rows)
        k = node.id
        while k != "source":
            n = next(x for x in results.nodes if x.id == k)
            if n.via_run:
                assert f"run {n.via_run}:" in names
            if n.kind == "transformer":
                assert f"transformer {n.id}:" in names
            k = n.parent
        checked += 1
    assert checked == len(results.nodes) - 1


def test_minimum_case_is_hotter_and_higher_impedance(tmp_path):
    """Conductors at a higher temperature and the transformer at +tolerance give a larger
    impedance for the minimum (NFPA 70-2023 Ch. 9 Table 8 note: R rises with temperature,
    α_Cu = 0.00323 /°C; IEEE C57.12.00 impedance tolerance)."""
    _, results = load_and_check(ROOT / "sample_jobs" / "harbor_kitchen.toml")
    b = results.sheets["LP1"].buildup
    runs = [r for r in b.rows if r.component.startswith("run ")]
    assert runs and all(r.z_min_ohm.real > r.z_max_ohm.real for r in runs)
    assert all("°C" in r.max_case and "°C" in r.min_case for r in runs)
    t = next(r for r in b.rows if r.component.startswith("transformer "))
    assert abs(t.z_min_ohm) > abs(t.z_max_ohm)
