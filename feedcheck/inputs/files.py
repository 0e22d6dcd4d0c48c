"""The one guard on a file a user hands in: a regular file, within a size limit, UTF-8.

Callers turn :class:`FileRefused` into their own message form (a
:class:`~feedcheck.errors.Problem` for a job or schedule, a refused report).
"""

from __future__ import annotations

import stat
from dataclasses import dataclass
from pathlib import Path


class FileRefused(ValueError):
    """A file refused by the guard: what was found and what was expected."""

    def __init__(self, value: str, expected: str, line: int | None = None) -> None:
        super().__init__(f"got {value!r}; expected {expected}")
        self.value = value
        self.expected = expected
        self.line = line


@dataclass(frozen=True)
class FileKind:
    """What a kind of input file is called and how large it may be.

    Attributes
    ----------
    noun : str
        ``"job file"``, ``"schedule file"`` (used in messages).
    folder_hint : str
        Shown after the noun when a folder is given: ``"(.toml)"``.
    max_bytes : int
        Largest accepted size.
    too_large : str
        The expectation shown for a larger file.
    suffixes : tuple of str
        Accepted name endings (lower case); empty: any.
    suffix_expected : str
        The expectation shown for another ending.
    """

    noun: str
    folder_hint: str
    max_bytes: int
    too_large: str
    suffixes: tuple[str, ...] = ()
    suffix_expected: str = ""


def check_size(n_bytes: int, max_bytes: int, expected: str) -> None:
    """Refuse ``n_bytes`` above ``max_bytes`` (value shown as ``"<n> bytes"``)."""
    if n_bytes > max_bytes:
        raise FileRefused(f"{n_bytes} bytes", expected)


def read_bytes(path: Path, kind: FileKind) -> bytes:
    """The bytes of a regular file of at most ``kind.max_bytes``, size checked before reading.

    Raises
    ------
    FileRefused
        A folder, another name ending, a device or pipe, an unreadable or too large file.
    """
    if path.is_dir():
        raise FileRefused(str(path), f"a {kind.noun} {kind.folder_hint}, not a folder")
    if kind.suffixes and path.suffix.lower() not in kind.suffixes:
        raise FileRefused(path.name, kind.suffix_expected)
    unreadable = f"a readable {kind.noun} ({{}})"
    try:
        info = path.stat()
    except OSError as exc:
        raise FileRefused(str(path), unreadable.format(exc.strerror)) from None
    if not stat.S_ISREG(info.st_mode):
        raise FileRefused(str(path), f"a {kind.noun} (a regular file, not a device or pipe)")
    check_size(info.st_size, kind.max_bytes, kind.too_large)
    try:
        with path.open("rb") as f:
            # read what the file holds (asking for the limit would allocate the limit per
            # file); one growing while read is read on, still bounded by the limit
            raw = f.read(min(info.st_size, kind.max_bytes) + 1)
            if len(raw) > info.st_size:
                raw += f.read(kind.max_bytes + 1 - len(raw))
    except OSError as exc:
        raise FileRefused(str(path), unreadable.format(exc.strerror)) from None
    check_size(len(raw), kind.max_bytes, kind.too_large)
    return raw


def decode_utf8(raw: bytes, expected: str, *, drop_bom: bool = True) -> str:
    """Text of UTF-8 bytes; a leading byte-order mark (as some Windows editors write) is
    dropped unless ``drop_bom`` is False.

    Raises
    ------
    FileRefused
        Naming the first bad byte (``"byte 0xe9"``) and its 1-based line.
    """
    try:
        return raw.decode("utf-8-sig" if drop_bom else "utf-8")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        raise FileRefused(f"byte 0x{raw[exc.start]:02x}", expected, line) from None
