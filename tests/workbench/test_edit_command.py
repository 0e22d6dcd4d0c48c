"""`feedcheck edit` on the command line: bad arguments exit 2 with a clear message and
nothing written; good ones hand a session to the server."""

from __future__ import annotations

import pytest

from feedcheck import CAUTION
from feedcheck.template import TEMPLATE
from tests.badinput import assert_no_traceback, cli

from .conftest import copy_sample


@pytest.fixture
def served(monkeypatch):
    """The sessions the command would serve (the server itself is not started)."""
    calls = []

    def fake_serve(session, port=0, open_browser=True, echo=print):
        calls.append((session, port, open_browser))

    monkeypatch.setattr("feedcheck.workbench.server.serve", fake_serve)
    return calls


def _refused(result, *words: str) -> None:
    assert_no_traceback(result)
    assert result.exit_code == 2, result.output
    assert result.stdout == ""
    for w in words:
        assert w in result.stderr, result.stderr


def test_missing_folder(tmp_path, served):
    r = cli("edit", str(tmp_path / "nowhere" / "job.toml"))
    _refused(r, "does not exist")
    assert not served


def test_a_workbook_is_refused(tmp_path, served):
    (tmp_path / "job.xlsx").write_bytes(b"PK")
    _refused(cli("edit", str(tmp_path / "job.xlsx")), "job workbook", ".toml")
    assert not served


def test_other_endings_are_refused(tmp_path, served):
    (tmp_path / "LP1.csv").write_text("a,b\n", encoding="utf-8")
    _refused(cli("edit", str(tmp_path / "LP1.csv")), ".toml")


def test_a_folder_is_refused(tmp_path, served):
    (tmp_path / "job.toml").mkdir()
    _refused(cli("edit", str(tmp_path / "job.toml")), "not a folder")


def test_an_unreadable_file_is_refused(tmp_path, served):
    (tmp_path / "job.toml").write_bytes(b'name = "\xff\xfe"\n')
    _refused(cli("edit", str(tmp_path / "job.toml")), "UTF-8")
    assert not served


def test_a_bad_port_is_refused(tmp_path, served):
    job = copy_sample(tmp_path)
    _refused(cli("edit", str(job), "--port", "70000"))


def test_an_existing_job_is_served(tmp_path, served):
    job = copy_sample(tmp_path)
    r = cli("edit", str(job), "--no-browser", "--port", "0")
    assert r.exit_code == 0, r.output
    ((session, port, open_browser),) = served
    assert session.doc.text == job.read_text(encoding="utf-8")
    assert session.exists and port == 0 and open_browser is False


def test_a_job_with_errors_is_served_to_be_fixed(tmp_path, served):
    job = tmp_path / "broken.toml"
    job.write_text("[project\n", encoding="utf-8")
    assert cli("edit", str(job), "--no-browser").exit_code == 0
    assert not served[0][0].payload["valid"]


def test_a_missing_job_starts_from_the_template(tmp_path, served):
    r = cli("edit", str(tmp_path / "new.toml"), "--no-browser")
    assert r.exit_code == 0
    session = served[0][0]
    assert session.doc.text == TEMPLATE and not session.exists
    assert not (tmp_path / "new.toml").exists()  # Save creates it


def test_help_carries_the_caution():
    out = " ".join(cli("edit", "--help").stdout.split())
    assert " ".join(CAUTION.split()) in out
    assert "127.0.0.1" in out
