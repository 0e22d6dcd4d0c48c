"""Read and validate a job file (TOML) into the Job model (SI floats).

Every problem is collected with its key path (``run[2].length``) and, where the
file shows it, its line; then one :class:`~feedcheck.errors.InputError` carries
them all. The format is documented key by key in the README.
"""

from __future__ import annotations

import difflib
import math
import re
import tomllib
from dataclasses import dataclass, field
from pathlib import Path, PureWindowsPath

from .calc.sizes import Size, SizeError, parse_size
from .errors import ProblemList
from .units import UnitParseError, VoltageSystem, parse_quantity, parse_voltage_system

MAX_JOB_BYTES = 2_000_000
# Values outside these ranges are not low-voltage distribution feeds: input errors.
FAULT_RANGE_A = (100.0, 1.0e6)  # available fault current at the transformer primary
DEVICE_RANGE_A = (1.0, 6000.0)  # ratings: 6000 A is the largest standard (NFPA 70 240.6(A))
INTERRUPTING_RANGE_A = (1.0e3, 300.0e3)  # equipment interrupting ratings
VOLTAGE_RANGE_V = (100.0, 1000.0)  # line-to-line; "low voltage" is 1000 V and less
SOURCE_ID = "source"
_DEVICE = (*DEVICE_RANGE_A, "an ampere rating from 1 A to 6000 A")
_INTERRUPTING = (*INTERRUPTING_RANGE_A, "an interrupting rating from 1 kA to 300 kA")
RACEWAYS = ("steel", "aluminum", "pvc", "cable", "free-air")


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
class Source:
    """The supply at the transformer primary."""

    voltage: VoltageSystem
    fault_a: float  # available three-phase fault current [A]; inf for an infinite bus
    x_r: float


@dataclass(frozen=True)
class Transformer:
    id: str
    from_id: str
    rating_va: float
    primary: VoltageSystem
    secondary: VoltageSystem
    z_pct: float
    x_r: float | None  # None: typical value from tables/transformer_xr.csv
    primary_device_a: float
    secondary_device_a: float | None
    tap_pct: float = 0.0
    z0_ratio: float = 1.0


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


@dataclass(frozen=True)
class Motor:
    id: str
    panel_id: str
    full_load_a: float
    locked_rotor_a: float | None
    hp: float | None


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


@dataclass(frozen=True)
class Options:
    impedance_tolerance_pct: float | None = None  # None: rule fault-z-tolerance of the tables
    voltage_factor: str = "none"  # "none" | "iec60909"
    voltage_drop: str = "recommended"  # "recommended" (warn) | "mandatory" (fail)
    feeder_drop_pct: float | None = None
    branch_drop_pct: float | None = None
    total_drop_pct: float | None = None


@dataclass(frozen=True)
class Job:
    path: Path
    project: Project
    source: Source
    transformers: tuple[Transformer, ...]
    runs: tuple[Run, ...]
    panels: tuple[Panel, ...]
    motors: tuple[Motor, ...] = ()
    options: Options = field(default_factory=Options)
    text: str = ""

    def element(self, element_id: str):
        for coll in (self.transformers, self.runs, self.panels):
            for e in coll:
                if e.id == element_id:
                    return e
        return None


# ---------------------------------------------------------------- key locations
_HEADER_RE = re.compile(r"^\s*(\[\[?)\s*([A-Za-z_][\w.-]*)\s*\]\]?\s*(#.*)?$")
_KEY_RE = re.compile(r"^\s*([A-Za-z_][\w-]*)\s*=")


def _key_lines(text: str) -> dict[str, int]:
    """Map key paths (``run[1].length``, ``source.voltage``) to 1-based line numbers."""
    lines: dict[str, int] = {}
    counts: dict[str, int] = {}
    prefix = ""
    for no, line in enumerate(text.splitlines(), start=1):
        if m := _HEADER_RE.match(line):
            name = m.group(2)
            if m.group(1) == "[[":
                counts[name] = counts.get(name, 0) + 1
                prefix = f"{name}[{counts[name]}]"
            else:
                prefix = name
            lines.setdefault(prefix, no)
        elif m := _KEY_RE.match(line):
            path = f"{prefix}.{m.group(1)}" if prefix else m.group(1)
            lines.setdefault(path, no)
    return lines


class _Reader:
    """Reads typed values out of TOML tables, collecting problems with key paths."""

    def __init__(self, file: str, text: str) -> None:
        self.problems = ProblemList(file)
        self.lines = _key_lines(text)

    def line(self, path: str) -> int | None:
        if path in self.lines:
            return self.lines[path]
        head = path.rsplit(".", 1)[0]
        return self.lines.get(head)

    def add(self, path: str, value, expected: str) -> None:
        self.problems.add(path, value, expected, line=self.line(path))

    def check_keys(self, table: dict, path: str, allowed: tuple[str, ...]) -> None:
        for k in table:
            if k not in allowed:
                close = difflib.get_close_matches(k, allowed, n=1)
                hint = f" — did you mean {close[0]!r}?" if close else ""
                where = f"{path}.{k}" if path else k
                self.add(where, k, "one of the keys " + ", ".join(allowed) + hint)

    def text(
        self, table: dict, path: str, key: str, required: bool = True, default: str = ""
    ) -> str:
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return default
        v = table[key]
        if not isinstance(v, str) or (required and not v.strip()):
            self.add(f"{path}.{key}", v, "a non-empty text in quotes")
            return default
        return v.strip()

    def qty(
        self,
        table: dict,
        path: str,
        key: str,
        dimension: str,
        required: bool = True,
        default: float | None = None,
        within: tuple[float, float, str] | None = None,
        **kw,
    ) -> float | None:
        """``within=(lo, hi, text)``: values outside [lo, hi] (SI) are refused with ``text``."""
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return default
        try:
            value = parse_quantity(table[key], dimension, **kw)
        except UnitParseError as exc:
            self.add(f"{path}.{key}", table[key], exc.expected)
            return default
        if within is not None and math.isfinite(value) and not within[0] <= value <= within[1]:
            self.add(f"{path}.{key}", table[key], within[2])
            return default
        return value

    def number(
        self,
        table: dict,
        path: str,
        key: str,
        lo: float,
        hi: float,
        default: float | None = None,
        integer: bool = False,
        required: bool = False,
    ) -> float | None:
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return default
        v = table[key]
        kind = "a whole number" if integer else "a number"
        if (
            isinstance(v, bool)
            or not isinstance(v, (int, float))
            or (integer and not isinstance(v, int))
        ):
            self.add(f"{path}.{key}", v, f"{kind} from {lo:g} to {hi:g} (no quotes)")
            return default
        if not (math.isfinite(v) and lo <= v <= hi):
            self.add(f"{path}.{key}", v, f"{kind} from {lo:g} to {hi:g}")
            return default
        return v

    def flag(self, table: dict, path: str, key: str, default: bool = False) -> bool:
        v = table.get(key, default)
        if not isinstance(v, bool):
            self.add(f"{path}.{key}", v, "true or false")
            return default
        return v

    def voltage(
        self, table: dict, path: str, key: str, required: bool = True, phases: int | None = None
    ) -> VoltageSystem | None:
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return None
        try:
            vs = parse_voltage_system(table[key], phases=phases)
        except UnitParseError as exc:
            self.add(f"{path}.{key}", table[key], exc.expected)
            return None
        lo, hi = VOLTAGE_RANGE_V
        if not lo <= vs.line_v <= hi:
            self.add(
                f"{path}.{key}",
                table[key],
                f"a low-voltage system from {lo:g} V to {hi:g} V line to line",
            )
            return None
        return vs

    def conductor(
        self,
        table: dict,
        path: str,
        key: str,
        required: bool = True,
        default_material: str | None = None,
    ) -> tuple[Size | None, str]:
        """Read ``"4/0 AWG Cu"`` → (Size, "cu")."""
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return None, default_material or "cu"
        v = table[key]
        if not isinstance(v, str):
            self.add(f"{path}.{key}", v, "a size and material in quotes, e.g. '4/0 AWG Cu'")
            return None, default_material or "cu"
        parts = v.strip().rsplit(None, 1)
        material = default_material
        size_text = v
        if len(parts) == 2 and parts[1].lower() in ("cu", "al", "copper", "aluminum", "aluminium"):
            material = "cu" if parts[1].lower() in ("cu", "copper") else "al"
            size_text = parts[0]
        if material is None:
            self.add(
                f"{path}.{key}",
                v,
                "a size followed by its material, e.g. '4/0 AWG Cu' or '95 mm2 Al'",
            )
            return None, "cu"
        try:
            return parse_size(size_text), material
        except SizeError as exc:
            self.add(f"{path}.{key}", v, exc.expected)
            return None, material


def _array_of_tables(r: _Reader, data: dict, name: str) -> list[dict]:
    v = data.get(name, [])
    if isinstance(v, dict):
        r.add(name, f"[{name}]", f"[[{name}]] (double brackets: one block per {name})")
        return []
    if not isinstance(v, list) or not all(isinstance(x, dict) for x in v):
        r.add(name, v, f"[[{name}]] blocks")
        return []
    return v


PROJECT_KEYS = ("name", "site", "prepared_by", "date", "revision", "rules", "notes")
SOURCE_KEYS = ("voltage", "phases", "available_fault", "short_circuit_mva", "x_r")
TRANSFORMER_KEYS = (
    "id",
    "from",
    "rating",
    "primary",
    "secondary",
    "impedance",
    "x_r",
    "primary_device",
    "secondary_device",
    "tap",
    "zero_sequence_ratio",
)
RUN_KEYS = (
    "id",
    "from",
    "to",
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
    "rooftop_height",
    "harmonic_neutral",
    "clearing_time",
)
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
)
MOTOR_KEYS = ("id", "panel", "full_load", "hp", "locked_rotor")
OPTION_KEYS = (
    "impedance_tolerance",
    "voltage_factor",
    "voltage_drop",
    "feeder_drop",
    "branch_drop",
    "total_drop",
)
TOP_KEYS = ("project", "source", "transformer", "run", "panel", "motor", "options")
_ID_RE = re.compile(r"^[A-Za-z0-9][A-Za-z0-9_.\-]{0,39}$")


def read_job(path: str | Path) -> Job:
    """Read, parse and validate a job file.

    Raises
    ------
    InputError
        Listing every problem found (file, key path, line, value, expectation).
    """
    p = Path(path)
    pl = ProblemList(str(p))
    if p.is_dir():
        pl.add("", str(p), "a job file (.toml), not a folder")
        pl.raise_if_any()
    try:
        raw = p.read_bytes()
    except OSError as exc:
        pl.add("", str(p), f"a readable job file ({exc.strerror})")
        pl.raise_if_any()
    if len(raw) > MAX_JOB_BYTES:
        pl.add("", f"{len(raw)} bytes", f"a job file under {MAX_JOB_BYTES // 1_000_000} MB")
        pl.raise_if_any()
    if not raw.strip():
        pl.add(
            "",
            "(empty file)",
            "a TOML job file with [project], [source], [[transformer]], "
            "[[run]] and [[panel]] (see `feedcheck init`)",
        )
        pl.raise_if_any()
    try:
        # utf-8-sig: a byte-order mark (as some Windows editors write) is dropped
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        pl.add("", f"byte 0x{raw[exc.start]:02x}", "UTF-8 text (save the file as UTF-8)", line=line)
        pl.raise_if_any()
    try:
        data = tomllib.loads(text)
    except RecursionError:
        pl.add("", "arrays or tables nested too deeply", "a job file nested a few levels at most")
        pl.raise_if_any()
    except tomllib.TOMLDecodeError as exc:
        msg = str(exc)
        m = re.search(r"line (\d+)", msg)
        pl.add(
            "",
            msg.split(" (at")[0],
            'valid TOML (key = "value" lines under [tables])',
            line=int(m.group(1)) if m else None,
        )
        pl.raise_if_any()
    return parse_job_data(data, text, p)


def parse_job_data(data: dict, text: str, job_path: Path) -> Job:
    job_path = Path(job_path)
    r = _Reader(str(job_path), text)
    r.check_keys(data, "", TOP_KEYS)
    # paths like ".foo" for unknown top-level keys read better without the dot
    r.problems.items = [
        type(x)(x.file, x.where.lstrip("."), x.value, x.expected, x.line) for x in r.problems.items
    ]

    proj = data.get("project", {})
    if not isinstance(proj, dict):
        r.add("project", proj, "a [project] table")
        proj = {}
    r.check_keys(proj, "project", PROJECT_KEYS)
    project = Project(
        name=r.text(proj, "project", "name"),
        site=r.text(proj, "project", "site", required=False),
        prepared_by=r.text(proj, "project", "prepared_by", required=False),
        date=str(proj.get("date", "")),
        revision=str(proj.get("revision", "")),
        rules=r.text(proj, "project", "rules", required=False, default="na"),
        notes=r.text(proj, "project", "notes", required=False),
    )
    if project.rules != "na":
        r.add(
            "project.rules",
            project.rules,
            "'na' (the rule set shipped in tables/; use --tables DIR for local amendments)",
        )

    src = data.get("source")
    if not isinstance(src, dict):
        r.add("source", None if src is None else src, "a [source] table (required)")
        src = {}
    r.check_keys(src, "source", SOURCE_KEYS)
    phases = int(r.number(src, "source", "phases", 1, 3, default=3, integer=True) or 3)
    if phases not in (1, 3):
        r.add("source.phases", phases, "1 or 3")
    sv = r.voltage(src, "source", "voltage", phases=phases) if src or "source" in data else None
    if sv is not None and "phases" in src and sv.phases != phases and phases in (1, 3):
        r.add(
            "source.phases",
            phases,
            f"{sv.phases} to match the {sv.phases}-phase voltage {sv.text!r}",
        )
    if "available_fault" in src and "short_circuit_mva" in src:
        r.add(
            "source.short_circuit_mva",
            src["short_circuit_mva"],
            "either available_fault or short_circuit_mva, not both",
        )
    fault_a: float | None = None
    if "short_circuit_mva" in src:
        mva = r.qty(src, "source", "short_circuit_mva", "power", apparent_only=True)
        if mva is not None and sv is not None:
            fault_a = mva / (math.sqrt(3) * sv.line_v if sv.phases == 3 else sv.line_v)
    elif src:
        fault_a = r.qty(src, "source", "available_fault", "current", allow_inf=True)
    if (
        fault_a is not None
        and math.isfinite(fault_a)
        and not (FAULT_RANGE_A[0] <= fault_a <= FAULT_RANGE_A[1])
    ):
        key = "short_circuit_mva" if "short_circuit_mva" in src else "available_fault"
        r.add(
            f"source.{key}",
            src.get(key),
            "an available fault current from 100 A to 1000 kA, or 'infinite'",
        )
    xr_src = r.number(src, "source", "x_r", 0.1, 100, default=None)
    if fault_a is not None and math.isfinite(fault_a) and xr_src is None and "x_r" not in src:
        r.add(
            "source.x_r", None, "the source X/R (a number, e.g. 6) when the fault current is finite"
        )
    source = Source(sv, fault_a if fault_a is not None else math.inf, xr_src or 6.0) if sv else None

    transformers = []
    for i, t in enumerate(_array_of_tables(r, data, "transformer"), start=1):
        path = f"transformer[{i}]"
        r.check_keys(t, path, TRANSFORMER_KEYS)
        sec = r.voltage(t, path, "secondary", phases=phases)
        # a single-phase transformer may sit on two lines of a three-phase system
        prim = r.voltage(
            t, path, "primary", phases=1 if sec is not None and sec.phases == 1 else phases
        )
        z = r.qty(t, path, "impedance", "percent")
        if z is not None and not (0.5 <= z <= 25):
            r.add(
                f"{path}.impedance",
                t["impedance"],
                "a percent impedance from 0.5 % to 25 % (distribution transformers are 1-10 %)",
            )
        tap = r.qty(t, path, "tap", "percent", required=False, default=0.0, must_be_positive=False)
        if tap is not None and (abs(tap) > 5 or abs(tap / 2.5 - round(tap / 2.5)) > 1e-9):
            r.add(f"{path}.tap", t.get("tap"), "a no-load tap of -5, -2.5, 0, +2.5 or +5 %")
        if prim and sec and prim.phases != sec.phases:
            r.add(
                f"{path}.secondary",
                t.get("secondary"),
                f"a {prim.phases}-phase secondary like the {prim.phases}-phase primary "
                f"({prim.text})",
            )
        rating = r.qty(t, path, "rating", "power", apparent_only=True)
        if rating is not None and not (1e3 <= rating <= 5e6):
            r.add(f"{path}.rating", t.get("rating"), "a rating from 1 kVA to 5000 kVA")
        transformers.append(
            Transformer(
                id=r.text(t, path, "id"),
                from_id=r.text(t, path, "from", required=False, default=SOURCE_ID),
                rating_va=rating or 1.0,
                primary=prim,
                secondary=sec,
                z_pct=z or 1.0,
                x_r=r.number(t, path, "x_r", 0.1, 50),
                primary_device_a=r.qty(t, path, "primary_device", "current", within=_DEVICE) or 0.0,
                secondary_device_a=r.qty(
                    t, path, "secondary_device", "current", required=False, within=_DEVICE
                ),
                tap_pct=tap or 0.0,
                z0_ratio=r.number(t, path, "zero_sequence_ratio", 0.1, 3, default=1.0) or 1.0,
            )
        )

    runs = []
    for i, t in enumerate(_array_of_tables(r, data, "run"), start=1):
        path = f"run[{i}]"
        r.check_keys(t, path, RUN_KEYS)
        size, material = r.conductor(t, path, "conductors")
        gsize, gmat = r.conductor(t, path, "ground", required=False, default_material=material)
        raceway = r.text(t, path, "raceway", required=False, default="steel")
        if raceway not in RACEWAYS:
            r.add(f"{path}.raceway", raceway, "one of " + ", ".join(RACEWAYS))
        ins = r.qty(
            t,
            path,
            "insulation",
            "temperature",
            required=False,
            default=75.0,
            must_be_positive=False,
        )
        if ins not in (60.0, 75.0, 90.0):
            r.add(f"{path}.insulation", t.get("insulation"), "'60 degC', '75 degC' or '90 degC'")
        term = r.qty(t, path, "termination", "temperature", required=False, must_be_positive=False)
        if term is not None and term not in (60.0, 75.0, 90.0):
            r.add(f"{path}.termination", t.get("termination"), "'60 degC', '75 degC' or '90 degC'")
        amb = r.qty(
            t, path, "ambient", "temperature", required=False, default=30.0, must_be_positive=False
        )
        if amb is not None and not (-40 <= amb < (ins or 75)):
            r.add(
                f"{path}.ambient",
                t.get("ambient"),
                "an ambient from -40 degC to below the insulation rating",
            )
        length = r.qty(t, path, "length", "length")
        if length is not None and length > 2000:
            r.add(
                f"{path}.length",
                t.get("length"),
                "a run length up to 2000 m (6560 ft); longer feeds need a different study",
            )
        runs.append(
            Run(
                id=r.text(t, path, "id"),
                from_id=r.text(t, path, "from"),
                to_id=r.text(t, path, "to"),
                length_m=length or 1.0,
                size=size,
                material=material,
                sets=int(r.number(t, path, "sets", 1, 20, default=1, integer=True) or 1),
                insulation_c=ins or 75.0,
                raceway=raceway,
                ambient_c=amb if amb is not None else 30.0,
                current_carrying=int(
                    r.number(t, path, "current_carrying", 1, 80, default=3, integer=True) or 3
                ),
                ground=gsize,
                ground_material=gmat,
                device_a=r.qty(t, path, "device", "current", required=False, within=_DEVICE),
                termination_c=term,
                rooftop_mm=r.qty(
                    t, path, "rooftop_height", "length", required=False, must_be_positive=False
                )
                if "rooftop_height" in t
                else None,
                harmonic_neutral=r.flag(t, path, "harmonic_neutral"),
                clearing_s=r.qty(t, path, "clearing_time", "time", required=False),
            )
        )
        if runs[-1].rooftop_mm is not None:
            if runs[-1].rooftop_mm < 0:
                r.add(
                    f"{path}.rooftop_height",
                    t.get("rooftop_height"),
                    "a height above the roof of zero or more",
                )
            runs[-1] = _replace(runs[-1], rooftop_mm=runs[-1].rooftop_mm * 1000.0)

    panels = []
    for i, t in enumerate(_array_of_tables(r, data, "panel"), start=1):
        path = f"panel[{i}]"
        r.check_keys(t, path, PANEL_KEYS)
        sched = None
        if "schedule" in t:
            stext = r.text(t, path, "schedule")
            if stext:
                sched = _resolve_schedule(r, f"{path}.schedule", stext, job_path.parent)
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
        panels.append(
            Panel(
                id=r.text(t, path, "id"),
                rating_a=r.qty(t, path, "rating", "current", within=_DEVICE) or 0.0,
                main_device_a=r.qty(
                    t, path, "main_device", "current", required=False, within=_DEVICE
                ),
                interrupting_a=r.qty(
                    t, path, "interrupting", "current", required=False, within=_INTERRUPTING
                ),
                voltage=r.voltage(t, path, "voltage", required=False),
                schedule=sched,
                load_va=load,
                continuous_va=cont or 0.0,
                pf=pf or 0.9,
                instantaneous_a=r.qty(t, path, "instantaneous_trip", "current", required=False),
                occupancy=_occupancy(r, t, path),
            )
        )

    motors = []
    for i, t in enumerate(_array_of_tables(r, data, "motor"), start=1):
        path = f"motor[{i}]"
        r.check_keys(t, path, MOTOR_KEYS)
        fla = r.qty(t, path, "full_load", "current", required=False)
        hp = r.number(t, path, "hp", 0.1, 1000)
        if fla is None and "full_load" not in t:
            r.add(f"{path}.full_load", None, "the motor's full-load current, e.g. '30.8 A'")
        motors.append(
            Motor(
                id=r.text(t, path, "id"),
                panel_id=r.text(t, path, "panel"),
                full_load_a=fla or 1.0,
                locked_rotor_a=r.qty(t, path, "locked_rotor", "current", required=False),
                hp=hp,
            )
        )

    opts = data.get("options", {})
    if not isinstance(opts, dict):
        r.add("options", opts, "an [options] table")
        opts = {}
    r.check_keys(opts, "options", OPTION_KEYS)
    tol = r.qty(
        opts,
        "options",
        "impedance_tolerance",
        "percent",
        required=False,
        default=None,
        must_be_positive=False,
    )
    if tol is not None and not (0 <= tol <= 20):
        r.add(
            "options.impedance_tolerance",
            opts.get("impedance_tolerance"),
            "a tolerance from 0 % to 20 % (7.5 % per IEEE C57.12.00; 10 % is common for dry-type)",
        )
    vf = r.text(opts, "options", "voltage_factor", required=False, default="none")
    if vf not in ("none", "iec60909"):
        r.add("options.voltage_factor", vf, "'none' or 'iec60909'")
    vd = r.text(opts, "options", "voltage_drop", required=False, default="recommended")
    if vd not in ("recommended", "mandatory"):
        r.add("options.voltage_drop", vd, "'recommended' (warnings) or 'mandatory' (failures)")
    options = Options(
        impedance_tolerance_pct=tol,
        voltage_factor=vf,
        voltage_drop=vd,
        feeder_drop_pct=r.qty(opts, "options", "feeder_drop", "percent", required=False),
        branch_drop_pct=r.qty(opts, "options", "branch_drop", "percent", required=False),
        total_drop_pct=r.qty(opts, "options", "total_drop", "percent", required=False),
    )

    _check_ids_and_tree(r, transformers, runs, panels, motors)
    # schedule paths resolve relative to the job file's folder
    panels = [
        _replace(pn, schedule=(job_path.parent / pn.schedule) if pn.schedule else None)
        for pn in panels
    ]
    if not transformers and "transformer" not in data:
        r.add("transformer", None, "at least one [[transformer]] block")
    r.problems.raise_if_any()
    job = Job(
        path=job_path,
        project=project,
        source=source,
        transformers=tuple(transformers),
        runs=tuple(runs),
        panels=tuple(panels),
        motors=tuple(motors),
        options=options,
        text=text,
    )
    _check_voltages(r, job)
    r.problems.raise_if_any()
    return job


OCCUPANCIES = ("other", "dwelling", "hospital", "hotel", "warehouse")


def _occupancy(r: _Reader, t: dict, path: str) -> str:
    """Occupancy for the lighting demand factors of the panel's schedule."""
    occ = r.text(t, path, "occupancy", required=False, default="other")
    if occ not in OCCUPANCIES:
        r.add(
            f"{path}.occupancy",
            occ,
            "one of " + ", ".join(OCCUPANCIES) + " (lighting demand factors of Table 220.42)",
        )
        return "other"
    return occ


def _replace(obj, **changes):
    from dataclasses import replace

    return replace(obj, **changes)


def _resolve_schedule(r: _Reader, key: str, text: str, folder: Path) -> Path | None:
    """A schedule path relative to the job file's folder, refused if it could lead out.

    Absolute paths, drive letters, backslashes and '..' are refused as written; a
    path that resolves (through a symbolic link) outside the folder is refused too.
    """
    inside = "a path inside the job file's folder (no absolute paths, no '..')"
    if "\x00" in text or "\\" in text or PureWindowsPath(text).drive:
        r.add(key, text, inside + " written with '/' between folders")
        return None
    p = Path(text)
    if p.is_absolute() or ".." in p.parts:
        r.add(key, text, inside)
        return None
    if p.suffix.lower() not in (".csv", ".xlsx"):
        r.add(key, text, "a .csv or .xlsx schedule file")
        return None
    try:
        base = folder.resolve()
        real = (folder / p).resolve()
    except (OSError, RuntimeError):  # a link loop
        r.add(key, text, "a schedule file that can be opened (the path loops through links)")
        return None
    if not real.is_relative_to(base):
        r.add(key, text, inside + "; this one leads outside it through a link")
        return None
    if not real.is_file():
        r.add(key, text, f"an existing schedule file in {folder} (not found)")
        return None
    return p


def _check_ids_and_tree(r: _Reader, transformers, runs, panels, motors) -> None:
    seen: dict[str, str] = {}
    malformed: set[str] = set()  # reported once here, not again as unfed or unknown
    for kind, coll in (
        ("transformer", transformers),
        ("run", runs),
        ("panel", panels),
        ("motor", motors),
    ):
        for i, e in enumerate(coll, start=1):
            if not e.id:
                continue
            if not _ID_RE.match(e.id):
                malformed.add(e.id)
                r.add(
                    f"{kind}[{i}].id",
                    e.id,
                    "an id of letters, digits, '-', '_' or '.' "
                    "(at most 40, starting with a letter or digit)",
                )
            if e.id.lower() == SOURCE_ID:
                r.add(f"{kind}[{i}].id", e.id, "an id other than 'source' (reserved)")
            elif e.id in seen:
                r.add(f"{kind}[{i}].id", e.id, f"a unique id ({seen[e.id]} has it already)")
            else:
                seen[e.id] = f"{kind}[{i}]"
    nodes = {SOURCE_ID: "source"}
    # an element wrongly named 'source' is reported above; it must not hide the source
    nodes.update({t.id: "transformer" for t in transformers if t.id != SOURCE_ID})
    nodes.update({p.id: "panel" for p in panels if p.id != SOURCE_ID})
    all_ids = list(nodes)
    incoming: dict[str, list[str]] = {}
    for i, run in enumerate(runs, start=1):
        for key, target in (("from", run.from_id), ("to", run.to_id)):
            if target and target not in nodes:
                close = difflib.get_close_matches(target, all_ids, n=1)
                hint = f" — did you mean {close[0]!r}?" if close else ""
                r.add(
                    f"run[{i}].{key}",
                    target,
                    "the id of the source, a transformer or a panel" + hint,
                )
        if run.to_id == SOURCE_ID:
            r.add(f"run[{i}].to", run.to_id, "a transformer or panel (nothing feeds the source)")
        if run.from_id and run.from_id == run.to_id:
            r.add(f"run[{i}].to", run.to_id, "a different element than its 'from'")
        if (
            run.from_id in nodes
            and nodes[run.from_id] == "source"
            and run.to_id in nodes
            and nodes[run.to_id] == "panel"
        ):
            r.add(
                f"run[{i}].from",
                run.from_id,
                "a transformer (panels are fed from a transformer secondary or another panel)",
            )
        if run.to_id in nodes:
            incoming.setdefault(run.to_id, []).append(f"run[{i}]")
    for i, t in enumerate(transformers, start=1):
        if t.from_id not in nodes or nodes.get(t.from_id) == "transformer":
            if t.from_id not in nodes:
                close = difflib.get_close_matches(t.from_id, all_ids, n=1)
                hint = f" — did you mean {close[0]!r}?" if close else ""
                r.add(f"transformer[{i}].from", t.from_id, "'source' or a panel id" + hint)
            else:
                r.add(f"transformer[{i}].from", t.from_id, "'source' or a panel id")
        runs_in = incoming.get(t.id, [])
        if t.from_id != SOURCE_ID and not runs_in:
            r.add(
                f"transformer[{i}].from",
                t.from_id,
                f"a [[run]] from {t.from_id!r} to {t.id!r} (the primary feeder)",
            )
    for i, m in enumerate(motors, start=1):
        if (m.panel_id and m.panel_id not in nodes) or nodes.get(m.panel_id) != "panel":
            r.add(f"motor[{i}].panel", m.panel_id, "the id of a panel")
    for nid, srcs in incoming.items():
        if len(srcs) > 1:
            r.add(f"{srcs[1]}.to", nid, f"one run into {nid!r} (radial feed; {srcs[0]} feeds it)")
    for i, p in enumerate(panels, start=1):
        if p.id and p.id not in incoming and p.id not in malformed:
            r.add(f"panel[{i}].id", p.id, "a [[run]] with to = " + repr(p.id) + " feeding it")
    if r.problems:
        return
    # reachability from the source (catches cycles)
    children: dict[str, list[str]] = {}
    for run in runs:
        children.setdefault(run.from_id, []).append(run.to_id)
    for t in transformers:
        if t.from_id == SOURCE_ID and t.id not in incoming:
            children.setdefault(SOURCE_ID, []).append(t.id)
    reached = {SOURCE_ID}
    stack = [SOURCE_ID]
    while stack:
        n = stack.pop()
        for c in children.get(n, []):
            if c not in reached:
                reached.add(c)
                stack.append(c)
    for nid, kind in nodes.items():
        if nid not in reached:
            idx = [e.id for e in (transformers if kind == "transformer" else panels)].index(nid) + 1
            r.add(
                f"{kind}[{idx}].id",
                nid,
                "an element fed from the source (this one is in a loop "
                "or not connected: the feed must be a tree)",
            )


def _check_voltages(r: _Reader, job: Job) -> None:
    """Each element's stated voltage must match the voltage of the node that feeds it."""
    from .topology import build_tree

    tree = build_tree(job)
    for i, pn in enumerate(job.panels, start=1):
        if pn.voltage is None:
            continue
        have = tree.voltage_of[pn.id]
        if abs(have.line_v - pn.voltage.line_v) > 0.5 or have.phases != pn.voltage.phases:
            r.add(
                f"panel[{i}].voltage",
                pn.voltage.text,
                f"the voltage of the feed that reaches it ({have.text})",
            )
    for i, t in enumerate(job.transformers, start=1):
        have = tree.voltage_of[tree.parent_node[t.id]]
        if t.primary and (
            abs(have.line_v - t.primary.line_v) > 0.5 or have.phases < t.primary.phases
        ):
            r.add(
                f"transformer[{i}].primary",
                t.primary.text,
                f"the voltage of what feeds it ({have.text})",
            )
