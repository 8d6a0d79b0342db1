"""HTTP plumbing shared by every route: security headers, the request-body cap, and error responses.

- Every response carries a strict Content-Security-Policy (``script-src 'self'``: the pages use no
  inline script and no inline event handler) and the usual hardening headers.
- A request body larger than the cap (``Settings.max_body_bytes``) gets 413, whether announced by
  Content-Length or streamed.
- Errors are JSON ``{"detail": [{"loc": [...], "msg": ..., "type": ...}]}`` for the API, the JSON twins
  and CSV downloads, and a readable HTML page for the pages; never a traceback, never NaN in a body.
- Every request is logged as one JSON object on one line (method, path, status, duration in ms, worker
  process id) through the standard ``logging`` module, logger ``electrosieve.request``, to stderr.
- Database failures are 503 (507 when the disk is full) with a plain message and the connection kept;
  the driver's words go to the log (logger ``electrosieve.storage``), never to the client.
- HEAD is answered wherever GET is (load balancers probe with HEAD); redirects are relative, never
  built from the ``Host`` header; a POST from another site's page (``Sec-Fetch-Site`` or ``Origin``) gets 403.
"""

import json
import logging
import os
import sys
import time
from urllib.parse import urlsplit

from fastapi import HTTPException, Request
from fastapi.exceptions import RequestValidationError
from fastapi.responses import JSONResponse
from sqlalchemy.exc import SQLAlchemyError
from starlette.exceptions import HTTPException as StarletteHTTPException

from .. import urls
from ..models import FieldError
from ..storage import FAILURES, failure_kind
from ..viewstate import UNION_TAG

CONTENT_SECURITY_POLICY = "; ".join([
    "default-src 'self'",
    "script-src 'self'",
    # plotly.js writes style attributes and one <style> element at run time
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'self'",
    "frame-ancestors 'none'",
])

SECURITY_HEADERS = [
    (b"content-security-policy", CONTENT_SECURITY_POLICY.encode()),
    (b"x-content-type-options", b"nosniff"),
    (b"referrer-policy", b"same-origin"),
    (b"x-frame-options", b"DENY"),
]


class SecurityHeaders:
    """ASGI middleware adding :data:`SECURITY_HEADERS` to every HTTP response."""

    def __init__(self, app):
        self.app = app

    async def __call__(self, scope, receive, send):
        if scope["type"] != "http":
            return await self.app(scope, receive, send)

        async def send_with_headers(message):
            if message["type"] == "http.response.start":
                present = {name.lower() for name, _ in message.get("headers", [])}
                extra = [(name, value) for name, value in SECURITY_HEADERS if name not in present]
                message = {**message, "headers": [*message.get("headers", []), *extra]}
            await send(message)

        await self.app(scope, receive, send_with_headers)


REQUEST_LOGGER = "electrosieve.request"
"""Name of the request log's logger; configure it before the app starts to send the lines elsewhere."""


class _StderrHandler(logging.StreamHandler):
    """A handler writing to whatever ``sys.stderr`` is at the time of each line."""

    def __init__(self):
        super().__init__()

    @property
    def stream(self):
        return sys.stderr

    @stream.setter
    def stream(self, _value):
        pass


def request_log() -> logging.Logger:
    """The request logger; gets a stderr handler (one JSON object per line) unless one was configured already."""
    logger = logging.getLogger(REQUEST_LOGGER)
    if not logger.handlers:
        handler = _StderrHandler()
        handler.setFormatter(logging.Formatter("%(message)s"))
        logger.addHandler(handler)
        logger.setLevel(logging.INFO)
        logger.propagate = False
    return logger


class RequestLog:
    """ASGI middleware writing one line per HTTP request:
    ``{"method": "GET", "path": "/healthz", "status": 200, "duration_ms": 1.42, "pid": 4242}``.

    The duration runs from the request's arrival to the last byte of the response; a request that
    fails with no response sent is logged with status 500 (the server's error handler answers it).
    The query string and the body are not logged.
    """

    def __init__(self, app):
        self.app = app
        self.logger = request_log()

    async def __call__(self, scope, receive, send):
        if scope["type"] != "http":
            return await self.app(scope, receive, send)
        start = time.perf_counter()
        status = 500

        async def timed_send(message):
            nonlocal status
            if message["type"] == "http.response.start":
                status = message["status"]
            await send(message)

        try:
            await self.app(scope, receive, timed_send)
        finally:
            self.logger.info(json.dumps({
                "method": scope.get("method", ""), "path": scope.get("path", ""), "status": status,
                "duration_ms": round((time.perf_counter() - start) * 1000, 2), "pid": os.getpid(),
            }))


class BodyTooLarge(HTTPException):
    def __init__(self, limit: int):
        super().__init__(status_code=413, detail=[{"loc": ["body"], "msg": f"body: larger than {limit} bytes",
                                                   "type": "too_large"}])


class BodyLimit:
    """ASGI middleware refusing request bodies over ``max_bytes`` with 413.

    A Content-Length over the cap is refused before reading; a streamed body is counted as it
    arrives and refused when it passes the cap (FastAPI re-raises an HTTPException from body parsing).
    """

    def __init__(self, app, max_bytes: int):
        self.app = app
        self.max_bytes = max_bytes

    async def __call__(self, scope, receive, send):
        if scope["type"] != "http":
            return await self.app(scope, receive, send)
        for name, value in scope.get("headers", []):
            if name == b"content-length":
                if not value.isdigit() or int(value) > self.max_bytes:
                    return await _send_json(send, 413, BodyTooLarge(self.max_bytes).detail)
        received = 0
        started = False

        async def counted_receive():
            nonlocal received
            message = await receive()
            if message["type"] == "http.request":
                received += len(message.get("body", b""))
                if received > self.max_bytes:
                    raise BodyTooLarge(self.max_bytes)
            return message

        async def watched_send(message):
            nonlocal started
            if message["type"] == "http.response.start":
                started = True
            await send(message)

        try:
            await self.app(scope, counted_receive, watched_send)
        except BodyTooLarge as error:
            if not started:
                await _send_json(send, 413, error.detail)


async def _send_json(send, status: int, detail) -> None:
    body = json.dumps({"detail": detail}).encode()
    await send({"type": "http.response.start", "status": status,
                "headers": [(b"content-type", b"application/json"), (b"content-length", str(len(body)).encode()),
                            *SECURITY_HEADERS]})
    await send({"type": "http.response.body", "body": body})


def wants_json(request: Request) -> bool:
    """True for the API, JSON twins and CSV downloads; pages get HTML errors."""
    path = request.url.path
    return (path.startswith("/api/") or path.endswith((".json", ".csv")) or path in ("/healthz", "/openapi.json")
            or "text/html" not in request.headers.get("accept", ""))


def _detail_list(detail) -> list[dict]:
    if isinstance(detail, list):
        return detail
    return [{"loc": [], "msg": str(detail), "type": "error"}]


async def validation_error(request: Request, error: RequestValidationError):
    """422 naming each bad field; pydantic's echoed input is left out (it may hold NaN or a huge body)."""
    errors: list[FieldError] = []
    for item in error.errors():
        loc = [part for part in item.get("loc", ())]
        if item.get("type") == "json_invalid":  # loc is ("body", character position): name the body itself
            position = loc[1] if len(loc) > 1 else "?"
            reason = (item.get("ctx") or {}).get("error", "")
            errors.append(FieldError(loc=["body"], type="json_invalid",
                                     msg=f"body: not valid JSON{f' ({reason})' if reason else ''} at character {position}"))
            continue
        where, rest = (loc[0], loc[1:]) if loc else ("body", [])
        cleaned = [p for p in rest if not (isinstance(p, str) and UNION_TAG.match(p))]
        key = (where, *cleaned)
        if any(tuple(e.loc) == key for e in errors):
            continue
        name = ".".join(str(p) for p in cleaned) or str(where)
        errors.append(FieldError(loc=[where, *cleaned], msg=f"{name}: {item.get('msg', 'invalid')}",
                                 type=str(item.get("type", "value_error"))))
    # a union (number or list) tried both arms: when the list arm names an item, the number arm's
    # complaint about the whole field is noise
    itemised = {tuple(e.loc[:-1]) for e in errors if len(e.loc) > 2 and isinstance(e.loc[-1], int)}
    errors = [e for e in errors if not (tuple(e.loc) in itemised and e.type == "float_type")]
    return error_response(request, 422, [e.model_dump() for e in errors])


async def http_error(request: Request, error: StarletteHTTPException):
    detail = _detail_list(error.detail)
    if error.status_code == 400 and isinstance(error.detail, str):
        # a body the framework could not parse (FastAPI's JSON reading, Starlette's form parser): name the body
        reason = ("it must be UTF-8 JSON, not nested too deeply"
                  if error.detail == "There was an error parsing the body" else error.detail)
        detail = [{"loc": ["body"], "msg": f"body: could not be read ({reason})", "type": "unreadable"}]
    return error_response(request, error.status_code, detail, getattr(error, "headers", None))


STORAGE_LOGGER = "electrosieve.storage"
STORAGE_RETRY_AFTER = 5
"""Seconds a client is asked to wait after a storage failure."""


async def storage_error(request: Request, error: SQLAlchemyError):
    """A database failure: 507 when the disk is full, else 503, in plain words; the driver's words are logged."""
    kind = failure_kind(error)
    logging.getLogger(STORAGE_LOGGER).warning("%s %s: storage %s: %s: %s", request.method, request.url.path, kind,
                                              type(error).__name__, str(error).splitlines()[0] if str(error) else "")
    saving = request.method == "POST"
    message = f"storage: {FAILURES[kind]}; " + ("the shortlist was not saved" if saving else "please retry later")
    return error_response(request, 507 if kind == "full" else 503,
                          [{"loc": [], "msg": message, "type": f"storage_{kind.replace('-', '_')}"}],
                          {"Retry-After": str(STORAGE_RETRY_AFTER)})


async def storage_setup_error(request: Request, error: Exception):
    """The storage could not be opened (see ``app.storage.StorageError``): 503; the path and cause go to the log."""
    logging.getLogger(STORAGE_LOGGER).error("%s %s: %s", request.method, request.url.path, error)
    return error_response(request, 503, [{"loc": [], "msg": "storage: the shortlist database cannot be opened; "
                                                             "the server's log says why", "type": "storage_setup"}],
                          {"Retry-After": str(STORAGE_RETRY_AFTER)})


async def unexpected_error(request: Request, error: Exception):
    """Last resort: a readable 500 without a traceback (the server log keeps it).

    Starlette answers this one outside every middleware, so the security headers are added here; the
    server closes the connection after it, so the answer says so (``Connection: close``)."""
    headers = {name.decode(): value.decode() for name, value in SECURITY_HEADERS} | {"Connection": "close"}
    return error_response(request, 500, [{"loc": [], "msg": f"unexpected failure ({type(error).__name__}); "
                                                            "please report it", "type": "internal"}], headers)


def error_response(request: Request, status: int, detail: list[dict], headers=None):
    if wants_json(request):
        return JSONResponse({"detail": detail}, status_code=status, headers=headers)
    from .common import render

    titles = {403: "Refused", 404: "Not found", 413: "Too large", 422: "Please check the input",
              429: "Too many saves", 500: "Something went wrong", 503: "Please retry shortly",
              507: "Storage full"}
    errors = [FieldError(loc=[str(p) for p in d.get("loc", [])], msg=str(d.get("msg", "")),
                         type=str(d.get("type", "error"))) for d in detail]
    response = render(request, "error.html", {"status": status, "title": titles.get(status, f"Error {status}"),
                                              "errors": errors, "back": urls.screen_page()}, status_code=status)
    response.headers.update(headers or {})
    return response


class HeadAsGet:
    """ASGI middleware answering HEAD wherever GET is answered: the GET's status and headers, no body."""

    def __init__(self, app):
        self.app = app

    async def __call__(self, scope, receive, send):
        if scope["type"] != "http" or scope["method"] != "HEAD":
            return await self.app(scope, receive, send)

        async def headers_only(message):
            if message["type"] == "http.response.body":
                if message.get("more_body", False):
                    return
                message = {"type": "http.response.body", "body": b""}
            await send(message)

        await self.app({**scope, "method": "GET"}, receive, headers_only)


class RelativeRedirects:
    """ASGI middleware making every redirect's ``Location`` relative (path and query only).

    The framework's trailing-slash redirect is built from the ``Host`` header, which a client chooses."""

    def __init__(self, app):
        self.app = app

    async def __call__(self, scope, receive, send):
        if scope["type"] != "http":
            return await self.app(scope, receive, send)

        async def relative(message):
            if message["type"] == "http.response.start" and 300 <= message["status"] < 400:
                message = {**message, "headers": [(name, _relative(value) if name.lower() == b"location" else value)
                                                  for name, value in message.get("headers", [])]}
            await send(message)

        await self.app(scope, receive, relative)


def _relative(location: bytes) -> bytes:
    """``http://any.host/x?y`` → ``/x?y``; a relative location is kept (``//host/x`` becomes ``/x``)."""
    parts = urlsplit(location.decode("latin-1"))
    path = "/" + parts.path.lstrip("/")
    return (path + (f"?{parts.query}" if parts.query else "")).encode("latin-1")


UNSAFE_METHODS = ("POST", "PUT", "PATCH", "DELETE")


class SameOriginPosts:
    """ASGI middleware refusing (403) a state-changing request sent by another site's page.

    Browsers say where a request comes from: ``Sec-Fetch-Site`` decides when sent (anything but
    ``same-origin`` or ``none`` is foreign); browsers without it send ``Origin``, whose host must then be
    the ``Host`` asked for (a reverse proxy must pass ``Host`` through). Clients that send neither
    (scripts, curl) are not browsers carrying a visitor's session and pass."""

    def __init__(self, app):
        self.app = app

    async def __call__(self, scope, receive, send):
        if scope["type"] != "http" or scope["method"] not in UNSAFE_METHODS:
            return await self.app(scope, receive, send)
        headers = {name.lower(): value.decode("latin-1") for name, value in scope.get("headers", [])}
        site = headers.get(b"sec-fetch-site", "").strip().lower()
        origin = headers.get(b"origin", "").strip()
        if site:
            foreign = site not in ("same-origin", "none")
        else:
            foreign = bool(origin) and (origin == "null"
                                        or urlsplit(origin).netloc.lower() != headers.get(b"host", "").lower())
        if foreign:
            response = error_response(Request(scope, receive), 403, [{
                "loc": ["header", "origin"], "type": "cross_origin",
                "msg": "origin: requests from another site's page are refused; save from this site's own pages"}])
            return await response(scope, receive, send)
        await self.app(scope, receive, send)
