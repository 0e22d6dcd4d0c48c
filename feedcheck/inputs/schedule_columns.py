"""Typed columns of a panel schedule: circuit numbers, loads, ratings and lengths; the
installation columns (insulation, ambient, bundling, kind, raceway, conductors); spaces
taken twice. Each reads the distinct cell texts once (:class:`~.schedule_cells.Cells`)."""

from __future__ import annotations

import numpy as np

from ..errors import ProblemList
from ..model import LOAD_KINDS, RACEWAYS
from ..units import SCHEDULE_HEADER_UNITS
from .schedule_cells import MAX_PROBLEMS, Cells, truthy

# ``20 A 22kAIC``, ``20/22 kAIC``: the interrupting rating after a breaker rating
AIC_SUFFIX = r"\s*[,/;]?\s*\d+(?:[.,]\d+)?\s*(?:k\s*a?|ka)?\s*aic\s*$"


def cell_text(v) -> str:
    if v is None:
        return ""
    if isinstance(v, bool):
        return "yes" if v else "no"
    if isinstance(v, float):
        return str(int(v)) if v.is_integer() and abs(v) < 1e15 else repr(v)
    return str(v)


_TEMPERATURE_WORDS = {"60": 60.0, "75": 75.0, "90": 90.0, "60c": 60.0, "75c": 75.0, "90c": 90.0}


def electrical_columns(c: Cells, found) -> dict[str, np.ndarray]:
    """Circuit number, poles, load (scaled by its header unit), pf, breaker, length."""
    units = SCHEDULE_HEADER_UNITS
    circuit = c.number(
        "circuit", "a circuit number, a whole number from 1 to 999", 1, 999, None, integer=True
    )
    poles = c.number("poles", "1, 2 or 3 poles", 1, 3, 1.0, integer=True)
    load_unit, load_scale = units["load"].get(found["load"][2], ("VA", 1.0))
    unit_text = {"va": "VA", "kva": "kVA", "w": "W", "kw": "kW", "a": "A"}.get(
        found["load"][2], "VA"
    )
    load = c.number("load", f"a load in {unit_text}, a number ≥ 0", 0, 1e8, None)
    pf = c.number("pf", "a power factor from 0.05 to 1", 0.05, 1.0, 1.0)
    breaker = c.number(
        "breaker",
        "a breaker rating in A, e.g. 20, '20 A' or '20 A 22kAIC'",
        1,
        6000,
        None,
        strip=r"a$",
        pre=AIC_SUFFIX,
    )
    # an interrupting rating (its own column, or after the breaker rating) is read and
    # validated; ``schedule`` has no fault current to hold it against (``check`` does)
    c.number(
        "aic",
        "an interrupting rating such as 22kAIC, '22 kA' or 10000",
        1,
        300_000,
        np.nan,
        strip=r"(?:k?a?ic|ka|a)$",
    )
    len_scale = units["length"].get(found["length"][2], units["length"][""])[1]
    length = c.number(
        "length", "a one-way length greater than 0 (up to 2000 m)", 1e-6, 2000 / len_scale, None
    )
    return {
        "circuit": circuit,
        "poles": poles,
        "load_value": load * load_scale,
        "load_unit": load_unit,
        "pf": pf,
        "breaker_a": breaker,
        "length_m": length * len_scale,
    }


def installation_columns(c: Cells) -> dict[str, np.ndarray]:
    """Insulation, termination, ambient, bundling, load kind, continuous, raceway, wires."""
    ins = c.choice("insulation", _TEMPERATURE_WORDS, "60, 75 or 90 (°C)", 75.0, squeeze=True)
    term = c.choice("termination", _TEMPERATURE_WORDS, "60, 75 or 90 (°C)", np.nan, squeeze=True)
    amb = c.number("ambient", "an ambient from -40 to 85 °C", -40, 85, 30.0)
    ccc = c.number(
        "current_carrying",
        "a whole number of current-carrying conductors, 1 to 80",
        1,
        80,
        3.0,
        integer=True,
    )
    kind = c.choice(
        "kind",
        {k: k for k in LOAD_KINDS}
        | {
            "light": "lighting",
            "lights": "lighting",
            "receptacles": "receptacle",
            "recept": "receptacle",
            "motors": "motor",
            "heat": "heating",
            "heater": "heating",
        },
        "a load kind: " + ", ".join(LOAD_KINDS),
        "other",
    )
    cont = c.choice("continuous", truthy(), "yes or no", False)
    raceway = c.choice(
        "raceway",
        {r: r for r in RACEWAYS}
        | {"emt": "steel", "rmc": "steel", "imc": "steel", "free air": "free-air"},
        "one of " + ", ".join(RACEWAYS),
        "steel",
    )
    cell = c.conductor("conductor", required=True)
    size, material = cell["size"], cell["material"]
    ground = c.conductor("ground", required=False)
    # a ground column wins; a blank one takes the ground written in the conductor cell
    no_g = ground["size"] == ""
    gsize = np.where(no_g, cell["ground_size"], ground["size"])
    gmat = np.where(no_g, cell["ground_material"], ground["material"])
    # an insulation type in the cell (THHN …): the lower of it and the insulation column
    ins = np.array(ins.tolist(), dtype=float)
    stated = c.text("insulation") != ""
    typed = cell["insulation_c"]
    ins = np.where(np.isnan(typed), ins, np.where(stated, np.fmin(ins, typed), typed))
    c.assumed_copper = cell["assumed"] | (ground["assumed"] & ~no_g)
    return {
        "insulation_c": ins.astype(float),
        "termination_c": term.astype(float),
        "ambient_c": amb,
        "current_carrying": ccc,
        "kind": kind,
        "continuous": cont,
        "raceway": raceway,
        "size": size,
        "material": material,
        "ground_size": gsize,
        "ground_material": gmat,
    }


def check_spaces(circuit, poles, panel, rows, found, problems: ProblemList) -> None:
    """Duplicate circuit numbers and spaces taken twice (an n-pole circuit at space s
    takes s, s+2, ...)."""
    valid = np.isfinite(circuit) & np.isfinite(poles)
    if not valid.any():
        return
    pan_codes = _codes(panel)
    n_pole = np.where(valid, poles, 1).astype(np.int64)
    idx = np.repeat(np.flatnonzero(valid), n_pole[valid])
    step = np.arange(len(idx)) - np.repeat(np.cumsum(n_pole[valid]) - n_pole[valid], n_pole[valid])
    space = circuit[idx].astype(np.int64) + 2 * step
    key = pan_codes[idx].astype(np.int64) * 10_000 + space
    order = np.argsort(key, kind="stable")
    ks = key[order]
    dup = np.flatnonzero(ks[1:] == ks[:-1]) + 1
    for d in dup[:MAX_PROBLEMS]:
        j = idx[order[d]]
        # the earliest row holding this space
        start = d
        while start > 0 and ks[start - 1] == ks[d]:
            start -= 1
        first = idx[order[start]]
        what = (
            "the same circuit number as"
            if step[order[d]] == 0 and circuit[j] == circuit[first]
            else "a space already taken by"
        )
        problems.add(
            f"row {rows[j]}, column '{found['circuit'][1]}'",
            cell_text(circuit[j]),
            f"a circuit number not used twice in panel {panel[j]} (it has "
            f"{what} row {rows[first]}, space {space[order[d]]})",
        )


def _codes(values: np.ndarray) -> np.ndarray:
    """Number each distinct value in the order met (as ``pandas.factorize``)."""
    seen: dict = {}
    return np.array([seen.setdefault(v, len(seen)) for v in values.tolist()], dtype=np.intp)
