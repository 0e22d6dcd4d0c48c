"""The quantities of every circuit of a schedule, as whole columns: load and current,
ampacities, device limits, grounding conductor, voltage drop. The rules of
:mod:`feedcheck.checks.schedule_rules` compare them."""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from ..errors import ProblemList
from ..model import VoltageSystem
from .schedule_rules import per_unique

if TYPE_CHECKING:
    import pandas as pd


def circuit_electrics(c: pd.DataFrame, load_unit: str, system: VoltageSystem):
    """Nominal voltage, load VA, current and drop circuit kind of every circuit.

    Load: ``[VA]`` as given; ``[W]`` divided by the power factor; ``[A]`` times the
    circuit's volts per ampere (line-to-neutral for one pole, line-to-line for two,
    √3 · V_LL for three poles on a three-phase panel).
    """
    from ..calc.power import SQRT3

    poles = c["poles"].to_numpy()
    three = system.phases == 3
    vln = system.voltage_ln_v if system.voltage_ln_v is not None else system.voltage_ll_v
    vll = system.voltage_ll_v
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
    return nominal_v, load_va, load_va / kv, kind


def ampacities(c: pd.DataFrame, problems: ProblemList, book):
    """Derated ampacity, ampacity before correction (termination column) and the
    termination temperature of every circuit; a size the table lacks is an input problem."""
    from ..calc.ampacity import COLUMNS_C, ampacity_a, termination_c_for
    from ..calc.conductor import material_index, size_index

    size = c["size"].to_numpy(object)
    mat = c["material"].to_numpy(object)
    breaker = c["breaker_a"].to_numpy(float)
    term = c["termination_c"].to_numpy(float)
    term = np.where(np.isnan(term), per_unique(termination_c_for, breaker, size), term)
    t = book.ampacity
    idx = per_unique(size_index, size)
    m = per_unique(material_index, mat)
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
    derated = per_unique(
        ampacity_a,
        size,
        mat,
        ins,
        c["ambient_c"].to_numpy(float),
        c["current_carrying"].to_numpy(),
        term,
        tables=t,
    )
    unadjusted = per_unique(
        lambda s, m, i, tc: ampacity_a(s, m, i, 30.0, 3, tc, tables=t), size, mat, ins, term
    )
    return np.asarray(derated, float), np.asarray(unadjusted, float), term


def min_phase_area(breaker, need_a, mat, ins, term, ambient, cc, size, *, book):
    """Area [mm²] of the smallest conductor (same material and size system) with
    sufficient ampacity for the intended installation: corrected for the circuit's
    ambient and current-carrying count at its insulation and termination columns
    (310.15), carrying the circuit's need (125 % continuous, 430.22 motors) and protected
    by its breaker (240.4): the "minimum size" of 250.122(B), as a run's is
    (checks/conductors.py). Whole columns; the ampacity kernel once per distinct
    installation and size."""
    from ..calc.ampacity import ampacity_a
    from ..calc.protection import max_device_a
    from ..calc.sizes import AWG_KCMIL_ORDER, METRIC_ORDER, SIZES
    from .schedule_rules import unique_rows

    area = np.array([SIZES[s].area_mm2 for s in size], float)
    out = area.copy()
    system = np.array([SIZES[s].system == "awg" for s in size])
    codes, first = unique_rows(mat, ins, term, ambient, cc, system)
    for g, f in enumerate(first):
        idx = np.flatnonzero(codes == g)
        order = AWG_KCMIL_ORDER if system[f] else METRIC_ORDER
        amp = np.full(len(order), -np.inf)
        dev = np.full(len(order), -np.inf)
        for j, name in enumerate(order):
            try:
                amp[j] = float(
                    ampacity_a(
                        name, mat[f], ins[f], ambient[f], cc[f], term[f], tables=book.ampacity
                    )
                )
                dev[j] = float(max_device_a(amp[j], name, mat[f], tables=book.protection))
            except ValueError:
                continue
        areas = np.array([SIZES[n].area_mm2 for n in order])
        ok = (
            (dev[None, :] >= breaker[idx, None] - 1e-9)
            & (amp[None, :] >= need_a[idx, None] * (1 - 1e-9))
            & (areas[None, :] < area[idx, None])
        )
        has = ok.any(axis=1)
        out[idx[has]] = areas[np.argmax(ok, axis=1)[has]]
    return out


def egc_required_area(breaker, gmat, size, mat, min_area, *, book):
    """Least EGC area [mm²]: :func:`feedcheck.calc.protection.egc_area_mm2`, the one
    250.122(A)/(B) rule runs use too, capped at the circuit conductors (250.122(A))."""
    from ..calc.protection import egc_area_mm2
    from ..calc.sizes import SIZES

    phase_area = np.array([SIZES[s].area_mm2 for s in size], float)
    # the installed ground is a standard size, so comparing its area with the grown area
    # is the same as rounding the grown area up to the next standard size
    need, table, _ratio, cap = egc_area_mm2(
        breaker, gmat, phase_area, min_area, mat, tables=book.protection
    )
    return np.minimum(need, cap), table


def _device_limits(q: dict, book) -> None:
    """Breaker and conductor limits: 240.6(A), 210.19/210.20, 240.4(B)/(D), 430.22/430.52."""
    from ..calc.conductor import material_index, size_index
    from ..calc.protection import (
        max_device_a,
        next_standard_rating_a,
        standard_ratings_a,
    )

    breaker, current, size, mat = q["breaker_a"], q["current_a"], q["size"], q["material"]
    cont, motor = q["continuous"], q["motor"]
    q["breaker_standard"] = np.isin(breaker, standard_ratings_a("breaker", tables=book.protection))
    q["need_breaker_a"] = np.where(cont, 1.25 * current, current)
    q["need_conductor_a"] = np.where(cont, 1.25 * current, current)
    q["motor_conductor_a"] = 1.25 * current
    q["small_max_a"] = book.protection.small_limit_a[
        per_unique(material_index, mat), per_unique(size_index, size)
    ]
    q["max_device_a"] = np.asarray(
        per_unique(max_device_a, q["ampacity_a"], size, mat, tables=book.protection), float
    )
    motor_max = np.zeros(len(breaker))
    if motor.any():
        motor_max[motor] = next_standard_rating_a(
            np.minimum(2.5 * current[motor], 6000.0), tables=book.protection
        )
    q["motor_max_a"] = motor_max
    q["not_motor"] = ~motor
    q["not_motor_within_small"] = ~motor & ~(breaker > q["small_max_a"] + 1e-9)


def _grounding(q: dict, c: pd.DataFrame, book) -> None:
    """Installed and required EGC area of circuits that give a ground (250.122)."""
    from ..calc.conductor import AREA_MM2, size_index

    n = len(c)
    gsize = c["ground_size"].to_numpy(object)
    has_g = gsize != ""
    g_ok = np.ones(n, bool)
    g_area = np.zeros(n)
    g_need = np.zeros(n)
    if has_g.any():
        breaker, mat, size, term = q["breaker_a"], q["material"], q["size"], q["termination_c"]
        gm = c["ground_material"].to_numpy(object)
        ins_c = c["insulation_c"].to_numpy(float)
        need_a = np.where(q["motor"], q["motor_conductor_a"], q["need_conductor_a"])
        min_area = min_phase_area(
            breaker[has_g],
            need_a[has_g],
            mat[has_g],
            ins_c[has_g],
            term[has_g],
            c["ambient_c"].to_numpy(float)[has_g],
            c["current_carrying"].to_numpy()[has_g],
            size[has_g],
            book=book,
        )
        need, _table = per_unique(
            egc_required_area,
            breaker[has_g],
            gm[has_g],
            size[has_g],
            mat[has_g],
            min_area,
            book=book,
        )
        g_need[has_g] = need
        g_area[has_g] = AREA_MM2[per_unique(size_index, gsize[has_g])]
        g_ok[has_g] = g_area[has_g] >= need * (1 - 1e-9)
    q.update(ground_size=gsize, ground_ok=g_ok, ground_area_mm2=g_area, ground_need_mm2=g_need)


def _voltage_drop(q: dict, c: pd.DataFrame, nominal_v, vd_kind, feeder_drop_pct, book) -> None:
    """Branch drop by the approximate form at 75 °C, and the total with the feeder's."""
    import pandas as pd

    from ..calc.conductor import ac_impedance_ohm_per_m
    from ..calc.vdrop import voltage_drop_approximate_v

    n = len(c)
    r_m, x_m = per_unique(
        lambda s, m, r: ac_impedance_ohm_per_m(s, m, r, 75.0, data=book.conductors),
        q["size"],
        q["material"],
        c["raceway"].to_numpy(object),
    )
    vd_v = voltage_drop_approximate_v(q["current_a"], r_m, x_m, q["length_m"], q["pf"], vd_kind)
    # a drop of all the voltage is the most there is (no load beyond it is delivered)
    vd_pct = np.minimum(100.0 * np.asarray(vd_v, float) / nominal_v, 100.0)
    panel = q["panel"]
    if isinstance(feeder_drop_pct, dict):
        feeder = np.array([float(feeder_drop_pct.get(p, 0.0)) for p in pd.unique(panel)])[
            pd.factorize(panel)[0]
        ]
    else:
        feeder = np.full(n, float(feeder_drop_pct))
    q["vdrop_pct"] = vd_pct
    q["total_vdrop_pct"] = vd_pct + feeder


def circuit_quantities(
    c: pd.DataFrame,
    load_unit: str,
    system: VoltageSystem,
    feeder_drop_pct,
    limits,
    problems,
    book,
) -> dict:
    """Every per-circuit quantity the rules compare, by name (arrays of one per circuit,
    or scalars)."""
    nominal_v, load_va, current, vd_kind = circuit_electrics(c, load_unit, system)
    derated, unadjusted, term = ampacities(c, problems, book)
    poles = c["poles"].to_numpy()
    kind = c["kind"].to_numpy(object)
    q = {
        "panel": c["panel"].to_numpy(object),
        "circuit": c["circuit"].to_numpy(),
        "poles": poles,
        "poles_f": poles.astype(float),
        "breaker_a": c["breaker_a"].to_numpy(float),
        "size": c["size"].to_numpy(object),
        "material": c["material"].to_numpy(object),
        "kind": kind,
        "continuous": c["continuous"].to_numpy(bool),
        "pf": c["pf"].to_numpy(float),
        "length_m": c["length_m"].to_numpy(float),
        "motor": kind == "motor",
        "load_va": load_va,
        "current_a": current,
        "vd_kind": vd_kind,
        "ampacity_a": derated,
        "unadjusted_a": unadjusted,
        "termination_c": term,
        "max_poles": float(3 if system.phases == 3 else 2),
        "phases": system.phases,
        "system": system.text,
        "two": 2.0,
        "neutral_ok": ~((poles == 1) & (system.voltage_ln_v is None)),
        # a one-pole circuit in a B space of a high-leg delta: 208 V to neutral
        "high_leg_ok": ~(
            (poles == 1)
            & (system.kind == "highleg")
            & ((c["circuit"].to_numpy().astype(np.int64) - 1) // 2 % 3 == 1)
        ),
        "branch_limit_pct": limits["branch"].max_pct,
        "total_limit_pct": limits["total"].max_pct,
    }
    _device_limits(q, book)
    _grounding(q, c, book)
    _voltage_drop(q, c, nominal_v, vd_kind, feeder_drop_pct, book)
    return q
