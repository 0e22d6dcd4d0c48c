"""Run checks: ampacity chain, loads and devices, conductor protection, equipment
grounding conductor, parallel sets, short-circuit withstand and the transformer
secondary-conductor arrangements."""

from __future__ import annotations

from ..calc import protection as pk
from ..calc.ampacity import ampacity_chain, rooftop_adder_c, termination_c_for
from ..calc.memo import memoised
from ..calc.sizes import SIZES
from ..model import SOURCE_ID, Run
from .ampacity_sheet import ampacity_steps
from .bonding import check_sds_conductors
from .compare import passes
from .context import Context
from .run_fix import RunDuty, next_passing, smallest_for_duty
from .taps import check_unprotected_run, run_device
from .termination import termination_note
from .withstand import check_withstand

# pure figures of a device and a size (frozen records): a building repeats a few pairs
_conductor_protection = memoised(pk.conductor_protection)
_egc_size = memoised(pk.egc_size)


def _loads(ctx: Context, run: Run) -> tuple[float, float, float]:
    """Continuous and noncontinuous load current on a run (its heaviest line, single-
    phase elements at S / V_LL: checks/loads.py), and its power factor."""
    cont, non = ctx.feed_currents_a(run.to_id)
    return cont, non, ctx.loads[run.to_id].pf


def _run_sheet(ctx: Context, run: Run):
    """The run's calculation sheet with its inputs."""
    sh = ctx.sheet(run.id, "run", f"Run {run.id} ({run.from_id} → {run.to_id})")
    sh.inputs += [
        ("From → to", f"{run.from_id} → {run.to_id}"),
        ("Length", ctx.length(run.length_m, pair=True)),
        (
            "Conductors",
            f"{run.sets} × {run.size.name} {run.material.capitalize()}, "
            f"{run.insulation_c:g} °C insulation",
        ),
        ("Raceway", run.raceway),
        ("Ambient", f"{run.ambient_c:g} °C"),
        (
            "Current-carrying conductors",
            str(run.current_carrying) + (" + neutral (harmonics)" if run.harmonic_neutral else ""),
        ),
        (
            "Grounding conductor",
            f"{run.ground.name} {run.ground_material.capitalize()}" if run.ground else "not given",
        ),
        ("Device at the sending end", f"{run.device_a:g} A" if run.device_a else "none"),
    ]
    if run.tap_rule:
        sh.inputs.append(("Tap rule declared", run.tap_rule))
    sh.uses(
        "ampacity_raceway",
        "adjustment_factors",
        "ampacity_rules",
        "protection_rules",
        "egc_size",
        "conductor_impedance_table9",
    )
    return sh


def _device_source(ctx: Context, run: Run, sh, device: float | None, where: str) -> None:
    """Say which device protects the run when it is not the run's own
    (:func:`~feedcheck.checks.taps.run_device`)."""
    if ctx.tree.kind[run.from_id] == "transformer" and device is not None:
        ctx.add(
            run.id,
            "secondary conductor protection",
            device,
            None,
            "A",
            "info",
            "run-device-protects",
            "secondary conductors protected by a device at the transformer (checked as a "
            "feeder)"
            + (
                ""
                if where == "run"
                else ": the transformer's secondary_device, taken at "
                "its secondary terminals (declare tap_rule if it sits where they end)"
            ),
        )
    if where in ("transformer primary", "transformer secondary"):
        sh.step(
            "Device protecting the run",
            f"no device of its own: the transformer's {where.split()[1]} device, taken at "
            "the run's supply end (declare tap_rule if the run is a tap)",
            where,
            device,
            "A",
        )


def _rooftop_c(ctx: Context, run: Run, sh) -> float:
    """Rooftop raceway temperature adder [°C] (0 when the run is not on a roof)."""
    rooftop_c, rooftop_rule = 0.0, ""
    if run.rooftop_mm is not None:
        rooftop_c, rooftop_rule = rooftop_adder_c(
            run.rooftop_mm / 1000.0, tables=ctx.rules.ampacity
        )
        sh.step(
            "Rooftop raceway temperature adder",
            "added to the ambient",
            f"raceway {run.rooftop_mm:.0f} mm above the roof",
            rooftop_c,
            "°C",
            rooftop_rule,
        )
    return rooftop_c


def _termination_c(run: Run, sh, device: float | None, load_a: float) -> float:
    """Terminal temperature column: the job's, else the 110.14(C)(1) rule."""
    term = run.termination_c
    if term is None:
        basis = device if device is not None else load_a
        term = float(termination_c_for(basis, run.size.name))
        sh.step(
            "Termination temperature column",
            "110.14(C)(1): ≤ 100 A or 14–1 AWG → 60 °C, else 75 °C",
            f"circuit {basis:.0f} A, {run.size.name}",
            term,
            "°C",
            "term-60c-100a" if term == 60 else "term-75c-over-100a",
        )
    return term


def _check_device(
    ctx: Context, run: Run, device: float, ampacity_a: float, cont: float, non: float, fix_text
) -> None:
    """Device against the load (215.3) and the conductors (240.4)."""
    need = float(pk.device_min_for_load_a(cont, non, tables=ctx.rules.protection))
    ok = passes(device, need, "at_least")
    ctx.compare(
        run.id,
        "device vs load",
        device,
        need,
        "A",
        "at_least",
        "run-device-load",
        f"{device:g} A device for {100 * ctx.rules.protection.continuous_factor:g} % × "
        f"{cont:.1f} + {non:.1f} A"
        f" = {need:.1f} A" + ("" if ok else "; a larger device (and conductors) needed"),
    )
    prot = _conductor_protection(
        device, ampacity_a, run.size.name, run.material, tables=ctx.rules.protection
    )
    with ctx.reading(*ctx.ampacity_rows(run)):
        ctx.add(
            run.id,
            "device protects conductors",
            device,
            prot.max_device_a,
            "A",
            "ok" if prot.ok else "fail",
            prot.rule_id,
            prot.note + ("" if prot.ok else "; " + fix_text()),
        )


def _check_ampacity(
    ctx: Context, run: Run, chain, load_a: float, fix_text, tnote: str = ""
) -> None:
    """Ampacity before and after corrections against the load (215.2(A)(1)); ``tnote``
    says when the 60 °C termination rule governs."""
    # load before and after corrections (215.2(A)(1))
    ok = chain.ok_before
    before_a = min(chain.base_per_set_a * chain.sets, chain.termination_cap_a)
    ctx.add(
        run.id,
        "ampacity vs 125 % continuous + noncontinuous",
        chain.required_before_a,
        before_a,
        "A",
        "ok" if ok else "fail",
        "run-ampacity-before",
        f"needs {chain.required_before_a:.1f} A before corrections"
        + tnote
        + ("" if ok else "; " + fix_text()),
    )
    ok = chain.ok_after
    ctx.add(
        run.id,
        "allowable ampacity vs load",
        load_a,
        chain.final_a,
        "A",
        "ok" if ok else "fail",
        "run-ampacity-after",
        f"allowable {chain.final_a:.1f} A ({chain.governed_by} governs) for "
        f"{load_a:.1f} A of load" + tnote + ("" if ok else "; " + fix_text()),
    )


def check_run(ctx: Context, run: Run) -> None:
    tree = ctx.tree
    sh = _run_sheet(ctx, run)
    cont, non, _pf = _loads(ctx, run)
    device, where = run_device(ctx, run)
    _device_source(ctx, run, sh, device, where)
    cc = run.current_carrying + (1 if run.harmonic_neutral else 0)
    rooftop_c = _rooftop_c(ctx, run, sh)
    if run.sets > 1 and run.size.area_kcmil < SIZES["1/0 AWG"].area_kcmil * (1 - 1e-9):
        ctx.add(
            run.id,
            "parallel conductors",
            run.size.area_kcmil,
            SIZES["1/0 AWG"].area_kcmil,
            "kcmil",
            "fail",
            "run-parallel-min",
            f"{run.sets} sets of {run.size.name}: conductors in parallel must be 1/0 AWG or larger",
        )
        return
    term = _termination_c(run, sh, device, cont + non)
    try:
        chain = ampacity_chain(
            run.size.name,
            run.material,
            run.insulation_c,
            run.ambient_c,
            cc,
            term,
            run.sets,
            run.raceway == "free-air",
            rooftop_c,
            cont,
            non,
            tables=ctx.rules.ampacity,
        )
    except ValueError as exc:
        ctx.add(run.id, "ampacity", None, None, "A", "fail", "run-ampacity-after", str(exc))
        return
    ampacity_steps(ctx, sh, chain, run.raceway == "free-air")
    ctx.run_values.setdefault(run.id, {}).update(
        {
            "ampacity_a": chain.final_a,
            "continuous_a": cont,
            "noncontinuous_a": non,
            "termination_c": term,
        }
    )
    tnote = termination_note(ctx, run, term, chain.termination_cap_a)  # issue 13 item 7
    duty = RunDuty(cont, non, device, cc, rooftop_c)
    fix = None

    def fix_text():
        """The size (and device) with which every conductor check of the run passes,
        verified by re-running them (:mod:`feedcheck.checks.run_fix`); found once."""
        nonlocal fix
        if fix is None:
            fix = next_passing(ctx, run, duty)
        return fix

    with ctx.reading(*ctx.ampacity_rows(run)):
        _check_ampacity(ctx, run, chain, cont + non, fix_text, tnote)
    if device is not None:
        _check_device(ctx, run, device, chain.final_a, cont, non, fix_text)
        if not (run.from_id == SOURCE_ID and tree.kind[run.to_id] == "panel"):
            # service conductors carry no EGC (checks/service.py)
            _check_egc(ctx, run, duty, term)
    else:
        with ctx.reading(*ctx.ampacity_rows(run)):
            check_unprotected_run(ctx, run, chain.final_a)
        if tree.kind[run.from_id] == "transformer":
            check_sds_conductors(ctx, run)
    check_withstand(ctx, run, cont + non, chain.corrected_a)


def _check_egc(ctx: Context, run: Run, duty: RunDuty, term: float | None) -> None:
    if run.ground is None:
        ctx.add(
            run.id,
            "grounding conductor",
            None,
            None,
            "",
            "info",
            "run-egc-size",
            "no equipment grounding conductor given (a metal raceway may serve; check 250.118)",
        )
        return
    try:
        minimum = smallest_for_duty(ctx, run, duty, term)
    except ValueError:
        minimum = run.size.name
    if SIZES[minimum].area_mm2 > run.size.area_mm2:
        minimum = run.size.name
    need = _egc_size(
        duty.device_a,
        run.ground_material,
        run.size.name,
        minimum,
        run.material,
        run.sets,
        tables=ctx.rules.protection,
    )
    ok = run.ground.area_mm2 >= SIZES[need.size].area_mm2 * (1 - 1e-9)
    with ctx.reading(*ctx.ampacity_rows(run, minimum)):  # the minimum phase size
        ctx.add(
            run.id,
            "grounding conductor",
            run.ground.area_kcmil,
            SIZES[need.size].area_kcmil,
            "kcmil",
            "ok" if ok else "fail",
            "run-egc-size",
            f"{run.ground.name} given; at least {need.size} {need.material.capitalize()} "
            f"needed: {need.reasoning}",
        )
    ctx.sheet(run.id, "run", "").step(
        "Equipment grounding conductor",
        "Table 250.122 by device; × (installed / minimum phase area) when upsized",
        need.reasoning,
        need.size,
        "",
        "run-egc-size",
    )
