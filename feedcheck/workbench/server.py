"""The workbench's HTTP side: a WSGI application (Werkzeug) over one
:class:`~feedcheck.workbench.actions.Session`, and the loop that serves it on
127.0.0.1 until Ctrl-C, the page's goodbye or a long silence.

Every request passes the guard of :mod:`~feedcheck.workbench.security` first. The
routes, all below ``/TOKEN/`` (nothing else is served):

=========================  ==============================================================
``GET  ""``                the page (``static/index.html``); ``GET static/<name>`` its files
``GET  api/state``         job (name, exists, dirty, unit), rev, text, schema, elements,
                           results (:mod:`.payload`)
``POST api/edit``          ``{rev, edits: [set|add|remove|text]}`` → state (rev + 1);
                           a stale rev → 409
``POST api/save``          the text written to the job file (atomic, in its folder)
``POST api/report``        ``<stem>_report.pdf`` of the saved job → its download url
``GET  api/download/<n>``  a file this session wrote, as an attachment
``POST api/new``           ``{name}``: a new job from the template in the same folder
``GET  api/schedule``      ``?panel=ID``: the schedule's cells, each row's status
``POST api/schedule``      ``{panel, columns, rows}``: edited cells checked in memory
                           → state (with the grid as ``schedule`` while the job reads)
``POST api/schedule/save`` the edited cells written back to the schedule's file
``POST api/ping``, ``bye`` the page is there / is going
=========================  ==============================================================
"""

from __future__ import annotations

import json
import mimetypes
import os
import secrets
import threading
import time
from pathlib import Path

from werkzeug.wrappers import Request, Response

from ..errors import InputError
from .actions import ActionRefused, Session
from .schema import schema
from .security import Refused, check_request, check_token, json_body, secured

STATIC_DIR = Path(__file__).with_name("static")
STATIC_TYPES = {
    ".html": "text/html; charset=utf-8",
    ".js": "text/javascript; charset=utf-8",
    ".css": "text/css; charset=utf-8",
    ".svg": "image/svg+xml",
    ".png": "image/png",
    ".woff2": "font/woff2",
}
IDLE_S = 150.0  # no page has pinged for this long: stop
BYE_GRACE_S = 5.0  # after a page's goodbye: stop unless another page pings within this


def static_files(folder: Path) -> dict[str, Path]:
    """The page's files, listed once: name → path (plain files of known kinds only)."""
    if not folder.is_dir():
        return {}
    return {
        p.name: p
        for p in sorted(folder.iterdir())
        if p.is_file() and not p.is_symlink() and p.suffix in STATIC_TYPES
    }


class Lifetime:
    """When to stop: no ping for ``idle_s``, or a goodbye not followed by a request
    within ``grace_s``."""

    def __init__(self, idle_s: float = IDLE_S, grace_s: float = BYE_GRACE_S) -> None:
        self.idle_s, self.grace_s = idle_s, grace_s
        self.seen = time.monotonic()
        self.bye_at: float | None = None

    def ping(self) -> None:
        self.seen = time.monotonic()
        self.bye_at = None

    def bye(self) -> None:
        self.bye_at = time.monotonic()

    def should_stop(self, now: float | None = None) -> bool:
        now = time.monotonic() if now is None else now
        if self.bye_at is not None and now - self.bye_at >= self.grace_s:
            return True
        return now - self.seen >= self.idle_s


def _json(data: dict, status: int = 200) -> Response:
    return Response(json.dumps(data), status=status, mimetype="application/json")


class Workbench:
    """The WSGI application of one session."""

    def __init__(
        self,
        session: Session,
        token: str,
        port: int,
        static_dir: Path = STATIC_DIR,
        lifetime: Lifetime | None = None,
    ) -> None:
        self.session = session
        self.token = token
        self.port = port  # set again once the server is bound
        self.static = static_files(static_dir)
        self.lifetime = lifetime or Lifetime()

    def __call__(self, environ, start_response):
        request = Request(environ)
        return secured(self.respond(request))(environ, start_response)

    def respond(self, request: Request) -> Response:
        try:
            route = check_token(request, self.token)
        except Refused as exc:
            return Response(exc.reason, status=exc.status, mimetype="text/plain")
        is_api = route.startswith("api/")
        try:
            check_request(request, self.port)
            if not is_api:
                return self.page(route)
            if route != "api/bye":
                self.lifetime.ping()
            return self.api(request, route[len("api/") :])
        except Refused as exc:
            if is_api:
                return _json({"error": exc.reason}, exc.status)
            return Response(exc.reason, status=exc.status, mimetype="text/plain")
        except ActionRefused as exc:
            return _json({"error": exc.message, **exc.extra}, exc.status)
        except InputError as exc:
            from ..commands.errors import problem_line

            lines = [problem_line(p) for p in exc.problems]
            return _json({"error": "; ".join(lines), "errors": lines}, 400)
        except OSError as exc:
            return _json({"error": f"{exc.filename or 'a file'}: {exc.strerror or exc}"}, 500)

    # ------------------------------------------------------------ the page
    def page(self, route: str) -> Response:
        name = "index.html" if route == "" else route.removeprefix("static/")
        if route not in ("", f"static/{name}") or name not in self.static:
            raise Refused(404, "refused: no such file")
        path = self.static[name]
        return Response(path.read_bytes(), mimetype=STATIC_TYPES[path.suffix])

    # ------------------------------------------------------------ the API
    def api(self, request: Request, name: str) -> Response:
        s = self.session
        if request.method == "GET":
            with s.lock:
                if name == "state":
                    return _json({**s.state(), "schema": schema()})
                if name == "schedule":
                    return _json(s.schedule(request.args.get("panel", "")))
                if name.startswith("download/"):
                    return self.download(name.removeprefix("download/"))
            raise Refused(404, "refused: no such request")
        body = json_body(request)
        if name == "bye":
            self.lifetime.bye()
            return _json({"ok": True})
        if name == "ping":
            return _json({"ok": True})
        handlers = {
            "edit": lambda: {**s.edit(body.get("rev"), body.get("edits")), "schema": schema()},
            "save": lambda: {**s.save(), "job": s.state()["job"]},
            "report": s.report,
            "new": lambda: {**s.new(body.get("name")), "schema": schema()},
            "schedule": lambda: {
                **s.edit_schedule(body.get("panel"), body.get("columns"), body.get("rows")),
                "schema": schema(),
            },
            "schedule/save": lambda: s.save_schedule(body.get("panel")),
        }
        if name not in handlers:
            raise Refused(404, "refused: no such request")
        with s.lock:
            return _json(handlers[name]())

    def download(self, name: str) -> Response:
        path = self.session.download(name)
        kind = mimetypes.guess_type(path.name)[0] or "application/octet-stream"
        response = Response(path.read_bytes(), mimetype=kind)
        response.headers["Content-Disposition"] = f'attachment; filename="{path.name}"'
        return response


def bind(app: Workbench, port: int):
    """The threaded server of ``app`` listening on 127.0.0.1 (never another address)."""
    from werkzeug.serving import make_server

    server = make_server("127.0.0.1", port, app, threaded=True)
    app.port = server.server_port
    return server


def serve(session: Session, port: int = 0, open_browser: bool = True, echo=print) -> None:
    """Serve the session on 127.0.0.1 until Ctrl-C, the page's goodbye or a silence."""
    import logging

    logging.getLogger("werkzeug").setLevel(logging.ERROR)  # no line per request
    idle = float(os.environ.get("FEEDCHECK_WORKBENCH_IDLE_S", IDLE_S))
    token = secrets.token_urlsafe(24)
    app = Workbench(session, token, port, lifetime=Lifetime(idle_s=idle))
    server = bind(app, port)
    url = f"http://127.0.0.1:{app.port}/{token}/"
    echo(f"feedcheck workbench: {url}")
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    if open_browser:
        import webbrowser

        webbrowser.open(url)
    try:
        while not app.lifetime.should_stop():
            time.sleep(0.25)
    except KeyboardInterrupt:
        pass
    finally:
        server.shutdown()
        thread.join(timeout=5)
