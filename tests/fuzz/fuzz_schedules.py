"""Fuzz ``feedcheck schedule`` with mutated panel schedules (run on demand).

Feeds CSV schedules (the sample schedules and variants in the forms people export:
other header spellings, spares, spaces, totals rows, two-column rows, trade notation)
with 1-8 byte-, cell- or line-level mutations to the CLI in-process, writing an XLSX or
CSV results file, until ``--seconds`` have passed; stops at the first input that breaks
the contract: exit 0 or 1 with the results file written, or exit 2 with ``error:``
lines and nothing written; never a traceback.

Usage::

    python tests/fuzz/fuzz_schedules.py --seconds 300 [--seed 1] [--save-dir DIR]
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
ROOT = HERE.parent.parent
CELLS = [
    "",
    "0",
    "-1",
    "1e9",
    "nan",
    "inf",
    "SPARE",
    "SPACE",
    "TOTAL",
    "12\x0000",
    "\x01",
    "=1+1",
    "\uff1dX",
    "\ufeff=1",
    "|x",
    "3#12, 1#12G",
    "500 MCM CU THHN",
    "20A 22kAIC",
    "x" * 40_000,
    "100000000",
    "2.5",
    "A-B-C",
    '"',
    ",",
    "\r",
    "Ckt #",
    "Load VA",
]
HEADERS = [
    "Ckt #",
    "Load Description",
    "Load VA",
    "BKR (A)",
    "Wire",
    "Length",
    "Poles",
    "Cont?",
    "Ins",
    "AIC",
    "System",
    "Trip",
    "Amps",
    "Circuit",
]


def _seeds() -> list[str]:
    out = [p.read_text(encoding="utf-8") for p in sorted((ROOT / "sample_jobs").glob("*.csv"))]
    h = "Ckt #,Load Description,Load VA,Brkr,Wire,Length"
    out.append(
        f"{h},{h}\n1,A,1200,20,12 AWG Cu,50,2,B,900,20,12 AWG Cu,40\n"
        "3,SPARE,,20,,,4,SPACE,,,,\n,TOTAL,2100,,,,,,,,,\n"
    )
    return out


def mutate(rng: random.Random, text: str) -> bytes:
    lines = text.splitlines()
    for _ in range(rng.randint(1, 8)):
        k = rng.randrange(len(lines)) if lines else 0
        op = rng.randrange(6)
        if op == 0 and lines:
            cells = lines[k].split(",")
            cells[rng.randrange(len(cells))] = rng.choice(CELLS)
            lines[k] = ",".join(cells)
        elif op == 1 and lines:
            lines.insert(k, lines[k])
        elif op == 2 and lines:
            del lines[k]
        elif op == 3 and lines:
            cells = lines[0].split(",")
            cells[rng.randrange(len(cells))] = rng.choice(HEADERS)
            lines[0] = ",".join(cells)
        elif op == 4 and lines:
            lines[k] = lines[k] + "," + rng.choice(CELLS)
        else:
            b = bytearray("\n".join(lines).encode("utf-8", "surrogatepass"))
            if b:
                b[rng.randrange(len(b))] = rng.randrange(256)
            return bytes(b)
    return ("\n".join(lines) + "\n").encode("utf-8")


def check_one(data: bytes, work: Path, out_name: str) -> str | None:
    from click.testing import CliRunner

    from feedcheck.cli import main

    src = work / "LP1.csv"
    src.write_bytes(data)
    out = work / out_name
    for p in work.glob("r*"):
        p.unlink()
    r = CliRunner().invoke(
        main, ["schedule", str(src), "--system", "208Y/120 V", "--out", str(out)]
    )
    if r.exception is not None and not isinstance(r.exception, SystemExit):
        return "".join(traceback.format_exception(r.exception))
    if r.exit_code in (0, 1):
        return None if out.exists() else f"exit {r.exit_code} without {out_name}"
    if r.exit_code == 2:
        if out.exists():
            return "exit 2 with a results file"
        if "error:" not in r.stderr and "could not" not in r.stderr:
            return f"exit 2 without an error line: {r.stderr[:300]}"
        return None
    return f"exit {r.exit_code}: {r.output[-500:]}"


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
            data = mutate(rng, rng.choice(seeds))
            bad = check_one(data, work, rng.choice(["r.xlsx", "r.csv"]))
            n += 1
            if bad:
                print(f"seed {seed}, input {n}: {bad}")
                if a.save_dir:
                    a.save_dir.mkdir(parents=True, exist_ok=True)
                    (a.save_dir / f"schedule-{seed}-{n}.csv").write_bytes(data)
                return 1
    print(f"seed {seed}: {n} inputs, no contract broken")
    return 0


if __name__ == "__main__":
    sys.exit(main())
