"""Readers of the [[panel]] and [[motor]] blocks of a job file (keys, ranges, defaults)."""

from __future__ import annotations

from pathlib import Path

from ..model import DEVICE_FAMILIES, OCCUPANCIES, Panel
from .element_keys import area_m2 as _area
from .element_keys import phases_connected as _phases_connected
from .files import FileRefused
from .paths import relative_file_inside
from .ranges import DEVICE, INTERRUPTING
from .toml_reader import Reader

PANEL_KEYS = (
    "id",
    "rating",
    "main_device",
    "interrupting",
    "voltage",
    "schedule",
    "load",
    "continuous",
    "power_factor",
    "instantaneous_trip",
    "occupancy",
    "area",
    "device_type",
    "columns",
    "phases_connected",
    "series_rating",
    "series_upstream",
    "series_upstream_device",
)


def read_panel(r: Reader, t: dict, path: str, folder: Path) -> Panel:
    r.check_keys(t, path, PANEL_KEYS)
    sched = None
    if "schedule" in t:
        stext = r.text(t, path, "schedule")
        if stext:
            try:
                sched = relative_file_inside(stext, folder)
            except FileRefused as exc:
                r.add(f"{path}.schedule", exc.value, exc.expected)
    pf = r.number(t, path, "power_factor", 0.05, 1.0, default=0.9)
    load = r.qty(t, path, "load", "power", required=False, apparent_only=True)
    cont = r.qty(
        t,
        path,
        "continuous",
        "power",
        required=False,
        default=0.0,
        must_be_positive=False,
        apparent_only=True,
    )
    if cont is not None and cont < 0:
        r.add(f"{path}.continuous", t.get("continuous"), "a continuous load of zero or more")
    if load is not None and cont is not None and cont > load * (1 + 1e-9):
        r.add(f"{path}.continuous", t.get("continuous"), "at most the panel's load")
    return Panel(
        id=r.text(t, path, "id"),
        rating_a=r.qty(t, path, "rating", "current", within=DEVICE) or 0.0,
        main_device_a=r.qty(t, path, "main_device", "current", required=False, within=DEVICE),
        interrupting_a=r.qty(
            t, path, "interrupting", "current", required=False, within=INTERRUPTING
        ),
        voltage=(pv := r.voltage(t, path, "voltage", required=False)),
        schedule=sched,
        load_va=load,
        continuous_va=cont or 0.0,
        pf=pf or 0.9,
        instantaneous_a=r.qty(t, path, "instantaneous_trip", "current", required=False),
        occupancy=_occupancy(r, t, path),
        area_m2=_area(r, t, path),
        device_type=_device_type(r, t, path),
        schedule_columns=_schedule_columns(r, t, path),
        phases_connected=_phases_connected(r, t, path, pv, "panel"),
        **_series(r, t, path),
    )


def _series(r: Reader, t: dict, path: str) -> dict:
    """A series-rated combination (240.86(B)): ``series_rating`` with ``series_upstream``
    (the run whose device is the line-side device) and, optionally, that device's rating
    as marked (``series_upstream_device``)."""
    keys = ("series_rating", "series_upstream", "series_upstream_device")
    if not any(k in t for k in keys):
        return {}
    for k in keys[:2]:
        if k not in t:
            r.add(f"{path}.{k}", None, "a value with the other series_* keys (240.86(B))")
    return {
        "series_rating_a": r.qty(
            t, path, "series_rating", "current", required=False, within=INTERRUPTING
        ),
        "series_upstream_run": r.text(t, path, "series_upstream", required=False),
        "series_upstream_device_a": r.qty(
            t, path, "series_upstream_device", "current", required=False, within=DEVICE
        ),
    }


def _schedule_columns(r: Reader, t: dict, path: str) -> tuple[tuple[str, str], ...]:
    """``columns = {"Cont?" = "continuous", Ins = "insulation"}``: the schedule's column
    map (:func:`feedcheck.inputs.schedule_header.parse_column_map`)."""
    from .schedule_header import parse_column_map

    cols = t.get("columns")
    if cols is None:
        return ()
    if not isinstance(cols, dict) or not all(
        isinstance(k, str) and isinstance(v, str) for k, v in cols.items()
    ):
        r.add(f"{path}.columns", cols, 'a table of header = column, e.g. {Ins = "insulation"}')
        return ()
    try:
        return tuple(
            parse_column_map(
                ",".join(f"{k}={v}" for k, v in cols.items()), f"{path}.columns"
            ).items()
        )
    except ValueError as exc:
        r.add(f"{path}.columns", cols, str(exc).split("expected ", 1)[-1])
        return ()


def _occupancy(r: Reader, t: dict, path: str) -> str:
    """Occupancy for the lighting demand factors of the panel's schedule."""
    occ = r.text(t, path, "occupancy", required=False, default="other")
    if occ not in OCCUPANCIES:
        r.add(
            f"{path}.occupancy",
            occ,
            "one of "
            + ", ".join(OCCUPANCIES)
            + " (lighting demand factors of Table 220.42, unit loads of Table 220.12)",
        )
        return "other"
    return occ


def _device_type(r: Reader, t: dict, path: str) -> str | None:
    """Family of the panel's devices, for the test X/R of its interrupting rating."""
    if "device_type" not in t:
        return None
    kind = r.text(t, path, "device_type")
    if kind not in DEVICE_FAMILIES:
        r.add(f"{path}.device_type", kind, "one of " + ", ".join(DEVICE_FAMILIES))
        return None
    return kind
