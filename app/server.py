"""Run the web app with uvicorn (``electrosieve serve``, ``make serve``)."""

import errno
import os
import socket
import sys

from electrosieve.engine.errors import InputError

from .settings import Settings
from .storage import open_storage


def check_port_free(host: str, port: int) -> None:
    """Raise an :class:`InputError` naming ``--port`` when ``host:port`` cannot be listened on."""
    family = socket.AF_INET6 if ":" in host else socket.AF_INET
    with socket.socket(family, socket.SOCK_STREAM) as probe:
        probe.setsockopt(socket.SOL_SOCKET, socket.SO_REUSEADDR, 1)  # as uvicorn binds
        try:
            probe.bind((host, port))
        except OSError as error:
            if error.errno == errno.EADDRINUSE:
                raise InputError(f"--port {port} is in use on {host}: stop what is listening there or choose "
                                 "another port", field="--port") from None
            raise InputError(f"cannot listen on {host}:{port}: {error.strerror}", field="--host") from None


def serve(host: str = "127.0.0.1", port: int = 8000, workers: int = 1, data_dir: str | None = None) -> None:
    """Serve the app on http://host:port with ``workers`` processes, shortlists kept in ``data_dir``.

    ``data_dir`` overrides ``ELECTROSIEVE_DATA_DIR``; the workers read it from the environment. The
    port is checked and the database opened (created if new) before the start-up line and before the
    workers start, so set-up problems are one line and a non-zero exit, never a half-started server.
    ``X-Forwarded-For``/``-Proto`` are believed only from ``ELECTROSIEVE_TRUSTED_PROXIES``.
    """
    import uvicorn

    if not 1 <= port <= 65535:
        raise InputError(f"--port must be between 1 and 65535 (given {port})", field="--port")
    if workers < 1:
        raise InputError(f"--workers must be at least 1 (given {workers})", field="--workers")
    if data_dir:
        os.environ["ELECTROSIEVE_DATA_DIR"] = str(data_dir)
    settings = Settings.from_env()
    check_port_free(host, port)
    open_storage(url=settings.storage_url, synchronous=settings.sqlite_synchronous).dispose()
    shown_host = f"[{host}]" if ":" in host else host
    where = settings.database_url and "DATABASE_URL" or str(settings.data_dir.resolve())
    print(f"electrosieve: serving on http://{shown_host}:{port}/ (shortlists in {where}; "
          f"{workers} worker{'s' if workers != 1 else ''}). Press Ctrl+C to stop.", file=sys.stderr, flush=True)
    proxies = ",".join(settings.trusted_proxies)
    uvicorn.run("electrosieve.app.main:app", host=host, port=port, workers=workers, log_level="warning",
                proxy_headers=bool(proxies), forwarded_allow_ips=proxies or None, server_header=False)
