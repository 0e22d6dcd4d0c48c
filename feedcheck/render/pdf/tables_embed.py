"""Custom tables travel with the report.

A report made with ``--tables DIR`` carries each of the user's tables it used as
a PDF file attachment ``tables/<name>.csv`` (byte for byte), listed in a small
manifest ``feedcheck-tables.json`` with each table's sha256. ``feedcheck rerun``
and ``feedcheck extract`` write them back out so the job is checked again with
the same tables on any machine. Nothing here computes an electrical figure.
"""

from __future__ import annotations

import hashlib
import json
import re
from pathlib import Path

TABLES_MANIFEST = "feedcheck-tables.json"
TABLES_PREFIX = "tables/"
TABLES_FORMAT = "feedcheck-report-tables/1"
MAX_TABLE_ATTACHMENT_BYTES = 5_000_000  # as the table loader's own limit
_NAME = re.compile(r"^[a-z0-9_]{1,64}$")


class TablesDamaged(Exception):
    """The embedded tables cannot be used (exit code 2)."""


def table_attachments(results) -> list[tuple[str, bytes]]:
    """(name, bytes) attachments for the user's tables the results used; the
    manifest first. Empty when every table used was a shipped one."""
    from ...tables import table_path, user_tables_dir

    udir = user_tables_dir()
    if udir is None:
        return []
    files, listed = [], []
    for t in results.provenance:
        if t.origin != "user" or not _NAME.match(t.name):
            continue
        path, origin = table_path(t.name, udir)
        if origin != "user":
            continue
        data = path.read_bytes()
        files.append((f"{TABLES_PREFIX}{t.name}.csv", data))
        listed.append({"name": t.name, "sha256": hashlib.sha256(data).hexdigest()})
    if not files:
        return []
    manifest = json.dumps({"format": TABLES_FORMAT, "tables": listed}, indent=2, sort_keys=True)
    return [(TABLES_MANIFEST, (manifest + "\n").encode("utf-8")), *files]


def read_attachment_map(pdf_path: str | Path) -> dict[str, bytes]:
    """Every non-empty attachment of a PDF by name (raises on an unreadable file)."""
    from pypdf import PdfReader

    reader = PdfReader(str(pdf_path))
    return {name: c[0] for name, c in reader.attachments.items() if c}


def embedded_tables(attachments: dict[str, bytes]) -> dict[str, bytes]:
    """The embedded user tables {name: bytes}, checked against their manifest."""
    if TABLES_MANIFEST not in attachments:
        return {}
    try:
        manifest = json.loads(attachments[TABLES_MANIFEST].decode("utf-8"))
        listed = manifest["tables"] if manifest.get("format") == TABLES_FORMAT else None
    except (UnicodeDecodeError, json.JSONDecodeError, KeyError, TypeError, AttributeError):
        listed = None
    if not isinstance(listed, list):
        raise TablesDamaged("the embedded table manifest is damaged")
    out = {}
    for item in listed:
        name = item.get("name") if isinstance(item, dict) else None
        if not isinstance(name, str) or not _NAME.match(name):
            raise TablesDamaged(f"embedded table name {name!r} is not a table name")
        data = attachments.get(f"{TABLES_PREFIX}{name}.csv")
        if data is None or len(data) > MAX_TABLE_ATTACHMENT_BYTES:
            raise TablesDamaged(f"embedded table {name!r} is missing or too large")
        if hashlib.sha256(data).hexdigest() != item.get("sha256"):
            raise TablesDamaged(f"embedded table {name!r} does not match its sha256")
        out[name] = data
    return out


def write_tables(tables: dict[str, bytes], folder: Path) -> list[Path]:
    """Write the tables as ``folder/<name>.csv`` (names already checked)."""
    folder.mkdir(parents=True, exist_ok=True)
    paths = []
    for name, data in tables.items():
        p = folder / f"{name}.csv"
        p.write_bytes(data)
        paths.append(p)
    return paths


def use_embedded_tables(pdf_path: str | Path, folder: str | Path) -> list[str]:
    """For a re-run: unless the user named their own ``--tables``, write the
    report's embedded tables into ``folder`` and use them; return their names."""
    from ...tables import set_user_tables_dir, user_tables_dir

    if user_tables_dir() is not None:
        return []
    try:
        tables = embedded_tables(read_attachment_map(pdf_path))
    except TablesDamaged:
        raise
    except Exception as exc:  # pypdf raises many kinds on damaged files
        raise TablesDamaged(f"cannot read the embedded tables ({type(exc).__name__})") from exc
    if not tables:
        return []
    write_tables(tables, Path(folder))
    set_user_tables_dir(folder)
    return sorted(tables)
