"""The one compare-and-emit helper: a value held against a limit becomes a Finding.

Every check that compares a figure with a rule's limit calls :func:`compare` instead of
writing ``"ok" if value <= limit + 1e-9 else "fail"`` itself, so the tolerance, the
status of a failure (the rule row's own, ``fail`` or ``warn``) and the handling of a
figure that is missing are the same everywhere.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from typing import Literal

from ..findings import Finding

Direction = Literal["at_least", "at_most"]
TOLERANCE = 1e-9


def _number(v) -> float | None:
    if v is None:
        return None
    return float(v)


def passes(value, limit, direction: Direction, tolerance: float = TOLERANCE) -> bool | None:
    """Whether ``value`` meets ``limit``; None when either is missing or not a number.

    Examples
    --------
    >>> passes(100.0, 100.0 + 1e-12, "at_least"), passes(3.1, 3.0, "at_most")
    (True, False)
    >>> passes(None, 3.0, "at_most") is None
    True
    """
    v, lim = _number(value), _number(limit)
    if v is None or lim is None or math.isnan(v) or math.isnan(lim):
        return None
    if direction == "at_least":
        return v >= lim - tolerance
    if direction == "at_most":
        return v <= lim + tolerance
    raise ValueError(f"direction: got {direction!r}; expected 'at_least' or 'at_most'")


def compare(
    value,
    limit,
    direction: Direction,
    rule: Mapping | str,
    subject: str,
    check: str,
    unit: str,
    note: str = "",
    *,
    tolerance: float = TOLERANCE,
    fail_status: str | None = None,
) -> Finding:
    """A Finding for ``value`` held against ``limit``.

    Parameters
    ----------
    value, limit : float or None
        The figure checked and its limit (the finding keeps them as floats).
    direction : {"at_least", "at_most"}
        ``at_least``: passes when value ≥ limit − tolerance; ``at_most``: when
        value ≤ limit + tolerance.
    rule : mapping or str
        The rule row (its ``rule_id``, and its ``status`` for a failure when it has one),
        or a bare rule id (a failure is then ``fail``).
    subject, check, unit, note : str
        As in :class:`~feedcheck.findings.Finding`.
    tolerance : float
        Rounding allowance in the unit of the value.
    fail_status : str, optional
        Status of a failure when the rule row does not set it (default ``fail``).

    Returns
    -------
    Finding
        ``ok`` when it passes; the rule's failure status otherwise. A value or limit that
        is missing cannot be evaluated: never ``ok``, the failure status with the note
        saying what is missing.

    Examples
    --------
    >>> f = compare(180.0, 200.0, "at_most", {"rule_id": "r-1", "status": "warn"},
    ...             "LP1", "load vs bus", "A", "design current vs bus")
    >>> f.status, f.rule_id
    ('ok', 'r-1')
    >>> compare(210.0, 200.0, "at_most", "r-2", "LP1", "load vs bus", "A").status
    'fail'
    >>> compare(None, 200.0, "at_most", "r-2", "LP1", "load vs bus", "A").note
    'not evaluated: the value is missing'
    """
    if isinstance(rule, str):
        rule_id, status = rule, fail_status or "fail"
    else:
        rule_id = str(rule["rule_id"])
        status = str(rule.get("status") or fail_status or "fail")
    ok = passes(value, limit, direction, tolerance)
    if ok is None:
        missing = "value" if value is None or math.isnan(float(value)) else "limit"
        extra = f"not evaluated: the {missing} is missing"
        note = f"{note} ({extra})" if note else extra
    return Finding(
        subject,
        check,
        _number(value),
        _number(limit),
        unit,
        "ok" if ok else status,  # type: ignore[arg-type]
        rule_id,
        note,
    )
