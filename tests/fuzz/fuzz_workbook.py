"""Fuzz ``feedcheck check`` with mutated job workbooks (run on demand).

The contract is that of ``fuzz_inputs.py`` (exit 0/1 with JSON written, or exit 2 with
``error:`` lines and nothing written; never a traceback). Inputs, chosen at random:

``cells``   a sample job written as a workbook (``feedcheck workbook``), then 1-6 cells
            set to random values of every kind a cell holds (texts with units and
            without, formula texts, numbers, truth values, dates, spreadsheet error
            codes, empties), sometimes in new rows, new columns or new sheets, merged
            ranges, sheets renamed or removed;
``bytes``   the same workbook with 1-8 bytes of its archive flipped or cut short.

Usage::

    python tests/fuzz/fuzz_workbook.py --seconds 120 [--seed 1]
"""

from __future__ import annotations

import argparse
import datetime as dt
import io
import random
import sys
import tempfile
import time
import tomllib
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))
sys.path.insert(0, str(HERE.parent.parent))

from fuzz_inputs import check_one  # noqa: E402

SAMPLES = HERE.parent.parent / "sample_jobs"
VALUES = [
    "85 ft", "-2.5 %", "=1+1", "@x", "'", "", "nan ft", "1e400 A", "300 kcmil Cu", "A-B",
    "{Ins = \"insulation\"}", "{", "480Y/277 V", "#N/A", "#DIV/0!", 0, -1, 3, 2.5, 1e300,
    True, False, dt.datetime(2026, 1, 2), dt.date(2026, 11, 30), None, "x" * 300,
]  # fmt: skip


def _seed_books() -> list[bytes]:
    from feedcheck.workbook_export import job_workbook

    return [
        job_workbook(tomllib.loads(p.read_text(encoding="utf-8")))
        for p in sorted(SAMPLES.glob("*.toml"))
    ]


def gen_cells(rng: random.Random, books: list[bytes]) -> bytes:
    import openpyxl

    wb = openpyxl.load_workbook(io.BytesIO(rng.choice(books)))
    for _ in range(rng.randint(1, 6)):
        ws = rng.choice(wb.worksheets[1:] or wb.worksheets)
        move = rng.random()
        if move < 0.05:
            wb.create_sheet(rng.choice(["runs", "Motor", "generator", "options", "x"]))
        elif move < 0.1 and len(wb.worksheets) > 1:
            wb.remove(rng.choice(wb.worksheets))
        elif move < 0.15:
            ws.merge_cells(f"A{rng.randint(1, 4)}:B{rng.randint(4, 6)}")
        else:
            row, col = rng.randint(1, ws.max_row + 2), rng.randint(1, ws.max_column + 2)
            try:
                ws.cell(row=row, column=col, value=rng.choice(VALUES))
            except (AttributeError, ValueError):
                continue  # a merged cell is read-only in openpyxl
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


def gen_bytes(rng: random.Random, books: list[bytes]) -> bytes:
    data = bytearray(rng.choice(books))
    if rng.random() < 0.2:
        return bytes(data[: rng.randint(0, len(data))])
    for _ in range(rng.randint(1, 8)):
        data[rng.randrange(len(data))] = rng.randrange(256)
    return bytes(data)


GENERATORS = {"cells": gen_cells, "bytes": gen_bytes}


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--seconds", type=float, default=60.0)
    ap.add_argument("--seed", type=int, default=None)
    args = ap.parse_args(argv)
    seed = args.seed if args.seed is not None else int(time.time())
    rng = random.Random(seed)
    books = _seed_books()
    counts: dict[str, int] = {}
    n = 0
    deadline = time.monotonic() + args.seconds
    with tempfile.TemporaryDirectory() as tmp:
        work = Path(tmp)
        for p in SAMPLES.glob("*.csv"):  # the schedules the sample jobs name
            (work / p.name).write_bytes(p.read_bytes())
        while time.monotonic() < deadline:
            name = rng.choice(list(GENERATORS))
            data = GENERATORS[name](rng, books)
            n += 1
            code, breach = check_one(data, work, "job.xlsx")
            if breach is None:
                counts[f"{name}/exit {code}"] = counts.get(f"{name}/exit {code}", 0) + 1
                continue
            case = Path(tempfile.mkdtemp(prefix="feedcheck-fuzz-")) / f"failing-{seed}-{n}.xlsx"
            case.write_bytes(data)
            print(f"FAILED after {n} inputs (seed {seed}, generator {name}); input: {case}")
            print(breach)
            return 1
    print(f"seed {seed}: {n} inputs in {args.seconds:g} s, no contract breach")
    print("by generator/exit code: " + ", ".join(f"{k}: {v}" for k, v in sorted(counts.items())))
    return 0


if __name__ == "__main__":
    sys.exit(main())
