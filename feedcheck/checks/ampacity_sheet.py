"""The ampacity chain of a run on its sheet, each step with its source: the table, row
and column it was read from, each correction factor with its table or formula and the
figures put into it (no bare "=" a reviewer has to guess at)."""

from __future__ import annotations

from ..calc.ampacity import AmpacityChain
from ..results import Sheet
from .context import Context

# the table a chain reads for each kind of installation: (file, table of NFPA 70-2023)
TABLES = {False: ("ampacity_raceway", "Table 310.16"), True: ("ampacity_free_air", "Table 310.17")}


def _adjustment_row(ctx: Context, rule_id: str) -> str:
    row = next((r for r in ctx.rules.rows("adjustment_factors") if r["rule_id"] == rule_id), None)
    if row is None:
        return rule_id
    lo, hi = int(float(row["count_from"])), int(float(row["count_to"]))
    return f"row {lo}–{hi} conductors"


def ampacity_steps(ctx: Context, sh: Sheet, chain: AmpacityChain, free_air: bool) -> None:
    """Each link of ``chain`` as a sheet step with its source and substituted figures."""
    name, table = TABLES[free_air]
    row = f"row {chain.size} {chain.material.capitalize()}"
    interp = (
        " (metric size: interpolated by area between table rows)"
        if (chain.method == "interpolated")
        else ""
    )
    ta = chain.ambient_c + chain.rooftop_adder_c
    tc = chain.insulation_c
    per_set_cap = chain.termination_cap_a / chain.sets if chain.sets else chain.termination_cap_a
    texts = (
        (
            f"{table} (tables/{name}.csv), {row}, column c{tc:g}_a ({tc:g} °C insulation)" + interp,
            f"{chain.base_per_set_a:g} A per conductor",
        ),
        (
            "ambient + rooftop adder (310.15(B)(2), tables/rooftop_adder.csv)"
            if chain.rooftop_adder_c
            else "ambient as given for the run",
            f"{chain.ambient_c:g} + {chain.rooftop_adder_c:g} °C",
        ),
        (
            "F = √((Tc − Ta)/(Tc − 30)), the equation of 310.15(B)(1) (rule ambient-formula; "
            "Table 310.15(B)(1) tabulates it by band)",
            f"√(({tc:g} − {ta:g}) / ({tc:g} − 30))",
        ),
        (
            f"Table 310.15(C)(1) (tables/adjustment_factors.csv), "
            f"{_adjustment_row(ctx, chain.adjustment_rule_id)}",
            f"{chain.current_carrying} current-carrying conductors in the raceway",
        ),
        ("conductors in parallel per phase (310.10(G)(1))", f"{chain.sets} set(s)"),
        (
            "table ampacity × F × adjustment × sets",
            f"{chain.base_per_set_a:g} × {chain.ambient_factor:.4f} × "
            f"{chain.adjustment_factor:g} × {chain.sets}",
        ),
        (
            f"{table} (tables/{name}.csv), {row}, column c{chain.termination_c:g}_a "
            f"({chain.termination_c:g} °C terminations, 110.14(C)) × sets",
            f"{per_set_cap:g} × {chain.sets}",
        ),
        (
            "the lower of the corrected ampacity and the termination limit",
            f"min({chain.corrected_a:.1f}, {chain.termination_cap_a:g}): {chain.governed_by}",
        ),
    )
    for (label, value, unit, rid), (formula, substituted) in zip(chain.steps(), texts, strict=True):
        sh.step(label, formula, substituted, value, unit, rid)
    sh.uses(name, "adjustment_factors")
    if chain.rooftop_adder_c:
        sh.uses("rooftop_adder")
