"""Smallest conductor meeting every criterion, and which criterion governed.

Criteria, each checked on every standard size in ascending order:

* **ampacity** — :func:`~feedcheck.calc.ampacity.ampacity_chain` load checks
  (125 % of continuous + noncontinuous before adjustment at the termination column;
  the load after correction, adjustment and the termination cap), 215.2(A)(1);
* **protection** — the device protects the conductor (240.4(B)–(D));
* **voltage drop** — approximate drop ``k·I·L·(R cos θ + X sin θ)/sets`` (k = √3
  three-phase, 2 single-phase) at the load current with R at 75 °C, against a limit
  in percent of the nominal voltage;
* **withstand** — the adiabatic withstand current ``k·S/√t`` of the phase conductor
  at least the available fault current for the clearing time.

The device, when not given, is the next standard rating at least 1.25 × continuous +
noncontinuous (215.3). The selected size is the smallest meeting all criteria; the
governing criterion is the one whose own smallest size is the largest (ties: the
first in the order above).

References
----------
NFPA 70-2023 110.14(C), 215.2(A)(1), 215.3, 240.4, 310.10(G), 310.15; IEC 60364-4-43
434.5.2; NFPA 70 informational notes to 210.19(A) and 215.2(A) (3 % / 5 % drop).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache

import numpy as np

from .ampacity import (
    PARALLEL_MIN_AREA_MM2,
    AmpacityChain,
    AmpacityTables,
    _column,
    ampacity_a,
    ampacity_chain,
)
from .conductor import (
    AREA_MM2,
    ConductorData,
    ac_impedance_ohm_per_m,
    material_index,
    size_index,
)
from .constants import SQRT3
from .memo import memoised
from .protection import (
    ProtectionTables,
    device_min_for_load_a,
    max_device_a,
    next_standard_rating_a,
)
from .sizes import AWG_KCMIL_ORDER, METRIC_ORDER
from .withstand import WithstandData, k_constant, withstand_current_a

CRITERIA = ("ampacity", "protection", "voltage drop", "withstand")
VDROP_CONDUCTOR_C = 75.0


@dataclass(frozen=True)
class SizingData:
    """The records :func:`select_conductor` reads (``book.sizing`` of the rule book)."""

    ampacity: AmpacityTables
    protection: ProtectionTables
    conductors: ConductorData
    withstand: WithstandData


def _vdrop_v(current_a, r_ohm_per_m, x_ohm_per_m, length_m, pf, phases, sets):
    """Approximate drop; uses feedcheck.calc.vdrop when present."""
    try:
        from .vdrop import voltage_drop_approximate_v
    except ImportError:  # pragma: no cover - vdrop.py is written by another module owner
        k = SQRT3 if phases == 3 else 2.0
        sin = np.sqrt(1.0 - pf * pf)
        return k * current_a * length_m * (r_ohm_per_m * pf + x_ohm_per_m * sin) / sets
    return float(
        voltage_drop_approximate_v(
            current_a,
            r_ohm_per_m,
            x_ohm_per_m,
            length_m,
            pf,
            circuit="3ph" if phases == 3 else "1ph2w",
            sets=sets,
        )
    )


@dataclass(frozen=True)
class Selection:
    """Result of :func:`select_conductor`."""

    size: str
    sets: int
    device_a: float
    termination_c: float
    governing: str
    minimum_by_criterion: tuple[tuple[str, str], ...]
    chain: AmpacityChain
    max_device_a: float
    vdrop_pct: float | None
    withstand_a: float | None
    rule_ids: tuple[str, ...]


@dataclass(frozen=True)
class _Extra:
    """The voltage-drop and withstand criteria of one selection, checked size by size."""

    check_vd: bool
    check_ws: bool
    run: tuple  # material, raceway, sets, load current [A], SizingData
    drop: tuple  # length [m], voltage [V], pf, phases, drop limit [%]
    withstand: tuple  # insulation kind, fault current [A], clearing time [s]

    def verdicts(self, name: str, ampacity_ok: bool, protection_ok: bool):
        """Each criterion's verdict for size ``name``, the drop [%] and withstand [A]."""
        material, raceway, sets, load_a, data = self.run
        passed = {"ampacity": ampacity_ok, "protection": protection_ok}
        vd_pct = ws = None
        if self.check_vd:
            length_m, voltage_v, pf, phases, vdrop_max_pct = self.drop
            r, x = ac_impedance_ohm_per_m(
                name, material, raceway, VDROP_CONDUCTOR_C, data=data.conductors
            )
            vd_pct = 100.0 * _vdrop_v(load_a, r, x, length_m, pf, phases, sets) / voltage_v
            passed["voltage drop"] = vd_pct <= vdrop_max_pct + 1e-12
        if self.check_ws:
            insulation, fault_a, clearing_s = self.withstand
            area = float(AREA_MM2[size_index(name)])
            k = k_constant(insulation, material, "line", area, data=data.withstand).k
            ws = float(withstand_current_a(area, clearing_s, k)) * sets
            passed["withstand"] = ws >= fault_a
        return passed, vd_pct, ws


def _search(names, terms, ok, extra, args, data: SizingData):
    """The first size passing each criterion, and the first passing all of them as
    (name, termination, chain, max device, drop %, withstand) (None when none does);
    ``ok`` the screened (ampacity, protection) verdicts of every size."""
    chain_args, more, sets, material = args
    first: dict[str, str] = {}
    chosen = None
    for i, name in enumerate(names):
        passed, vd_pct, ws = extra.verdicts(name, bool(ok[0][i]), bool(ok[1][i]))
        for c, good in passed.items():
            if good and c not in first:
                first[c] = name
        if chosen is None and all(passed.values()):
            chain = ampacity_chain(
                name, *chain_args, terms[i], sets, more[0], *more[1:], tables=data.ampacity
            )
            mx = float(max_device_a(chain.final_a, name, material, tables=data.protection))
            chosen = (name, terms[i], chain, mx, vd_pct, ws)
            if len(first) == len(passed):
                break
    return first, chosen


def _check_args(phases, pf, system, sets, loads=(), fault=(None, None)) -> None:
    """Refuse arguments no selection can use; ``loads`` (name, value) of the load
    currents, ``fault`` (fault_a, clearing_s)."""
    if fault[0] is not None and fault[1] is None:
        raise ValueError("clearing_s: expected a clearing time with fault_a")
    for what, v in loads:
        if not (np.isfinite(v) and v >= 0):
            raise ValueError(f"{what}: got {v}; expected a load current ≥ 0 A")
    if phases not in (1, 3):
        raise ValueError(f"phases: got {phases}; expected 1 or 3")
    if not (0 < pf <= 1):
        raise ValueError(f"pf: got {pf}; expected a power factor in (0, 1]")
    if system not in ("awg", "metric"):
        raise ValueError(f"system: got {system!r}; expected 'awg' or 'metric'")
    if not (isinstance(sets, int | np.integer) and sets >= 1):
        raise ValueError(f"sets: got {sets}; expected a whole number ≥ 1")


def _device(continuous_a, noncontinuous_a, device_a, data: SizingData) -> float:
    """The device given (at least 125 % continuous + noncontinuous, 215.3), else the next
    standard rating above that."""
    need = float(device_min_for_load_a(continuous_a, noncontinuous_a, tables=data.protection))
    if need <= 0:
        raise ValueError("continuous_a, noncontinuous_a: expected a load above 0 A")
    dev = (
        float(next_standard_rating_a(need, tables=data.protection))
        if device_a is None
        else float(device_a)
    )
    if dev < need - 1e-9:
        raise ValueError(
            f"device_a: got {dev:g} A; expected at least {need:g} A "
            "(125 % of continuous + noncontinuous, NFPA 70 215.3)"
        )
    return dev


def _none_meets(first: dict, check_vd: bool, check_ws: bool) -> None:
    missing = [
        c
        for c in CRITERIA
        if c not in first
        and (
            c in ("ampacity", "protection")
            or (c == "voltage drop" and check_vd)
            or (c == "withstand" and check_ws)
        )
    ]
    raise ValueError(
        "no standard size meets every criterion"
        + (f" (none meets: {', '.join(missing)})" if missing else "")
        + "; try more parallel sets, a higher insulation column or a "
        "shorter run"
    )


@cache
def _order_indices(system: str) -> tuple[int, ...]:
    """Index of every size of the system's order (``SIZE_NAMES``), looked up once."""
    order = AWG_KCMIL_ORDER if system == "awg" else METRIC_ORDER
    return tuple(size_index(np.array(order, dtype=object)).tolist())


def _candidates(system, sets, material, termination_c, dev, equipment_75c, tables):
    """The sizes tried, smallest first (tabulated for the material; 1/0 AWG or larger in
    parallel), and the termination column of each (110.14(C)(1) when not given)."""
    order = AWG_KCMIL_ORDER if system == "awg" else METRIC_ORDER
    m = 0 if material == "cu" else 1
    small = float(AREA_MM2[size_index("1 AWG")])
    names, terms = [], []
    for name, i in zip(order, _order_indices(system), strict=True):
        area = float(AREA_MM2[i])
        if sets > 1 and area < PARALLEL_MIN_AREA_MM2 * (1 - 1e-9):
            continue
        if np.isnan(tables.raceway_a[m, 0, i]):
            continue
        names.append(name)
        if termination_c is not None:
            terms.append(termination_c)
        else:
            terms.append(60.0 if (dev <= 100.0 or area <= small) and not equipment_75c else 75.0)
    return tuple(names), tuple(terms)


def _screen(dev, sets, candidates, chain_args, more, data: SizingData):
    """The sizes tried and their termination columns (:func:`_candidates`), and the
    ampacity (before and after corrections) and protection verdicts of every size at
    once: the figures :func:`~feedcheck.calc.ampacity.ampacity_chain` and
    :func:`~feedcheck.calc.protection.max_device_a` give one size at a time.
    ``candidates``: (system, termination column or None, equipment marked 75 °C)."""
    free_air, rooftop_c, cont_a, non_a = more
    names, terms, before, final, mx = _screen_figures(
        *candidates,
        dev,
        sets,
        *chain_args,
        free_air,
        rooftop_c,
        tables=data.ampacity,
        protection=data.protection,
    )
    if not names:
        return names, terms, (np.zeros(0, bool), np.zeros(0, bool))
    ok_before = before >= data.ampacity.continuous_factor * cont_a + non_a - 1e-9
    ok_after = final >= cont_a + non_a - 1e-9
    return names, terms, (ok_before & ok_after, dev <= mx + 1e-9)


@memoised(records=("tables", "protection"))
def _screen_figures(
    system,
    termination_c,
    equipment_75c,
    dev,
    sets,
    material,
    insulation_c,
    ambient_c,
    cc,
    free_air,
    rooftop_c,
    *,
    tables: AmpacityTables,
    protection: ProtectionTables,
):
    """The sizes tried, their termination columns, and the ampacity before corrections,
    the allowable ampacity and the largest device of every size [A]: the figures of
    :func:`_screen` that do not depend on the load (kept per distinct call: a building's
    runs share a few installations and devices; read-only arrays)."""
    names, terms = _candidates(system, sets, material, termination_c, dev, equipment_75c, tables)
    if not names:
        return names, terms, None, None, None
    final = np.asarray(
        ampacity_a(
            np.array(names, dtype=object),
            material,
            insulation_c,
            ambient_c,
            cc,
            np.array(terms, dtype=float),
            sets,
            free_air,
            rooftop_c,
            tables=tables,
        ),
        dtype=float,
    )
    tab = tables.free_air_a if free_air else tables.raceway_a
    m, idx = int(material_index(material)), size_index(np.array(names, dtype=object))
    ci = int(_column(insulation_c, "insulation_c"))
    before = tab[m, np.minimum(ci, _column(np.array(terms, dtype=float), "t")), idx] * sets
    mx = max_device_a(final, np.array(names, dtype=object), material, tables=protection)
    out = (np.asarray(before, dtype=float), final, np.asarray(mx, dtype=float))
    for arr in out:
        arr.flags.writeable = False
    return (names, terms, *out)


def select_conductor(
    continuous_a: float,
    noncontinuous_a: float = 0.0,
    material: str = "cu",
    insulation_c: float = 75.0,
    ambient_c: float = 30.0,
    current_carrying: int = 3,
    termination_c: float | None = None,
    sets: int = 1,
    raceway: str = "steel",
    device_a: float | None = None,
    length_m: float = 0.0,
    voltage_v: float | None = None,
    phases: int = 3,
    pf: float = 0.9,
    vdrop_max_pct: float = 3.0,
    fault_a: float | None = None,
    clearing_s: float | None = None,
    withstand_insulation: str = "thermoplastic",
    rooftop_adder_c: float = 0.0,
    equipment_75c: bool = False,
    system: str = "awg",
    *,
    data: SizingData,
) -> Selection:
    """Smallest conductor size meeting ampacity, protection, voltage drop and withstand.

    Loads ``continuous_a``, ``noncontinuous_a`` [A]; ``material`` "cu"/"al";
    ``insulation_c`` column (60, 75, 90 °C); ``ambient_c``; ``current_carrying`` per
    raceway; ``termination_c`` (default by 110.14(C)(1) from the device and size,
    ``equipment_75c`` when the equipment is marked 75 °C); ``sets`` in parallel (each
    ≥ 1/0 AWG); ``raceway`` steel, aluminum, pvc, cable or free-air (Table 310.17);
    ``device_a`` (default the next standard rating ≥ 1.25 Ic + Inc); the drop is checked
    when ``length_m`` > 0 and ``voltage_v`` (line-to-line three-phase, else line) is
    given, with ``phases``, ``pf`` and ``vdrop_max_pct``; withstand when ``fault_a`` [A]
    is given, with ``clearing_s`` and ``withstand_insulation`` ("thermoplastic" or
    "thermoset"); ``rooftop_adder_c`` [°C]; ``system`` "awg" or "metric"; ``data`` the
    rule book's ``book.sizing``. Returns a :class:`Selection`; ``ValueError`` for bad
    input, a device smaller than the load requires, or no size meeting every criterion.

    >>> s = select_conductor(150.0, 30.0, "cu", 90.0, 40.0, 6, data=book.sizing)  # 4/0 too small
    >>> s.size, s.device_a, s.governing
    ('250 kcmil', 225.0, 'protection')

    References: NFPA 70-2023 110.14(C), 215.2(A)(1), 215.3, 240.4; IEC 60364-4-43 434.5.2.
    """
    loads = (("continuous_a", continuous_a), ("noncontinuous_a", noncontinuous_a))
    _check_args(phases, pf, system, sets, loads, (fault_a, clearing_s))
    dev = _device(continuous_a, noncontinuous_a, device_a, data)
    extra = _Extra(
        length_m > 0 and voltage_v is not None,
        fault_a is not None,
        (material, raceway, sets, continuous_a + noncontinuous_a, data),
        (length_m, voltage_v, pf, phases, vdrop_max_pct),
        (withstand_insulation, fault_a, clearing_s),
    )
    chain_args = (material, insulation_c, ambient_c, current_carrying)
    more = (raceway == "free-air", rooftop_adder_c, continuous_a, noncontinuous_a)
    candidates = (system, termination_c, equipment_75c)
    names, terms, ok = _screen(dev, sets, candidates, chain_args, more, data)
    first, chosen = _search(names, terms, ok, extra, (chain_args, more, sets, material), data)
    if chosen is None:
        _none_meets(first, extra.check_vd, extra.check_ws)
    name, term, chain, mx, vd_pct, ws = chosen
    rank = {n: i for i, n in enumerate(AWG_KCMIL_ORDER if system == "awg" else METRIC_ORDER)}
    present = [c for c in CRITERIA if c in first]
    governing = max(present, key=lambda c: (rank[first[c]], -CRITERIA.index(c)))
    rules = (*chain.rule_ids, "device-continuous-125", "prot-next-size-up")
    criteria = tuple((c, first[c]) for c in present)
    return Selection(name, sets, dev, term, governing, criteria, chain, mx, vd_pct, ws, rules)


def smallest_size(
    continuous_a: float,
    noncontinuous_a: float,
    material: str,
    insulation_c: float,
    ambient_c: float,
    current_carrying: int,
    termination_c: float | None = None,
    sets: int = 1,
    raceway: str = "steel",
    device_a: float | None = None,
    rooftop_adder_c: float = 0.0,
    system: str = "awg",
    *,
    data: SizingData,
) -> str:
    """The size :func:`select_conductor` selects on ampacity and protection alone (no
    drop, no withstand: ``length_m`` 0 and no ``fault_a``), from the same screen of
    every size, without the selected size's ampacity chain. The same arguments and
    ``ValueError`` as :func:`select_conductor`.

    >>> smallest_size(150.0, 30.0, "cu", 90.0, 40.0, 6, data=book.sizing)
    '250 kcmil'

    References: NFPA 70-2023 110.14(C), 215.2(A)(1), 215.3, 240.4.
    """
    loads = (("continuous_a", continuous_a), ("noncontinuous_a", noncontinuous_a))
    _check_args(3, 0.9, system, sets, loads)
    dev = _device(continuous_a, noncontinuous_a, device_a, data)
    chain_args = (material, insulation_c, ambient_c, current_carrying)
    more = (raceway == "free-air", rooftop_adder_c, continuous_a, noncontinuous_a)
    candidates = (system, termination_c, False)
    names, _terms, (ok_amp, ok_prot) = _screen(dev, sets, candidates, chain_args, more, data)
    both = np.flatnonzero(ok_amp & ok_prot)
    if not len(both):
        first = {
            c: names[int(np.flatnonzero(ok)[0])]
            for c, ok in (("ampacity", ok_amp), ("protection", ok_prot))
            if ok.any()
        }
        _none_meets(first, False, False)
    return names[int(both[0])]
