"""Web benchmarks: POST /api/v1/screen for the whole catalog in-process, and the screen page's time to interactive.

- ``screen_api_ms``: median wall time of ``POST /api/v1/screen`` (every material, an RHE window) through
  FastAPI's in-process test client, after one warm-up request (target: under 50 ms).
- ``screen_page_interactive_ms``: in headless Chromium against a real uvicorn server on 127.0.0.1, the time
  from navigation start until the page's script has wired the form (``performance.mark('electrosieve-ready')``),
  median over a few loads after one warm-up (target: under 1000 ms). Skipped, with the reason, when Chromium
  or Playwright is missing.
"""

import json
import os
import socket
import statistics
import subprocess
import sys
import tempfile
import time
import urllib.request
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

SCREEN_BODY = {"ph": [0, 1], "potential": [1.4, 1.8], "scale": "RHE", "role": "anode"}
CHROMIUM = "/usr/bin/chromium"
CHROME_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
               "--disable-background-networking", "--disable-component-update", "--disable-sync"]


def screen_api_ms(repeats: int = 40) -> dict:
    """Median and p90 of POST /api/v1/screen for the whole catalog [ms], in-process."""
    import warnings

    warnings.filterwarnings("ignore", message="Using `httpx`")
    from fastapi.testclient import TestClient

    from electrosieve.app.main import create_app
    from electrosieve.app.settings import Settings

    with tempfile.TemporaryDirectory() as data_dir, TestClient(create_app(Settings(data_dir=Path(data_dir)))) as client:
        first = client.post("/api/v1/screen", json=SCREEN_BODY)
        first.raise_for_status()
        times = []
        for _ in range(repeats):
            start = time.perf_counter()
            client.post("/api/v1/screen", json=SCREEN_BODY).raise_for_status()
            times.append((time.perf_counter() - start) * 1000)
    times.sort()
    return {"median": round(statistics.median(times), 2), "p90": round(times[int(0.9 * (len(times) - 1))], 2),
            "materials": len(first.json()["results"]), "repeats": repeats}


def _free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return sock.getsockname()[1]


def screen_page_interactive_ms(loads: int = 5) -> dict:
    """Median time to interactive of the screen page in headless Chromium [ms]."""
    if not os.access(CHROMIUM, os.X_OK):
        return {"skipped": f"{CHROMIUM} not found (sudo apt-get install -y chromium)"}
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        return {"skipped": "playwright is not installed (pip install -e '.[test]')"}
    port = _free_port()
    with tempfile.TemporaryDirectory() as data_dir:
        env = {**os.environ, "ELECTROSIEVE_DATA_DIR": data_dir}
        server = subprocess.Popen([sys.executable, "-m", "uvicorn", "electrosieve.app.main:app", "--host", "127.0.0.1",
                                   "--port", str(port), "--log-level", "warning"], cwd=ROOT, env=env,
                                  stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        try:
            url = f"http://127.0.0.1:{port}/"
            deadline = time.monotonic() + 30
            while True:
                try:
                    urllib.request.urlopen(url + "healthz", timeout=2).close()
                    break
                except OSError:
                    if time.monotonic() > deadline or server.poll() is not None:
                        return {"skipped": "the test server did not start"}
                    time.sleep(0.1)
            with sync_playwright() as playwright:
                browser = playwright.chromium.launch(executable_path=CHROMIUM, args=CHROME_ARGS, headless=True)
                try:
                    times = []
                    for load in range(loads + 1):
                        context = browser.new_context()
                        page = context.new_page()
                        page.goto(url, timeout=30_000)
                        page.wait_for_selector("body[data-ready='1']", timeout=30_000)
                        mark = page.evaluate("() => performance.getEntriesByName('electrosieve-ready')[0].startTime")
                        context.close()
                        if load:  # the first load warms the server's catalog and caches
                            times.append(mark)
                finally:
                    browser.close()
        finally:
            server.terminate()
            try:
                server.wait(timeout=10)
            except subprocess.TimeoutExpired:
                server.kill()
    return {"median": round(statistics.median(times), 1), "max": round(max(times), 1), "loads": loads}


def web_figures() -> dict:
    """All web figures as one dict (for ``bench/run.py``)."""
    return {"screen_api_ms": screen_api_ms(), "screen_page_interactive_ms": screen_page_interactive_ms()}


if __name__ == "__main__":
    print(json.dumps(web_figures(), indent=2))
