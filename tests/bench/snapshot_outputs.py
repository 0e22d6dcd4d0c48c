"""Snapshot every output of the sample jobs and the generated building jobs, for speed work.

Run on demand (not part of the test command), once before and once after a change, then
compare the two folders (``diff -r BEFORE AFTER``; no output means nothing changed)::

    python tests/bench/snapshot_outputs.py /tmp/before [--cli PATH] [--reports]

Written per job: ``check`` as text, with ``--all``, as JSON and as CSV; ``schedule --job``
to the terminal, to CSV and to XLSX (its cells as text:
the file carries the time it was made); then ``schedule`` of a folder of 2,000 files, of one
file holding the same rows, and of the sample schedules. With ``--reports`` also each
report's text, page by page (``pdftotext -layout``, poppler-utils), since the PDF bytes
carry the time they were made. The generated jobs are those of ``bench_building.py``
(our own invented data), made once under ``OUTDIR/../snapshot_jobs`` and reused so that
the before and after runs read the very same files.
"""

from __future__ import annotations

import argparse
import shutil
import subprocess
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

import bench_building as bb  # noqa: E402

SAMPLES = HERE.parent.parent / "sample_jobs"


def xlsx_text(path: Path) -> str:
    """Every sheet's cells (value and number format) and column widths, as text."""
    from openpyxl import load_workbook

    lines = []
    for ws in load_workbook(path).worksheets:
        lines.append(f"== {ws.title} {ws.freeze_panes} {ws.auto_filter.ref}")
        widths = {k: d.width for k, d in ws.column_dimensions.items()}
        lines.append(f"widths {sorted(widths.items())}")
        for row in ws.iter_rows():
            for c in row:
                if c.value is not None:
                    lines.append(f"{c.coordinate} {c.value!r} {c.number_format} {c.font.b}")
    return "\n".join(lines) + "\n"


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("out", type=Path, help="folder to write the snapshot into (made fresh)")
    ap.add_argument("--cli", default=str(Path(sys.executable).with_name("feedcheck")))
    ap.add_argument("--reports", action="store_true", help="also the reports' text per page")
    ap.add_argument("--no-1000", action="store_true", help="leave out the 1,000-panel job")
    args = ap.parse_args()
    out: Path = args.out
    if out.exists():
        shutil.rmtree(out)
    out.mkdir(parents=True)
    jobs = out.parent / "snapshot_jobs"
    if not jobs.exists():
        jobs.mkdir()
        for n in (1, 12, 100, 1000):
            bb.make_job(jobs, n)
        bb.make_schedules(jobs)
    sizes = (1, 12, 100) if args.no_1000 else (1, 12, 100, 1000)
    targets = sorted(SAMPLES.glob("*.toml")) + [jobs / f"job{n}" / "job.toml" for n in sizes]

    def run(name: str, argv: list[str]) -> None:
        p = subprocess.run([args.cli, *argv], capture_output=True, cwd=out)
        text = p.stdout + b"\n--stderr--\n" + p.stderr + f"\n--rc {p.returncode}".encode()
        for path, word in ((out, b"OUT"), (jobs, b"JOBS"), (SAMPLES, b"SAMPLES")):
            text = text.replace(str(path).encode(), word)
        (out / f"{name}.out").write_bytes(text)

    for t in targets:
        name = t.stem if t.parent == SAMPLES else t.parent.name
        run(f"{name}_text", ["check", str(t)])
        run(f"{name}_all", ["check", str(t), "--all"])
        run(f"{name}_json", ["check", str(t), "--format", "json"])
        run(f"{name}_csv", ["check", str(t), "--format", "csv"])
        run(f"{name}_sched", ["schedule", "--job", str(t)])
        run(f"{name}_schedcsv", ["schedule", "--job", str(t), "--out", f"{name}_sched.csv"])
        run(f"{name}_schedxlsx", ["schedule", "--job", str(t), "--out", f"{name}_sched.xlsx"])
        if args.reports and not name.endswith("1000"):
            pdf = out / f"{name}.pdf"
            run(f"{name}_report", ["report", str(t), "-o", str(pdf)])
            if pdf.exists():
                txt = subprocess.run(
                    ["pdftotext", "-layout", str(pdf), "-"], capture_output=True, check=True
                ).stdout
                (out / f"{name}_report.txt").write_bytes(txt)
                pdf.unlink()
    sysv = ["--system", "208Y/120 V"]
    sample_csv = [str(p) for p in sorted(SAMPLES.glob("*.csv"))]
    for nm, argv in (
        ("folder", ["schedule", str(jobs / "many"), *sysv]),
        ("one", ["schedule", str(jobs / "one" / "all.csv"), *sysv]),
        ("samples", ["schedule", *sample_csv, *sysv, "--keep-going"]),
    ):
        run(nm, argv)
        run(f"{nm}_csv", [*argv, "--out", f"{nm}.csv"])
        run(f"{nm}_xlsx", [*argv, "--out", f"{nm}.xlsx"])
    for book in out.glob("*.xlsx"):  # the file carries the time it was made: keep cells
        (out / f"{book.name}.txt").write_text(xlsx_text(book), encoding="utf-8")
        book.unlink()
    print(f"snapshot written to {out} ({len(list(out.iterdir()))} files)")


if __name__ == "__main__":
    main()
