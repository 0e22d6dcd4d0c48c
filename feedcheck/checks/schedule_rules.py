"""Per-circuit schedule rules as data, and the one vectorised loop that applies them.

Each :class:`CircuitRule` names the rule id (a row of ``tables/schedule_rules.csv``, or a
voltage-drop scope whose limit comes from the job's drop limits), the quantity columns
it compares, the test, and the message a failing circuit gets. :func:`apply_rules` runs
every rule on whole columns (no loop per circuit) and formats a message once per
distinct combination of the columns it is made of.
"""

from __future__ import annotations

import string
from dataclasses import dataclass

import numpy as np

from ..findings import SEVERITY, Finding

TOL = 1e-9


@dataclass(frozen=True)
class CircuitRule:
    """One per-circuit check.

    Attributes
    ----------
    check : str
        Finding check name.
    rule_id : str
        Row of ``tables/schedule_rules.csv`` (its status is used); or, with
        ``drop_scope``, ignored (id, limit and status come from the drop limit).
    value, limit : str
        Quantity columns compared (``limit`` may name a scalar quantity).
    test : {"ge", "le", "ok"}
        ``ge``: fails when value < limit − 1e-9; ``le``: fails when value > limit + 1e-9;
        ``ok``: fails where the boolean column ``ok_column`` is false.
    unit : str
        Unit of value and limit.
    message : str
        ``str.format`` text over quantity names: the reason a circuit fails.
    applies : str, optional
        Boolean column: the rule is held only where it is true.
    ok_column : str, optional
        For ``test="ok"``.
    drop_scope : str, optional
        ``branch`` or ``total``: a voltage-drop rule.
    """

    check: str
    rule_id: str
    value: str
    limit: str
    test: str
    unit: str
    message: str
    applies: str | None = None
    ok_column: str | None = None
    drop_scope: str | None = None


R = CircuitRule
CIRCUIT_RULES: tuple[CircuitRule, ...] = (
    R(
        "standard rating",
        "sched-standard-rating",
        "breaker_a",
        "breaker_a",
        "ok",
        "A",
        "{breaker_a:g} A is not a standard breaker rating (240.6(A))",
        ok_column="breaker_standard",
    ),
    R(
        "breaker vs load",
        "sched-breaker-load",
        "breaker_a",
        "need_breaker_a",
        "ge",
        "A",
        "breaker {breaker_a:g} A < {need_breaker_a:.1f} A load",
        applies="not_motor",
    ),
    R(
        "conductor vs load",
        "sched-conductor-load",
        "unadjusted_a",
        "need_conductor_a",
        "ge",
        "A",
        "{size} {material} {unadjusted_a:.0f} A < {need_conductor_a:.1f} A load",
        applies="not_motor",
    ),
    R(
        "conductor after derating",
        "sched-conductor-derated",
        "ampacity_a",
        "current_a",
        "ge",
        "A",
        "derated ampacity {ampacity_a:.1f} A < {current_a:.1f} A load",
        applies="not_motor",
    ),
    R(
        "motor conductor",
        "sched-motor-conductor",
        "ampacity_a",
        "motor_conductor_a",
        "ge",
        "A",
        "{size} {material} {ampacity_a:.1f} A < 125 % of {current_a:.1f} A motor",
        applies="motor",
    ),
    R(
        "small conductor",
        "sched-small-conductor",
        "breaker_a",
        "small_max_a",
        "le",
        "A",
        "{size} {material} on {breaker_a:g} A (at most {small_max_a:g} A)",
        applies="not_motor",
    ),
    R(
        "conductor vs breaker",
        "sched-conductor-breaker",
        "breaker_a",
        "max_device_a",
        "le",
        "A",
        "breaker {breaker_a:g} A over {ampacity_a:.1f} A conductor (max {max_device_a:g} A)",
        applies="not_motor_within_small",
    ),
    R(
        "motor breaker",
        "sched-motor-breaker",
        "breaker_a",
        "motor_max_a",
        "le",
        "A",
        "motor breaker {breaker_a:g} A over {motor_max_a:g} A (250 % rule)",
        applies="motor",
    ),
    R(
        "motor breaker minimum",
        "sched-motor-breaker-min",
        "breaker_a",
        "current_a",
        "ge",
        "A",
        "motor breaker {breaker_a:g} A below {current_a:.1f} A running current",
        applies="motor",
    ),
    R(
        "grounding conductor",
        "sched-egc",
        "ground_area_mm2",
        "ground_need_mm2",
        "ok",
        "mm2",
        "ground {ground_size} smaller than required for {breaker_a:g} A with {size} "
        "{material} (Table 250.122, increased in proportion when upsized)",
        ok_column="ground_ok",
    ),
    R(
        "poles vs panel",
        "sched-poles-phases",
        "poles_f",
        "max_poles",
        "le",
        "poles",
        "{poles} poles on a {phases}-phase panel",
    ),
    R(
        "neutral for one pole",
        "sched-neutral",
        "poles_f",
        "two",
        "ok",
        "poles",
        "one-pole circuit on {system} (no neutral)",
        ok_column="neutral_ok",
    ),
    R(
        "one pole on the high leg",
        "sched-high-leg",
        "poles_f",
        "two",
        "ok",
        "poles",
        "one-pole circuit {circuit} in a B space of {system}: the high leg is 208 V to "
        "neutral; put 120 V loads on A or C (408.3(E)(1), 110.15)",
        ok_column="high_leg_ok",
    ),
    R(
        "branch voltage drop",
        "",
        "vdrop_pct",
        "branch_limit_pct",
        "le",
        "%",
        "branch drop {vdrop_pct:.2f} % > {branch_limit_pct:g} %",
        drop_scope="branch",
    ),
    R(
        "total voltage drop",
        "",
        "total_vdrop_pct",
        "total_limit_pct",
        "le",
        "%",
        "total drop {total_vdrop_pct:.2f} % > {total_limit_pct:g} %",
        drop_scope="total",
    ),
)
del R


def unique_rows(*arrays) -> tuple[np.ndarray, np.ndarray]:
    """Distinct combinations of equal-length columns: ``(codes, first)``.

    ``codes[i]`` numbers the combination of row ``i`` (in order of first appearance) and
    ``first[j]`` is the first row holding combination ``j``, so ``f(x[first])[codes]``
    equals ``f(x)`` for a function that works row by row. Floats are told apart by
    their exact bits; a column with a missing value (None/NaN object) is not grouped.
    """
    import pandas as pd

    n = len(arrays[0]) if arrays else 0
    key = np.zeros(n, dtype=np.intp)
    for a in arrays:
        a = np.asarray(a)
        if a.dtype.kind == "f":
            a = np.ascontiguousarray(a, dtype=np.float64).view(np.int64)
        codes = pd.factorize(a)[0]
        if len(codes) and codes.min() < 0:
            return np.arange(n), np.arange(n)
        key = pd.factorize(key * (int(codes.max(initial=0)) + 1) + codes)[0]
    first = np.flatnonzero(~pd.Series(key).duplicated().to_numpy())
    return key, first


def per_unique(fn, *arrays, **kwargs):
    """``fn(*arrays, **kwargs)`` for a row-by-row function, called once per distinct row."""
    codes, first = unique_rows(*arrays)
    out = fn(*(np.asarray(a)[first] for a in arrays), **kwargs)
    if isinstance(out, tuple):
        return tuple(np.asarray(o)[codes] for o in out)
    return np.asarray(out)[codes]


def _texts(idx: np.ndarray, message: str, q: dict, n: int) -> np.ndarray:
    """``message`` formatted for each circuit of ``idx``, once per distinct combination of
    the per-circuit columns it names (scalars are the same for every circuit)."""
    names = [f for _, f, _, _ in string.Formatter().parse(message) if f]
    cols = [k for k in dict.fromkeys(names) if np.ndim(q[k]) == 1 and len(q[k]) == n]

    def one(i):
        return message.format(**{k: (q[k][i] if k in cols else q[k]) for k in names})

    if not cols:
        return np.full(len(idx), one(idx[0]), dtype=object)
    codes, first = unique_rows(*(np.asarray(q[k])[idx] for k in cols))
    made = np.array([one(i) for i in idx[first]] + [None], dtype=object)[:-1]
    return made[codes]


def _failing(rule: CircuitRule, q: dict, n: int) -> np.ndarray:
    value = np.broadcast_to(np.asarray(q[rule.value], float), (n,))
    limit = np.broadcast_to(np.asarray(q[rule.limit], float), (n,))
    if rule.test == "ge":
        bad = value < limit - TOL
    elif rule.test == "le":
        bad = value > limit + TOL
    elif rule.test == "ok":
        bad = ~np.asarray(q[rule.ok_column], bool)
    else:
        raise ValueError(f"rule {rule.check!r}: test {rule.test!r}; expected ge, le or ok")
    if rule.applies is not None:
        bad = bad & np.asarray(q[rule.applies], bool)
    return np.broadcast_to(bad, (n,))


def apply_rules(q: dict, n: int, statuses: dict[str, str], limits: dict, rules=CIRCUIT_RULES):
    """Every rule on every circuit.

    Parameters
    ----------
    q : dict
        Quantity name → array of ``n`` circuits (or a scalar).
    statuses : dict
        rule_id → status of ``tables/schedule_rules.csv``.
    limits : dict of DropLimit
        The job's ``branch`` and ``total`` drop limits.

    Returns
    -------
    severity : int array
        Worst :data:`~feedcheck.findings.SEVERITY` of each circuit.
    reason : object array
        The failing rules' messages of each circuit, joined with ``"; "``.
    found : list
        Per rule with failures: (check, rule_id, idx, values, limits, unit, status, texts).
    """
    sev = np.full(n, SEVERITY["ok"])
    reason = np.full(n, "", dtype=object)
    found = []
    for rule in rules:
        rid, status = rule.rule_id, statuses.get(rule.rule_id)
        if rule.drop_scope is not None:
            lim = limits[rule.drop_scope]
            rid, status = lim.rule_id, lim.status
        idx = np.flatnonzero(_failing(rule, q, n))
        if not len(idx):
            continue
        sev[idx] = np.minimum(sev[idx], SEVERITY[status])
        texts = _texts(idx, rule.message, q, n)
        reason[idx] = np.where(reason[idx] == "", texts, reason[idx] + "; " + texts)
        values = np.broadcast_to(np.asarray(q[rule.value], float), (n,))[idx]
        lims = np.broadcast_to(np.asarray(q[rule.limit], float), (n,))[idx]
        found.append((rule.check, rid, idx, values, lims, rule.unit, status, texts))
    return sev, reason, found


def circuit_findings(panel: np.ndarray, circuit: np.ndarray, found) -> list[Finding]:
    """One Finding per failing circuit check, check by check, circuits in order."""
    out: list[Finding] = []
    for name, rid, idx, vals, lims, unit, status, texts in found:
        subj = np.char.add(np.char.add(panel[idx].astype(str), "/"), circuit[idx].astype(str))
        # tolist(): Python str and float, as str()/float() of each element would give
        out.extend(
            Finding(s, name, v, lim, unit, status, rid, str(t))
            for s, v, lim, t in zip(
                subj.tolist(), vals.tolist(), lims.tolist(), texts.tolist(), strict=True
            )
        )
    return out
