"""Liveness and readiness: the catalog is loaded and the shortlist database answers and can take saves.

Answered on the event loop, its one blocking step (asking the database) in a thread pool of its own,
so a probe never waits behind screens and pages computing in the shared pool (``app.overload``).
"""

import logging

import anyio
from fastapi import APIRouter, Request
from fastapi.responses import JSONResponse

from ..models import ErrorBody, Health
from ..storage import FAILURES, StorageError, check_storage, failure_kind
from .common import state
from .http import STORAGE_LOGGER

router = APIRouter(tags=["health"])

PROBE_THREADS = anyio.CapacityLimiter(2)
"""Threads only /healthz uses (per worker process)."""


def _probe(app_state) -> tuple[object, str]:
    catalog = app_state.catalog
    return catalog, check_storage(engine=app_state.storage)


@router.get("/healthz", response_model=Health, summary="Health check",
            responses={503: {"model": ErrorBody, "description": "storage unreachable, damaged or full"}})
async def healthz(request: Request):
    try:
        catalog, storage = await anyio.to_thread.run_sync(_probe, state(request), limiter=PROBE_THREADS)
    except StorageError as error:  # a full disk (our words), or set-up trouble naming paths and hosts: logged only
        logging.getLogger(STORAGE_LOGGER).warning("healthz: %s", error.message)
        shown = error.message if error.field == "full" else "the shortlist database cannot be opened; see the log"
        return JSONResponse({"detail": f"storage: {shown}"}, status_code=503)
    except Exception as error:  # report, do not crash: a load balancer polls this; driver details go to the log
        logging.getLogger(STORAGE_LOGGER).warning("healthz: %s: %s", type(error).__name__, error)
        return JSONResponse({"detail": f"storage: {FAILURES[failure_kind(error)]}"}, status_code=503)
    return Health(status="ok", catalog_version=catalog.version, materials=len(catalog.materials),
                  elements=len(catalog.systems), storage=storage)
