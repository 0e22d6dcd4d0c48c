"""The workbench page in a real browser: Debian's Chromium driven by Playwright.

The browser is the system's (/usr/bin/chromium, or FEEDCHECK_CHROMIUM); Playwright's own
download is never used. Without a browser these tests skip and say why, unless
FEEDCHECK_REQUIRE_BROWSER=1 (set by .ci/run), which makes a missing browser a failure.

Each test starts the real server (`feedcheck edit COPY --no-browser --port 0`) on a copy
of sample_jobs/ in a temporary folder; the repository's samples are never edited.
Screenshots go to FEEDCHECK_SCREENSHOTS when set, else to a temporary folder.
"""

from __future__ import annotations

import os
import queue
import shutil
import signal
import subprocess
import sys
import threading
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[3]
SAMPLES = ROOT / "sample_jobs"
CHROMIUM = os.environ.get("FEEDCHECK_CHROMIUM", "/usr/bin/chromium")
CHROMIUM_ARGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
]
URL_PREFIX = "feedcheck workbench: "
WAIT_MS = 15_000


def _unavailable(reason: str):
    if os.environ.get("FEEDCHECK_REQUIRE_BROWSER") == "1":
        pytest.fail(f"{reason} (FEEDCHECK_REQUIRE_BROWSER=1: the browser tests must run)")
    pytest.skip(f"{reason}; browser tests skipped (install Debian's chromium to run them)")


@pytest.fixture(scope="session")
def browser():
    if not (Path(CHROMIUM).is_file() and os.access(CHROMIUM, os.X_OK)):
        _unavailable(f"no Chromium at {CHROMIUM}")
    try:
        from playwright.sync_api import expect, sync_playwright
    except ImportError:
        _unavailable("the Python package playwright is not installed")
    # conditions are waited for, never slept on; a loaded CI machine gets the same time
    expect.set_options(timeout=WAIT_MS)
    with sync_playwright() as pw:
        chromium = pw.chromium.launch(executable_path=CHROMIUM, args=CHROMIUM_ARGS, headless=True)
        yield chromium
        chromium.close()


@pytest.fixture(scope="session")
def shots(tmp_path_factory) -> Path:
    folder = os.environ.get("FEEDCHECK_SCREENSHOTS")
    path = Path(folder) if folder else tmp_path_factory.mktemp("screenshots")
    path.mkdir(parents=True, exist_ok=True)
    return path


class Workbench:
    """A running `feedcheck edit` on a copy of the sample jobs."""

    def __init__(self, folder: Path, job: str) -> None:
        self.folder = folder
        self.job = folder / job
        env = {**os.environ, "FEEDCHECK_WORKBENCH_IDLE_S": "120"}
        self.proc = subprocess.Popen(
            [
                sys.executable,
                "-c",
                "from feedcheck.cli import main; main()",
                "edit",
                str(self.job),
                "--no-browser",
                "--port",
                "0",
            ],
            stdout=subprocess.PIPE,
            stderr=subprocess.PIPE,
            text=True,
            env=env,
        )
        self.url = self._first_line()

    def _first_line(self, timeout_s: float = 60.0) -> str:
        lines: queue.Queue = queue.Queue()
        threading.Thread(target=lambda: lines.put(self.proc.stdout.readline()), daemon=True).start()
        try:
            line = lines.get(timeout=timeout_s)
        except queue.Empty:
            self.stop()
            pytest.fail(f"feedcheck edit printed no address within {timeout_s} s")
        if not line.startswith(URL_PREFIX):
            self.stop()
            pytest.fail(
                f"feedcheck edit printed {line!r}; stderr: {self.proc.stderr.read()[-2000:]}"
            )
        return line[len(URL_PREFIX) :].strip()

    @property
    def origin(self) -> str:
        return "/".join(self.url.split("/")[:3])

    def stop(self) -> int | None:
        if self.proc.poll() is None:
            self.proc.send_signal(signal.SIGINT)
            try:
                self.proc.wait(timeout=10)
            except subprocess.TimeoutExpired:
                self.proc.kill()
                self.proc.wait()
        return self.proc.returncode


def sample_copy(tmp_path: Path) -> Path:
    folder = tmp_path / "jobs"
    shutil.copytree(SAMPLES, folder)
    return folder


@pytest.fixture
def jobs(tmp_path) -> Path:
    """A copy of sample_jobs/ the test may change before the server starts."""
    return sample_copy(tmp_path)


@pytest.fixture
def start(jobs):
    """start(job_name) → a running Workbench on the copy; stopped after the test."""
    started: list[Workbench] = []

    def _start(job: str = "harbor_kitchen.toml") -> Workbench:
        bench = Workbench(jobs, job)
        started.append(bench)
        return bench

    yield _start
    for bench in started:
        bench.stop()


def _console(msg, problems: list[str]) -> None:
    if msg.type == "error":
        problems.append(f"console {msg.type}: {msg.text} ({msg.location.get('url')})")


@pytest.fixture
def open_page(browser, start):
    """open_page(job) → (page, workbench): the page loaded and its first state drawn.
    Console errors and uncaught exceptions of the page fail the test."""
    contexts = []
    problems: list[str] = []

    def _open(job: str = "harbor_kitchen.toml"):
        bench = start(job)
        context = browser.new_context(
            accept_downloads=True, viewport={"width": 1440, "height": 960}
        )
        contexts.append(context)
        # the page reads no clipboard itself; the tests put text on it to paste with Ctrl+V
        context.grant_permissions(["clipboard-read", "clipboard-write"], origin=bench.origin)
        page = context.new_page()
        page.set_default_timeout(WAIT_MS)
        page.on("pageerror", lambda exc: problems.append(f"page error: {exc}"))
        page.on("console", lambda msg: _console(msg, problems))
        page.goto(bench.url)
        page.wait_for_selector("body[data-ready=true]")
        return page, bench

    yield _open
    for context in contexts:
        context.close()
    assert problems == [], problems
