"""Findings: the one record every check emits and every renderer shows.

``Finding(subject, check, value, limit, unit, status, rule_id, note)`` with
``status`` one of ``ok``, ``warn``, ``fail``, ``info``. Renderers (CLI, PDF,
exports) only display findings; they compute nothing.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass
from typing import Literal

Status = Literal["ok", "warn", "fail", "info"]
STATUSES: tuple[Status, ...] = ("fail", "warn", "ok", "info")
SEVERITY = {"fail": 0, "warn": 1, "ok": 2, "info": 3}


@dataclass(frozen=True)
class Finding:
    """One check of one element.

    Attributes
    ----------
    subject : str
        Element id (``T1``, ``F-LP1``, ``LP1/3``).
    check : str
        Short name of the check (``secondary device``, ``ampacity``).
    value : float | None
        The computed or given figure that was checked.
    limit : float | None
        The limit it was held against.
    unit : str
        Unit of ``value`` and ``limit`` (``A``, ``%``, ``kcmil``).
    status : Status
        ``ok``, ``warn``, ``fail`` or ``info``.
    rule_id : str
        Id of the rule row (from ``tables/``) or method that set the limit.
    note : str
        One sentence a reader can act on (what was compared; what would fix it).
    unconfirmed : tuple of str
        One note per table row the figure is computed from whose value is not confirmed
        in a published copy ("uses an unconfirmed value from … row …"); empty for most.
    """

    subject: str
    check: str
    value: float | None
    limit: float | None
    unit: str
    status: Status
    rule_id: str
    note: str = ""
    unconfirmed: tuple[str, ...] = ()

    def as_dict(self) -> dict:
        """The finding as plain values; ``unconfirmed`` only when it has notes."""
        d = asdict(self)
        if self.unconfirmed:
            d["unconfirmed"] = list(self.unconfirmed)
        else:
            del d["unconfirmed"]
        for k in ("value", "limit"):
            v = d[k]
            if isinstance(v, float) and not math.isfinite(v):
                d[k] = None if math.isnan(v) else ("inf" if v > 0 else "-inf")
        return d


def status_of(passed: bool, warn_only: bool = False) -> Status:
    """``ok`` when passed, else ``warn`` or ``fail``."""
    if passed:
        return "ok"
    return "warn" if warn_only else "fail"


def sort_findings(findings: list[Finding]) -> list[Finding]:
    """Failures first, then warnings, ok, info; stable within each."""
    return sorted(findings, key=lambda f: SEVERITY[f.status])


def count_by_status(findings: list[Finding]) -> dict[str, int]:
    counts = {s: 0 for s in STATUSES}
    for f in findings:
        counts[f.status] += 1
    return counts
