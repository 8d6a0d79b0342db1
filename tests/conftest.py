"""Shared fixtures: a real uvicorn server in a subprocess, and Debian's Chromium for pytest-playwright.

Browser tests are skipped, with the reason, when /usr/bin/chromium is missing
(``make test`` installs it when run as root; otherwise ``sudo apt-get install -y chromium``).
"""

import os
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pytest
from hypothesis import settings

settings.register_profile("ci", derandomize=True, database=None, print_blob=True)
"""Same examples on every run, so CI never fails at random (``make test``)."""
settings.register_profile("deep", max_examples=2000, derandomize=False, print_blob=True)
"""Fresh random examples, ten times more of them (``make test-deep``)."""
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "ci"))

ROOT = Path(__file__).resolve().parent.parent
CHROMIUM = "/usr/bin/chromium"
CHROME_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
               "--disable-background-networking", "--disable-component-update", "--disable-sync"]
SERVER_START_SECONDS = 30
"""Longest wait for a test server to answer /healthz."""


BROWSER_FIXTURES = {"page", "browser", "context"}
"""Tests asking for one of these drive Chromium: marked ``browser``."""
SERVER_FIXTURES = {"live_server", "start_server", "cli_server"}
"""Tests asking for one of these start a real server: marked ``slow``."""
WHOLE_FILES = {"test_postgres.py": "postgres", "test_fuzz.py": "slow", "test_durability.py": "slow",
               "test_concurrency.py": "slow", "test_browser.py": "browser"}
"""Files whose every test carries a marker."""


def pytest_collection_modifyitems(items):
    """Mark tests ``browser``, ``postgres`` and ``slow`` (registered in pyproject.toml) so ``make test-fast``
    can leave them out: by the fixtures they use and by file."""
    for item in items:
        fixtures = set(getattr(item, "fixturenames", ()))
        if fixtures & BROWSER_FIXTURES:
            item.add_marker(pytest.mark.browser)
        if fixtures & SERVER_FIXTURES:
            item.add_marker(pytest.mark.slow)
        marker = WHOLE_FILES.get(item.path.name)
        if marker:
            item.add_marker(getattr(pytest.mark, marker))


def chromium_missing_reason() -> str | None:
    if not (os.path.exists(CHROMIUM) and os.access(CHROMIUM, os.X_OK)):
        return f"{CHROMIUM} not found: install Debian's Chromium (sudo apt-get install -y chromium) to run browser tests"
    return None


@pytest.fixture(scope="session")
def browser_type_launch_args(browser_type_launch_args):
    reason = chromium_missing_reason()
    if reason:
        pytest.skip(reason)
    return {**browser_type_launch_args, "executable_path": CHROMIUM, "args": CHROME_ARGS, "headless": True}


def free_port() -> int:
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return sock.getsockname()[1]


class Server:
    """A uvicorn process serving ``app.main:app`` on 127.0.0.1 with its own data directory."""

    def __init__(self, data_dir: Path, env: dict | None = None):
        self.data_dir = Path(data_dir)
        self.port = free_port()
        self.url = f"http://127.0.0.1:{self.port}"
        self.log = self.data_dir / f"server-{self.port}.log"
        environment = {key: value for key, value in os.environ.items()
                       if key not in ("DATABASE_URL", "ELECTROSIEVE_CATALOG_DIR")}
        environment.update({"ELECTROSIEVE_DATA_DIR": str(self.data_dir), **(env or {})})
        self.data_dir.mkdir(parents=True, exist_ok=True)
        self._log_file = open(self.log, "wb")
        self.process = subprocess.Popen(
            [sys.executable, "-m", "uvicorn", "electrosieve.app.main:app", "--host", "127.0.0.1", "--port", str(self.port),
             "--log-level", "warning"],
            cwd=ROOT, env=environment, stdout=self._log_file, stderr=subprocess.STDOUT)
        self._wait_until_up()

    def _wait_until_up(self) -> None:
        deadline = time.monotonic() + SERVER_START_SECONDS
        while time.monotonic() < deadline:
            if self.process.poll() is not None:
                raise RuntimeError(f"test server exited early:\n{self.log.read_text(errors='replace')}")
            try:
                with urllib.request.urlopen(f"{self.url}/healthz", timeout=2) as answer:
                    if answer.status == 200:
                        return
            except OSError:
                time.sleep(0.1)
        self.stop()
        raise RuntimeError(f"test server did not answer within {SERVER_START_SECONDS} s")

    def stop(self) -> None:
        if self.process.poll() is None:
            self.process.terminate()
            try:
                self.process.wait(timeout=10)
            except subprocess.TimeoutExpired:
                self.process.kill()
                self.process.wait(timeout=10)
        self._log_file.close()


@pytest.fixture()
def start_server():
    """A function starting a server on a data directory; every server it started is stopped afterwards."""
    started: list[Server] = []

    def start(data_dir: Path, env: dict | None = None) -> Server:
        server = Server(data_dir, env)
        started.append(server)
        return server

    yield start
    for server in started:
        server.stop()


@pytest.fixture(scope="session")
def live_server(tmp_path_factory):
    """One server for the browser tests, with a fresh data directory."""
    server = Server(tmp_path_factory.mktemp("live-server"))
    yield server
    server.stop()


@pytest.fixture()
def client(tmp_path):
    """An in-process client of the app with the built-in catalog and shortlists in a temporary directory."""
    from fastapi.testclient import TestClient

    from electrosieve.app.main import create_app
    from electrosieve.app.settings import Settings
    from electrosieve.engine.catalog import default_catalog

    app = create_app(Settings(data_dir=tmp_path), catalog=default_catalog())
    with TestClient(app, raise_server_exceptions=False) as test_client:
        yield test_client
