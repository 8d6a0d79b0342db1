"""The web app's settings, read once from the environment.

| variable | meaning | default |
|---|---|---|
| ``ELECTROSIEVE_DATA_DIR`` | directory holding the shortlist database (SQLite) | ``./var`` |
| ``DATABASE_URL`` | SQLAlchemy URL, e.g. ``postgresql+psycopg://user@host/db`` for several instances | SQLite file in the data dir |
| ``ELECTROSIEVE_CATALOG_DIR`` | a whole catalog directory (same layout as ``data/``) used instead of the built-in one | built-in |
| ``ELECTROSIEVE_MAX_BODY_BYTES`` | largest request body accepted; bigger ones get 413 | 65536 |

A small dataclass rather than pydantic-settings, which is not a dependency.
"""

import os
from dataclasses import dataclass
from pathlib import Path

from electrosieve.engine.errors import ElectrosieveError

DEFAULT_DATA_DIR = "var"
DEFAULT_MAX_BODY_BYTES = 64 * 1024
SQLITE_FILE = "electrosieve.sqlite3"


class SettingsError(ElectrosieveError):
    """An environment variable the app cannot use; names the variable."""


@dataclass(frozen=True)
class Settings:
    """Where shortlists live, which catalog to use, and how large a request may be."""

    data_dir: Path = Path(DEFAULT_DATA_DIR)
    database_url: str | None = None
    catalog_dir: Path | None = None
    max_body_bytes: int = DEFAULT_MAX_BODY_BYTES

    @classmethod
    def from_env(cls, environ=None) -> "Settings":
        """Settings from ``environ`` (``os.environ`` by default); unset or empty variables take the defaults."""
        env = os.environ if environ is None else environ
        cap_text = env.get("ELECTROSIEVE_MAX_BODY_BYTES", "").strip()
        try:
            cap = int(cap_text) if cap_text else DEFAULT_MAX_BODY_BYTES
        except ValueError:
            raise SettingsError(f"ELECTROSIEVE_MAX_BODY_BYTES must be a whole number of bytes (given {cap_text!r})",
                                field="ELECTROSIEVE_MAX_BODY_BYTES") from None
        if cap < 1024:
            raise SettingsError(f"ELECTROSIEVE_MAX_BODY_BYTES must be at least 1024 (given {cap})",
                                field="ELECTROSIEVE_MAX_BODY_BYTES")
        catalog = env.get("ELECTROSIEVE_CATALOG_DIR", "").strip()
        return cls(
            data_dir=Path(env.get("ELECTROSIEVE_DATA_DIR", "").strip() or DEFAULT_DATA_DIR),
            database_url=env.get("DATABASE_URL", "").strip() or None,
            catalog_dir=Path(catalog) if catalog else None,
            max_body_bytes=cap,
        )

    @property
    def storage_url(self) -> str:
        """The SQLAlchemy URL shortlists are stored at."""
        if self.database_url:
            return self.database_url
        return f"sqlite:///{(self.data_dir / SQLITE_FILE).resolve()}"
