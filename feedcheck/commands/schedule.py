"""``feedcheck schedule``: check panel schedules (CSV/XLSX) circuit by circuit.

Thin: parse the options, call :mod:`feedcheck.inputs.schedule_file`,
:mod:`feedcheck.checks.schedules`, :mod:`feedcheck.render.schedules` (the --out file) and
:mod:`feedcheck.render.schedule_text` (the summary printed). Heavy modules are imported in
the body.
"""

from __future__ import annotations

import sys
from pathlib import Path

import click

from .. import CAUTION
from ..model import OCCUPANCIES
from .params import CURRENT, VOLTAGE_SYSTEM, QuantityType

DROP = QuantityType("percent", must_be_positive=False)

PROGRESS_FROM = 10  # show a progress bar from this many files on
SHOW_CIRCUITS = 20  # failing/warning circuits listed per file without --all

HELP = f"""Check panel schedules: every circuit's breaker, conductor, grounding
conductor and voltage drop; phase balance; connected and demand load.

FILE_OR_FOLDER is a .csv or .xlsx schedule, or a folder of them. Columns
(header row 1, case and spacing do not matter): circuit, load [VA|kVA|W|kW|A],
breaker [A], conductor ("12 AWG Cu"), length [ft|m]; optional description,
poles, power factor, kind (lighting, receptacle, motor, heating, other),
continuous (yes/no), insulation, termination, ground, current carrying,
ambient, raceway, panel (several panels in one file).

\b
Examples:
  feedcheck schedule LP1.csv --system "208Y/120 V"
  feedcheck schedule schedules/ --system "120/240 V" --out results.xlsx
  feedcheck schedule --job site.toml LP1.csv EQ1.csv
  feedcheck schedule --job site.toml           (every schedule of the job)

Exit code 0: no failing check (warnings allowed); 1: a check failed; 2: an
input could not be read (nothing is written).

{CAUTION}
"""


def _expand(paths: tuple[str, ...]) -> list[Path]:
    out: list[Path] = []
    for p in map(Path, paths):
        if p.is_dir():
            out.extend(sorted(q for q in p.iterdir()
                              if q.suffix.lower() in (".csv", ".xlsx") and q.is_file()
                              and not q.name.startswith((".", "~$"))))
        else:
            out.append(p)
    return out


@click.command("schedule", help=HELP, context_settings={"help_option_names": ["-h", "--help"],
                                                        "max_content_width": 100})
@click.argument("inputs", nargs=-1, type=click.Path(exists=True), metavar="FILE_OR_FOLDER...")
@click.option("--system", type=VOLTAGE_SYSTEM,
              help='Panel voltage, e.g. "208Y/120 V", "120/240 V", "480Y/277 V".')
@click.option("--job", "job_file", type=click.Path(exists=True, dir_okay=False),
              help="Job file: each panel's voltage and feeder drop come from it; files are "
                   "matched to panels by the job's schedule paths.")
@click.option("--feeder-drop", "feeder_drop", type=DROP, default="0%", show_default=True,
              help="Drop from the source to the panel, added for the total (with --system).")
@click.option("--occupancy", type=click.Choice(list(OCCUPANCIES)), default=None,
              help="Lighting demand factors (NFPA 70 Table 220.42); default other. With "
                   "--job each panel's occupancy comes from the job.")
@click.option("--bus", "bus_a", type=CURRENT, help="Panel bus rating, e.g. 225A (with --system).")
@click.option("--main", "main_a", type=CURRENT, help="Main device rating (with --system).")
@click.option("--out", "out", type=click.Path(dir_okay=False),
              help="Write every circuit with status and reason to .csv, .xlsx or .json "
                   "(atomically).")
@click.option("--all", "show_all", is_flag=True, help="List every failing/warning circuit.")
def schedule_command(inputs, system, job_file, feeder_drop, occupancy, bus_a, main_a, out,
                     show_all):
    from ..errors import InputError

    if system is not None and job_file:
        raise click.UsageError("give either --system or --job, not both")
    if system is None and not job_file:
        raise click.UsageError('give the panel voltage with --system "208Y/120 V" or a --job')
    if out and Path(out).suffix.lower() not in (".csv", ".xlsx", ".json"):
        raise click.UsageError(f"--out: got {out!r}; expected a .csv, .xlsx or .json file")
    if job_file and (bus_a or main_a or feeder_drop or occupancy):
        raise click.UsageError(
            "--bus, --main, --feeder-drop and --occupancy come from the job with --job")
    occupancy = occupancy or "other"
    files = _expand(inputs)
    if not files and not job_file:
        raise click.UsageError("no .csv or .xlsx schedule found in the inputs")
    if out:
        from ..io_atomic import check_output

        check_output(out, [*files, *([job_file] if job_file else [])])  # before the work
    done: list[str] = []
    try:
        if job_file:
            results = _from_job(job_file, files)
            done = [str(r.path) for r in results]
        else:
            results = _from_files(files, system, feeder_drop, occupancy, bus_a, main_a, done)
        if out:
            from ..io_atomic import check_output
            from ..render.schedules import write_results

            check_output(out, [*files, *done, *([job_file] if job_file else [])])

            write_results(results, out, CAUTION)
    except KeyboardInterrupt:
        _report_partial(done, files, "interrupted")
        sys.exit(130)
    except InputError as exc:
        for p in exc.problems:
            click.echo(f"error: {p}", err=True)
        n = len(exc.problems)
        click.echo(f"{n} problem{'s' if n != 1 else ''} in the input; nothing was written.",
                   err=True)
        if done:
            click.echo(f"checked without problems: {', '.join(done)}", err=True)
        sys.exit(2)
    except OSError as exc:
        _report_partial(done, files, f"could not write {out} ({exc.strerror})")
        sys.exit(2)
    from ..render.schedule_text import render_schedule_summary

    click.echo(render_schedule_summary(results, show_all, SHOW_CIRCUITS), nl=False)
    if out:
        click.echo(f"wrote {out}", err=True)
    sys.exit(1 if any(r.exit_code for r in results) else 0)


def _report_partial(done, files, why: str) -> None:
    click.echo(f"{why}: nothing was written; {len(done)} of {len(files) or len(done)} inputs "
               f"were checked: {', '.join(done) or 'none'}", err=True)


def _from_files(files, system, feeder_drop, occupancy, bus_a, main_a, done):
    from ..checks.schedules import check_schedule
    from ..errors import InputError
    from ..inputs.schedule_file import read_schedule

    results, problems = [], []

    def one(path):
        try:
            s = read_schedule(path)
            results.append(check_schedule(s, system, feeder_drop, occupancy, bus_a, main_a))
            done.append(str(path))
        except InputError as exc:
            problems.extend(exc.problems)

    if len(files) >= PROGRESS_FROM:
        with click.progressbar(files, label="checking schedules", file=sys.stderr) as bar:
            for f in bar:
                one(f)
    else:
        for f in files:
            one(f)
    if problems:
        raise InputError(problems)
    return results


def _from_job(job_file, files):
    """The job's schedules exactly as ``feedcheck check`` checks them: through the runner
    (feeder drop from the walk, bus and main ratings, the job's drop limits and each
    panel's occupancy)."""
    from ..errors import InputError, Problem
    from ..runner import load_and_check
    from .clock import calc_date

    job, res = load_and_check(job_file, calc_date())
    by_path = {p.schedule.resolve(): p.id for p in job.panels if p.schedule is not None}
    if not files:
        wanted = list(by_path.values())
    else:
        wanted, problems = [], []
        for f in files:
            pid = by_path.get(f.resolve())
            if pid is None:
                problems.append(Problem(str(f), "", f.name,
                                        f"a schedule named by a panel of {job_file}"))
            else:
                wanted.append(pid)
        if problems:
            raise InputError(problems)
    return [res.schedules[pid] for pid in wanted if pid in res.schedules]


