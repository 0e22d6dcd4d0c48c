"""Path safety: a path a job names must be relative, without '..', and stay inside the
job file's folder even after symbolic links are followed."""

from __future__ import annotations

from pathlib import Path, PureWindowsPath

from .files import FileRefused

_INSIDE = "a path inside the job file's folder (no absolute paths, no '..')"


def _resolved(folder: Path) -> Path:
    """``folder`` resolved, once per folder while its links stay as they are: the last
    answer is kept with the folder's own (lstat) identity and reused only while that
    identity is unchanged; every file path below it is still resolved each time."""
    try:
        st = folder.lstat()
    except OSError:  # no such folder (yet): resolved as written, nothing kept
        return folder.resolve()
    key = (str(folder), st.st_dev, st.st_ino, st.st_mtime_ns)
    hit = _RESOLVED.get(key)
    if hit is None:
        hit = folder.resolve()
        _RESOLVED.clear()  # one folder at a time: a job's panels share theirs
        _RESOLVED[key] = hit
    return hit


_RESOLVED: dict[tuple, Path] = {}


def relative_file_inside(
    text: str,
    folder: Path,
    *,
    noun: str = "schedule file",
    suffixes: tuple[str, ...] = (".csv", ".xlsx"),
    suffix_expected: str = "a .csv or .xlsx schedule file",
) -> Path:
    """The path ``text`` (relative to ``folder``) of an existing file inside ``folder``.

    Absolute paths, drive letters, backslashes and '..' are refused as written; a
    path that resolves (through a symbolic link) outside the folder is refused too.

    Returns
    -------
    Path
        ``text`` as a relative path (not resolved).

    Raises
    ------
    FileRefused
        With ``text`` as the value and what was expected.
    """
    if "\x00" in text or "\\" in text or PureWindowsPath(text).drive:
        raise FileRefused(text, _INSIDE + " written with '/' between folders")
    p = Path(text)
    if p.is_absolute() or ".." in p.parts:
        raise FileRefused(text, _INSIDE)
    if p.suffix.lower() not in suffixes:
        raise FileRefused(text, suffix_expected)
    try:
        base = _resolved(folder)
        real = (folder / p).resolve()
    except (OSError, RuntimeError):  # a link loop
        raise FileRefused(
            text, f"a {noun} that can be opened (the path loops through links)"
        ) from None
    if not real.is_relative_to(base):
        raise FileRefused(text, _INSIDE + "; this one leads outside it through a link")
    if not real.is_file():
        raise FileRefused(text, f"an existing {noun} in {folder} (not found)")
    return p
