"""Concurrency: many shortlists saved at once from several client threads against a real server started
the way a lab would start it (``electrosieve serve --workers 2``): every id distinct, every shortlist
readable and identical to what was sent, whichever worker process answers.

The same run checks the operations side: the start-up line names the URL, two worker processes answer
(the request log carries each worker's process id), and every request is logged as one JSON object per
line with method, path, status and duration.

Loopback only; bounded: a fixed number of saves, a timeout on every HTTP call and on start and stop.
"""

import json
import os
import signal
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest

from tests.conftest import ROOT, SERVER_START_SECONDS, free_port
from tests.utils.http import request_json

WORKERS = 2
CLIENTS = 8
SAVES_PER_CLIENT = 12
HTTP_TIMEOUT = 20
"""Longest wait for any one HTTP answer [s] (a save waits for SQLite's write lock at most 5 s)."""

SCENARIOS = [
    {"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode", "materials": ["Pt", "Zn", "Pb"]},
    {"ph": 14, "potential": [1.5, 1.7], "scale": "RHE", "materials": ["Ni", "Co", "IrO2"]},
    {"ph": [4, 9], "potential": [0.0, 0.4], "scale": "AgAgCl-sat", "materials": ["Au", "Ti", "graphite"]},
]


def request(method: str, url: str, body: dict | None = None) -> tuple[int, dict]:
    return request_json(method, url, body, timeout=HTTP_TIMEOUT)


def log_lines(path: Path, complete: bool = True) -> list[dict]:
    """The request log's JSON lines (other lines, such as the start-up line, are left out).

    ``complete=False`` while the server runs: a line being written may be cut off, and is skipped."""
    lines = []
    for line in path.read_text(errors="replace").splitlines():
        if line.startswith("{"):
            try:
                lines.append(json.loads(line))
            except ValueError:
                if complete:
                    raise
    return lines


class CliServer:
    """``electrosieve serve --workers N`` in a subprocess, its stderr in a log file."""

    def __init__(self, data_dir: Path, workers: int):
        self.port = free_port()
        self.url = f"http://127.0.0.1:{self.port}"
        self.log = data_dir / "serve.log"
        env = {k: v for k, v in os.environ.items() if k not in ("DATABASE_URL", "ELECTROSIEVE_CATALOG_DIR")}
        env["ELECTROSIEVE_SAVES_PER_MINUTE"] = "0"  # many saves from one address on purpose: no rate limit here
        self._log_file = open(self.log, "wb")
        self.process = subprocess.Popen(
            [sys.executable, "-m", "electrosieve.app.cli", "serve", "--host", "127.0.0.1", "--port", str(self.port),
             "--workers", str(workers), "--store", str(data_dir)],
            cwd=ROOT, env=env, stdout=self._log_file, stderr=subprocess.STDOUT)

    def wait_for_workers(self, count: int) -> set[int]:
        """Poll /healthz until ``count`` distinct worker processes have answered; their process ids."""
        deadline = time.monotonic() + SERVER_START_SECONDS
        while time.monotonic() < deadline:
            if self.process.poll() is not None:
                raise RuntimeError(f"server exited early:\n{self.log.read_text(errors='replace')}")
            try:
                request("GET", f"{self.url}/healthz")
            except OSError:
                time.sleep(0.1)
                continue
            pids = {line["pid"] for line in log_lines(self.log, complete=False) if line["path"] == "/healthz"}
            if len(pids) >= count:
                return pids
        raise RuntimeError(f"{count} workers did not answer within {SERVER_START_SECONDS} s:\n"
                           f"{self.log.read_text(errors='replace')}")

    def children(self) -> set[int]:
        """Process ids of the supervisor's children (the workers), from /proc."""
        try:
            text = Path(f"/proc/{self.process.pid}/task/{self.process.pid}/children").read_text()
        except OSError:
            return set()
        return {int(pid) for pid in text.split()}

    def stop(self) -> None:
        """SIGTERM to the supervisor, which stops its workers; SIGKILL to both if that takes too long."""
        if self.process.poll() is None:
            workers = self.children()  # taken while they are still ours
            self.process.send_signal(signal.SIGTERM)
            try:
                self.process.wait(timeout=15)
            except subprocess.TimeoutExpired:
                for pid in workers:
                    try:
                        os.kill(pid, signal.SIGKILL)
                    except ProcessLookupError:
                        pass
                self.process.kill()
                self.process.wait(timeout=10)
        if not self._log_file.closed:
            self._log_file.close()


@pytest.fixture()
def cli_server(tmp_path):
    server = CliServer(tmp_path, WORKERS)
    try:
        server.worker_pids = server.wait_for_workers(WORKERS)
        assert server.worker_pids <= server.children()  # the answering processes are the supervisor's workers
        yield server
    finally:
        server.stop()


def test_many_shortlists_saved_at_once_are_distinct_and_readable(cli_server):
    server = cli_server
    startup = server.log.read_text(errors="replace").splitlines()[0]
    assert f"serving on {server.url}/" in startup and f"{WORKERS} workers" in startup, startup

    start = threading.Barrier(CLIENTS, timeout=HTTP_TIMEOUT)
    saved: list[tuple[str, dict]] = []
    problems: list = []
    lock = threading.Lock()

    def client(number: int) -> None:
        try:
            start.wait()
            for serial in range(SAVES_PER_CLIENT):
                scenario = SCENARIOS[(number + serial) % len(SCENARIOS)]
                body = {"title": f"client {number} save {serial} — Zn²⁺/Zn",
                        "scenario": scenario, "notes": {scenario["materials"][-1]: f"from client {number}/{serial}"}}
                status, created = request("POST", f"{server.url}/api/v1/shortlists", body)
                with lock:
                    if status == 201:
                        saved.append((created["id"], body))
                    else:
                        problems.append((status, created))
        except Exception as error:  # reported below, not lost in the thread
            with lock:
                problems.append(repr(error))

    threads = [threading.Thread(target=client, args=(n,), daemon=True) for n in range(CLIENTS)]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join(timeout=HTTP_TIMEOUT * SAVES_PER_CLIENT)
        assert not thread.is_alive(), "a client did not finish"
    assert not problems, problems[:5]
    assert len(saved) == CLIENTS * SAVES_PER_CLIENT
    assert len({shortlist_id for shortlist_id, _ in saved}) == len(saved)

    expected = {}
    for scenario in SCENARIOS:
        status, expected[json.dumps(scenario, sort_keys=True)] = request("POST", f"{server.url}/api/v1/screen", scenario)
        assert status == 200
    for shortlist_id, body in saved:
        status, first = request("GET", f"{server.url}/api/v1/shortlists/{shortlist_id}")
        assert status == 200, first
        status, again = request("GET", f"{server.url}/s/{shortlist_id}.json")
        assert status == 200 and again == first
        assert first["id"] == shortlist_id and first["title"] == body["title"]
        assert {row["material"]: row["note"] for row in first["results"] if row["note"]} == body["notes"]
        screened = expected[json.dumps(body["scenario"], sort_keys=True)]
        assert [{k: v for k, v in row.items() if k != "note"} for row in first["results"]] == screened["results"]

    server.stop()  # every log line is written once the workers have stopped
    lines = log_lines(server.log)
    assert all(set(line) == {"method", "path", "status", "duration_ms", "pid"} for line in lines)
    assert all(isinstance(line["duration_ms"], (int, float)) and line["duration_ms"] >= 0 for line in lines)
    saves = [line for line in lines if line["method"] == "POST" and line["path"] == "/api/v1/shortlists"]
    assert len(saves) == len(saved) and {line["status"] for line in saves} == {201}
    assert {line["pid"] for line in saves} <= server.worker_pids
    assert len(server.worker_pids) == WORKERS


HEAVY_CLIENTS = 12
PROBE_TIMEOUT = 2.0
"""A load balancer's probe timeout [s]: /healthz must answer within it whatever else runs."""


def test_heavy_pages_beyond_the_limit_get_a_quick_503_and_healthz_still_answers(tmp_path, start_server):
    # one computation at a time and one waiting: of twelve uncached compare pages asked at once, most are
    # told to come back (503 + Retry-After) at once, and the health probe answers throughout
    import urllib.error
    import urllib.request

    server = start_server(tmp_path, env={"ELECTROSIEVE_HEAVY_REQUESTS": "1", "ELECTROSIEVE_HEAVY_QUEUE": "1"})
    start = threading.Barrier(HEAVY_CLIENTS + 1, timeout=HTTP_TIMEOUT)
    answers, probes = [], []
    lock = threading.Lock()

    def heavy(number: int) -> None:
        query = (f"ph_low={number * 0.37:.2f}&ph_high={number * 0.37 + 2:.2f}&potential_low=-0.5&potential_high=1.2"
                 "&compare=Pt&compare=Ni&compare=Zn&compare=Cu")
        start.wait()
        try:
            with urllib.request.urlopen(f"{server.url}/compare.json?{query}", timeout=HTTP_TIMEOUT) as answer:
                outcome = (answer.status, None)
        except urllib.error.HTTPError as error:
            outcome = (error.code, error.headers.get("retry-after"))
        with lock:
            answers.append(outcome)

    def probe() -> None:
        start.wait()
        for _ in range(10):
            try:
                with urllib.request.urlopen(f"{server.url}/healthz", timeout=PROBE_TIMEOUT) as answer:
                    probes.append(answer.status)
            except (OSError, urllib.error.HTTPError) as error:
                probes.append(repr(error))
            time.sleep(0.05)

    threads = [threading.Thread(target=heavy, args=(n,), daemon=True) for n in range(HEAVY_CLIENTS)]
    threads.append(threading.Thread(target=probe, daemon=True))
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join(timeout=HTTP_TIMEOUT * 2)
        assert not thread.is_alive()
    assert probes == [200] * 10, probes
    statuses = sorted(status for status, _ in answers)
    assert len(answers) == HEAVY_CLIENTS and set(statuses) <= {200, 503}, statuses
    assert statuses.count(200) >= 1 and statuses.count(503) >= 1, statuses
    assert all(retry == "1" for status, retry in answers if status == 503)
