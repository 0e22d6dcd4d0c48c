"""How figures look to a person: the one place for display units, number formatting,
status words and the labels of node figures.

Every renderer (terminal text, PDF, and whatever comes next) formats through this
module; none keeps its own copy. The rules:

* lengths are shown in the unit the results name (:attr:`Results.length_unit`,
  metres or feet), with the other unit beside them where a drawing has room;
* fault currents in kA, other currents in A;
* no figure is shown as ``inf``/``∞`` (an unbounded figure reads "unlimited"), as
  ``-0.0`` or with an exponent; a missing figure is a dash.

Nothing here computes an electrical figure: scale factors only change the unit a
stored SI figure is shown in.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

M_PER_FT = 0.3048  # international foot, exact by definition (1959 yard and pound agreement)
MISSING = "–"
UNLIMITED = "unlimited"
UNBOUNDED_BELOW = "unbounded"
TINY = 5e-7  # magnitudes below this are shown as zero (rounding noise, not a figure)

# ------------------------------------------------------------------ status words

STATUS_WORD = {"fail": "FAIL", "warn": "WARN", "ok": "ok", "info": "info"}
STATUS_MEANING = {
    "fail": "checks that failed",
    "warn": "checks that need attention",
    "ok": "checks that passed",
    "info": "figures reported for information",
}


def unconfirmed_line(count: int) -> str:
    """How many figures rest on table rows not confirmed in a published copy.

    >>> unconfirmed_line(0), unconfirmed_line(1)
    ('0 figures depend on unconfirmed values', '1 figure depends on unconfirmed values')
    """
    if count == 1:
        return "1 figure depends on unconfirmed values"
    return f"{count} figures depend on unconfirmed values"


def status_word(status: str, loud: bool = False) -> str:
    """The word shown for a finding's status (``loud``: capitals, for headline counts).

    >>> status_word("fail"), status_word("ok"), status_word("ok", loud=True)
    ('FAIL', 'ok', 'OK')
    """
    word = STATUS_WORD.get(str(status).lower(), str(status))
    return word.upper() if loud else word


def is_flagged(status: str) -> bool:
    """Statuses a reader must act on (shown in bold, tinted, listed first)."""
    return str(status).lower() in ("fail", "warn")


# ------------------------------------------------------------------ numbers


@dataclass(frozen=True)
class NumberStyle:
    """Decimals by magnitude: ``steps`` is ((at least, decimals), …), largest first;
    below the last step three significant digits; ``zero`` is how 0 is written."""

    steps: tuple[tuple[float, int], ...]
    zero: str


REPORT = NumberStyle(((1000.0, 0), (100.0, 1), (1.0, 2)), "0")
TERMINAL = NumberStyle(((100.0, 0), (10.0, 1), (1.0, 2)), "0")


def _no_minus_zero(text: str) -> str:
    if text.startswith("-") and not any(c in "123456789" for c in text):
        return text[1:]
    return text


def _unbounded(v: float) -> str:
    return UNLIMITED if v > 0 else UNBOUNDED_BELOW


def number(v: object, style: NumberStyle = REPORT) -> str:
    """A figure for people: thousands separators, decimals by magnitude, no exponent.

    Text passes through; None and NaN are a dash; infinity reads "unlimited".

    >>> number(30_000.0), number(208.21), number(2.5), number(0.01234)
    ('30,000', '208.2', '2.50', '0.0123')
    >>> number(208.21, TERMINAL), number(0.0, TERMINAL), number(2.13e-14), number(-1e-9)
    ('208', '0', '0', '0')
    >>> number(float("inf")), number(None), number(4.5e-5), number(15.0), number(31.25)
    ('unlimited', '–', '0.000045', '15', '31.25')
    """
    if v is None:
        return MISSING
    if isinstance(v, str):
        return v
    if isinstance(v, bool):
        return str(v)
    v = float(v)  # type: ignore[arg-type]
    if math.isnan(v):
        return MISSING
    if math.isinf(v):
        return _unbounded(v)
    a = abs(v)
    if a < TINY:
        return style.zero
    if v.is_integer() and a < 1e15:  # a whole figure is not padded ("15 A", not "15.00 A")
        return f"{int(v):,}"
    for at_least, decimals in style.steps:
        if a >= at_least:
            return _no_minus_zero(f"{v:,.{decimals}f}")
    decimals = 2 - math.floor(math.log10(a))  # three significant digits
    text = f"{v:.{decimals}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return _no_minus_zero(text)


def precise(v: object, digits: int = 10) -> str:
    """A figure to ``digits`` significant digits, no separators and no exponent (for
    telling two nearly equal figures apart); at most 12 decimals.

    >>> precise(6009.123456789), precise(1e-7 / 3), precise("inf"), precise(None)
    ('6009.123457', '0.000000033333', 'unlimited', '–')
    """
    if v is None:
        return MISSING
    try:
        f = float(v)  # type: ignore[arg-type]
    except (TypeError, ValueError):
        return str(v)
    if math.isnan(f):
        return MISSING
    if math.isinf(f):
        return _unbounded(f)
    if f == 0:
        return "0"
    decimals = min(12, max(0, digits - 1 - math.floor(math.log10(abs(f)))))
    text = f"{f:.{decimals}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return _no_minus_zero(text)


def fixed(v: object, decimals: int, scale: float = 1.0) -> str:
    """``v × scale`` with a fixed number of decimals and thousands separators.

    >>> fixed(12_345.0, 2, 1e-3), fixed(-0.001, 2), fixed(float("inf"), 1), fixed(None, 1)
    ('12.35', '0.00', 'unlimited', '–')
    """
    if v is None or isinstance(v, str):
        return MISSING if v is None else v
    v = float(v)  # type: ignore[arg-type]
    if math.isnan(v):
        return MISSING
    if math.isinf(v):
        return _unbounded(v)
    return _no_minus_zero(f"{v * scale:,.{decimals}f}")


def plain(v: float) -> str:
    """A round figure (an axis tick) in its shortest form, never with an exponent.

    >>> plain(2.5), plain(100.0), plain(1e6), plain(-0.0)
    ('2.5', '100', '1000000', '0')
    """
    text = f"{v:.10f}".rstrip("0").rstrip(".")
    return _no_minus_zero(text)


def whole_or_number(v: object) -> str:
    """A total: whole figures as integers with separators, others as :func:`number`.

    >>> whole_or_number(3840.0), whole_or_number(12.5)
    ('3,840', '12.50')
    """
    if isinstance(v, float) and v.is_integer() and abs(v) < 1e15:
        return f"{int(v):,}"
    return number(v)


def kiloamps(current_a: object) -> str:
    """A fault current in kA with its unit ("12.35 kA"); unlimited or a dash as text.

    >>> kiloamps(12_345.0), kiloamps(float("inf")), kiloamps(None)
    ('12.35 kA', 'unlimited', '–')
    """
    shown = fixed(current_a, 2, 1e-3)
    if current_a is None or not math.isfinite(float(current_a)):  # type: ignore[arg-type]
        return shown
    return f"{shown} kA"


def kilovoltamps(va: object) -> str:
    """An apparent power [VA] in kVA ("75 kVA", "112.5 kVA").

    >>> kilovoltamps(75_000.0), kilovoltamps(112_500.0)
    ('75 kVA', '112.5 kVA')
    """
    if not isinstance(va, (int, float)) or isinstance(va, bool):
        return number(va)
    return f"{number(va * 1e-3)} kVA"


def milliohms(z_ohm: object) -> str:
    """An impedance part [Ω] in mΩ, three decimals ("28.915").

    >>> milliohms(0.028915), milliohms(-0.0), milliohms(1.5)
    ('28.915', '0.000', '1,500.000')
    """
    return fixed(z_ohm, 3, 1e3)


def percent(v: object, decimals: int = 2) -> str:
    """A percentage with its sign ("2.31 %").

    >>> percent(2.314), percent(97.0, 0)
    ('2.31 %', '97 %')
    """
    return f"{fixed(v, decimals)} %"


def amps(v: object, decimals: int = 1) -> str:
    """A current in A ("208.2 A").

    >>> amps(208.17)
    '208.2 A'
    """
    return f"{fixed(v, decimals)} A"


def bolted_fault_words(phases: object) -> str:
    """The bolted fault a node's maximum and minimum figures are: three-phase on a
    three-phase system, line-to-line on a single-phase one.

    >>> bolted_fault_words(3), bolted_fault_words(1)
    ('three-phase', 'line-to-line (single-phase system)')
    """
    return "line-to-line (single-phase system)" if phases == 1 else "three-phase"


# ------------------------------------------------------------------ lengths

# unit → (metres per unit, decimals shown)
LENGTH_UNITS = {"m": (1.0, 1), "ft": (M_PER_FT, 0)}


@dataclass(frozen=True)
class Display:
    """Display choices of one set of results: the length unit (``"m"`` or ``"ft"``).

    >>> Display("ft").length(30.48), Display("m").length_pair(12.19)
    ('100 ft', '12.2 m (40 ft)')
    """

    length_unit: str = "m"

    def __post_init__(self) -> None:
        if self.length_unit not in LENGTH_UNITS:
            raise ValueError(f"length unit {self.length_unit!r}: expected 'm' or 'ft'")

    @property
    def other_length_unit(self) -> str:
        return "ft" if self.length_unit == "m" else "m"

    def length_value(self, length_m: float) -> float:
        """A length [m] in the display unit (a number, for axes and tables)."""
        return length_m / LENGTH_UNITS[self.length_unit][0]

    def length_figure(self, length_m: object, unit: str | None = None) -> str:
        """A length [m] as a figure in ``unit`` (default: the display unit), no unit text."""
        unit = unit or self.length_unit
        per, decimals = LENGTH_UNITS[unit]
        if length_m is None or isinstance(length_m, str):
            return fixed(length_m, decimals)
        return fixed(float(length_m) / per, decimals)  # type: ignore[arg-type]

    def length(self, length_m: object, unit: str | None = None, decimals: int | None = None) -> str:
        """A length [m] with its unit ("12.2 m" or "40 ft"); ``decimals``: instead of the
        unit's usual number."""
        unit = unit or self.length_unit
        if decimals is not None and isinstance(length_m, (int, float)):
            return f"{fixed(float(length_m) / LENGTH_UNITS[unit][0], decimals)} {unit}"
        return f"{self.length_figure(length_m, unit)} {unit}"

    def length_pair(self, length_m: float) -> str:
        """A length in the display unit with the other one in brackets.

        >>> Display("ft").length_pair(28.956), Display("ft").length(1.0, decimals=1)
        ('95 ft (29.0 m)', '3.3 ft')
        """
        return f"{self.length(length_m)} ({self.length(length_m, self.other_length_unit)})"


DEFAULT_DISPLAY = Display()


def display_for(results: object) -> Display:
    """The display choices the results name (metres when they name none)."""
    return Display(getattr(results, "length_unit", "m") or "m")


def finding_figures(
    value: object,
    limit: object,
    unit: str,
    display: Display = DEFAULT_DISPLAY,
    style: NumberStyle = REPORT,
) -> tuple[str, str]:
    """(figure, limit) of a finding as shown, each with its unit ("" when absent); a
    length (unit ``m``) in the display's length unit.

    >>> finding_figures(18.288, 7.62, "m", Display("ft"))
    ('60 ft', '25 ft')
    >>> finding_figures(31.25, None, "A"), finding_figures(None, 5.0, "%")
    (('31.25 A', ''), ('', '5 %'))
    >>> finding_figures(250.0, float("inf"), "A")
    ('250 A', 'unlimited')
    """

    def one(v: object) -> str:
        if v is None:
            return ""
        shown = number(v, style)
        if shown in (UNLIMITED, UNBOUNDED_BELOW, MISSING):
            return shown
        if unit == "m" and isinstance(v, (int, float)) and not isinstance(v, bool):
            return display.length(v)
        return f"{shown} {unit}".rstrip()

    return one(value), one(limit)


# ------------------------------------------------------------------ node labels


@dataclass(frozen=True)
class Figure:
    """How one node figure is labelled and shown: report label, terminal column
    header, display unit, scale from the stored SI figure, decimals."""

    label: str
    column: str
    unit: str
    scale: float = 1.0
    decimals: int = 1


FIGURES: dict[str, Figure] = {
    "load_va": Figure("Demand load", "load kVA", "kVA", 1e-3, 1),
    "load_a": Figure("Demand current", "load A", "A", 1, 1),
    "design_current_a": Figure("Design current (continuous at 125 %)", "design A", "A", 1, 1),
    "rated_primary_a": Figure("Rated primary current", "rated pri A", "A", 1, 1),
    "rated_secondary_a": Figure("Rated secondary current", "rated sec A", "A", 1, 1),
    "loading_pct": Figure("Loading", "loading %", "%", 1, 1),
    "regulation_pct": Figure("Regulation (exact phasor)", "reg %", "%", 1, 3),
    "regulation_approx_pct": Figure("Regulation (approximate)", "reg approx %", "%", 1, 3),
    "x_r_transformer": Figure("Transformer X/R", "X/R xfmr", "", 1, 2),
    "fault_max_a": Figure("Fault current, maximum", "Isc max kA", "kA", 1e-3, 2),
    "fault_min_a": Figure("Fault current, minimum", "Isc min kA", "kA", 1e-3, 2),
    "fault_lg_min_a": Figure(
        "Line-to-ground fault current, minimum", "I L-G min kA", "kA", 1e-3, 2
    ),
    "fault_ln_max_a": Figure(
        "Line-to-neutral fault current, maximum", "I L-N max kA", "kA", 1e-3, 2
    ),
    "fault_lg_max_a": Figure(
        "Line-to-ground fault current, maximum", "I L-G max kA", "kA", 1e-3, 2
    ),
    "fault_duty_sym_a": Figure("Governing maximum fault current", "duty sym kA", "kA", 1e-3, 2),
    "fault_duty_x_r": Figure("X/R of the governing fault", "duty X/R", "", 1, 2),
    "fault_duty_mf": Figure("Asymmetry multiplying factor", "MF", "", 1, 3),
    "fault_duty_a": Figure("Interrupting duty (governing × MF)", "duty kA", "kA", 1e-3, 2),
    "x_r": Figure("X/R at the fault point", "X/R", "", 1, 2),
    "peak_a": Figure("Peak asymmetrical current", "peak kA", "kA", 1e-3, 2),
    "asym_rms_a": Figure("Asymmetrical rms current", "asym kA", "kA", 1e-3, 2),
    "fault_ptp_a": Figure("Fault current, point-to-point method", "p-t-p kA", "kA", 1e-3, 2),
    "fault_ptp_diff_pct": Figure("Point-to-point against ohmic", "p-t-p diff %", "%", 1, 1),
    "vdrop_pct": Figure("Voltage drop from the source", "drop %", "%", 1, 2),
    "voltage_pct": Figure("Voltage at the node", "V %", "% of nominal", 1, 2),
    "voltage_v": Figure("Voltage at the node (volts)", "V", "V", 1, 1),
    "segment_vdrop_pct": Figure("Voltage drop in the feeding run", "run drop %", "%", 1, 2),
    "service_transformer_va": Figure("Utility transformer rating", "svc kVA", "kVA", 1e-3, 1),
    "service_z_pct": Figure("Utility transformer impedance", "svc Z %", "%", 1, 2),
    "service_x_r": Figure("Utility transformer X/R", "svc X/R", "", 1, 2),
    "service_primary_sc_va": Figure(
        "Short-circuit power at its primary", "svc prim MVA", "MVA", 1e-6, 1
    ),
    "conductor_vdrop_pct": Figure(
        "Voltage drop in the conductors since the transformer secondary", "cond drop %", "%", 1, 2
    ),
    "transformer_drop_pct": Figure("Voltage drop in the transformer", "xfmr drop %", "%", 1, 2),
    "fault_primary_max_a": Figure(
        "Fault current at the primary terminals, maximum", "Isc pri max kA", "kA", 1e-3, 2
    ),
    "fault_primary_min_a": Figure(
        "Fault current at the primary terminals, minimum", "Isc pri min kA", "kA", 1e-3, 2
    ),
    "fault_motor_a": Figure("Motor contribution to the fault", "motors kA", "kA", 1e-3, 2),
    "fault_duty_case": Figure("Governing fault case", "duty case", ""),
}
# the node figures of the terminal summary, in column order
TERMINAL_FIGURES = (
    "load_va",
    "fault_max_a",
    "fault_duty_a",
    "fault_min_a",
    "fault_lg_min_a",
    "x_r",
    "peak_a",
    "fault_ptp_a",
    "voltage_pct",
    "vdrop_pct",
)
# unit suffix of a figure's key → the unit shown (first match wins)
SUFFIX_UNITS = (
    ("_kcmil", "kcmil"),
    ("_mm2", "mm²"),
    ("_pct", "%"),
    ("_ohm", "Ω"),
    ("_var", "var"),
    ("_va", "VA"),
    ("_a", "A"),
    ("_v", "V"),
    ("_w", "W"),
    ("_m", "m"),
    ("_s", "s"),
    ("_c", "°C"),
)


def figure_label(key: str) -> tuple[str, str]:
    """(label, unit) of a figure's key; a key not in :data:`FIGURES` gets a label made
    from the key and the unit of its suffix.

    >>> figure_label("fault_max_a"), figure_label("new_thing_ohm")
    (('Fault current, maximum', 'kA'), ('New thing', 'Ω'))
    """
    if key in FIGURES:
        return FIGURES[key].label, FIGURES[key].unit
    unit, stem = "", key
    for suffix, u in SUFFIX_UNITS:
        if key.endswith(suffix):
            unit, stem = u, key[: -len(suffix)]
            break
    return stem.replace("_", " ").strip().capitalize() or key, unit


def node_figure(key: str, value: object) -> tuple[str, str, str]:
    """(label, shown value, unit) of one node figure.

    >>> node_figure("fault_max_a", 12_345.0), node_figure("new_thing_ohm", 0.0123)
    (('Fault current, maximum', '12.35', 'kA'), ('New thing', '0.0123', 'Ω'))
    """
    label, unit = figure_label(key)
    fig = FIGURES.get(key)
    numeric = isinstance(value, (int, float)) and not isinstance(value, bool)
    if fig is not None and numeric:
        return label, fixed(value, fig.decimals, fig.scale), unit
    return label, number(value), unit


def figure_cell(key: str, value: object) -> str:
    """One node figure in its terminal column (scaled, fixed decimals)."""
    fig = FIGURES[key]
    return fixed(value, fig.decimals, fig.scale)


SOURCE_NODE_ID = "source"


def node_title(node_id: str, kind: str, voltage: str) -> str:
    """The heading of a node in drawings ("LP1 — panel, 208Y/120 V"; "Source, 480 V").

    >>> node_title("LP1", "panel", "208Y/120 V"), node_title("source", "source", "480 V")
    ('LP1 — panel, 208Y/120 V', 'Source, 480 V')
    """
    if kind == "source" and node_id == SOURCE_NODE_ID:
        return f"Source, {voltage}"
    return f"{node_id} — {kind}, {voltage}"


def service_caption(values: dict) -> str:
    """The source's utility transformer as the one-line states it ("" when the job
    states the source by its fault current or short-circuit power).

    >>> service_caption({"service_transformer_va": 750e3, "service_z_pct": 5.75,
    ...                  "service_primary_sc_va": float("inf")})
    'service: utility transformer 750 kVA, 5.75 % (infinite primary)'
    """
    if "service_transformer_va" not in values:
        return ""
    sc = values.get("service_primary_sc_va", float("inf"))
    primary = "infinite primary" if sc == float("inf") else f"primary {sc / 1e6:g} MVA"
    return (
        f"service: utility transformer {values['service_transformer_va'] / 1000:g} kVA, "
        f"{values['service_z_pct']:g} % ({primary})"
    )


def node_caption(node_id: str, kind: str) -> str:
    """A node named in running text ("LP1 (panel)")."""
    return f"{node_id} ({kind})"
