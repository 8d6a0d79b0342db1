"""Service benchmark: a bounded load on a real uvicorn server on 127.0.0.1, stopping by itself.

For 1, 8 and 32 concurrent clients it sends a fixed number of requests of
``POST /api/v1/screen`` (the whole catalog; ``screen`` repeats one scenario, as a
shared link does, ``screen_fresh`` asks a new one every time) and of ``GET /healthz``
(the framework's own floor), and reports requests/s, p50 and p99 latency and errors.
"""

import http.client
import itertools
import json
import os
import socket
import statistics
import subprocess
import sys
import tempfile
import threading
import time
from concurrent.futures import ThreadPoolExecutor

SCENARIO = {"ph": [13, 14], "potential": [1.5, 1.7], "scale": "RHE", "role": "anode"}
SCREEN_BODY = json.dumps(SCENARIO).encode()
CONCURRENCY = (1, 8, 32)
REQUESTS = {"screen": 240, "screen_fresh": 240, "healthz": 480}
FRESH = itertools.count(1)
"""Numbers the ``screen_fresh`` requests: each narrows the pH range by a different amount, so no two
ask the same question and no element verdict can be reused (diagrams still can: same element, T, a)."""


def fresh_body() -> bytes:
    """The alkaline OER scenario with a pH range never asked before."""
    return json.dumps({**SCENARIO, "ph": [13, 14 - 1e-6 * next(FRESH)]}).encode()


def free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return sock.getsockname()[1]


def start_server(port: int, data_dir: str) -> subprocess.Popen:
    """uvicorn in a subprocess; returns once /healthz answers."""
    env = {**os.environ, "ELECTROSIEVE_DATA_DIR": data_dir}
    process = subprocess.Popen([sys.executable, "-m", "uvicorn", "electrosieve.app.main:app", "--host", "127.0.0.1",
                                "--port", str(port), "--log-level", "warning"], env=env,
                               stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    deadline = time.time() + 30
    while time.time() < deadline:
        try:
            connection = http.client.HTTPConnection("127.0.0.1", port, timeout=2)
            connection.request("GET", "/healthz")
            if connection.getresponse().status == 200:
                return process
        except OSError:
            time.sleep(0.1)
    process.kill()
    raise RuntimeError("server did not start")


def _worker(port: int, kind: str, count: int, latencies: list, errors: list, lock: threading.Lock) -> None:
    connection = http.client.HTTPConnection("127.0.0.1", port, timeout=30)
    for _ in range(count):
        start = time.perf_counter()
        try:
            if kind.startswith("screen"):
                body = SCREEN_BODY if kind == "screen" else fresh_body()
                connection.request("POST", "/api/v1/screen", body=body, headers={"Content-Type": "application/json"})
            else:
                connection.request("GET", "/healthz")
            response = connection.getresponse()
            response.read()
            ok = response.status == 200
        except (OSError, http.client.HTTPException):
            ok = False
            connection.close()
            connection = http.client.HTTPConnection("127.0.0.1", port, timeout=30)
        elapsed = (time.perf_counter() - start) * 1000
        with lock:
            latencies.append(elapsed)
            if not ok:
                errors.append(1)
    connection.close()


def load(port: int, kind: str, clients: int, total: int) -> dict:
    """``total`` requests shared by ``clients`` threads, each on its own keep-alive connection."""
    latencies: list[float] = []
    errors: list[int] = []
    lock = threading.Lock()
    share = [total // clients + (1 if i < total % clients else 0) for i in range(clients)]
    start = time.perf_counter()
    with ThreadPoolExecutor(max_workers=clients) as pool:
        for count in share:
            pool.submit(_worker, port, kind, count, latencies, errors, lock)
    wall = time.perf_counter() - start
    latencies.sort()
    return {
        "requests": total, "requests_per_s": round(total / wall, 1),
        "p50_ms": round(statistics.median(latencies), 2),
        "p99_ms": round(latencies[min(len(latencies) - 1, int(0.99 * len(latencies)))], 2),
        "errors": len(errors),
    }


def service_figures() -> dict:
    """Figures for every kind of request at every concurrency, and the screen/healthz p50 ratio at 8 clients."""
    port = free_port()
    with tempfile.TemporaryDirectory() as data_dir:
        server = start_server(port, data_dir)
        try:
            load(port, "screen", 4, 40)  # warm the diagram caches
            figures = {kind: {str(c): load(port, kind, c, REQUESTS[kind]) for c in CONCURRENCY} for kind in REQUESTS}
        finally:
            server.terminate()
            server.wait(timeout=10)
    for kind in ("screen", "screen_fresh"):
        figures[f"{kind}_over_healthz_p50_at_8"] = round(figures[kind]["8"]["p50_ms"] / figures["healthz"]["8"]["p50_ms"], 2)
    return figures


if __name__ == "__main__":
    print(json.dumps(service_figures(), indent=2))
