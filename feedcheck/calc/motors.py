"""Motor kernels: table full-load current, motor conductors and branch devices.

Methods of NFPA 70 Article 430:

* 430.6(A)(1): conductors, short-circuit and ground-fault devices and feeders of a motor
  are sized from the full-load current (FLC) of Tables 430.248 (single-phase) and 430.250
  (three-phase), looked up by horsepower and voltage, not from the nameplate current.
  The tables' notes permit the 115, 230, 460 and 575 V columns for system voltages of
  110–120, 220–240, 440–480 and 550–600 V.
* 430.22: the conductors of one motor carry at least 125 % of its FLC.
* 430.24: a feeder of several motors carries at least 125 % of the largest motor's FLC,
  plus the other motors' FLC, plus the other loads (continuous ones at 125 %).
* 430.52(C)(1) and Table 430.52: the branch short-circuit and ground-fault device is at most
  the table percent of the FLC; Exception No. 1 permits the next higher standard rating.

The tables are passed in (:class:`MotorFlcTable`); no table is read here. A kilowatt
rating is converted at 746 W per horsepower (the electrical horsepower of motor ratings;
the 745.7 W mechanical horsepower differs by 0.04 %, which never changes a table row).

References
----------
.. [1] NFPA 70 National Electrical Code, 2017/2023: 430.6(A)(1), 430.22, 430.24,
   430.52(C)(1), Tables 430.248, 430.250, 430.52; 240.6(A).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

W_PER_HP = 746.0  # electrical horsepower, common practice (NEMA ratings), see module notes
CONTINUOUS_FACTOR = 1.25  # 430.22, 430.24 (largest motor), 215.2(A)(1) (other loads)
HP_MATCH_RTOL = 0.01  # a horsepower within 1 % of a table row is that row
# 430.248 / 430.250 notes: system voltage range -> rated-voltage column
SYSTEM_VOLTAGE_RANGES_V = (
    (110.0, 120.0, 115.0),
    (220.0, 240.0, 230.0),
    (440.0, 480.0, 460.0),
    (550.0, 600.0, 575.0),
)


@dataclass(frozen=True)
class MotorFlcTable:
    """One full-load current table (Table 430.248 or 430.250) as arrays.

    Attributes
    ----------
    hp : ndarray, shape (n,)
        Horsepower of each row, increasing [hp].
    voltage_v : ndarray, shape (m,)
        Rated motor voltage of each column [V].
    flc_a : ndarray, shape (n, m)
        Full-load current [A]; NaN where the table lists none (a dash).
    rule_id : tuple of str
        Row ids of the table (for the finding and the calculation sheet).
    title : str
        The table as cited on the calculation sheet (``"Table 430.250"``).
    """

    hp: np.ndarray
    voltage_v: np.ndarray
    flc_a: np.ndarray
    rule_id: tuple[str, ...] = ()
    title: str = ""  # the table's name as cited ("Table 430.250")

    def __post_init__(self):
        hp = np.asarray(self.hp, dtype=float)
        v = np.asarray(self.voltage_v, dtype=float)
        f = np.asarray(self.flc_a, dtype=float)
        if hp.ndim != 1 or np.any(np.diff(hp) <= 0) or np.any(hp <= 0):
            raise ValueError("hp: expected positive horsepower rows, increasing")
        if f.shape != (hp.size, v.size):
            raise ValueError(f"flc_a: got shape {f.shape}; expected {(hp.size, v.size)}")
        if np.any(f[np.isfinite(f)] <= 0):
            raise ValueError("flc_a: expected currents > 0 A (NaN where not listed)")
        if self.rule_id and len(self.rule_id) != hp.size:
            raise ValueError("rule_id: expected one id per row")
        object.__setattr__(self, "hp", hp)
        object.__setattr__(self, "voltage_v", v)
        object.__setattr__(self, "flc_a", f)

    @classmethod
    def from_named_columns(cls, hp, columns, rule_id=(), title="") -> MotorFlcTable:
        """Build from columns named ``flc_<V>v_a`` (``opt_`` prefix allowed).

        ``columns`` maps a column name to its values (NaN where not listed); other names
        are ignored. This is array assembly only: the caller reads the table.

        Examples
        --------
        >>> t = MotorFlcTable.from_named_columns([1, 2], {"flc_460v_a": [2.1, 3.4],
        ...                                               "opt_flc_115v_a": [8.4, 13.6]})
        >>> t.voltage_v.tolist()
        [115.0, 460.0]
        """
        import re

        found = []
        for name, values in columns.items():
            m = re.fullmatch(r"(?:opt_)?flc_(\d+)v_a", str(name))
            if m:
                found.append((float(m.group(1)), np.asarray(values, dtype=float)))
        if not found:
            raise ValueError("columns: expected columns named flc_<V>v_a")
        found.sort(key=lambda c: c[0])
        return cls(
            np.asarray(hp, dtype=float),
            np.array([v for v, _ in found]),
            np.column_stack([c for _, c in found]),
            tuple(rule_id),
            title,
        )


@dataclass(frozen=True)
class MotorFlcTables:
    """The two full-load current tables of 430.6(A)(1), built by the rule book
    (``book.motor_flc``): single-phase (Table 430.248) and three-phase (Table 430.250).
    """

    single: MotorFlcTable
    three: MotorFlcTable

    def for_phases(self, phases: int) -> MotorFlcTable:
        """The table of a motor with ``phases`` (1 or 3)."""
        if phases not in (1, 3):
            raise ValueError(f"phases: got {phases!r}; expected 1 or 3")
        return self.single if phases == 1 else self.three


def hp_from_kw(power_kw):
    """Horsepower [hp] of a motor rated in kilowatts, at 746 W per hp.

    Examples
    --------
    >>> round(float(hp_from_kw(7.5)), 3)
    10.054
    """
    p = np.asarray(power_kw, dtype=float)
    if not np.all(np.isfinite(p) & (p > 0)):
        raise ValueError(f"power_kw: got {power_kw!r}; expected a rating > 0 kW")
    out = p * 1000.0 / W_PER_HP
    return out if out.ndim else float(out)


def table_column_voltage_v(voltage_v, columns_v):
    """Rated-voltage column [V] of a full-load current table that serves a voltage.

    Method: a voltage equal to a column's rated voltage takes that column; otherwise the
    notes of Tables 430.248 and 430.250 permit the 115, 230, 460 and 575 V columns for
    system voltages of 110–120, 220–240, 440–480 and 550–600 V. Any other voltage (277,
    380, 415 V, ...) has no column and is refused. Give a motor's nameplate voltage when
    known: a 200 V motor on a 208 V system takes the 200 V column.

    Parameters
    ----------
    voltage_v : float or array
        Rated motor voltage or system voltage [V].
    columns_v : array
        Rated voltages of the table's columns [V].

    Returns
    -------
    float or ndarray
        The column's rated voltage [V].

    Raises
    ------
    ValueError
        A voltage no column serves.

    Examples
    --------
    >>> cols = [115, 200, 208, 230, 460, 575]
    >>> [float(table_column_voltage_v(v, cols)) for v in (120, 208, 240, 480, 600)]
    [115.0, 208.0, 230.0, 460.0, 575.0]
    """
    v = np.asarray(voltage_v, dtype=float)
    cols = np.asarray(columns_v, dtype=float)
    out = np.full(v.shape, np.nan)
    for c in cols:
        out = np.where(np.isclose(v, c, rtol=0, atol=1e-6), c, out)
    for lo, hi, c in SYSTEM_VOLTAGE_RANGES_V:
        if np.any(np.isclose(cols, c)):
            out = np.where(np.isnan(out) & (v >= lo - 1e-6) & (v <= hi + 1e-6), c, out)
    if np.any(np.isnan(out)):
        bad = v[np.isnan(out)].ravel()[0]
        raise ValueError(
            f"voltage_v: got {bad:g} V; expected a rated motor voltage of the table "
            f"({', '.join(f'{c:g}' for c in cols)} V) or a system voltage in 110–120, "
            "220–240, 440–480 or 550–600 V (NFPA 70 Tables 430.248/430.250 notes)"
        )
    return out if out.ndim else float(out)


def motor_flc_row(hp, table: MotorFlcTable, between: str = "refuse"):
    """Row index of a horsepower in a full-load current table.

    Method: a horsepower within 1 % of a row is that row (so 7.5 kW = 10.05 hp is the
    10 hp row). A horsepower between rows is refused by default (``between="refuse"``):
    motors are built in the standard ratings the table lists, so an unlisted value is
    more often a typing slip than a real motor, and taking the next larger row would
    also raise the 430.52 device limit computed from it. ``between="next-larger"``
    takes the next larger row (larger current: conservative for conductors; the check
    must say the row was taken up). Above the last row is always refused.

    Examples
    --------
    >>> t = MotorFlcTable([5, 7.5, 10], [460], [[7.6], [11], [14]])
    >>> int(motor_flc_row(10.054, t)), int(motor_flc_row(6, t, between="next-larger"))
    (2, 1)
    """
    if between not in ("refuse", "next-larger"):
        raise ValueError(f"between: got {between!r}; expected 'refuse' or 'next-larger'")
    h = np.asarray(hp, dtype=float)
    if not np.all(np.isfinite(h) & (h > 0)):
        raise ValueError(f"hp: got {hp!r}; expected a horsepower > 0")
    rows = table.hp
    i = np.clip(np.searchsorted(rows, h), 0, rows.size - 1)
    j = np.clip(i - 1, 0, rows.size - 1)
    near_i = np.isclose(h, rows[i], rtol=HP_MATCH_RTOL, atol=0)
    near_j = np.isclose(h, rows[j], rtol=HP_MATCH_RTOL, atol=0)
    exact = np.where(near_j, j, np.where(near_i, i, -1))
    over = h > rows[-1] * (1 + HP_MATCH_RTOL)
    if np.any(over):
        raise ValueError(
            f"hp: got {h[over].ravel()[0]:g} hp; the table ends at "
            f"{rows[-1]:g} hp (use the nameplate and the maker's data)"
        )
    off = exact < 0
    if np.any(off) and between == "refuse":
        k = int(np.argmax(off.ravel()))
        x, lo, hi = h.ravel()[k], rows[j.ravel()[k]], rows[i.ravel()[k]]
        where = (
            f"below the first row, {hi:g} hp" if x < rows[0] else f"between {lo:g} and {hi:g} hp"
        )
        raise ValueError(
            f"hp: got {x:g} hp; expected a table row ({where}: give the motor's rated horsepower)"
        )
    out = np.where(off, i, exact)
    return out if out.ndim else int(out)


def motor_flc_a(hp, voltage_v, table: MotorFlcTable, between: str = "refuse"):
    """Full-load current [A] of a motor from Table 430.248 or 430.250 (430.6(A)(1)).

    Parameters
    ----------
    hp : float or array
        Rated horsepower [hp] (``hp_from_kw`` for a kW rating).
    voltage_v : float or array
        Rated motor voltage or system voltage [V] (see ``table_column_voltage_v``).
    table : MotorFlcTable
        The table (single-phase or three-phase) for the motor's phases.
    between : {"refuse", "next-larger"}
        What to do with a horsepower between rows (see ``motor_flc_row``).

    Returns
    -------
    float or ndarray
        Table full-load current [A].

    Raises
    ------
    ValueError
        Unlisted horsepower or voltage, or a cell the table leaves blank.

    Examples
    --------
    Invented motors: a 15 hp fan at 480 V and a 1-1/2 hp pump at 208 V.

    >>> t = MotorFlcTable([1.5, 15], [208, 460], [[6.6, 3.0], [46.2, 21]])
    >>> float(motor_flc_a(15, 480, t)), float(motor_flc_a(1.5, 208, t))
    (21.0, 6.6)

    References
    ----------
    NFPA 70 430.6(A)(1), Tables 430.248 and 430.250.
    """
    row = np.asarray(motor_flc_row(hp, table, between))
    col_v = np.asarray(table_column_voltage_v(voltage_v, table.voltage_v))
    row, col_v = np.broadcast_arrays(row, col_v)
    col = np.argmin(np.abs(table.voltage_v[None, :] - col_v.reshape(-1, 1)), axis=1)
    out = table.flc_a[row.ravel(), col].reshape(row.shape)
    if np.any(np.isnan(out)):
        k = int(np.argmax(np.isnan(out).ravel()))
        raise ValueError(
            f"hp/voltage: the table lists no current for "
            f"{table.hp[row.ravel()[k]]:g} hp at {col_v.ravel()[k]:g} V"
        )
    return out if out.ndim else float(out)


def branch_conductor_min_a(flc_a):
    """Least ampacity [A] of the conductors of one motor: 125 % of its FLC (430.22).

    Examples
    --------
    >>> float(branch_conductor_min_a(21.0))
    26.25
    """
    f = _currents("flc_a", flc_a)
    out = CONTINUOUS_FACTOR * f
    return out if out.ndim else float(out)


def feeder_conductor_min_a(motor_flc_a, other_noncontinuous_a=0.0, other_continuous_a=0.0):
    """Least ampacity [A] of a feeder of several motors and other loads (430.24).

    Method: 125 % of the largest motor's FLC + 100 % of the other motors' FLC + 100 % of
    the noncontinuous other loads + 125 % of the continuous other loads. The largest
    motor's 25 % is added once (the 430.24 adder), never again as "continuous".

    Parameters
    ----------
    motor_flc_a : array, shape (..., k)
        Table FLC of each motor on the feeder [A], last axis = motors (0 pads a row).
    other_noncontinuous_a, other_continuous_a : float or array, shape (...)
        Other loads' currents on the same phase [A].

    Returns
    -------
    float or ndarray
        Least feeder ampacity [A].

    Examples
    --------
    Invented feeder: motors of 21, 14 and 7.6 A plus 10 A of continuous lighting.

    >>> float(feeder_conductor_min_a([21.0, 14.0, 7.6], other_continuous_a=10.0))
    60.35

    References
    ----------
    NFPA 70 430.24; 215.2(A)(1) for the continuous other loads.
    """
    m = _currents("motor_flc_a", motor_flc_a)
    if m.ndim == 0:
        m = m.reshape(1)
    nc = _currents("other_noncontinuous_a", other_noncontinuous_a)
    c = _currents("other_continuous_a", other_continuous_a)
    out = m.sum(axis=-1) + (CONTINUOUS_FACTOR - 1.0) * m.max(axis=-1) + nc + CONTINUOUS_FACTOR * c
    return out if np.ndim(out) else float(out)


@dataclass(frozen=True)
class BranchDeviceMax:
    """Largest motor branch short-circuit and ground-fault device (430.52(C)(1)).

    Attributes
    ----------
    limit_a : float or ndarray
        Table 430.52 percent × FLC [A].
    permitted_a : float or ndarray
        Largest rating permitted [A]: the limit itself when it is a standard rating,
        otherwise the next higher standard rating (Exception No. 1).
    percent : float or ndarray
        The Table 430.52 percent used [%].
    """

    limit_a: float | np.ndarray
    permitted_a: float | np.ndarray
    percent: float | np.ndarray


def branch_device_max_a(flc_a, percent, standard_ratings_a) -> BranchDeviceMax:
    """Largest branch-circuit short-circuit and ground-fault device of a motor.

    Method: NFPA 70 430.52(C)(1): rating at most ``percent`` (Table 430.52, by motor and
    device type) of the table FLC; Exception No. 1: where that is not a standard rating
    (240.6(A)), the next higher standard rating is permitted. Exception No. 2 (larger
    devices where the motor will not start) is not applied.

    Parameters
    ----------
    flc_a : float or array
        Table full-load current [A].
    percent : float or array
        Table 430.52 percent for the motor and device type [%].
    standard_ratings_a : array
        Standard device ratings, ascending [A] (Table 240.6(A), fuse or breaker list).

    Returns
    -------
    BranchDeviceMax

    Raises
    ------
    ValueError
        FLC or percent not positive; a limit above the largest standard rating.

    Examples
    --------
    Invented 15 hp motor, 21 A, inverse-time breaker (250 %): 52.5 A → 60 A permitted.

    >>> r = branch_device_max_a(21.0, 250, [15, 20, 50, 60, 70])
    >>> float(r.limit_a), float(r.permitted_a)
    (52.5, 60.0)

    References
    ----------
    NFPA 70 430.52(C)(1) and Exception No. 1, Table 430.52; 240.6(A).
    """
    f = _currents("flc_a", flc_a)
    p = np.asarray(percent, dtype=float)
    if np.any(f <= 0) or not np.all(np.isfinite(p) & (p > 0)):
        raise ValueError("flc_a and percent: expected values > 0")
    r = np.sort(np.asarray(standard_ratings_a, dtype=float))
    limit = f * p / 100.0
    i = np.searchsorted(r, limit * (1 - 1e-12), side="left")
    if np.any(i >= r.size):
        raise ValueError(
            f"flc_a: limit {float(np.max(limit)):g} A above the largest standard rating {r[-1]:g} A"
        )
    permitted = r[i]

    def _out(x):
        x = np.asarray(x)
        return x if x.ndim else float(x)

    return BranchDeviceMax(_out(limit), _out(permitted), _out(np.broadcast_to(p, limit.shape)))


def locked_rotor_multiple(locked_rotor_a, flc_a):
    """Locked-rotor current as a multiple of full-load current, validated.

    A locked-rotor (starting) current below the full-load current is physically
    impossible for an induction motor started across the line (common practice, no
    source) and means the two figures were swapped or mistyped.

    Raises
    ------
    ValueError
        ``locked_rotor_a < flc_a`` or a value not positive.

    Examples
    --------
    >>> float(locked_rotor_multiple(126.0, 21.0))
    6.0
    """
    lr = np.asarray(locked_rotor_a, dtype=float)
    f = np.asarray(flc_a, dtype=float)
    if not (np.all(np.isfinite(lr) & (lr > 0)) and np.all(np.isfinite(f) & (f > 0))):
        raise ValueError("locked_rotor_a and flc_a: expected currents > 0 A")
    low = lr < f
    if np.any(low):
        lr_b, f_b = np.broadcast_arrays(lr, f)
        k = int(np.argmax(np.broadcast_to(low, lr_b.shape).ravel()))
        raise ValueError(
            f"locked_rotor_a: got {lr_b.ravel()[k]:g} A, below the full-load current "
            f"{f_b.ravel()[k]:g} A; expected the starting (locked-rotor) current, "
            "several times the full-load current"
        )
    out = lr / f
    return out if out.ndim else float(out)


def _currents(name, x):
    a = np.asarray(x, dtype=float)
    if not np.all(np.isfinite(a) & (a >= 0)):
        raise ValueError(f"{name}: got {x!r}; expected currents ≥ 0 A")
    return a
