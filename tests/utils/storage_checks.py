"""Storage checks shared by the SQLite tests (tests/test_storage.py) and the PostgreSQL ones (tests/test_postgres.py)."""

import math

import pytest
from sqlalchemy import func, select, text
from sqlalchemy.exc import DatabaseError

from electrosieve.app.storage import NOTE_MAX, TITLE_MAX, load_shortlist, save_shortlist, shortlists

SCENARIO = {"ph": [0, 1], "potential": [-0.2, 0.0], "role": "cathode", "materials": ["Pt", "Zn"]}
RESULT = {"catalog_version": "abc123", "results": [{"material": "Pt"}, {"material": "Zn"}], "rule": "r"}
"""A small scenario echo and screen result (test data)."""


def count(engine) -> int:
    """Rows in the shortlists table."""
    with engine.connect() as connection:
        return connection.execute(select(func.count()).select_from(shortlists)).scalar()


def assert_failed_saves_write_nothing(engine) -> None:
    """A non-finite number, an over-long title or an over-long note is refused and leaves no row."""
    before = count(engine)
    with pytest.raises(ValueError):
        save_shortlist(engine=engine, title="bad", scenario=SCENARIO, result={**RESULT, "x": math.nan}, notes={})
    with pytest.raises(ValueError):
        save_shortlist(engine=engine, title="t" * (TITLE_MAX + 1), scenario=SCENARIO, result=RESULT, notes={})
    with pytest.raises(ValueError):
        save_shortlist(engine=engine, title="t", scenario=SCENARIO, result=RESULT, notes={"Pt": "n" * (NOTE_MAX + 1)})
    assert count(engine) == before


def assert_a_save_is_one_transaction(engine, monkeypatch, failure: str) -> None:
    """An insert that fails inside the transaction (``failure`` says how) leaves no row behind."""

    class Boom(Exception):
        pass

    original = engine.begin

    def failing_begin():
        context = original()

        class Wrapped:
            def __enter__(self):
                self.connection = context.__enter__()
                return self

            def execute(self, statement):
                self.connection.execute(statement)
                raise Boom(failure)

            def __exit__(self, *exc):
                return context.__exit__(*exc)

        return Wrapped()

    before = count(engine)
    monkeypatch.setattr(engine, "begin", failing_begin)
    with pytest.raises(Boom):
        save_shortlist(engine=engine, title="half", scenario=SCENARIO, result=RESULT, notes={})
    monkeypatch.undo()
    assert count(engine) == before


def assert_updates_are_refused(engine, match: str | None = None):
    """The database itself refuses an UPDATE of a saved shortlist; returns the shortlist."""
    saved = save_shortlist(engine=engine, title="fixed", scenario=SCENARIO, result=RESULT, notes={})
    with pytest.raises(DatabaseError, match=match):
        with engine.begin() as connection:
            connection.execute(text("UPDATE shortlists SET title = 'changed' WHERE id = :id"), {"id": saved.id})
    assert load_shortlist(engine=engine, shortlist_id=saved.id).title == "fixed"
    return saved
