"""The workbench shows what `feedcheck check` says: the same input error lines for a
bad job (the whole catalogue of tests/badinput), the same findings for every sample
job (one code path: the runner). The oracle is our own CLI, no published value."""

from __future__ import annotations

import json

import pytest

from tests.badinput import GOOD, cli, error_lines
from tests.badinput.test_job_catalogue import CASES

from .conftest import SAMPLES, copy_sample, make_page

SAMPLE_JOBS = sorted(p.name for p in SAMPLES.glob("*.toml"))


@pytest.mark.parametrize("case", CASES, ids=[c[0] for c in CASES])
def test_input_errors_are_the_clis_lines(tmp_path, static_dir, case):
    _, old, new, _ = case
    job = tmp_path / "job.toml"
    assert old in GOOD
    job.write_text(GOOD.replace(old, new, 1), encoding="utf-8")
    expected = error_lines(cli("check", str(job)))
    state = make_page(job, static_dir).get("api/state").json
    results = state["results"]
    assert not results["valid"] and results["findings"] == [] and results["nodes"] == []
    assert [e["message"] for e in results["input_errors"]] == expected


def test_input_errors_after_an_edit_are_the_clis_lines(tmp_path, static_dir):
    """An edit in memory gives the lines the CLI gives for the same text saved."""
    job = copy_sample(tmp_path)
    page = make_page(job, static_dir)
    state = page.edit(
        {"op": "set", "kind": "run", "index": 1, "key": "length", "value": "-5 ft"},
        {"op": "set", "kind": "transformer", "index": 0, "key": "impedance", "value": "900 %"},
    ).json
    page.post("api/save")
    expected = error_lines(cli("check", str(job)))
    assert len(expected) == 2
    assert [e["message"] for e in state["results"]["input_errors"]] == expected
    where = {(e["kind"], e["index"], e["key"]) for e in state["results"]["input_errors"]}
    assert where == {("run", 1, "length"), ("transformer", 0, "impedance")}


@pytest.mark.parametrize("name", SAMPLE_JOBS)
def test_findings_are_those_of_check_json(tmp_path, static_dir, name):
    job = copy_sample(tmp_path, name)
    result = cli("check", str(job), "--format", "json")
    if result.exit_code == 2:  # a sample job that is invalid on purpose
        state = make_page(job, static_dir).get("api/state").json
        assert [e["message"] for e in state["results"]["input_errors"]] == error_lines(result)
        return
    expected = json.loads(result.stdout)
    results = make_page(job, static_dir).get("api/state").json["results"]
    assert results["valid"]
    got = results["findings"]
    assert len(got) == len(expected["findings"])
    assert [(f["status"], f["subject"], f["check"], f["rule_id"]) for f in got] == [
        (f["status"], f["subject"], f["check"], f["rule_id"]) for f in expected["findings"]
    ]
    assert results["counts"] == expected["counts"]
    feed = [n["id"] for n in results["nodes"] if n["kind"] not in SIDE_KINDS]
    assert feed == [n["id"] for n in expected["nodes"]]
    side = [n["id"] for n in results["nodes"] if n["kind"] in SIDE_KINDS]
    job_ids = {f["subject"] for f in expected["findings"]}
    assert all(i in job_ids for i in side)  # every side node is an element with findings


SIDE_KINDS = ("motor", "transfer_switch", "generator")


def test_motors_and_the_standby_source_are_nodes_beside_their_panel(tmp_path, static_dir):
    """Drawn where they hang (a motor under its panel, the switch at its panel, the
    generator at the switch), with their own findings' figures and worst status."""
    job = copy_sample(tmp_path, "willow_yard_standby.toml")
    expected = json.loads(cli("check", str(job), "--format", "json").stdout)
    results = make_page(job, static_dir).get("api/state").json["results"]
    side = {n["id"]: n for n in results["nodes"] if n["kind"] in SIDE_KINDS}
    assert {(n["kind"], n["parent"]) for n in side.values()} == {
        ("motor", "MDP"),
        ("transfer_switch", "MDP"),
        ("generator", "ATS-1"),
    }
    order = ("fail", "warn", "ok")
    for node_id, n in side.items():
        own = {f["status"] for f in expected["findings"] if f["subject"] == node_id}
        assert n["status"] == next((s for s in order if s in own), "none")
        assert n["figures"] and all(len(fig) == 2 and fig[1] for fig in n["figures"])


def test_finding_lines_are_the_terminal_lines(tmp_path, static_dir):
    """Each failing or warning finding's message is the line `check` prints for it."""
    job = copy_sample(tmp_path)
    printed = cli("check", str(job), "--all").stdout.splitlines()
    results = make_page(job, static_dir).get("api/state").json["results"]
    assert results["findings"]
    for f in results["findings"]:
        assert f["message"] in printed


def test_figures_are_in_the_jobs_unit(tmp_path, static_dir):
    """A job written in feet shows feet; the same job in metres shows metres."""
    job = copy_sample(tmp_path)
    feet = make_page(job, static_dir).get("api/state").json["results"]
    assert feet["unit"] == "ft"
    distances = [dict(n["figures"]).get("Distance from the source") for n in feet["nodes"]]
    assert all(d.endswith(" ft") for d in distances if d)
    text = (
        job.read_text(encoding="utf-8").replace('"95 ft"', '"29 m"').replace('"140 ft"', '"43 m"')
    )
    job.write_text(text, encoding="utf-8")
    metres = make_page(job, static_dir).get("api/state").json["results"]
    assert metres["unit"] == "m"
    distances = [dict(n["figures"]).get("Distance from the source") for n in metres["nodes"]]
    assert all(d.endswith(" m") for d in distances if d)


def test_a_node_with_nothing_held_against_a_limit_is_not_ok(page):
    """Never "ok" for what was not evaluated: a node status comes from its findings."""
    results = page.get("api/state").json["results"]
    by_subject = {}
    for f in results["findings"]:
        by_subject.setdefault(f["subject"].split("/")[0], set()).add(f["status"])
    for n in results["nodes"]:
        seen = by_subject.get(n["id"], set()) | by_subject.get(n["via"] or "", set())
        if n["status"] == "ok":
            assert "ok" in seen and not seen & {"fail", "warn"}
        if not seen & {"ok", "warn", "fail"}:
            assert n["status"] == "none"
    assert any(n["status"] == "none" for n in results["nodes"])  # the source: figures only
