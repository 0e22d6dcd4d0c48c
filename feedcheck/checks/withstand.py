"""Short-circuit withstand of a run's conductors by the ICEA P-32-382 formula.

- The insulation's family and short-circuit limit come from its type name
  (tables/insulation_types.csv); a run whose insulation is given only as a temperature is
  taken as thermoplastic (the lower limit, 150 °C; rule ``run-withstand-insulation``).
- Phase conductors start from their operating temperature at the run's load
  (square law, at most the insulation rating) and are held against the largest maximum
  fault at the sending end (three-phase, line-to-line, line-to-neutral, line-to-ground:
  whichever the fault checks put in the node's values).
- The grounding conductor carries no load: it starts from the ambient and is held
  against the maximum line-to-ground fault (``fault_lg_max_a``), or, where no such
  figure is available, the larger of the bolted (three-phase, or line-to-line on a
  single-phase node) and line-to-neutral maxima, with a note. It is taken as insulated
  like the phase conductors (a bare conductor tolerates more: conservative).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..calc import withstand_icea as wi
from ..calc.memo import memoised
from ..calc.sizes import Size
from ..model import Run
from .compare import passes
from .context import Context
from .fault_duty import kiloamps

# node values the fault checks may give, and how a finding names them
DUTY_KEYS = {
    "fault_max_a": "three-phase maximum",
    "fault_ll_max_a": "line-to-line maximum",
    "fault_ln_max_a": "line-to-neutral maximum",
    "fault_lg_max_a": "line-to-ground maximum",
    "fault_duty_sym_a": "governing maximum (symmetrical)",
}


@dataclass(frozen=True)
class Insulation:
    name: str  # type name, or "90 °C (type not given)"
    rated_c: float
    family: str
    limit_c: float
    rule_id: str


def insulation_of(ctx: Context, run: Run) -> Insulation:
    """The run's insulation: its type row, or the conservative assumption for a
    temperature alone."""
    if run.insulation_type:
        row = _insulation_row(run.insulation_type, book=ctx.rules)
        return Insulation(row.name, run.insulation_c, row.family, row.sc_final_c, row.rule_id)
    limit = ctx.rules.rule("run-withstand-insulation").number("limit")
    return Insulation(
        f"{run.insulation_c:g} °C (type not given)",
        run.insulation_c,
        "thermoplastic",
        limit,
        "run-withstand-insulation",
    )


@memoised(records=("book",))
def _insulation_row(name: str, *, book) -> wi.InsulationType:
    """The insulation type's row of the rule book (kept per name and book)."""
    rows = [wi.InsulationType.from_record(r) for r in book.rows("insulation_types")]
    return wi.insulation_type(name, rows)


def _constants(ctx: Context, material: str) -> tuple[float, float]:
    return _material_constants(material, book=ctx.rules)


@memoised(records=("book",))
def _material_constants(material: str, *, book) -> tuple[float, float]:
    """ICEA K and T0 of a conductor material (kept per material and book)."""
    row = next(r for r in book.rows("conductor_materials") if r["material"] == material)
    return float(row["icea_k"]), float(row["icea_t0_c"])


# the withstand of one area, time, material and temperatures: runs share most of them
_icea_withstand_a = memoised(wi.icea_withstand_current_a)


def _clearing_s(ctx: Context, run: Run) -> float:
    t = run.clearing_s or ctx.rules.rule("withstand-clearing-default").number("limit")
    if run.clearing_s is None:
        ctx.assume(
            f"Withstand checks use a clearing time of {t:g} s where the job gives none "
            "(common practice; state the device's actual clearing time)."
        )
    return t


def duty_name(ctx: Context, node: str, key: str) -> str:
    """How a finding names a node's fault figure: a single-phase node's bolted fault is
    its line-to-line maximum, not a three-phase one."""
    if key == "fault_max_a" and ctx.tree.voltage_of[node].phases == 1:
        return DUTY_KEYS["fault_ll_max_a"]
    return DUTY_KEYS[key]


def governing_duty(ctx: Context, node: str, keys=tuple(DUTY_KEYS)) -> tuple[float | None, str]:
    """Largest maximum fault figure [A] at ``node`` among ``keys``, and its name."""
    values = ctx.nodes[node].values
    found = [(float(values[k]), duty_name(ctx, node, k)) for k in keys if values.get(k) is not None]
    return max(found) if found else (None, "")


def phase_withstand_a(
    ctx: Context, run: Run, size: Size, load_a: float, ampacity_a: float, clearing_s: float
) -> tuple[float, float]:
    """Withstand [A] of the run's phase conductors of ``size`` (all sets) and the operating
    temperature [°C] it starts from."""
    ins = insulation_of(ctx, run)
    k_icea, t0 = _constants(ctx, run.material)
    t1 = float(wi.operating_temperature_c(run.ambient_c, ins.rated_c, load_a, ampacity_a))
    i_w = _icea_withstand_a(size.area_mm2 * run.sets, clearing_s, k_icea, t0, t1, ins.limit_c)
    return float(i_w), t1


def phase_withstand_passes(
    ctx: Context, run: Run, size: Size, load_a: float, ampacity_a: float
) -> bool:
    """Whether phase conductors of ``size`` withstand the governing duty (True when no
    fault figure is known: nothing to verify a suggestion against)."""
    duty, _ = governing_duty(ctx, run.from_id)
    if duty is None:
        return True
    t = run.clearing_s or ctx.rules.rule("withstand-clearing-default").number("limit")
    i_w, _ = phase_withstand_a(ctx, run, size, load_a, ampacity_a, t)
    return bool(passes(duty, i_w, "at_most", 0.0))


def check_withstand(ctx: Context, run: Run, load_a: float, ampacity_a: float) -> None:
    """Withstand of the phase conductors (governing duty, from operating temperature) and
    of the grounding conductor (line-to-ground maximum, from ambient).

    ``ampacity_a``: the run's ampacity at its insulation rating after corrections (the
    current at which it reaches that rating), for the operating temperature."""
    duty, key = governing_duty(ctx, run.from_id)
    if duty is None:
        return
    t = _clearing_s(ctx, run)
    ins = insulation_of(ctx, run)
    if ins.rule_id == "run-withstand-insulation":
        ctx.assume(
            "Withstand: insulation given only as a temperature is taken as thermoplastic "
            f"(short-circuit limit {ins.limit_c:g} °C, ICEA P-32-382); give the type name "
            "(e.g. XHHW-2) to use a thermoset limit."
        )
    i_w, t1 = phase_withstand_a(ctx, run, run.size, load_a, ampacity_a, t)
    rows = (*ctx.impedance_rows.get(run.from_id, ()), *_insulation_rows(ctx, ins))
    with ctx.reading(*rows, *ctx.ampacity_rows(run)):  # operating temperature: ampacity
        _emit(ctx, run, "phase conductors", duty, key, i_w, t, t1, ins)
    if run.ground is not None:
        lg = ctx.nodes[run.from_id].values.get("fault_lg_max_a")
        key, note = DUTY_KEYS["fault_lg_max_a"], ""
        if lg is None:  # the larger of the bolted and line-to-neutral maxima (conservative)
            lg, key = governing_duty(ctx, run.from_id, ("fault_max_a", "fault_ln_max_a"))
            note = f"; no maximum line-to-ground figure: the {key} is used"
        k_icea, t0 = _constants(ctx, run.ground_material)
        t1g = run.ambient_c
        i_g = float(
            _icea_withstand_a(run.ground.area_mm2 * run.sets, t, k_icea, t0, t1g, ins.limit_c)
        )
        with ctx.reading(*rows):
            _emit(ctx, run, "grounding conductor", lg, key, i_g, t, t1g, ins, note)
    ctx.method(
        "Short-circuit withstand of insulated conductors, (I/A)²·t = K·log10((T2+T0)/(T1+T0)) "
        "from the operating temperature to the insulation's short-circuit limit",
        "ICEA P-32-382-2007; insulation types and ratings NFPA 70-2023 Table 310.4(A)",
    )


def _insulation_rows(ctx: Context, ins: Insulation) -> tuple:
    """The insulation type's row (none when the limit is the rule for a temperature)."""
    if ins.rule_id == "run-withstand-insulation":
        return ()
    return (ctx.rules.row_use("insulation_types", rule_id=ins.rule_id),)


def _emit(ctx, run, what, duty, key, i_w, t, t1, ins, extra="") -> None:
    ok = passes(duty, i_w, "at_most", 0.0)
    ctx.compare(
        run.id,
        f"withstand, {what}",
        duty,
        i_w,
        "A",
        "at_most",
        "run-withstand",
        f"{what} withstand {i_w / 1000:,.1f} kA for {t:g} s ({ins.name}, {ins.family}, "
        f"{t1:.0f} °C → {ins.limit_c:g} °C, ICEA P-32-382) vs {kiloamps(duty)} "
        f"({key}) at the sending end"
        + extra
        + ("" if ok else "; a faster device or larger conductor"),
        fail_status="warn",
        tolerance=0.0,
    )
