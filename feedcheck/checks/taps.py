"""Runs without an overcurrent device of their own: which device protects a run, and the
tap rules a run without one must be built under (NFPA 70-2023 240.21(B) and (C)).

The one rule, stated (the same for every check that needs "the device of a run"):

- a run's own ``device`` (at its sending end) protects it;
- a run into a transformer with no device of its own is protected by that transformer's
  ``primary_device`` (taken at the supply end of the primary conductors);
- a run out of a transformer with no device of its own and no ``tap_rule`` is protected by
  the transformer's ``secondary_device``, taken at the transformer's secondary terminals
  (it is then a feeder checked against that device, and the device the instantaneous-trip
  check uses);
- a run with a ``tap_rule`` has no device at its supply end: it is a feeder tap
  (240.21(B)(1), (B)(2)) or transformer secondary conductors (240.21(C)(2), (C)(6)), and
  every condition of that rule is checked; a transformer's ``secondary_device`` is then
  not taken as protecting it;
- any other run without a device fails 240.21.
"""

from __future__ import annotations

from ..model import SOURCE_ID, Run
from .context import Context

FEEDER_TAPS = {"10 ft": "tap-10ft", "25 ft": "tap-25ft"}
SECONDARY_TAPS = {
    "transformer secondary 10 ft": "xfmr-secondary-10ft",
    "transformer secondary 25 ft": "xfmr-secondary-25ft",
}


def run_device(ctx: Context, run: Run) -> tuple[float | None, str]:
    """The device protecting ``run`` and where it is: ``"run"``, ``"transformer primary"``,
    ``"transformer secondary"``, ``"service disconnect"`` (service conductors without a
    device at the source: the main device of the service equipment they end at, NFPA
    70-2023 230.90(A), 230.91), ``"tap"`` (a declared tap rule: none) or ``""`` (none).

    This is the module docstring's rule, the one every check uses.
    """
    if run.device_a is not None:
        return run.device_a, "run"
    if run.tap_rule:
        return None, "tap"
    tx = ctx.transformer_by_id
    if run.to_id in tx:
        return tx[run.to_id].primary_device_a, "transformer primary"
    if run.from_id in tx and tx[run.from_id].secondary_device_a is not None:
        return tx[run.from_id].secondary_device_a, "transformer secondary"
    if run.from_id == SOURCE_ID:  # service conductors: protected at their load end
        panel = ctx.panel_by_id.get(run.to_id)
        if panel is not None and panel.main_device_a is not None:
            return panel.main_device_a, "service disconnect"
    return None, ""


def bus_device(ctx: Context, node: str) -> tuple[float | None, str]:
    """The device protecting the bus of panel ``node`` (408.36): its main device, else the
    device protecting the run into it (:func:`run_device`); a tap ending at a main-lugs
    panel has no device of its own, so the feeder device it is tapped from is returned.
    Returns (rating, description)."""
    panel = ctx.panel_by_id.get(node)
    if panel is not None and panel.main_device_a is not None:
        return panel.main_device_a, f"main device of {node}"
    run = ctx.job.tree.parent_run.get(node)
    if run is None:
        return None, "no device"
    device, where = run_device(ctx, run)
    if device is not None:
        return device, f"device of run {run.id} ({where})"
    if where == "tap":
        up, what = feeder_device(ctx, run)
        if up is not None:
            return up, f"{what}, through the tap {run.id}"
    return None, f"no device (run {run.id} has none)"


def feeder_device(ctx: Context, run: Run) -> tuple[float | None, str]:
    """The device protecting the conductors a tap ``run`` is tapped from: the bus device of
    the panel it leaves (a tap from a tap has none: 240.21, first paragraph)."""
    if ctx.job.tree.kind.get(run.from_id) != "panel":
        return None, f"{run.from_id} is not a panel"
    up_run = ctx.job.tree.parent_run.get(run.from_id)
    panel = ctx.panel_by_id[run.from_id]
    if panel.main_device_a is None and up_run is not None and up_run.tap_rule:
        return None, f"{run.from_id} is itself fed by a tap ({up_run.id})"
    return bus_device(ctx, run.from_id)


def check_unprotected_run(ctx: Context, run: Run, ampacity_a: float) -> None:
    """A run with no device protecting it (:func:`run_device` gives none): a declared
    tap rule and all its conditions, or a failure of 240.21."""
    ctx.method(
        "Conductors without a device at their supply: declared tap rule, length, ampacity "
        "against the feeder (or primary) device share, one device at the end",
        "NFPA 70-2023 240.21, 240.21(B)(1), (B)(2), (C)(2), (C)(6)",
    )
    from_transformer = ctx.tree.kind.get(run.from_id) == "transformer"
    if run.tap_rule in FEEDER_TAPS and from_transformer:
        _unprotected(
            ctx,
            run,
            f"tap_rule = '{run.tap_rule}' is a feeder tap rule (240.21(B)); conductors from "
            f"the transformer secondary are under 240.21(C): declare 'transformer secondary "
            f"{run.tap_rule}' or give the run's device",
        )
        return
    if run.tap_rule in SECONDARY_TAPS or (not run.tap_rule and from_transformer):
        from .secondary import check_secondary_arrangement

        check_secondary_arrangement(ctx, run, ampacity_a)
        return
    if not run.tap_rule:
        _unprotected(
            ctx,
            run,
            f"no device protects {run.id} ({run.from_id} → {run.to_id}): give the run's "
            "device, or declare the tap rule it is built under (tap_rule = '10 ft' or "
            "'25 ft') so its conditions are checked",
        )
        return
    _check_feeder_tap(ctx, run, ampacity_a)


def _check_feeder_tap(ctx: Context, run: Run, ampacity_a: float) -> None:
    """240.21(B)(1) (10 ft) and (B)(2) (25 ft): length, ampacity against a share of the
    feeder device, and the one device the tap ends in."""
    rid = FEEDER_TAPS[run.tap_rule]
    rules = ctx.rules
    limit_m = rules.rule(rid).number("limit")
    ctx.compare(
        run.id,
        f"tap length ({run.tap_rule} rule)",
        run.length_m,
        limit_m,
        "m",
        "at_most",
        rid,
        f"{ctx.length(run.length_m, 1)} tap under the {run.tap_rule} rule "
        f"(at most {ctx.length(limit_m)}); a longer run needs a device at its supply end",
    )
    feeder_a, what = feeder_device(ctx, run)
    share_pct = rules.rule(f"{rid}-ratio").number("limit")
    if feeder_a is None:
        ctx.add(
            run.id,
            f"tap ampacity vs feeder device ({run.tap_rule} rule)",
            ampacity_a,
            None,
            "A",
            "fail",
            f"{rid}-ratio",
            f"not evaluated: no device protects the feeder the tap is made from ({what}); "
            "a tap is made from conductors protected by a device",
        )
    else:
        need = feeder_a * share_pct / 100.0
        ctx.compare(
            run.id,
            f"tap ampacity vs feeder device ({run.tap_rule} rule)",
            ampacity_a,
            need,
            "A",
            "at_least",
            f"{rid}-ratio",
            f"tap ampacity {ampacity_a:.0f} A vs {share_pct:.4g} % of the {feeder_a:g} A "
            f"feeder device ({what}) = {need:.1f} A; larger tap conductors or a device at "
            "the tap",
        )
    _check_tap_end_device(ctx, run, ampacity_a, rid)


def _check_tap_end_device(ctx: Context, run: Run, ampacity_a: float, rid: str) -> None:
    """The tap ends in one device rated at most the tap's ampacity (240.21(B)(1)(1)b:
    ampacity not less than the device at the termination; (B)(2)(2): a single device
    limiting the load to the tap's ampacity)."""
    panel = ctx.panel_by_id.get(run.to_id)
    end = panel.main_device_a if panel is not None else None
    check = "tap ends in one device"
    if end is None:
        ctx.add(
            run.id,
            check,
            None,
            ampacity_a,
            "A",
            "fail",
            f"{rid}-end-device",
            f"{run.to_id} has no main device: a tap without a device at its supply end must "
            f"end in one device rated at most its ampacity ({ampacity_a:.0f} A); add a "
            "main device to the panel",
        )
        return
    pct = ctx.rules.rule(f"{rid}-end-device").number("limit")
    ctx.compare(
        run.id,
        check,
        end,
        ampacity_a * pct / 100.0,
        "A",
        "at_most",
        f"{rid}-end-device",
        f"main device {end:g} A of {run.to_id} vs tap ampacity {ampacity_a:.0f} A; a "
        "smaller main device or larger tap conductors",
    )


def tap_needs_a(ctx: Context, run: Run) -> float:
    """The least ampacity a tap run needs by its rule (0 when it has no tap rule), for
    verifying a suggested conductor size."""
    if run.tap_rule in FEEDER_TAPS:
        rid = FEEDER_TAPS[run.tap_rule]
        feeder_a, _ = feeder_device(ctx, run)
        share = ctx.rules.rule(f"{rid}-ratio").number("limit") / 100.0
        panel = ctx.panel_by_id.get(run.to_id)
        end = panel.main_device_a if panel is not None and panel.main_device_a else 0.0
        return max((feeder_a or 0.0) * share, end)
    if run.tap_rule in SECONDARY_TAPS or (
        not run.tap_rule
        and run.device_a is None
        and ctx.tree.kind.get(run.from_id) == "transformer"
        and run_device(ctx, run)[0] is None
    ):
        from .secondary import secondary_need_a

        return secondary_need_a(ctx, run) or 0.0
    return 0.0


def _unprotected(ctx: Context, run: Run, note: str) -> None:
    """A failing "overcurrent protection" finding: nothing protects the run under 240.21."""
    ctx.add(run.id, "overcurrent protection", None, None, "A", "fail", "feeder-unprotected", note)
