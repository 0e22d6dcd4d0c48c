"""The job file being edited: its text, cut into one section per top-level table, each
edited with tomlkit so comments, key order and formatting of what is not touched stay
byte for byte.

Why sections: tomlkit keeps a file's comments and layout, but gathers the elements of
an array of tables written apart (``[[run]]``, ``[[panel]]``, ``[[run]]``) into one
place when any of them changes. A job file interleaves them on purpose (a run beside
the panel it feeds), so the text is cut at each top-level header and each section is a
small TOML document of its own: an edit changes one section's text and nothing else.
The cut is verified on every text: each section must read back as it is written and
the sections together must give the data of the whole file; when they do not (a header
inside an array, an element written inline) the form edits are refused and the text is
edited as text (the ``text`` edit).
"""

from __future__ import annotations

import re
import tomllib
from dataclasses import dataclass

import tomlkit
from tomlkit.exceptions import TOMLKitError

from ..inputs.job_keys import TOP_KEYS
from ..inputs.toml_reader import deep_key_line
from ..inputs.workbook_cells import TEXT_KEYS, CellRefused, inline_table, job_value

ARRAY_KINDS = ("transformer", "run", "panel", "motor")
SINGLE_KINDS = ("project", "source", "options", "generator", "transfer_switch")
# the id a new element gets: prefix + the first unused number
ID_PREFIX = {
    "transformer": "T",
    "run": "R",
    "panel": "P",
    "motor": "M",
    "generator": "G",
    "transfer_switch": "TS",
}

# a top-level header of one bare part, or a token that may hold a header-like line
_SCAN = re.compile(
    r'"""[\s\S]*?"""|\'\'\'[\s\S]*?\'\'\'|"(?:[^"\\\n]|\\.)*"|\'[^\'\n]*\'|#[^\n]*'
    r"|^[ \t]*(?P<open>\[\[?)[ \t]*(?P<name>[A-Za-z0-9_-]+)[ \t]*(?P<close>\]\]?)",
    re.MULTILINE,
)
_INT = re.compile(r"[+-]?\d+")
_FLOAT = re.compile(r"[+-]?(\d+\.\d*|\.\d+|\d+)([eE][+-]?\d+)?")


class EditRefused(ValueError):
    """An edit that cannot be applied (a message for the page)."""


@dataclass
class Section:
    """One top-level table of the file: ``kind`` ("" for the text before the first
    header), whether it is an element of an array of tables, and its text."""

    kind: str
    array: bool
    text: str


def split_sections(text: str) -> list[Section]:
    """The text cut before each top-level header of one bare part (``[source]``,
    ``[[run]]``); the first section holds what comes before the first header."""
    cuts: list[tuple[int, str, bool]] = []
    for m in _SCAN.finditer(text):
        name = m.group("name")
        if name is None or len(m.group("open")) != len(m.group("close")):
            continue
        cuts.append((m.start(), name, m.group("open") == "[["))
    sections = [Section("", False, text[: cuts[0][0] if cuts else len(text)])]
    for i, (start, name, array) in enumerate(cuts):
        end = cuts[i + 1][0] if i + 1 < len(cuts) else len(text)
        sections.append(Section(name, array, text[start:end]))
    return sections


def _merged(sections: list[Section]) -> dict:
    """The data of the sections read one by one and put together as TOML would."""
    data: dict = {}
    for s in sections:
        part = tomllib.loads(s.text)
        if not s.kind:
            data.update(part)
        elif s.array:
            if set(part) != {s.kind} or len(part[s.kind]) != 1:
                raise ValueError("section holds more than its element")
            data.setdefault(s.kind, []).append(part[s.kind][0])
        else:
            if set(part) != {s.kind} or s.kind in data:
                raise ValueError("section holds more than its table")
            data[s.kind] = part[s.kind]
    return data


def value_from_text(kind: str, key: str, text: str):
    """The TOML value of what a user typed in a field, read as a job-workbook cell is:
    ``85 ft`` a text, ``3`` a whole number, ``2.5`` a decimal, ``true``/``false`` a truth
    value; a key that takes text only keeps the text (``id = "1"``); ``columns`` the
    inline table the job file writes.

    >>> value_from_text("run", "length", "85 ft"), value_from_text("run", "sets", "2")
    ('85 ft', 2)
    >>> value_from_text("panel", "power_factor", "0.9"), value_from_text("run", "id", "7")
    (0.9, '7')
    >>> value_from_text("run", "harmonic_neutral", "true")
    True
    """
    stripped = text.strip()
    if key in TEXT_KEYS:
        cell, data_type = text, "s"
    elif stripped in ("true", "false"):
        cell, data_type = stripped == "true", "b"
    elif _INT.fullmatch(stripped):
        cell, data_type = int(stripped), "n"
    elif _FLOAT.fullmatch(stripped):
        cell, data_type = float(stripped), "n"
    else:
        cell, data_type = text, "s"
    try:
        return job_value(kind, key, cell, data_type, "")
    except CellRefused as exc:
        raise EditRefused(f"{kind}.{key}: got {exc.shown!r}; expected {exc.expected}") from None


def shown_value(value) -> str:
    """A job value as the text a user would type (the inverse of :func:`value_from_text`).

    >>> shown_value("85 ft"), shown_value(2), shown_value(0.9), shown_value(True)
    ('85 ft', '2', '0.9', 'true')
    """
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, str):
        return value
    if isinstance(value, dict):
        try:
            return inline_table(value)
        except CellRefused:
            return str(value)
    if isinstance(value, float):
        return repr(value)
    return str(value)


class JobDocument:
    """The job's text and its sections; every edit gives a new text."""

    def __init__(self, text: str) -> None:
        self.set_text(text)

    # ------------------------------------------------------------ text
    def set_text(self, text: str) -> None:
        """Replace the whole text (the raw editor); the form edits work when it cuts."""
        self.text = text
        self.sections: list[Section] | None = None
        self.why_text_only = ""
        if deep_key_line(text) is not None:
            self.why_text_only = "the text holds a key of too many parts"
            return
        try:
            whole = tomllib.loads(text)
            sections = split_sections(text)
            if _merged(sections) != whole:
                raise ValueError("the sections do not give the file's data")
            for s in sections:
                if s.kind and tomlkit.parse(s.text).as_string() != s.text:
                    raise ValueError("a section does not read back as written")
        except (tomllib.TOMLDecodeError, RecursionError):
            self.why_text_only = "the text is not valid TOML (see the problems listed)"
            return
        except (ValueError, TOMLKitError) as exc:
            self.why_text_only = f"its layout is not one the form edits keep ({exc})"
            return
        self.sections = sections

    def _join(self) -> None:
        assert self.sections is not None
        self.text = "".join(s.text for s in self.sections)

    # ------------------------------------------------------------ reading
    def elements(self) -> list[dict]:
        """Each element of the job as the page lists it: kind, index (file order within
        its kind, from 0), id and its values as typed text."""
        if self.sections is None:
            return []
        out: list[dict] = []
        counts: dict[str, int] = {}
        for s in self.sections:
            if s.kind not in ARRAY_KINDS + SINGLE_KINDS:
                continue
            part = tomllib.loads(s.text)[s.kind]
            table = part[0] if s.array else part
            if not isinstance(table, dict):
                continue
            index = counts.get(s.kind, 0)
            counts[s.kind] = index + 1
            values = {k: shown_value(v) for k, v in table.items()}
            element_id = table.get("id") if isinstance(table.get("id"), str) else None
            out.append({"kind": s.kind, "index": index, "id": element_id, "values": values})
        return out

    def _find(self, kind: str, index: int) -> int | None:
        """Position in ``sections`` of element ``index`` of ``kind`` (None: none)."""
        n = 0
        for pos, s in enumerate(self.sections or ()):
            if s.kind == kind:
                if n == index:
                    return pos
                n += 1
        return None

    # ------------------------------------------------------------ edits
    def apply(self, edit: dict) -> None:
        """Apply one edit (``set``, ``add``, ``remove`` or ``text``); raises EditRefused."""
        op = edit.get("op")
        if op == "text":
            text = edit.get("text")
            if not isinstance(text, str):
                raise EditRefused("a text edit carries the whole job as a string")
            self.set_text(text)
            return
        if op not in ("set", "add", "remove"):
            raise EditRefused(f"unknown edit {op!r}: expected set, add, remove or text")
        kind = edit.get("kind")
        if kind not in ARRAY_KINDS + SINGLE_KINDS:
            raise EditRefused(f"unknown kind {kind!r}: expected one of {', '.join(TOP_KEYS)}")
        if self.sections is None:
            raise EditRefused(f"the form cannot change this job: {self.why_text_only}")
        if op == "add":
            self._add(kind)
            return
        index = edit.get("index", 0)
        if not isinstance(index, int) or isinstance(index, bool) or index < 0:
            raise EditRefused(f"index {index!r}: expected a whole number from 0")
        if op == "remove":
            self._remove(kind, index)
        else:
            self._set(kind, index, edit.get("key"), edit.get("value"))
        self._join()

    def _set(self, kind: str, index: int, key, value) -> None:
        if not isinstance(key, str) or not key or not isinstance(value, str):
            raise EditRefused("a set edit carries a key and the value as text")
        pos = self._find(kind, index)
        if pos is None and kind in SINGLE_KINDS and index == 0:
            if value == "":
                return
            self.sections.append(Section(kind, False, f"\n[{kind}]\n"))
            pos = len(self.sections) - 1
        if pos is None:
            raise EditRefused(f"no {kind} number {index + 1} written as a table in the job")
        section = self.sections[pos]
        doc = tomlkit.parse(section.text)
        table = doc[kind][0] if section.array else doc[kind]
        if value == "":
            if key in table:
                del table[key]
        else:
            table[key] = value_from_text(kind, key, value)
        section.text = doc.as_string()

    def _add(self, kind: str) -> None:
        used = {e["id"] for e in self.elements() if e["id"]}
        if kind in SINGLE_KINDS:
            if self._find(kind, 0) is not None:
                raise EditRefused(f"the job has a [{kind}] table already (one at most)")
            header = f"[{kind}]"
        else:
            header = f"[[{kind}]]"
        lines = [header]
        if kind in ID_PREFIX:
            n = 1
            while f"{ID_PREFIX[kind]}{n}" in used:
                n += 1
            lines.append(f'id = "{ID_PREFIX[kind]}{n}"')
        new = Section(kind, kind in ARRAY_KINDS, "\n".join(lines) + "\n")
        last = max((i for i, s in enumerate(self.sections) if s.kind == kind), default=None)
        at = len(self.sections) if last is None else last + 1
        before = self.sections[at - 1]
        if not before.text.endswith("\n"):
            before.text += "\n"
        if not before.text.endswith("\n\n"):
            new.text = "\n" + new.text
        self.sections.insert(at, new)
        self._join()

    def _remove(self, kind: str, index: int) -> None:
        pos = self._find(kind, index)
        if pos is None:
            raise EditRefused(f"no {kind} number {index + 1} written as a table in the job")
        del self.sections[pos]
