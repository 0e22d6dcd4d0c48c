"""A schedule's conductor cell as the trade writes it.

``12 AWG Cu``, ``500 MCM CU THHN`` (size, material, insulation type), ``3#12, 1#12G``
or ``3-#12 CU THWN-2 + #12 G`` (count, size, a grounding conductor marked ``G``/``GND``/
``EGC``/``GROUND``). Parts are separated by ``,``, ``;`` or ``+``.

Insulation types give the insulation's temperature rating, the lower of its dry and wet
ratings (NFPA 70-2017 Table 310.104(A), Table 310.4(A) from 2020; read 2026-12-03, copy in
tests/reference/tables/insulation_types__nfpa70_2017_t310_104a.csv: TW 60 °C; THW, THWN,
RHW, USE, XHHW (wet) 75 °C; THHN (dry and damp), THWN-2, XHHW-2, RHW-2, USE-2 90 °C).
NM and UF cable are taken at 60 °C (NFPA 70-2017 334.80 and 340.80: their ampacity is that
of 60 °C conductors) and XHHW at 75 °C (its wet rating: the safe one).
A cell without a material is read as copper and the reader says so (common practice, no
source: branch circuits under 8 AWG are copper).
"""

from __future__ import annotations

import re
from functools import lru_cache

from ..calc.sizes import SizeError, parse_size
from ..model import MATERIAL_WORDS

INSULATION_TYPES = {
    "tw": 60.0,
    "uf": 60.0,
    "nm": 60.0,
    "nmb": 60.0,
    "nm-b": 60.0,
    "thw": 75.0,
    "thwn": 75.0,
    "rhw": 75.0,
    "use": 75.0,
    "xhhw": 75.0,
    "thhn": 90.0,
    "thhn/thwn": 75.0,  # dual-rated wire in a wet location: the lower rating
    "thwn-2": 90.0,
    "thhn/thwn-2": 90.0,
    "xhhw-2": 90.0,
    "rhw-2": 90.0,
    "use-2": 90.0,
}
_GROUND = re.compile(r"(?:\s*[-/]?\s*(?:g|gnd|grd|egc|ground|gr))$", re.I)
_COUNT = re.compile(r"^\s*\d{1,2}\s*(?:[-x×]\s*|(?=#))", re.I)
_SPLIT = re.compile(r"[,;+]")


@lru_cache(maxsize=4096)  # the same few conductor texts recur over a building's files
def parse_conductor_cell(text: str):
    """``(size, material, insulation °C or None, ground size, ground material, problem,
    material_assumed)``; ``problem`` names what could not be read ("" when all was).

    >>> parse_conductor_cell("500 MCM CU THHN")[:3]
    ('500 kcmil', 'cu', 90.0)
    >>> parse_conductor_cell("3#12, 1#12G")
    ('12 AWG', 'cu', None, '12 AWG', 'cu', '', True)
    >>> parse_conductor_cell("12 AWG Cu")
    ('12 AWG', 'cu', None, '', '', '', False)
    >>> parse_conductor_cell("12 AWG Cu blue")[5]
    "'blue' (not a size, material or insulation type)"
    """
    size = mat = gsize = gmat = ""
    ins = None
    assumed = False
    parts = [p.strip() for p in _SPLIT.split(str(text)) if p.strip()]
    if not parts:
        return "", "", None, "", "", "a conductor size and material", False
    for k, part in enumerate(parts):
        body = _COUNT.sub("", part)
        ground = False
        if k > 0 and _GROUND.search(body):
            body, ground = _GROUND.sub("", body), True
        words = body.replace("°", " ").split()
        m = ""
        rest = []
        for w in words:
            lw = w.lower().strip(".")
            if lw in MATERIAL_WORDS:
                m = MATERIAL_WORDS[lw]
            elif lw in INSULATION_TYPES:
                t = INSULATION_TYPES[lw]
                ins = t if ins is None else min(ins, t)
            else:
                rest.append(w)
        sz, unread = _size(rest)
        if unread:
            return "", "", None, "", "", unread, False
        if not m:
            m, assumed = "cu", True
        if ground or (k > 0 and size):
            gsize, gmat = sz, m
        else:
            size, mat = sz, m
    if not size:
        return "", "", None, "", "", "a phase conductor size before the ground", False
    return size, mat, ins, gsize, gmat, "", assumed


def _size(words: list[str]) -> tuple[str, str]:
    """The size the words spell, or ("", what could not be read)."""
    for n in range(len(words), 0, -1):  # the longest leading run that is a size
        try:
            name = parse_size(" ".join(words[:n])).name
        except SizeError:
            continue
        if words[n:]:
            extra = " ".join(words[n:])
            return "", f"{extra!r} (not a size, material or insulation type)"
        return name, ""
    if not words:
        return "", "a size (e.g. 12 AWG, #12, 500 MCM)"
    try:
        parse_size(" ".join(words))
    except SizeError as exc:  # its own hint: the standard sizes, the nearest one
        return "", f"{' '.join(words)!r} (expected {exc.expected})"
    return "", f"{' '.join(words)!r} (not a conductor size)"
