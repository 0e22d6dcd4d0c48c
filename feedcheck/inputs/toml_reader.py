"""Typed values out of parsed TOML tables, every problem collected with its key path
(``run[2].length``) and, where the file shows it, its line."""

from __future__ import annotations

import difflib
import functools
import math
import re

from ..calc.sizes import Size, SizeError, parse_size
from ..errors import ProblemList
from ..model import MATERIAL_WORDS, VoltageSystem
from ..units import UnitParseError, parse_quantity, parse_voltage_system

VOLTAGE_RANGE_V = (100.0, 1000.0)  # line-to-line; "low voltage" is 1000 V and less
MEDIUM_VOLTAGE_MAX_V = 35_000.0  # a source (or a transformer primary) up to 35 kV


# ---------------------------------------------------------------- bounded parsing
MAX_KEY_PARTS = 16  # a job's deepest key is three parts (run.x.y); dotted keys beyond are refused

# The standard library's TOML parser builds each dotted key part by part (time grows
# with the square of its parts: a 2 MB ``[k.k.k…]`` runs for minutes). This scan runs
# before it, in linear time: strings and comments are taken whole (their dots are not
# keys); a chain of key parts joined by more than MAX_KEY_PARTS - 1 dots is refused.
_BARE = r"[A-Za-z0-9_-]++"
_BASIC = r'"(?:[^"\\\n]|\\.)*+"'
_LITERAL = r"'[^'\n]*+'"
_PART = f"(?:{_BARE}|{_BASIC}|{_LITERAL})"
_SCAN_RE = re.compile(
    rf"(?P<chain>(?<![A-Za-z0-9_.-]){_PART}(?:[ \t]*+\.[ \t]*+{_PART}){{{MAX_KEY_PARTS}}})"
    r'|"""[\s\S]*?"""|\'\'\'[\s\S]*?\'\'\''
    rf"|{_BASIC}|{_LITERAL}|#[^\n]*+"
)

DEEP_KEY_VALUE = f"a dotted key of more than {MAX_KEY_PARTS} parts"
KEY_PARTS_EXPECTED = f"keys of at most {MAX_KEY_PARTS} dotted parts (a job needs three)"


def deep_key_line(text: str) -> int | None:
    """1-based line of the first key with more than ``MAX_KEY_PARTS`` dotted parts, or None.

    Linear in the length of ``text``; run before parsing so a file built to make the
    parser's work grow with the square of a key's length is refused at once.
    """
    for m in _SCAN_RE.finditer(text):
        if m.group("chain"):
            return text.count("\n", 0, m.start()) + 1
    return None


# ---------------------------------------------------------------- key locations
_HEADER_RE = re.compile(r"^\s*(\[\[?)\s*([A-Za-z_][\w.-]*)\s*\]\]?\s*(#.*)?$")
_KEY_RE = re.compile(r"^\s*([A-Za-z_][\w-]*)\s*=")


def _key_lines(text: str) -> dict[str, int]:
    """Map key paths (``run[1].length``, ``source.voltage``) to 1-based line numbers."""
    lines: dict[str, int] = {}
    counts: dict[str, int] = {}
    prefix = ""
    for no, line in enumerate(text.splitlines(), start=1):
        if m := _HEADER_RE.match(line):
            name = m.group(2)
            if m.group(1) == "[[":
                counts[name] = counts.get(name, 0) + 1
                prefix = f"{name}[{counts[name]}]"
            else:
                prefix = name
            lines.setdefault(prefix, no)
        elif m := _KEY_RE.match(line):
            path = f"{prefix}.{m.group(1)}" if prefix else m.group(1)
            lines.setdefault(path, no)
    return lines


class Reader:
    """Reads typed values out of TOML tables, collecting problems with key paths."""

    def __init__(self, file: str, text: str) -> None:
        self.problems = ProblemList(file)
        self._text = text

    @functools.cached_property
    def lines(self) -> dict[str, int]:
        """Key paths to their lines, found when a problem first needs one (a good job's
        thousand tables are never scanned for them)."""
        return _key_lines(self._text)

    def line(self, path: str) -> int | None:
        if path in self.lines:
            return self.lines[path]
        head = path.rsplit(".", 1)[0]
        return self.lines.get(head)

    def add(self, path: str, value, expected: str) -> None:
        self.problems.add(path, value, expected, line=self.line(path))

    def check_keys(self, table: dict, path: str, allowed: tuple[str, ...]) -> None:
        for k in table:
            if k not in allowed:
                close = difflib.get_close_matches(k, allowed, n=1)
                hint = f" — did you mean {close[0]!r}?" if close else ""
                where = f"{path}.{k}" if path else k
                self.add(where, k, "one of the keys " + ", ".join(allowed) + hint)

    def text(
        self, table: dict, path: str, key: str, required: bool = True, default: str = ""
    ) -> str:
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return default
        v = table[key]
        if not isinstance(v, str) or (required and not v.strip()):
            self.add(f"{path}.{key}", v, "a non-empty text in quotes")
            return default
        return v.strip()

    def qty(
        self,
        table: dict,
        path: str,
        key: str,
        dimension: str,
        required: bool = True,
        default: float | None = None,
        within: tuple[float, float, str] | None = None,
        **kw,
    ) -> float | None:
        """``within=(lo, hi, text)``: values outside [lo, hi] (SI) are refused with ``text``."""
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return default
        try:
            value = parse_quantity(table[key], dimension, **kw)
        except UnitParseError as exc:
            self.add(f"{path}.{key}", table[key], exc.expected)
            return default
        if within is not None and math.isfinite(value) and not within[0] <= value <= within[1]:
            self.add(f"{path}.{key}", table[key], within[2])
            return default
        return value

    def number(
        self,
        table: dict,
        path: str,
        key: str,
        lo: float,
        hi: float,
        default: float | None = None,
        integer: bool = False,
        required: bool = False,
    ) -> float | None:
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return default
        v = table[key]
        kind = "a whole number" if integer else "a number"
        if (
            isinstance(v, bool)
            or not isinstance(v, (int, float))
            or (integer and not isinstance(v, int))
        ):
            self.add(f"{path}.{key}", v, f"{kind} from {lo:g} to {hi:g} (no quotes)")
            return default
        if not (math.isfinite(v) and lo <= v <= hi):
            self.add(f"{path}.{key}", v, f"{kind} from {lo:g} to {hi:g}")
            return default
        return v

    def flag(self, table: dict, path: str, key: str, default: bool = False) -> bool:
        v = table.get(key, default)
        if not isinstance(v, bool):
            self.add(f"{path}.{key}", v, "true or false")
            return default
        return v

    def voltage(
        self,
        table: dict,
        path: str,
        key: str,
        required: bool = True,
        phases: int | None = None,
        medium: bool = False,
    ) -> VoltageSystem | None:
        """A system voltage; ``medium``: up to 35 kV (a source or a transformer primary),
        otherwise low voltage only (1000 V and less)."""
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return None
        try:
            vs = parse_voltage_system(table[key], phases=phases)
        except UnitParseError as exc:
            self.add(f"{path}.{key}", table[key], exc.expected)
            return None
        lo, hi = VOLTAGE_RANGE_V
        if medium and hi < vs.voltage_ll_v <= MEDIUM_VOLTAGE_MAX_V:
            return vs
        if not lo <= vs.voltage_ll_v <= hi:
            self.add(
                f"{path}.{key}",
                table[key],
                f"a low-voltage system from {lo:g} V to {hi:g} V line to line"
                + (
                    f" or a medium voltage up to {MEDIUM_VOLTAGE_MAX_V / 1000:g} kV"
                    if medium
                    else " (medium voltage only at the source and a transformer's primary)"
                ),
            )
            return None
        return vs

    def conductor(
        self,
        table: dict,
        path: str,
        key: str,
        required: bool = True,
        default_material: str | None = None,
    ) -> tuple[Size | None, str]:
        """Read ``"4/0 AWG Cu"`` → (Size, "cu")."""
        if key not in table:
            if required:
                self.add(f"{path}.{key}", None, f"a value for {key!r} (required)")
            return None, default_material or "cu"
        v = table[key]
        if not isinstance(v, str):
            self.add(f"{path}.{key}", v, "a size and material in quotes, e.g. '4/0 AWG Cu'")
            return None, default_material or "cu"
        parts = v.strip().rsplit(None, 1)
        material = default_material
        size_text = v
        if len(parts) == 2 and parts[1].lower() in MATERIAL_WORDS:
            material = MATERIAL_WORDS[parts[1].lower()]
            size_text = parts[0]
        if material is None:
            self.add(
                f"{path}.{key}",
                v,
                "a size followed by its material, e.g. '4/0 AWG Cu' or '95 mm2 Al'",
            )
            return None, "cu"
        try:
            return parse_size(size_text), material
        except SizeError as exc:
            self.add(f"{path}.{key}", v, exc.expected)
            return None, material


def array_of_tables(r: Reader, data: dict, name: str) -> list[dict]:
    v = data.get(name, [])
    if isinstance(v, dict):
        r.add(name, f"[{name}]", f"[[{name}]] (double brackets: one block per {name})")
        return []
    if not isinstance(v, list) or not all(isinstance(x, dict) for x in v):
        r.add(name, v, f"[[{name}]] blocks")
        return []
    return v
