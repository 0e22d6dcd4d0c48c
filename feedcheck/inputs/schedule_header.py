"""The header row of a panel schedule: column names matched forgivingly, units read.

Case, spaces, underscores and hyphens do not matter; a unit goes in square or round
brackets (``load [VA]``, ``length (m)``).
"""

from __future__ import annotations

import re
from functools import lru_cache

from ..errors import ProblemList
from ..units import SCHEDULE_HEADER_UNITS

# canonical column -> spellings (normalised: lower case, single spaces)
ALIASES: dict[str, tuple[str, ...]] = {
    "panel": ("panel", "panel id", "panelboard"),
    "circuit": (
        "circuit",
        "circuits",
        "circuit no",
        "circuit number",
        "ckt",
        "ckt no",
        "no",
        "number",
        "space",
        "cct",
    ),
    "description": (
        "description",
        "desc",
        "load description",
        "circuit description",
        "name",
        "served",
        "load served",
    ),
    "poles": ("poles", "pole", "p", "no of poles"),
    "load": ("load", "connected load", "load va", "va", "load kva", "kva", "load w", "watts"),
    "pf": ("pf", "power factor"),
    "kind": ("kind", "load kind", "type", "load type", "class"),
    "continuous": ("continuous", "cont", "continuous load"),
    "breaker": (
        "breaker",
        "breaker rating",
        "breaker size",
        "brkr",
        "bkr",
        "cb",
        "device",
        "ocpd",
        "trip",
        "amps",
        "amp",
        "rating",
    ),
    "conductor": ("conductor", "conductors", "wire", "wires", "wire size", "conductor size"),
    "insulation": ("insulation", "insulation rating", "insulation temperature"),
    "termination": ("termination", "terminations", "termination rating"),
    "ground": ("ground", "egc", "grounding conductor", "equipment ground"),
    "current_carrying": ("current carrying", "current carrying conductors", "ccc"),
    "ambient": ("ambient", "ambient temperature"),
    "raceway": ("raceway", "conduit", "raceway type"),
    "length": ("length", "run length", "one way length", "distance"),
    "system": ("system", "voltage system", "panel voltage", "voltage"),
    "aic": ("aic", "kaic", "interrupting rating", "breaker aic"),
}
# a unit written as the header's last word (``Load VA``, ``Length ft``): name → unit
_UNIT_WORDS = {
    "load": {"va": "va", "kva": "kva", "w": "w", "watts": "w", "kw": "kw", "a": "a"},
    "length": {"ft": "ft", "feet": "ft", "m": "m"},
    "breaker": {"a": "a", "amps": "a", "amp": "a"},
}
# header names standing for their unit: ``VA`` is a load in VA, ``Amps`` a breaker in A
_NAME_UNITS = {
    "va": "va",
    "kva": "kva",
    "watts": "w",
    "load va": "va",
    "load kva": "kva",
    "load w": "w",
    "amps": "a",
    "amp": "a",
}
IGNORE = "ignore"  # a user mapping's word for a column to be skipped knowingly
# column -> the quantity of its header unit (the others are temperatures)
_QUANTITY = {"load": "load", "length": "length", "breaker": "current"}
REQUIRED = ("circuit", "load", "breaker", "conductor", "length")
_LOOKUP = {a: k for k, names in ALIASES.items() for a in names}
_UNIT_RE = re.compile(r"^(?P<name>.*?)\s*[\[(]\s*(?P<unit>[^\])]*?)\s*[\])]\s*$")


def normalise_header(text: object) -> tuple[str, str]:
    """``"Load_[VA] "`` → ``("load", "va")``: name and unit, lower case, single spaces.

    Examples
    --------
    >>> normalise_header("Length (ft)")
    ('length', 'ft')
    >>> normalise_header("  CURRENT_carrying  ")
    ('current carrying', '')
    """
    return _normalised("" if text is None else str(text))


@lru_cache(maxsize=4096)  # a folder's files repeat the same few header texts
def _normalised(raw: str) -> tuple[str, str]:
    match = _UNIT_RE.match(raw.strip())
    name, unit = (match.group("name"), match.group("unit")) if match else (raw, "")
    name = " ".join(re.sub(r"[_\-.#:?]+", " ", name).lower().split())
    return name, unit.strip().lower().replace("°", "")


def _split_unit_word(name: str, unit: str) -> tuple[str, str]:
    """``("load va", "")`` → ``("load", "va")``; a name standing for its unit keeps it."""
    if unit:
        return name, unit
    if name in _NAME_UNITS:
        return name, _NAME_UNITS[name]
    head, _, last = name.rpartition(" ")
    key = _LOOKUP.get(head)
    if head and key in _UNIT_WORDS and last in _UNIT_WORDS[key]:
        return head, _UNIT_WORDS[key][last]
    return name, unit


def parse_column_map(text: str, where: str) -> dict[str, str]:
    """``"Cont?=continuous, Ins=insulation"`` → {normalised header: column} (a column of
    :data:`ALIASES`, or ``ignore``); raises ValueError naming what is wrong.

    >>> parse_column_map("Cont?=continuous, Ins=insulation, Notes=ignore", "--columns")
    {'cont': 'continuous', 'ins': 'insulation', 'notes': 'ignore'}
    """
    out: dict[str, str] = {}
    for part in filter(None, (piece.strip() for piece in re.split(r"[,;]", text))):
        head, eq, col = part.partition("=")
        key = _LOOKUP.get(normalise_header(col)[0]) if col.strip().lower() != IGNORE else IGNORE
        if not eq or not head.strip() or key is None:
            raise ValueError(
                f"{where}: got {part!r}; expected HEADER=COLUMN with COLUMN one of "
                + ", ".join(ALIASES)
                + f" or {IGNORE}"
            )
        out[normalise_header(head)[0]] = key
    return out


def accepted_spellings(key: str) -> str:
    """Every header spelling of a column, for an error message (never cut)."""
    return f"{key!r} (" + ", ".join(f"'{spelling}'" for spelling in ALIASES[key]) + ")"


def match_header(
    df: list[list[str]],
    has_values,
    problems: ProblemList,
    notices: list[str] | None = None,
    user_map: dict[str, str] | None = None,
) -> dict[str, tuple[int, str, str]]:
    """canonical name -> (column position, header text, unit).

    ``df`` holds the header row and the rows below it as lists of text (the first few are enough:
    they are searched for a header placed too low); ``has_values(pos)`` tells whether
    column ``pos`` has a non-blank cell below the header. ``user_map`` (normalised header
    → column or ``ignore``, :func:`parse_column_map`) comes first; every other header not
    understood is named in ``notices`` (never dropped in silence).
    """
    header = [str(cell) for cell in df[0]]
    found, blank = _match_columns(header, has_values, problems, notices, user_map or {})
    missing = [key for key in REQUIRED if key not in found]
    if missing:
        problems.add(
            "row 1",
            ", ".join(header),
            "header columns "
            + "; ".join(accepted_spellings(key) for key in missing)
            + " (case, spaces and a unit in brackets do not matter)"
            + _header_too_low_hint(df, missing),
        )
    else:
        for pos in blank:
            problems.add(
                f"row 1, column {pos + 1}",
                "",
                "a name for every column with values (blank or merged header cell)",
            )
    _check_header_units(found, problems)
    return found


def _match_columns(header, has_values, problems, notices, user_map):
    """canonical name -> (position, text, unit) of the header cells understood, and the
    positions of blank header cells above values."""
    found: dict[str, tuple[int, str, str]] = {}
    blank: list[int] = []
    for pos, text in enumerate(header):
        name, unit = normalise_header(text)
        if not name:
            if has_values(pos):
                blank.append(pos)
            continue
        key = user_map.get(name)
        if key is None:
            name, unit = _split_unit_word(name, unit)
            key = _LOOKUP.get(name)
        if key == IGNORE:
            if notices is not None:
                notices.append(f"column {pos + 1} '{text}' ignored (as the column map says)")
            continue
        if key is None:
            if notices is not None and has_values(pos):
                notices.append(
                    f"column {pos + 1} '{text}' not understood: its values are NOT used "
                    '(name it with --columns "HEADER=COLUMN", or HEADER=ignore)'
                )
            continue
        if key in found:
            problems.add(
                f"row 1, column {pos + 1}",
                text,
                f"one column for {key!r} (column {found[key][0] + 1} "
                f"'{found[key][1]}' is one already)",
            )
            continue
        found[key] = (pos, text, unit)
    return found, blank


def _header_too_low_hint(df, missing) -> str:
    """Where the missing columns are, when the header row sits below title rows."""
    for row in range(1, min(len(df), 6)):
        names = {_LOOKUP.get(normalise_header(cell)[0]) for cell in df[row]}
        if all(key in names for key in missing):
            return (
                f" (they are in row {row + 1}: the header must be row 1 — remove the "
                "title rows above it, or unmerge them)"
            )
    return ""


def _check_header_units(found, problems: ProblemList) -> None:
    """The unit each quantity column's header gives must be one the reader knows."""
    for key in ("load", "length", "breaker", "insulation", "ambient", "termination"):
        if key not in found:
            continue
        pos, text, unit = found[key]
        quantity = _QUANTITY.get(key, "temperature")
        allowed = SCHEDULE_HEADER_UNITS[quantity]
        if unit not in allowed:
            want = {
                "load": "'load [VA]', '[kVA]', '[W]', '[kW]' or '[A]'",
                "length": "'length [ft]' or 'length [m]'",
                "breaker": "'breaker [A]'",
            }.get(key, f"'{key} [C]' (degrees Celsius)")
            problems.add(f"row 1, column {pos + 1}", text, f"a header such as {want}")
        elif key == "load" and unit == "":
            problems.add(
                f"row 1, column {pos + 1}",
                text,
                "the load's unit in the header: 'load [VA]', '[kVA]', '[W]', '[kW]' or '[A]'",
            )
