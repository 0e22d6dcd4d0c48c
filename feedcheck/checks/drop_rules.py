"""The job's voltage-drop limits: the one place they are chosen.

The feed walk (:mod:`feedcheck.checks.vdrop`), the schedule checks and the runner all
take their feeder, branch and total limits from :func:`drop_limits`. A limit is a row of
``tables/voltage_drop_limits.csv`` (its ``max_pct`` and ``status`` honoured as given,
also from a ``--tables`` copy), or the job's own figure from ``[options]``.
"""

from __future__ import annotations

from dataclasses import dataclass

SCOPES = ("feeder", "branch", "total")
RULE_IDS = {
    "recommended": {
        "feeder": "vd-nec-feeder",
        "branch": "vd-nec-branch",
        "total": "vd-nec-total",
    },
    "mandatory": {
        "feeder": "vd-energy-feeder-2",
        "branch": "vd-energy-branch-3",
        "total": "vd-energy-total-5",
    },
}


@dataclass(frozen=True)
class DropLimit:
    """One voltage-drop limit: its scope, largest drop [%], status of an exceedance, the
    rule id findings cite and the clause (or "set in the job")."""

    scope: str
    max_pct: float
    status: str
    rule_id: str
    clause: str


def drop_limits(
    voltage_drop: str = "recommended",
    feeder_pct: float | None = None,
    branch_pct: float | None = None,
    total_pct: float | None = None,
    rules=None,
) -> dict[str, DropLimit]:
    """Feeder, branch and total limits for a rule choice and the job's own figures.

    Parameters
    ----------
    voltage_drop : {"recommended", "mandatory"}
        The job's ``[options] voltage_drop``: the NFPA 70 informational-note figures
        (warnings) or the energy-code figures (failures).
    feeder_pct, branch_pct, total_pct : float, optional
        The job's own limits [%]; each replaces the rule row of its scope and takes the
        status of the rule choice.
    rules : RuleBook, optional
        The rule book (default: the tables in force, shipped or ``--tables``).

    Examples
    --------
    >>> lim = drop_limits()
    >>> lim["branch"].rule_id, lim["branch"].max_pct, lim["branch"].status
    ('vd-nec-branch', 3.0, 'warn')
    >>> drop_limits("mandatory", total_pct=4.0)["total"].rule_id
    'vd-job-total'
    """
    if rules is None:
        from ..rulebook import current_rulebook

        rules = current_rulebook()
    if voltage_drop not in RULE_IDS:
        raise ValueError(
            f"voltage_drop: got {voltage_drop!r}; expected one of {', '.join(RULE_IDS)}"
        )
    given = {"feeder": feeder_pct, "branch": branch_pct, "total": total_pct}
    status = "fail" if voltage_drop == "mandatory" else "warn"
    out = {}
    for scope in SCOPES:
        if given[scope] is not None:
            out[scope] = DropLimit(
                scope,
                float(given[scope]),
                status,
                f"vd-job-{scope}",
                f"limit set in the job's [options] ({voltage_drop})",
            )
            continue
        rid = RULE_IDS[voltage_drop][scope]
        row = rules.rule(rid)
        out[scope] = DropLimit(
            scope, row.number("max_pct"), row.text("status"), rid, row.text("clause")
        )
    return out


def job_drop_limits(job, rules=None) -> dict[str, DropLimit]:
    """:func:`drop_limits` of a job's ``[options]``."""
    o = job.options
    return drop_limits(
        o.voltage_drop, o.feeder_drop_pct, o.branch_drop_pct, o.total_drop_pct, rules=rules
    )
