"""Durability: shortlists are saved while the server is killed with SIGKILL; after a restart on the same
data directory every shortlist whose creation was acknowledged (201 received) is readable and identical,
and no stored row is half-written.

A real uvicorn server in a subprocess (tests/conftest.py), writers on loopback only. Bounded: ROUNDS
kills, each after at most LOAD_SECONDS of writing; every HTTP call has a timeout; the server start-up
is bounded by the fixture. A SIGKILL loses no committed transaction in SQLite's WAL mode (the OS keeps
the written pages); power loss is another matter, which this test does not claim to cover.
"""

import http.client
import json
import random
import sqlite3
import threading
import time

from electrosieve.app.settings import SQLITE_FILE
from electrosieve.app.storage import FORMAT
from tests.utils.http import request_json

NO_RATE_LIMIT = {"ELECTROSIEVE_SAVES_PER_MINUTE": "0"}
"""Many saves from one address on purpose (the rate limit has its own tests)."""
ROUNDS = 3
"""How many times the server is killed while shortlists are being written."""
WRITERS = 4
"""Client threads writing at once."""
LOAD_SECONDS = (0.4, 1.0)
"""The kill comes at a random moment in this range after the first acknowledged save of a round [s]."""
HTTP_TIMEOUT = 10
"""Longest wait for any one HTTP answer [s]."""
ROUND_SECONDS = 20
"""Longest a round may take before the test gives up [s]."""

SCENARIOS = [
    {"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode", "materials": ["Pt", "Zn", "Ni"]},
    {"ph": 14, "potential": [1.5, 1.7], "scale": "RHE", "materials": ["Ni", "Co", "Fe", "IrO2"]},
    {"ph": [6, 8], "potential": 0.2, "scale": "SCE", "materials": ["Au", "Ag", "Cu"]},
]


def request(method: str, url: str, body: dict | None = None) -> tuple[int, dict]:
    return request_json(method, url, body, timeout=HTTP_TIMEOUT)


GONE = (OSError, ValueError, http.client.HTTPException)
"""What a client sees when the server dies under it: refused, reset, or a cut-off answer."""


def shortlist_body(writer: int, serial: int, rng: random.Random) -> dict:
    scenario = rng.choice(SCENARIOS)
    first = scenario["materials"][0]
    return {"title": f"durable {writer}-{serial} électrode ✓", "scenario": scenario,
            "notes": {first: f"writer {writer}, save {serial}\nsecond line"}}


class Writers:
    """Threads saving shortlists until the server stops answering; they keep what was acknowledged."""

    def __init__(self, url: str, round_number: int):
        self.url = url
        self.round = round_number
        self.acknowledged: list[tuple[str, dict]] = []  # (id, body sent)
        self.seen_before_kill: dict[str, dict] = {}  # id -> the JSON the server returned right after saving
        self.unexpected: list = []  # answers other than 201/200 while the server was up
        self.first_ack = threading.Event()
        self.lock = threading.Lock()
        self.threads = [threading.Thread(target=self.write, args=(n,), daemon=True) for n in range(WRITERS)]

    def start(self) -> None:
        for thread in self.threads:
            thread.start()

    def write(self, writer: int) -> None:
        rng = random.Random(1000 * self.round + writer)
        deadline = time.monotonic() + ROUND_SECONDS
        serial = 0
        while time.monotonic() < deadline:
            serial += 1
            body = shortlist_body(writer, 100 * self.round + serial, rng)
            try:
                status, created = request("POST", f"{self.url}/api/v1/shortlists", body)
            except GONE:  # the server was killed
                return
            if status != 201:
                self.unexpected.append((status, created))
                return
            with self.lock:
                self.acknowledged.append((created["id"], body))
            self.first_ack.set()
            try:
                status, stored = request("GET", f"{self.url}/api/v1/shortlists/{created['id']}")
            except GONE:
                return
            if status != 200:
                self.unexpected.append((status, stored))
            else:
                with self.lock:
                    self.seen_before_kill[created["id"]] = stored

    def join(self) -> None:
        for thread in self.threads:
            thread.join(timeout=HTTP_TIMEOUT + 5)
            assert not thread.is_alive(), "a writer did not stop after the server was killed"


def rows_of(database) -> list[dict]:
    connection = sqlite3.connect(f"file:{database}?mode=ro", uri=True, timeout=5)
    try:
        assert connection.execute("PRAGMA integrity_check").fetchone()[0] == "ok"
        connection.row_factory = sqlite3.Row
        return [dict(row) for row in connection.execute("SELECT * FROM shortlists")]
    finally:
        connection.close()


def test_acknowledged_shortlists_survive_sigkill_and_none_is_half_written(tmp_path, start_server):
    acknowledged: list[tuple[str, dict]] = []
    seen: dict[str, dict] = {}
    for round_number in range(ROUNDS):
        server = start_server(tmp_path, env=NO_RATE_LIMIT)
        writers = Writers(server.url, round_number)
        writers.start()
        assert writers.first_ack.wait(timeout=ROUND_SECONDS), "no shortlist was acknowledged"
        time.sleep(random.Random(round_number).uniform(*LOAD_SECONDS))
        server.process.kill()  # SIGKILL: no shutdown handler runs
        server.process.wait(timeout=10)
        writers.join()
        server.stop()
        assert not writers.unexpected, writers.unexpected
        acknowledged += writers.acknowledged
        seen.update(writers.seen_before_kill)

    assert len(acknowledged) >= ROUNDS
    assert len({shortlist_id for shortlist_id, _ in acknowledged}) == len(acknowledged)

    server = start_server(tmp_path, env=NO_RATE_LIMIT)
    screened = {}
    for shortlist_id, body in acknowledged:
        status, stored = request("GET", f"{server.url}/api/v1/shortlists/{shortlist_id}")
        assert status == 200, (shortlist_id, stored)
        assert stored["title"] == body["title"]
        notes = {row["material"]: row["note"] for row in stored["results"] if row["note"]}
        assert notes == body["notes"]
        key = json.dumps(body["scenario"], sort_keys=True)
        if key not in screened:
            status, screened[key] = request("POST", f"{server.url}/api/v1/screen", body["scenario"])
            assert status == 200
        expected = screened[key]
        assert stored["scenario"] == expected["scenario"]
        assert [{k: v for k, v in row.items() if k != "note"} for row in stored["results"]] == expected["results"]
        if shortlist_id in seen:  # read back before the kill: identical after the restart
            assert stored == seen[shortlist_id]

    rows = rows_of(tmp_path / SQLITE_FILE)
    stored_ids = {row["id"] for row in rows}
    assert {shortlist_id for shortlist_id, _ in acknowledged} <= stored_ids
    for row in rows:  # rows saved but never acknowledged (killed before the answer) must be whole too
        assert all(row[column] not in (None, "") for column in ("id", "title", "created_at", "catalog_version"))
        result = json.loads(row["result"])
        assert row["format"] == FORMAT and json.loads(row["scenario"])["accept"]
        assert result["results"] and isinstance(json.loads(row["notes"]), dict)
        status, _ = request("GET", f"{server.url}/api/v1/shortlists/{row['id']}")
        assert status == 200
