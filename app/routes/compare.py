"""The compare page: one to six candidates' diagrams and figures side by side under one operating window."""

from fastapi import APIRouter, Depends, Query, Request
from fastapi.responses import HTMLResponse

from electrosieve.engine.catalog import Catalog

from ..comparison import compare_page_data
from ..errors import Unprocessable
from ..models import ComparePage
from ..viewstate import ViewQuery
from .common import ERROR_RESPONSES, HTML_RESPONSES, get_catalog, render, view_query

router = APIRouter(tags=["pages"])

def compare_view(view: ViewQuery = Depends(view_query),
                 compare: list[str] = Query([], description="material ids to compare (1 to 6; repeat)"),
                 axis: str | None = Query(None, max_length=40, description="reference scale of the plots' potential axis")
                 ) -> ViewQuery:
    """Dependency: the view plus the compared materials and the axis scale."""
    return view


@router.get("/compare", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="Compare page: 1 to 6 candidates' diagrams and figures side by side")
def compare_html(request: Request, view: ViewQuery = Depends(compare_view), catalog: Catalog = Depends(get_catalog)):
    page = compare_page_data(view, catalog)
    return render(request, "compare.html", {"page": page, "view": view}, json_twin=page.links["json_twin"],
                  status_code=422 if page.errors else 200)


@router.get("/compare.json", response_model=ComparePage, responses=ERROR_RESPONSES,
            summary="Compare page data (JSON twin of /compare)")
def compare_json(view: ViewQuery = Depends(compare_view), catalog: Catalog = Depends(get_catalog)) -> ComparePage:
    page = compare_page_data(view, catalog)
    if page.errors:
        raise Unprocessable(page.errors)
    return page
