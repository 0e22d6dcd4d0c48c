"""Panel schedule checks: every circuit at once (whole columns, no loop per row), phase
balance, connected and demand load.

Per circuit (rules in ``tables/schedule_rules.csv`` and ``tables/voltage_drop_limits.csv``):

* breaker vs load — at least 125 % of a continuous load, 100 % otherwise (210.20(A));
* conductor vs load — ampacity at the termination column before correction at least
  125 % continuous + 100 % noncontinuous (210.19(A)(1)(a)); after ambient correction and
  adjustment at least the load (210.19(A)(1)(b)); motor circuits 125 % of full-load
  current (430.22);
* conductor vs breaker — 240.4(B) next size up and the 240.4(D) small-conductor limits;
  motor circuits instead: inverse-time breaker at most 250 % of full-load current, next
  standard rating up permitted (430.52(C)(1));
* equipment grounding conductor vs breaker (Table 250.122, not larger than the circuit
  conductors), where a ground is given;
* branch voltage drop, and total drop adding the panel's feeder drop;
* poles vs the panel's phases, one-pole circuits only where a neutral exists.

Phases: circuits are mapped to phases by the usual panelboard numbering (odd numbers one
side, even the other; each pair of rows on the next phase: 1,2 → A; 3,4 → B; 5,6 → C;
7,8 → A … for three-phase, A/B alternating for single-phase three-wire; a multi-pole
circuit n takes spaces n, n+2, …) — common practice, no source.

Load of a circuit: ``[VA]`` as given; ``[W]`` divided by the power factor; ``[A]`` times
the circuit voltage (line-to-neutral for one pole, line-to-line for two, √3 · V_LL for
three poles on a three-phase panel). A multi-pole load is shared equally by its poles in
the per-phase totals (common practice, no source).

Demand load (``tables/demand_factors.csv``): lighting by occupancy (Table 220.42),
receptacles 10 kVA at 100 % and the rest at 50 % (220.44), motors 100 % plus 25 % of
the largest (430.24), heating and other loads 100 %. The continuous portion is carried
separately; the feeder and panel checks apply its 125 %.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from .checks.context import Load
from .errors import ProblemList
from .findings import SEVERITY, Finding
from .schedule import Schedule
from .units import VoltageSystem

if TYPE_CHECKING:
    import pandas as pd

OCCUPANCIES = ("other", "dwelling", "hospital", "hotel", "warehouse")
SQRT3 = math.sqrt(3.0)
CIRCUIT_COLUMNS = (
    "panel",
    "circuit",
    "description",
    "poles",
    "phase",
    "kind",
    "load_va",
    "current_a",
    "breaker_a",
    "size",
    "material",
    "length_m",
    "ampacity_a",
    "vdrop_pct",
    "total_vdrop_pct",
    "status",
    "reason",
    "row",
)


@dataclass
class ScheduleResult:
    """Checked schedule of one file (one panel, or several with a ``panel`` column).

    Attributes
    ----------
    circuits : DataFrame
        One row per circuit: :data:`CIRCUIT_COLUMNS`.
    totals : dict
        label → value for the (first) panel: connected, demand, continuous and design VA,
        per-phase VA, imbalance %, design current. For a multi-panel file see ``panels``.
    panels : DataFrame
        The same figures, one row per panel.
    findings : list of Finding
        One per failing or warning circuit check (subject ``"LP1/7"``) plus the panel ones.
        A plain list; :func:`check_schedule` builds it on first use (one object per
        failing circuit check is costly on a large schedule, and many callers only want
        the circuits table), then it is kept and may be changed like any list.
    demand : Load
        Demand load of the (first) panel, for the feed walk; ``demands`` has every panel.
    """

    path: Path
    system: str
    circuits: pd.DataFrame
    totals: dict
    panels: pd.DataFrame
    findings: list[Finding]
    demand: Load
    demands: dict[str, Load] = field(default_factory=dict)

    @property
    def exit_code(self) -> int:
        f = self.__dict__["_findings"]
        if isinstance(f, _Deferred):
            return 1 if f.any_fail else 0
        return 1 if any(f.status == "fail" for f in self.findings) else 0

    def __getstate__(self) -> dict:
        """Copies and pickles hold the built list."""
        _get_findings(self)
        return dict(self.__dict__)


class _Deferred:
    """Findings not built yet: ``build()`` makes the list; ``any_fail`` says whether it
    holds a failing one."""

    __slots__ = ("any_fail", "build")

    def __init__(self, build, any_fail: bool):
        self.build = build
        self.any_fail = any_fail


def _get_findings(self) -> list[Finding]:
    f = self.__dict__["_findings"]
    if isinstance(f, _Deferred):
        f = self.__dict__["_findings"] = f.build()
    return f


def _set_findings(self, value) -> None:
    self.__dict__["_findings"] = value


# the dataclass __init__ assigns ``findings`` through this property (a list, or _Deferred)
ScheduleResult.findings = property(
    _get_findings,
    _set_findings,  # type: ignore[assignment]
    doc="Findings: a list, built on first use.",
)


def _unique_rows(*arrays) -> tuple[np.ndarray, np.ndarray]:
    """Distinct combinations of equal-length columns: ``(codes, first)``.

    ``codes[i]`` numbers the combination of row ``i`` (in order of first appearance) and
    ``first[j]`` is the first row holding combination ``j``, so ``f(x[first])[codes]``
    equals ``f(x)`` for a function that works row by row. Floats are told apart by
    their exact bits; a column with a missing value (None/NaN object) is not grouped.
    """
    import pandas as pd

    n = len(arrays[0]) if arrays else 0
    key = np.zeros(n, dtype=np.intp)
    for a in arrays:
        a = np.asarray(a)
        if a.dtype.kind == "f":
            a = np.ascontiguousarray(a, dtype=np.float64).view(np.int64)
        codes = pd.factorize(a)[0]
        if len(codes) and codes.min() < 0:
            return np.arange(n), np.arange(n)
        key = pd.factorize(key * (int(codes.max(initial=0)) + 1) + codes)[0]
    first = np.flatnonzero(~pd.Series(key).duplicated().to_numpy())
    return key, first


def _per_unique(fn, *arrays, **kwargs):
    """``fn(*arrays, **kwargs)`` for a row-by-row function, called once per distinct row."""
    codes, first = _unique_rows(*arrays)
    out = fn(*(np.asarray(a)[first] for a in arrays), **kwargs)
    if isinstance(out, tuple):
        return tuple(np.asarray(o)[codes] for o in out)
    return np.asarray(out)[codes]


def _texts(idx: np.ndarray, text, deps) -> np.ndarray:
    """``[text(i) for i in idx]`` as an object array, formatted once per distinct
    combination of the columns ``deps`` the text is made of."""
    if not len(deps):
        return np.full(len(idx), text(idx[0]), dtype=object)
    codes, first = _unique_rows(*(np.asarray(d)[idx] for d in deps))
    made = np.array([text(i) for i in idx[first]] + [None], dtype=object)[:-1]
    return made[codes]


# --------------------------------------------------------------------------- rules
def _rules() -> dict[str, dict]:
    from .tables import load_table

    t = load_table("schedule_rules").data
    return {r["rule_id"]: r for r in t.to_dict("records")}


def _drop_limit(rule_id) -> tuple[float, str]:
    """(max %, status) of a voltage-drop rule id, or of a job's own (rule_id, max %, status)."""
    if isinstance(rule_id, tuple):
        return float(rule_id[1]), str(rule_id[2])
    from .tables import rule

    r = rule("voltage_drop_limits", rule_id)
    return float(r["max_pct"]), str(r["status"])


def _tiered(total_va: np.ndarray, rows) -> np.ndarray:
    """Σ factor · (part of the total between from_va and to_va)."""
    out = np.zeros_like(total_va, dtype=float)
    for lo, hi, f in rows:
        out += f * np.clip(total_va - lo, 0.0, hi - lo)
    return out


def demand_tiers(occupancy: str = "other") -> dict[str, list[tuple[float, float, float]]]:
    """Demand tiers by load kind from ``tables/demand_factors.csv`` for an occupancy.

    Examples
    --------
    >>> demand_tiers()["receptacle"]
    [(0.0, 10000.0, 1.0), (10000.0, inf, 0.5)]
    """
    from .tables import load_table

    if occupancy not in OCCUPANCIES:
        raise ValueError(f"occupancy: got {occupancy!r}; expected one of {', '.join(OCCUPANCIES)}")
    t = load_table("demand_factors").data
    out: dict[str, list[tuple[float, float, float]]] = {}
    for r in t.itertuples(index=False):
        if r.kind == "lighting" and r.occupancy != occupancy:
            continue
        out.setdefault(str(r.kind), []).append((float(r.from_va), float(r.to_va), float(r.factor)))
    return out


# --------------------------------------------------------------------------- electrical
def _circuit_electrics(c: pd.DataFrame, load_unit: str, system: VoltageSystem):
    """Circuit voltage factor, nominal voltage, load VA, current, drop circuit kind."""
    poles = c["poles"].to_numpy()
    three = system.phases == 3
    vln = system.neutral_v if system.neutral_v is not None else system.line_v
    vll = system.line_v
    # volts per ampere of load: VA = I · kv
    kv = np.where(poles == 1, vln, np.where((poles == 3) & three, SQRT3 * vll, vll))
    nominal_v = np.where(poles == 1, vln, vll)
    kind = np.where(poles == 1, "ln4w", np.where((poles == 3) & three, "3ph", "1ph2w"))
    val = c["load_value"].to_numpy(float)
    pf = c["pf"].to_numpy(float)
    if load_unit == "A":
        load_va = val * kv
    elif load_unit == "W":
        load_va = val / pf
    else:
        load_va = val
    return kv, nominal_v, load_va, load_va / kv, kind


def _phase_of_space(space: np.ndarray, system: VoltageSystem) -> np.ndarray:
    n_ph = 3 if system.phases == 3 else (2 if system.kind == "split" else 1)
    return ((space - 1) // 2) % n_ph


def _ampacities(c: pd.DataFrame, problems: ProblemList):
    from .calc.ampacity import COLUMNS_C, ampacity_a, termination_c_for
    from .rulebook import current_rulebook
    from .calc.conductor import material_index, size_index

    size = c["size"].to_numpy(object)
    mat = c["material"].to_numpy(object)
    breaker = c["breaker_a"].to_numpy(float)
    term = c["termination_c"].to_numpy(float)
    term = np.where(np.isnan(term), _per_unique(termination_c_for, breaker, size), term)
    t = current_rulebook().ampacity
    idx = _per_unique(size_index, size)
    m = _per_unique(material_index, mat)
    cols = np.asarray(COLUMNS_C)
    ins = c["insulation_c"].to_numpy(float)
    ci = np.searchsorted(cols, ins)
    ct = np.searchsorted(cols, term)
    missing = np.isnan(t.raceway_a[m, ci, idx]) | np.isnan(t.raceway_a[m, ct, idx])
    for i in np.flatnonzero(missing)[:50]:
        problems.add(
            f"row {c['row'].iat[i]}, column 'conductor'",
            f"{size[i]} {mat[i]}",
            "a size the ampacity table lists for that material (14 AWG … 2000 kcmil "
            "Cu, 12 AWG … 2000 kcmil Al)",
        )
    problems.raise_if_any()
    # the kernels once per distinct conductor and conditions, spread over the circuits
    derated = _per_unique(
        ampacity_a,
        size,
        mat,
        ins,
        c["ambient_c"].to_numpy(float),
        c["current_carrying"].to_numpy(),
        term,
        tables=t,
    )
    unadjusted = _per_unique(
        lambda s, m, i, tc: ampacity_a(s, m, i, 30.0, 3, tc, tables=t), size, mat, ins, term
    )
    return np.asarray(derated, float), np.asarray(unadjusted, float), term


def _min_phase_area(breaker, mat, ins, term, size):
    """Area [mm²] of the smallest conductor of the same material and size system that the
    breaker protects (240.4, at the circuit's insulation and termination columns): the
    "minimum size that has sufficient ampacity" of 250.122(B). One call per distinct row."""
    from .calc.ampacity import ampacity_a
    from .calc.protection import max_device_a
    from .rulebook import current_rulebook

    book = current_rulebook()
    from .calc.sizes import AWG_KCMIL_ORDER, METRIC_ORDER, SIZES

    out = np.empty(len(breaker))
    for k, (b, m, i, t, sz) in enumerate(zip(breaker, mat, ins, term, size, strict=True)):
        order = AWG_KCMIL_ORDER if SIZES[sz].system == "awg" else METRIC_ORDER
        out[k] = SIZES[sz].area_mm2
        for name in order:
            if SIZES[name].area_mm2 >= SIZES[sz].area_mm2:
                break
            try:
                amp = float(ampacity_a(name, m, i, 30.0, 3, t, tables=book.ampacity))
            except ValueError:
                continue
            if float(max_device_a(amp, name, m, tables=book.protection)) >= b - 1e-9:
                out[k] = SIZES[name].area_mm2
                break
    return out


def _egc_required_area(breaker, gmat, size, mat, min_area):
    """Least EGC area [mm²] by Table 250.122, increased in proportion to the circuit
    conductors' area over the minimum size (250.122(B)), capped at the circuit
    conductors (250.122(A))."""
    from .calc.conductor import AREA_MM2, material_index, size_index
    from .rulebook import current_rulebook

    t = current_rulebook().protection
    row = np.searchsorted(t.egc_up_to_a, breaker * (1 - 1e-12), side="left")
    row = np.minimum(row, len(t.egc_up_to_a) - 1)
    cu = AREA_MM2[size_index(np.array(t.egc_cu))]
    al = AREA_MM2[size_index(np.array(t.egc_al))]
    gm = material_index(gmat)
    table_area = np.where(gm == 0, cu[row], al[row])
    phase_area = AREA_MM2[size_index(size)]
    # the installed ground is a standard size, so comparing its area with the grown area
    # is the same as rounding the grown area up to the next standard size
    need = table_area * np.maximum(phase_area / min_area, 1.0)
    rho = t.rho20
    pm = material_index(mat)
    cap = phase_area * rho[gm] / rho[pm]
    return np.minimum(need, cap), table_area


# --------------------------------------------------------------------------- the check
def check_schedule(
    schedule: Schedule,
    system: VoltageSystem,
    feeder_drop_pct: float | dict[str, float] = 0.0,
    occupancy: str = "other",
    bus_a: float | None = None,
    main_a: float | None = None,
    branch_rule: str = "vd-nec-branch",
    total_rule: str = "vd-nec-total",
) -> ScheduleResult:
    """Check every circuit of a schedule and total its panel(s).

    Parameters
    ----------
    schedule : Schedule
        From :func:`feedcheck.schedule.read_schedule`.
    system : VoltageSystem
        The panel's nominal system (``208Y/120 V``, ``120/240 V`` …).
    feeder_drop_pct : float or dict
        Voltage drop from the source to the panel [%] (one figure, or per panel id).
    occupancy : str
        Lighting demand occupancy: other, dwelling, hospital, hotel, warehouse.
    bus_a, main_a : float, optional
        Panel bus and main device ratings [A]; when given, held against the design
        current (demand with continuous at 125 %).
    branch_rule, total_rule : str
        Rule ids in ``voltage_drop_limits.csv`` for the branch and total drop.

    Returns
    -------
    ScheduleResult

    Raises
    ------
    InputError
        A conductor the ampacity table does not list for its material.
    ValueError
        An unknown occupancy.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> from feedcheck.schedule import read_schedule
    >>> from feedcheck.units import parse_voltage_system
    >>> d = pathlib.Path(tempfile.mkdtemp())
    >>> _ = (d / "LP1.csv").write_text("circuit,load [VA],breaker [A],conductor,length [ft]\\n"
    ...                                "1,1800,20,12 AWG Cu,60\\n2,2400,15,14 AWG Cu,40\\n")
    >>> r = check_schedule(read_schedule(d / "LP1.csv"), parse_voltage_system("208Y/120 V"))
    >>> r.circuits["status"].tolist(), r.totals["connected_va"]
    (['ok', 'fail'], 4200.0)
    """
    import pandas as pd

    from .calc.conductor import AREA_MM2, ac_impedance_ohm_per_m, size_index
    from .calc.protection import max_device_a, next_standard_rating_a
    from .rulebook import current_rulebook

    book = current_rulebook()
    from .calc.vdrop import voltage_drop_approximate_v

    tiers = demand_tiers(occupancy)
    rules = _rules()
    c = schedule.circuits
    n = len(c)
    problems = ProblemList(str(schedule.path))
    panel = c["panel"].to_numpy(object)
    circuit = c["circuit"].to_numpy()
    poles = c["poles"].to_numpy()
    breaker = c["breaker_a"].to_numpy(float)
    size = c["size"].to_numpy(object)
    mat = c["material"].to_numpy(object)
    kind = c["kind"].to_numpy(object)
    cont = c["continuous"].to_numpy(bool)
    pf = c["pf"].to_numpy(float)
    length = c["length_m"].to_numpy(float)
    motor = kind == "motor"

    _kv, nominal_v, load_va, current, vd_kind = _circuit_electrics(c, schedule.load_unit, system)
    derated, unadjusted, term = _ampacities(c, problems)

    # ---- checks: (name, rule id, failing mask, value, limit, unit, status, reason text)
    checks = []

    def add(name, rid, mask, value, limit, unit, status, text, deps):
        """``text(i)``: the reason for circuit ``i``, made only of the columns ``deps``."""
        checks.append((name, rid, np.asarray(mask, bool), value, limit, unit, status, text, deps))

    from .calc.protection import standard_ratings_a

    std = standard_ratings_a("breaker", tables=book.protection)
    add(
        "standard rating",
        "sched-standard-rating",
        ~np.isin(breaker, std),
        breaker,
        breaker,
        "A",
        rules["sched-standard-rating"]["status"],
        lambda i: f"{breaker[i]:g} A is not a standard breaker rating (240.6(A))",
        (breaker,),
    )
    need_brk = np.where(cont, 1.25 * current, current)
    add(
        "breaker vs load",
        "sched-breaker-load",
        ~motor & (breaker < need_brk - 1e-9),
        breaker,
        need_brk,
        "A",
        rules["sched-breaker-load"]["status"],
        lambda i: f"breaker {breaker[i]:g} A < {need_brk[i]:.1f} A load",
        (breaker, need_brk),
    )
    need_cond = np.where(cont, 1.25 * current, current)
    add(
        "conductor vs load",
        "sched-conductor-load",
        ~motor & (unadjusted < need_cond - 1e-9),
        unadjusted,
        need_cond,
        "A",
        rules["sched-conductor-load"]["status"],
        lambda i: f"{size[i]} {mat[i]} {unadjusted[i]:.0f} A < {need_cond[i]:.1f} A load",
        (size, mat, unadjusted, need_cond),
    )
    add(
        "conductor after derating",
        "sched-conductor-derated",
        ~motor & (derated < current - 1e-9),
        derated,
        current,
        "A",
        rules["sched-conductor-derated"]["status"],
        lambda i: f"derated ampacity {derated[i]:.1f} A < {current[i]:.1f} A load",
        (derated, current),
    )
    add(
        "motor conductor",
        "sched-motor-conductor",
        motor & (derated < 1.25 * current - 1e-9),
        derated,
        1.25 * current,
        "A",
        rules["sched-motor-conductor"]["status"],
        lambda i: f"{size[i]} {mat[i]} {derated[i]:.1f} A < 125 % of {current[i]:.1f} A motor",
        (size, mat, derated, current),
    )
    from .calc.conductor import material_index

    small = book.protection.small_limit_a[
        _per_unique(material_index, mat), _per_unique(size_index, size)
    ]
    mx = np.asarray(_per_unique(max_device_a, derated, size, mat, tables=book.protection), float)
    add(
        "small conductor",
        "sched-small-conductor",
        ~motor & (breaker > small + 1e-9),
        breaker,
        small,
        "A",
        rules["sched-small-conductor"]["status"],
        lambda i: f"{size[i]} {mat[i]} on {breaker[i]:g} A (at most {small[i]:g} A)",
        (size, mat, breaker, small),
    )
    add(
        "conductor vs breaker",
        "sched-conductor-breaker",
        ~motor & (breaker > mx + 1e-9) & ~(breaker > small + 1e-9),
        breaker,
        mx,
        "A",
        rules["sched-conductor-breaker"]["status"],
        lambda i: f"breaker {breaker[i]:g} A over {derated[i]:.1f} A conductor (max {mx[i]:g} A)",
        (breaker, derated, mx),
    )
    motor_max = np.zeros(n)
    if motor.any():
        motor_max[motor] = next_standard_rating_a(
            np.minimum(2.5 * current[motor], 6000.0), tables=book.protection
        )
    add(
        "motor breaker",
        "sched-motor-breaker",
        motor & (breaker > motor_max + 1e-9),
        breaker,
        motor_max,
        "A",
        rules["sched-motor-breaker"]["status"],
        lambda i: f"motor breaker {breaker[i]:g} A over {motor_max[i]:g} A (250 % rule)",
        (breaker, motor_max),
    )
    add(
        "motor breaker minimum",
        "sched-motor-breaker-min",
        motor & (breaker < current - 1e-9),
        breaker,
        current,
        "A",
        rules["sched-motor-breaker-min"]["status"],
        lambda i: f"motor breaker {breaker[i]:g} A below {current[i]:.1f} A running current",
        (breaker, current),
    )

    gsize = c["ground_size"].to_numpy(object)
    has_g = gsize != ""
    g_ok = np.ones(n, bool)
    g_area = np.zeros(n)
    g_need = np.zeros(n)
    if has_g.any():
        gm = c["ground_material"].to_numpy(object)
        ins_c = c["insulation_c"].to_numpy(float)
        min_area = _per_unique(
            _min_phase_area, breaker[has_g], mat[has_g], ins_c[has_g], term[has_g], size[has_g]
        )
        need, _table = _per_unique(
            _egc_required_area, breaker[has_g], gm[has_g], size[has_g], mat[has_g], min_area
        )
        g_need[has_g] = need
        g_area[has_g] = AREA_MM2[_per_unique(size_index, gsize[has_g])]
        g_ok[has_g] = g_area[has_g] >= need * (1 - 1e-9)
    add(
        "grounding conductor",
        "sched-egc",
        ~g_ok,
        g_area,
        g_need,
        "mm2",
        rules["sched-egc"]["status"],
        lambda i: (
            f"ground {gsize[i]} smaller than required for {breaker[i]:g} A with "
            f"{size[i]} {mat[i]} (Table 250.122, increased in proportion when upsized)"
        ),
        (gsize, breaker, size, mat),
    )

    max_poles = 3 if system.phases == 3 else 2
    add(
        "poles vs panel",
        "sched-poles-phases",
        poles > max_poles,
        poles.astype(float),
        float(max_poles),
        "poles",
        rules["sched-poles-phases"]["status"],
        lambda i: f"{poles[i]} poles on a {system.phases}-phase panel",
        (poles,),
    )
    add(
        "neutral for one pole",
        "sched-neutral",
        (poles == 1) & (system.neutral_v is None),
        poles.astype(float),
        2.0,
        "poles",
        rules["sched-neutral"]["status"],
        lambda i: f"one-pole circuit on {system.text} (no neutral)",
        (),
    )

    r_m, x_m = _per_unique(
        lambda s, m, r: ac_impedance_ohm_per_m(s, m, r, 75.0, data=book.conductors),
        size,
        mat,
        c["raceway"].to_numpy(object),
    )
    vd_v = voltage_drop_approximate_v(current, r_m, x_m, length, pf, vd_kind)
    vd_pct = 100.0 * np.asarray(vd_v, float) / nominal_v
    if isinstance(feeder_drop_pct, dict):
        feeder = np.array([float(feeder_drop_pct.get(p, 0.0)) for p in pd.unique(panel)])[
            pd.factorize(panel)[0]
        ]
    else:
        feeder = np.full(n, float(feeder_drop_pct))
    total_pct = vd_pct + feeder
    b_lim, b_status = _drop_limit(branch_rule)
    t_lim, t_status = _drop_limit(total_rule)
    b_id = branch_rule[0] if isinstance(branch_rule, tuple) else branch_rule
    t_id = total_rule[0] if isinstance(total_rule, tuple) else total_rule
    add(
        "branch voltage drop",
        b_id,
        vd_pct > b_lim + 1e-9,
        vd_pct,
        b_lim,
        "%",
        b_status,
        lambda i: f"branch drop {vd_pct[i]:.2f} % > {b_lim:g} %",
        (vd_pct,),
    )
    add(
        "total voltage drop",
        t_id,
        total_pct > t_lim + 1e-9,
        total_pct,
        t_lim,
        "%",
        t_status,
        lambda i: f"total drop {total_pct[i]:.2f} % > {t_lim:g} %",
        (total_pct,),
    )

    # ---- status and reason per circuit (worst of its checks)
    sev = np.full(n, SEVERITY["ok"])
    reason = np.full(n, "", dtype=object)
    circ_found = []  # per check with failures: what its findings are made of
    for name, rid, mask, value, limit, unit, status, text, deps in checks:
        idx = np.flatnonzero(mask)
        if not len(idx):
            continue
        sev[idx] = np.minimum(sev[idx], SEVERITY[status])
        texts = _texts(idx, text, deps)
        reason[idx] = np.where(reason[idx] == "", texts, reason[idx] + "; " + texts)
        circ_found.append(
            (
                name,
                rid,
                idx,
                np.broadcast_to(np.asarray(value, float), (n,))[idx],
                np.broadcast_to(np.asarray(limit, float), (n,))[idx],
                unit,
                status,
                texts,
            )
        )
    findings: list[Finding] = []  # the panel ones; the circuit ones come first, on demand
    status_names = np.array(["fail", "warn", "ok", "info"], dtype=object)

    # ---- phases: every space a circuit takes
    counts = poles.astype(np.int64)
    owner = np.repeat(np.arange(n), counts)
    step = np.arange(len(owner)) - np.repeat(np.cumsum(counts) - counts, counts)
    space = circuit[owner].astype(np.int64) + 2 * step
    ph = _phase_of_space(space, system)
    pan_codes, pan_ids = pd.factorize(pd.Series(panel))
    n_pan = len(pan_ids)
    per_phase = np.bincount(
        pan_codes[owner] * 3 + ph, weights=(load_va / counts)[owner], minlength=3 * n_pan
    ).reshape(n_pan, 3)
    letters = np.array(list("ABC"), dtype=object)
    phase_txt = np.full(n, "", dtype=object)
    for k in range(int(counts.max()) if n else 0):
        sel = step == k
        phase_txt[owner[sel]] = phase_txt[owner[sel]] + letters[ph[sel]]

    # ---- demand per panel
    conn, dem_va, cont_va, w, largest_motor = _panel_demand(
        kind, load_va, cont, pf, pan_codes, n_pan, tiers
    )
    cont_factor = tiers["continuous"][0][2]
    design_va = dem_va + (cont_factor - 1.0) * cont_va
    k_i = SQRT3 * system.line_v if system.phases == 3 else system.line_v
    n_ph = 3 if system.phases == 3 else (2 if system.kind == "split" else 1)
    used = per_phase[:, :n_ph]
    avg = used.mean(axis=1)
    imbalance = (
        np.divide(np.abs(used - avg[:, None]).max(axis=1), avg, out=np.zeros(n_pan), where=avg > 0)
        * 100.0
        if n_ph > 1
        else np.zeros(n_pan)
    )
    imb_lim = float(rules["sched-imbalance"]["value"])
    imb_status = str(rules["sched-imbalance"]["status"])
    fail_n = np.bincount(pan_codes, weights=sev == SEVERITY["fail"], minlength=n_pan)
    warn_n = np.bincount(pan_codes, weights=sev == SEVERITY["warn"], minlength=n_pan)
    panels = pd.DataFrame(
        {
            "panel": np.asarray(pan_ids, dtype=object),
            "circuits": np.bincount(pan_codes, minlength=n_pan),
            "connected_va": conn.sum(axis=1),
            "demand_va": dem_va,
            "continuous_va": cont_va,
            "design_va": design_va,
            "design_current_a": design_va / k_i,
            "phase_a_va": per_phase[:, 0],
            "phase_b_va": per_phase[:, 1],
            "phase_c_va": per_phase[:, 2],
            "imbalance_pct": imbalance,
            "largest_motor_va": largest_motor,
            "lighting_va": conn[:, 0],
            "receptacle_va": conn[:, 1],
            "motor_va": conn[:, 2],
            "heating_va": conn[:, 3],
            "other_va": conn[:, 4],
            "fail_circuits": fail_n.astype(int),
            "warn_circuits": warn_n.astype(int),
        }
    )
    for j, pid in enumerate(panels["panel"]):
        bad = imbalance[j] > imb_lim
        findings.append(
            Finding(
                str(pid),
                "phase balance",
                float(imbalance[j]),
                imb_lim,
                "%",
                imb_status if bad else "ok",
                "sched-imbalance",
                "largest phase deviation from the average phase load "
                f"(A {per_phase[j, 0] / 1e3:.1f} / B {per_phase[j, 1] / 1e3:.1f}"
                + (f" / C {per_phase[j, 2] / 1e3:.1f}" if n_ph == 3 else "")
                + " kVA)",
            )
        )
        for rid, what, rating in (
            ("panel-bus-load", "bus rating", bus_a),
            ("panel-main-load", "main device", main_a),
        ):
            if rating:
                i_d = design_va[j] / k_i
                findings.append(
                    Finding(
                        str(pid),
                        f"demand vs {what}",
                        float(i_d),
                        float(rating),
                        "A",
                        "ok" if i_d <= rating + 1e-9 else "fail",
                        rid,
                        f"design current {i_d:.1f} A (continuous at 125 %) vs {what} {rating:g} A",
                    )
                )
    circuits = pd.DataFrame(
        {
            "panel": panel,
            "circuit": circuit,
            "description": c["description"].to_numpy(object),
            "poles": poles,
            "phase": phase_txt,
            "kind": kind,
            "load_va": load_va,
            "current_a": current,
            "breaker_a": breaker,
            "size": size,
            "material": mat,
            "length_m": length,
            "ampacity_a": derated,
            "vdrop_pct": vd_pct,
            "total_vdrop_pct": total_pct,
            "status": status_names[sev],
            "reason": reason,
            "row": c["row"].to_numpy(),
        }
    )
    demands = {
        str(pid): Load(float(dem_va[j]), float(cont_va[j]), float(w[j]))
        for j, pid in enumerate(panels["panel"])
    }
    first = panels.iloc[0]
    totals = {
        k: (float(v) if isinstance(v, (int, float, np.floating, np.integer)) else v)
        for k, v in first.to_dict().items()
    }
    totals["occupancy"] = occupancy
    totals["system"] = system.text
    if n_pan > 1:
        totals = {
            "panels": n_pan,
            "circuits": n,
            "connected_va": float(conn.sum()),
            "demand_va": float(dem_va.sum()),
            "worst_imbalance_pct": float(imbalance.max()),
            "occupancy": occupancy,
            "system": system.text,
        }
    any_fail = any(f[6] == "fail" for f in circ_found) or any(f.status == "fail" for f in findings)
    deferred = _Deferred(lambda: _circuit_findings(panel, circuit, circ_found) + findings, any_fail)
    return ScheduleResult(
        schedule.path,
        system.text,
        circuits,
        totals,
        panels,
        deferred,
        demands[str(panels["panel"].iat[0])],
        demands,
    )


def _circuit_findings(panel: np.ndarray, circuit: np.ndarray, circ_found) -> list[Finding]:
    """One Finding per failing circuit check, check by check, circuits in order."""
    out: list[Finding] = []
    for name, rid, idx, vals, lims, unit, status, texts in circ_found:
        subj = np.char.add(np.char.add(panel[idx].astype(str), "/"), circuit[idx].astype(str))
        # tolist(): Python str and float, as str()/float() of each element would give
        out.extend(
            Finding(s, name, v, lim, unit, status, rid, str(t))
            for s, v, lim, t in zip(
                subj.tolist(), vals.tolist(), lims.tolist(), texts.tolist(), strict=True
            )
        )
    return out


def _panel_demand(kind, load_va, cont, pf, pan_codes, n_pan: int, tiers):
    """Connected VA by kind, demand VA, continuous VA, real power and the largest motor
    of each panel (demand factors of ``tables/demand_factors.csv``)."""
    import pandas as pd

    kinds = ("lighting", "receptacle", "motor", "heating", "other")
    kcode = np.asarray(pd.Categorical(kind, categories=kinds).codes, dtype=np.int64)
    conn = np.bincount(pan_codes * 5 + kcode, weights=load_va, minlength=5 * n_pan).reshape(
        n_pan, 5
    )
    dem = np.empty_like(conn)
    for j, k in enumerate(kinds):
        dem[:, j] = _tiered(conn[:, j], tiers.get(k, [(0.0, math.inf, 1.0)]))
    motor = kind == "motor"
    largest_motor = np.zeros(n_pan)
    if motor.any():
        np.maximum.at(largest_motor, pan_codes[motor], load_va[motor])
    extra = (tiers["motor-largest"][0][2] - 1.0) * largest_motor
    dem[:, 2] += extra
    factor = np.divide(dem, conn, out=np.zeros_like(dem), where=conn > 0)
    circ_dem = load_va * factor[pan_codes, kcode]
    dem_va = dem.sum(axis=1)
    cont_va = np.bincount(pan_codes, weights=np.where(cont, circ_dem, 0.0), minlength=n_pan)
    w = np.bincount(pan_codes, weights=circ_dem * pf, minlength=n_pan)
    return conn, dem_va, cont_va, w, largest_motor


def demand_load(schedule: Schedule, system: VoltageSystem, occupancy: str = "other") -> Load:
    """Demand load of a one-panel schedule (for the feed walk), without the circuit
    checks; the same figures as ``check_schedule(...).demand``."""
    c = schedule.circuits
    _kv, _v, load_va, _i, _k = _circuit_electrics(c, schedule.load_unit, system)
    _conn, dem_va, cont_va, w, _m = _panel_demand(
        c["kind"].to_numpy(object),
        load_va,
        c["continuous"].to_numpy(bool),
        c["pf"].to_numpy(float),
        np.zeros(len(c), dtype=np.int64),
        1,
        demand_tiers(occupancy),
    )
    return Load(float(dem_va[0]), float(cont_va[0]), float(w[0]))
