"""Run a small job built in the test through `feedcheck check --format json`.

The feed-walk checks are exercised end to end and read back from the JSON output
(findings, nodes, runs), never from printed text.
"""

from __future__ import annotations

import json

import pytest
from click.testing import CliRunner

from feedcheck.cli import main


@pytest.fixture
def check_json(write_job):
    """Return the parsed JSON of `feedcheck check --format json` for a TOML text."""

    def _run(toml_text: str) -> dict:
        path = write_job(toml_text)
        res = CliRunner().invoke(main, ["check", str(path), "--format", "json"])
        assert res.exit_code in (0, 1), res.output
        return json.loads(res.stdout)

    return _run
