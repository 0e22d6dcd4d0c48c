"""The unit system a job is written in, so every length a person reads comes back in it.

A job whose lengths are written in feet (or, with no length to go by, whose conductors
are AWG and kcmil) is shown in feet; a job written in metres (or mm² conductors) in
metres. Only what is shown changes: figures are kept and computed in SI.
"""

from __future__ import annotations

import re

# unit words of a length as users write them -> the system they belong to
IMPERIAL_WORDS = frozenset({"ft", "feet", "foot", "'", "in", "inch", "inches", '"', "yd", "mi"})
METRIC_WORDS = frozenset({"m", "meter", "meters", "metre", "metres", "km", "cm", "mm", "dm"})
_UNIT = re.compile(r"[0-9.,\s]*([^\s0-9.,]+)\s*$")


def length_word_system(text: object) -> str | None:
    """``"ft"`` or ``"m"`` for a length as written (``"85 ft"``, ``"26 m"``); None when the
    text names neither (a number, a word we do not know).

    >>> length_word_system("85 ft"), length_word_system("26 m"), length_word_system(12)
    ('ft', 'm', None)
    >>> length_word_system("120'"), length_word_system("3.5 Metres")
    ('ft', 'm')
    """
    if not isinstance(text, str):
        return None
    m = _UNIT.search(text.strip())
    if m is None:
        return None
    word = m.group(1).lower()
    if word in IMPERIAL_WORDS:
        return "ft"
    if word in METRIC_WORDS:
        return "m"
    return None


def job_length_unit(lengths: list[object], size_systems: list[str]) -> str:
    """The length unit a job is shown in: the system most of its lengths are written in;
    on a tie (or with no length) the system of most conductor sizes (``"awg"`` → feet,
    ``"metric"`` → metres); feet when nothing tells (the shipped rules are NFPA 70).

    >>> job_length_unit(["95 ft", "10 ft", "3 m"], []), job_length_unit(["60 m"], ["awg"])
    ('ft', 'm')
    >>> job_length_unit([], ["metric", "metric"]), job_length_unit([], [])
    ('m', 'ft')
    """
    systems = [length_word_system(t) for t in lengths]
    feet, metres = systems.count("ft"), systems.count("m")
    if feet == metres:
        feet, metres = size_systems.count("awg"), size_systems.count("metric")
    return "m" if metres > feet else "ft"
