"""Read a job (and its schedules) and run the checks: the one entry point the CLI,
the report, the re-run and ``feedcheck schedule --job`` use, so they all compute the
same figures."""

from __future__ import annotations

import gc
import threading
from contextlib import contextmanager
from pathlib import Path

from .checks import check_job
from .inputs.job_file import read_job
from .model import Job
from .results import Results


def load_and_check(job_file: str | Path, calc_date: str | None = None) -> tuple[Job, Results]:
    """Read, validate and check a job file; raises InputError on bad input.

    Panels with a ``schedule`` file: the schedule is read (every problem of every
    schedule reported together), its demand load replaces the panel's ``load`` in the
    feed walk, and its circuits are checked with the panel's feeder drop (node value
    ``conductor_vdrop_pct``, the conductor drop since the transformer secondary), the
    panel's bus and main ratings and the job's drop limits. The checked schedules go to
    ``results.schedules[panel_id]`` and their findings to ``results.findings``.

    ``calc_date`` (ISO date) labels the fault-current marking when the job gives no
    date; by default the command's clock (:func:`feedcheck.commands.clock.calc_date`,
    which honours ``SOURCE_DATE_EPOCH``).
    """
    if calc_date is None:
        from .commands.clock import calc_date as today

        calc_date = today()
    with fewer_collections():
        job = read_job(job_file)
        return job, check_job_with_schedules(job, read_job_schedules(job), calc_date)


_GC = {"depth": 0, "saved": None}  # fewer_collections(): blocks open, thresholds before
_GC_LOCK = threading.Lock()


@contextmanager
def fewer_collections():
    """Python's cycle collector run less often while a job is read and checked.

    Reading and checking a building makes a few hundred thousand small objects (frames,
    findings, sheets) that live until the results are built; with the default
    thresholds the collector scans them over and over (a sixth of a 1,000-panel
    check). Its thresholds are raised (never lowered) while any such block is open, in
    any thread (the workbench checks in its request threads), and restored when the
    last one closes; nothing is left uncollected, only collected later."""
    with _GC_LOCK:
        if _GC["depth"] == 0:
            old = _GC["saved"] = gc.get_threshold()
            gc.set_threshold(max(old[0], 50_000), max(old[1], 20), max(old[2], 100))
        _GC["depth"] += 1
    try:
        yield
    finally:
        with _GC_LOCK:
            _GC["depth"] -= 1
            if _GC["depth"] == 0:
                gc.set_threshold(*_GC["saved"])


def check_job_with_schedules(job: Job, schedules: dict, calc_date: str | None = None) -> Results:
    """Check a job whose panels' schedules are already read (``{panel_id: Schedule}``).

    Each panel's demand is computed once, used for the feed walk, and reused by its
    circuit checks after the walk has given the panel its feeder drop. Panels alike in
    system, occupancy and load unit are checked in one frame
    (:class:`~feedcheck.checks.schedule_batch.ScheduleBatch`).
    """
    with fewer_collections():
        return _check_with_schedules(job, schedules, calc_date)


def _check_with_schedules(job: Job, schedules: dict, calc_date: str | None) -> Results:
    from .rulebook import current_rulebook

    book = current_rulebook()
    if not schedules:
        return check_job(job, calc_date=calc_date, rules=book)
    from .checks.drop_rules import job_drop_limits
    from .checks.schedule_batch import ScheduleBatch

    batch = ScheduleBatch(job, schedules, book)
    results = check_job(job, batch.loads(), calc_date, book)
    # branch drops add to the conductor drop since the transformer secondary (the same
    # basis as the panel's own total-drop check), under the job's drop limits
    # (with a standby source: the larger of the two positions' feeder drops)
    drops = {
        n.id: max(
            float(n.values.get(k, 0.0) or 0.0)
            for k in ("conductor_vdrop_pct", "standby_conductor_vdrop_pct")
        )
        for n in results.nodes
    }
    for pid, res in batch.check(drops, job_drop_limits(job, book)).items():
        res.findings = book.with_cited_notes(res.findings)  # rule rows not confirmed
        results.schedules[pid] = res
        results.findings.extend(res.findings)
    return results


def read_job_schedules(job: Job, grids: dict | None = None) -> dict:
    """Each panel's schedule, read and validated; one InputError for all of them.

    ``grids``: panel id → the schedule's cells already in memory (an edited grid, row 0
    as the file's first row), read in place of the panel's file.
    """
    from .errors import InputError, Problem
    from .inputs.schedule_alike import ScheduleReader

    panels = [p for p in job.panels if p.schedule is not None]
    reader = ScheduleReader()  # alike files read together, each file's result its own
    for p in panels:
        cols = dict(getattr(p, "schedule_columns", ()))
        reader.add(p.schedule, p.id, cols or None, cells=(grids or {}).get(p.id))
    out, problems = {}, []
    for p, sched in zip(panels, reader.read(), strict=True):
        if isinstance(sched, InputError):
            problems.extend(sched.problems)
            continue
        if sched.panels != (p.id,):
            problems.append(
                Problem(
                    str(p.schedule),
                    "column 'panel'",
                    ", ".join(sched.panels),
                    f"only panel {p.id!r} (the panel whose schedule it is)",
                )
            )
            continue
        out[p.id] = sched
    if problems:
        raise InputError(problems)
    return out


_read_job_schedules = read_job_schedules  # the former name


def run_job(job_file: str | Path, calc_date: str | None = None) -> Results:
    """Results of :func:`load_and_check` alone."""
    return load_and_check(job_file, calc_date)[1]
