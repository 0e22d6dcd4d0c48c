"""Fuzz ``feedcheck check`` with random and mutated job files (run on demand).

Feeds job files to the CLI in-process (click's ``CliRunner``) until ``--seconds``
have passed, and stops at the first input that breaks the contract:

* exit code 0 or 1 with JSON on stdout (the job was valid), or
* exit code 2 with at least one ``error:`` line on stderr and nothing on stdout,
* never a traceback (any exception other than ``SystemExit``), never an output file
  after exit 2.

Inputs come from three generators, chosen at random each round:

``bytes``    random bytes (length 0-4000), sometimes with a valid prefix;
``mutate``   the valid starting job (``tests/badinput``) or a sample job with 1-8 byte- or
             line-level mutations (delete, duplicate, swap lines, flip bytes, insert
             TOML punctuation or interesting values such as ``nan``, ``1e400``, ``"0 ft"``);
``values``   the valid job with key values replaced by random quantities and texts.

Usage::

    python tests/fuzz/fuzz_inputs.py --seconds 180 [--seed 1] [--save-dir DIR]

Prints a summary (inputs tried, exit-code counts) and, for a failure, the seed, the
input saved under ``--save-dir`` and the traceback; exit status 1 when it found one.
"""

from __future__ import annotations

import argparse
import json
import random
import sys
import tempfile
import time
import traceback
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent.parent
INTERESTING = [
    "nan",
    "inf",
    "-inf",
    "1e400",
    "-1",
    "0",
    "0.0",
    "1e-300",
    '""',
    '"0 ft"',
    '"nan %"',
    '"1,5 m"',
    '"75 kVA"',
    '"4/0"',
    '"5/0 AWG Cu"',
    '"source"',
    "[]",
    "{}",
    "true",
    '"../x.csv"',
    '"/etc/passwd"',
    "1979-05-27T07:32:00Z",
    '"\\u0000"',
    '"∞ A"',
    "[[1]]",
    '"35 delta_degC"',
    '"208Y/120 V"',
    '"120/240 V"',
    '"480 V delta"',
    '"1e9 A"',
]
PUNCT = ["[", "]", "[[", "]]", "=", '"', "'", "\n", "#", ",", "{", "}", ".", "\\", "\x00"]
KEYS_WITH_VALUES = [
    "length",
    "rating",
    "impedance",
    "available_fault",
    "voltage",
    "primary",
    "secondary",
    "conductors",
    "ground",
    "device",
    "load",
    "continuous",
    "power_factor",
    "sets",
    "x_r",
    "phases",
    "from",
    "to",
    "id",
    "ambient",
    "insulation",
    "raceway",
    "interrupting",
]


def _seeds() -> list[str]:
    sys.path.insert(0, str(ROOT / "tests"))
    from badinput import GOOD

    texts = [GOOD]
    texts += [p.read_text(encoding="utf-8") for p in sorted((ROOT / "sample_jobs").glob("*.toml"))]
    return texts


def gen_bytes(rng: random.Random, seeds: list[str]) -> bytes:
    body = bytes(rng.randrange(256) for _ in range(rng.randrange(4000)))
    if rng.random() < 0.3:
        s = rng.choice(seeds).encode()
        body = s[: rng.randrange(len(s))] + body
    return body


def gen_mutate(rng: random.Random, seeds: list[str]) -> bytes:
    lines = rng.choice(seeds).splitlines(keepends=True)
    for _ in range(rng.randint(1, 8)):
        if not lines:
            break
        i = rng.randrange(len(lines))
        op = rng.randrange(6)
        if op == 0:
            del lines[i]
        elif op == 1:
            lines.insert(i, lines[i])
        elif op == 2:
            j = rng.randrange(len(lines))
            lines[i], lines[j] = lines[j], lines[i]
        elif op == 3 and lines[i]:
            k = rng.randrange(len(lines[i]))
            lines[i] = lines[i][:k] + rng.choice(PUNCT) + lines[i][k:]
        elif op == 4 and "=" in lines[i]:
            lines[i] = lines[i].split("=", 1)[0] + "= " + rng.choice(INTERESTING) + "\n"
        else:
            raw = bytearray(lines[i].encode("utf-8", errors="surrogateescape"))
            if raw:
                raw[rng.randrange(len(raw))] = rng.randrange(256)
            lines[i] = raw.decode("utf-8", errors="surrogateescape")
    return "".join(lines).encode("utf-8", errors="surrogateescape")


def _random_value(rng: random.Random) -> str:
    units = [
        "ft",
        "m",
        "km",
        "A",
        "kA",
        "V",
        "kVA",
        "kW",
        "%",
        "degC",
        "degF",
        "mm2",
        "kcmil",
        "AWG Cu",
        "AWG Al",
        "kcmil Cu",
        "hp",
        "s",
        "",
        "furlong",
    ]
    exp = f"{rng.uniform(0, 10):.3g}e{rng.randint(-320, 320)}"
    num = rng.choice(
        [str(rng.uniform(-1e3, 1e4)), str(rng.randint(-5, 5000)), exp, "nan", "inf", "0"]
    )
    kind = rng.randrange(4)
    if kind == 0:
        return num
    if kind == 1:
        return f'"{num} {rng.choice(units)}"'
    if kind == 2:
        return rng.choice(INTERESTING)
    return f'"{rng.choice(["4/0", "250", "1/0", "12", "0000", "750"])} {rng.choice(units)}"'


def gen_values(rng: random.Random, seeds: list[str]) -> bytes:
    out = []
    for line in rng.choice(seeds).splitlines(keepends=True):
        key = line.split("=", 1)[0].strip()
        if key in KEYS_WITH_VALUES and rng.random() < 0.06:
            line = f"{key} = {_random_value(rng)}\n"
        out.append(line)
    return "".join(out).encode()


GENERATORS = {"bytes": gen_bytes, "mutate": gen_mutate, "values": gen_values}


def check_one(data: bytes, workdir: Path, name: str = "job.toml") -> tuple[int, str | None]:
    """Run one input (written as ``name``); return its exit code and a description of a
    breach (or None)."""
    from click.testing import CliRunner

    from feedcheck.cli import main

    job = workdir / name
    out = workdir / "out.json"
    job.write_bytes(data)
    if out.exists():
        out.unlink()
    r = CliRunner().invoke(main, ["check", str(job), "--format", "json", "--out", str(out)])
    if r.exception is not None and not isinstance(r.exception, SystemExit):
        return -1, "traceback:\n" + "".join(traceback.format_exception(r.exception))
    code = r.exit_code
    if code == 2:
        if not any(ln.startswith("error: ") for ln in r.stderr.splitlines()):
            return code, f"exit 2 without an error line: {r.stderr[-500:]!r}"
        if r.stdout or out.exists():
            return code, "exit 2 but something was written"
        if "Traceback" in r.output:
            return code, "traceback text in the output"
        return code, None
    if code in (0, 1):
        try:
            json.loads(out.read_text(encoding="utf-8"))
        except (OSError, ValueError) as exc:
            return code, f"exit {code} but no valid JSON written: {exc}"
        return code, None
    return code, f"unexpected exit code {code}: {r.output[-500:]!r}"


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--seconds", type=float, default=60.0, help="time budget (default 60)")
    ap.add_argument("--seed", type=int, default=None, help="random seed (default: time)")
    ap.add_argument("--save-dir", type=Path, default=None, help="where to save a failing input")
    args = ap.parse_args(argv)
    seed = args.seed if args.seed is not None else int(time.time())
    rng = random.Random(seed)
    seeds = _seeds()
    counts: dict[str, int] = {}
    n = 0
    deadline = time.monotonic() + args.seconds
    with tempfile.TemporaryDirectory() as tmp:
        work = Path(tmp)
        while time.monotonic() < deadline:
            name = rng.choice(list(GENERATORS))
            data = GENERATORS[name](rng, seeds)
            n += 1
            code, breach = check_one(data, work)
            if breach is None:
                key = f"{name}/exit {code}"
                counts[key] = counts.get(key, 0) + 1
                continue
            save = args.save_dir or Path(tempfile.mkdtemp(prefix="feedcheck-fuzz-"))
            save.mkdir(parents=True, exist_ok=True)
            case = save / f"failing-{seed}-{n}.toml"
            case.write_bytes(data)
            print(f"FAILED after {n} inputs (seed {seed}, generator {name}); input: {case}")
            print(breach)
            return 1
    print(f"seed {seed}: {n} inputs in {args.seconds:g} s, no contract breach")
    print("by generator/exit code: " + ", ".join(f"{k}: {v}" for k, v in sorted(counts.items())))
    return 0


if __name__ == "__main__":
    sys.exit(main())
