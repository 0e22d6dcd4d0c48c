"""Supply-side bonding jumper and grounded conductor of a separately derived system
(NFPA 70-2023 250.30(A)(2), (A)(3), Table 250.102(C)(1) with its 12.5 % rule).

Applies to a run out of a transformer that leaves it without a device (a declared
transformer-secondary tap rule, or no device at all: :func:`~feedcheck.checks.taps.run_device`).
The job may state them (run keys ``bonding_jumper`` and ``neutral``); a stated size is
held against the least size, an absent one is reported as information with that size.
Each set of a parallel run is taken in its own raceway with its own jumper and grounded
conductor, each sized from the conductors in that raceway (250.102(C)(2), 250.30(A)(3)(b)).
"""

from __future__ import annotations

from ..calc.bonding import JumperTable, jumper_passes, supply_side_jumper_size
from ..calc.sizes import SIZES, Size
from ..model import Run
from .context import Context


def _table(ctx: Context) -> JumperTable:
    return JumperTable.from_records(ctx.rules.rows("supply_side_bonding_jumper"))


def check_sds_conductors(ctx: Context, run: Run) -> None:
    """Size the supply-side bonding jumper and grounded conductor of secondary conductors
    leaving the transformer without a device, and check the sizes the job states."""
    ctx.method(
        "Supply-side bonding jumper and grounded conductor of a separately derived system "
        "by the largest ungrounded conductor (12.5 % of its area above the table)",
        "NFPA 70-2023 250.30(A)(2), (A)(3), 250.102(C), Table 250.102(C)(1)",
    )
    try:
        need = supply_side_jumper_size(run.size.area_kcmil, 1, run.material, _table(ctx))
    except ValueError as exc:
        ctx.add(
            run.id,
            "supply-side bonding jumper",
            None,
            None,
            "kcmil",
            "warn",
            "sds-bonding-jumper",
            f"not evaluated: {exc}",
        )
        return
    name = str(need.size)
    per = " per raceway (one set in each)" if run.sets > 1 else ""
    basis = f"{run.size.name} {run.material.capitalize()} ungrounded conductors{per} → " + (
        f"{name} ({need.rule_id})"
        if need.rule == "table"
        else f"{float(need.required_kcmil):.1f} kcmil (12.5 % of the area, {need.rule_id})"
    )
    ctx.sheet(run.id, "run", "").step(
        "Supply-side bonding jumper and grounded conductor (separately derived system)",
        "Table 250.102(C)(1) by the largest ungrounded conductor; 12.5 % above the table",
        basis,
        name,
        "",
        "sds-bonding-jumper",
    )
    required = float(need.required_kcmil)
    _held(
        ctx,
        run,
        "supply-side bonding jumper",
        run.bonding_jumper,
        run.bonding_jumper_material,
        required,
        name,
        "sds-bonding-jumper",
        "bonding_jumper",
        basis,
    )
    grounded_min = required
    if run.sets > 1:  # parallel grounded conductors: 1/0 AWG or larger (310.10(G))
        grounded_min = max(required, SIZES["1/0 AWG"].area_kcmil)
    _held(
        ctx,
        run,
        "grounded conductor",
        run.neutral,
        run.neutral_material,
        grounded_min,
        name if grounded_min == required else "1/0 AWG",
        "sds-grounded-conductor",
        "neutral",
        basis,
    )


def _held(ctx, run, what, size: Size | None, material, required, name, rid, key, basis):
    """The stated conductor ``size`` against the ``required`` area [kcmil] (info when it
    is not stated, a warning when its material differs from the phases')."""

    def finding(value, status, note):
        ctx.add(run.id, what, value, required, "kcmil", status, rid, note)

    if size is None:
        finding(
            None,
            "info",
            f"not stated: at least {name} {run.material.capitalize()}"
            f"{' in each raceway' if run.sets > 1 else ''} ({basis}); state it as "
            f'{key} = "…" to have it checked',
        )
        return
    if material != run.material:
        finding(
            size.area_kcmil,
            "warn",
            f"{size.name} {material.capitalize()} with {run.material.capitalize()} phase "
            "conductors: not evaluated (Table 250.102(C)(1) note: size from an "
            "ungrounded conductor of the jumper's material with the same ampacity)",
        )
        return
    ok = jumper_passes(size.area_kcmil, required)
    finding(
        size.area_kcmil,
        "ok" if ok else "fail",
        f"{size.name} {material.capitalize()} given; at least {name} needed: {basis}"
        + ("" if ok else f"; use {name} or larger"),
    )
