"""Read and validate a job file (TOML) into the :class:`~feedcheck.model.Job` model.

Every problem is collected with its key path (``run[2].length``) and, where the
file shows it, its line; then one :class:`~feedcheck.errors.InputError` carries
them all. The format is documented key by key in the README. The returned job has
every default filled (a transformer's typical X/R included) and carries its feed
tree, built once (``job.tree``).
"""

from __future__ import annotations

import hashlib
import re
from dataclasses import replace
from pathlib import Path

import tomli  # the parser the standard tomllib was taken from, shipped compiled (3x faster)

from ..errors import InputError, ProblemList
from ..model import (
    INSULATION_RATINGS_C,
    PRIMARY_DEVICE_KINDS,
    RACEWAYS,
    SOURCE_ID,
    TAP_RULES,
    VOLTAGE_DROP_MODES,
    VOLTAGE_FACTORS,
    Job,
    Motor,
    Options,
    Project,
    Run,
    Transformer,
)
from .defaults import typical_x_r
from .element_keys import phases_connected as _phases_connected
from .element_keys import tap_pct as _tap
from .feed_rules import check_feed, check_series, check_voltages
from .files import FileKind, FileRefused, decode_utf8, read_bytes
from .job_keys import OPTION_KEYS, PROJECT_KEYS, RUN_KEYS, TOP_KEYS, TRANSFORMER_KEYS
from .motor_keys import read_motor, table_currents
from .panel_reader import read_panel
from .ranges import CLEARING, DEVICE
from .source_reader import read_source
from .standby_reader import check_standby, read_standby
from .toml_reader import (
    DEEP_KEY_VALUE,
    KEY_PARTS_EXPECTED,
    Reader,
    array_of_tables,
    deep_key_line,
)
from .tree import build_tree
from .unit_system import job_length_unit

MAX_JOB_BYTES = 2_000_000
JOB_FILE = FileKind(
    "job file", "(.toml)", MAX_JOB_BYTES, f"a job file under {MAX_JOB_BYTES // 1_000_000} MB"
)
# spreadsheets a job cannot be read from (a workbook is read as .xlsx only)
SPREADSHEET_SUFFIXES = (".xls", ".xlsm", ".xlsb", ".ods", ".csv", ".numbers")
_TEMPERATURE_RATING = "'60 degC', '75 degC' or '90 degC'"
_EMPTY_EXPECTED = (
    "a TOML job file with [project], [source], [[transformer]], "
    "[[run]] and [[panel]] (see `feedcheck init`)"
)
_INSULATION = "'60 degC', '75 degC', '90 degC' or an insulation type such as 'THHN' or 'XHHW-2'"


def read_job(path: str | Path) -> Job:
    """Read, parse and validate a job file (TOML) or job workbook (``.xlsx``).

    Returns
    -------
    Job
        Every default filled; ``job.tree`` is the feed tree.

    Raises
    ------
    InputError
        Listing every problem found (file, key path and line, or sheet, row and
        column; value; expectation).
    """
    p = Path(path)
    if p.suffix.lower() == ".xlsx":
        from .workbook_file import read_workbook

        book = read_workbook(p)
        try:
            job = parse_job_data(book.data, "", p)
        except InputError as exc:
            raise book.locate(exc) from None
        return replace(job, file_sha256=book.sha256)
    data, text, raw = read_toml(p)
    job = parse_job_data(data, text, p)
    return replace(job, file_sha256=hashlib.sha256(raw).hexdigest())


def read_job_data(path: str | Path) -> dict:
    """The job's data as its reader parses it (TOML or workbook), not yet validated."""
    p = Path(path)
    if p.suffix.lower() == ".xlsx":
        from .workbook_file import read_workbook

        return read_workbook(p).data
    return read_toml(p)[0]


def read_toml(p: Path) -> tuple[dict, str, bytes]:
    """A job file's parsed TOML, its text and its bytes (guarded: a regular file, its
    size, UTF-8, keys of a few parts, TOML syntax)."""
    text, raw = read_job_source(p)
    return read_job_text(text, p), text, raw


def read_job_source(p: Path) -> tuple[str, bytes]:
    """A job file's text and bytes (guarded: a regular file, its size, not empty, UTF-8);
    not parsed."""
    pl = ProblemList(str(p))
    if p.suffix.lower() in SPREADSHEET_SUFFIXES:
        pl.add("", p.name, "a TOML job file or a job workbook saved as .xlsx")
        pl.raise_if_any()
    try:
        raw = read_bytes(p, JOB_FILE)
        if not raw.strip():
            raise FileRefused("(empty file)", _EMPTY_EXPECTED)
        text = decode_utf8(raw, "UTF-8 text (save the file as UTF-8)")
    except FileRefused as exc:
        pl.add("", exc.value, exc.expected, line=exc.line)
        pl.raise_if_any()
    return text, raw


def read_job_text(text: str, path: str | Path) -> dict:
    """A job file's text parsed as TOML with the guards of the file reader (keys of a
    few parts, nesting, syntax with its line): the one parse of a job's text, from a
    file or from memory (the workbench's edited text); problems name ``path``."""
    pl = ProblemList(str(path))
    if not text.strip():
        pl.add("", "(empty file)", _EMPTY_EXPECTED)
        pl.raise_if_any()
    if (deep := deep_key_line(text)) is not None:
        pl.add("", DEEP_KEY_VALUE, KEY_PARTS_EXPECTED, line=deep)
        pl.raise_if_any()
    try:
        data = tomli.loads(text)
    except RecursionError:
        pl.add("", "arrays or tables nested too deeply", "a job file nested a few levels at most")
        pl.raise_if_any()
    except tomli.TOMLDecodeError as exc:
        msg = str(exc)
        m = re.search(r"line (\d+)", msg)
        pl.add(
            "",
            msg.split(" (at")[0],
            'valid TOML (key = "value" lines under [tables])',
            line=int(m.group(1)) if m else None,
        )
        pl.raise_if_any()
    return data


def parse_job_data(data: dict, text: str, job_path: Path) -> Job:
    """Validate parsed TOML ``data`` (``text`` is the file, for line numbers)."""
    job_path = Path(job_path)
    r = Reader(str(job_path), text)
    r.check_keys(data, "", TOP_KEYS)
    # paths like ".foo" for unknown top-level keys read better without the dot
    r.problems.items = [
        type(x)(x.file, x.where.lstrip("."), x.value, x.expected, x.line) for x in r.problems.items
    ]
    project = _project(r, _table(r, data, "project", "a [project] table"))
    src = data.get("source")
    if not isinstance(src, dict):
        r.add("source", None if src is None else src, "a [source] table (required)")
        src = {}
    source, phases = read_source(r, src, "source" in data)
    transformers = [
        _transformer(r, t, f"transformer[{i}]", phases)
        for i, t in enumerate(array_of_tables(r, data, "transformer"), start=1)
    ]
    run_tables = array_of_tables(r, data, "run")
    runs = [_run(r, t, f"run[{i}]") for i, t in enumerate(run_tables, start=1)]
    panels = [
        read_panel(r, t, f"panel[{i}]", job_path.parent)
        for i, t in enumerate(array_of_tables(r, data, "panel"), start=1)
    ]
    _service_ground(r, source, runs, run_tables, {pn.id for pn in panels})
    motor_tables = array_of_tables(r, data, "motor")
    motor_paths = [f"motor[{i}]" for i in range(1, len(motor_tables) + 1)]
    motors = [read_motor(r, t, p) for p, t in zip(motor_paths, motor_tables, strict=True)]
    options = _options(r, _table(r, data, "options", "an [options] table"))
    check_feed(r, transformers, runs, panels, motors, source)
    generator, switch = read_standby(r, data, _run)
    ids = {e.id for coll in (transformers, runs, panels, motors) for e in coll}
    check_standby(r, generator, switch, runs, panels, source, ids)
    # schedule paths resolve relative to the job file's folder
    panels = [
        replace(pn, schedule=(job_path.parent / pn.schedule) if pn.schedule else None)
        for pn in panels
    ]
    if not transformers and not panels and "transformer" not in data and "panel" not in data:
        r.add("transformer", None, "at least one [[transformer]] or [[panel]] block")
    r.problems.raise_if_any()
    tree = build_tree(source, transformers, runs, panels)
    check_voltages(r, tree, transformers, panels)
    motors = table_currents(r, motors, tree, motor_paths)
    check_series(r, tree, runs, panels)
    r.problems.raise_if_any()
    return Job(
        path=job_path,
        project=project,
        source=source,
        transformers=tuple(_fill_x_r(t) for t in transformers),
        runs=tuple(runs),
        panels=tuple(panels),
        tree=tree,
        motors=tuple(motors),
        options=options,
        text=text,
        length_unit=_length_unit(data, runs, motors),
        generator=generator,
        transfer_switch=switch,
    )


def _service_ground(r: Reader, source, runs, run_tables, panel_ids: set[str]) -> None:
    """Service conductors carry no equipment grounding conductor: their grounded
    conductor is the fault return (NFPA 70-2023 250.24(C)); refuse a ``ground`` on a run
    from a low-voltage source to a panel (a run to a transformer is a primary feeder)."""
    if source is None or source.medium_voltage:
        return
    for i, (run, raw) in enumerate(zip(runs, run_tables, strict=True), start=1):
        if run.from_id == SOURCE_ID and run.to_id in panel_ids and "ground" in raw:
            r.add(
                f"run[{i}].ground",
                raw["ground"],
                "no ground on service conductors (from = 'source'): state their grounded "
                "conductor as neutral (250.24(C)); the electrode conductor and main "
                "bonding jumper go under [source]",
            )


def _length_unit(data: dict, runs: list[Run], motors: list[Motor]) -> str:
    """The unit the job's lengths are shown in (see :mod:`.unit_system`)."""
    written = [
        t.get("length")
        for key in ("run", "motor")
        for t in (data.get(key) or ())
        if isinstance(t, dict)
    ]
    sizes = [e.size.system for e in (*runs, *motors) if e.size is not None]
    return job_length_unit(written, sizes)


def _table(r: Reader, data: dict, name: str, expected: str) -> dict:
    v = data.get(name, {})
    if not isinstance(v, dict):
        r.add(name, v, expected)
        return {}
    return v


def _fill_x_r(t: Transformer) -> Transformer:
    """The typical X/R by rating where the job gives none (flagged on the transformer)."""
    if t.x_r is not None:
        return t
    x_r, row = typical_x_r(t.rating_va)
    return replace(t, x_r=x_r, x_r_typical_row=row)


def _project(r: Reader, proj: dict) -> Project:
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
    return project


def _transformer(r: Reader, t: dict, path: str, phases: int) -> Transformer:
    r.check_keys(t, path, TRANSFORMER_KEYS)
    sec = r.voltage(t, path, "secondary", phases=phases)
    # a single-phase transformer may sit on two lines of a three-phase system
    prim = r.voltage(
        t,
        path,
        "primary",
        phases=1 if sec is not None and sec.phases == 1 else phases,
        medium=True,
    )
    z = r.qty(t, path, "impedance", "percent")
    if z is not None and not (0.5 <= z <= 25):
        r.add(
            f"{path}.impedance",
            t["impedance"],
            "a percent impedance from 0.5 % to 25 % (distribution transformers are 1-10 %)",
        )
    tap = _tap(r, t, path)
    if prim and sec and prim.phases != sec.phases:
        r.add(
            f"{path}.secondary",
            t.get("secondary"),
            f"a {prim.phases}-phase secondary like the {prim.phases}-phase primary ({prim.text})",
        )
    rating = r.qty(t, path, "rating", "power", apparent_only=True)
    if rating is not None and not (1e3 <= rating <= 5e6):
        r.add(f"{path}.rating", t.get("rating"), "a rating from 1 kVA to 5000 kVA")
    return Transformer(
        id=r.text(t, path, "id"),
        from_id=r.text(t, path, "from", required=False, default=SOURCE_ID),
        rating_va=rating or 1.0,
        primary=prim,
        secondary=sec,
        z_pct=z or 1.0,
        x_r=r.number(t, path, "x_r", 0.1, 50),  # None here: filled once the job is valid
        primary_device_a=r.qty(t, path, "primary_device", "current", within=DEVICE) or 0.0,
        secondary_device_a=r.qty(
            t, path, "secondary_device", "current", required=False, within=DEVICE
        ),
        tap_pct=tap or 0.0,
        z0_ratio=r.number(t, path, "zero_sequence_ratio", 0.1, 3),
        phases_connected=_phases_connected(r, t, path, prim),
        primary_device_type=_primary_device_type(r, t, path),
    )


def _primary_device_type(r: Reader, t: dict, path: str) -> str:
    """``fuse`` or ``breaker``: the column of Table 450.3(A) over 1000 V ("" not stated)."""
    kind = r.text(t, path, "primary_device_type", required=False)
    if kind and kind not in PRIMARY_DEVICE_KINDS:
        r.add(f"{path}.primary_device_type", kind, "'fuse' or 'breaker'")
        return ""
    return kind


def _run_temperatures(r: Reader, t: dict, path: str) -> tuple[float | None, ...]:
    """Insulation, termination and ambient temperatures of a run [°C]."""
    type_rating = _insulation_type_rating(t.get("insulation"))
    if type_rating is not None:
        ins = type_rating
    else:
        ins = r.qty(
            t,
            path,
            "insulation",
            "temperature",
            required=False,
            default=75.0,
            must_be_positive=False,
        )
    if ins not in INSULATION_RATINGS_C:
        r.add(f"{path}.insulation", t.get("insulation"), _INSULATION)
    term = r.qty(t, path, "termination", "temperature", required=False, must_be_positive=False)
    if term is not None and term not in INSULATION_RATINGS_C:
        r.add(f"{path}.termination", t.get("termination"), _TEMPERATURE_RATING)
    amb = r.qty(
        t, path, "ambient", "temperature", required=False, default=30.0, must_be_positive=False
    )
    if amb is not None and not (-40 <= amb < (ins or 75)):
        r.add(
            f"{path}.ambient",
            t.get("ambient"),
            "an ambient from -40 degC to below the insulation rating",
        )
    return ins, term, amb


def _run(r: Reader, t: dict, path: str) -> Run:
    r.check_keys(t, path, RUN_KEYS)
    size, material = r.conductor(t, path, "conductors")
    gsize, gmat = r.conductor(t, path, "ground", required=False, default_material=material)
    raceway = r.text(t, path, "raceway", required=False, default="steel")
    if raceway not in RACEWAYS:
        r.add(f"{path}.raceway", raceway, "one of " + ", ".join(RACEWAYS))
    ins, term, amb = _run_temperatures(r, t, path)
    length = r.qty(t, path, "length", "length")
    if length is not None and length > 2000:
        r.add(
            f"{path}.length",
            t.get("length"),
            "a run length up to 2000 m (6560 ft); longer feeds need a different study",
        )
    run = Run(
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
        device_a=r.qty(t, path, "device", "current", required=False, within=DEVICE),
        termination_c=term,
        rooftop_mm=r.qty(
            t, path, "rooftop_height", "length", required=False, must_be_positive=False
        )
        if "rooftop_height" in t
        else None,
        harmonic_neutral=r.flag(t, path, "harmonic_neutral"),
        clearing_s=r.qty(t, path, "clearing_time", "time", required=False, within=CLEARING),
    )
    run = _run_protection_keys(r, t, path, run)
    if run.rooftop_mm is None:
        return run
    if run.rooftop_mm < 0:
        r.add(
            f"{path}.rooftop_height",
            t.get("rooftop_height"),
            "a height above the roof of zero or more",
        )
    return replace(run, rooftop_mm=run.rooftop_mm * 1000.0)  # read in m, kept in mm


def _insulation_type_rating(value) -> float | None:
    """Temperature rating [°C] of an insulation type name (``"THHN"``), its dry-location
    rating (NFPA 70-2023 Table 310.4(A)); None when ``value`` is not a known type name
    (then it is read as a temperature)."""
    if not isinstance(value, str) or not value.strip() or value.strip()[0].isdigit():
        return None
    from ..calc.withstand_icea import InsulationType, insulation_type
    from ..tables import load_table

    records = load_table("insulation_types").data.to_dict("records")
    rows = [InsulationType.from_record(x) for x in records]
    try:
        return insulation_type(value, rows).dry_c
    except ValueError:
        return None


def _run_protection_keys(r: Reader, t: dict, path: str, run: Run) -> Run:
    """The run keys of issue 12: tap_rule, the insulation type name, bonding_jumper and
    neutral (supply-side bonding jumper and grounded conductor of secondary conductors)."""
    tap = r.text(t, path, "tap_rule", required=False)
    if tap and tap not in TAP_RULES:
        r.add(f"{path}.tap_rule", tap, "one of " + ", ".join(repr(x) for x in TAP_RULES))
        tap = ""
    if tap and run.device_a is not None:
        r.add(f"{path}.tap_rule", tap, "no tap_rule on a run that has a device (omit one)")
    ins = t.get("insulation")
    type_name = ins.strip() if _insulation_type_rating(ins) is not None else ""
    jumper, jumper_mat = r.conductor(
        t, path, "bonding_jumper", required=False, default_material=run.material
    )
    neutral, neutral_mat = r.conductor(
        t, path, "neutral", required=False, default_material=run.material
    )
    return replace(
        run,
        tap_rule=tap,
        insulation_type=type_name,
        bonding_jumper=jumper,
        bonding_jumper_material=jumper_mat,
        neutral=neutral,
        neutral_material=neutral_mat,
    )


def _options(r: Reader, opts: dict) -> Options:
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
    if vf not in VOLTAGE_FACTORS:
        r.add("options.voltage_factor", vf, "'none', 'iec60909' or 'iec60909-10pct'")
    vd = r.text(opts, "options", "voltage_drop", required=False, default="recommended")
    if vd not in VOLTAGE_DROP_MODES:
        r.add("options.voltage_drop", vd, "'recommended' (warnings) or 'mandatory' (failures)")
    return Options(
        impedance_tolerance_pct=tol,
        voltage_factor=vf,
        voltage_drop=vd,
        feeder_drop_pct=r.qty(opts, "options", "feeder_drop", "percent", required=False),
        branch_drop_pct=r.qty(opts, "options", "branch_drop", "percent", required=False),
        total_drop_pct=r.qty(opts, "options", "total_drop", "percent", required=False),
    )
