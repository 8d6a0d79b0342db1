"""Shortlist storage: one transaction per save, immutable rows, random ids, WAL mode, and links that survive restarts."""

import inspect
import json
import urllib.request

import pytest
from fastapi.testclient import TestClient

from electrosieve.app import storage
from electrosieve.app.main import create_app
from electrosieve.app.settings import Settings, SettingsError
from electrosieve.app.storage import load_shortlist, open_storage, save_shortlist
from electrosieve.engine.catalog import default_catalog
from tests.utils.storage_checks import (RESULT, SCENARIO, assert_a_save_is_one_transaction,
                                        assert_failed_saves_write_nothing, assert_updates_are_refused)



@pytest.fixture()
def engine(tmp_path):
    db = open_storage(url=f"sqlite:///{tmp_path / 'db' / 'shortlists.sqlite3'}")
    yield db
    db.dispose()


def test_save_and_load_round_trip(engine):
    saved = save_shortlist(engine=engine, title="Acid cathodes", scenario=SCENARIO, result=RESULT,
                           notes={"Pt": "ask stores ü"})
    loaded = load_shortlist(engine=engine, shortlist_id=saved.id)
    assert loaded == saved
    assert loaded.catalog_version == "abc123"
    assert load_shortlist(engine=engine, shortlist_id="AAAAAAAAAAAAAAAA") is None


def test_ids_are_random_and_at_least_64_bits(engine):
    ids = {save_shortlist(engine=engine, title="t", scenario=SCENARIO, result=RESULT, notes={}).id for _ in range(200)}
    assert len(ids) == 200
    for shortlist_id in ids:
        assert len(shortlist_id) == 16  # 12 random bytes, URL-safe base64: 96 bits
    assert storage.ID_BYTES * 8 >= 64


def test_sqlite_runs_in_wal_mode(engine):
    assert storage.journal_mode(engine=engine) == "wal"


def test_stored_shortlists_cannot_be_updated(engine):
    assert_updates_are_refused(engine, match="immutable")
    assert not [name for name in dir(storage) if name.startswith(("update", "edit", "delete", "change"))]


def test_a_failed_save_writes_nothing(engine):
    assert_failed_saves_write_nothing(engine)


def test_a_save_is_one_transaction(engine, monkeypatch):
    assert_a_save_is_one_transaction(engine, monkeypatch, "disk full after the insert")


def test_storage_functions_take_keywords_only():
    for function in (open_storage, save_shortlist, load_shortlist, storage.check_storage, storage.journal_mode):
        parameters = inspect.signature(function).parameters.values()
        assert all(p.kind is inspect.Parameter.KEYWORD_ONLY for p in parameters), function.__name__


def test_settings_from_the_environment(tmp_path):
    settings = Settings.from_env({"ELECTROSIEVE_DATA_DIR": str(tmp_path), "ELECTROSIEVE_MAX_BODY_BYTES": "2048"})
    assert settings.data_dir == tmp_path and settings.max_body_bytes == 2048
    assert settings.storage_url == f"sqlite:///{(tmp_path / 'electrosieve.sqlite3').resolve()}"
    remote = Settings.from_env({"DATABASE_URL": "postgresql+psycopg://lab@db/electrosieve"})
    assert remote.storage_url == "postgresql+psycopg://lab@db/electrosieve"
    assert Settings.from_env({}).data_dir.name == "var"
    for bad in ("lots", "10"):
        with pytest.raises(SettingsError, match="ELECTROSIEVE_MAX_BODY_BYTES"):
            Settings.from_env({"ELECTROSIEVE_MAX_BODY_BYTES": bad})


def test_importing_the_app_touches_no_disk(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    create_app(Settings.from_env({}))
    assert not (tmp_path / "var").exists()


def test_link_survives_an_app_restart(tmp_path):
    catalog = default_catalog()
    body = {"title": "survives", "scenario": SCENARIO, "notes": {"Pt": "keep"}}
    with TestClient(create_app(Settings(data_dir=tmp_path), catalog=catalog)) as first:
        created = first.post("/api/v1/shortlists", json=body).json()
        before = first.get(f"/api/v1/shortlists/{created['id']}").json()
    with TestClient(create_app(Settings(data_dir=tmp_path), catalog=catalog)) as second:
        after = second.get(f"/api/v1/shortlists/{created['id']}")
        assert after.status_code == 200
        assert after.json() == before
        assert second.get(created["url"]).status_code == 200


def test_link_survives_a_server_restart(tmp_path, start_server):
    first = start_server(tmp_path)
    request = urllib.request.Request(f"{first.url}/api/v1/shortlists", method="POST",
                                     data=json.dumps({"title": "restart", "scenario": SCENARIO}).encode(),
                                     headers={"content-type": "application/json"})
    with urllib.request.urlopen(request, timeout=20) as answer:
        assert answer.status == 201
        created = json.loads(answer.read())
    with urllib.request.urlopen(f"{first.url}/s/{created['id']}.json", timeout=20) as answer:
        before = json.loads(answer.read())
    first.stop()
    second = start_server(tmp_path)
    with urllib.request.urlopen(f"{second.url}{created['url']}.json", timeout=20) as answer:
        assert answer.status == 200
        after = json.loads(answer.read())
    assert after["results"] == before["results"] and after["title"] == "restart"
    assert (tmp_path / "electrosieve.sqlite3").exists()
