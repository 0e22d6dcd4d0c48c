"""`feedcheck check --format json` on every job the test suite ran (captured before the
second-wave re-arrangement) must give the same bytes as recorded.

This guards refactoring only: the recorded outputs are our own program's, never an oracle
for a figure (the figures are held against published sources in tests/reference/). An
intended change of output is recorded again with

    FEEDCHECK_UPDATE_GOLDEN=1 python -m pytest tests/golden

and the commit that does so says which figures changed and why.

Numbers are held to 1 part in 10^9, everything else exactly: the last binary digit of a
float may differ between machines (numpy picks its vectorised routines by processor), and
such a difference is no change of output a person could read.
"""

from __future__ import annotations

import gzip
import json
import math
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
    assert _differences(json.loads(result.stdout), json.loads(_read(expected))) == []


def _differences(got, want, where: str = "$") -> list[str]:
    """Paths where ``got`` differs from ``want`` (floats to 1 part in 10^9)."""
    if isinstance(want, dict) and isinstance(got, dict):
        if list(got) != list(want):
            return [f"{where}: keys {list(got)} != {list(want)}"]
        return [d for k in want for d in _differences(got[k], want[k], f"{where}.{k}")]
    if isinstance(want, list) and isinstance(got, list):
        if len(got) != len(want):
            return [f"{where}: {len(got)} items != {len(want)}"]
        return [
            d
            for i, (item, wanted) in enumerate(zip(got, want, strict=True))
            for d in _differences(item, wanted, f"{where}[{i}]")
        ]
    both_float = isinstance(got, float) and isinstance(want, float)
    if both_float and math.isclose(got, want, rel_tol=1e-9, abs_tol=1e-12):
        return []
    return [] if type(got) is type(want) and got == want else [f"{where}: {got!r} != {want!r}"]


def test_differences_tells_a_changed_figure_from_a_last_digit():
    want = {"node": [{"fault_a": 6009.123456789, "status": "ok", "circuits": 20}]}
    assert (
        _differences(
            {"node": [{"fault_a": 6009.123456789001, "status": "ok", "circuits": 20}]}, want
        )
        == []
    )
    assert _differences({"node": [{"fault_a": 9009.1, "status": "ok", "circuits": 20}]}, want)
    assert _differences(
        {"node": [{"fault_a": 6009.123456789, "status": "fail", "circuits": 20}]}, want
    )
    assert _differences(
        {"node": [{"fault_a": 6009.123456789, "status": "ok", "circuits": 20.0}]}, want
    )
    assert _differences({"node": []}, want)
