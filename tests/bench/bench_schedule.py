"""Benchmark: panel schedules end to end — read, check every circuit, write CSV.

Run on demand: ``python tests/bench/bench_schedule.py [circuits] [panels] [files]``
(default 1,000,000 circuits across 25,000 panels in 25 CSV files with a ``panel``
column). Prints the wall time of each stage, the peak resident memory of the process
(``resource.getrusage`` maxrss) and the ratio against a per-row reference loop over the
same kernels, timed on a subset of rows and scaled linearly (said in the output).
``ScheduleResult.findings`` is built on first use; the time to build every result's
list (one Finding per failing circuit check) is printed on its own line, outside the
end-to-end figure, since reading, checking and writing the CSV never need it.
Demo data are random and invented.
"""

from __future__ import annotations

import resource
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

from feedcheck.calc.ampacity import termination_c_for
from feedcheck.calc.vdrop import voltage_drop_approximate_v
from feedcheck.checks.schedules import check_schedule
from feedcheck.inputs.schedule_file import read_schedule
from feedcheck.render.schedules import write_results
from feedcheck.units import parse_voltage_system
from tests.kernels import ac_impedance_ohm_per_m, ampacity_a, max_device_a

SIZES = np.array(["14 AWG Cu", "12 AWG Cu", "10 AWG Cu", "8 AWG Cu", "6 AWG Cu", "12 AWG Al"])
BREAKER = np.array([15, 20, 30, 40, 60, 15])
KINDS = np.array(["lighting", "receptacle", "motor", "heating", "other"])


def generate(folder: Path, circuits: int, panels: int, files: int, seed: int = 7) -> list[Path]:
    rng = np.random.default_rng(seed)
    per_panel = circuits // panels
    paths = []
    panels_per_file = panels // files
    for f in range(files):
        n_pan = panels_per_file
        pan = np.repeat([f"P{f:03d}-{k:05d}" for k in range(n_pan)], per_panel)
        circ = np.tile(np.arange(1, per_panel + 1), n_pan)
        m = len(pan)
        s = rng.integers(0, len(SIZES), m)
        load = rng.uniform(100, 1800, m).round(0) * (1 + s // 3)
        cont = rng.choice(np.array(["yes", "no"]), m)
        kind = KINDS[rng.integers(0, len(KINDS), m)]
        length = rng.uniform(5, 150, m).round(1)
        lines = [
            "panel,circuit,kind,continuous,load [VA],power factor,breaker [A],conductor,"
            "insulation,length [ft],ground"
        ]
        body = np.char.add(pan.astype(str), ",")
        for col in (
            circ.astype(str),
            kind,
            cont,
            load.astype(str),
            rng.choice(np.array(["0.9", "0.95", "1"]), m),
            BREAKER[s].astype(str),
            SIZES[s],
            np.full(m, "90"),
            length.astype(str),
            SIZES[s],
        ):
            body = np.char.add(np.char.add(body, col), ",")
        text = "\n".join([lines[0], *np.char.rstrip(body, ",").tolist()]) + "\n"
        p = folder / f"sched_{f:03d}.csv"
        p.write_text(text, encoding="utf-8")
        paths.append(p)
    return paths


def per_row_reference(schedule, system, rows: int) -> float:
    """Per-row loop over the same kernels (scalar calls), first ``rows`` circuits."""
    c = schedule.circuits.head(rows)
    t0 = time.perf_counter()
    for r in c.itertuples(index=False):
        i = r.load_value / system.voltage_ln_v
        term = float(termination_c_for(r.breaker_a, r.size))
        amp = float(
            ampacity_a(r.size, r.material, r.insulation_c, r.ambient_c, r.current_carrying, term)
        )
        float(ampacity_a(r.size, r.material, r.insulation_c, 30.0, 3, term))
        float(max_device_a(amp, r.size, r.material))
        rr, xx = ac_impedance_ohm_per_m(r.size, r.material, r.raceway, 75.0)
        voltage_drop_approximate_v(i, float(rr), float(xx), r.length_m, r.pf, "ln4w")
    return time.perf_counter() - t0


def main() -> None:
    circuits = int(sys.argv[1]) if len(sys.argv) > 1 else 1_000_000
    panels = int(sys.argv[2]) if len(sys.argv) > 2 else 25_000
    files = int(sys.argv[3]) if len(sys.argv) > 3 else 25
    system = parse_voltage_system("208Y/120 V")
    with tempfile.TemporaryDirectory() as d:
        folder = Path(d)
        t = time.perf_counter()
        paths = generate(folder, circuits, panels, files)
        t_gen = time.perf_counter() - t
        t0 = time.perf_counter()
        t_read = t_check = 0.0
        results = []
        for p in paths:
            a = time.perf_counter()
            s = read_schedule(p)
            b = time.perf_counter()
            results.append(check_schedule(s, system, 1.0))
            t_check += time.perf_counter() - b
            t_read += b - a
        a = time.perf_counter()
        write_results(results, folder / "results.csv")
        t_write = time.perf_counter() - a
        total = time.perf_counter() - t0
        n = sum(len(r.circuits) for r in results)
        n_pan = sum(len(r.panels) for r in results)
        sub = 2_000
        loop = per_row_reference(read_schedule(paths[0]), system, sub)
        loop_scaled = loop / sub * n
        fails = sum(int((r.circuits["status"] == "fail").sum()) for r in results)
        a = time.perf_counter()
        n_find = sum(len(r.findings) for r in results)
        t_find = time.perf_counter() - a
    peak_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(f"circuits {n:,} in {n_pan:,} panels, {len(paths)} files (generated in {t_gen:.1f} s)")
    print(
        f"read {t_read:.2f} s, check {t_check:.2f} s, write CSV {t_write:.2f} s; "
        f"end to end {total:.2f} s ({n / total:,.0f} circuits/s); {fails:,} failing circuits"
    )
    print(f"peak resident memory {peak_mb:,.0f} MB")
    print(
        f"per-row reference loop over the same kernels: {loop:.2f} s for {sub:,} rows, "
        f"scaled linearly to {n:,} rows ≈ {loop_scaled:,.0f} s (checks only, no read/write)"
    )
    print(f"ratio per-row loop / vectorised check: {loop_scaled / t_check:,.0f}×")
    print(
        f"findings lists (built on first use, not in the figures above): {n_find:,} "
        f"findings in {t_find:.2f} s"
    )


if __name__ == "__main__":
    main()
