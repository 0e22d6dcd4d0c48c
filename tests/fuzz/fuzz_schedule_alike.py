"""Fuzz the reading of many schedules together against reading each alone (on demand).

Each round takes one of the schedules of ``fuzz_schedules.py`` and writes 2-40 mutated
copies of it (most keep its header, so they are read as one group) beside a few copies
of other schedules, as CSV (LF or CR LF) or XLSX; reads them with
:func:`feedcheck.inputs.schedule_alike.read_schedule_files` and each with
:func:`~feedcheck.inputs.schedule_file.read_schedule`; stops at the first file whose two
readings differ (schedule, notices or problems) or at a traceback.

Usage::

    python tests/fuzz/fuzz_schedule_alike.py --seconds 300 [--seed 1] [--save-dir DIR]
"""

from __future__ import annotations

import argparse
import random
import sys
import tempfile
import time
import traceback
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path[:0] = [str(HERE), str(HERE.parent.parent)]

from fuzz_schedules import _seeds, mutate  # noqa: E402


def _xlsx(path: Path, data: bytes) -> Path:
    """The CSV text's cells written to an XLSX workbook as text (None when the text is
    not UTF-8: written as CSV then)."""
    import openpyxl

    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError:
        path.with_suffix(".csv").write_bytes(data)
        return path.with_suffix(".csv")
    wb = openpyxl.Workbook()
    for line in text.splitlines():
        try:
            wb.active.append(line.split(","))
        except Exception:  # a control character openpyxl refuses: the file stays CSV
            path.with_suffix(".csv").write_bytes(data)
            return path.with_suffix(".csv")
    wb.save(path.with_suffix(".xlsx"))
    return path.with_suffix(".xlsx")


def one_round(rng: random.Random, seeds: list[str], work: Path) -> str | None:
    from feedcheck.errors import InputError
    from feedcheck.inputs.schedule_alike import read_schedule_files
    from feedcheck.inputs.schedule_file import read_schedule
    from tests.inputs.test_schedule_alike import assert_same

    for p in work.iterdir():
        p.unlink()
    base = rng.choice(seeds)
    paths = []
    for i in range(rng.randint(2, 40)):
        text = base if rng.random() < 0.85 else rng.choice(seeds)
        data = mutate(rng, text) if rng.random() < 0.7 else text.encode("utf-8")
        if rng.random() < 0.2:
            data = data.replace(b"\n", b"\r\n")
        path = work / f"S{i:02d}.csv"
        if rng.random() < 0.1:
            paths.append(_xlsx(path, data))
        else:
            path.write_bytes(data)
            paths.append(path)
    try:
        together = read_schedule_files(paths)
    except Exception:
        return "".join(traceback.format_exc())
    for path, got in zip(paths, together, strict=True):
        try:
            alone = read_schedule(path)
        except InputError as exc:
            alone = exc
        try:
            assert_same(got, alone)
        except AssertionError as exc:
            return f"{path.name} differs: {exc!r}"
    return None


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--seconds", type=float, default=60.0)
    ap.add_argument("--seed", type=int, default=None)
    ap.add_argument("--save-dir", type=Path, default=None)
    a = ap.parse_args(argv)
    seed = a.seed if a.seed is not None else int(time.time())
    rng = random.Random(seed)
    seeds = _seeds()
    n = 0
    end = time.monotonic() + a.seconds
    with tempfile.TemporaryDirectory() as d:
        work = Path(d)
        while time.monotonic() < end:
            bad = one_round(rng, seeds, work)
            n += 1
            if bad:
                print(f"seed {seed}, round {n}: {bad}")
                if a.save_dir:
                    a.save_dir.mkdir(parents=True, exist_ok=True)
                    for p in work.iterdir():
                        (a.save_dir / f"{seed}-{n}-{p.name}").write_bytes(p.read_bytes())
                return 1
    print(f"seed {seed}: {n} rounds, every file read together as alone")
    return 0


if __name__ == "__main__":
    sys.exit(main())
