"""Job keys of issue 13, read in small functions: the no-load tap (nameplate sign), the
lines a single-phase transformer takes on a three-phase feed, and a panel's floor area.

Each reads one key of one ``[[transformer]]`` / ``[[panel]]`` table and records a problem
naming the key, the value and what is expected (exit 2, nothing written).
"""

from __future__ import annotations

from ..units import UnitParseError, parse_quantity
from .toml_reader import Reader

TAP_EXPECTED = (
    'a signed no-load tap, "+2.5 %" (above normal: lowers the secondary, as on the '
    'nameplate) or "-2.5 %" (below normal: raises it), or "0"; an unsigned tap and the '
    "words boost, buck, raise, lower and ± are ambiguous"
)


def tap_pct(r: Reader, t: dict, path: str) -> float:
    """No-load primary tap [%], nameplate convention: + = above normal = more primary
    turns = lower secondary voltage (calc/taps.py). Ambiguous spellings refused."""
    from ..calc.taps import parse_tap_pct

    raw = t.get("tap")
    if raw is None:
        return 0.0
    if isinstance(raw, bool) or not isinstance(raw, (str, int, float)):
        r.add(f"{path}.tap", raw, TAP_EXPECTED)
        return 0.0
    if not isinstance(raw, str):  # a bare TOML number carries no "+" to read
        if raw == 0:
            return 0.0
        r.add(f"{path}.tap", raw, TAP_EXPECTED + ' (write it as text, e.g. "+2.5 %")')
        return 0.0
    try:
        tap = parse_tap_pct(raw)
    except ValueError:
        r.add(f"{path}.tap", raw, TAP_EXPECTED)
        return 0.0
    if abs(tap) > 5 or abs(tap / 2.5 - round(tap / 2.5)) > 1e-9:
        r.add(f"{path}.tap", raw, "a no-load tap of -5, -2.5, 0, +2.5 or +5 %")
        return 0.0
    return tap


# how users write the lines a single-phase unit takes -> the connection code
PAIR_WORDS = {"AB": "AB", "BA": "AB", "BC": "BC", "CB": "BC", "CA": "CA", "AC": "CA"}


def phases_connected(r: Reader, t: dict, path: str, prim, what: str = "transformer") -> str:
    """``phases_connected = "A-B"``: the pair of lines a single-phase transformer (or a
    single-phase panel, ``what="panel"``) takes on a three-phase feed; "" when not given
    (assigned to balance by the checks)."""
    raw = t.get("phases_connected")
    if raw is None:
        return ""
    expected = 'a pair of lines "A-B", "B-C" or "C-A"'
    key_of = {"transformer": "primary", "panel": "voltage"}[what]
    if prim is None and what == "panel":
        r.add(
            f"{path}.phases_connected",
            raw,
            'no value without a single-phase voltage (add voltage = "208 V 1ph" or '
            '"240/120 V"; a panel without one takes its feed\'s three phases)',
        )
        return ""
    if prim is not None and prim.phases != 1:
        r.add(
            f"{path}.phases_connected",
            raw,
            f"no value: only a single-phase {what} takes a pair of lines (this {what}'s "
            f"{key_of} {prim.text!r} is three-phase)",
        )
        return ""
    text = raw.upper() if isinstance(raw, str) else ""
    key = "".join(ch for ch in text if ch not in " -–/_")
    if key in PAIR_WORDS:
        return PAIR_WORDS[key]
    r.add(f"{path}.phases_connected", raw, expected)
    return ""


_AREA_WORDS = (("sq ft", "ft**2"), ("sq. ft", "ft**2"), ("ft2", "ft**2"), ("m2", "m**2"))


def area_m2(r: Reader, t: dict, path: str) -> float | None:
    """``area = "12000 ft2"``: floor area the panel serves (outside dimensions), for the
    minimum lighting load of Table 220.12 [m²]; None when not given."""
    raw = t.get("area")
    if raw is None:
        return None
    text = raw
    if isinstance(raw, str):
        for word, unit in _AREA_WORDS:
            text = text.replace(word, unit)
    expected = 'a floor area with its unit, e.g. "12000 ft2" or "1100 m2" (1 m2 to 1,000,000 m2)'
    try:
        area_m2 = parse_quantity(text, "area") / 1e6
    except UnitParseError:
        r.add(f"{path}.area", raw, expected)
        return None
    if not 1.0 <= area_m2 <= 1e6:
        r.add(f"{path}.area", raw, expected)
        return None
    return area_m2


def locked_rotor_check(r: Reader, t: dict, path: str, lra, fla) -> None:
    """A locked-rotor current below the full-load current is an input error: it would
    give a silently tiny starting dip (calc/motors.locked_rotor_multiple)."""
    if lra is None or fla is None:
        return
    from ..calc.motors import locked_rotor_multiple

    try:
        locked_rotor_multiple(lra, fla)
    except ValueError:
        r.add(
            f"{path}.locked_rotor",
            t.get("locked_rotor"),
            f"a locked-rotor current at least the full-load current ({fla:g} A); "
            "typically 5 to 8 times it",
        )


def motor_branch(r: Reader, t: dict, path: str) -> dict:
    """The motor's branch run (``length`` and ``conductors``, optional ``raceway``) for
    the starting dip at its terminals; both or neither."""
    from ..model import RACEWAYS

    if "length" not in t and "conductors" not in t:
        return {}
    length = r.qty(t, path, "length", "length")
    size, material = r.conductor(t, path, "conductors")
    raceway = r.text(t, path, "raceway", required=False, default="steel")
    if raceway not in RACEWAYS:
        r.add(f"{path}.raceway", raceway, "one of " + ", ".join(RACEWAYS))
    if length is not None and not 0 < length <= 2000:
        r.add(f"{path}.length", t.get("length"), "a branch length above 0 and up to 2000 m")
    return {"length_m": length, "size": size, "material": material or "cu", "raceway": raceway}
