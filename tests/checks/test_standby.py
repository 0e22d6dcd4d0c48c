"""The standby position in the feed walk: which position governs each figure, and the
transfer switch's checks. Invented jobs (no real site); the figures compared are the
walk's own two positions and the published generator formula (IEEE Std 141-1993
ch. 4: I = I_rated / x"d), never a stored answer."""

from __future__ import annotations

import math

import pytest

from feedcheck.runner import run_job
from tests.badinput.test_standby_inputs import STANDBY


def _run(tmp_path, text):
    path = tmp_path / "job.toml"
    path.write_text(text, encoding="utf-8")
    return run_job(path)


def _find(results, subject, check):
    return [f for f in results.findings if f.subject == subject and f.check == check]


def test_governing_positions_and_the_generator_figure(tmp_path):
    res = _run(tmp_path, STANDBY)
    mdp = next(n for n in res.nodes if n.id == "MDP").values
    # 25 kA utility against a 250 kVA generator: the utility governs the maximum, the
    # generator the minimum
    assert mdp["fault_max_a"] > mdp["standby_fault_max_a"]
    assert mdp["fault_max_governs"] == "normal"
    assert mdp["fault_min_governs"] == "standby"
    assert mdp["standby_fault_min_a"] < mdp["fault_min_a"]
    # below the generator's run the fault is under the terminal figure I_rated / |z"|
    rated = 250e3 / (math.sqrt(3) * 480.0)
    terminal = rated / (0.15 * math.sqrt(1 + 1 / 12**2))  # IEEE Std 141-1993 ch. 4
    (gen,) = _find(res, "GEN", "generator fault contribution")
    assert gen.value == pytest.approx(terminal, rel=1e-9)
    assert mdp["standby_fault_max_a"] < terminal
    # no standby line-to-ground figure on the generator's own system, and a warning
    assert "standby_fault_lg_min_a" not in mdp
    (lg,) = _find(res, "GEN", "line-to-ground fault on the generator")
    assert lg.status == "warn"
    assert not _find(res, "MDP", "ground fault trips instantaneously (standby)")


def test_standby_governs_the_maximum_when_the_utility_is_weak(tmp_path):
    # a 3 kA utility beside a 2 MVA generator: the standby position's duty exceeds a
    # 10 kA panel rating and fails there, though the normal position passes
    text = STANDBY.replace('"25 kA"', '"3 kA"').replace('"250 kVA"', '"2000 kVA"')
    text = text.replace('interrupting = "35 kA"', 'interrupting = "10 kA"')
    res = _run(tmp_path, text)
    mdp = next(n for n in res.nodes if n.id == "MDP").values
    assert mdp["fault_max_governs"] == "standby"
    (normal,) = _find(res, "MDP", "interrupting rating")
    (standby,) = _find(res, "MDP", "interrupting rating (standby)")
    assert normal.status == "ok" and standby.status == "fail"
    assert "standby position (generator GEN through ATS)" in standby.note
    (ws,) = _find(res, "ATS", "transfer switch withstand vs available fault")
    assert ws.value == pytest.approx(mdp["standby_fault_max_a"])
    assert res.exit_code == 1


def test_switch_rating_and_missing_withstand(tmp_path):
    text = STANDBY.replace('rating = "600 A"\nwithstand = "35 kA"\n', 'rating = "200 A"\n')
    res = _run(tmp_path, text)
    (rating,) = _find(res, "ATS", "transfer switch rating vs load")
    assert rating.status == "fail" and rating.limit == 200.0
    (ws,) = _find(res, "ATS", "transfer switch withstand vs available fault")
    assert ws.status == "warn" and "not evaluated" in ws.note  # never ok unevaluated
    (size,) = _find(res, "GEN", "generator size vs demand (information)")
    assert size.status == "info" and size.limit == 250e3


def test_drop_for_each_position(tmp_path):
    res = _run(tmp_path, STANDBY)
    mdp = next(n for n in res.nodes if n.id == "MDP").values
    assert mdp["vdrop_governs"] in ("normal", "standby")
    worse = max(mdp["vdrop_pct"], mdp["standby_vdrop_pct"])
    governing = mdp["standby_vdrop_pct"] if mdp["vdrop_governs"] == "standby" else mdp["vdrop_pct"]
    assert governing == worse
    assert _find(res, "GEN", "feeder voltage drop (standby)")  # the generator's run
