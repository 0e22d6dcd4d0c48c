"""Benchmark: building-scale jobs and quick-command start-up, as ratios in one run.

Run on demand (not part of the test command):
``python tests/bench/bench_building.py [--repeat N] [--quick] [--rows check,schedule]``.

Generates jobs of 1, 12, 100 and 1,000 panels (our own invented data: a 13.8 kV service
stated by its short-circuit power, ten panels per 150 kVA 13.8 kV delta → 208Y/120 V
transformer, 30 circuits per panel, so 100 transformers and 30,000 circuits at 1,000
panels; loads sized so the design passes, as a real job's would) and a folder of 2,000
schedule files (60,000 circuits) beside one file holding the same 60,000 rows with a
``panel`` column. Every figure is a whole process (the ``feedcheck`` script beside this
Python; ``python -c "import click, pint"`` for the start-up baseline), one warm-up run
then the median of ``--repeat`` runs, measured side by side in this one run: wall time,
CPU time (user + system of the child) and the child's peak resident memory, all from the
child's own rusage (``os.wait4``, the figures ``resource.getrusage`` gives for a child).
On a shared machine the CPU ratio is the steadier one; both are printed.
Printed: one line per row
of issue 17's table, each as a ratio against its baseline with the target (the report
of the 12-panel job against the 1-panel job; with ``--report-1000`` also the 1,000-panel
report, one run, against its 90 s and 1.5 GB targets), then the two forms of the radial
fault walk timed at job sizes, and which one the check uses.
``--code DIR`` runs the same commands on another source tree (a "before" figure).
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

PY = sys.executable
CLI = [str(Path(PY).with_name("feedcheck"))]
PANELS_PER_TRANSFORMER = 10
CIRCUITS = 30
SIZES = np.array(["12 AWG Cu", "12 AWG Cu", "10 AWG Cu", "8 AWG Cu", "14 AWG Cu"])
BREAKER = np.array([20, 20, 30, 40, 15])
KINDS = np.array(["lighting", "receptacle", "receptacle", "heating", "other"])
HEADER = (
    "panel,circuit,description,kind,continuous,load [VA],power factor,breaker [A],"
    "conductor,insulation,length [ft],ground"
)


def schedule_rows(panel: str, rng: np.random.Generator, with_panel: bool = True) -> list[str]:
    """30 invented circuits of one panel, as CSV lines (no header)."""
    s = rng.integers(0, len(SIZES), CIRCUITS)
    load = (rng.uniform(90, 420, CIRCUITS) * (1 + s // 3)).round(0)
    length = rng.uniform(10, 120, CIRCUITS).round(0)
    out = []
    for k in range(CIRCUITS):
        cells = [
            str(k + 1),
            f"circuit {k + 1}",
            KINDS[s[k]],
            "yes" if k % 3 == 0 else "no",
            f"{load[k]:.0f}",
            "0.95",
            str(BREAKER[s[k]]),
            SIZES[s[k]],
            "90",
            f"{length[k]:.0f}",
            SIZES[s[k]],
        ]
        out.append(",".join(([panel] if with_panel else []) + cells))
    return out


def job_text(n_panels: int, folder: Path, seed: int = 17) -> str:
    """A job file of ``n_panels`` panels with schedules written into ``folder``."""
    rng = np.random.default_rng(seed)
    n_tr = max(1, -(-n_panels // PANELS_PER_TRANSFORMER))
    parts = [
        '[project]\nname = "Generated campus (invented benchmark data)"\n'
        'date = "2026-12-01"\n\n[source]\nvoltage = "13800 V delta"\nphases = 3\n'
        'short_circuit = "500 MVA"\nx_r = 12\n'
    ]
    made = 0
    for t in range(n_tr):
        tid = f"T{t:03d}"
        parts.append(
            f'\n[[transformer]]\nid = "{tid}"\nrating = "150 kVA"\nprimary = "13800 V delta"\n'
            f'secondary = "208Y/120 V"\nimpedance = "4.5 %"\nx_r = 4\n'
            f'primary_device = "15 A"\nprimary_device_type = "fuse"\n'
            f'secondary_device = "500 A"\n'
        )
        for k in range(min(PANELS_PER_TRANSFORMER, n_panels - made)):
            pid = f"P{t:03d}{k}"
            src, length = (tid, 20) if k == 0 else (f"P{t:03d}0", 40 + 10 * k)
            cond, gnd, dev, rating = (
                ("2 x 250 kcmil Cu", "1/0 AWG Cu", "500 A", "600 A")
                if k == 0
                else ("1 AWG Cu", "6 AWG Cu", "100 A", "100 A")
            )
            sets = 2 if k == 0 else 1
            cond = cond.removeprefix("2 x ")
            (folder / f"{pid}.csv").write_text(
                "\n".join([HEADER.removeprefix("panel,"), *schedule_rows(pid, rng, False)]) + "\n",
                encoding="utf-8",
            )
            parts.append(
                f'\n[[run]]\nid = "F-{pid}"\nfrom = "{src}"\nto = "{pid}"\n'
                f'length = "{length} ft"\nconductors = "{cond}"\nsets = {sets}\n'
                f'insulation = "75 degC"\nraceway = "steel"\nground = "{gnd}"\n'
                f'device = "{dev}"\n'
                f'\n[[panel]]\nid = "{pid}"\nrating = "{rating}"\n'
                f'main_device = "{dev}"\ninterrupting = "65 kA"\nschedule = "{pid}.csv"\n'
            )
            made += 1
    return "".join(parts)


def make_job(root: Path, n_panels: int) -> Path:
    folder = root / f"job{n_panels}"
    folder.mkdir()
    path = folder / "job.toml"
    path.write_text(job_text(n_panels, folder), encoding="utf-8")
    return path


def make_schedules(root: Path, files: int = 2000) -> tuple[Path, Path]:
    """A folder of ``files`` one-panel schedules and one file with the same rows."""
    rng = np.random.default_rng(5)
    folder = root / "many"
    folder.mkdir()
    lines = [HEADER]
    for f in range(files):
        rows = schedule_rows(f"Q{f:04d}", rng)
        (folder / f"Q{f:04d}.csv").write_text("\n".join([HEADER, *rows]) + "\n", "utf-8")
        lines.extend(rows)
    one = root / "one" / "all.csv"
    one.parent.mkdir()
    one.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return folder, one


ENV = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}


def run_once(cmd: list[str]) -> tuple[float, float, float]:
    """One whole process: wall [s], CPU user+system [s], peak RSS [MB] (its own rusage)."""
    t0 = time.perf_counter()
    p = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, env=ENV)
    err = p.stderr.read()
    _, status, ru = os.wait4(p.pid, 0)
    wall = time.perf_counter() - t0
    code = os.waitstatus_to_exitcode(status)
    if code not in (0, 1):
        raise SystemExit(f"{' '.join(cmd)} exited {code}:\n{err.decode()}")
    return wall, ru.ru_utime + ru.ru_stime, ru.ru_maxrss / 1024


def timed(cmd: list[str], repeat: int) -> tuple[float, float, float]:
    """Medians of ``repeat`` runs (after one warm-up run: bytecode and caches written):
    wall [s], CPU [s], and the largest peak RSS [MB]."""
    run_once(cmd)
    runs = [run_once(cmd) for _ in range(repeat)]
    return (
        statistics.median(r[0] for r in runs),
        statistics.median(r[1] for r in runs),
        max(r[2] for r in runs),
    )


def line(what: str, a, b, target: float) -> None:
    wall, cpu = a[0] / b[0], a[1] / b[1]
    verdict = "met" if max(wall, cpu) <= target else ("met on CPU" if cpu <= target else "NOT met")
    print(
        f"{what}\n    wall {a[0]:7.3f} s vs {b[0]:7.3f} s = {wall:5.2f}x | CPU {a[1]:7.3f} s vs "
        f"{b[1]:7.3f} s = {cpu:5.2f}x | target <= {target:g}x: {verdict} | "
        f"peak RSS {a[2]:.0f} MB vs {b[2]:.0f} MB"
    )


CALC = {
    "rated-current": ["rated-current", "--rating", "75kVA", "--voltage", "208V"],
    "fault": [
        "fault",
        "--rating",
        "75kVA",
        "--primary",
        "480 V delta",
        "--secondary",
        "208Y/120 V",
        "--impedance",
        "5.1%",
        "--x-r",
        "3.5",
        "--source-fault",
        "30kA",
        "--length",
        "95 ft",
        "--size",
        "4/0 AWG",
        "--ground",
        "4 AWG",
        "--device",
        "225A",
    ],
    "ampacity": [
        "ampacity",
        "--size",
        "3/0 AWG",
        "--insulation",
        "90degC",
        "--ambient",
        "40degC",
        "--current-carrying",
        "6",
    ],
    "voltage-drop": [
        "voltage-drop",
        "--current",
        "150A",
        "--length",
        "200 ft",
        "--size",
        "3/0 AWG",
        "--system",
        "208Y/120 V",
        "--pf",
        "0.9",
    ],
}


def calc_rows(repeat: int) -> None:
    """The quick commands' start-up against ``python -c "import click, pint"``."""
    base = timed([PY, "-c", "import click, pint"], max(repeat, 5))
    for name, argv in CALC.items():
        t = timed([*CLI, "calc", *argv], max(repeat, 5))
        target = 1.2 if name == "rated-current" else 1.5
        line(f"calc {name} vs python -c 'import click, pint'", t, base, target)


def fault_walk_note() -> None:
    """Time the two forms of the radial walk at job sizes (in process, best of 5): a
    job-shaped feed (source, transformers, ten panels each: depth 3) and the deep random
    feed of ``bench_fault_walk.py``."""
    sys.path.insert(0, str(Path(__file__).parent))
    from bench_fault_walk import best_of, python_loop, random_feed, vectorised

    print(
        "fault walk used by the check: vectorised pointer jumping "
        "(feedcheck.calc.fault.cumulative_impedance_ohm), kept: the walk's callers hold "
        "arrays, and it is the faster form from about a thousand nodes on; below that both "
        "take well under a millisecond (times below)"
    )
    rng = np.random.default_rng(3)
    for n_panels in (12, 1_000, 10_000):
        n_tr = -(-n_panels // PANELS_PER_TRANSFORMER)
        parent = [-1]  # source, transformers, first panel of each, the other panels
        for _ in range(n_tr):
            parent.append(0)
            tr = len(parent) - 1
            parent.append(tr)
            parent.extend([tr + 1] * (PANELS_PER_TRANSFORMER - 1))
        parent = np.array(parent, dtype=np.intp)
        branch = rng.uniform(1e-4, 5e-3, len(parent)) + 1j * rng.uniform(1e-4, 3e-3, len(parent))
        shapes = (("job-shaped", parent, branch), ("deep random", *random_feed(len(parent))))
        for label, par, br in shapes:
            root = 0.0005 + 0.003j
            t_vec, _ = best_of(vectorised, par, br, root, 208.0)
            t_loop, _ = best_of(python_loop, par, br.tolist(), root, 208.0)
            faster = "vectorised" if t_vec < t_loop else "loop"
            print(
                f"  {label:<11} {len(par):>6,} nodes: loop {t_loop * 1e3:8.3f} ms, "
                f"vectorised {t_vec * 1e3:8.3f} ms ({faster} faster)"
            )


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=3, help="runs per figure (median)")
    ap.add_argument("--quick", action="store_true", help="skip the 2,000-file schedule row")
    ap.add_argument(
        "--report-1000", action="store_true", help="also report the 1,000-panel job (one run)"
    )
    ap.add_argument(
        "--rows",
        default="calc,check,schedule,report",
        help="comma-separated rows to run (calc, check, schedule, report); default all",
    )
    ap.add_argument(
        "--code", help="run the commands with this source tree first on PYTHONPATH (a 'before')"
    )
    args = ap.parse_args()
    if args.code:
        ENV["PYTHONPATH"] = os.pathsep.join(filter(None, [args.code, ENV.get("PYTHONPATH")]))
    r = args.repeat
    rows = set(args.rows.split(","))
    print(f"{os.cpu_count()} CPUs, load average {os.getloadavg()[0]:.1f}; medians of {r} runs")
    with tempfile.TemporaryDirectory() as tmp:
        root = Path(tmp)
        jobs = {n: make_job(root, n) for n in (1, 12, 100, 1000)}
        if "calc" in rows:
            calc_rows(r)
        if "check" in rows:
            checks = {n: timed([*CLI, "check", str(path)], r) for n, path in jobs.items()}
            for n, t in checks.items():
                print(
                    f"check {n:>5} panels: wall {t[0]:7.3f} s, CPU {t[1]:7.3f} s, "
                    f"peak {t[2]:.0f} MB"
                )
            line("check 1,000 panels vs 1 panel", checks[1000], checks[1], 3.0)
        if "schedule" in rows and not args.quick:
            folder, one = make_schedules(root)
            sysv = ["--system", "208Y/120 V"]
            t_one = timed([*CLI, "schedule", str(one), *sysv], r)
            t_many = timed([*CLI, "schedule", str(folder), *sysv], r)
            line("schedule: 2,000 files vs one file of the same 60,000 rows", t_many, t_one, 1.5)
        reports = {n: [*CLI, "report", str(jobs[n]), "-o", str(root / f"r{n}.pdf")] for n in jobs}
        if "report" in rows:
            t1, t12 = timed(reports[1], r), timed(reports[12], r)
            line("report 12 panels vs 1 panel", t12, t1, 2.0)
        if args.report_1000:
            w, cpu, rss = run_once(reports[1000])
            verdict = "met" if w <= 90 and rss <= 1536 else "NOT met"
            print(
                f"report 1,000 panels (one run)\n    wall {w:7.1f} s, CPU {cpu:7.1f} s, peak RSS "
                f"{rss:.0f} MB | target <= 90 s and <= 1.5 GB: {verdict}"
            )
        if "check" in rows:
            fault_walk_note()


if __name__ == "__main__":
    main()
