"""The ``[[motor]]`` blocks of a job: a motor given by its horsepower (or kW) and the
voltage of its panel, its nameplate current optional, its branch run, device and
disconnect.

Conductors and devices of a motor are sized from the full-load current of Table 430.248
(single-phase) or Table 430.250 (three-phase), not from the nameplate (NFPA 70
430.6(A)(1)); the table current is looked up here, once the panel voltages are known,
with the rule book's tables (``book.motor_flc``). What the table cannot answer (a
horsepower between rows or beyond the last, a voltage no column serves) is an input
error naming the key.
"""

from __future__ import annotations

from dataclasses import replace

from ..model import MOTOR_DEVICES, MOTOR_TYPES, Motor, Tree
from .element_keys import locked_rotor_check, motor_branch
from .toml_reader import Reader

MOTOR_KEYS = (
    "id",
    "panel",
    "hp",
    "kw",
    "phases",
    "voltage",
    "full_load",
    "locked_rotor",
    "device",
    "device_type",
    "motor_type",
    "disconnect",
    "length",
    "conductors",
    "raceway",
    "termination",
)
VOLTAGE_MATCH = 0.10  # a rated motor voltage within 10 % of the system voltage it is on


def read_motor(r: Reader, t: dict, path: str) -> Motor:
    """One ``[[motor]]`` block; the table current follows in :func:`table_currents`."""
    r.check_keys(t, path, MOTOR_KEYS)
    fla = r.qty(t, path, "full_load", "current", required=False)
    hp = r.number(t, path, "hp", 0.1, 1000)
    kw = r.number(t, path, "kw", 0.05, 750)
    if "hp" in t and "kw" in t:
        r.add(f"{path}.kw", t["kw"], "either hp or kw, not both")
    if hp is None and kw is not None:
        from ..calc.motors import hp_from_kw

        hp = float(hp_from_kw(kw))
    if fla is None and "full_load" not in t and "hp" not in t and "kw" not in t:
        r.add(f"{path}.hp", None, "the motor's horsepower (e.g. hp = 10) or kw, or its full_load")
    lra = r.qty(t, path, "locked_rotor", "current", required=False)
    locked_rotor_check(r, t, path, lra, fla)
    phases = r.number(t, path, "phases", 1, 3, integer=True)
    if phases not in (None, 1, 3):
        r.add(f"{path}.phases", phases, "1 or 3")
    return Motor(
        id=r.text(t, path, "id"),
        panel_id=r.text(t, path, "panel"),
        full_load_a=fla or 1.0,
        locked_rotor_a=lra,
        hp=hp,
        nameplate_a=fla,
        kw=kw,
        phases=phases,
        voltage_v=r.qty(t, path, "voltage", "voltage", required=False),
        flc_basis="nameplate",
        device_a=r.qty(t, path, "device", "current", required=False),
        device_type=_word(r, t, path, "device_type", tuple(MOTOR_DEVICES), "inverse-time-breaker"),
        motor_type=_word(r, t, path, "motor_type", MOTOR_TYPES, None),
        disconnect_a=r.qty(t, path, "disconnect", "current", required=False),
        termination_c=_termination(r, t, path),
        **motor_branch(r, t, path),
    )


def _termination(r: Reader, t: dict, path: str) -> float | None:
    """Termination temperature of the motor's branch conductors [°C] (None: 110.14(C)(1))."""
    term = r.qty(t, path, "termination", "temperature", required=False, must_be_positive=False)
    if term is not None and term not in (60.0, 75.0, 90.0):
        r.add(f"{path}.termination", t.get("termination"), "'60 degC', '75 degC' or '90 degC'")
        return None
    return term


def _word(r: Reader, t: dict, path: str, key: str, words: tuple, default):
    if key not in t:
        return default
    v = r.text(t, path, key)
    if v not in words:
        r.add(f"{path}.{key}", v, "one of " + ", ".join(words))
        return default
    return v


def table_currents(r: Reader, motors: list[Motor], tree: Tree, paths: list[str]) -> list[Motor]:
    """Each motor with a horsepower gets its table full-load current (430.6(A)(1)).

    The motor's voltage is its ``voltage`` key or its panel's line-to-line voltage; its
    phases the ``phases`` key or the panel's. The column is the voltage's own, or the
    one the tables' notes permit for its range (calc/motors.table_column_voltage_v).
    """
    from ..calc.motors import locked_rotor_multiple
    from ..rulebook import current_rulebook

    book = current_rulebook()
    out = []
    for m, path in zip(motors, paths, strict=True):
        v = tree.voltage_of.get(m.panel_id)
        if v is None:
            out.append(m)
            continue
        phases = m.phases or v.phases
        if phases == 3 and v.phases == 1:
            r.add(f"{path}.phases", 3, f"1: panel {m.panel_id} is single-phase ({v.text})")
            out.append(m)
            continue
        volts = _motor_volts(r, m, path, v, phases)
        if m.hp is None or volts is None:
            out.append(replace(m, phases=phases))
            continue
        table = book.motor_flc.for_phases(phases)
        found = _table_row(r, m, path, table, volts)
        if found is None:
            out.append(m)
            continue
        flc, row, column_v = found
        m = replace(
            m,
            full_load_a=flc,
            phases=phases,
            flc_basis="table",
            flc_rule_id=table.rule_id[row] if table.rule_id else "",
            flc_column_v=column_v,
            flc_row_hp=float(table.hp[row]),
        )
        if m.locked_rotor_a is not None:
            try:
                locked_rotor_multiple(m.locked_rotor_a, flc)
            except ValueError:
                r.add(
                    f"{path}.locked_rotor",
                    f"{m.locked_rotor_a:g} A",
                    f"a locked-rotor current at least the table full-load current ({flc:g} A, "
                    f"{table.title}); typically 5 to 8 times it",
                )
        out.append(m)
    return out


def _motor_volts(r: Reader, m: Motor, path: str, v, phases: int) -> float | None:
    """The motor's voltage [V]: its ``voltage`` key, checked against the panel's system
    (line-to-line, or line-to-neutral for a single-phase motor), else the panel's
    line-to-line voltage."""
    if m.voltage_v is None:
        return v.voltage_ll_v
    fits = [v.voltage_ll_v] + ([v.voltage_ln_v] if phases == 1 and v.voltage_ln_v else [])
    if any(abs(m.voltage_v - s) <= VOLTAGE_MATCH * s for s in fits):
        return m.voltage_v
    r.add(
        f"{path}.voltage",
        f"{m.voltage_v:g} V",
        f"a rated motor voltage within 10 % of panel {m.panel_id}'s "
        + " or ".join(f"{s:g} V" for s in fits)
        + f" ({v.text})",
    )
    return None


def _table_row(r: Reader, m: Motor, path: str, table, volts: float):
    """(FLC [A], row, column voltage [V]) of the motor in ``table``; None (and the
    problem named by key) where the table cannot answer."""
    from ..calc.motors import motor_flc_a, motor_flc_row, table_column_voltage_v

    key = "kw" if m.kw is not None else "hp"
    given = m.kw if m.kw is not None else m.hp
    where = f"{table.title} (NFPA 70, 430.6(A)(1))"
    try:
        column_v = float(table_column_voltage_v(volts, table.voltage_v))
    except ValueError as exc:
        key_v = "voltage" if m.voltage_v is not None else "panel"
        r.add(f"{path}.{key_v}", f"{volts:g} V", f"a voltage {where} has a column for: {exc}")
        return None
    # a kW rating between horsepower rows takes the next larger row (its larger current:
    # 430.6(A)(1) sizes from the table, and the larger row is the safe side for conductors
    # and disconnects); a horsepower between rows is refused (a typing slip more often)
    between = "next-larger" if m.kw is not None else "refuse"
    try:
        row = int(motor_flc_row(m.hp, table, between))
        flc = float(motor_flc_a(m.hp, volts, table, between))
    except ValueError as exc:
        r.add(f"{path}.{key}", given, f"a rating {where} lists: {exc}")
        return None
    return flc, row, column_v
