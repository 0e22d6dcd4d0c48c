"""Reader of the standby source: the [generator] and [transfer_switch] tables.

The model: the transfer switch sits at the line side of one panel fed by a run from the
source (the normal feed); the generator reaches the same switch by its own run (the
generator's conductors, described by run keys in the [generator] table). In the
standby position the panel and everything below it are fed from the generator.
"""

from __future__ import annotations

from collections.abc import Callable

from ..model import SOURCE_ID, Generator, Run, TransferSwitch
from .ranges import DEVICE
from .toml_reader import Reader

GENERATOR_KEYS = ("id", "rating", "kw", "voltage", "subtransient", "x_r")
# the generator's run to the transfer switch: the run keys that describe conductors
GENERATOR_RUN_KEYS = (
    "length",
    "conductors",
    "sets",
    "insulation",
    "raceway",
    "ambient",
    "current_carrying",
    "ground",
    "device",
    "termination",
)
TRANSFER_SWITCH_KEYS = ("id", "panel", "rating", "withstand")
_WITHSTAND = (1e3, 200e3, "a withstand and closing rating from 1 kA to 200 kA")


def read_standby(
    r: Reader, data: dict, read_run: Callable[[Reader, dict, str], Run]
) -> tuple[Generator | None, TransferSwitch | None]:
    """The generator and transfer switch, both or neither (``read_run``: the run reader)."""
    gen_t, ts_t = data.get("generator"), data.get("transfer_switch")
    if gen_t is None and ts_t is None:
        return None, None
    for name, t, other in (
        ("generator", gen_t, "transfer_switch"),
        ("transfer_switch", ts_t, "generator"),
    ):
        if t is None:
            r.add(name, None, f"a [{name}] table with the [{other}] (a standby source needs both)")
        elif not isinstance(t, dict):
            r.add(name, t, f"a [{name}] table")
    if not isinstance(gen_t, dict) or not isinstance(ts_t, dict):
        return None, None
    return _generator(r, gen_t, ts_t, read_run), _transfer_switch(r, ts_t)


def _generator(r: Reader, g: dict, ts: dict, read_run) -> Generator | None:
    r.check_keys(g, "generator", GENERATOR_KEYS + GENERATOR_RUN_KEYS)
    gid = r.text(g, "generator", "id")
    rating = r.qty(g, "generator", "rating", "power", apparent_only=True)
    if rating is not None and not (1e3 <= rating <= 10e6):
        r.add("generator.rating", g.get("rating"), "a generator rating from 1 kVA to 10 MVA")
        rating = None
    kw = r.qty(g, "generator", "kw", "power", required=False) if "kw" in g else None
    if kw is not None and rating is not None and not (0 < kw <= rating):
        r.add("generator.kw", g.get("kw"), "a kW rating above zero and not above the kVA rating")
    voltage = r.voltage(g, "generator", "voltage", phases=3)
    xdss = r.qty(g, "generator", "subtransient", "percent")
    if xdss is not None and not (5 <= xdss <= 50):
        # IEEE Std 141-1993 Table 4-2 lists X"d of 9 % to 32 % for synchronous machines
        r.add("generator.subtransient", g.get("subtransient"), 'an X"d from 5 % to 50 %')
        xdss = None
    x_r = r.number(g, "generator", "x_r", 0.5, 100, required=True)
    run_t = {k: g[k] for k in GENERATOR_RUN_KEYS if k in g}
    panel = ts.get("panel") if isinstance(ts.get("panel"), str) else "transfer switch"
    run = read_run(
        r, {"id": gid or "generator", "from": SOURCE_ID, "to": panel, **run_t}, "generator"
    )
    if None in (rating, voltage, xdss, x_r) or not gid:
        return None
    return Generator(gid, rating, voltage, xdss, x_r, run, kw)


def _transfer_switch(r: Reader, ts: dict) -> TransferSwitch | None:
    r.check_keys(ts, "transfer_switch", TRANSFER_SWITCH_KEYS)
    tid = r.text(ts, "transfer_switch", "id")
    panel = r.text(ts, "transfer_switch", "panel")
    rating = r.qty(ts, "transfer_switch", "rating", "current", within=DEVICE)
    withstand = r.qty(
        ts, "transfer_switch", "withstand", "current", required=False, within=_WITHSTAND
    )
    if not tid or not panel or rating is None:
        return None
    return TransferSwitch(tid, panel, rating, withstand)


def check_standby(r: Reader, generator, switch, runs, panels, source, ids: set[str]) -> None:
    """Where the switch may stand: a panel fed by a run from a low-voltage source whose
    voltage is the generator's; ids unique across the job."""
    if generator is None or switch is None:
        return
    for key, value in (("generator.id", generator.id), ("transfer_switch.id", switch.id)):
        if value in ids or value == SOURCE_ID:
            r.add(key, value, "an id no other element of the job uses")
    if generator.id == switch.id:
        r.add("transfer_switch.id", switch.id, "an id other than the generator's")
    if switch.panel_id not in {p.id for p in panels}:
        r.add("transfer_switch.panel", switch.panel_id, "the id of a [[panel]] of the job")
        return
    normal = next((x for x in runs if x.to_id == switch.panel_id), None)
    if normal is None or normal.from_id != SOURCE_ID:
        r.add(
            "transfer_switch.panel",
            switch.panel_id,
            "a panel fed by a run from the source (from = 'source'): the switch stands "
            "where the normal feed from the source ends",
        )
        return
    if source is not None and (
        abs(source.voltage.voltage_ll_v - generator.voltage.voltage_ll_v) > 1e-6
        or source.voltage.phases != generator.voltage.phases
    ):
        r.add(
            "generator.voltage",
            generator.voltage.text,
            f"the normal source's voltage {source.voltage.text!r} (the switch selects "
            "between two feeds of one system)",
        )
