"""Fuzz ``feedcheck rerun`` with damaged and hostile report PDFs (run on demand).

Builds one genuine report of the valid starting job (``tests/badinput``), then feeds
``rerun`` variants of it until ``--seconds`` have passed, stopping at the first input
that breaks the contract:

* exit code 0 or 1 (the embedded inputs were read and checked again), or
* exit code 2 with at least one ``error:`` line on stderr,
* never exit 3 or a traceback, never a ``feedcheck-rerun-*`` folder left behind.

Generators, chosen at random each round:

``pdfbytes``  the genuine report with 1-20 bytes flipped, a slice removed or cut short;
``job``       the embedded job file mutated as ``fuzz_inputs`` mutates job files;
``results``   the embedded results JSON with values replaced by other types (texts,
              numbers, lists, objects, null, deep nesting), keys deleted or renamed;
``manifest``  the manifest with names changed (unsafe paths, duplicates, missing
              files, other types), attachments duplicated, extra or missing.

Usage::

    python tests/fuzz/fuzz_rerun.py --seconds 300 [--seed 1] [--save-dir DIR]
"""

from __future__ import annotations

import argparse
import copy
import json
import os
import random
import sys
import tempfile
import time
import traceback
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))
sys.path.insert(0, str(HERE.parent))

from fuzz_inputs import gen_mutate, gen_values  # noqa: E402

ODD_VALUES = [None, True, 0, -1, 1e308, "x", "", [], {}, [1, [2]], {"id": 3}, "inf", "nan"]
ODD_NAMES = [
    "../x.toml",
    "/etc/passwd",
    "a\\b.toml",
    "C:x",
    ".h",
    "",
    "a/../../b",
    "job.toml",
    "x" * 300,
    "LP1.csv",
    5,
    None,
    ["a"],
]


def _base(work: Path) -> tuple[bytes, dict]:
    """A genuine report of the starting job: PDF bytes and its parts."""
    from badinput import GOOD
    from click.testing import CliRunner

    from feedcheck.cli import main
    from feedcheck.render.pdf.embed import read_report

    job = work / "job.toml"
    job.write_text(GOOD, encoding="utf-8")
    pdf = work / "base.pdf"
    r = CliRunner().invoke(main, ["report", str(job), "-o", str(pdf)])
    assert r.exit_code in (0, 1), r.output
    emb = read_report(pdf)
    return pdf.read_bytes(), {
        "manifest": emb.manifest,
        "results": emb.results,
        "files": emb.files,
        "job": emb.job,
    }


def _plain_pdf() -> bytes:
    import io

    from reportlab.pdfgen import canvas

    buf = io.BytesIO()
    c = canvas.Canvas(buf, invariant=1)
    c.drawString(72, 720, "page")
    c.save()
    return buf.getvalue()


def _assemble(parts: dict, extra: list[tuple[str, bytes]] | None = None) -> bytes:
    from feedcheck.render.pdf.embed import INPUT_PREFIX, MANIFEST_NAME, RESULTS_NAME, attach

    files = [(MANIFEST_NAME, json.dumps(parts["manifest"]).encode())]
    files += [(INPUT_PREFIX + k, v) for k, v in parts["files"].items()]
    results = parts["results"]
    files.append(
        (RESULTS_NAME, results if isinstance(results, bytes) else json.dumps(results).encode())
    )
    return attach(PLAIN, files + (extra or []))


def gen_pdfbytes(rng: random.Random, base: bytes, parts: dict) -> bytes:
    data = bytearray(base)
    op = rng.randrange(3)
    if op == 0:
        for _ in range(rng.randint(1, 20)):
            data[rng.randrange(len(data))] = rng.randrange(256)
    elif op == 1:
        i = rng.randrange(len(data))
        del data[i : i + rng.randint(1, 5000)]
    else:
        del data[rng.randrange(len(data)) :]
    return bytes(data)


def gen_job(rng: random.Random, base: bytes, parts: dict) -> bytes:
    p = copy.deepcopy(parts)
    text = p["files"][p["job"]].decode("utf-8")
    gen = rng.choice([gen_mutate, gen_values])
    p["files"][p["job"]] = gen(rng, [text])
    return _assemble(p)


def _deep(rng: random.Random) -> object:
    n = rng.choice([10, 1000, 100_000])
    return json.loads("[" * n + "]" * n) if n < 1000 else "[" * n + "]" * n


def _mutate_json(rng: random.Random, obj: object) -> object:
    """Replace a random value somewhere in ``obj`` (in place where possible)."""
    path = []
    cur = obj
    while isinstance(cur, (dict, list)) and cur and rng.random() < 0.7:
        key = rng.choice(list(cur)) if isinstance(cur, dict) else rng.randrange(len(cur))
        path.append((cur, key))
        cur = cur[key]
    if not path:
        return copy.deepcopy(rng.choice(ODD_VALUES))
    parent, key = path[-1]
    op = rng.randrange(3)
    if op == 0 and isinstance(parent, dict):
        del parent[key]
    elif op == 1:
        parent[key] = _deep(rng) if rng.random() < 0.1 else copy.deepcopy(rng.choice(ODD_VALUES))
    else:
        parent[key] = copy.deepcopy(rng.choice(ODD_VALUES))
    return obj


def gen_results(rng: random.Random, base: bytes, parts: dict) -> bytes:
    p = copy.deepcopy(parts)
    if rng.random() < 0.1:
        n = rng.choice([100, 5000, 200_000])
        p["results"] = ('{"nodes": ' + "[" * n + "]" * n + ', "findings": []}').encode()
        return _assemble(p)
    for _ in range(rng.randint(1, 6)):
        p["results"] = _mutate_json(rng, p["results"])
    return _assemble(p)


def gen_manifest(rng: random.Random, base: bytes, parts: dict) -> bytes:
    from feedcheck.render.pdf.embed import INPUT_PREFIX, MANIFEST_NAME, RESULTS_NAME

    p = copy.deepcopy(parts)
    extra: list[tuple[str, bytes]] = []
    op = rng.randrange(5)
    if op == 0:
        p["manifest"]["job"] = rng.choice(ODD_NAMES)
    elif op == 1:
        p["manifest"]["schedules"] = [rng.choice(ODD_NAMES) for _ in range(rng.randint(0, 4))]
    elif op == 2:
        name = rng.choice([MANIFEST_NAME, RESULTS_NAME, INPUT_PREFIX + p["job"]])
        extra.append((name, rng.choice([b"", b"{}", b"x = 1", b'{"nodes": [], "findings": []}'])))
    elif op == 3:
        p["manifest"] = _mutate_json(rng, p["manifest"])
    else:
        p["files"] = {} if rng.random() < 0.5 else {"other.toml": b"x = 1"}
    return _assemble(p, extra)


GENERATORS = {
    "pdfbytes": gen_pdfbytes,
    "job": gen_job,
    "results": gen_results,
    "manifest": gen_manifest,
}


def _rerun_dirs() -> set[str]:
    return {n for n in os.listdir(tempfile.gettempdir()) if n.startswith("feedcheck-rerun-")}


def check_one(data: bytes, workdir: Path) -> tuple[int, str | None]:
    """Run one report; return its exit code and a description of a breach (or None)."""
    from click.testing import CliRunner

    from feedcheck.cli import main

    pdf = workdir / "r.pdf"
    pdf.write_bytes(data)
    before = _rerun_dirs()
    r = CliRunner().invoke(main, ["rerun", str(pdf)])
    if r.exception is not None and not isinstance(r.exception, SystemExit):
        return -1, "traceback:\n" + "".join(traceback.format_exception(r.exception))
    if _rerun_dirs() - before:
        return r.exit_code, "a feedcheck-rerun-* folder was left behind"
    if "Traceback" in r.output:
        return r.exit_code, "traceback text in the output"
    if r.exit_code == 2:
        if not any(ln.startswith("error: ") for ln in r.stderr.splitlines()):
            return 2, f"exit 2 without an error line: {r.stderr[-500:]!r}"
        return 2, None
    if r.exit_code in (0, 1):
        return r.exit_code, None
    return r.exit_code, f"unexpected exit code {r.exit_code}: {r.output[-800:]!r}"


PLAIN = b""


def main(argv: list[str] | None = None) -> int:
    global PLAIN
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--seconds", type=float, default=60.0, help="time budget (default 60)")
    ap.add_argument("--seed", type=int, default=None, help="random seed (default: time)")
    ap.add_argument("--save-dir", type=Path, default=None, help="where to save a failing input")
    args = ap.parse_args(argv)
    seed = args.seed if args.seed is not None else int(time.time())
    rng = random.Random(seed)
    counts: dict[str, int] = {}
    n = 0
    PLAIN = _plain_pdf()
    with tempfile.TemporaryDirectory() as tmp:
        work = Path(tmp)
        private = work / "tmp"  # rerun's own temporary folders go here, apart from others'
        private.mkdir()
        tempfile.tempdir = str(private)
        base, parts = _base(work)
        deadline = time.monotonic() + args.seconds
        while time.monotonic() < deadline:
            name = rng.choice(list(GENERATORS))
            data = GENERATORS[name](rng, base, parts)
            n += 1
            code, breach = check_one(data, work)
            if breach is None:
                key = f"{name}/exit {code}"
                counts[key] = counts.get(key, 0) + 1
                continue
            save = args.save_dir or Path(tempfile.mkdtemp(prefix="feedcheck-fuzz-"))
            save.mkdir(parents=True, exist_ok=True)
            case = save / f"failing-rerun-{seed}-{n}.pdf"
            case.write_bytes(data)
            print(f"FAILED after {n} inputs (seed {seed}, generator {name}); input: {case}")
            print(breach)
            return 1
    print(f"seed {seed}: {n} reports in {args.seconds:g} s, no contract breach")
    print("by generator/exit code: " + ", ".join(f"{k}: {v}" for k, v in sorted(counts.items())))
    return 0


if __name__ == "__main__":
    sys.exit(main())
