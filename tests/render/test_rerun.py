"""Re-checking a report from its embedded inputs: round trip, a changed table,
unsafe attachment names, files that are not reports, the comparison itself."""

from __future__ import annotations

import io
import json
from pathlib import Path
from types import SimpleNamespace

import pytest
from click.testing import CliRunner
from reportlab.pdfgen import canvas

from feedcheck.cli import main
from feedcheck.render.pdf.embed import (
    FORMAT,
    MANIFEST_NAME,
    RESULTS_NAME,
    NotAReport,
    attach,
    extract_inputs,
    input_attachments,
    safe_relative,
)
from feedcheck.render.pdf.rerun_compare import compare_results


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


@pytest.fixture(scope="module")
def maple_pdf(tmp_path_factory, request):
    """Report of the sample job that takes its transformer X/R from the typical table."""
    out = tmp_path_factory.mktemp("rerun") / "maple.pdf"
    job = request.config.rootpath / "sample_jobs" / "maple_farmhouse.toml"
    r = _run("report", job, "-o", out)
    assert r.exit_code in (0, 1), r.output
    return out


def test_round_trip_matches(maple_pdf, tmp_path, request):
    r = _run("rerun", maple_pdf)
    assert r.exit_code == 0, r.output
    # Round trip: the results embedded in the report equal a fresh `check --format json`
    # of the same job file, figure by figure (read from JSON, not from printed text).
    embedded = extract_inputs(maple_pdf, tmp_path).results
    job = request.config.rootpath / "sample_jobs" / "maple_farmhouse.toml"
    fresh = json.loads(_run("check", job, "--format", "json").stdout)
    compared, differences = compare_results(embedded, fresh)
    assert differences == []
    assert compared == len(fresh["findings"]) + sum(
        isinstance(v, (int, float)) and not isinstance(v, bool)
        for node in fresh["nodes"]
        for v in node.values()
    ) + sum("fault_duty_case" in node for node in fresh["nodes"])  # the governing case, as text
    assert f"all {compared} figures match" in r.stdout


def test_changed_table_value_is_named(maple_pdf, tmp_path, request):
    src = request.config.rootpath / "tables" / "transformer_xr.csv"
    lines = src.read_text().splitlines(keepends=True)
    # the 25 kVA transformer's typical X/R: move it halfway to the next row
    # (keeps the column nondecreasing, as the table loader requires)
    i = next(k for k, ln in enumerate(lines) if ln.startswith("25,"))
    here, nxt = float(lines[i].split(",")[1]), float(lines[i + 1].split(",")[1])
    assert nxt > here
    lines[i] = f"25,{(here + nxt) / 2:g}\n"
    (tmp_path / "transformer_xr.csv").write_text("".join(lines))
    r = _run("--tables", tmp_path, "rerun", maple_pdf)
    assert r.exit_code == 1, r.output
    assert "TX-B: x_r_transformer: report" in r.stdout
    assert "table transformer_xr" in r.stdout


def test_not_a_pdf_exits_2(tmp_path):
    p = tmp_path / "x.pdf"
    p.write_bytes(b"hello, not a pdf")
    r = _run("rerun", p)
    assert r.exit_code == 2
    assert "cannot read it as a PDF" in r.stderr and "Traceback" not in r.stderr


def _plain_pdf() -> bytes:
    buf = io.BytesIO()
    c = canvas.Canvas(buf, invariant=1)
    c.drawString(72, 720, "just a page")
    c.save()
    return buf.getvalue()


def test_pdf_without_inputs_exits_2(tmp_path):
    p = tmp_path / "plain.pdf"
    p.write_bytes(_plain_pdf())
    r = _run("rerun", p)
    assert r.exit_code == 2
    assert "not a feedcheck report" in r.stderr


@pytest.mark.parametrize(
    "name", ["/etc/passwd", "../evil.toml", "a/../../b.toml", "C:x.toml", "a\\b.toml", ".hidden"]
)
def test_unsafe_names_rejected(name):
    with pytest.raises(NotAReport, match="unsafe"):
        safe_relative(name)


def test_extract_never_writes_outside(tmp_path):
    manifest = {"format": FORMAT, "job": "../evil.toml", "schedules": [], "results": RESULTS_NAME}
    pdf = attach(
        _plain_pdf(),
        [
            (MANIFEST_NAME, json.dumps(manifest).encode()),
            ("inputs/../evil.toml", b"x = 1"),
            (RESULTS_NAME, b'{"nodes": [], "findings": []}'),
        ],
    )
    p = tmp_path / "r.pdf"
    p.write_bytes(pdf)
    dest = tmp_path / "out"
    dest.mkdir()
    with pytest.raises(NotAReport):
        extract_inputs(p, dest)
    assert not (tmp_path / "evil.toml").exists()
    assert list(dest.iterdir()) == []


def test_schedules_keep_their_relative_paths(tmp_path):
    (tmp_path / "job" / "sched").mkdir(parents=True)
    job_path = tmp_path / "job" / "site.toml"
    job_path.write_bytes(b"# job\n")
    sched = tmp_path / "job" / "sched" / "LP1.csv"
    sched.write_bytes(b"circuit,load\n1,100\n")
    job = SimpleNamespace(path=job_path, panels=[SimpleNamespace(schedule=sched)])
    files = [*input_attachments(job), (RESULTS_NAME, b'{"nodes": [], "findings": []}')]
    p = tmp_path / "r.pdf"
    p.write_bytes(attach(_plain_pdf(), files))
    ex = extract_inputs(p, tmp_path / "x")
    assert ex.job_path == (tmp_path / "x" / "site.toml").resolve()
    assert (tmp_path / "x" / "sched" / "LP1.csv").read_bytes() == sched.read_bytes()


def _results(**node_values):
    return {
        "nodes": [{"id": "T1", "kind": "transformer", "voltage": "208Y/120 V", **node_values}],
        "findings": [
            {
                "subject": "T1",
                "check": "loading",
                "value": 50.0,
                "limit": 100.0,
                "unit": "%",
                "status": "ok",
                "rule_id": "xfmr-loading",
            }
        ],
    }


def test_compare_tolerance_and_differences():
    a = _results(fault_max_a=10_000.0, x_r="inf")
    n, d = compare_results(a, _results(fault_max_a=10_000.0 * (1 + 1e-12), x_r="inf"))
    assert (n, d) == (3, [])
    n, d = compare_results(a, _results(fault_max_a=10_000.0 * (1 + 1e-6), x_r="inf"))
    assert [(x.element, x.figure) for x in d] == [("T1", "fault_max_a")]
    b = _results(fault_max_a=10_000.0, x_r="inf")
    b["findings"][0]["status"] = "fail"
    _, d = compare_results(a, b)
    assert [x.figure for x in d] == ["loading (status)"]
    b["nodes"].append({"id": "LP9", "kind": "panel"})
    _, d = compare_results(a, b)
    assert ("LP9", "node") in [(x.element, x.figure) for x in d]


def test_tmp_folder_is_removed(maple_pdf, monkeypatch, tmp_path):
    import tempfile

    monkeypatch.setattr(tempfile, "tempdir", str(tmp_path))
    r = _run("rerun", maple_pdf)
    assert r.exit_code == 0
    assert not [p for p in Path(tmp_path).iterdir() if p.name.startswith("feedcheck-rerun-")]
