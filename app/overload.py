"""Bounded work: how much load one worker process takes before it answers "later" instead of queueing.

- **Heavy requests** (everything that computes: screens, diagrams, the pages, CSV, saves) run at most
  ``Settings.heavy_requests`` at once per worker (the work is CPU-bound: more at once only makes each
  slower), and at most ``Settings.heavy_queue`` more wait their turn on the event loop, costing no
  thread; one more gets 503 with ``Retry-After`` at once, so a burst of expensive pages cannot make
  the process stop answering. Light requests (``/healthz``, static files, plotly.js, the API
  reference) never wait behind heavy ones.
- **Saves** (``POST /api/v1/shortlists`` and the form's ``POST /shortlists``) are limited per client
  address and worker: a token bucket of ``Settings.saves_per_minute`` saves, refilled evenly over a
  minute; beyond it 429 with ``Retry-After`` (seconds until the next save is allowed). The client
  address is the peer's, or the ``X-Forwarded-For`` of a configured proxy (``app.server``).
"""

import asyncio
import math
import threading
import time
from collections import OrderedDict

from starlette.requests import Request

from .routes.http import error_response

__all__ = ["HEAVY_EXEMPT", "SAVE_PATHS", "HeavyLimit", "SaveRateLimit", "TokenBuckets"]

HEAVY_EXEMPT = ("/healthz", "/static/", "/vendor/", "/openapi.json", "/docs")
"""Path prefixes that never count as heavy: probes, files served as they are, the API reference."""
SAVE_PATHS = ("/api/v1/shortlists", "/shortlists")
"""The paths where a POST saves a shortlist."""
RETRY_AFTER_BUSY = 1
"""Seconds a client is asked to wait when the heavy-request limit is reached."""
CLIENTS_TRACKED = 10_000
"""Most client addresses whose save budget is remembered (least recently seen forgotten first)."""


class TokenBuckets:
    """Per-key token buckets of ``capacity`` tokens refilled at ``capacity`` per ``period`` seconds; thread-safe."""

    def __init__(self, capacity: int, period: float = 60.0, clock=time.monotonic):
        self.capacity = capacity
        self.rate = capacity / period
        self.clock = clock
        self._buckets: OrderedDict[str, tuple[float, float]] = OrderedDict()
        self._lock = threading.Lock()

    def take(self, key: str) -> float:
        """Take one token for ``key``: 0 when granted, else the seconds until one is available."""
        now = self.clock()
        with self._lock:
            tokens, then = self._buckets.pop(key, (float(self.capacity), now))
            tokens = min(float(self.capacity), tokens + (now - then) * self.rate)
            wait = 0.0 if tokens >= 1 else (1 - tokens) / self.rate
            self._buckets[key] = (tokens - 1 if wait == 0 else tokens, now)
            while len(self._buckets) > CLIENTS_TRACKED:
                self._buckets.popitem(last=False)
        return wait


async def _refuse(scope, receive, send, status: int, message: str, kind: str, retry_after: int) -> None:
    response = error_response(Request(scope, receive), status, [{"loc": [], "msg": message, "type": kind}],
                               {"Retry-After": str(retry_after)})
    await response(scope, receive, send)


class HeavyLimit:
    """ASGI middleware: at most ``limit`` heavy requests running and ``queue`` waiting; the next gets 503 at once."""

    def __init__(self, app, limit: int, queue: int):
        self.app = app
        self.limit = limit
        self.queue = queue
        self.in_flight = 0  # running and waiting; touched only on the event loop's thread
        self._turns: asyncio.Semaphore | None = None
        self._loop = None

    def _semaphore(self) -> asyncio.Semaphore:
        loop = asyncio.get_running_loop()
        if self._loop is not loop:  # a semaphore belongs to one event loop (tests run one per client)
            self._turns, self._loop = asyncio.Semaphore(self.limit), loop
        return self._turns

    async def __call__(self, scope, receive, send):
        if scope["type"] != "http" or scope["path"].startswith(HEAVY_EXEMPT):
            return await self.app(scope, receive, send)
        if self.in_flight >= self.limit + self.queue:
            return await _refuse(scope, receive, send, 503, "busy: too many computations at once; please retry "
                                 f"in {RETRY_AFTER_BUSY} s", "busy", RETRY_AFTER_BUSY)
        self.in_flight += 1
        try:
            async with self._semaphore():
                await self.app(scope, receive, send)
        finally:
            self.in_flight -= 1


class SaveRateLimit:
    """ASGI middleware: at most ``per_minute`` shortlist saves per client address (0: no limit)."""

    def __init__(self, app, per_minute: int):
        self.app = app
        self.buckets = TokenBuckets(per_minute) if per_minute else None

    async def __call__(self, scope, receive, send):
        if (self.buckets is None or scope["type"] != "http" or scope["method"] != "POST"
                or scope["path"] not in SAVE_PATHS):
            return await self.app(scope, receive, send)
        client = (scope.get("client") or ("unknown", 0))[0]
        wait = self.buckets.take(client)
        if wait > 0:
            seconds = max(1, math.ceil(wait))
            return await _refuse(scope, receive, send, 429, f"too many saves from this address: at most "
                                 f"{self.buckets.capacity} a minute; retry in {seconds} s", "rate_limited", seconds)
        await self.app(scope, receive, send)
