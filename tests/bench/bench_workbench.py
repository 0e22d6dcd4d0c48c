"""Benchmark: the workbench's check round trip (issue 19), in one run.

Run on demand (not part of the test command):
``python tests/bench/bench_workbench.py [--repeat N]``.

For each sample job and a generated 100-panel job (our own invented data, the generator
of bench_building.py: ten panels per transformer, 30 circuits per panel, a schedule
file each), a workbench is served on 127.0.0.1 on a free port (the real server, in a
thread of this process) and ``api/edit`` is posted over HTTP: one edit of a run length,
alternating between two values so every request checks a changed job. The round trip
is measured at the client (request written → whole JSON response read and parsed), one
warm-up request then the median of ``--repeat``; the server's own ``elapsed_ms`` (the
check alone) is printed beside it. Also the median of ``api/schedule`` (an edited grid
of one panel re-checked) on the 100-panel job.

Targets (issue 19): a round trip under 300 ms for the sample jobs, under 2 s for the
100-panel job. Printed as ratio = median / target (below 1 meets it).
"""

from __future__ import annotations

import argparse
import json
import shutil
import statistics
import sys
import tempfile
import threading
import time
import urllib.request
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[1]
sys.path.insert(0, str(HERE))

from bench_building import make_job  # noqa: E402

SAMPLE_TARGET_S = 0.300
LARGE_TARGET_S = 2.0


def start(job: Path) -> tuple[str, threading.Thread]:
    """Serve ``job`` on a free port; the base URL (with its token)."""
    from feedcheck.workbench.actions import Session
    from feedcheck.workbench.server import serve

    session = Session(job, "2026-12-01", job.read_text(encoding="utf-8"), True)
    lines: list[str] = []
    thread = threading.Thread(
        target=serve,
        args=(session,),
        kwargs={"open_browser": False, "echo": lines.append},
        daemon=True,
    )
    thread.start()
    while not lines:
        time.sleep(0.01)
    return lines[0].split(": ", 1)[1], thread


def post(url: str, body: dict) -> dict:
    req = urllib.request.Request(
        url,
        data=json.dumps(body).encode(),
        method="POST",
        headers={"Content-Type": "application/json"},
    )
    with urllib.request.urlopen(req, timeout=120) as r:
        return json.loads(r.read())


def round_trips(base: str, run_index: int, repeat: int) -> tuple[float, float, dict]:
    """Median client round trip [s] and server check time [ms] of ``api/edit``."""
    state = json.loads(urllib.request.urlopen(base + "api/state", timeout=120).read())
    rev = state["rev"]
    walls, checks = [], []
    last = state
    for i in range(repeat + 1):
        length = "101 ft" if i % 2 else "99 ft"
        edit = {"op": "set", "kind": "run", "index": run_index, "key": "length", "value": length}
        t0 = time.perf_counter()
        last = post(base + "api/edit", {"rev": rev, "edits": [edit]})
        wall = time.perf_counter() - t0
        rev = last["rev"]
        if i:  # the first is the warm-up
            walls.append(wall)
            checks.append(last["results"]["elapsed_ms"])
    return statistics.median(walls), statistics.median(checks), last


def schedule_trips(base: str, panel: str, repeat: int) -> float:
    grid = json.loads(urllib.request.urlopen(f"{base}api/schedule?panel={panel}").read())
    col = grid["columns"].index("length [ft]")
    walls = []
    for i in range(repeat + 1):
        rows = [list(r) for r in grid["rows"]]
        rows[0][col] = "61" if i % 2 else "59"
        t0 = time.perf_counter()
        post(base + "api/schedule", {"panel": panel, "columns": grid["columns"], "rows": rows})
        if i:
            walls.append(time.perf_counter() - t0)
    return statistics.median(walls)


def line(what: str, wall: float, check_ms: float, target: float, size: int) -> None:
    print(
        f"{what:34} round trip {wall * 1000:8.1f} ms  check {check_ms:7.1f} ms  "
        f"response {size / 1000:7.1f} kB  target {target * 1000:6.0f} ms  "
        f"ratio {wall / target:5.2f}"
    )


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--repeat", type=int, default=9)
    args = ap.parse_args()
    with tempfile.TemporaryDirectory(prefix="feedcheck-bench-wb-") as tmp:
        root = Path(tmp)
        for extra in (ROOT / "sample_jobs").iterdir():
            shutil.copy(extra, root / extra.name)
        for job in sorted(root.glob("*.toml")):
            base, _ = start(job)
            wall, check, last = round_trips(base, 0, args.repeat)
            if not last["results"]["valid"]:
                print(f"{job.name:34} (invalid on purpose: input errors only)")
            line(job.name, wall, check, SAMPLE_TARGET_S, len(json.dumps(last)))
            post(base + "api/bye", {})
        big = make_job(root, 100)
        base, _ = start(big)
        wall, check, last = round_trips(base, 5, args.repeat)
        assert last["results"]["valid"], last["results"]["input_errors"][:3]
        line(
            "generated 100 panels (3,000 circ.)", wall, check, LARGE_TARGET_S, len(json.dumps(last))
        )
        sched = schedule_trips(base, "P0001", args.repeat)
        print(
            f"{'  schedule grid edit, 100 panels':34} round trip {sched * 1000:8.1f} ms  "
            f"target {LARGE_TARGET_S * 1000:6.0f} ms  ratio {sched / LARGE_TARGET_S:5.2f}"
        )
        post(base + "api/bye", {})
    print(f"medians of {args.repeat} requests after one warm-up; 2 shared cores: noisy")


if __name__ == "__main__":
    main()
