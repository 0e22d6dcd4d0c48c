"""When the server stops (idle, the page's goodbye) and the real server: bound to
127.0.0.1 only, spoken to over HTTP with urllib."""

from __future__ import annotations

import json
import re
import socket
import threading
import time
import urllib.error
import urllib.request

from feedcheck.workbench.actions import Session
from feedcheck.workbench.server import Lifetime, Workbench, bind, serve

from .conftest import TOKEN


def test_idle_stops_after_the_silence():
    life = Lifetime(idle_s=150, grace_s=5)
    t0 = life.seen
    assert not life.should_stop(t0 + 149)
    assert life.should_stop(t0 + 150)
    life.ping()
    assert not life.should_stop(life.seen + 100)


def test_bye_stops_unless_another_page_pings():
    life = Lifetime(idle_s=150, grace_s=5)
    life.bye()
    assert not life.should_stop(life.bye_at + 4)
    assert life.should_stop(life.bye_at + 5)
    life.ping()  # another page (or a reload) within the grace
    assert life.bye_at is None and not life.should_stop(life.seen + 10)


def test_bye_and_ping_through_the_api(page):
    life = page.app.lifetime
    assert page.post("api/bye").json == {"ok": True}
    assert life.bye_at is not None
    assert page.post("api/ping").json == {"ok": True}
    assert life.bye_at is None


def _start(job, monkeypatch, idle="30"):
    monkeypatch.setenv("FEEDCHECK_WORKBENCH_IDLE_S", idle)
    session = Session(job, "2026-12-01", job.read_text(encoding="utf-8"), True)
    lines: list[str] = []
    thread = threading.Thread(
        target=serve,
        args=(session,),
        kwargs={"open_browser": False, "echo": lines.append},
        daemon=True,
    )
    thread.start()
    for _ in range(200):
        if lines:
            break
        time.sleep(0.05)
    return thread, lines


def _post(url: str, body: dict, headers: dict | None = None):
    req = urllib.request.Request(
        url,
        data=json.dumps(body).encode(),
        method="POST",
        headers={"Content-Type": "application/json", **(headers or {})},
    )
    return urllib.request.urlopen(req, timeout=10)


def test_real_server_on_loopback_over_http(job, monkeypatch):
    thread, lines = _start(job, monkeypatch)
    assert len(lines) == 1
    m = re.fullmatch(r"feedcheck workbench: http://127\.0\.0\.1:(\d+)/([\w-]{32})/", lines[0])
    assert m, lines
    port, token = int(m.group(1)), m.group(2)
    assert token != TOKEN
    base = f"http://127.0.0.1:{port}/{token}/"
    with urllib.request.urlopen(base + "api/state", timeout=10) as r:
        state = json.loads(r.read())
    assert state["results"]["valid"] and state["job"]["name"] == job.name
    edit = {
        "rev": 0,
        "edits": [{"op": "set", "kind": "run", "index": 0, "key": "length", "value": "96 ft"}],
    }
    with _post(base + "api/edit", edit) as r:
        assert json.loads(r.read())["rev"] == 1
    try:
        urllib.request.urlopen(f"http://127.0.0.1:{port}/api/state", timeout=10)
        raise AssertionError("served without the token")
    except urllib.error.HTTPError as exc:
        assert exc.code == 403
    # the listening socket is on the loopback address only
    for host in ["127.0.0.2", *_other_addresses()]:  # 0.0.0.0 would answer on these
        with socket.socket() as s:
            s.settimeout(1)
            assert s.connect_ex((host, port)) != 0, host
    with _post(base + "api/bye", {}):
        pass
    thread.join(timeout=15)
    assert not thread.is_alive()  # stopped on the page's goodbye (5 s grace)


def test_bind_address_is_loopback(page):
    app = Workbench(page.app.session, TOKEN, 0)
    server = bind(app, 0)
    try:
        host, port = server.socket.getsockname()[:2]
        assert host == "127.0.0.1" and port == app.port > 0
    finally:
        server.server_close()


def test_real_server_stops_when_no_page_pings(job, monkeypatch):
    thread, lines = _start(job, monkeypatch, idle="1")
    assert lines
    thread.join(timeout=10)
    assert not thread.is_alive()


def _other_addresses() -> list[str]:
    """This machine's addresses other than loopback (none on an isolated machine)."""
    out = set()
    try:
        for info in socket.getaddrinfo(socket.gethostname(), None, socket.AF_INET):
            out.add(info[4][0])
    except OSError:
        pass
    with socket.socket(socket.AF_INET, socket.SOCK_DGRAM) as s:
        try:
            s.connect(("10.255.255.255", 1))
            out.add(s.getsockname()[0])
        except OSError:
            pass
    return sorted(a for a in out if not a.startswith("127."))
