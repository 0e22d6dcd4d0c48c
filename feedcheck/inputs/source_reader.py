"""Reader of the [source] table of a job file: its voltage and how strong it is."""

from __future__ import annotations

import math

from ..model import Source
from .ranges import FAULT_RANGE_A
from .toml_reader import Reader

SOURCE_KEYS = ("voltage", "phases", "available_fault", "short_circuit_mva", "x_r")


def read_source(r: Reader, src: dict, given: bool) -> tuple[Source | None, int]:
    """The [source] table and the phases it states (default 3)."""
    r.check_keys(src, "source", SOURCE_KEYS)
    phases = int(r.number(src, "source", "phases", 1, 3, default=3, integer=True) or 3)
    if phases not in (1, 3):
        r.add("source.phases", phases, "1 or 3")
    sv = r.voltage(src, "source", "voltage", phases=phases) if src or given else None
    if sv is not None and "phases" in src and sv.phases != phases and phases in (1, 3):
        r.add(
            "source.phases",
            phases,
            f"{sv.phases} to match the {sv.phases}-phase voltage {sv.text!r}",
        )
    fault_a = _source_fault_a(r, src, sv)
    xr_src = r.number(src, "source", "x_r", 0.1, 100, default=None)
    if fault_a is not None and math.isfinite(fault_a) and xr_src is None and "x_r" not in src:
        r.add(
            "source.x_r", None, "the source X/R (a number, e.g. 6) when the fault current is finite"
        )
    if not sv:
        return None, phases
    return Source(sv, fault_a if fault_a is not None else math.inf, xr_src or 6.0), phases


def _source_fault_a(r: Reader, src: dict, sv) -> float | None:
    """Available fault current [A] from ``available_fault`` or ``short_circuit_mva``."""
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
    return fault_a
