"""A workbench session over a copy of a sample job, its WSGI application and a
Werkzeug test client speaking to it as the page does (token in the path, this
server's Host header, JSON bodies)."""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest
from werkzeug.test import Client

from feedcheck.template import TEMPLATE
from feedcheck.workbench.actions import Session
from feedcheck.workbench.server import Lifetime, Workbench

ROOT = Path(__file__).resolve().parents[2]
SAMPLES = ROOT / "sample_jobs"
PORT = 48123
TOKEN = "test-token-0123456789abcdefghij"
BASE = f"http://127.0.0.1:{PORT}"


def copy_sample(folder: Path, name: str = "harbor_kitchen.toml") -> Path:
    """The sample job and every schedule beside it, copied into ``folder``."""
    for extra in SAMPLES.iterdir():
        if extra.suffix in (".csv", ".xlsx", ".toml"):
            shutil.copy(extra, folder / extra.name)
    return folder / name


class Page:
    """Requests as the page sends them."""

    def __init__(self, app: Workbench) -> None:
        self.app = app
        self.client = Client(app)

    def get(self, route: str, **kw):
        return self.client.get(f"/{TOKEN}/{route}", base_url=BASE, **kw)

    def post(self, route: str, body: dict | None = None, **kw):
        return self.client.post(f"/{TOKEN}/{route}", base_url=BASE, json=body or {}, **kw)

    def edit(self, *edits: dict, rev: int | None = None):
        if rev is None:
            rev = self.get("api/state").json["rev"]
        return self.post("api/edit", {"rev": rev, "edits": list(edits)})


@pytest.fixture
def static_dir(tmp_path_factory) -> Path:
    d = tmp_path_factory.mktemp("static")
    (d / "index.html").write_text("<!doctype html><title>wb</title>", encoding="utf-8")
    (d / "app.js").write_text("// page\n", encoding="utf-8")
    return d


def make_page(job: Path, static_dir: Path, exists: bool = True) -> Page:
    text = job.read_text(encoding="utf-8") if exists else TEMPLATE
    session = Session(job, "2026-12-01", text, exists)
    return Page(Workbench(session, TOKEN, PORT, static_dir=static_dir, lifetime=Lifetime()))


@pytest.fixture
def job(tmp_path) -> Path:
    return copy_sample(tmp_path)


@pytest.fixture
def page(job, static_dir) -> Page:
    return make_page(job, static_dir)
