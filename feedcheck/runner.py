"""Read a job (and its schedules) and run the checks: the one entry point the CLI,
the report and the re-run use, so they all compute the same figures."""

from __future__ import annotations

from pathlib import Path

from .checks import check_job
from .job import read_job
from .results import Results


def run_job(job_file: str | Path) -> Results:
    """Read, validate and check a job file; raises InputError on bad input."""
    job = read_job(job_file)
    return check_job(job)
