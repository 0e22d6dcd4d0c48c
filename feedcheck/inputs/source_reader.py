"""Reader of the [source] table of a job file: its voltage and how strong it is."""

from __future__ import annotations

import math
from dataclasses import replace

from ..calc.service import service_through_fault
from ..model import ServiceTransformer, Source
from .defaults import typical_x_r
from .ranges import FAULT_RANGE_A
from .toml_reader import Reader

SOURCE_KEYS = (
    "voltage",
    "phases",
    "available_fault",
    "short_circuit",
    "short_circuit_mva",
    "x_r",
    "service_transformer",
    "service_impedance",
    "service_x_r",
    "primary_short_circuit",
    "primary_x_r",
    "electrode_conductor",
    "main_bonding_jumper",
)
# the ways a source's strength is stated; exactly one of them
STRENGTH_KEYS = ("available_fault", "short_circuit", "short_circuit_mva", "service_transformer")
SERVICE_KEYS = ("service_impedance", "service_x_r", "primary_short_circuit", "primary_x_r")


def read_source(r: Reader, src: dict, given: bool) -> tuple[Source | None, int]:
    """The [source] table and the phases it states (default 3)."""
    r.check_keys(src, "source", SOURCE_KEYS)
    if "service_transformer" in src:
        return _service_source(r, src)
    phases, sv = _voltage(r, src, medium=True) if src or given else (3, None)
    fault_a = _source_fault_a(r, src, sv)
    xr_src = r.number(src, "source", "x_r", 0.1, 100, default=None)
    if fault_a is not None and math.isfinite(fault_a) and xr_src is None and "x_r" not in src:
        r.add(
            "source.x_r", None, "the source X/R (a number, e.g. 6) when the fault current is finite"
        )
    for key in SERVICE_KEYS:
        if key in src:
            r.add(f"source.{key}", src[key], "this key only with service_transformer")
    if not sv:
        return None, phases
    sc_key = _sc_key(src)
    source = Source(
        sv,
        fault_a if fault_a is not None else math.inf,
        xr_src or 6.0,
        given_as="short-circuit" if sc_key else "fault",
        short_circuit_va=r.qty(src, "source", sc_key, "power", apparent_only=True)
        if sc_key
        else None,
    )
    return _service_grounding(r, src, source), phases


def _voltage(r: Reader, src: dict, medium: bool):
    """The stated phases (default 3) and the voltage, which must agree."""
    phases = int(r.number(src, "source", "phases", 1, 3, default=3, integer=True) or 3)
    if phases not in (1, 3):
        r.add("source.phases", phases, "1 or 3")
    sv = r.voltage(src, "source", "voltage", phases=phases, medium=medium)
    if sv is not None and "phases" in src and sv.phases != phases and phases in (1, 3):
        r.add(
            "source.phases",
            phases,
            f"{sv.phases} to match the {sv.phases}-phase voltage {sv.text!r}",
        )
    return phases, sv


def _sc_key(src: dict) -> str:
    """The key the job states the short-circuit power under ("" when none)."""
    return next((k for k in ("short_circuit", "short_circuit_mva") if k in src), "")


def _service_source(r: Reader, src: dict) -> tuple[Source | None, int]:
    """A service described by the utility's transformer: kVA, %Z, X/R and the primary's
    short-circuit power (infinite unless stated); its through-fault is the source's."""
    for key in ("available_fault", "short_circuit", "short_circuit_mva", "x_r"):
        if key in src:
            r.add(
                f"source.{key}",
                src[key],
                "no " + key + " with service_transformer (the through-fault is computed "
                "from the service transformer; its X/R is service_x_r)",
            )
    phases, sv = _voltage(r, src, medium=False)
    rating = r.qty(src, "source", "service_transformer", "power", apparent_only=True)
    if rating is not None and not (1e3 <= rating <= 10e6):
        r.add("source.service_transformer", src.get("service_transformer"), _RATING)
        rating = None
    z = r.qty(src, "source", "service_impedance", "percent")
    if z is not None and not (0.5 <= z <= 25):
        r.add("source.service_impedance", src.get("service_impedance"), _IMPEDANCE)
        z = None
    xr = r.number(src, "source", "service_x_r", 0.1, 50, default=None)
    psc = r.qty(
        src,
        "source",
        "primary_short_circuit",
        "power",
        required=False,
        default=math.inf,
        apparent_only=True,
        allow_inf=True,
    )
    pxr = r.number(src, "source", "primary_x_r", 0.1, 100, default=None)
    if psc is not None and math.isfinite(psc) and pxr is None and "primary_x_r" not in src:
        r.add("source.primary_x_r", None, "the primary system's X/R (e.g. 10) when finite")
    if sv is None or rating is None or z is None or psc is None:
        return None, phases
    row = ""
    if xr is None:
        xr, row = typical_x_r(rating)
    service = ServiceTransformer(rating, z, xr, psc, pxr or 10.0, row)
    fault_a, x_r = service_through_fault(
        rating, sv.voltage_ll_v, z, xr, sv.phases, psc, pxr or 10.0
    )
    source = Source(sv, fault_a, x_r, given_as="service-transformer", service=service)
    return _service_grounding(r, src, source), phases


_RATING = "a service transformer rating from 1 kVA to 10 MVA"
_IMPEDANCE = "a percent impedance from 0.5 % to 25 %"


def _service_grounding(r: Reader, src: dict, source: Source) -> Source:
    """The service's grounding electrode conductor and main bonding jumper, if stated
    (a service point only: not at a medium-voltage source)."""
    out = {}
    for key in ("electrode_conductor", "main_bonding_jumper"):
        if key not in src:
            continue
        if source.medium_voltage:
            r.add(f"source.{key}", src[key], "no " + key + " at a medium-voltage source")
            continue
        size, material = r.conductor(src, "source", key, default_material="cu")
        out[key] = size
        out[key + "_material"] = material
    return replace(source, **out) if out else source


def _source_fault_a(r: Reader, src: dict, sv) -> float | None:
    """Available fault current [A] from ``available_fault`` or ``short_circuit``
    (``short_circuit_mva`` its former spelling)."""
    sc_key = _sc_key(src)
    if "short_circuit" in src and "short_circuit_mva" in src:
        r.add("source.short_circuit_mva", src["short_circuit_mva"], "short_circuit alone")
    elif "available_fault" in src and sc_key:
        r.add(
            f"source.{sc_key}",
            src[sc_key],
            f"either available_fault or {sc_key}, not both",
        )
    fault_a: float | None = None
    if sc_key:
        mva = r.qty(src, "source", sc_key, "power", apparent_only=True)
        if mva is not None and sv is not None:
            fault_a = mva / (math.sqrt(3) * sv.voltage_ll_v if sv.phases == 3 else sv.voltage_ll_v)
    elif src:
        fault_a = r.qty(src, "source", "available_fault", "current", allow_inf=True)
    if (
        fault_a is not None
        and math.isfinite(fault_a)
        and not (FAULT_RANGE_A[0] <= fault_a <= FAULT_RANGE_A[1])
    ):
        key = sc_key or "available_fault"
        r.add(
            f"source.{key}",
            src.get(key),
            "an available fault current from 100 A to 1000 kA, or 'infinite'",
        )
    return fault_a
