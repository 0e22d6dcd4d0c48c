"""`feedcheck report` and `feedcheck rerun` on the command line."""

from __future__ import annotations

from click.testing import CliRunner
from pypdf import PdfReader

from feedcheck.cli import main


def _run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


def test_report_writes_pdf_with_check_exit_code(samples, tmp_path):
    job = samples / "harbor_kitchen.toml"
    out = tmp_path / "h.pdf"
    r = _run("report", job, "-o", out)
    check = _run("check", job)
    assert r.exit_code == check.exit_code  # same 0/1 meaning as `feedcheck check`
    assert f"wrote {out}" in r.stderr
    assert len(PdfReader(str(out)).pages) > 5
    assert [p.name for p in tmp_path.iterdir()] == ["h.pdf"]


def test_invalid_job_writes_nothing(write_job, samples, tmp_path):
    text = (samples / "harbor_kitchen.toml").read_text()
    p = write_job(text.replace('length = "95 ft"', 'length = "95"'))
    out = tmp_path / "bad.pdf"
    r = _run("report", p, "-o", out)
    assert r.exit_code == 2
    assert "run[1].length" in r.stderr and "Traceback" not in r.stderr
    assert not out.exists()
    assert not list(tmp_path.glob("*.pdf")) and not list(tmp_path.glob(".*.part"))


def test_missing_output_folder_exits_2(samples, tmp_path):
    r = _run("report", samples / "harbor_kitchen.toml", "-o", tmp_path / "no" / "x.pdf")
    assert r.exit_code == 2 and "does not exist" in r.stderr


def test_help_has_examples_and_caution():
    for cmd in ("report", "rerun"):
        r = _run(cmd, "--help")
        assert r.exit_code == 0
        assert "Example" in r.stdout and f"feedcheck {cmd}" in r.stdout
        assert "licensed electrician or engineer" in r.stdout
    assert {"report", "rerun"} <= set(main.commands)
