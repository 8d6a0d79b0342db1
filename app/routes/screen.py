"""The screen page: the scenario form and the ranked table, its JSON twin and its CSV."""

from fastapi import APIRouter, Depends, Request
from fastapi.responses import HTMLResponse, Response

from electrosieve.engine.catalog import Catalog

from ..errors import Unprocessable
from ..models import ScreenPage
from ..pages import screen_page_data, screen_view
from ..viewstate import ViewQuery
from .common import CSV_RESPONSES, ERROR_RESPONSES, HTML_RESPONSES, csv_response, get_catalog, render, view_query

router = APIRouter(tags=["pages"])


@router.get("/", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="Screen page: scenario form and ranked table")
@router.get("/screen", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            include_in_schema=False)
def screen_html(request: Request, view: ViewQuery = Depends(view_query), catalog: Catalog = Depends(get_catalog)):
    page = screen_page_data(view, catalog)
    return render(request, "screen.html", {"page": page, "view": view}, json_twin=page.links.json_twin,
                  status_code=422 if page.errors else 200)


@router.get("/screen/ranking", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="The screen page's ranked rows, rule, notes and errors as an HTML fragment (what its script swaps in)")
def screen_ranking(request: Request, view: ViewQuery = Depends(view_query), catalog: Catalog = Depends(get_catalog)):
    page = screen_page_data(view, catalog)
    return render(request, "screen_ranking.html", {"page": page}, status_code=422 if page.errors else 200)


@router.get("/screen.json", response_model=ScreenPage, responses=ERROR_RESPONSES,
            summary="Screen page data (JSON twin of /)")
def screen_json(view: ViewQuery = Depends(view_query), catalog: Catalog = Depends(get_catalog)) -> ScreenPage:
    page = screen_page_data(view, catalog)
    if page.errors:
        raise Unprocessable(page.errors)
    return page


@router.get("/screen.csv", response_class=Response, response_model=None, responses=CSV_RESPONSES,
            summary="The ranked table as CSV")
def screen_csv(view: ViewQuery = Depends(view_query), catalog: Catalog = Depends(get_catalog)) -> Response:
    result, errors = screen_view(view, catalog)
    if errors:
        raise Unprocessable(errors)
    return csv_response(result, "electrosieve-screen.csv")
