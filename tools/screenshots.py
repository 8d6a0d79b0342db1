"""Screenshots of the main pages at a laptop and a phone size, for reviewers: docs/screenshots/<page>-<w>x<h>.png.

Starts a real server on a free port with a throwaway data directory, saves one shortlist through the API,
and photographs one screenful of each page (the diagrams of the compare and material pages) with Debian's
Chromium through Playwright (``make screenshots``).
"""

import json
import os
import socket
import subprocess
import sys
import tempfile
import time
import urllib.request
from pathlib import Path

from playwright.sync_api import sync_playwright

ROOT = Path(__file__).resolve().parent.parent
OUT = ROOT / "docs" / "screenshots"
CHROMIUM = "/usr/bin/chromium"
CHROME_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
               "--disable-background-networking", "--disable-component-update", "--disable-sync"]
SIZES = ((1366, 768), (390, 844))
SCENARIO = "ph_low=0&ph_high=1&potential_low=1.4&potential_high=1.8&scale=RHE&role=anode"
SHORTLIST = {"title": "Acid OER anode candidates", "notes": {"Ir": "Ask stores for a coated mesh quote."},
             "scenario": {"ph": [0, 1], "potential": [1.4, 1.8], "scale": "RHE", "role": "anode"}}


def free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return sock.getsockname()[1]


def start_server(data_dir: str) -> tuple[subprocess.Popen, str]:
    port = free_port()
    url = f"http://127.0.0.1:{port}"
    env = {k: v for k, v in os.environ.items() if k not in ("DATABASE_URL", "ELECTROSIEVE_CATALOG_DIR")}
    env["ELECTROSIEVE_DATA_DIR"] = data_dir
    process = subprocess.Popen([sys.executable, "-m", "uvicorn", "electrosieve.app.main:app", "--host", "127.0.0.1",
                                "--port", str(port), "--log-level", "warning"],
                               cwd=ROOT, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    deadline = time.monotonic() + 30
    while time.monotonic() < deadline:
        try:
            with urllib.request.urlopen(f"{url}/healthz", timeout=2):
                return process, url
        except OSError:
            time.sleep(0.1)
    process.terminate()
    raise SystemExit("the server did not start within 30 s")


def save_shortlist(url: str) -> str:
    request = urllib.request.Request(f"{url}/api/v1/shortlists", data=json.dumps(SHORTLIST).encode(),
                                     headers={"Content-Type": "application/json"}, method="POST")
    with urllib.request.urlopen(request, timeout=30) as answer:
        return json.load(answer)["url"]


def pages(url: str, shortlist: str) -> dict[str, tuple[str, str]]:
    """Page name → (address, selector that says the page is drawn, element scrolled into view or None)."""
    return {
        "screen": (f"{url}/?{SCENARIO}", "body[data-ready='1']", None),
        "compare": (f"{url}/compare?{SCENARIO}&compare=Ir&compare=Pt&compare=Au", "body[data-plots-ready='1']",
                    ".diagram-grid"),
        "material": (f"{url}/materials/Zn", "body[data-plots-ready='1']", ".diagram-card"),
        "shortlist": (f"{url}{shortlist}", "#ranking", None),
    }


def main() -> None:
    OUT.mkdir(parents=True, exist_ok=True)
    with tempfile.TemporaryDirectory() as data_dir:
        server, url = start_server(data_dir)
        try:
            shortlist = save_shortlist(url)
            with sync_playwright() as playwright:
                browser = playwright.chromium.launch(executable_path=CHROMIUM, args=CHROME_ARGS, headless=True)
                for width, height in SIZES:
                    context = browser.new_context(viewport={"width": width, "height": height},
                                                  is_mobile=width < 600, device_scale_factor=1)
                    page = context.new_page()
                    for name, (address, ready, focus) in pages(url, shortlist).items():
                        page.goto(address)
                        page.wait_for_selector(ready, timeout=20_000)
                        if focus:
                            page.locator(focus).first.evaluate("node => node.scrollIntoView({block: 'start'})")
                        page.wait_for_timeout(300)
                        path = OUT / f"{name}-{width}x{height}.png"
                        page.screenshot(path=str(path), full_page=False)
                        print(path.relative_to(ROOT))
                    context.close()
                browser.close()
        finally:
            server.terminate()
            server.wait(timeout=10)


if __name__ == "__main__":
    main()
