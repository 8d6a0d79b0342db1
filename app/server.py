"""Run the web app with uvicorn (``electrosieve serve``, ``make serve``)."""

import os
import sys

from electrosieve.engine.errors import InputError

from .settings import Settings
from .storage import open_storage


def serve(host: str = "127.0.0.1", port: int = 8000, workers: int = 1, data_dir: str | None = None) -> None:
    """Serve the app on http://host:port with ``workers`` processes, shortlists kept in ``data_dir``.

    ``data_dir`` overrides ``ELECTROSIEVE_DATA_DIR``; the workers read it from the environment. The
    database is created before the workers start, so they never race to create it.
    """
    import uvicorn

    if not 1 <= port <= 65535:
        raise InputError(f"--port must be between 1 and 65535 (given {port})", field="--port")
    if workers < 1:
        raise InputError(f"--workers must be at least 1 (given {workers})", field="--workers")
    if data_dir:
        os.environ["ELECTROSIEVE_DATA_DIR"] = str(data_dir)
    settings = Settings.from_env()
    open_storage(url=settings.storage_url).dispose()
    shown_host = f"[{host}]" if ":" in host else host
    where = settings.database_url and "DATABASE_URL" or str(settings.data_dir.resolve())
    print(f"electrosieve: serving on http://{shown_host}:{port}/ (shortlists in {where}; "
          f"{workers} worker{'s' if workers != 1 else ''}). Press Ctrl+C to stop.", file=sys.stderr, flush=True)
    uvicorn.run("electrosieve.app.main:app", host=host, port=port, workers=workers, log_level="warning",
                proxy_headers=True, server_header=False)
