"""Static files and plotly.js under versioned URLs, so browsers keep them for a year and never fetch them twice.

``/static/<path>?v=<version>``: the version is a digest of every file under ``static/``, so any edit makes new
URLs. ``/vendor/plotly-<plotly.js version>.min.js``: the plotly package's own file, compressed once and kept
in memory (gzip, 4.8 MB down to about 1.5 MB). Both answer with ``Cache-Control: public, max-age=31536000,
immutable`` (RFC 8246).
"""

import gzip
import hashlib
from functools import cache
from importlib import resources
from pathlib import Path
from urllib.parse import parse_qs

import plotly
from plotly.offline import get_plotlyjs_version
from starlette.requests import Request
from starlette.responses import Response
from starlette.staticfiles import StaticFiles

PLOTLY_JS = Path(plotly.__file__).resolve().parent / "package_data" / "plotly.min.js"
"""The plotly wheel's own plotly.min.js; nothing else of the package is served."""
PLOTLY_VERSION = get_plotlyjs_version()
LONG_CACHE = "public, max-age=31536000, immutable"
"""Cache-Control of a versioned URL: its content never changes."""


def static_dir() -> Path:
    """The ``static/`` directory (installed as the package ``electrosieve.static``)."""
    return Path(str(resources.files("electrosieve.static")))


@cache
def static_version() -> str:
    """A short digest (SHA-256) of every file under ``static/``: their names and contents."""
    digest = hashlib.sha256()
    root = static_dir()
    for path in sorted(p for p in root.rglob("*") if p.is_file() and "__pycache__" not in p.parts):
        digest.update(str(path.relative_to(root)).encode() + b"\0" + path.read_bytes())
    return digest.hexdigest()[:12]


@cache
def plotly_bytes() -> tuple[bytes, bytes]:
    """plotly.min.js as (plain, gzip-compressed) bytes, read and compressed once."""
    plain = PLOTLY_JS.read_bytes()
    return plain, gzip.compress(plain, compresslevel=9, mtime=0)


def plotly_js(request: Request) -> Response:
    """plotly.js, gzip-compressed when the client accepts it, cached for a year."""
    plain, packed = plotly_bytes()
    headers = {"Cache-Control": LONG_CACHE, "Vary": "Accept-Encoding"}
    if "gzip" in request.headers.get("accept-encoding", ""):
        return Response(packed, media_type="text/javascript", headers={**headers, "Content-Encoding": "gzip"})
    return Response(plain, media_type="text/javascript", headers=headers)


class VersionedStatic(StaticFiles):
    """Static files; asked for under the current version (``?v=``) they may be kept for a year."""

    async def get_response(self, path: str, scope) -> Response:
        response = await super().get_response(path, scope)
        asked = parse_qs(scope.get("query_string", b"").decode("latin-1")).get("v", [""])[0]
        if response.status_code == 200:
            response.headers["Cache-Control"] = LONG_CACHE if asked == static_version() else "no-cache"
        return response
