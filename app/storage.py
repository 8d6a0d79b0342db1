"""Shortlist storage through SQLAlchemy: SQLite (WAL mode) in the data directory by default, any URL otherwise.

A shortlist is written once, in one transaction, and never changed: this module
offers no update, and a trigger (SQLite or PostgreSQL) refuses any UPDATE of a stored row.
A change makes a new shortlist with a new id. Ids are random, 96 bits
(``secrets.token_urlsafe(12)``), so links cannot be guessed.

Routes call only the keyword-only functions below.
"""

import errno
import json
import os
import secrets
import shutil
import sqlite3
import threading
from dataclasses import dataclass
from datetime import datetime, timezone
from pathlib import Path

from sqlalchemy import Column, DDL, Integer, MetaData, String, Table, Text, create_engine, event, insert, select, text
from sqlalchemy.engine import Engine
from sqlalchemy.exc import IntegrityError, OperationalError, SQLAlchemyError

from electrosieve.engine.errors import ElectrosieveError

ID_BYTES = 12
"""Random bytes per id: 96 bits, 16 URL-safe characters."""

ID_PATTERN = r"^[A-Za-z0-9_-]{16}$"
"""What an id looks like; anything else is unknown without asking the database."""

TITLE_MAX = 200
NOTE_MAX = 2000
NOTES_TOTAL_MAX = 20_000
"""Characters of all notes of one shortlist together."""
FORMAT = 2
"""Version of the stored ``result`` layout: 1, the whole screen payload (older rows, still read);
2, the compact record of ``app.shortlists.compact_record`` (what was shown; the rest is recomputed)."""

metadata = MetaData()

shortlists = Table(
    "shortlists", metadata,
    Column("id", String(32), primary_key=True),
    Column("title", String(TITLE_MAX), nullable=False),
    Column("created_at", String(40), nullable=False),
    Column("catalog_version", String(64), nullable=False),
    Column("format", Integer, nullable=False),
    Column("scenario", Text, nullable=False),
    Column("result", Text, nullable=False),
    Column("notes", Text, nullable=False),
)

event.listen(shortlists, "after_create", DDL(
    "CREATE TRIGGER IF NOT EXISTS shortlists_immutable BEFORE UPDATE ON shortlists "
    "BEGIN SELECT RAISE(ABORT, 'shortlists are immutable: save a new one'); END"
).execute_if(dialect="sqlite"))
event.listen(shortlists, "after_create", DDL(
    "CREATE OR REPLACE FUNCTION shortlists_refuse_update() RETURNS trigger LANGUAGE plpgsql AS "
    "$$ BEGIN RAISE EXCEPTION 'shortlists are immutable: save a new one'; END $$; "
    "CREATE TRIGGER shortlists_immutable BEFORE UPDATE ON shortlists "
    "FOR EACH ROW EXECUTE FUNCTION shortlists_refuse_update()"
).execute_if(dialect="postgresql"))


@dataclass(frozen=True)
class StoredShortlist:
    """A shortlist as saved: the scenario echo, the result record at save time (layout ``format``) and the notes."""

    id: str
    title: str
    created_at: str
    catalog_version: str
    scenario: dict
    result: dict
    notes: dict
    format: int = FORMAT


SYNCHRONOUS = ("NORMAL", "FULL")
"""SQLite's ``synchronous`` settings offered: NORMAL (WAL) loses no acknowledged save when the process
dies, but may lose the last ones on power loss or an operating-system crash; FULL syncs every commit
and survives those too, at the cost of slower saves (SQLite documentation, "PRAGMA synchronous")."""
FREE_BYTES_MIN = 1024 * 1024
"""Below this much free space on the database's file system, the storage counts as full."""


class StorageError(ElectrosieveError):
    """The shortlist storage cannot be opened or used; names the path (or URL setting) and the likely cause."""


def _sqlite_pragmas(synchronous: str):
    def set_pragmas(dbapi_connection, _record) -> None:
        cursor = dbapi_connection.cursor()
        cursor.execute("PRAGMA journal_mode=WAL")
        cursor.execute("PRAGMA busy_timeout=5000")
        cursor.execute(f"PRAGMA synchronous={synchronous}")
        cursor.close()
    return set_pragmas


def _busy_timeout(dbapi_connection, _record) -> None:
    dbapi_connection.execute("PRAGMA busy_timeout=5000")


_create_lock = threading.Lock()


def _sqlite_path(url: str) -> Path | None:
    """The database file of a ``sqlite:///`` URL; None for other databases and in-memory SQLite."""
    path = url.removeprefix("sqlite:///")
    if not url.startswith("sqlite:///") or not path or path == ":memory:":
        return None
    return Path(path)


def _read_only(path: Path) -> bool:
    """True when ``path`` exists in a directory this process cannot write (e.g. a read-only mount)."""
    return path.is_file() and not os.access(path.parent, os.W_OK)


def open_storage(*, url: str, synchronous: str = "NORMAL") -> Engine:
    """An engine for ``url`` with the tables created; a SQLite file's directory is created too.

    An existing SQLite file in a directory that cannot be written is opened read-only (shortlists are
    shown, saves refused). Raises :class:`StorageError` naming the path and the likely cause."""
    if synchronous not in SYNCHRONOUS:
        raise ValueError(f"synchronous must be one of {SYNCHRONOUS}")
    path = _sqlite_path(url)
    where = str(path) if path else "DATABASE_URL"
    options = {}
    if url.startswith("sqlite"):
        options["connect_args"] = {"check_same_thread": False}
    read_only = False
    if path is not None:
        try:
            path.parent.mkdir(parents=True, exist_ok=True)
        except FileExistsError:
            raise StorageError(f"{path.parent} is a file, not a directory: choose another data directory",
                               field="data_dir") from None
        except OSError as error:
            raise StorageError(f"cannot create the data directory {path.parent}: {error.strerror}",
                               field="data_dir") from None
        if path.exists() and not path.is_file():
            raise StorageError(f"{path} is not a file: move it away or choose another data directory", field="data_dir")
        read_only = _read_only(path)
        if read_only:  # nobody writes here, so SQLite may skip its lock files (which it could not create)
            options["creator"] = lambda: sqlite3.connect(f"file:{path}?mode=ro&immutable=1", uri=True,
                                                         check_same_thread=False)
        elif not os.access(path.parent, os.W_OK):
            raise StorageError(f"cannot write in the data directory {path.parent}: make it writable",
                               field="data_dir")
    try:
        engine = create_engine(url, pool_pre_ping=True, **options)
    except Exception as error:  # a malformed URL or a missing driver
        raise StorageError(f"DATABASE_URL cannot be used: {type(error).__name__}: {error}", field="DATABASE_URL") from None
    if engine.dialect.name == "sqlite":
        event.listen(engine, "connect", _busy_timeout if read_only else _sqlite_pragmas(synchronous))
    try:
        with _create_lock:
            _create_schema(engine)
    except SQLAlchemyError as error:
        engine.dispose()
        raise StorageError(f"cannot open the shortlist database {where}: {failure_text(error)}",
                           field="data_dir" if path else "DATABASE_URL") from None
    return engine


SCHEMA_LOCK_KEY = 0x656C_7363_6865_6D61  # "elschema": the PostgreSQL advisory lock taken while creating the schema
"""Instances started together on a new PostgreSQL database take turns creating the table and its trigger."""


def _create_schema(engine: Engine) -> None:
    """Create the table and trigger once, whatever else starts at the same moment.

    PostgreSQL: under a transaction-scoped advisory lock, so a second instance waits and then finds
    the table (without it, the loser of the race fails on a duplicate type name). SQLite: a second
    process that created the table between the check and the CREATE makes the first retry once."""
    if engine.dialect.name == "postgresql":
        with engine.begin() as connection:
            connection.execute(text("SELECT pg_advisory_xact_lock(:key)"), {"key": SCHEMA_LOCK_KEY})
            metadata.create_all(connection)
        return
    try:
        metadata.create_all(engine)
    except OperationalError:
        metadata.create_all(engine)


def new_id() -> str:
    """A fresh random shortlist id."""
    return secrets.token_urlsafe(ID_BYTES)


def _dumps(value) -> str:
    return json.dumps(value, ensure_ascii=False, allow_nan=False, separators=(",", ":"))


def save_shortlist(*, engine: Engine, title: str, scenario: dict, result: dict, notes: dict) -> StoredShortlist:
    """Store a new shortlist in one transaction and return it with its id.

    ``result`` is the record in the current layout (:data:`FORMAT`) and carries its ``catalog_version``."""
    if not title or len(title) > TITLE_MAX:
        raise ValueError(f"title must have 1 to {TITLE_MAX} characters")
    if any(len(note) > NOTE_MAX for note in notes.values()):
        raise ValueError(f"notes may have at most {NOTE_MAX} characters")
    if sum(len(note) for note in notes.values()) > NOTES_TOTAL_MAX:
        raise ValueError(f"notes may have at most {NOTES_TOTAL_MAX} characters together")
    created = datetime.now(timezone.utc).isoformat(timespec="seconds")
    row = {"title": title, "created_at": created, "catalog_version": result.get("catalog_version", ""),
           "format": FORMAT, "scenario": _dumps(scenario), "result": _dumps(result), "notes": _dumps(notes)}
    for _attempt in range(3):
        shortlist_id = new_id()
        try:
            with engine.begin() as connection:
                connection.execute(insert(shortlists).values(id=shortlist_id, **row))
        except IntegrityError:  # an id collision: 1 in 2^48 after 2^48 saves; draw again
            continue
        return StoredShortlist(id=shortlist_id, title=title, created_at=created,
                               catalog_version=row["catalog_version"], scenario=scenario, result=result, notes=notes)
    raise RuntimeError("could not draw an unused shortlist id")


def load_shortlist(*, engine: Engine, shortlist_id: str) -> StoredShortlist | None:
    """The shortlist with ``shortlist_id``, or None when there is none."""
    with engine.connect() as connection:
        row = connection.execute(select(shortlists).where(shortlists.c.id == shortlist_id)).mappings().first()
    if row is None:
        return None
    return StoredShortlist(id=row["id"], title=row["title"], created_at=row["created_at"],
                           catalog_version=row["catalog_version"], scenario=json.loads(row["scenario"]),
                           result=json.loads(row["result"]), notes=json.loads(row["notes"]), format=row["format"])


def check_storage(*, engine: Engine) -> str:
    """``"ok"`` when the database answers and can take saves, ``"read-only"`` when it can only be read;
    raises :class:`StorageError` (``field="full"``) when a SQLite file's disk is full, the driver's error
    when the database does not answer."""
    with engine.connect() as connection:
        connection.execute(text("SELECT 1"))
    path = _sqlite_path(engine.url.render_as_string()) if engine.dialect.name == "sqlite" else None
    if path is None:
        return "ok"
    if _read_only(path):
        return "read-only"
    if shutil.disk_usage(path.parent).free < FREE_BYTES_MIN:
        raise StorageError(f"the disk holding the database is full (less than {FREE_BYTES_MIN // 1024} KiB free)",
                           field="full")
    return "ok"


FAILURES = {
    "full": "the disk holding the database is full",
    "read-only": "the database is read-only",
    "unavailable": "the database does not answer",
    "damaged": "the database file is damaged or not a database",
}
"""What a storage failure means, in words for the person running the server (no driver detail)."""


def failure_kind(error: BaseException) -> str:
    """Which of :data:`FAILURES` a database error is (``"unavailable"`` when it is none of the others)."""
    original = getattr(error, "orig", None) or error
    state = str(getattr(original, "sqlstate", "") or "")
    number = getattr(original, "errno", None) or getattr(original, "sqlite_errorcode", None)
    words = str(original).lower()
    if state == "53100" or number == errno.ENOSPC or "disk is full" in words or "no space" in words:
        return "full"
    if state == "25006" or number == errno.EROFS or "readonly" in words or "read-only" in words:
        return "read-only"
    if "not a database" in words or "malformed" in words:
        return "damaged"
    return "unavailable"


def failure_text(error: BaseException) -> str:
    """A database error in plain words, with the driver's one-line reason for the server's operator."""
    reason = str(getattr(error, "orig", None) or error).strip().splitlines()[0] if str(error).strip() else ""
    return f"{FAILURES[failure_kind(error)]} ({reason})" if reason else FAILURES[failure_kind(error)]


def journal_mode(*, engine: Engine) -> str:
    """SQLite's journal mode (``"wal"`` when set up here); empty for other databases."""
    if engine.dialect.name != "sqlite":
        return ""
    with engine.connect() as connection:
        return str(connection.execute(text("PRAGMA journal_mode")).scalar()).lower()
