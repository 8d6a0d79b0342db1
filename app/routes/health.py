"""Liveness and readiness: the catalog is loaded and the shortlist database answers."""

from fastapi import APIRouter, Depends
from fastapi.responses import JSONResponse

from electrosieve.engine.catalog import Catalog

from ..models import ErrorBody, Health
from ..storage import check_storage
from .common import get_catalog, get_storage

router = APIRouter(tags=["health"])


@router.get("/healthz", response_model=Health, responses={503: {"model": ErrorBody, "description": "storage unreachable"}},
            summary="Health check")
def healthz(catalog: Catalog = Depends(get_catalog), storage=Depends(get_storage)):
    try:
        status = check_storage(engine=storage)
    except Exception as error:  # report, do not crash: a load balancer polls this
        return JSONResponse({"detail": f"storage: {type(error).__name__}: {error}"}, status_code=503)
    return Health(status="ok", catalog_version=catalog.version, materials=len(catalog.materials),
                  elements=len(catalog.systems), storage=status)
