"""The spelling of a job in a workbook, shared by its reader and its writer.

One sheet per table of the job file (``project``, ``source``, ``transformer``, ``run``,
``panel``, ``motor``, ``generator``, ``transfer_switch``, ``options``); row 1 holds the
keys, each row below one element (a single table: one row). A cell holds the value as
the job file writes it: ``"85 ft"`` stays the text ``85 ft``, ``x_r = 3.5`` the number
3.5, ``harmonic_neutral = true`` the boolean TRUE, an unquoted TOML date a date.

Texts that need care in a cell:

* a text a spreadsheet would read as a formula (``-2.5 %``, ``=…``, ``+…``, ``@…``) is
  written with one leading apostrophe (:func:`feedcheck.render.cells.neutralise_cell`);
  so are the empty text (a lone ``'``) and a text that itself starts with an apostrophe.
  Reading drops one leading apostrophe from any text cell, which gives the text back;
* ``columns`` (a panel's schedule column map) is the inline table the job file writes
  after ``columns =``: ``{Ins = "insulation", Notes = "ignore"}``, read with the TOML
  parser;
* a whole number kept as a decimal (``power_factor = 1.0``) carries the number format
  ``0.0`` so it reads back as a decimal.

A spreadsheet turns some typing into numbers and dates: a number cell formatted as a
percentage reads as the text the cell shows (``5.1 %``); a date is accepted in
``project.date`` and ``project.revision`` only (the job file reads both as text).
"""

from __future__ import annotations

import datetime as dt
import json
import math
import re
import tomllib

from ..render.cells import XLSX_CELL_MAX, neutralise_cell
from .job_keys import OPTION_KEYS, PROJECT_KEYS, RUN_KEYS, TRANSFORMER_KEYS
from .motor_keys import MOTOR_KEYS
from .panel_reader import PANEL_KEYS
from .source_reader import SOURCE_KEYS
from .standby_reader import GENERATOR_KEYS, GENERATOR_RUN_KEYS, TRANSFER_SWITCH_KEYS
from .toml_reader import deep_key_line

README_SHEET = "read me"
DECIMAL_FORMAT = "0.0"  # a whole number that is a decimal in the job file (1.0)
DATE_FORMAT = "yyyy-mm-dd"
DATETIME_FORMAT = "yyyy-mm-dd hh:mm:ss"
TABLE_KEYS = frozenset({"columns"})  # keys whose value is an inline table
DATE_KEYS = frozenset({("project", "date"), ("project", "revision")})  # read as text


# kind -> (its keys in the order the sheet lists them, one row per element?)
SHEETS: dict[str, tuple[tuple[str, ...], bool]] = {
    "project": (PROJECT_KEYS, False),
    "source": (SOURCE_KEYS, False),
    "transformer": (TRANSFORMER_KEYS, True),
    "run": (RUN_KEYS, True),
    "panel": (PANEL_KEYS, True),
    "motor": (MOTOR_KEYS, True),
    "generator": (GENERATOR_KEYS + GENERATOR_RUN_KEYS, False),
    "transfer_switch": (TRANSFER_SWITCH_KEYS, False),
    "options": (OPTION_KEYS, False),
}

# keys every reader takes as text only (a number or a truth value there is refused;
# tests/inputs/test_workbook_cells.py holds each against the job file's reader)
TEXT_KEYS = frozenset(
    {
        "id",
        "from",
        "to",
        "panel",
        "name",
        "site",
        "prepared_by",
        "notes",
        "rules",
        "schedule",
        "conductors",
        "ground",
        "neutral",
        "bonding_jumper",
        "electrode_conductor",
        "main_bonding_jumper",
        "raceway",
        "tap_rule",
        "occupancy",
        "device_type",
        "motor_type",
        "primary_device_type",
        "primary",
        "secondary",
        "series_upstream",
        "voltage_factor",
        "voltage_drop",
    }
)

TEXT_EXPECTED = (
    "text (this cell holds {what}: format the cell as Text, or type an apostrophe before the value)"
)
COLUMNS_EXPECTED = (
    'a column map written as in the job file, e.g. {Ins = "insulation", Notes = "ignore"}'
)


class CellRefused(ValueError):
    """A cell that cannot stand for a job value: what it holds and what was expected."""

    def __init__(self, shown: str, expected: str) -> None:
        super().__init__(expected)
        self.shown = shown
        self.expected = expected


# ---------------------------------------------------------------- writing
def _bare_key(key: str) -> str:
    return key if re.fullmatch(r"[A-Za-z0-9_-]+", key) else _toml_string(key)


def _toml_string(text: str) -> str:
    """A TOML basic string (JSON's escapes are TOML's; DEL is escaped too)."""
    return json.dumps(text, ensure_ascii=False).replace("\x7f", "\\u007f")


def inline_table(value: dict) -> str:
    """``{Ins = "insulation"}``: a table of texts as the job file writes it inline.

    >>> inline_table({"Ins": "insulation", "Cont?": "continuous"})
    '{Ins = "insulation", "Cont?" = "continuous"}'
    """
    parts = []
    for k, v in value.items():
        if not isinstance(k, str) or not isinstance(v, str):
            raise CellRefused(str(value), "a table of texts (header = column)")
        parts.append(f"{_bare_key(k)} = {_toml_string(v)}")
    return "{" + ", ".join(parts) + "}"


def _survives(text: str) -> bool:
    """A text an XLSX cell gives back unchanged (no control characters, no CR)."""
    return len(text) <= XLSX_CELL_MAX - 1 and not re.search(
        r"[\x00-\x08\x0b-\x1f\x7f\ufffe\uffff]", text
    )


def cell_value(kind: str, key: str, value):
    """What to write in the cell of ``key`` for ``value`` (and its number format, or "").

    Raises
    ------
    CellRefused
        A value no cell gives back as it is (a control character, a number of more
        than 15 significant digits, a nested table or list outside ``columns``).
    """
    if isinstance(value, bool):
        return value, ""
    if isinstance(value, int):
        if abs(value) >= 10**15:
            raise CellRefused(str(value), "a whole number of at most 15 digits (a cell's)")
        return value, ""
    if isinstance(value, float):
        if not math.isfinite(value) or float(f"{value:.16g}") != value:  # as openpyxl writes
            raise CellRefused(
                repr(value), "a finite number of at most 16 significant digits (a cell's)"
            )
        return value, DECIMAL_FORMAT if value == int(value) else ""
    if isinstance(value, dt.datetime):  # a cell holds no time zone nor microseconds
        if value.tzinfo is None and not value.microsecond:
            return value, DATETIME_FORMAT
        return _text(str(value)), ""
    if isinstance(value, dt.date):
        return value, DATE_FORMAT
    if isinstance(value, dict) and key in TABLE_KEYS:
        return _text(inline_table(value)), ""
    if isinstance(value, str):
        return _text(value), ""
    if (kind, key) in DATE_KEYS:  # read as text by the job file's reader: str(value)
        return _text(str(value)), ""
    raise CellRefused(str(value), "a text, a number, true or false")


def _text(text: str) -> str:
    if not _survives(text):
        raise CellRefused(text, "a text without control characters (a cell cannot hold them)")
    guarded = neutralise_cell(text)
    if guarded != text or text == "" or text.startswith("'"):
        return "'" + text
    return text


# ---------------------------------------------------------------- reading
def job_value(kind: str, key: str, value, data_type: str, number_format: str):
    """The job value of one stored cell (``data_type`` as openpyxl names it).

    Raises
    ------
    CellRefused
        A spreadsheet error value, a date outside ``project.date``, a number where
        text is expected, a ``columns`` cell that is not a column map.
    """
    if data_type == "e":
        raise CellRefused(str(value), "a value, not a spreadsheet error")
    if isinstance(value, str):
        text = value[1:] if value.startswith("'") else value
        return _table(text) if key in TABLE_KEYS else text
    if isinstance(value, (dt.datetime, dt.date, dt.time, dt.timedelta)):
        return _date(kind, key, value, number_format)
    if key in TEXT_KEYS or key in TABLE_KEYS:
        what = "a truth value" if isinstance(value, bool) else "a number"
        raise CellRefused(_shown(value), TEXT_EXPECTED.format(what=what))
    if isinstance(value, bool):
        return value
    if "%" in number_format:  # 5.1 % typed into a spreadsheet is stored as 0.051
        return f"{value * 100:.12g} %"
    if isinstance(value, int) and number_format == DECIMAL_FORMAT:
        return float(value)
    return value


def _shown(value) -> str:
    if isinstance(value, bool):
        return "TRUE" if value else "FALSE"
    return f"{value:.15g}" if isinstance(value, float) else str(value)


def _date(kind: str, key: str, value, number_format: str):
    if (kind, key) not in DATE_KEYS:
        raise CellRefused(
            str(value),
            TEXT_EXPECTED.format(what="a date or time the spreadsheet made of what was typed")
            if key in TEXT_KEYS
            else "a text or a number, not a date (format the cell as Text and type the value "
            "again)",
        )
    timeless = isinstance(value, dt.datetime) and value.time() == dt.time()
    if timeless and "h" not in number_format.lower():
        return value.date()
    return value


def _table(text: str) -> dict:
    if deep_key_line(text) is not None:  # the parser's time grows with a key's parts
        raise CellRefused(text[:40], COLUMNS_EXPECTED)
    try:
        doc = tomllib.loads("v = " + text)
    except (tomllib.TOMLDecodeError, RecursionError):
        raise CellRefused(text, COLUMNS_EXPECTED) from None
    value = doc.get("v")
    if set(doc) != {"v"} or not isinstance(value, dict):
        raise CellRefused(text, COLUMNS_EXPECTED)
    return value
