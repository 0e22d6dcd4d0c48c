"""What the checks put into the results for the renderers: the feed's description (the
one-line diagram's source), table provenance with row confidence, node phases, the job
file's fingerprint. These are plumbing tests: each value is held against the job file
or table it was read from, never against a computed figure."""

from __future__ import annotations

import hashlib

import pytest

from feedcheck.rulebook import current_rulebook
from feedcheck.runner import load_and_check
from feedcheck.tables import load_table


@pytest.fixture(scope="module")
def harbor(request):
    return load_and_check(request.config.rootpath / "sample_jobs" / "harbor_kitchen.toml")


def test_diagram_describes_every_node_run_and_rating(harbor):
    job, results = harbor
    d = results.diagram
    assert [n.id for n in d.nodes] == [n.id for n in results.nodes]
    for dn, rn in zip(d.nodes, results.nodes, strict=True):
        assert (dn.kind, dn.voltage, dn.parent, dn.via_run) == (
            rn.kind,
            rn.voltage,
            rn.parent,
            rn.via_run,
        )
        assert dn.phases == rn.phases in (1, 3)
    assert [r.id for r in d.runs] == [r.id for r in job.runs]
    for run in job.runs:
        dr = d.run(run.id)
        assert (dr.length_m, dr.size, dr.material, dr.sets, dr.device_a) == (
            run.length_m,
            run.size.name,
            run.material,
            run.sets,
            run.device_a,
        )
    for t in job.transformers:
        r = d.node(t.id).ratings
        assert (r["rating_va"], r["z_pct"], r["primary"], r["secondary"]) == (
            t.rating_va,
            t.z_pct,
            t.primary.text,
            t.secondary.text,
        )
    for p in job.panels:
        r = d.node(p.id).ratings
        assert r["rating_a"] == p.rating_a
        assert r.get("interrupting_a") == p.interrupting_a
    assert d.node("source").ratings["fault_a"] == job.source.fault_a


def test_provenance_of_every_table_with_row_confidence(harbor):
    _, results = harbor
    assert [t.name for t in results.provenance] == sorted(current_rulebook().tables)
    by_name = {t.name: t for t in results.provenance}
    amp = load_table("ampacity_raceway")
    prov = by_name["ampacity_raceway"]
    assert (prov.basis, prov.conditions, prov.sha256) == (
        amp.meta["basis"],
        amp.meta["conditions"],
        amp.sha256,
    )
    assert len(prov.row_confidence) == len(amp.data)
    assert {c for _, c in prov.row_confidence} == set(amp.data["row_confidence"])
    assert ("14 AWG cu", amp.data["row_confidence"].iloc[0]) == prov.row_confidence[0]
    assert by_name["fault_assumptions"].row_confidence[0][0] == "fault-z-tolerance"


def test_job_fingerprint_and_unchanged_json(harbor):
    job, results = harbor
    assert results.job_sha256 == hashlib.sha256(job.path.read_bytes()).hexdigest()
    assert results.length_unit == "ft"  # the harbor kitchen job writes its lengths in feet
    # the renderers' fields stay out of the JSON (its keys are held stable)
    top = results.to_dict()
    assert set(top) == {"job", "nodes", "runs", "schedules", "findings", "counts", "tables"}
    assert "phases" not in top["nodes"][0] and "length_unit" not in top["job"]
