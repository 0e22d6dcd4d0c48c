"""A generated building-scale job (invented: no real site, firm or person) for the
report tests: one 480 V service, transformers each feeding a main panel and a
chain of sub-panels, so the one-line diagram, the charts and the sheets run past
one page."""

from __future__ import annotations

from pathlib import Path

HEAD = """[project]
name = "Generated tower, {n} panels (invented)"
prepared_by = "Test generator"
revision = "1"

[source]
voltage = "480Y/277 V"
available_fault = "35 kA"
x_r = 6
"""

TRANSFORMER = """
[[transformer]]
id = "T{t}"
rating = "150 kVA"
primary = "480 V delta"
secondary = "208Y/120 V"
impedance = "4.5 %"
x_r = 4
primary_device = "225 A"
secondary_device = "500 A"
"""

RUN = """
[[run]]
id = "W{p}"
from = "{frm}"
to = "P{p}"
length = "{length} ft"
conductors = "{size} Cu"
insulation = "75 degC"
raceway = "steel"
ground = "{ground} Cu"
device = "{device} A"
"""

PANEL = """
[[panel]]
id = "P{p}"
rating = "{rating} A"
main_device = "{device} A"
interrupting = "22 kA"
load = "{load} kVA"
"""


def write_scale_job(folder: Path, panels: int = 100, per_transformer: int = 10) -> Path:
    """Write ``panels`` panels (``per_transformer`` on each transformer) to folder/job.toml."""
    parts = [HEAD.format(n=panels)]
    for p in range(1, panels + 1):
        t, k = divmod(p - 1, per_transformer)
        if k == 0:
            parts.append(TRANSFORMER.format(t=t + 1))
            frm, size, ground, device, rating, load = (
                f"T{t + 1}",
                "350 kcmil",
                "3 AWG",
                400,
                400,
                30,
            )
        else:
            frm, size, ground, device, rating, load = f"P{p - k}", "1 AWG", "8 AWG", 100, 100, 8
        parts.append(
            RUN.format(p=p, frm=frm, length=20 + 5 * k, size=size, ground=ground, device=device)
        )
        parts.append(PANEL.format(p=p, rating=rating, device=device, load=load))
    path = folder / "job.toml"
    path.write_text("".join(parts), encoding="utf-8")
    return path
