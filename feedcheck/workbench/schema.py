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


@functools.cache
def template_notes() -> dict[tuple[str, str], tuple[str, str]]:
    """(kind, key) → (example value, help) as the template writes them."""
    notes: dict[tuple[str, str], tuple[str, str]] = {}
    kind = ""
    for line in TEMPLATE.splitlines():
        if m := _HEADER.match(line):
            kind = m.group(1)
        elif kind and (m := _KEY.match(line)):
            example = m.group(2).strip('"')
            notes.setdefault((kind, m.group(1)), (example, (m.group(3) or "").strip()))
    return notes


def _label(key: str) -> str:
    """``primary_device`` → ``Primary device``; ``x_r`` → ``X/R``."""
    return {"x_r": "X/R", "id": "Id", "kw": "kW", "hp": "hp"}.get(
        key, key.replace("_", " ").capitalize()
    )


def _field(kind: str, key: str) -> dict:
    example, help_text = template_notes().get((kind, key), ("", ""))
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
