"""The web app's settings, read once from the environment.

| variable | meaning | default |
|---|---|---|
| ``ELECTROSIEVE_DATA_DIR`` | directory holding the shortlist database (SQLite) | ``./var`` |
| ``DATABASE_URL`` | SQLAlchemy URL, e.g. ``postgresql+psycopg://user@host/db`` for several instances | SQLite file in the data dir |
| ``ELECTROSIEVE_CATALOG_DIR`` | a whole catalog directory (same layout as ``data/``) used instead of the built-in one | built-in |
| ``ELECTROSIEVE_MAX_BODY_BYTES`` | largest request body accepted; bigger ones get 413 | 65536 |
| ``ELECTROSIEVE_SAVES_PER_MINUTE`` | shortlist saves per client and worker process per minute (0: no limit); more get 429 | 30 |
| ``ELECTROSIEVE_HEAVY_REQUESTS`` | computing requests (screens, diagrams, pages) running at once per worker process | 2 |
| ``ELECTROSIEVE_HEAVY_QUEUE`` | computing requests waiting their turn per worker process; more get 503 | 32 |
| ``ELECTROSIEVE_TRUSTED_PROXIES`` | comma-separated addresses whose ``X-Forwarded-For``/``-Proto`` are believed | none |
| ``ELECTROSIEVE_SQLITE_SYNCHRONOUS`` | ``NORMAL`` (survives the process dying) or ``FULL`` (also survives power loss) | ``NORMAL`` |

A small dataclass rather than pydantic-settings, which is not a dependency.
"""

import os
from dataclasses import dataclass
from pathlib import Path

from electrosieve.engine.errors import ElectrosieveError

DEFAULT_DATA_DIR = "var"
DEFAULT_MAX_BODY_BYTES = 64 * 1024
DEFAULT_SAVES_PER_MINUTE = 30
DEFAULT_HEAVY_REQUESTS = 2
DEFAULT_HEAVY_QUEUE = 32
SQLITE_FILE = "electrosieve.sqlite3"
SQLITE_SYNCHRONOUS = ("NORMAL", "FULL")


class SettingsError(ElectrosieveError):
    """An environment variable the app cannot use; names the variable."""


def _whole_number(env, name: str, default: int, low: int, high: int, unit: str) -> int:
    text = env.get(name, "").strip()
    if not text:
        return default
    try:
        value = int(text)
    except ValueError:
        raise SettingsError(f"{name} must be a whole number of {unit} (given {text!r})", field=name) from None
    if not low <= value <= high:
        raise SettingsError(f"{name} must be between {low} and {high} (given {value})", field=name)
    return value


@dataclass(frozen=True)
class Settings:
    """Where shortlists live, which catalog to use, how large a request may be, and how much load is taken."""

    data_dir: Path = Path(DEFAULT_DATA_DIR)
    database_url: str | None = None
    catalog_dir: Path | None = None
    max_body_bytes: int = DEFAULT_MAX_BODY_BYTES
    saves_per_minute: int = DEFAULT_SAVES_PER_MINUTE
    heavy_requests: int = DEFAULT_HEAVY_REQUESTS
    heavy_queue: int = DEFAULT_HEAVY_QUEUE
    trusted_proxies: tuple[str, ...] = ()
    sqlite_synchronous: str = "NORMAL"

    @classmethod
    def from_env(cls, environ=None) -> "Settings":
        """Settings from ``environ`` (``os.environ`` by default); unset or empty variables take the defaults."""
        env = os.environ if environ is None else environ
        catalog = env.get("ELECTROSIEVE_CATALOG_DIR", "").strip()
        synchronous = env.get("ELECTROSIEVE_SQLITE_SYNCHRONOUS", "").strip().upper() or "NORMAL"
        if synchronous not in SQLITE_SYNCHRONOUS:
            raise SettingsError(f"ELECTROSIEVE_SQLITE_SYNCHRONOUS must be one of {', '.join(SQLITE_SYNCHRONOUS)} "
                                f"(given {env['ELECTROSIEVE_SQLITE_SYNCHRONOUS']!r})", field="ELECTROSIEVE_SQLITE_SYNCHRONOUS")
        proxies = tuple(part.strip() for part in env.get("ELECTROSIEVE_TRUSTED_PROXIES", "").split(",") if part.strip())
        return cls(
            data_dir=Path(env.get("ELECTROSIEVE_DATA_DIR", "").strip() or DEFAULT_DATA_DIR),
            database_url=env.get("DATABASE_URL", "").strip() or None,
            catalog_dir=Path(catalog) if catalog else None,
            max_body_bytes=_whole_number(env, "ELECTROSIEVE_MAX_BODY_BYTES", DEFAULT_MAX_BODY_BYTES, 1024, 2**31,
                                         "bytes"),
            saves_per_minute=_whole_number(env, "ELECTROSIEVE_SAVES_PER_MINUTE", DEFAULT_SAVES_PER_MINUTE, 0, 100_000,
                                           "saves"),
            heavy_requests=_whole_number(env, "ELECTROSIEVE_HEAVY_REQUESTS", DEFAULT_HEAVY_REQUESTS, 1, 1000,
                                         "requests"),
            heavy_queue=_whole_number(env, "ELECTROSIEVE_HEAVY_QUEUE", DEFAULT_HEAVY_QUEUE, 0, 100_000, "requests"),
            trusted_proxies=proxies,
            sqlite_synchronous=synchronous,
        )

    @property
    def storage_url(self) -> str:
        """The SQLAlchemy URL shortlists are stored at."""
        if self.database_url:
            return self.database_url
        return f"sqlite:///{(self.data_dir / SQLITE_FILE).resolve()}"
