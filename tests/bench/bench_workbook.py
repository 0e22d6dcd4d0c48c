"""Benchmark: a building-scale job checked from its workbook against its job file.

Run on demand (not part of the test command):
``python tests/bench/bench_workbook.py [--panels 1000] [--repeat 3]``.

The 1,000-panel job of ``bench_building.py`` (our own invented data, its schedules
beside it) is written as a workbook with ``feedcheck workbook``; then
``feedcheck check`` runs on each, as whole processes (one warm-up, the median of
``--repeat``), and the workbook's wall and CPU time are printed as a ratio of the job
file's. Target: the workbook check within 1.25 times the job file's (reading the
workbook is a small part of the check).
"""

from __future__ import annotations

import argparse
import subprocess
import sys
import tempfile
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

from bench_building import make_job, timed  # noqa: E402

TARGET = 1.25


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--panels", type=int, default=1000)
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args()
    exe = str(Path(sys.executable).with_name("feedcheck"))
    with tempfile.TemporaryDirectory() as tmp:
        job = make_job(Path(tmp), args.panels)
        xlsx = job.with_suffix(".xlsx")
        subprocess.run([exe, "workbook", str(job), "-o", str(xlsx)], check=True)
        a = timed([exe, "check", str(job), "--format", "json"], args.repeat)
        b = timed([exe, "check", str(xlsx), "--format", "json"], args.repeat)
    wall, cpu = b[0] / a[0], b[1] / a[1]
    verdict = "met" if max(wall, cpu) <= TARGET else ("met on CPU" if cpu <= TARGET else "NOT met")
    print(
        f"check of a {args.panels}-panel job: job file {a[0]:.2f} s wall / {a[1]:.2f} s CPU, "
        f"workbook {b[0]:.2f} s / {b[1]:.2f} s = {wall:.2f}x wall, {cpu:.2f}x CPU | "
        f"target <= {TARGET:g}x: {verdict} | peak memory {a[2]:.0f} MB vs {b[2]:.0f} MB"
    )


if __name__ == "__main__":
    main()
