"""`feedcheck extract`, `compare` and `labels` (issue 15 items 14, 15, 16)."""

from __future__ import annotations

import re
import shutil

import pytest
from click.testing import CliRunner
from pypdf import PdfReader

from feedcheck.cli import main
from feedcheck.runner import load_and_check
from feedcheck.tables import set_user_tables_dir


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


@pytest.fixture(autouse=True)
def _reset_tables():
    yield
    set_user_tables_dir(None)


@pytest.fixture(scope="module")
def cedar(tmp_path_factory, request):
    """The cedar sample job (with its schedule) copied to a folder, and its report."""
    root = request.config.rootpath / "sample_jobs"
    folder = tmp_path_factory.mktemp("cedar")
    shutil.copy(root / "cedar_annex_review.toml", folder)
    shutil.copy(root / "LA_with_errors.csv", folder)
    pdf = folder / "cedar.pdf"
    r = _run("report", folder / "cedar_annex_review.toml", "-o", pdf)
    assert r.exit_code in (0, 1), r.output
    return folder, pdf


# ---------------------------------------------------------------- extract


def test_extract_writes_job_and_schedule_byte_for_byte(cedar, tmp_path):
    folder, pdf = cedar
    out = tmp_path / "rev_b"
    r = _run("extract", pdf, out)
    assert r.exit_code == 0, r.output
    for name in ("cedar_annex_review.toml", "LA_with_errors.csv"):
        assert (out / name).read_bytes() == (folder / name).read_bytes()
    names = sorted(p.name for p in out.rglob("*"))
    assert names == ["LA_with_errors.csv", "cedar_annex_review.toml"]
    r = _run("check", out / "cedar_annex_review.toml")  # ready to re-run
    assert r.exit_code == 1  # the sample job fails on purpose


def test_extract_refuses_to_overwrite(cedar, tmp_path):
    _, pdf = cedar
    out = tmp_path / "x"
    out.mkdir()
    (out / "LA_with_errors.csv").write_text("mine")
    r = _run("extract", pdf, out)
    assert r.exit_code == 2
    assert "exists" in r.stderr and "--force" in r.stderr and "Traceback" not in r.stderr
    assert sorted(p.name for p in out.iterdir()) == ["LA_with_errors.csv"]  # nothing written
    assert (out / "LA_with_errors.csv").read_text() == "mine"
    assert _run("extract", pdf, out, "--force").exit_code == 0
    assert (out / "LA_with_errors.csv").read_text() != "mine"


def test_extract_takes_custom_tables_out(tmp_path, request):
    root = request.config.rootpath
    local = tmp_path / "local"
    local.mkdir()
    shutil.copy(root / "tables" / "transformer_xr.csv", local)
    pdf = tmp_path / "m.pdf"
    r = _run("--tables", local, "report", root / "sample_jobs" / "maple_farmhouse.toml", "-o", pdf)
    assert r.exit_code in (0, 1), r.output
    set_user_tables_dir(None)
    r = _run("extract", pdf, tmp_path / "out")
    assert r.exit_code == 0, r.output
    assert (tmp_path / "out" / "tables" / "transformer_xr.csv").read_bytes() == (
        local / "transformer_xr.csv"
    ).read_bytes()
    assert "--tables" in r.stderr


def test_extract_of_a_non_report_exits_2(tmp_path):
    p = tmp_path / "x.pdf"
    p.write_bytes(b"not a pdf")
    r = _run("extract", p, tmp_path / "out")
    assert r.exit_code == 2 and "Traceback" not in r.stderr
    assert len(r.stderr.strip().splitlines()) == 1
    assert not (tmp_path / "out").exists()


# ---------------------------------------------------------------- compare


def test_compare_identical_revisions(cedar):
    folder, pdf = cedar
    r = _run("compare", pdf, folder / "cedar_annex_review.toml")
    assert r.exit_code == 0, r.output
    assert "inputs changed: none" in r.stdout and "figures changed: none" in r.stdout


def test_compare_names_input_figure_and_finding_changes(cedar, tmp_path):
    folder, pdf = cedar
    rev = tmp_path / "rev"
    rev.mkdir()
    job = (folder / "cedar_annex_review.toml").read_text()
    job = job.replace('available_fault = "42 kA"', 'available_fault = "65 kA"')
    (rev / "cedar_annex_review.toml").write_text(job)
    sched = (folder / "LA_with_errors.csv").read_text().splitlines(keepends=True)
    (rev / "LA_with_errors.csv").write_text("".join(sched[:-1]))  # last circuit removed
    r = _run("compare", pdf, rev / "cedar_annex_review.toml")
    assert r.exit_code == 1, r.output
    out = r.stdout
    assert "job source.available_fault: '42 kA' → '65 kA'" in out
    assert "schedule LA_with_errors.csv: 1 line(s) changed" in out
    # a higher source fault current raises the maximum fault current at the transformer
    m = re.search(r"TA: fault_max_a: ([\d,.]+) → ([\d,.]+)", out)
    assert m, out
    assert float(m.group(2).replace(",", "")) > float(m.group(1).replace(",", ""))
    assert "findings changed: none" not in out


def test_compare_bad_file_exits_2(tmp_path, cedar):
    _, pdf = cedar
    p = tmp_path / "bad.pdf"
    p.write_bytes(b"%PDF-1.4 nothing")
    r = _run("compare", p, pdf)
    assert r.exit_code == 2 and "Traceback" not in r.stderr


# ---------------------------------------------------------------- labels


def test_labels_one_per_marked_node_with_figure_date_and_voltage(cedar, tmp_path):
    folder, _ = cedar
    out = tmp_path / "labels.pdf"
    r = _run("labels", folder / "cedar_annex_review.toml", "-o", out)
    assert r.exit_code == 0, r.output
    text = "\n".join(p.extract_text() for p in PdfReader(str(out)).pages)
    _, results = load_and_check(folder / "cedar_annex_review.toml")
    marked = [f for f in results.findings if f.rule_id == "fault-marking" and "/" not in f.subject]
    assert marked
    nodes = {n.id: n for n in results.nodes}
    for f in marked:
        assert f"{round(f.value):,} A" in text  # the figure the checks computed
        assert f"{f.subject} — {nodes[f.subject].kind}, {nodes[f.subject].voltage}" in text
    assert text.count("MAXIMUM AVAILABLE FAULT CURRENT") == len(marked)
    assert "calculated 2026-11-30" in text  # the job's own date
    assert "locally adopted code" in text
    assert "arc" not in text.lower()


def test_labels_bad_job_exits_2_and_writes_nothing(tmp_path):
    job = tmp_path / "j.toml"
    job.write_text("[project]\nname = 'x'\n[source]\nvoltage = 'banana'\n")
    out = tmp_path / "l.pdf"
    r = _run("labels", job, "-o", out)
    assert r.exit_code == 2 and "Traceback" not in r.stderr
    assert not out.exists()
