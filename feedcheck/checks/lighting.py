"""Minimum general lighting load of a panel (issue 13 item 9, NFPA 70 220.12).

Where a panel gives an ``occupancy`` with a row in ``tables/lighting_unit_loads.csv``
and its floor ``area``, the scheduled general lighting is held against unit load × area
(:func:`feedcheck.calc.lighting.minimum_lighting_load`). The larger is the lighting load
used: a shortfall is added to the panel's own load (continuous, power factor 1, spread
evenly over its lines) before the loads are rolled up, and a warning names it.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..calc.lighting import M2_PER_FT2, minimum_lighting_load, unit_load_va_per_m2
from ..model import Job


@dataclass(frozen=True)
class LightingMinimum:
    panel_id: str
    rule_id: str
    unit_va_per_ft2: float
    area_m2: float
    scheduled_va: float | None  # None: the panel has no schedule
    minimum_va: float
    used_va: float
    below: bool


def minimum_lighting(job: Job, rules, lighting_va: dict[str, float]) -> list[LightingMinimum]:
    """The 220.12 figures of every panel with an occupancy row and an area.

    ``lighting_va``: connected general lighting of each panel with a schedule [VA]."""
    rows = {str(r["occupancy"]): r for r in rules.rows("lighting_unit_loads")}
    out = []
    for p in job.panels:
        if p.area_m2 is None or p.occupancy not in rows:
            continue
        row = rows[p.occupancy]
        unit = float(row["va_per_ft2"])
        sched = lighting_va.get(p.id)
        r = minimum_lighting_load(sched or 0.0, p.area_m2, unit_load_va_per_m2(unit))
        out.append(
            LightingMinimum(
                p.id,
                str(row["rule_id"]),
                unit,
                p.area_m2,
                sched,
                float(r.minimum_va),
                float(r.used_va),
                bool(r.below),
            )
        )
    return out


def report_minimum_lighting(ctx) -> None:
    """Findings and sheet steps of the 220.12 minimum (figures from the context)."""
    for m in ctx.lighting_minimum:
        sh = ctx.sheet(m.panel_id, "panel", f"Panel {m.panel_id}")
        area_ft2 = m.area_m2 / M2_PER_FT2
        sh.step(
            "Minimum general lighting load (220.12)",
            "unit load × floor area",
            f"{m.unit_va_per_ft2:g} VA/ft² × {area_ft2:,.0f} ft²",
            m.minimum_va,
            "VA",
            m.rule_id,
        )
        if m.scheduled_va is None:
            note = (
                f"no schedule: the lighting on {m.panel_id} is unknown, so the 220.12 "
                f"minimum {m.minimum_va:,.0f} VA is added to its load (continuous)"
            )
            ctx.add(
                m.panel_id,
                "minimum lighting load",
                None,
                m.minimum_va,
                "VA",
                "warn",
                m.rule_id,
                note,
            )
            continue
        note = (
            f"scheduled general lighting {m.scheduled_va:,.0f} VA; Table 220.12 minimum "
            f"{m.minimum_va:,.0f} VA ({m.unit_va_per_ft2:g} VA/ft² × {area_ft2:,.0f} ft²); "
            f"{m.used_va:,.0f} VA used"
        )
        if m.below:
            note += " (the shortfall is added to the panel load as continuous lighting)"
        ctx.compare(
            m.panel_id,
            "minimum lighting load",
            m.scheduled_va,
            m.minimum_va,
            "VA",
            "at_least",
            m.rule_id,
            note,
            fail_status="warn",
            tolerance=0.0,
        )
