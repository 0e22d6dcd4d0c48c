"""The workbench's guard, applied to every request before anything else runs.

The server listens on 127.0.0.1 only. A request is refused unless

* its path starts with the session's random token (``/TOKEN/``), compared in constant
  time: another local program or a page of another site does not know it;
* its Host header names this server (``127.0.0.1:PORT`` or ``localhost:PORT``): a page
  of another site whose name was pointed at 127.0.0.1 (DNS rebinding) sends its own name;
* it is a GET or a POST; a POST carries ``Content-Type: application/json``, at most
  :data:`MAX_BODY` bytes, and an Origin header, when it has one, of this server.

Every response carries headers that keep it out of caches, other sites' frames and
content sniffing, and a content security policy allowing only the page's own files.
"""

from __future__ import annotations

import hmac
import json

from werkzeug.wrappers import Request, Response

MAX_BODY = 2_000_000
SECURITY_HEADERS = {
    "Cache-Control": "no-store",
    "X-Content-Type-Options": "nosniff",
    "Referrer-Policy": "no-referrer",
    "Content-Security-Policy": "default-src 'self'; img-src 'self' data:; style-src 'self'; "
    "script-src 'self'; connect-src 'self'; frame-ancestors 'none'",
}


class Refused(Exception):
    """A request refused by the guard: HTTP status and reason."""

    def __init__(self, status: int, reason: str) -> None:
        super().__init__(reason)
        self.status = status
        self.reason = reason


def allowed_hosts(port: int) -> tuple[str, ...]:
    return (f"127.0.0.1:{port}", f"localhost:{port}")


def allowed_origins(port: int) -> tuple[str, ...]:
    return tuple(f"http://{h}" for h in allowed_hosts(port))


def check_token(request: Request, token: str) -> str:
    """The path below the token (``api/state``, ``static/app.js``, ``""``); raises
    Refused (403) when the path does not start with the token (compared in constant
    time)."""
    prefix = f"/{token}/"
    path = request.path
    given = path[: len(prefix)]
    if not hmac.compare_digest(given.encode("utf-8", "replace"), prefix.encode()):
        raise Refused(403, "refused: unknown address")
    return path[len(prefix) :]


def check_request(request: Request, port: int) -> None:
    """Raises Refused when a request (its token already checked) breaks a rule of this
    module: Host, method, and for a POST its Origin, content type and length."""
    if request.host not in allowed_hosts(port):
        raise Refused(403, "refused: the Host header does not name this server")
    if request.method not in ("GET", "POST"):
        raise Refused(405, "refused: only GET and POST")
    if request.method == "POST":
        origin = request.headers.get("Origin")
        if origin is not None and origin not in allowed_origins(port):
            raise Refused(403, "refused: a request from another site")
        if request.mimetype != "application/json":
            raise Refused(415, "refused: the body must be JSON (Content-Type: application/json)")
        length = request.content_length
        if length is None or length > MAX_BODY:
            raise Refused(413, f"refused: a body of at most {MAX_BODY:,} bytes with its length")


def json_body(request: Request) -> dict:
    """The request's JSON object (at most MAX_BODY bytes read); raises Refused."""
    raw = request.stream.read(MAX_BODY + 1)
    if len(raw) > MAX_BODY:
        raise Refused(413, f"refused: a body of at most {MAX_BODY:,} bytes")
    try:
        body = json.loads(raw.decode("utf-8"))
    except (UnicodeDecodeError, ValueError, RecursionError):
        raise Refused(400, "refused: the body is not JSON") from None
    if not isinstance(body, dict):
        raise Refused(400, "refused: the body must be a JSON object")
    return body


def secured(response: Response) -> Response:
    """The response with the headers every response carries."""
    for k, v in SECURITY_HEADERS.items():
        response.headers[k] = v
    return response
