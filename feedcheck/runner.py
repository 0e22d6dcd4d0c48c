"""Read a job (and its schedules) and run the checks: the one entry point the CLI,
the report and the re-run use, so they all compute the same figures."""

from __future__ import annotations

from pathlib import Path

from .checks import check_job
from .job import Job, read_job
from .results import Results


def load_and_check(job_file: str | Path) -> tuple[Job, Results]:
    """Read, validate and check a job file; raises InputError on bad input."""
    job = read_job(job_file)
    return job, check_job(job)


def run_job(job_file: str | Path) -> Results:
    """Results of :func:`load_and_check` alone."""
    return load_and_check(job_file)[1]
