"""Service benchmark: an interleaved request mix against a real uvicorn server on 127.0.0.1, stopping by itself.

The load comes from another process (``bench/load.py``: asyncio tasks sharing one httpx.AsyncClient) at 1, 8,
32 and 128 clients, against one and then two uvicorn workers. The mix interleaves ``/healthz`` (the server's own
floor), the screen API with one scenario repeated and with a fresh one each time (random pH and potential ranges,
scale, temperature 5–95 °C, activity), the screen page, the compare page (4 candidates), a material page and the
JSON twins. Each kind's p50 is also given as a multiple of ``/healthz``'s p50 in the same run: on a shared
machine only these ratios mean something.
"""

import json
import os
import socket
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import httpx

CONCURRENCY = (1, 8, 32, 128)
REQUESTS = {1: 200, 8: 400, 32: 600, 128: 800}
WORKERS = (1, 2)
LOAD = Path(__file__).resolve().parent / "load.py"


def free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return sock.getsockname()[1]


def start_server(port: int, data_dir: str, workers: int) -> subprocess.Popen:
    """uvicorn in a subprocess with ``workers`` processes; returns once /healthz answers."""
    env = {**os.environ, "ELECTROSIEVE_DATA_DIR": data_dir}
    process = subprocess.Popen([sys.executable, "-m", "uvicorn", "electrosieve.app.main:app", "--host", "127.0.0.1",
                                "--port", str(port), "--workers", str(workers), "--log-level", "warning"], env=env,
                               stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    deadline = time.time() + 60
    while time.time() < deadline:
        try:
            if httpx.get(f"http://127.0.0.1:{port}/healthz", timeout=2).status_code == 200:
                return process
        except httpx.HTTPError:
            time.sleep(0.2)
    process.kill()
    raise RuntimeError("server did not start")


def load(port: int, clients: int, requests: int, seed: int) -> dict:
    """One run of the load process; its figures with every kind's p50 over /healthz's p50."""
    output = subprocess.run([sys.executable, str(LOAD), str(port), str(clients), str(requests), str(seed)],
                            capture_output=True, text=True, check=True).stdout
    figures = json.loads(output)
    floor = figures["healthz"]["p50_ms"]
    figures["p50_over_healthz"] = {kind: round(value["p50_ms"] / floor, 2) for kind, value in figures.items()
                                   if isinstance(value, dict) and kind != "healthz"}
    return figures


def service_figures() -> dict:
    """Figures for the mix at every concurrency, with one and two workers."""
    figures = {}
    for workers in WORKERS:
        port = free_port()
        with tempfile.TemporaryDirectory() as data_dir:
            server = start_server(port, data_dir, workers)
            try:
                load(port, 8, 80, seed=0)  # warm every worker: imports, data files, the repeated scenario
                figures[f"workers_{workers}"] = {str(c): load(port, c, REQUESTS[c], seed=c) for c in CONCURRENCY}
            finally:
                server.terminate()
                server.wait(timeout=20)
    return figures


if __name__ == "__main__":
    print(json.dumps(service_figures(), indent=2))
