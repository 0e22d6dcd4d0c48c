"""The demand arithmetic of a panel on its calculation sheet, as one chain (issue 13
item 3), for a panel with a schedule and for one given by ``load`` alone:

1. connected load by kind (a ``load`` panel: the job's figure, as "other");
1b. the shortfall to the minimum general lighting load of Table 220.12 (220.12), when
    the panel gives an occupancy with a row and an area: added as continuous lighting at
    100 % (the walk's load, checks/context.py);
2. after demand factors (a ``load`` panel: the job's figure is the demand, 100 %);
3. + 25 % of the largest motor (430.24), once;
4. + 25 % of the continuous non-motor demand (215.2(A)(1)), the 1b shortfall included.

The figures come from :func:`feedcheck.calc.demand_chain.demand_chain` (the schedule's
chain, or one built here for a ``load`` panel with the rule rows ``df-motor-largest``
and ``df-continuous``); nothing is computed twice.
"""

from __future__ import annotations

from ..calc.demand_chain import demand_chain
from ..calc.lighting import M2_PER_FT2


def given_load_chain(ctx, p):
    """The chain of a panel given by ``load`` (no schedule): the job's load and its
    continuous part as "other" at 100 %, no motor of its own (None: no load given)."""
    if p.load_va is None:
        return None
    return demand_chain(
        {"other": p.load_va},
        {"other": p.continuous_va},
        0.0,
        largest_motor_factor=ctx.rules.rule("df-motor-largest").number("factor"),
        continuous_factor=ctx.rules.rule("df-continuous").number("factor"),
    )


def demand_chain_steps(ctx, p, sheet) -> None:
    """Every step of the panel's demand chain on its sheet, each step once."""
    chain = ctx.chains.get(p.id)
    given = chain is None
    if given:
        chain = given_load_chain(ctx, p)
    minimum = next((m for m in ctx.lighting_minimum if m.panel_id == p.id), None)
    short = 0.0 if minimum is None else max(0.0, minimum.used_va - (minimum.scheduled_va or 0))
    if chain is None and minimum is None:
        return
    # the factors as the rule book gives them (rows df-motor-largest, df-continuous)
    f_motor, f_cont = (
        (chain.largest_motor_factor, chain.continuous_factor)
        if chain is not None
        else (ctx.rules.rule(r).number("factor") for r in ("df-motor-largest", "df-continuous"))
    )
    motor_adder, cont_adder_f = round(f_motor - 1.0, 6), round(f_cont - 1.0, 6)
    if chain is not None:
        kinds = [k for k, v in chain.connected_va.items() if v > 0]
        sheet.step(
            "1. Connected load",
            "the job's load (no schedule)" if given else "Σ circuit loads by kind",
            " + ".join(f"{k} {chain.connected_va[k]:,.0f}" for k in kinds) or "0",
            round(float(chain.connected_total_va)),
            "VA",
        )
    if minimum is not None:
        _minimum_step(sheet, minimum, short)
    demand = float(chain.demand_total_va) if chain is not None else 0.0
    motor_add = float(chain.largest_motor_adder_va) if chain is not None else 0.0
    cont_dem = float(chain.continuous_demand_va) if chain is not None else 0.0
    sheet.step(
        "2. After demand factors",
        "the job's load taken as the demand (100 %)"
        if given
        else "each kind through its tiers (Table 220.42, 220.44; others 100 %)",
        " + ".join([f"{k} {chain.demand_va[k]:,.0f}" for k in kinds] if chain is not None else [])
        + (f" + 220.12 shortfall {short:,.0f}" if short > 0 else ""),
        round(demand + short),
        "VA",
    )
    sheet.step(
        "3. Largest motor",
        f"+ {motor_adder * 100:g} % of the largest motor (430.24), once",
        f"{motor_adder:g} × {float(chain.largest_motor_va) if chain is not None else 0.0:,.0f}",
        round(motor_add),
        "VA",
    )
    cont_add = (f_cont - 1.0) * (cont_dem + short)
    sheet.step(
        "4. Continuous loads",
        f"+ {cont_adder_f * 100:g} % of the continuous non-motor demand (215.2(A)(1))",
        f"{cont_adder_f:g} × {cont_dem + short:,.0f}",
        round(cont_add),
        "VA",
    )
    sheet.step(
        "Design load",
        "step 2 + step 3 + step 4",
        f"{demand + short:,.0f} + {motor_add:,.0f} + {cont_add:,.0f}",
        round(demand + short + motor_add + cont_add),
        "VA",
    )


def _minimum_step(sheet, m, short: float) -> None:
    area_ft2 = m.area_m2 / M2_PER_FT2
    sheet.step(
        "1b. Minimum general lighting load (220.12)",
        "unit load × floor area; the shortfall of the general lighting is added "
        "(continuous, 100 %)",
        f"{m.unit_va_per_ft2:g} VA/ft² × {area_ft2:,.0f} ft² = {m.minimum_va:,.0f}; "
        f"general lighting {m.scheduled_va or 0:,.0f} → shortfall {short:,.0f}",
        round(m.minimum_va),
        "VA",
        m.rule_id,
    )
