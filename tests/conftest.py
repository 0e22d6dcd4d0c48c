import os
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "sample_jobs"

os.environ.setdefault("SOURCE_DATE_EPOCH", "1764547200")


@pytest.fixture(autouse=True)
def _reset_user_tables():
    from feedcheck.tables import set_user_tables_dir

    set_user_tables_dir(None)
    yield
    set_user_tables_dir(None)


@pytest.fixture
def samples() -> Path:
    return SAMPLES


@pytest.fixture
def write_job(tmp_path):
    """Write a job file from TOML text into a fresh folder; return its path."""

    def _write(text: str, name: str = "job.toml") -> Path:
        # schedules referenced by the sample jobs travel with them
        for extra in SAMPLES.iterdir():
            if extra.suffix in (".csv", ".xlsx") and not (tmp_path / extra.name).exists():
                (tmp_path / extra.name).write_bytes(extra.read_bytes())
        p = tmp_path / name
        p.write_text(text, encoding="utf-8")
        return p

    return _write
