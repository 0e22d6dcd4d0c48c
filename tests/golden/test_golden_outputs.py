"""`feedcheck check --format json` on every job the test suite ran (captured before the
second-wave re-arrangement) must give the same bytes as recorded.

This guards refactoring only: the recorded outputs are our own program's, never an oracle
for a figure (the figures are held against published sources in tests/reference/). An
intended change of output is recorded again with

    FEEDCHECK_UPDATE_GOLDEN=1 python -m pytest tests/golden

and the commit that does so says which figures changed and why.
"""

from __future__ import annotations

import gzip
import os
from pathlib import Path

import pytest
from click.testing import CliRunner

from feedcheck.cli import main as cli

JOBS = Path(__file__).resolve().parent / "jobs"
CASES = sorted(p for p in JOBS.iterdir() if p.is_dir())


def _expected_path(case: Path) -> Path:
    gz = case / "expected.json.gz"
    return gz if gz.exists() else case / "expected.json"


def _read(path: Path) -> str:
    data = path.read_bytes()
    return (gzip.decompress(data) if path.suffix == ".gz" else data).decode("utf-8")


def _write(path: Path, text: str) -> None:
    data = text.encode("utf-8")
    path.write_bytes(gzip.compress(data, mtime=0) if path.suffix == ".gz" else data)


@pytest.mark.parametrize("case", CASES, ids=[c.name for c in CASES])
def test_check_json_is_unchanged(case: Path, monkeypatch):
    job = next(case.glob("*.toml"))
    monkeypatch.chdir(case)
    result = CliRunner().invoke(cli, ["check", job.name, "--format", "json"])
    assert result.exit_code in (0, 1), result.output
    expected = _expected_path(case)
    if os.environ.get("FEEDCHECK_UPDATE_GOLDEN"):
        _write(expected, result.stdout)
    assert result.stdout == _read(expected)
