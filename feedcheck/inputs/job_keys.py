"""The keys of each table of a job file (the TOML tables and the workbook's sheets).

Kept apart from the readers so the workbook reader and writer name the same keys
without importing the job reader.
"""

from __future__ import annotations

PROJECT_KEYS = ("name", "site", "prepared_by", "date", "revision", "rules", "notes")
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
    "phases_connected",
    "primary_device_type",
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
    "tap_rule",
    "bonding_jumper",
    "neutral",
)
OPTION_KEYS = (
    "impedance_tolerance",
    "voltage_factor",
    "voltage_drop",
    "feeder_drop",
    "branch_drop",
    "total_drop",
)
TOP_KEYS = (
    "project",
    "source",
    "transformer",
    "run",
    "panel",
    "motor",
    "options",
    "generator",
    "transfer_switch",
)
