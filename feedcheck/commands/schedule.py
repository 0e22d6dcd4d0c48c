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
from .params import CONTEXT, CURRENT, VOLTAGE_SYSTEM, QuantityType

DROP = QuantityType("percent", must_be_positive=False)

PROGRESS_FROM = 10  # show a progress bar from this many files on
LARGE_FILE_BYTES = 5_000_000  # ... or for a single file this large (terminal only)
SHOW_CIRCUITS = 20  # failing/warning circuits listed per file without --all

HELP = f"""Check panel schedules: every circuit's breaker, conductor, grounding
conductor and voltage drop; phase balance; connected and demand load.

FILE_OR_FOLDER is a .csv or .xlsx schedule, or a folder of them. Columns
(header row 1, case and spacing do not matter): circuit, load [VA|kVA|W|kW|A],
breaker [A], conductor ("12 AWG Cu"), length [ft|m]; optional description,
poles, power factor, kind (lighting, receptacle, motor, heating, other),
continuous (yes/no), insulation, termination, ground, current carrying,
ambient, raceway, panel (several panels in one file), system. Common
spellings are accepted (Ckt #, Load VA, Brkr, BKR (A), Trip, Amps, Wire,
Load Description ...); a column not understood is named in a notice and its
values are not used: map it with --columns. Spare and space rows count as
the panel's spaces; TOTAL rows are skipped and compared with the sum; the
two-column panel form (odd circuits left, even right) is detected.

\b
Examples:
  feedcheck schedule LP1.csv --system "208Y/120 V"
  feedcheck schedule schedules/ --system "120/240 V" --out results.xlsx
  feedcheck schedule --job site.toml LP1.csv EQ1.csv
  feedcheck schedule --job site.toml           (every schedule of the job)
  feedcheck schedule mixed/ --systems systems.txt --keep-going --out r.csv
  feedcheck schedule LP1.csv --system "120/240 V" --columns "Cont?=continuous,Ins=insulation"

Exit code 0: no failing check (warnings allowed); 1: a check failed; 2: an
input could not be read (by default nothing is written; with --keep-going the
readable files are checked and written, and the exit code is 2 at the end).

{CAUTION}
"""


def _expand(paths: tuple[str, ...], out: str | None = None) -> list[Path]:
    """The schedule files: the files named, and the .csv/.xlsx files of the folders named
    (without results files this command wrote, which are skipped with a notice)."""
    from ..render.schedules import is_results_file, panels_csv_path

    own = set()
    if out:
        own = {Path(out).resolve(), panels_csv_path(out).resolve()}
    out_files: list[Path] = []
    for given in map(Path, paths):
        if given.is_dir():
            for entry in sorted(given.iterdir()):
                if (
                    entry.suffix.lower() not in (".csv", ".xlsx")
                    or not entry.is_file()
                    or entry.name.startswith((".", "~$"))
                ):
                    continue
                if (own and entry.resolve() in own) or is_results_file(entry):
                    click.echo(
                        f"skipped {entry}: a results file feedcheck schedule wrote", err=True
                    )
                    continue
                out_files.append(entry)
        else:
            out_files.append(given)
    return out_files


@click.command(
    "schedule",
    help=HELP,
    context_settings=CONTEXT,
)
@click.argument("inputs", nargs=-1, type=click.Path(exists=True), metavar="FILE_OR_FOLDER...")
@click.option(
    "--system",
    type=VOLTAGE_SYSTEM,
    help='Panel voltage, e.g. "208Y/120 V", "120/240 V", "480Y/277 V".',
)
@click.option(
    "--job",
    "job_file",
    type=click.Path(exists=True, dir_okay=False),
    help="Job file: each panel's voltage and feeder drop come from it; files are "
    "matched to panels by the job's schedule paths.",
)
@click.option(
    "--feeder-drop",
    "feeder_drop",
    type=DROP,
    default="0%",
    show_default=True,
    help="Drop from the source to the panel, added for the total (with --system).",
)
@click.option(
    "--occupancy",
    type=click.Choice(list(OCCUPANCIES)),
    default=None,
    help="Lighting demand factors (NFPA 70 Table 220.42); default other. With "
    "--job each panel's occupancy comes from the job.",
)
@click.option("--bus", "bus_a", type=CURRENT, help="Panel bus rating, e.g. 225A (with --system).")
@click.option("--main", "main_a", type=CURRENT, help="Main device rating (with --system).")
@click.option(
    "--out",
    "out",
    type=click.Path(dir_okay=False),
    help="Write every circuit with status and reason to .csv, .xlsx or .json (atomically).",
)
@click.option("--all", "show_all", is_flag=True, help="List every failing/warning circuit.")
@click.option(
    "--columns",
    "columns",
    metavar="MAP",
    help='Name columns the reader does not know: "Cont?=continuous,Ins=insulation" '
    "(HEADER=COLUMN, or HEADER=ignore to skip a column knowingly).",
)
@click.option(
    "--layout",
    type=click.Choice(["auto", "one-row", "two-column"]),
    default="auto",
    show_default=True,
    help="auto detects the two-column panel form (odd circuits left, even right).",
)
@click.option(
    "--systems",
    "systems_file",
    type=click.Path(exists=True, dir_okay=False),
    help='Per-file voltage systems: lines "LP1.csv = 208Y/120 V" (# comments).',
)
@click.option(
    "--keep-going",
    "keep_going",
    is_flag=True,
    help="Check every readable file and write their results; list each unreadable "
    "file with its errors; exit 2 at the end if any was unreadable.",
)
def schedule_command(
    inputs,
    system,
    job_file,
    feeder_drop,
    occupancy,
    bus_a,
    main_a,
    out,
    show_all,
    columns,
    layout,
    systems_file,
    keep_going,
):
    from ..errors import InputError
    from .errors import echo_problems

    _check_options(system, job_file, systems_file, columns, layout)
    column_map = _column_map(columns)
    _check_out_and_panel_options(out, job_file, (bus_a, main_a, feeder_drop, occupancy))
    occupancy = occupancy or "other"
    files = _expand(inputs, out)
    if not files and not job_file:
        raise click.UsageError("no .csv or .xlsx schedule found in the inputs")
    if out:
        from ..io_atomic import check_output

        check_output(out, [*files, *([job_file] if job_file else [])])  # before the work
    done: list[str] = []
    unreadable: list = []
    try:
        if job_file:
            results = _from_job(job_file, files)
            done = [str(result.path) for result in results]
        else:
            opts = {
                "system": system,
                "systems": _systems(systems_file),
                "columns": column_map,
                "layout": layout,
                "keep_going": keep_going,
            }
            results = _from_files(
                files, opts, (feeder_drop, occupancy, bus_a, main_a), done, unreadable
            )
        if out and (results or not unreadable):
            _write_results(out, results, files, done, job_file)
    except KeyboardInterrupt:
        _report_partial(done, files, "interrupted")
        sys.exit(130)
    except InputError as exc:
        echo_problems(exc.problems)
        if done:
            click.echo(f"checked without problems: {', '.join(done)}", err=True)
        sys.exit(2)
    except OSError as exc:
        _report_partial(done, files, f"could not write {out} ({exc.strerror})")
        sys.exit(2)
    from ..render.schedule_text import render_schedule_summary

    click.echo(render_schedule_summary(results, show_all, SHOW_CIRCUITS), nl=False)
    if out and (results or not unreadable):
        click.echo(f"wrote {out}", err=True)
    if unreadable:
        _report_unreadable(unreadable)
        sys.exit(2)
    sys.exit(1 if any(result.exit_code for result in results) else 0)


def _check_options(system, job_file, systems_file, columns, layout) -> None:
    """Options for files that the job gives instead (UsageError)."""
    if system is not None and job_file:
        raise click.UsageError("give either --system or --job, not both")
    if job_file and (systems_file or columns or layout != "auto"):
        raise click.UsageError("--systems, --columns and --layout are for files without --job")


def _check_out_and_panel_options(out, job_file, panel_options) -> None:
    """The --out file kind, and panel options that the job gives instead (UsageError)."""
    if out and Path(out).suffix.lower() not in (".csv", ".xlsx", ".json"):
        raise click.UsageError(f"--out: got {out!r}; expected a .csv, .xlsx or .json file")
    if job_file and any(panel_options):
        raise click.UsageError(
            "--bus, --main, --feeder-drop and --occupancy come from the job with --job"
        )


def _write_results(out, results, files, done, job_file) -> None:
    """The --out file, checked again against every input read (exit 2 when the results
    do not fit the format)."""
    from ..io_atomic import check_output
    from ..render.schedules import write_results

    check_output(out, [*files, *done, *([job_file] if job_file else [])])
    try:
        write_results(results, out, CAUTION)
    except ValueError as exc:  # more circuits than an XLSX sheet holds
        _report_partial(done, files, str(exc))
        sys.exit(2)


def _report_unreadable(unreadable) -> None:
    """With --keep-going: every problem of the files that could not be read, and their
    names."""
    for exc in unreadable:
        for problem in exc.problems:
            click.echo(f"error: {problem}", err=True)
    names = list(dict.fromkeys(problem.file for exc in unreadable for problem in exc.problems))
    click.echo(
        f"{len(names)} file(s) could not be read (listed above; not in the results): "
        f"{', '.join(names)}",
        err=True,
    )


def _column_map(columns: str | None) -> dict[str, str]:
    from ..inputs.schedule_header import parse_column_map

    if not columns:
        return {}
    try:
        return parse_column_map(columns, "--columns")
    except ValueError as exc:
        raise click.UsageError(str(exc)) from None


def _systems(path: str | None) -> dict[str, str]:
    """``--systems FILE``: file name → system text (each line ``NAME = SYSTEM``)."""
    from ..errors import InputError, Problem
    from ..units import parse_voltage_system

    if not path:
        return {}
    try:
        raw = Path(path).read_bytes()[:1_000_001]
        text = raw.decode("utf-8-sig")
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(
            [Problem(path, "", str(exc), "a UTF-8 text file of NAME = SYSTEM lines")]
        ) from None
    out, problems = {}, []
    for line_no, line in enumerate(text.splitlines(), 1):
        body = line.split("#", 1)[0].strip()
        if not body:
            continue
        name, eq, sys_text = body.partition("=")
        try:
            if not eq or not name.strip():
                raise ValueError
            parse_voltage_system(sys_text.strip())
        except Exception:  # any unreadable line is reported with its number
            problems.append(
                Problem(
                    path,
                    f"line {line_no}",
                    line.strip(),
                    'a line such as "LP1.csv = 208Y/120 V"',
                    line_no,
                )
            )
            continue
        out[Path(name.strip()).name] = sys_text.strip()
    if len(raw) > 1_000_000:
        problems.append(Problem(path, "", "(over 1,000,000 bytes)", "a short mapping file"))
    if problems:
        raise InputError(problems)
    return out


def _report_partial(done, files, why: str) -> None:
    click.echo(
        f"{why}: nothing was written; {len(done)} of {len(files) or len(done)} inputs "
        f"were checked: {', '.join(done) or 'none'}",
        err=True,
    )


def _file_system(path: Path, schedule, opts):
    """The system of one file: --systems line, else its own ``system`` column, else
    --system; the two in-file sources must agree when both are given."""
    from ..errors import InputError, Problem
    from ..units import parse_voltage_system

    mapped = opts["systems"].get(path.name)
    text = mapped or schedule.system or opts["system"]
    if text is None:
        raise InputError(
            [
                Problem(
                    str(path),
                    "",
                    "(no system)",
                    'a voltage system: --system "208Y/120 V", a line in '
                    "--systems FILE, or a system column in the file",
                )
            ]
        )
    try:
        own = parse_voltage_system(schedule.system) if schedule.system else None
        system = text if not isinstance(text, str) else parse_voltage_system(text)
    except Exception as exc:  # the units parser's error names the text
        where = "column 'system'" if text == schedule.system else "system"
        raise InputError([Problem(str(path), where, str(text), str(exc))]) from None
    if own is not None and own != system:
        raise InputError(
            [
                Problem(
                    str(path),
                    "column 'system'",
                    schedule.system,
                    f"the same system as --systems or --system gives ({text})",
                )
            ]
        )
    return system


def _from_files(files, opts, panel_opts, done, unreadable):
    import gc

    import pandas  # noqa: F401  (its objects among those set aside below)

    # the objects made so far (the modules) are left out of the garbage collector's
    # passes while the files are read and checked (2,000 files: 0.03 s of its 0.07 s)
    gc.freeze()
    try:
        return _checked_files(files, opts, panel_opts, done, unreadable)
    finally:
        gc.unfreeze()


def _checked_files(files, opts, panel_opts, done, unreadable):
    from ..checks.schedule_batch import check_files
    from ..errors import InputError
    from ..rulebook import current_rulebook

    read, bad = [], []  # (file number, path, schedule, system); (file number, InputError)
    for k, (path, got) in enumerate(zip(files, _read_files(files, opts), strict=True)):
        try:
            if isinstance(got, InputError):
                raise got
            read.append((k, path, got, _file_system(path, got, opts)))
        except InputError as exc:
            bad.append((k, exc))
    # alike one-panel files are checked together (checks/schedule_batch.py)
    items = [(s, system) for _, _, s, system in read]
    checked = check_files(items, *panel_opts, current_rulebook())
    results = []
    for (k, path, _s, _system), res in zip(read, checked, strict=True):
        if isinstance(res, InputError):
            bad.append((k, res))
        else:
            results.append(res)
            done.append(str(path))
    bad = [exc for _, exc in sorted(bad, key=lambda kb: kb[0])]
    if bad and not opts["keep_going"]:
        raise InputError([problem for exc in bad for problem in exc.problems])
    unreadable.extend(bad)
    return results


def _read_files(files, opts) -> list:
    """Each file's Schedule or InputError: the files guarded and their cells read one by
    one (the progress bar), then alike ones read together (inputs/schedule_alike.py); a
    large file on the terminal alone, its stages shown."""
    from ..errors import InputError
    from ..inputs.schedule_alike import ScheduleReader
    from ..inputs.schedule_file import read_schedule

    columns, layout = opts["columns"], opts["layout"]
    big = [file_path for file_path in files if _size(file_path) >= LARGE_FILE_BYTES]
    if len(files) < PROGRESS_FROM and big and _on_terminal():
        got = []

        def one(path, stage=lambda _w: None):
            stage("reading")
            try:
                got.append(read_schedule(path, columns=columns, layout=layout))
                stage("checking")
            except InputError as exc:
                got.append(exc)

        for file_path in files:
            _one_with_stages(file_path, one)
        return got
    reader = ScheduleReader()
    if len(files) >= PROGRESS_FROM:
        with click.progressbar(files, label="checking schedules", file=sys.stderr) as bar:
            for file_path in bar:
                reader.add(file_path, columns=columns, layout=layout)
            return reader.read()
    for file_path in files:
        reader.add(file_path, columns=columns, layout=layout)
    return reader.read()


def _on_terminal() -> bool:
    return sys.stderr.isatty()


def _size(path: Path) -> int:
    try:
        return path.stat().st_size
    except OSError:
        return 0


def _one_with_stages(path: Path, one) -> None:
    """A large file's stages (reading, checking) as a progress bar on the terminal."""
    with click.progressbar(
        length=2,
        label=f"{path.name}",
        file=sys.stderr,
        item_show_func=lambda stage_name: stage_name,
    ) as bar:
        state = {"n": 0}

        def stage(what):
            if state["n"]:
                bar.update(1, what)
            else:
                bar.update(0, what)
            state["n"] += 1

        one(path, stage)
        bar.update(1, "done")


def _from_job(job_file, files):
    """The job's schedules exactly as ``feedcheck check`` checks them: through the runner
    (feeder drop from the walk, bus and main ratings, the job's drop limits and each
    panel's occupancy)."""
    from ..errors import InputError, Problem
    from ..runner import load_and_check
    from .clock import calc_date

    job, res = load_and_check(job_file, calc_date())
    by_path = {
        panel.schedule.resolve(): panel.id for panel in job.panels if panel.schedule is not None
    }
    if not files:
        wanted = list(by_path.values())
    else:
        wanted, problems = [], []
        for file_path in files:
            pid = by_path.get(file_path.resolve())
            if pid is None:
                problems.append(
                    Problem(
                        str(file_path),
                        "",
                        file_path.name,
                        f"a schedule named by a panel of {job_file}",
                    )
                )
            else:
                wanted.append(pid)
        if problems:
            raise InputError(problems)
    return [res.schedules[pid] for pid in wanted if pid in res.schedules]
