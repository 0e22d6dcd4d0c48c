"""Atomic output: write to a temporary file beside the target, then rename.

Outputs never destroy inputs: :func:`check_output` refuses a target that is one of
the command's inputs (the same file through links, ``./`` aliases or hard links:
compared by device and inode), names a folder, or is read-only; :func:`atomic_path`
applies the last two itself, removes its temporary file on any error and on
SIGTERM/SIGINT, and names the user's path (never the temporary file) in errors.
"""

from __future__ import annotations

import contextlib
import os
import signal
import stat
import tempfile
import threading
from collections.abc import Iterable, Iterator
from pathlib import Path

from .errors import InputError, Problem


def _refuse(target: str | Path, value: str, expected: str) -> InputError:
    return InputError([Problem(str(target), "", value, expected)])


def _same_file(a: os.stat_result, b: os.stat_result) -> bool:
    return (a.st_dev, a.st_ino) == (b.st_dev, b.st_ino)


def check_output(target: str | Path, inputs: Iterable[str | Path] = ()) -> None:
    """Refuse an output path that would destroy an input or cannot be a file.

    Raises
    ------
    InputError
        ``target`` ends in a path separator or names a folder (outputs are files:
        give a file name inside the folder); it is read-only (never replaced); or it
        is one of ``inputs`` — the same file by device and inode, whatever the
        spelling (links, ``./`` aliases, hard links).
    """
    text = os.fspath(target)
    seps = (os.sep, os.altsep) if os.altsep else (os.sep,)
    if text.endswith(seps) or Path(text).is_dir():
        raise _refuse(text, "a folder", "an output file name (give a file inside the folder)")
    try:
        info = os.stat(text)
    except OSError:
        return  # a new file: nothing to destroy
    if not stat.S_ISREG(info.st_mode):
        raise _refuse(text, "a device or pipe", "an output file name (a regular file)")
    for src in inputs:
        with contextlib.suppress(OSError):
            if _same_file(info, os.stat(src)):
                raise _refuse(
                    text,
                    f"the input {os.fspath(src)}",
                    "an output path other than the command's inputs (they are never replaced)",
                )
    if not info.st_mode & 0o222 or not os.access(text, os.W_OK):
        raise _refuse(
            text, "a read-only file", "a writable output file (read-only files are not replaced)"
        )


class _Terminated(KeyboardInterrupt):
    """SIGTERM, handled like an interrupt so temporary files are removed (exit 130)."""


@contextlib.contextmanager
def interrupts_unwind() -> Iterator[None]:
    """Within the block, SIGTERM raises an interrupt (as SIGINT does), so ``finally``
    blocks and temporary-file cleanup run; the former handler is restored after."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return

    def _raise(signum, frame):
        raise _Terminated()

    old = signal.signal(signal.SIGTERM, _raise)
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, old)


@contextlib.contextmanager
def atomic_path(target: str | Path) -> Iterator[Path]:
    """Yield a temporary path in the target's folder; rename it over the target on
    success, remove it on any error (including an interrupt or SIGTERM).

    Raises
    ------
    InputError
        The target names a folder or a read-only file (see :func:`check_output`).
    OSError
        The machine refused (missing folder, disk full, permission), with the user's
        target as its file name, never the temporary file.
    """
    check_output(target)
    target = Path(target)
    with interrupts_unwind():
        try:
            fd, tmp = tempfile.mkstemp(
                prefix=f".{target.name}.", suffix=".part", dir=str(target.parent or ".")
            )
        except OSError as exc:
            raise OSError(exc.errno, exc.strerror, str(target)) from None
        os.close(fd)
        tmp_path = Path(tmp)
        try:
            umask = os.umask(0)
            os.umask(umask)
            os.chmod(tmp_path, 0o666 & ~umask)  # mkstemp makes 0600; outputs get the usual mode
            yield tmp_path
            os.replace(tmp_path, target)
        except BaseException as exc:
            with contextlib.suppress(OSError):
                tmp_path.unlink()
            if isinstance(exc, OSError) and not isinstance(exc, InputError):
                raise OSError(exc.errno, exc.strerror or str(exc), str(target)) from None
            raise


def write_text_atomic(target: str | Path, text: str) -> None:
    with atomic_path(target) as tmp:
        tmp.write_text(text, encoding="utf-8")


def write_bytes_atomic(target: str | Path, data: bytes) -> None:
    with atomic_path(target) as tmp:
        tmp.write_bytes(data)
