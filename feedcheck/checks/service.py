"""The service: rules that apply where a low-voltage source feeds the premises wiring
(NFPA 70-2023 Art. 230 and 250.24, 250.28), in place of the feeder rules they differ from.

Service conductors are the runs that leave the source. Their overcurrent protection is
the service disconnect at their load end (the main device of the panel they feed,
230.90(A), 230.91; :func:`~feedcheck.checks.taps.run_device`); they carry no equipment
grounding conductor: the grounded (neutral) conductor brought to the service is the
fault return, sized by Table 250.102(C)(1) (250.24(C)). At the service equipment the
grounding electrode conductor (Table 250.66) and the main bonding jumper (250.28(D)) are
sized from the service-entrance conductors. The job may state them (``[source]`` keys
``electrode_conductor`` and ``main_bonding_jumper``; run key ``neutral``); a stated size is
held against the least size, an absent one is information with that size.
"""

from __future__ import annotations

from ..calc import bonding as bk
from ..calc import transformer as tk
from ..calc.service import service_through_fault
from ..calc.sizes import SIZES, Size
from ..model import SOURCE_ID, Run
from .context import Context
from .taps import run_device


def service_runs(ctx: Context) -> list[Run]:
    """The service conductors: runs from a low-voltage source to a panel (the service
    equipment); a run from the source to a transformer stays a primary feeder."""
    if ctx.job.source.medium_voltage:
        return []
    return [r for r in ctx.job.runs if r.from_id == SOURCE_ID and ctx.tree.kind[r.to_id] == "panel"]


def describe_source(ctx: Context) -> None:
    """How the source's strength was found: the utility transformer's through-fault
    (infinite-bus method, with the primary's impedance where stated) on the source's
    sheet and node; a medium-voltage source's short-circuit power; the service case's
    methods (drop from the service point, service conductors)."""
    src = ctx.job.source
    if src.medium_voltage:
        ctx.method(
            f"Medium-voltage source ({src.voltage.text}): fault current from its stated "
            "short-circuit power or current, I = S_sc/(√3·V); the transformer is fed "
            "directly (medium-voltage conductors and switchgear are not checked); primary "
            "protection by Table 450.3(A)",
            "IEEE Std 141-1993 ch. 4; NFPA 70-2023 450.3(A)",
        )
    if service_runs(ctx):
        ctx.method(
            "Service: the source is the service point; service conductors are the runs "
            "from it to the service equipment, protected by its main (the service "
            "disconnect); voltage drop is counted from the service point; the "
            "line-to-ground walk starts at the grounded service (the utility's "
            "transformer as the zero-sequence source)",
            "NFPA 70-2023 Art. 100 (service point), 230.90(A), 230.91, 215.2(A)(1) IN 2",
        )
    if src.service is None:
        return
    t, v = src.service, src.voltage
    sh = ctx.sheet(SOURCE_ID, "source", "Service")
    primary = "infinite" if t.primary_sc_va == float("inf") else f"{t.primary_sc_va / 1e6:g} MVA"
    sh.inputs += [
        ("Utility transformer", f"{t.rating_va / 1000:g} kVA, {t.z_pct:g} %, X/R {t.x_r:g}"),
        ("Primary short circuit", primary),
    ]
    if t.x_r_typical_row:
        sh.uses("transformer_xr")
        ctx.assume(
            f"Service transformer X/R {t.x_r:g} taken from the typical-value table "
            f"({t.x_r_typical_row}); state service_x_r where the utility gives it."
        )
    infinite, _ = service_through_fault(t.rating_va, v.voltage_ll_v, t.z_pct, t.x_r, v.phases)
    k = "√3 · " if v.phases == 3 else ""
    sh.step(
        "Through-fault of the utility transformer, infinite bus",
        f"I = S / ({k}V · Z%/100)",
        f"{t.rating_va:,.0f} / ({k}{v.voltage_ll_v:g} × {t.z_pct / 100:g})",
        round(infinite, 0),
        "A",
        "service-through-fault",
    )
    if t.primary_sc_va != float("inf"):
        sh.step(
            "With the primary's impedance (V²/S_sc at X/R, referred; complex sum)",
            "I = V / (√3 · |Z_T + Z_P|)",
            f"S_sc {primary}, X/R {t.primary_x_r:g}",
            round(src.fault_a, 0),
            "A",
            "service-through-fault",
        )
    ctx.method(
        "Service transformer through-fault, infinite-bus method I = S/(√3·V·Z_pu) "
        "(single-phase S/(V·Z_pu)), the primary's impedance V²/S_sc added as a complex "
        "series impedance where stated; nameplate %Z as given (no tolerance)",
        "IEEE Std 141-1993 §4.5; IEEE Std 242-2001 ch. 2",
    )
    ctx.nodes[SOURCE_ID].values.update(
        {
            "service_transformer_va": t.rating_va,
            "service_z_pct": t.z_pct,
            "service_x_r": t.x_r,
            "service_primary_sc_va": t.primary_sc_va,
        }
    )
    ctx.add(
        SOURCE_ID, "service transformer through-fault", src.fault_a, None, "A", "info",
        "service-through-fault",
        f"{t.rating_va / 1000:g} kVA at {t.z_pct:g} %, primary {primary}",
    )  # fmt: skip


def check_service(ctx: Context) -> None:
    """Service-entrance checks: conductor ampacity and device (230.42, 230.90, 230.79),
    grounded conductor (250.24(C)), electrode conductor and main bonding jumper."""
    runs = service_runs(ctx)
    if not runs:
        return
    ctx.method(
        "Service: conductors protected by the service disconnect at their load end; "
        "ampacity against the load, device against the ampacity; grounded conductor, "
        "main bonding jumper (Table 250.102(C)(1), 12.5 % above it) and grounding "
        "electrode conductor (Table 250.66) from the service-entrance conductors",
        "NFPA 70-2023 230.42(A), 230.79, 230.90(A), 230.91, 250.24(B)-(D), 250.28(D), "
        "Table 250.66, Table 250.102(C)(1)",
    )
    for run in runs:
        _conductors(ctx, run)
        _grounded_conductor(ctx, run)
    _electrode_and_jumper(ctx, runs)


def _conductors(ctx: Context, run: Run) -> None:
    """230.42(A) ampacity vs load, 230.90(A) device vs ampacity, 230.79 least rating."""
    values = ctx.run_values.get(run.id, {})
    amp = values.get("ampacity_a")
    if amp is None:
        ctx.add(
            run.id, "service conductor ampacity", None, None, "A", "fail", "service-ampacity",
            "not evaluated: the run's ampacity could not be computed (see its findings)",
        )  # fmt: skip
        return
    cont, non = values["continuous_a"], values["noncontinuous_a"]
    need = ctx.design_factor() * cont + non
    ctx.compare(
        run.id,
        "service conductor ampacity vs load",
        amp,
        need,
        "A",
        "at_least",
        "service-ampacity",
        f"allowable {amp:.1f} A for {100 * ctx.design_factor():g} % × {cont:.1f} + "
        f"{non:.1f} A = {need:.1f} A",
    )
    device, where = run_device(ctx, run)
    if device is None:
        ctx.add(
            run.id, "service disconnect", None, None, "A", "fail", "service-device",
            f"no service disconnect found: give {run.to_id} a main_device (or the run a "
            "device) so the service conductors are protected",
        )  # fmt: skip
        return
    prot = ctx.rules.protection
    from ..calc import protection as pk

    limit = pk.conductor_protection(device, amp, run.size.name, run.material, tables=prot)
    ctx.add(
        run.id,
        "service device vs service conductors",
        device,
        limit.max_device_a,
        "A",
        "ok" if limit.ok else "fail",
        "service-device",
        f"{device:g} A ({where}) protecting {run.sets} × {run.size.name} "
        f"{run.material.capitalize()} of {amp:.0f} A allowable; {limit.note}",
    )
    least = ctx.rules.rule("service-disconnect-min").number("limit")
    ctx.compare(
        run.id,
        "service disconnect rating",
        device,
        least,
        "A",
        "at_least",
        "service-disconnect-min",
        f"{device:g} A service disconnect ({where})",
    )


def _table(ctx: Context) -> bk.JumperTable:
    return bk.JumperTable.from_records(ctx.rules.rows("supply_side_bonding_jumper"))


def _grounded_conductor(ctx: Context, run: Run) -> None:
    """250.24(C): the grounded conductor in each raceway from the ungrounded conductors
    in it (Table 250.102(C)(1)); 1/0 AWG or larger in parallel."""
    v = ctx.tree.voltage_of[run.to_id]
    if v.voltage_ln_v is None:
        return
    try:
        need = bk.supply_side_jumper_size(run.size.area_kcmil, 1, run.material, _table(ctx))
    except ValueError as exc:
        ctx.add(
            run.id, "service grounded conductor", None, None, "kcmil", "warn",
            "service-grounded-conductor", f"not evaluated: {exc}",
        )  # fmt: skip
        return
    required, name = float(need.required_kcmil), str(need.size)
    if run.sets > 1 and required < SIZES["1/0 AWG"].area_kcmil:
        required, name = SIZES["1/0 AWG"].area_kcmil, "1/0 AWG"
    basis = f"{run.size.name} {run.material.capitalize()} ungrounded conductors" + (
        " per raceway" if run.sets > 1 else ""
    )
    _held(
        ctx, run.id, "service grounded conductor", run.neutral, run.neutral_material,
        run.material, required, name, "service-grounded-conductor",
        f"neutral on run {run.id}", basis,
    )  # fmt: skip


def _electrode_and_jumper(ctx: Context, runs: list[Run]) -> None:
    """Grounding electrode conductor (Table 250.66) and main bonding jumper (250.28(D))
    from the service-entrance conductors: the sum over parallel sets and service runs."""
    src = ctx.job.source
    total = sum(r.size.area_kcmil * r.sets for r in runs)
    material = runs[0].material
    sh = ctx.sheet(SOURCE_ID, "source", "Service")
    sh.uses("grounding_electrode_conductor", "supply_side_bonding_jumper")
    basis = " + ".join(f"{r.sets} × {r.size.name}" for r in runs)
    sh.step(
        "Service-entrance conductors (sum of parallel sets and service runs)",
        "Σ sets × area",
        basis,
        round(total, 1),
        "kcmil",
        "gec-service",
    )
    row = tk.gec_row(total, material, ctx.rules.rows("grounding_electrode_conductor"))
    gec = row["gec_cu"] if src.electrode_conductor_material == "cu" else row["gec_al"]
    sh.step(
        "Grounding electrode conductor of the service",
        "Table 250.66 row for that area",
        f"{total:.1f} kcmil {material.upper()} → row {row['row']}",
        f"{row['gec_cu']} Cu or {row['gec_al']} Al",
        "",
        "gec-service",
    )
    _held(
        ctx, SOURCE_ID, "service grounding electrode conductor", src.electrode_conductor,
        src.electrode_conductor_material, src.electrode_conductor_material,
        SIZES[gec].area_kcmil, gec, "gec-service", "electrode_conductor under [source]",
        f"{total:.1f} kcmil {material.upper()} service-entrance conductors",
    )  # fmt: skip
    try:
        need = bk.supply_side_jumper_size(total, 1, material, _table(ctx))
    except ValueError as exc:
        ctx.add(
            SOURCE_ID, "main bonding jumper", None, None, "kcmil", "warn", "mbj-service",
            f"not evaluated: {exc}",
        )  # fmt: skip
        return
    name = str(need.size)
    sh.step(
        "Main bonding jumper",
        "Table 250.102(C)(1) by the service-entrance conductors; 12.5 % above the table",
        f"{total:.1f} kcmil {material.upper()}",
        name,
        "",
        "mbj-service",
    )
    _held(
        ctx, SOURCE_ID, "main bonding jumper", src.main_bonding_jumper,
        src.main_bonding_jumper_material, material, float(need.required_kcmil), name,
        "mbj-service", "main_bonding_jumper under [source]",
        f"{total:.1f} kcmil {material.upper()} service-entrance conductors",
    )  # fmt: skip


def _held(ctx, subject, what, size: Size | None, material, want_material, required, name,
          rid, key, basis) -> None:  # fmt: skip
    """A stated size against the least size; an absent one is information."""
    if size is None:
        ctx.add(
            subject, what, None, required, "kcmil", "info", rid,
            f"not stated: at least {name} {want_material.capitalize()} ({basis}); state "
            f"{key} to have it checked",
        )  # fmt: skip
        return
    if material != want_material:
        ctx.add(
            subject, what, size.area_kcmil, required, "kcmil", "warn", rid,
            f"{size.name} {material.capitalize()} with {want_material.capitalize()} "
            "conductors: not evaluated (size it from a conductor of its own material)",
        )  # fmt: skip
        return
    ok = bk.jumper_passes(size.area_kcmil, required)
    ctx.add(
        subject, what, size.area_kcmil, required, "kcmil", "ok" if ok else "fail", rid,
        f"{size.name} {material.capitalize()} given; at least {name} needed ({basis})"
        + ("" if ok else f"; use {name} or larger"),
    )  # fmt: skip
