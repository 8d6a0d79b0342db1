"""The screen page: the scenario form and the ranked table, its JSON twin and its CSV."""

from fastapi import APIRouter, Depends, Request
from fastapi.responses import HTMLResponse, Response

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.ranking import RANK_KEYS

from .. import urls
from ..cautions import CAUTIONS
from ..models import Choice, ScreenLinks, ScreenPage
from ..viewstate import ViewQuery
from ..payloads import citation
from .common import (CSV_RESPONSES, ERROR_RESPONSES, HTML_RESPONSES, Unprocessable, csv_response, get_catalog, render,
                     screen_view, view_query)

router = APIRouter(tags=["pages"])


def form_choices(catalog: Catalog) -> dict:
    """The form's pickers: reference scales, families present in the catalog, materials, ranking keys."""
    families = sorted({m.family for m in catalog.materials.values()})
    return {
        "scales": [Choice(value=key, label=f"{key}: {row.name}") for key, row in catalog.scales.items()],
        "families": [Choice(value=f, label=f) for f in families],
        "materials": [Choice(value=m.id, label=f"{m.name} ({m.family})") for m in catalog.materials.values()],
        "ranking_keys": [Choice(value=k, label=text) for k, text in RANK_KEYS.items()],
    }


def result_citations(result: dict | None, catalog: Catalog) -> dict[str, str]:
    """Citations of the practical values a ranked table shows (prices, abundances) and of its reference scale."""
    if not result:
        return {}
    keys = []
    scale = catalog.scales.get(result["scenario"]["scale"])
    if scale is not None:
        keys.append(scale.source)
    for row in result["results"]:
        material = catalog.materials.get(row["material"])
        if material is not None:
            keys += [k for k in (material.price_source, material.abundance_source) if k]
    return {key: citation(catalog, key) for key in dict.fromkeys(keys) if key in catalog.sources}


def screen_page_data(view: ViewQuery, catalog: Catalog) -> ScreenPage:
    """The one data object behind the screen page and /screen.json."""
    result, errors = screen_view(view, catalog)
    links = ScreenLinks(page=urls.screen_page(view), json_twin=urls.screen_json(view), csv=urls.screen_csv(view),
                        compare=urls.compare_page(view, materials=[r["material"] for r in result["results"][:3]])
                        if result else urls.compare_page(view))
    return ScreenPage(query=view.form_values(), scenario=result["scenario"] if result else None, result=result,
                      errors=errors, links=links, citations=result_citations(result, catalog), cautions=list(CAUTIONS),
                      **form_choices(catalog))


@router.get("/", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="Screen page: scenario form and ranked table")
@router.get("/screen", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            include_in_schema=False)
def screen_html(request: Request, view: ViewQuery = Depends(view_query), catalog: Catalog = Depends(get_catalog)):
    page = screen_page_data(view, catalog)
    return render(request, "screen.html", {"page": page, "view": view}, json_twin=page.links.json_twin,
                  status_code=422 if page.errors else 200)


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
