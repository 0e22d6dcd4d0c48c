"""Transformer secondary conductors with no device at the transformer: the 10 ft and
25 ft arrangements of NFPA 70-2023 240.21(C)(2) and (C)(6).

The arrangement is the run's declared ``tap_rule`` ("transformer secondary 10 ft" or
"transformer secondary 25 ft"). A run out of a transformer with neither a device (its own
or the transformer's ``secondary_device``, see :mod:`feedcheck.checks.taps`) nor a declared
rule fails 240.21(C); the arrangement its length would allow is still checked so the
figures show what declaring it would need.
"""

from __future__ import annotations

from ..model import Run
from .context import Context

_RULES = {
    "transformer secondary 10 ft": "xfmr-secondary-10ft",
    "transformer secondary 25 ft": "xfmr-secondary-25ft",
}


def _arrangement(ctx: Context, run: Run) -> str | None:
    """Rule id of the arrangement: the declared one, else the one the length allows."""
    if run.tap_rule in _RULES:
        return _RULES[run.tap_rule]
    for rid in ("xfmr-secondary-10ft", "xfmr-secondary-25ft"):
        if run.length_m <= ctx.rules.rule(rid).number("limit") + 1e-9:
            return rid
    return None


def secondary_need_a(ctx: Context, run: Run) -> float | None:
    """Least ampacity [A] of the secondary conductors by their arrangement (None when the
    run is longer than either arrangement allows)."""
    rid = _arrangement(ctx, run)
    if rid is None:
        return None
    return _need(ctx, run, rid)[0]


def _need(ctx: Context, run: Run, rid: str) -> tuple[float, str]:
    """240.21(C)(2)(1)(b) and (C)(6)(1): ampacity at least a share (in %) of the primary
    device times the primary-to-secondary voltage ratio, the shares read from their rule
    rows; (C)(2)(1)(a): for 10 ft also at least the device the conductors end in."""
    t = ctx.transformer_by_id[run.from_id]
    ratio = t.primary.voltage_ll_v / t.secondary.voltage_ll_v
    share_pct = ctx.rules.rule(f"{rid}-ratio").number("limit")
    divisor = 100.0 / share_pct
    by_ratio = t.primary_device_a * ratio / divisor
    part = (
        f"primary device {t.primary_device_a:g} A × voltage ratio {ratio:.3f} ÷ {divisor:g}"
        f" = {by_ratio:.1f} A"
    )
    end = _end_device(ctx, run)
    if rid == "xfmr-secondary-10ft" and end is not None:
        return max(by_ratio, end), f"the larger of {part} and the end device {end:g} A"
    return by_ratio, part


def _end_device(ctx: Context, run: Run) -> float | None:
    panel = ctx.panel_by_id.get(run.to_id)
    return panel.main_device_a if panel else None


def check_secondary_arrangement(ctx: Context, run: Run, ampacity: float) -> None:
    """Length, ampacity and end device of secondary conductors without a device at the
    transformer (240.21(C)(2), (C)(6))."""
    rid = _arrangement(ctx, run)
    if not run.tap_rule:
        longest = ctx.length(ctx.rules.rule("xfmr-secondary-25ft").number("limit"))
        allows = (
            f"its length would allow tap_rule = '{_label(rid)}'"
            if rid
            else f"it is longer than {longest}, so it needs a device at the transformer"
        )
        ctx.add(
            run.id,
            "secondary conductor protection",
            None,
            None,
            "A",
            "fail",
            "xfmr-secondary-unprotected",
            f"no device at the transformer protects {run.id} and no tap_rule is declared: "
            f"give the run's device (or the transformer's secondary_device), or declare "
            f"the 240.21(C) arrangement it is built under ({allows})",
        )
    declared = _RULES.get(run.tap_rule, rid or "xfmr-secondary-25ft")
    limit_m = ctx.rules.rule(declared).number("limit")
    if rid is None or (run.tap_rule and run.length_m > limit_m + 1e-9):
        ctx.compare(
            run.id,
            "secondary conductor length",
            run.length_m,
            limit_m,
            "m",
            "at_most",
            declared,
            f"{ctx.length(run.length_m)} of secondary conductors with no device at "
            f"the transformer: more than {ctx.length(limit_m)} needs a device at the "
            "transformer",
        )
        return
    rid = declared
    need, how = _need(ctx, run, rid)
    ctx.compare(
        run.id,
        f"secondary conductors ({_label(rid).removeprefix('transformer secondary ')} arrangement)",
        ampacity,
        need,
        "A",
        "at_least",
        rid,
        f"ampacity {ampacity:.0f} A vs required {need:.0f} A: {how}",
    )
    _check_end_device(ctx, run, ampacity)


def _label(rid: str | None) -> str:
    return {v: k for k, v in _RULES.items()}.get(rid or "", "")


def _check_end_device(ctx: Context, run: Run, ampacity: float) -> None:
    end_device = _end_device(ctx, run)
    if end_device is None:
        ctx.add(
            run.id,
            "secondary conductors end in one device",
            None,
            None,
            "",
            "fail",
            "xfmr-secondary-end-device",
            f"{run.to_id} has no main device; secondary conductors without protection at "
            "the transformer must end in one device: add a main device rated at most "
            f"{ampacity:.0f} A",
        )
        return
    end_pct = ctx.rules.rule("xfmr-secondary-end-device").number("limit")
    ctx.compare(
        run.id,
        "secondary conductors end in one device",
        end_device,
        ampacity * end_pct / 100.0,
        "A",
        "at_most",
        "xfmr-secondary-end-device",
        f"main device {end_device:g} A vs conductor ampacity {ampacity:.0f} A",
    )
