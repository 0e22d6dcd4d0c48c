"""Embed a job's inputs in its report PDF and take them out again.

A report carries, as PDF file attachments:

* ``feedcheck-inputs.json`` — a small manifest: format version, the job file's
  name, the schedule paths (relative to the job file, as the job names them);
* ``inputs/<job file>`` and ``inputs/<schedule path>`` — the input files, byte for byte;
* ``feedcheck-results.json`` — the results as rendered by
  :func:`feedcheck.render.json_csv.render_json` when the report was made.

:func:`read_report` reads and checks them within bounded memory (only what the
manifest names, within a total budget; duplicates, AES encryption and results of the
wrong shape refused); :func:`extract_inputs` writes the inputs into a folder (never
outside it); the
comparison of a re-run with the embedded results is
:mod:`feedcheck.render.pdf.rerun_compare`. Nothing here computes an electrical figure.
"""

from __future__ import annotations

import io
import json
import re
from dataclasses import dataclass
from pathlib import Path, PurePosixPath

from ...inputs.files import FileKind, FileRefused, decode_utf8, read_bytes

MANIFEST_NAME = "feedcheck-inputs.json"
RESULTS_NAME = "feedcheck-results.json"
INPUT_PREFIX = "inputs/"
FORMAT = "feedcheck-report-inputs/1"
MAX_ATTACHMENT_BYTES = 20_000_000  # one embedded file, unpacked
MAX_TOTAL_BYTES = 60_000_000  # all embedded files read, unpacked, together
MAX_ATTACHMENTS = 1_000  # attachments listed (a report carries a job and its schedules)
REPORT_FILE = FileKind(
    noun="report",
    folder_hint="(.pdf)",
    max_bytes=100_000_000,
    too_large="a report PDF under 100 MB",
)


class NotAReport(Exception):
    """The PDF cannot be read, or carries no feedcheck inputs (exit code 2)."""


@dataclass(frozen=True)
class Extracted:
    """What :func:`extract_inputs` wrote, and the embedded results."""

    job_path: Path
    schedules: tuple[Path, ...]
    results: dict
    manifest: dict


def input_attachments(job) -> list[tuple[str, bytes]]:
    """Attachment (name, bytes) pairs for a job's input files, manifest first.

    The job file is read from ``job.path`` (its bytes as on disk, which
    ``job.text`` was decoded from); each panel schedule that exists is
    attached under its path relative to the job file.
    """
    job_path = Path(job.path)
    files: list[tuple[str, bytes]] = [(job_path.name, job_path.read_bytes())]
    schedules: list[str] = []
    for panel in job.panels:
        sched = getattr(panel, "schedule", None)
        if sched is None or not Path(sched).is_file():
            continue
        try:
            rel = PurePosixPath(Path(sched).relative_to(job_path.parent).as_posix())
        except ValueError:
            rel = PurePosixPath(Path(sched).name)
        if str(rel) not in schedules:
            schedules.append(str(rel))
            files.append((str(rel), Path(sched).read_bytes()))
    manifest = {
        "format": FORMAT,
        "job": job_path.name,
        "schedules": schedules,
        "results": RESULTS_NAME,
    }
    text = json.dumps(manifest, indent=2, sort_keys=True) + "\n"
    return [(MANIFEST_NAME, text.encode("utf-8"))] + [
        (INPUT_PREFIX + name, data) for name, data in files
    ]


def attach(pdf_bytes: bytes, attachments: list[tuple[str, bytes]]) -> bytes:
    """Return ``pdf_bytes`` with the attachments added (deterministic output)."""
    from pypdf import PdfReader, PdfWriter

    writer = PdfWriter(clone_from=PdfReader(io.BytesIO(pdf_bytes)))
    for name, data in attachments:
        writer.add_attachment(name, data)
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


_SAFE_PART = re.compile(r"^[A-Za-z0-9_][A-Za-z0-9_. \-]{0,120}$")


def safe_relative(name: str) -> PurePosixPath:
    """Check an attachment name is a plain relative path; return it.

    Raises NotAReport for absolute paths, ``..``, backslashes, drive letters,
    control characters or hidden/empty parts.
    """
    if not name or "\\" in name or ":" in name or name.startswith("/"):
        raise NotAReport(f"unsafe attachment name {name!r}")
    p = PurePosixPath(name)
    if not p.parts or any(not _SAFE_PART.match(part) or part in (".", "..") for part in p.parts):
        raise NotAReport(f"unsafe attachment name {name!r}")
    return p


def _quiet_pypdf():
    import logging

    log = logging.getLogger("pypdf")
    level = log.level
    log.setLevel(logging.ERROR)  # a damaged file gets one clear message, not pypdf's notes
    return log, level


def _open_pdf(pdf_path: Path):
    """A PdfReader of the report, read from a regular file of bounded size; an
    encrypted report is opened with an empty password (RC4 as pypdf does it alone;
    AES is refused, see below)."""
    from pypdf import PdfReader
    from pypdf.errors import DependencyError

    try:
        raw = read_bytes(pdf_path, REPORT_FILE)
    except FileRefused as exc:
        raise NotAReport(f"{pdf_path}: got {exc.value!r}; expected {exc.expected}") from None
    reader = PdfReader(io.BytesIO(raw))
    if reader.is_encrypted:
        try:
            ok = reader.decrypt("")
        except DependencyError:
            raise NotAReport(
                f"{pdf_path}: the report is encrypted with AES, which feedcheck does not "
                "open; save an unencrypted copy of it (any PDF viewer can) and rerun that"
            ) from None
        if not ok:
            raise NotAReport(f"{pdf_path}: the report needs a password; save an unencrypted copy")
    return reader


def _attachment_entries(reader, pdf_path: Path) -> dict[str, object]:
    """Attachment name → its one entry (contents not yet read). Two attachments of
    the same name are refused: which one a reader would take is not defined."""
    entries: dict[str, object] = {}
    for entry in reader.attachment_list:
        for name in entry._names:
            if name in entries and entries[name] is not entry:
                raise NotAReport(f"{pdf_path}: attachment {name!r} appears twice; refused")
            entries[name] = entry
            if len(entries) > MAX_ATTACHMENTS:
                raise NotAReport(
                    f"{pdf_path}: more than {MAX_ATTACHMENTS} attachments; not a feedcheck report"
                )
    return entries


class _Budget:
    """Reads attachment contents within a per-file and a total uncompressed budget."""

    def __init__(self, pdf_path: Path, entries: dict[str, object]) -> None:
        self.pdf_path, self.entries, self.used = pdf_path, entries, 0

    def read(self, name: str) -> bytes | None:
        entry = self.entries.get(name)
        if entry is None:
            return None
        data = entry.content
        if len(data) > MAX_ATTACHMENT_BYTES:
            raise NotAReport(
                f"{self.pdf_path}: attachment {name!r} unpacks to {len(data)} bytes; "
                f"expected at most {MAX_ATTACHMENT_BYTES}"
            )
        self.used += len(data)
        if self.used > MAX_TOTAL_BYTES:
            raise NotAReport(
                f"{self.pdf_path}: the embedded inputs unpack to more than "
                f"{MAX_TOTAL_BYTES} bytes in all; refused"
            )
        return data


def _json(data: bytes, pdf_path: Path, what: str):
    try:
        return json.loads(decode_utf8(data, "UTF-8", drop_bom=False))
    except (FileRefused, json.JSONDecodeError, RecursionError) as exc:
        raise NotAReport(f"{pdf_path}: the embedded {what} are damaged") from exc


@dataclass(frozen=True)
class Embedded:
    """A report's embedded manifest, results and input files (relative path → bytes),
    read and checked but not yet written anywhere."""

    job: str
    schedules: tuple[str, ...]
    files: dict[str, bytes]
    results: dict
    manifest: dict


def read_report(pdf_path: str | Path) -> Embedded:
    """Read and check what a report embeds, within bounded memory; write nothing.

    Only the attachments the report's own manifest names are unpacked (each at most
    ``MAX_ATTACHMENT_BYTES``, together at most ``MAX_TOTAL_BYTES``).

    Raises
    ------
    NotAReport
        Not a regular file or too large; unreadable as a PDF; encrypted with AES or a
        password; duplicate attachment names; no feedcheck manifest or results; an
        unsafe input name; results of the wrong shape (:func:`check_results_shape`).
    """
    from pypdf.errors import PyPdfError

    pdf_path = Path(pdf_path)
    log, level = _quiet_pypdf()
    try:
        reader = _open_pdf(pdf_path)
        budget = _Budget(pdf_path, _attachment_entries(reader, pdf_path))
        raw_manifest, raw_results = budget.read(MANIFEST_NAME), budget.read(RESULTS_NAME)
        if raw_manifest is None or raw_results is None:
            raise NotAReport(f"{pdf_path}: not a feedcheck report (no embedded inputs and results)")
        manifest = _json(raw_manifest, pdf_path, "manifest")
        job, schedules = _manifest_names(manifest, pdf_path)
        results = _json(raw_results, pdf_path, "results")
        check_results_shape(results, pdf_path)
        files: dict[str, bytes] = {}
        for rel in (job, *schedules):
            data = budget.read(INPUT_PREFIX + rel)
            if data is None:
                raise NotAReport(f"{pdf_path}: embedded input {rel!r} is missing")
            files[rel] = data
        return Embedded(job, schedules, files, results, manifest)
    except NotAReport:
        raise
    except (
        OSError,
        PyPdfError,
        ValueError,
        KeyError,
        TypeError,
        AttributeError,
        RecursionError,
    ) as exc:
        raise NotAReport(f"{pdf_path}: cannot read it as a PDF ({exc})") from exc
    finally:
        log.setLevel(level)


def _manifest_names(manifest, pdf_path: Path) -> tuple[str, tuple[str, ...]]:
    """The job file's and the schedules' relative paths, checked safe and distinct."""
    if not isinstance(manifest, dict) or manifest.get("format") != FORMAT:
        raise NotAReport(f"{pdf_path}: unknown embedded-inputs format")
    job_name = manifest.get("job")
    schedules = manifest.get("schedules") or []
    if (
        not isinstance(job_name, str)
        or not isinstance(schedules, list)
        or not all(isinstance(s, str) for s in schedules)
        or len(schedules) > MAX_ATTACHMENTS
    ):
        raise NotAReport(f"{pdf_path}: the embedded manifest is damaged")
    names = [str(safe_relative(n)) for n in (job_name, *schedules)]
    if len(set(names)) != len(names):
        raise NotAReport(f"{pdf_path}: the embedded manifest names an input twice")
    return names[0], tuple(names[1:])


def _shape_problem(results) -> str | None:
    if not isinstance(results, dict):
        return f"the results are {_kind(results)}, not an object"
    if not isinstance(results.get("job", {}), dict):
        return f"'job' is {_kind(results['job'])}, not an object"
    for key, need in (("nodes", ("id",)), ("findings", ("subject", "check"))):
        if key not in results:
            return f"'{key}' is missing"
        items = results[key]
        if not isinstance(items, list):
            return f"'{key}' is {_kind(items)}, not a list"
        for i, item in enumerate(items):
            if not isinstance(item, dict):
                return f"{key}[{i}] is {_kind(item)}, not an object"
            for k in need:
                if not isinstance(item.get(k), str):
                    return f"{key}[{i}].{k} is {_kind(item.get(k))}, not a text"
    tables = results.get("tables", [])
    if not isinstance(tables, list):
        return f"'tables' is {_kind(tables)}, not a list"
    return None


def _kind(v) -> str:
    return (
        "missing"
        if v is None
        else {
            dict: "an object",
            list: "a list",
            str: "a text",
            bool: "true/false",
            int: "a number",
            float: "a number",
        }.get(type(v), type(v).__name__)
    )


def check_results_shape(results, pdf_path: Path | str = "report") -> None:
    """Refuse embedded results that are not shaped as ``render_json`` writes them:
    an object with an optional ``job`` object, ``nodes`` (objects with a text ``id``)
    and ``findings`` (objects with a text ``subject`` and ``check``) lists.

    Raises
    ------
    NotAReport
        Naming the first part of the wrong shape.
    """
    problem = _shape_problem(results)
    if problem:
        raise NotAReport(f"{pdf_path}: the embedded results are damaged: {problem}")


def extract_inputs(pdf_path: str | Path, dest: str | Path) -> Extracted:
    """Write a report's embedded inputs into ``dest``; return where they went.

    Schedules land at the same paths relative to the job file as in the
    original. Nothing is written outside ``dest``.

    Raises
    ------
    NotAReport
        As :func:`read_report`; nothing is written then.
    """
    return write_inputs(read_report(pdf_path), dest)


def write_inputs(emb: Embedded, dest: str | Path) -> Extracted:
    """Write checked embedded inputs into ``dest`` (never outside it)."""
    dest = Path(dest).resolve()
    written: dict[str, Path] = {}
    for rel, data in emb.files.items():
        target = (dest / rel).resolve()
        if not target.is_relative_to(dest):
            raise NotAReport(f"unsafe attachment name {rel!r}")
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_bytes(data)
        written[rel] = target
    return Extracted(
        written[emb.job], tuple(written[s] for s in emb.schedules), emb.results, emb.manifest
    )
