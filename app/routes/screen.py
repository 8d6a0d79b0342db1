"""The screen page: the scenario form and the ranked table, its JSON twin, its CSV and its picture."""

from datetime import datetime, timezone

from fastapi import APIRouter, Depends, Query, Request
from fastapi.responses import HTMLResponse, Response

from electrosieve.engine.catalog import Catalog

from ..errors import Unprocessable
from ..models import ScreenPage
from ..pages import screen_page_data, screen_view
from ..csvheader import scenario_text
from ..filenames import download_name
from ..picture import picture_data
from ..selection import selected_diagram
from ..viewstate import ViewQuery
from .common import (CSV_RESPONSES, ERROR_RESPONSES, HTML_RESPONSES, csv_response, get_catalog, render, templates,
                     view_query)

router = APIRouter(tags=["pages"])


@router.get("/", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="Screen page: scenario form and ranked table")
@router.get("/screen", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            include_in_schema=False)
def screen_html(request: Request, view: ViewQuery = Depends(view_query), catalog: Catalog = Depends(get_catalog)):
    page = screen_page_data(view, catalog)
    selected, _ = selected_diagram(view, page.result.model_dump() if page.result else None, catalog)
    return render(request, "screen.html", {"page": page, "view": view, "selected": selected},
                  json_twin=page.links.json_twin, status_code=422 if page.errors else 200)


@router.get("/screen/ranking", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="The screen page's ranked rows, rule, notes and errors as an HTML fragment (what its script swaps in)")
def screen_ranking(request: Request, view: ViewQuery = Depends(view_query), catalog: Catalog = Depends(get_catalog)):
    page = screen_page_data(view, catalog)
    return render(request, "screen_ranking.html", {"page": page}, status_code=422 if page.errors else 200)


@router.get("/screen/diagram", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="The screen page's selected candidate: its diagram under the operating window, as an HTML fragment")
def screen_diagram(request: Request, view: ViewQuery = Depends(view_query), catalog: Catalog = Depends(get_catalog),
                   material: str | None = Query(None, max_length=60, description="a ranked material id (default: the first)")):
    result, errors = screen_view(view, catalog)
    selected, pick_errors = selected_diagram(view, result, catalog, material) if not errors else (None, [])
    errors = errors + pick_errors
    return render(request, "screen_diagram.html", {"selected": selected, "errors": errors},
                  status_code=422 if errors else 200)


@router.get("/screen/picture.svg", response_class=Response, response_model=None,
            responses={200: {"content": {"image/svg+xml": {}}, "description": "the picture"}, **ERROR_RESPONSES},
            summary="The ranking as a picture (SVG): one strip per candidate, the operating window's fate")
def screen_picture(request: Request, view: ViewQuery = Depends(view_query),
                   catalog: Catalog = Depends(get_catalog)) -> Response:
    result, errors = screen_view(view, catalog)
    if errors:
        raise Unprocessable(errors)
    words = scenario_text(result["scenario"])
    picture = picture_data(result, words[:1].upper() + words[1:])
    body = templates.get_template("ranking_picture.svg").render(p=picture)
    name = download_name("electrosieve-ranking", result["scenario"]["role"],
                         datetime.now(timezone.utc).isoformat(timespec="seconds"), "svg")
    return Response(body, media_type="image/svg+xml",
                    headers={"Content-Disposition": f'inline; filename="{name}"', "Cache-Control": "no-store"})


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
