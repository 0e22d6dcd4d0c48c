"""Small job texts for the feed-walk check tests (an invented source, one transformer,
one run and one panel; every field a format slot with a default) and readers of the
JSON output."""

from __future__ import annotations

JOB = """
[project]
name = "feed-walk check test (invented)"

[source]
voltage = "480 V delta"
available_fault = "{source_fault}"
x_r = 6

[[transformer]]
id = "T"
rating = "{kva} kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "{z_pct} %"
x_r = {x_r}
primary_device = "{primary_device} A"
{secondary_device}

[[run]]
id = "R"
from = "T"
to = "P"
length = "{length}"
conductors = "{conductors}"
sets = {sets}
insulation = "{insulation} degC"
raceway = "{raceway}"
ambient = "{ambient} degC"
current_carrying = {current_carrying}
ground = "{ground}"
device = "{device} A"

[[panel]]
id = "P"
rating = "{bus} A"
{main_device}
{interrupting}
load = "{load_kva} kVA"
continuous = "{continuous_kva} kVA"
power_factor = {pf}

[options]
impedance_tolerance = "{tolerance} %"
"""

DEFAULTS = dict(
    source_fault="infinite",
    kva=75,
    z_pct=5.0,
    x_r=3,
    primary_device=150,
    secondary_device='secondary_device = "300 A"',
    length="10 ft",
    conductors="250 kcmil Cu",
    sets=1,
    insulation=75,
    raceway="pvc",
    ambient=30,
    current_carrying=3,
    ground="4 AWG Cu",
    device=300,
    bus=400,
    main_device="",
    interrupting='interrupting = "65 kA"',
    load_kva=60,
    continuous_kva=0,
    pf=0.85,
    tolerance=7.5,
)


def job_text(**overrides) -> str:
    values = dict(DEFAULTS)
    values.update(overrides)
    return JOB.format(**values)


def finding(doc: dict, subject: str, check: str) -> dict:
    """The one finding with this subject and check name."""
    hits = [f for f in doc["findings"] if f["subject"] == subject and f["check"] == check]
    assert len(hits) == 1, (subject, check, [f["check"] for f in doc["findings"]])
    return hits[0]


def node(doc: dict, node_id: str) -> dict:
    return next(n for n in doc["nodes"] if n["id"] == node_id)


def run(doc: dict, run_id: str) -> dict:
    return next(r for r in doc["runs"] if r["id"] == run_id)
