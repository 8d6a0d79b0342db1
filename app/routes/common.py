"""What every router shares: the catalog and storage of the running app, templates, errors, CSV.

Routers parse (``app.viewstate``), call the page builders (``app.pages``, ``app.comparison``,
``app.shortlists``) and render; none of them computes any science itself, and none imports another.
"""

import io
import threading
from pathlib import Path

from fastapi import Query, Request
from fastapi.responses import HTMLResponse, Response
from jinja2 import Environment, FileSystemLoader, select_autoescape
from starlette.templating import Jinja2Templates

from electrosieve.engine.catalog import Catalog, default_catalog, load_catalog

from .. import urls
from ..cautions import CAUTIONS
from ..csvcells import write_csv
from ..filenames import human_date
from ..models import ErrorBody
from ..payloads import CSV_COLUMNS, csv_rows
from ..settings import Settings
from ..storage import open_storage
from ..viewstate import ViewQuery

TEMPLATES_DIR = Path(__file__).resolve().parent.parent / "templates"

ERROR_RESPONSES = {
    404: {"model": ErrorBody, "description": "no such item"},
    413: {"model": ErrorBody, "description": "request body too large"},
    422: {"model": ErrorBody, "description": "bad input; each entry names its field"},
}
"""The 4xx responses declared on JSON routes (so the OpenAPI schema says what really comes back)."""

BODY_RESPONSES = {**ERROR_RESPONSES, 400: {"model": ErrorBody, "description": "the body could not be read (not UTF-8)"}}
"""The 4xx responses of routes that read a request body."""

_HTML_OR_JSON = {"text/html": {"schema": {"type": "string"}},
                 "application/json": {"schema": {"$ref": "#/components/schemas/ErrorBody"}}}
HTML_RESPONSES = {
    404: {"description": "no such page (HTML for browsers, the JSON error body otherwise)", "content": _HTML_OR_JSON},
    422: {"description": "the page showing which query parameter is wrong (HTML for browsers, the JSON error body "
                         "otherwise)", "content": _HTML_OR_JSON},
}
"""The 4xx responses of pages: HTML when the client accepts text/html, else the JSON error body."""
CSV_RESPONSES = {200: {"content": {"text/csv": {}}, "description": "CSV, one row per ranked candidate"},
                 404: ERROR_RESPONSES[404], 422: ERROR_RESPONSES[422]}


class AppState:
    """The running app's settings, catalog and storage engine, each made on first use (imports stay cheap)."""

    def __init__(self, settings: Settings, catalog: Catalog | None = None):
        self.settings = settings
        self._catalog = catalog
        self._storage = None
        self._lock = threading.Lock()

    @property
    def catalog(self) -> Catalog:
        if self._catalog is None:
            with self._lock:
                if self._catalog is None:
                    directory = self.settings.catalog_dir
                    self._catalog = load_catalog(data_dir=directory) if directory else default_catalog()
        return self._catalog

    @property
    def storage(self):
        if self._storage is None:
            with self._lock:
                if self._storage is None:
                    self._storage = open_storage(url=self.settings.storage_url,
                                                 synchronous=self.settings.sqlite_synchronous)
        return self._storage

    def close(self) -> None:
        if self._storage is not None:
            self._storage.dispose()
            self._storage = None


def state(request: Request) -> AppState:
    return request.app.state.electrosieve


def get_catalog(request: Request) -> Catalog:
    """Dependency: the catalog the app serves."""
    return state(request).catalog


def get_storage(request: Request):
    """Dependency: the SQLAlchemy engine shortlists live in."""
    return state(request).storage


def _environment() -> Environment:
    env = Environment(loader=FileSystemLoader(str(TEMPLATES_DIR)), autoescape=select_autoescape(default=True),
                      trim_blocks=True, lstrip_blocks=True)
    env.globals["urls"] = urls
    env.filters["fmt"] = number_text
    env.filters["human_date"] = human_date
    env.filters["percent"] = lambda value: number_text(None if value is None else 100 * value, ".0f")
    return env


def number_text(value, spec: str = "g", missing: str = "–") -> str:
    """``format(value, spec)`` for templates; ``missing`` for None."""
    if value is None:
        return missing
    return format(value, spec)


templates = Jinja2Templates(env=_environment())


def render(request: Request, template: str, context: dict, *, status_code: int = 200,
           json_twin: str | None = None) -> HTMLResponse:
    """A page from ``template``; ``json_twin`` is linked as <link rel="alternate" type="application/json">."""
    catalog = state(request).catalog
    return templates.TemplateResponse(request, template, {
        **context, "json_twin": json_twin, "catalog_version": catalog.version, "cautions": list(CAUTIONS),
    }, status_code=status_code)


def csv_response(result: dict, filename: str, notes: dict | None = None, preamble: list[str] = ()) -> Response:
    """The ranked rows as CSV (``app.payloads.csv_rows``), with a ``note`` column when notes are given and the
    ``preamble`` lines (``app.csvheader``) above the header."""
    stream = io.StringIO()
    stream.writelines(f"{line}\n" for line in preamble)
    columns = list(CSV_COLUMNS) + (["note"] if notes is not None else [])
    rows = csv_rows(result)
    for row in rows if notes is not None else ():
        row["note"] = notes.get(row["material"], "")
    write_csv(stream, columns, rows)
    return Response(stream.getvalue(), media_type="text/csv; charset=utf-8",
                    headers={"Content-Disposition": f'attachment; filename="{filename}"'})


# --- the view state as documented query parameters --------------------------------------

def view_query(
    request: Request,
    ph_low: str | None = Query(None, max_length=40, description="pH, or the low end of a pH range"),
    ph_high: str | None = Query(None, max_length=40, description="high end of the pH range (empty: a point)"),
    potential_low: str | None = Query(None, max_length=40, description="potential [V on `scale`], or the low end"),
    potential_high: str | None = Query(None, max_length=40, description="high end of the potential range (empty: a point)"),
    scale: str | None = Query(None, max_length=40, description="reference scale of the potential"),
    temperature: str | None = Query(None, max_length=40, description="temperature [°C]"),
    activity: str | None = Query(None, max_length=40, description="activity of dissolved species"),
    role: str | None = Query(None, max_length=40, description="anode or cathode"),
    accept: list[str] = Query([], description="acceptable regions (repeat)"),
    pick: str | None = Query(None, max_length=40, description="all, family or names"),
    family: str | None = Query(None, max_length=40, description="a material family"),
    materials: list[str] = Query([], description="material ids (repeat)"),
    rank_by: str | None = Query(None, max_length=200, description="ranking keys, comma-separated"),
    weights: str | None = Query(None, max_length=200, description="key:weight pairs, comma-separated"),
) -> ViewQuery:
    """Dependency: the page's view state (declared here so the OpenAPI schema lists every parameter)."""
    return ViewQuery.from_params(request.query_params)
