"""Atomic output: write to a temporary file beside the target, then rename."""

from __future__ import annotations

import contextlib
import os
import tempfile
from collections.abc import Iterator
from pathlib import Path


@contextlib.contextmanager
def atomic_path(target: str | Path) -> Iterator[Path]:
    """Yield a temporary path in the target's folder; rename it over the target on
    success, remove it on any error (including KeyboardInterrupt)."""
    target = Path(target)
    fd, tmp = tempfile.mkstemp(
        prefix=f".{target.name}.", suffix=".part", dir=str(target.parent or ".")
    )
    os.close(fd)
    tmp_path = Path(tmp)
    umask = os.umask(0)
    os.umask(umask)
    os.chmod(tmp_path, 0o666 & ~umask)  # mkstemp makes 0600; outputs get the usual mode
    try:
        yield tmp_path
        os.replace(tmp_path, target)
    except BaseException:
        with contextlib.suppress(OSError):
            tmp_path.unlink()
        raise


def write_text_atomic(target: str | Path, text: str) -> None:
    with atomic_path(target) as tmp:
        tmp.write_text(text, encoding="utf-8")


def write_bytes_atomic(target: str | Path, data: bytes) -> None:
    with atomic_path(target) as tmp:
        tmp.write_bytes(data)
