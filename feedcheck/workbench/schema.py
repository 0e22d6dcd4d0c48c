"""The forms of the workbench: one per table of a job, its fields in the order the
readers list their keys.

The keys come from the readers' own lists (:data:`~feedcheck.inputs.workbook_cells.SHEETS`,
built from ``job_keys``, ``source_reader``, ``panel_reader``, ``motor_keys`` and
``standby_reader``), the example value and the help of each key from the commented
template of ``feedcheck init``, the choices from the vocabularies of the model. Only the
required keys and the defaults the readers fill are a small mapping here, each held
against the reader by ``tests/workbench/test_schema.py``.
"""

from __future__ import annotations

import functools
import re

from ..inputs.standby_reader import GENERATOR_RUN_KEYS
from ..inputs.workbook_cells import SHEETS
from ..model import (
    OCCUPANCIES,
    PRIMARY_DEVICE_KINDS,
    RACEWAYS,
    TAP_RULES,
    VOLTAGE_DROP_MODES,
    VOLTAGE_FACTORS,
)
from ..template import TEMPLATE

TITLES = {
    "project": "Project",
    "source": "Source",
    "transformer": "Transformers",
    "run": "Runs",
    "panel": "Panels",
    "motor": "Motors",
    "generator": "Generator",
    "transfer_switch": "Transfer switch",
    "options": "Options",
}
PAGE_ORDER = tuple(TITLES)

# keys a reader refuses to go without (others may still be needed together: the
# reader's message says which)
REQUIRED = {
    "project": ("name",),
    "source": ("voltage",),
    "transformer": ("id", "rating", "primary", "secondary", "impedance", "primary_device"),
    "run": ("id", "from", "to", "length", "conductors"),
    "panel": ("id", "rating"),
    "motor": ("id", "panel"),
    "generator": ("id", "rating", "voltage", "subtransient", "x_r"),
    "transfer_switch": ("id", "panel", "rating"),
    "options": (),
}
# the value a reader takes when a key is absent, as a user would type it
DEFAULTS = {
    ("project", "rules"): "na",
    ("transformer", "from"): "source",
    ("run", "sets"): "1",
    ("run", "insulation"): "75 degC",
    ("run", "raceway"): "steel",
    ("run", "ambient"): "30 degC",
    ("run", "current_carrying"): "3",
    ("run", "harmonic_neutral"): "false",
    ("panel", "occupancy"): "other",
    ("options", "voltage_factor"): "none",
    ("options", "voltage_drop"): "recommended",
}
CHOICES = {
    "raceway": RACEWAYS,
    "tap_rule": TAP_RULES,
    "primary_device_type": PRIMARY_DEVICE_KINDS,
    "voltage_factor": VOLTAGE_FACTORS,
    "voltage_drop": VOLTAGE_DROP_MODES,
    "occupancy": OCCUPANCIES,
    "harmonic_neutral": ("true", "false"),
}

_HEADER = re.compile(r"^#?\s*\[\[?([a-z_]+)\]\]?")
_KEY = re.compile(r"^#?\s*([a-z_]+)\s*=\s*(\"[^\"]*\"|[^#\s]+)\s*(?:#\s*(.*))?$")
_MORE = re.compile(r"^#\s+#\s*(.*)$")  # a comment continued on the next line

# Help where the template has none for a key, or its comment is one sentence spread
# over several keys; the wording is the README's job-file tables, shortened.
HELP = {
    ("project", "notes"): "optional: shown on the report",
    ("source", "short_circuit_mva"): "former spelling of short_circuit",
    (
        "source",
        "primary_x_r",
    ): "with service_transformer: X/R of the utility's primary (required when finite)",
    ("transformer", "zero_sequence_ratio"): (
        "optional: Z0/Z1 of a delta-wye transformer for the line-to-ground maximum and "
        "minimum (rules fault-z0-ratio-max 0.85 / -min 1.0 when absent)"
    ),
    ("run", "ambient"): "ambient temperature around the run",
    ("run", "bonding_jumper"): (
        "secondary conductors without a device: supply-side bonding jumper "
        "(250.30(A)(2)), Table 250.102(C)(1)"
    ),
    ("run", "neutral"): (
        "grounded conductor of secondary or service conductors (250.30(A)(3), 250.24(C)), "
        "Table 250.102(C)(1)"
    ),
    ("panel", "instantaneous_trip"): (
        "optional: instantaneous pick-up of the device feeding the panel, for the "
        "ground-fault check"
    ),
    ("panel", "device_type"): (
        "family of the panel's devices, which sets the test X/R of its interrupting "
        "rating (molded-case when absent)"
    ),
    ("panel", "columns"): (
        'the schedule\'s column map: {Ins = "insulation", Notes = "ignore"} (header = column)'
    ),
    ("panel", "series_rating"): "a series-rated combination's tested rating (240.86(B))",
    ("panel", "series_upstream"): "the run on the panel's feed whose device is the line side",
    ("panel", "series_upstream_device"): "that device's rating as the combination names it",
    ("motor", "hp"): "rated horsepower, a row of Table 430.248/430.250 (or give kw)",
    ("motor", "kw"): "rating in kilowatts, taken at 746 W/hp (or give hp)",
    ("motor", "motor_type"): "the Table 430.52 row (squirrel-cage when absent)",
    ("motor", "length"): "optional branch run to the motor (with conductors)",
    ("motor", "conductors"): "its branch conductors: 125 % FLC (430.22) and the starting dip",
    ("motor", "raceway"): "the branch run's raceway",
    ("generator", "length"): "its run to the transfer switch (with conductors)",
    ("generator", "conductors"): "the run's conductors, as a [[run]]",
    ("generator", "ground"): "the run's equipment grounding conductor",
    ("options", "feeder_drop"): "voltage drop limit of a feeder",
    ("options", "branch_drop"): "voltage drop limit of a branch circuit",
    ("options", "total_drop"): "voltage drop limit from the source to the farthest outlet",
}
# Examples where the template gives none, as a user would type them.
EXAMPLES = {
    ("source", "short_circuit_mva"): "250 MVA",
    ("source", "primary_x_r"): "10",
    ("transformer", "zero_sequence_ratio"): "0.85",
    ("panel", "instantaneous_trip"): "2500 A",
    ("panel", "device_type"): "molded-case",
    ("motor", "kw"): "7.5",
    ("motor", "motor_type"): "squirrel-cage",
    ("motor", "raceway"): "steel",
}


@functools.cache
def template_notes() -> dict[tuple[str, str], tuple[str, str]]:
    """(kind, key) → (example value, help) as the template writes them; a comment
    continued on the lines below its key is joined to it."""
    notes: dict[tuple[str, str], tuple[str, str]] = {}
    kind, last = "", None
    for line in TEMPLATE.splitlines():
        if m := _HEADER.match(line):
            kind, last = m.group(1), None
        elif last is not None and (m := _MORE.match(line)):
            example, help_text = notes[last]
            notes[last] = (example, f"{help_text} {m.group(1).strip()}".strip())
        elif kind and (m := _KEY.match(line)):
            key = (kind, m.group(1))
            last = None if key in notes else key
            example = m.group(2).strip('"')
            notes.setdefault(key, (example, (m.group(3) or "").strip()))
        else:
            last = None
    return notes


_LABELS = {
    "x_r": "X/R",
    "id": "Id",
    "kw": "kW",
    "hp": "hp",
    "short_circuit_mva": "Short circuit (MVA)",
    "service_x_r": "Service X/R",
    "primary_x_r": "Primary X/R",
}


def _label(key: str) -> str:
    """``primary_device`` → ``Primary device``; ``x_r`` → ``X/R``."""
    return _LABELS.get(key, key.replace("_", " ").capitalize())


def _note(kind: str, key: str) -> tuple[str, str]:
    """(example, help) of a key: the template's, else kept here; a key of the
    generator's run that neither gives is described as the [[run]] key it is."""
    example, help_text = template_notes().get((kind, key), ("", ""))
    example = example or EXAMPLES.get((kind, key), "")
    help_text = HELP.get((kind, key), help_text)
    if kind == "generator" and key in GENERATOR_RUN_KEYS and not help_text:
        run_example, run_help = _note("run", key)
        example = example or run_example
        help_text = f"its run to the transfer switch: {run_help}"
    return example, help_text


def _field(kind: str, key: str) -> dict:
    example, help_text = _note(kind, key)
    return {
        "key": key,
        "label": _label(key),
        "hint": f"e.g. {example}" if example else "",
        "default": DEFAULTS.get((kind, key)),
        "required": key in REQUIRED[kind],
        "choices": list(CHOICES[key]) if key in CHOICES else None,
        "help": help_text,
    }


@functools.cache
def _schema() -> dict:
    kinds = []
    for kind in PAGE_ORDER:
        keys, multiple = SHEETS[kind]
        kinds.append(
            {
                "kind": kind,
                "title": TITLES[kind],
                "multiple": multiple,
                "fields": [_field(kind, k) for k in keys],
            }
        )
    return {"kinds": kinds}


def schema() -> dict:
    """The forms (see WORKBENCH_API.md, SCHEMA), built once."""
    return _schema()
