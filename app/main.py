"""The web app, assembled: routers, static files, plotly.js from the plotly package, middleware, error handlers.

``app`` is what uvicorn serves (``uvicorn app.main:app``); ``create_app`` builds
another one, e.g. with a test catalog. Nothing is loaded or opened at import
time: the catalog and the database are made on first use.
"""

from contextlib import asynccontextmanager

from fastapi import FastAPI
from fastapi.exceptions import RequestValidationError
from fastapi.responses import FileResponse, Response
from sqlalchemy.exc import SQLAlchemyError
from starlette.exceptions import HTTPException as StarletteHTTPException
from starlette.middleware.gzip import GZipMiddleware

from electrosieve.engine.catalog import Catalog

from .contract import tighten
from .overload import HeavyLimit, SaveRateLimit
from . import assets, urls
from .routes import api, compare, docs, health, materials, screen, shortlists
from .routes.common import AppState
from .routes.http import (BodyLimit, HeadAsGet, RelativeRedirects, RequestLog, SameOriginPosts, SecurityHeaders,
                          http_error, storage_error, storage_setup_error, unexpected_error, validation_error)
from .settings import Settings
from .storage import StorageError

def create_app(settings: Settings | None = None, catalog: Catalog | None = None) -> FastAPI:
    """A new app reading ``settings`` (from the environment by default) and serving ``catalog`` (built-in by default)."""
    settings = settings or Settings.from_env()
    state = AppState(settings, catalog)

    @asynccontextmanager
    async def lifespan(_app):
        assets.plotly_bytes()  # compressed once, before the first page asks for it
        yield
        state.close()

    app = FastAPI(title="electrosieve", version="0.1.0", lifespan=lifespan, docs_url=None, redoc_url=None,
                  description="Screen electrode materials by exact E-pH stability domains computed from cited "
                              "thermodynamic data. Every page has a JSON twin; the API mirrors the CLI's --json.")
    app.state.electrosieve = state
    for router in (screen.router, compare.router, materials.router, shortlists.router, api.router, health.router,
                   docs.router):
        app.include_router(router)
    app.mount("/static", assets.VersionedStatic(directory=assets.static_dir()), name="static")
    app.add_api_route(urls.plotly_js(), assets.plotly_js, include_in_schema=False, response_class=Response)

    plain_openapi = app.openapi

    def openapi() -> dict:
        """FastAPI's schema with the served catalog's ids as enums (``app.contract``); idempotent."""
        return tighten(plain_openapi(), state.catalog)

    app.openapi = openapi

    @app.get("/vendor/plotly.min.js", include_in_schema=False, response_class=Response)
    def plotly_js() -> FileResponse:  # the unversioned name, for pages saved before a version was in the path
        return FileResponse(assets.PLOTLY_JS, media_type="text/javascript",
                            headers={"Cache-Control": "public, max-age=86400"})

    app.add_exception_handler(RequestValidationError, validation_error)
    app.add_exception_handler(StarletteHTTPException, http_error)
    app.add_exception_handler(SQLAlchemyError, storage_error)
    app.add_exception_handler(StorageError, storage_setup_error)
    app.add_exception_handler(Exception, unexpected_error)
    app.add_middleware(GZipMiddleware, minimum_size=1000)  # HTML, JSON, CSV, JS, CSS; plotly.js comes compressed
    # innermost first: each refusal (413, 503 busy, 429, 403) is cheap and still gets the security headers
    app.add_middleware(BodyLimit, max_bytes=settings.max_body_bytes)
    app.add_middleware(HeavyLimit, limit=settings.heavy_requests, queue=settings.heavy_queue)
    app.add_middleware(SaveRateLimit, per_minute=settings.saves_per_minute)
    app.add_middleware(SameOriginPosts)
    app.add_middleware(RelativeRedirects)
    app.add_middleware(SecurityHeaders)
    app.add_middleware(HeadAsGet)
    app.add_middleware(RequestLog)  # outermost: times everything, refusals included
    return app


app = create_app()
