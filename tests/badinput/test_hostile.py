"""Hostile and broken files: a clear exit-2 answer, inputs untouched, outputs atomic.

Limits chosen and why
---------------------
* Job file size: ``feedcheck.inputs.job_file.MAX_JOB_BYTES`` (2 MB). The largest real job (a few
  hundred panels, every key commented) is well under 200 kB; 2 MB leaves ten times
  that and keeps parsing and checking within a couple of seconds, so a huge or
  generated file is refused up front, before it is decoded or parsed.
* Nesting: TOML arrays or inline tables nested deeper than the parser's recursion
  limit are refused as "nested too deeply" (a job needs two levels).
* Element count: no separate cap; anything that fits in 2 MB checks in seconds
  (a 300-panel job is run below).
* Schedule paths are relative to the job file's folder: absolute paths, drive letters,
  backslashes and any '..' part are refused as written; the path is then resolved
  (following symbolic links) and refused if it leads outside the folder or does not
  name an existing file. A link that stays inside the folder is accepted.
* Inputs are opened read-only: their bytes (sha256) are the same after any run.
* Output (``--out``) is written to a temporary ``.<name>.*.part`` file beside the
  target and renamed into place; a failed or interrupted run leaves neither the target
  nor the temporary file, and an existing target is left as it was.
"""

from __future__ import annotations

import hashlib
import os
import time

import pytest

from feedcheck import io_atomic
from feedcheck.inputs.job_file import MAX_JOB_BYTES

from . import GOOD, assert_no_traceback, assert_rejected, cli, line_of

EXPECTED_EMPTY = (
    "got '(empty file)'; expected a TOML job file with [project], [source], "
    "[[transformer]], [[run]] and [[panel]] (see `feedcheck init`)"
)


def _job(tmp_path, data: bytes | str, name: str = "job.toml"):
    p = tmp_path / name
    if isinstance(data, str):
        p.write_text(data, encoding="utf-8")
    else:
        p.write_bytes(data)
    return p


def _sha(p) -> str:
    return hashlib.sha256(p.read_bytes()).hexdigest()


def test_oversize_job_refused_before_parsing(tmp_path):
    # valid TOML comments padding a valid job past the limit
    pad = ("# " + "x" * 98 + "\n") * (MAX_JOB_BYTES // 100 + 10)
    job = _job(tmp_path, GOOD + pad)
    size = job.stat().st_size
    out = tmp_path / "o.json"
    t0 = time.perf_counter()
    r = cli("check", job, "--format", "json", "--out", out)
    assert time.perf_counter() - t0 < 5
    (line,) = assert_rejected(r, out, n=1)
    assert line == f"error: {job}: got '{size} bytes'; expected a job file under 2 MB"


def test_just_under_the_limit_is_read(tmp_path):
    pad = ("# " + "x" * 98 + "\n") * ((MAX_JOB_BYTES - len(GOOD)) // 101 - 1)
    job = _job(tmp_path, GOOD + pad)
    assert job.stat().st_size <= MAX_JOB_BYTES
    r = cli("check", job)
    assert_no_traceback(r)
    assert r.exit_code in (0, 1), r.stderr


@pytest.mark.parametrize(
    "payload",
    [
        b"a = " + b"[" * 50_000 + b"]" * 50_000,
        b"a = " + b"{b = " * 5_000 + b"1" + b"}" * 5_000,
    ],
    ids=["deep-arrays", "deep-inline-tables"],
)
def test_deep_nesting_refused(tmp_path, payload):
    job = _job(tmp_path, payload)
    out = tmp_path / "o.json"
    (line,) = assert_rejected(cli("check", job, "--out", out), out, n=1)
    assert line == (
        f"error: {job}: got 'arrays or tables nested too deeply'; "
        "expected a job file nested a few levels at most"
    )


def test_huge_array_under_unknown_key(tmp_path):
    job = _job(tmp_path, "huge = [" + "1," * 300_000 + "]\n" + GOOD)
    lines = assert_rejected(cli("check", job), n=1)
    assert lines[0].startswith(f"error: {job}:1: huge got 'huge'; ")
    assert "expected one of the keys project, source, transformer" in lines[0]


def test_huge_value_is_shortened_in_the_message(tmp_path):
    job = _job(tmp_path, GOOD.replace('length = "60 ft"', f'length = "60 {"m*" * 5000}m"'))
    (line,) = assert_rejected(cli("check", job), n=1)
    assert len(line) < 400 and "..." in line


@pytest.mark.parametrize(
    ("data", "tail"),
    [
        (b"", EXPECTED_EMPTY),
        (b"  \n\t\r\n", EXPECTED_EMPTY),
        (
            GOOD.replace("invented", "caf\xe9").encode("latin-1"),
            "got 'byte 0xe9'; expected UTF-8 text (save the file as UTF-8)",
        ),
        (GOOD.encode("utf-16"), "got 'byte 0xff'; expected UTF-8 text (save the file as UTF-8)"),
        (bytes(range(256)), "got 'byte 0x80'; expected UTF-8 text (save the file as UTF-8)"),
        (
            b"\x00" * 64,
            "got 'Invalid statement'; expected valid TOML (key = \"value\" lines under [tables])",
        ),
    ],
    ids=["empty", "whitespace", "latin-1", "utf-16", "binary", "nul-bytes"],
)
def test_unreadable_content(tmp_path, data, tail):
    job = _job(tmp_path, data)
    (line,) = assert_rejected(cli("check", job), n=1)
    assert line.startswith(f"error: {job}") and line.endswith(tail), line


def test_byte_order_mark_is_accepted(tmp_path):
    """Some Windows editors save UTF-8 with a BOM; the job must still read."""
    job = _job(tmp_path, b"\xef\xbb\xbf" + GOOD.replace("\n", "\r\n").encode())
    r = cli("check", job)
    assert_no_traceback(r)
    assert r.exit_code in (0, 1), r.stderr


def test_folder_instead_of_file(tmp_path):
    (line,) = assert_rejected(cli("check", tmp_path), n=1)
    assert line == f"error: {tmp_path}: got '{tmp_path}'; expected a job file (.toml), not a folder"


def test_missing_file(tmp_path):
    job = tmp_path / "nope.toml"
    (line,) = assert_rejected(cli("check", job), n=1)
    assert line == (
        f"error: {job}: got '{job}'; expected a readable job file (No such file or directory)"
    )


def test_many_elements_within_limit(tmp_path):
    """300 panels fanned out of one panel: checked, not refused, in seconds."""
    extra = "".join(
        f'\n[[run]]\nid = "F{i}"\nfrom = "PB"\nto = "Q{i}"\nlength = "10 ft"\n'
        f'conductors = "12 AWG Cu"\ndevice = "20 A"\n'
        f'\n[[panel]]\nid = "Q{i}"\nrating = "20 A"\nload = "1 kVA"\n'
        for i in range(300)
    )
    job = _job(tmp_path, GOOD + extra)
    t0 = time.perf_counter()
    r = cli("check", job, "--format", "json")
    assert time.perf_counter() - t0 < 20
    assert_no_traceback(r)
    assert r.exit_code in (0, 1), r.stderr[-500:]


# ------------------------------------------------------------------ schedule paths
def _with_schedule(path_text: str) -> str:
    return GOOD.replace('load = "20 kVA"', f'load = "20 kVA"\nschedule = "{path_text}"')


INSIDE = "a path inside the job file's folder (no absolute paths, no '..')"


@pytest.mark.parametrize(
    "target", ["/etc/passwd", "/etc/passwd.csv", "../x.csv", "sub/../../x.csv", "a/../b.csv"]
)
def test_schedule_outside_folder_refused_as_written(tmp_path, target):
    text = _with_schedule(target)
    job = _job(tmp_path, text)
    (line,) = assert_rejected(cli("check", job), n=1)
    ext_ok = target.endswith(".csv")
    tail = INSIDE if ext_ok or target.startswith("/") else "a .csv or .xlsx schedule file"
    assert line == (
        f"error: {job}:{line_of(text, 'schedule =')}: panel[2].schedule got '{target}'; "
        f"expected {tail}"
    )


def test_schedule_symlink_escaping_folder_refused(tmp_path):
    outside = tmp_path / "elsewhere"
    outside.mkdir()
    (outside / "secret.csv").write_text("circuit,load [VA]\n1,100\n")
    folder = tmp_path / "jobdir"
    folder.mkdir()
    os.symlink(outside / "secret.csv", folder / "pb.csv")
    text = _with_schedule("pb.csv")
    job = _job(folder, text)
    (line,) = assert_rejected(cli("check", job), n=1)
    assert line == (
        f"error: {job}:{line_of(text, 'schedule =')}: panel[2].schedule got 'pb.csv'; "
        f"expected {INSIDE}; this one leads outside it through a link"
    )


def test_schedule_folder_symlink_escaping_refused(tmp_path):
    outside = tmp_path / "elsewhere"
    outside.mkdir()
    (outside / "pb.csv").write_text("x\n")
    folder = tmp_path / "jobdir"
    folder.mkdir()
    os.symlink(outside, folder / "sched")
    job = _job(folder, _with_schedule("sched/pb.csv"))
    (line,) = assert_rejected(cli("check", job), n=1)
    assert "leads outside it through a link" in line


def test_schedule_link_loop_refused(tmp_path):
    os.symlink(tmp_path / "b.csv", tmp_path / "a.csv")
    os.symlink(tmp_path / "a.csv", tmp_path / "b.csv")
    job = _job(tmp_path, _with_schedule("a.csv"))
    (line,) = assert_rejected(cli("check", job), n=1)
    assert "panel[2].schedule got 'a.csv'" in line


def test_schedule_symlink_inside_folder_accepted_by_job_reader(tmp_path):
    from feedcheck.inputs.job_file import read_job

    (tmp_path / "real").mkdir()
    (tmp_path / "real" / "pb.csv").write_text("x\n")
    os.symlink(tmp_path / "real" / "pb.csv", tmp_path / "pb.csv")
    job = read_job(_job(tmp_path, _with_schedule("pb.csv")))
    assert job.panels[1].schedule == tmp_path / "pb.csv"


# ------------------------------------------------------------------ inputs untouched
@pytest.mark.parametrize("broken", [False, True], ids=["valid", "invalid"])
def test_inputs_never_modified(tmp_path, broken):
    text = GOOD if not broken else GOOD.replace('length = "60 ft"', 'length = "60"')
    job = _job(tmp_path, text)
    before = _sha(job), job.stat().st_mtime_ns
    for fmt in ("text", "json", "csv"):
        cli("check", job, "--format", fmt, "--out", tmp_path / f"o.{fmt}")
    assert (_sha(job), job.stat().st_mtime_ns) == before
    assert sorted(p.name for p in tmp_path.iterdir() if p.name.startswith(".")) == []


# ------------------------------------------------------------------ atomic outputs
def test_failed_run_leaves_existing_output_alone(tmp_path):
    out = tmp_path / "r.json"
    out.write_text("previous results\n")
    job = _job(tmp_path, GOOD.replace('length = "60 ft"', 'length = "60 kVA"'))
    r = cli("check", job, "--format", "json", "--out", out)
    assert r.exit_code == 2
    assert out.read_text() == "previous results\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["job.toml", "r.json"]


@pytest.mark.parametrize("exc", [KeyboardInterrupt, OSError], ids=["interrupt", "disk-full"])
def test_interrupted_write_leaves_nothing(tmp_path, monkeypatch, exc):
    """Half the text reaches the temporary file, then the write is interrupted."""
    job = _job(tmp_path, GOOD)
    out = tmp_path / "r.json"

    def half_then_fail(self, data, *a, **kw):
        with open(self, "w", encoding="utf-8") as fh:
            fh.write(data[: len(data) // 2])
        raise exc("interrupted during the write")

    monkeypatch.setattr(io_atomic.Path, "write_text", half_then_fail)
    from click.testing import CliRunner

    from feedcheck.cli import main

    r = CliRunner().invoke(main, ["check", str(job), "--format", "json", "--out", str(out)])
    # click turns an interrupt into "Aborted!" (exit 1); the CLI reports an OSError
    # without a traceback. Either way: a non-zero exit and nothing left behind.
    assert r.exit_code != 0
    assert "Traceback" not in r.output
    monkeypatch.undo()
    assert not out.exists()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["job.toml"]


def test_interrupt_keeps_previous_output(tmp_path, monkeypatch):
    out = tmp_path / "r.txt"
    out.write_text("old\n")

    def boom(src, dst):
        raise KeyboardInterrupt

    monkeypatch.setattr(io_atomic.os, "replace", boom)
    with pytest.raises(KeyboardInterrupt):
        io_atomic.write_text_atomic(out, "new text\n")
    monkeypatch.undo()
    assert out.read_text() == "old\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["r.txt"]
