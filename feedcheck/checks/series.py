"""Series-rated combinations (NFPA 70-2023 240.86(B), (C); 110.22(C)).

A panel may declare that its devices are series rated with a line-side device: the
device of a run on its own feed (``series_upstream``), at the combination's tested
rating (``series_rating``). The interrupting check then holds the duty against the
combination's rating instead of the panel's own; the line-side device must be the one
the combination names (``series_upstream_device``, its rating as marked); the
equipment must carry the combination's marking (110.22(C), a reminder); and the
combination may not be used where motors between the two devices add more than 1 % of
the lower-rated device's own interrupting rating (240.86(C)).
"""

from __future__ import annotations

from ..model import Panel
from .context import Context

RULE = "series-rated"
RULE_MOTORS = "series-rated-motors"


def series_rating_a(ctx: Context, panel: Panel) -> tuple[float | None, str]:
    """The rating the interrupting duty is held against: the combination's when the
    panel declares one and its conditions hold (with the reason), else the panel's own."""
    if panel.series_rating_a is None or not panel.series_upstream_run:
        return panel.interrupting_a, ""
    ctx.method(
        "Series-rated combination: the duty held against the tested rating of the "
        "combination; the line-side device confirmed; motor contribution between the two "
        "devices at most 1 % of the lower-rated device's interrupting rating",
        "NFPA 70-2023 240.86(B), 240.86(C), 110.22(C)",
    )
    run = ctx.run_by_id[panel.series_upstream_run]
    declared = panel.series_upstream_device_a
    if declared is not None and abs(declared - (run.device_a or 0.0)) > 1e-9:
        ctx.add(
            panel.id, "series combination, line-side device", run.device_a, declared, "A",
            "fail", RULE,
            f"the combination names a {declared:g} A line-side device; run {run.id} has "
            f"{run.device_a:g} A: the series rating does not apply (240.86(B))",
        )  # fmt: skip
        return panel.interrupting_a, ""
    if not _motors_within_limit(ctx, panel, run.id):
        return panel.interrupting_a, ""
    ctx.add(
        panel.id, "series combination marking", panel.series_rating_a, None, "A", "info",
        RULE,
        f"series rated with the {run.device_a:g} A device of run {run.id} at "
        f"{panel.series_rating_a / 1000:g} kA: the equipment must be marked with the "
        "combination (110.22(C), 240.86(B)); the line-side device's own rating must meet "
        "the duty where it is installed",
    )  # fmt: skip
    return panel.series_rating_a, f"series-rated with run {run.id}'s device"


def _motors_within_limit(ctx: Context, panel: Panel, run_id: str) -> bool:
    """240.86(C): full-load current of the motors fed between the line-side device and
    this panel (on this panel, or on the panels along the feed between them) at most
    1 % of this panel's own interrupting rating."""
    tree = ctx.tree
    between, n = [], panel.id
    while n is not None:
        between.append(n)
        run = tree.parent_run.get(n)
        if run is not None and run.id == run_id:
            break
        n = tree.parent_node[n]
    motors = [m for m in ctx.job.motors if m.panel_id in between]
    if not motors:
        return True
    total = sum(m.full_load_a for m in motors)
    own = panel.interrupting_a
    if own is None:
        ctx.add(
            panel.id, "series combination, motor contribution", total, None, "A", "fail",
            RULE_MOTORS,
            "not evaluated: motors are fed between the devices of the combination and the "
            "panel gives no interrupting rating of its own (240.86(C) limit: 1 % of it)",
        )  # fmt: skip
        return False
    limit = ctx.rules.rule(RULE_MOTORS).number("limit") / 100.0 * own
    f = ctx.compare(
        panel.id,
        "series combination, motor contribution",
        total,
        limit,
        "A",
        "at_most",
        RULE_MOTORS,
        f"motors {', '.join(m.id for m in motors)}: {total:.1f} A full load vs 1 % of "
        f"{own / 1000:g} kA" + "",
    )
    return f.status == "ok"
