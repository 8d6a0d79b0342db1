"""The shortlist storage and API tests against PostgreSQL, the database several instances behind a load
balancer share (``DATABASE_URL``).

Runs when ``ELECTROSIEVE_TEST_POSTGRES_URL`` (a SQLAlchemy URL such as
``postgresql+psycopg://postgres@127.0.0.1:5432/electrosieve_test``) is set and the server answers;
otherwise every test here is skipped with the reason. ``.ci/run`` starts a throwaway PostgreSQL on
127.0.0.1 and sets the variable when it runs as root on Debian. Each run works in a schema of its
own, dropped at the end, so the database may be shared. Bounded: a connect timeout and a statement
timeout on every connection, timeouts on every HTTP call.
"""

import json
import os
import secrets
import threading
import urllib.request

import pytest
from fastapi.testclient import TestClient

from electrosieve.app import storage
from electrosieve.app.main import create_app
from electrosieve.app.settings import Settings
from electrosieve.app.storage import load_shortlist, open_storage, save_shortlist
from electrosieve.engine.catalog import default_catalog
from tests.utils.storage_checks import (RESULT, SCENARIO, assert_a_save_is_one_transaction,
                                        assert_failed_saves_write_nothing, assert_updates_are_refused, count)

ENV = "ELECTROSIEVE_TEST_POSTGRES_URL"
CONNECT_SECONDS = 5
STATEMENT_MS = 15_000
HTTP_TIMEOUT = 20
CATALOG = default_catalog()


def _with_options(url, **options):
    from sqlalchemy.engine import make_url

    parsed = make_url(url)
    flags = " ".join(f"-c{key}={value}" for key, value in options.items())
    return parsed.update_query_dict({"connect_timeout": str(CONNECT_SECONDS), "options": flags}).render_as_string(
        hide_password=False)


def unavailable() -> str | None:
    """Why the PostgreSQL tests cannot run here, or None."""
    url = os.environ.get(ENV, "").strip()
    if not url:
        return f"{ENV} is not set: no PostgreSQL to test against (.ci/run starts one when run as root on Debian)"
    try:
        from sqlalchemy import create_engine, text
        from sqlalchemy.engine import make_url

        parsed = make_url(url)
    except Exception as error:
        return f"{ENV} is not a SQLAlchemy URL: {error}"
    if parsed.get_backend_name() != "postgresql":
        return f"{ENV} does not name a PostgreSQL database ({parsed.get_backend_name()})"
    try:
        engine = create_engine(_with_options(url, statement_timeout=STATEMENT_MS))
    except ImportError as error:
        return f"no PostgreSQL driver for {parsed.drivername} ({error}); install the test extra: pip install -e '.[test]'"
    try:
        with engine.connect() as connection:
            connection.execute(text("SELECT 1"))
    except Exception as error:
        return f"PostgreSQL at {parsed.render_as_string(hide_password=True)} is unreachable: {type(error).__name__}"
    finally:
        engine.dispose()
    return None


@pytest.fixture(scope="module")
def pg_url():
    """A URL whose connections work in a fresh schema of their own (dropped afterwards)."""
    reason = unavailable()
    if reason:
        pytest.skip(reason)
    from sqlalchemy import create_engine, text

    base = os.environ[ENV].strip()
    schema = f"electrosieve_test_{secrets.token_hex(4)}"
    admin = create_engine(_with_options(base, statement_timeout=STATEMENT_MS))
    with admin.begin() as connection:
        connection.execute(text(f'CREATE SCHEMA "{schema}"'))
    try:
        yield _with_options(base, search_path=schema, statement_timeout=STATEMENT_MS)
    finally:
        with admin.begin() as connection:
            connection.execute(text(f'DROP SCHEMA "{schema}" CASCADE'))
        admin.dispose()


@pytest.fixture()
def engine(pg_url):
    db = open_storage(url=pg_url)
    yield db
    db.dispose()


# --- storage --------------------------------------------------------------------------------

def test_postgres_save_and_load_round_trip(engine):
    assert engine.dialect.name == "postgresql"
    saved = save_shortlist(engine=engine, title="Cathodes acides — ü ✓ 電極", scenario=SCENARIO, result=RESULT,
                           notes={"Pt": "ask stores ü\nsecond line"})
    loaded = load_shortlist(engine=engine, shortlist_id=saved.id)
    assert loaded == saved
    assert load_shortlist(engine=engine, shortlist_id="AAAAAAAAAAAAAAAA") is None
    assert storage.check_storage(engine=engine) == "ok"
    assert storage.journal_mode(engine=engine) == ""


def test_postgres_ids_are_random_and_distinct(engine):
    ids = {save_shortlist(engine=engine, title="t", scenario=SCENARIO, result=RESULT, notes={}).id for _ in range(50)}
    assert len(ids) == 50 and all(len(shortlist_id) == 16 for shortlist_id in ids)


def test_postgres_failed_save_writes_nothing(engine):
    assert_failed_saves_write_nothing(engine)


def test_postgres_save_is_one_transaction(engine, monkeypatch):
    assert_a_save_is_one_transaction(engine, monkeypatch, "lost the connection after the insert")


def test_postgres_cannot_store_nul_which_the_api_therefore_refuses(engine, pg_url, tmp_path):
    # PostgreSQL text cannot hold U+0000: the storage layer fails on it, so the API refuses it with a 422.
    from sqlalchemy.exc import SQLAlchemyError

    before = count(engine)
    with pytest.raises((SQLAlchemyError, ValueError)):
        save_shortlist(engine=engine, title="a\u0000b", scenario=SCENARIO, result=RESULT, notes={})
    assert count(engine) == before
    with TestClient(create_app(Settings(data_dir=tmp_path, database_url=pg_url), catalog=CATALOG),
                    raise_server_exceptions=False) as client:
        response = client.post("/api/v1/shortlists", json={"title": "a\u0000b", "scenario": SCENARIO})
        assert response.status_code == 422 and response.json()["detail"][0]["loc"] == ["body", "title"]


def test_postgres_saves_from_many_threads_are_distinct_and_readable(engine):
    saved, problems = [], []
    lock = threading.Lock()

    def writer(number):
        try:
            for serial in range(5):
                item = save_shortlist(engine=engine, title=f"thread {number}/{serial}", scenario=SCENARIO,
                                      result=RESULT, notes={"Pt": f"{number}/{serial}"})
                with lock:
                    saved.append(item)
        except Exception as error:
            with lock:
                problems.append(repr(error))

    threads = [threading.Thread(target=writer, args=(n,), daemon=True) for n in range(8)]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join(timeout=60)
        assert not thread.is_alive()
    assert not problems, problems
    assert len({item.id for item in saved}) == len(saved) == 40
    for item in saved:
        assert load_shortlist(engine=engine, shortlist_id=item.id) == item


def test_postgres_stored_shortlists_cannot_be_updated(engine):
    assert_updates_are_refused(engine)


# --- the API and several instances ----------------------------------------------------------

def test_postgres_api_create_get_and_restart(pg_url, tmp_path):
    body = {"title": "Électrodes — 電極 🧪", "scenario": {**SCENARIO, "materials": ["Pt", "Zn", "Pb"]},
            "notes": {"Pt": "ask stores", "zn": "no"}}
    with TestClient(create_app(Settings(data_dir=tmp_path, database_url=pg_url), catalog=CATALOG)) as first:
        assert first.get("/healthz").json()["storage"] == "ok"
        response = first.post("/api/v1/shortlists", json=body)
        assert response.status_code == 201, response.text
        created = response.json()
        before = first.get(f"/api/v1/shortlists/{created['id']}").json()
        assert before["title"] == body["title"]
        assert {row["material"]: row["note"] for row in before["results"]} == {"Pt": "ask stores", "Zn": "no", "Pb": ""}
        assert first.get("/api/v1/shortlists/AAAAAAAAAAAAAAAA").status_code == 404
    assert not (tmp_path / "electrosieve.sqlite3").exists()  # nothing went to SQLite
    with TestClient(create_app(Settings(data_dir=tmp_path, database_url=pg_url), catalog=CATALOG)) as second:
        after = second.get(f"/api/v1/shortlists/{created['id']}")
        assert after.status_code == 200 and after.json() == before
        assert second.get(created["url"], headers={"accept": "text/html"}).status_code == 200


def http(method: str, url: str, body: dict | None = None) -> tuple[int, dict]:
    data = None if body is None else json.dumps(body).encode()
    req = urllib.request.Request(url, data=data, method=method, headers={"content-type": "application/json"})
    with urllib.request.urlopen(req, timeout=HTTP_TIMEOUT) as answer:
        return answer.status, json.loads(answer.read())


def test_postgres_two_instances_share_the_shortlists(pg_url, tmp_path, start_server):
    # as behind a load balancer: saved through one instance, read through the other
    one = start_server(tmp_path / "one", env={"DATABASE_URL": pg_url})
    other = start_server(tmp_path / "other", env={"DATABASE_URL": pg_url})
    ids = []
    for number, (save_on, read_on) in enumerate([(one, other), (other, one)] * 3):
        status, created = http("POST", f"{save_on.url}/api/v1/shortlists",
                               {"title": f"shared {number}", "scenario": SCENARIO, "notes": {"Zn": f"n{number}"}})
        assert status == 201
        status, stored = http("GET", f"{read_on.url}/api/v1/shortlists/{created['id']}")
        assert status == 200 and stored["title"] == f"shared {number}"
        ids.append(created["id"])
    assert len(set(ids)) == len(ids)
    for server in (one, other):
        status, health = http("GET", f"{server.url}/healthz")
        assert status == 200 and health["storage"] == "ok"
    assert not any(path.name.endswith(".sqlite3") for path in tmp_path.rglob("*"))


# --- instances starting together on a new database --------------------------------------------

START_TOGETHER = """
import sys, time
from electrosieve.app.storage import check_storage, open_storage
url, at = sys.argv[1], float(sys.argv[2])
time.sleep(max(0.0, at - time.time()))
engine = open_storage(url=url)
print(check_storage(engine=engine))
"""
RACE_TRIALS = 6
INSTANCES = 3


def test_postgres_instances_starting_together_on_a_new_database_all_come_up(pg_url):
    # as an orchestrator starts them: several processes create the schema at the same moment, on a fresh
    # schema per trial; every one must come up (before the advisory lock, one exited on a duplicate type name)
    import subprocess
    import sys
    import time

    from sqlalchemy import create_engine, text

    admin = create_engine(pg_url)
    try:
        for trial in range(RACE_TRIALS):
            schema = f"race_{secrets.token_hex(4)}"
            with admin.begin() as connection:
                connection.execute(text(f'CREATE SCHEMA "{schema}"'))
            url = _with_options(os.environ[ENV].strip(), search_path=schema, statement_timeout=STATEMENT_MS)
            at = time.time() + 2.0
            processes = [subprocess.Popen([sys.executable, "-c", START_TOGETHER, url, str(at)], stdout=subprocess.PIPE,
                                          stderr=subprocess.PIPE, text=True) for _ in range(INSTANCES)]
            outcomes = [process.communicate(timeout=60) for process in processes]
            for process, (out, err) in zip(processes, outcomes):
                assert process.returncode == 0 and out.strip() == "ok", f"trial {trial}: {err[-2000:]}"
            engine = open_storage(url=url)
            saved = save_shortlist(engine=engine, title="after the race", scenario=SCENARIO, result=RESULT, notes={})
            assert load_shortlist(engine=engine, shortlist_id=saved.id) == saved
            assert_updates_are_refused(engine)  # the trigger was created exactly once, and works
            engine.dispose()
            with admin.begin() as connection:
                connection.execute(text(f'DROP SCHEMA "{schema}" CASCADE'))
    finally:
        admin.dispose()


def test_postgres_connections_cut_by_a_restart_are_replaced_without_an_error(pg_url, tmp_path):
    # a database restart ends every open connection: the next requests check theirs and reconnect
    from sqlalchemy import create_engine, text
    from sqlalchemy.engine import make_url

    app_url = make_url(pg_url).update_query_dict({"application_name": "electrosieve_restart"})
    app_url = app_url.render_as_string(hide_password=False)
    with TestClient(create_app(Settings(data_dir=tmp_path, database_url=app_url), catalog=CATALOG)) as client:
        created = client.post("/api/v1/shortlists", json={"title": "before the restart", "scenario": SCENARIO})
        assert created.status_code == 201
        admin = create_engine(pg_url)
        with admin.begin() as connection:
            ended = connection.execute(text(
                "SELECT count(pg_terminate_backend(pid)) FROM pg_stat_activity "
                "WHERE application_name = 'electrosieve_restart'")).scalar()
        admin.dispose()
        assert ended >= 1
        assert client.get("/healthz").json()["storage"] == "ok"
        assert client.get(f"/api/v1/shortlists/{created.json()['id']}").status_code == 200
        assert client.post("/api/v1/shortlists", json={"title": "after", "scenario": SCENARIO}).status_code == 201

