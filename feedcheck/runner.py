"""Read a job (and its schedules) and run the checks: the one entry point the CLI,
the report and the re-run use, so they all compute the same figures."""

from __future__ import annotations

from pathlib import Path

from .checks import check_job
from .inputs.job_file import read_job
from .model import Job
from .results import Results


def load_and_check(job_file: str | Path) -> tuple[Job, Results]:
    """Read, validate and check a job file; raises InputError on bad input.

    Panels with a ``schedule`` file: the schedule is read (every problem of every
    schedule reported together), its demand load replaces the panel's ``load`` in the
    feed walk, and its circuits are checked with the panel's feeder drop (node value
    ``conductor_vdrop_pct``, the conductor drop since the transformer secondary). The
    checked schedules go to ``results.schedules[panel_id]`` and their findings to
    ``results.findings``.
    """
    job = read_job(job_file)
    schedules = _read_job_schedules(job)
    if not schedules:
        return job, check_job(job)
    from .schedule_checks import check_schedule, demand_load

    tree = job.tree
    panels = {p.id: p for p in job.panels}
    # the walk needs each panel's demand; the circuits are checked once, after the walk
    # has given each panel its feeder drop
    demands = {
        pid: demand_load(s, tree.voltage_of[pid], panels[pid].occupancy)
        for pid, s in schedules.items()
    }
    results = check_job(job, demands)
    # branch drops add to the conductor drop since the transformer secondary (the same
    # basis as the panel's own total-drop check), under the job's drop rules
    drops = {n.id: float(n.values.get("conductor_vdrop_pct", 0.0) or 0.0) for n in results.nodes}
    limits = _drop_rules(job)
    for pid, s in schedules.items():
        res = check_schedule(
            s,
            tree.voltage_of[pid],
            feeder_drop_pct=drops.get(pid, 0.0),
            bus_a=panels[pid].rating_a,
            main_a=panels[pid].main_device_a,
            branch_rule=limits["branch"],
            total_rule=limits["total"],
            occupancy=panels[pid].occupancy,
        )
        results.schedules[pid] = res
        results.findings.extend(res.findings)
    return job, results


def _read_job_schedules(job: Job) -> dict:
    """Each panel's schedule, read and validated; one InputError for all of them."""
    from .errors import InputError
    from .inputs.schedule_file import read_schedule

    out, problems = {}, []
    for p in job.panels:
        if p.schedule is None:
            continue
        try:
            sched = read_schedule(p.schedule, panel_id=p.id)
        except InputError as exc:
            problems.extend(exc.problems)
            continue
        if sched.panels != (p.id,):
            from .errors import Problem

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


def _drop_rules(job: Job) -> dict:
    """The job's branch and total drop rules: a rule id, or the job's own limit as
    (rule_id, max %, status)."""
    mandatory = job.options.voltage_drop == "mandatory"
    status = "fail" if mandatory else "warn"
    ids = {
        "branch": "vd-energy-branch-3" if mandatory else "vd-nec-branch",
        "total": "vd-energy-total-5" if mandatory else "vd-nec-total",
    }
    given = {"branch": job.options.branch_drop_pct, "total": job.options.total_drop_pct}
    return {k: (f"vd-job-{k}", given[k], status) if given[k] is not None else ids[k] for k in ids}


def run_job(job_file: str | Path) -> Results:
    """Results of :func:`load_and_check` alone."""
    return load_and_check(job_file)[1]
