"""Embed a job's inputs in its report PDF and take them out again.

A report carries, as PDF file attachments:

* ``feedcheck-inputs.json`` — a small manifest: format version, the job file's
  name, the schedule paths (relative to the job file, as the job names them);
* ``inputs/<job file>`` and ``inputs/<schedule path>`` — the input files, byte for byte;
* ``feedcheck-results.json`` — the results as rendered by
  :func:`feedcheck.render.json_csv.render_json` when the report was made.

:func:`extract_inputs` writes the inputs into a folder (never outside it); the
comparison of a re-run with the embedded results is
:mod:`feedcheck.render.pdf.rerun_compare`. Nothing here computes an electrical figure.
"""

from __future__ import annotations

import io
import json
import re
from dataclasses import dataclass
from pathlib import Path, PurePosixPath

from ...inputs.files import FileRefused, check_size, decode_utf8

MANIFEST_NAME = "feedcheck-inputs.json"
RESULTS_NAME = "feedcheck-results.json"
INPUT_PREFIX = "inputs/"
FORMAT = "feedcheck-report-inputs/1"
MAX_ATTACHMENT_BYTES = 20_000_000


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


def _read_attachments(pdf_path: Path) -> dict[str, bytes]:
    import logging

    from pypdf import PdfReader
    from pypdf.errors import PyPdfError

    log = logging.getLogger("pypdf")
    level = log.level
    log.setLevel(logging.ERROR)  # a damaged file gets one clear message, not pypdf's notes
    try:
        reader = PdfReader(str(pdf_path))
        found = {}
        for name, contents in reader.attachments.items():
            if not contents:
                continue
            data = contents[0]
            try:
                check_size(len(data), MAX_ATTACHMENT_BYTES, "a smaller attachment")
            except FileRefused:
                raise NotAReport(f"attachment {name!r} is larger than expected") from None
            found[name] = data
        return found
    except NotAReport:
        raise
    except (OSError, PyPdfError, ValueError, KeyError, TypeError, AttributeError) as exc:
        raise NotAReport(f"{pdf_path}: cannot read it as a PDF ({exc})") from exc
    finally:
        log.setLevel(level)


def extract_inputs(pdf_path: str | Path, dest: str | Path) -> Extracted:
    """Write a report's embedded inputs into ``dest``; return where they went.

    Schedules land at the same paths relative to the job file as in the
    original. Nothing is written outside ``dest``.

    Raises
    ------
    NotAReport
        The file is unreadable, has no feedcheck manifest or results, or an
        attachment name would leave ``dest``.
    """
    pdf_path = Path(pdf_path)
    dest = Path(dest).resolve()
    found = _read_attachments(pdf_path)
    if MANIFEST_NAME not in found or RESULTS_NAME not in found:
        raise NotAReport(f"{pdf_path}: not a feedcheck report (no embedded inputs and results)")
    try:
        manifest = json.loads(decode_utf8(found[MANIFEST_NAME], "UTF-8", drop_bom=False))
        results = json.loads(decode_utf8(found[RESULTS_NAME], "UTF-8", drop_bom=False))
    except (FileRefused, json.JSONDecodeError) as exc:
        raise NotAReport(f"{pdf_path}: the embedded manifest or results are damaged") from exc
    if not isinstance(manifest, dict) or manifest.get("format") != FORMAT:
        raise NotAReport(f"{pdf_path}: unknown embedded-inputs format")
    if not isinstance(results, dict) or not {"nodes", "findings"} <= set(results):
        raise NotAReport(f"{pdf_path}: the embedded results lack nodes and findings")
    job_name = manifest.get("job")
    schedules = manifest.get("schedules") or []
    if not isinstance(job_name, str) or not isinstance(schedules, list):
        raise NotAReport(f"{pdf_path}: the embedded manifest is damaged")
    written: dict[str, Path] = {}
    for name in [job_name, *schedules]:
        rel = safe_relative(str(name))
        key = INPUT_PREFIX + str(rel)
        if key not in found:
            raise NotAReport(f"{pdf_path}: embedded input {str(rel)!r} is missing")
        target = (dest / rel).resolve()
        if not target.is_relative_to(dest):
            raise NotAReport(f"unsafe attachment name {name!r}")
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_bytes(found[key])
        written[str(rel)] = target
    return Extracted(
        written[str(safe_relative(job_name))],
        tuple(written[str(safe_relative(s))] for s in schedules),
        results,
        manifest,
    )
