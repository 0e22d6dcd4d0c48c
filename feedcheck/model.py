"""The model of a job: plain frozen dataclasses in SI floats, and the one copy of each
vocabulary (raceways, materials, occupancies, load kinds, system shapes, node kinds).

No I/O here and no logic beyond small properties: the readers under
:mod:`feedcheck.inputs` build these objects (defaults filled, the feed tree built once)
and everything downstream only reads them.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    import pandas as pd

    from .calc.sizes import Size

# ------------------------------------------------------------------- vocabularies
SOURCE_ID = "source"  # the reserved id of the supply node
LOW_VOLTAGE_MAX_V = 1000.0  # "1000 volts, nominal, or less" (NFPA 70-2023 Art. 100)
PRIMARY_DEVICE_KINDS = ("fuse", "breaker")  # Table 450.3(A) columns (over 1000 V)
NODE_KINDS = ("source", "transformer", "panel")  # nodes of the feed tree; runs are its edges
RACEWAYS = ("steel", "aluminum", "pvc", "cable", "free-air")
MATERIALS = ("cu", "al")
# how users write a conductor material -> the material
MATERIAL_WORDS = {"cu": "cu", "copper": "cu", "al": "al", "aluminum": "al", "aluminium": "al"}
INSULATION_RATINGS_C = (60.0, 75.0, 90.0)  # conductor insulation / terminal columns [°C]
# occupancies: the lighting demand factor rows of Table 220.42 (other, dwelling, hospital,
# hotel, warehouse; the rest at 100 % like "other") and the unit loads of Table 220.12
OCCUPANCIES = (
    "other",
    "dwelling",
    "hospital",
    "hotel",
    "warehouse",
    "auditorium",
    "bank",
    "barber",
    "church",
    "club",
    "courtroom",
    "garage",
    "industrial",
    "lodge",
    "office",
    "restaurant",
    "school",
    "store",
)
LOAD_KINDS = ("lighting", "receptacle", "motor", "heating", "other")  # schedule circuits
# system shapes (VoltageSystem.kind): 208Y/120 wye, 480 V delta, 120/240 split-phase
# three-wire, single-phase two-wire, three-phase with the winding not stated, and the
# 240/120 V four-wire delta with a high leg (B, 208 V to neutral; 408.3(E)(1))
SYSTEM_KINDS = ("wye", "delta", "split", "single", "line", "highleg")
HIGH_LEG = "B"  # the high leg's position in panelboards (NFPA 70-2023 408.3(E)(1))
VOLTAGE_DROP_MODES = ("recommended", "mandatory")
VOLTAGE_FACTORS = ("none", "iec60909", "iec60909-10pct")  # c_max 1.05 / 1.10
# device families of a panel (its ``device_type``) -> the row family of
# tables/device_test_power_factor.csv (test power factor of the interrupting rating)
DEVICE_FAMILIES = {
    "molded-case": "mccb",
    "insulated-case": "iccb",
    "power-breaker": "lvpcb-unfused",
    "power-breaker-fused": "lvpcb-fused",
    "fuse": "fuse",
}
# tap rules a run without an overcurrent device may be built under (run key tap_rule):
# NFPA 70 240.21(B)(1), (B)(2), (C)(2), (C)(6)
TAP_RULES = ("10 ft", "25 ft", "transformer secondary 10 ft", "transformer secondary 25 ft")
# a motor's branch short-circuit and ground-fault device (motor key device_type) -> its
# column of tables/motor_branch_device_max.csv (Table 430.52)
MOTOR_DEVICES = {
    "inverse-time-breaker": "inverse_time_breaker_pct",
    "instantaneous-breaker": "instantaneous_breaker_pct",
    "time-delay-fuse": "time_delay_fuse_pct",
    "nontime-delay-fuse": "nontime_delay_fuse_pct",
}
# motor kinds of Table 430.52 (motor key motor_type; the table's motor_type column)
MOTOR_TYPES = (
    "single-phase",
    "squirrel-cage",
    "design-b-energy-efficient",
    "synchronous",
    "wound-rotor",
)


@dataclass(frozen=True)
class VoltageSystem:
    """A nominal system voltage as the trade writes it.

    Attributes
    ----------
    voltage_ll_v : float
        Line-to-line voltage [V] (for a 120/240 V single-phase three-wire system, 240).
    voltage_ln_v : float | None
        Line-to-neutral voltage [V] where a neutral exists (120 for 120/240 V).
    phases : int
        1 or 3.
    kind : str
        One of :data:`SYSTEM_KINDS`: ``wye`` (``208Y/120``), ``delta``
        (``480 V delta``), ``split`` (``120/240``, single-phase three-wire), ``single``
        (single-phase two-wire), ``line`` (three-phase, winding not stated) or
        ``highleg`` (``240/120 V high-leg delta``: four-wire delta, the neutral at the
        midpoint of the A–C winding, B at √3/2 · 240 = 208 V to neutral).
    text : str
        The text as written.
    """

    voltage_ll_v: float
    voltage_ln_v: float | None
    phases: int
    kind: str
    text: str

    @property
    def grounded_wye(self) -> bool:
        return self.kind == "wye"

    @property
    def high_leg(self) -> bool:
        return self.kind == "highleg"


@dataclass(frozen=True)
class Project:
    name: str
    site: str = ""
    prepared_by: str = ""
    date: str = ""
    revision: str = ""
    rules: str = "na"
    notes: str = ""


@dataclass(frozen=True)
class ServiceTransformer:
    """The utility's transformer behind a service (the source's strength given by its
    nameplate): its through-fault sets the source's ``fault_a`` and ``x_r``."""

    rating_va: float
    z_pct: float
    x_r: float
    primary_sc_va: float  # short-circuit power at its primary [VA]; inf: infinite bus
    primary_x_r: float
    x_r_typical_row: str = ""  # "" when the job gives X/R; else the typical-table row used


@dataclass(frozen=True)
class Source:
    """The supply: a service point (low voltage, feeding panels or transformers) or a
    medium-voltage primary (up to 35 kV, feeding transformers directly)."""

    voltage: VoltageSystem
    fault_a: float  # available three-phase fault current [A]; inf for an infinite bus
    x_r: float
    # how the job stated its strength: "fault" (available_fault), "short-circuit"
    # (short_circuit power) or "service-transformer" (kVA, %Z and X/R of the utility's)
    given_as: str = "fault"
    short_circuit_va: float | None = None  # as stated (short_circuit), [VA]
    service: ServiceTransformer | None = None
    # the service's grounding electrode conductor and main bonding jumper, where stated
    electrode_conductor: Size | None = None
    electrode_conductor_material: str = "cu"
    main_bonding_jumper: Size | None = None
    main_bonding_jumper_material: str = "cu"

    @property
    def medium_voltage(self) -> bool:
        """True above 1000 V (NFPA 70: over 1000 V nominal)."""
        return self.voltage.voltage_ll_v > LOW_VOLTAGE_MAX_V


@dataclass(frozen=True)
class Transformer:
    """A transformer. ``x_r`` is always set: when the job gives none, the reader fills the
    typical value by rating and names the table row in ``x_r_typical_row``."""

    id: str
    from_id: str
    rating_va: float
    primary: VoltageSystem
    secondary: VoltageSystem
    z_pct: float
    x_r: float
    primary_device_a: float
    secondary_device_a: float | None
    tap_pct: float = 0.0
    z0_ratio: float | None = None  # None: rules fault-z0-ratio-max / -min
    x_r_typical_row: str = ""  # "" when the job gives X/R; else the typical-table row used
    # lines a single-phase unit takes on a three-phase feed: "AB", "BC" or "CA";
    # "" = assigned to balance by the checks
    phases_connected: str = ""
    primary_device_type: str = ""  # one of PRIMARY_DEVICE_KINDS; "" not stated

    @property
    def x_r_typical(self) -> bool:
        """True when ``x_r`` was filled from the typical-value table, not given."""
        return bool(self.x_r_typical_row)


@dataclass(frozen=True)
class Run:
    id: str
    from_id: str
    to_id: str
    length_m: float
    size: Size
    material: str
    sets: int
    insulation_c: float
    raceway: str
    ambient_c: float
    current_carrying: int
    ground: Size | None
    ground_material: str
    device_a: float | None  # device protecting the run at its sending end
    termination_c: float | None  # None: rule of 110.14(C)
    rooftop_mm: float | None = None  # raceway height above a sunlit roof [mm]
    harmonic_neutral: bool = False
    clearing_s: float | None = None
    # issue 12 (protection): the tap rule a run without a device is built under (one of
    # TAP_RULES, "" when none is declared), the insulation type name when the job gives
    # one ("" when only a temperature), and the supply-side bonding jumper and grounded
    # conductor of transformer secondary conductors (None when not stated)
    tap_rule: str = ""
    insulation_type: str = ""
    bonding_jumper: Size | None = None
    bonding_jumper_material: str = "cu"
    neutral: Size | None = None
    neutral_material: str = "cu"


@dataclass(frozen=True)
class Motor:
    """A motor on a panel. ``full_load_a`` is the current conductors and devices are
    sized from: the table current of 430.6(A)(1) when the motor gives ``hp`` (or kW),
    else the nameplate current typed in (``flc_basis`` says which)."""

    id: str
    panel_id: str
    full_load_a: float
    locked_rotor_a: float | None
    hp: float | None
    # the motor's branch circuit, for the starting dip at its terminals (None: not given)
    length_m: float | None = None
    size: Size | None = None
    material: str = "cu"
    raceway: str = "steel"
    nameplate_a: float | None = None  # nameplate full-load current, as typed
    kw: float | None = None  # rating as typed in kW (hp = kW × 1000 / 746)
    phases: int | None = None  # 1 or 3; None: the panel's
    voltage_v: float | None = None  # rated motor voltage as typed; None: the panel's
    flc_basis: str = ""  # "table" (430.6(A)(1)) or "nameplate"
    flc_rule_id: str = ""  # row of the full-load current table used
    flc_column_v: float | None = None  # voltage column of that table used [V]
    flc_row_hp: float | None = None  # horsepower of that table row [hp]
    device_a: float | None = None  # branch short-circuit and ground-fault device
    device_type: str = "inverse-time-breaker"  # one of MOTOR_DEVICES
    motor_type: str | None = None  # one of MOTOR_TYPES; None: by phases
    disconnect_a: float | None = None  # disconnecting means ampere rating
    termination_c: float | None = None  # branch terminations [°C]; None: by 110.14(C)(1)


@dataclass(frozen=True)
class Panel:
    id: str
    rating_a: float
    main_device_a: float | None
    interrupting_a: float | None
    voltage: VoltageSystem | None
    schedule: Path | None
    load_va: float | None
    continuous_va: float
    pf: float
    instantaneous_a: float | None = None
    occupancy: str = "other"  # lighting demand factors of the schedule (Table 220.42)
    area_m2: float | None = None  # floor area served, for the 220.12 minimum lighting [m²]
    device_type: str | None = None  # one of DEVICE_FAMILIES; None: molded-case assumed
    schedule_columns: tuple[tuple[str, str], ...] = ()  # the schedule's column map
    # a single-phase panel on a three-phase feed: the lines it takes ("AB", "BC", "CA");
    # "" = assigned to balance by the checks
    phases_connected: str = ""
    # a series-rated combination (NFPA 70-2023 240.86(B)): its tested rating, the run whose
    # device is the line-side device of the combination, and that device's rating as
    # marked on the combination (None / "" when the panel declares none)
    series_rating_a: float | None = None
    series_upstream_run: str = ""
    series_upstream_device_a: float | None = None


@dataclass(frozen=True)
class Generator:
    """The standby source: a generator feeding the transfer switch by its own run
    (``run``: from the source node to the transfer switch's panel in the standby
    position's feed). Subtransient reactance ``xdss_pct`` on its own rating."""

    id: str
    rating_va: float
    voltage: VoltageSystem
    xdss_pct: float
    x_r: float
    run: Run
    rating_w: float | None = None  # kW rating as typed, None: not given


@dataclass(frozen=True)
class TransferSwitch:
    """A transfer switch at the line side of ``panel_id``: the normal position takes the
    run into that panel from the source, the standby position the generator's run."""

    id: str
    panel_id: str
    rating_a: float
    withstand_a: float | None = None  # withstand and closing rating, None: not given


@dataclass(frozen=True)
class Options:
    impedance_tolerance_pct: float | None = None  # None: rule fault-z-tolerance of the tables
    voltage_factor: str = "none"  # one of VOLTAGE_FACTORS
    voltage_drop: str = "recommended"  # one of VOLTAGE_DROP_MODES: warn | fail
    feeder_drop_pct: float | None = None
    branch_drop_pct: float | None = None
    total_drop_pct: float | None = None


@dataclass(frozen=True)
class Tree:
    """The feed as a radial tree, built once when the job is read.

    Nodes are the source, transformers and panels; runs are the edges. A transformer
    with no run into it hangs directly on the source (zero-length connection).
    """

    order: tuple[str, ...]  # node ids, parents before children; order[0] == "source"
    kind: dict[str, str]  # node id -> one of NODE_KINDS
    parent_node: dict[str, str | None]
    parent_run: dict[str, Run | None]
    voltage_of: dict[str, VoltageSystem]  # voltage at the node (secondary for transformers)
    upstream_transformer: dict[str, str | None]
    distance_m: dict[str, float]

    def parent_index(self) -> list[int]:
        pos = {n: i for i, n in enumerate(self.order)}
        return [-1 if self.parent_node[n] is None else pos[self.parent_node[n]] for n in self.order]

    def children(self, node: str) -> list[str]:
        return [n for n in self.order if self.parent_node[n] == node]


@dataclass(frozen=True)
class Job:
    """A validated job: every default filled, the feed tree built (``tree``)."""

    path: Path
    project: Project
    source: Source
    transformers: tuple[Transformer, ...]
    runs: tuple[Run, ...]
    panels: tuple[Panel, ...]
    tree: Tree = field(compare=False, hash=False, repr=False)
    motors: tuple[Motor, ...] = ()
    options: Options = field(default_factory=Options)
    text: str = ""
    file_sha256: str = ""  # of the job file's bytes as read
    length_unit: str = "ft"  # lengths shown to people: "ft" or "m" (as the job is written)
    generator: Generator | None = None  # the standby source (with transfer_switch)
    transfer_switch: TransferSwitch | None = None

    def element(self, element_id: str):
        for coll in (self.transformers, self.runs, self.panels):
            for e in coll:
                if e.id == element_id:
                    return e
        return None


@dataclass(frozen=True)
class Schedule:
    """A validated schedule: one row per circuit, typed columns in SI units.

    ``circuits`` columns: ``panel``, ``circuit`` (int), ``description``, ``poles``,
    ``load_value`` with ``load_unit`` (``VA``, ``W`` or ``A``), ``pf``, ``kind`` (one of
    :data:`LOAD_KINDS`), ``continuous`` (bool), ``breaker_a``, ``size`` (canonical name),
    ``material``, ``insulation_c``, ``termination_c`` (NaN: by 110.14(C)),
    ``ground_size`` ("" when none), ``ground_material``, ``current_carrying``,
    ``ambient_c``, ``raceway``, ``length_m``, ``row`` (row number as the spreadsheet
    shows it).

    ``notices``: what the reader skipped or did not understand (unknown columns, totals
    rows, a stated total that differs from the sum), one line each. ``spaces``: panel →
    ``(spares, spaces)``, the poles of rows with a breaker but no load and of rows with
    no breaker (NFPA 70-2023 408.4(A): a directory names spares and spaces; from
    memory); they carry no load (Art. 220 sums served loads) and are
    not in ``circuits``. ``length_unit``: ``ft`` or ``m`` as the schedule wrote lengths.
    """

    path: Path
    circuits: pd.DataFrame
    load_unit: str
    panels: tuple[str, ...]
    notices: tuple[str, ...] = ()
    spaces: dict = field(default_factory=dict, compare=False, hash=False)
    length_unit: str = "ft"
    system: str = ""  # the file's own ``system`` column, "" when it has none
