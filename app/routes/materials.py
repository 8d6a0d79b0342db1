"""The materials list and one material's page: its diagram, boundary equations, species data with citations."""

from fastapi import APIRouter, Depends, Query, Request
from fastapi.responses import HTMLResponse

from electrosieve.engine.catalog import Catalog

from ..models import MaterialPage, MaterialsPage
from ..pages import material_page_data, materials_page_data
from .common import ERROR_RESPONSES, HTML_RESPONSES, get_catalog, render

router = APIRouter(tags=["pages"])


@router.get("/materials", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="Materials page: every candidate with price, abundance and hazards")
def materials_html(request: Request, catalog: Catalog = Depends(get_catalog)):
    page = materials_page_data(catalog)
    return render(request, "materials.html", {"page": page}, json_twin=page.links["json_twin"])


@router.get("/materials.json", response_model=MaterialsPage, responses=ERROR_RESPONSES,
            summary="Materials page data (JSON twin of /materials)")
def materials_json(catalog: Catalog = Depends(get_catalog)) -> MaterialsPage:
    return materials_page_data(catalog)


MATERIAL_QUERY = {
    "activity": Query(None, max_length=40, description="activity of dissolved species (default 1e-6)"),
    "temperature": Query(None, max_length=40, description="temperature [°C] (default 25)"),
    "axis": Query(None, max_length=40, description="reference scale of the potential axis (default SHE)"),
    "ph_low": Query(None, max_length=40, description="a screen's operating window to draw: pH, or its low end"),
    "ph_high": Query(None, max_length=40, description="high end of the window's pH range (empty: a point)"),
    "potential_low": Query(None, max_length=40, description="the window's potential [V on `scale`], or its low end"),
    "potential_high": Query(None, max_length=40, description="high end of the window's potential range"),
    "scale": Query(None, max_length=40, description="reference scale of the window's potential (default SHE)"),
}
WINDOW = ("ph_low", "ph_high", "potential_low", "potential_high", "scale")


@router.get("/materials/{material_id}.json", response_model=MaterialPage, responses=ERROR_RESPONSES,
            summary="One material's page data (JSON twin of /materials/{id})")
def material_json(material_id: str, catalog: Catalog = Depends(get_catalog),
                  activity: str | None = MATERIAL_QUERY["activity"], temperature: str | None = MATERIAL_QUERY["temperature"],
                  axis: str | None = MATERIAL_QUERY["axis"], ph_low: str | None = MATERIAL_QUERY["ph_low"],
                  ph_high: str | None = MATERIAL_QUERY["ph_high"], potential_low: str | None = MATERIAL_QUERY["potential_low"],
                  potential_high: str | None = MATERIAL_QUERY["potential_high"],
                  scale: str | None = MATERIAL_QUERY["scale"]) -> MaterialPage:
    window = dict(zip(WINDOW, (ph_low, ph_high, potential_low, potential_high, scale)))
    return material_page_data(material_id, catalog, activity, temperature, axis, window)


@router.get("/materials/{material_id}", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="One material: diagram, boundary equations, species data with citations, hazards")
def material_html(request: Request, material_id: str, catalog: Catalog = Depends(get_catalog),
                  activity: str | None = MATERIAL_QUERY["activity"], temperature: str | None = MATERIAL_QUERY["temperature"],
                  axis: str | None = MATERIAL_QUERY["axis"], ph_low: str | None = MATERIAL_QUERY["ph_low"],
                  ph_high: str | None = MATERIAL_QUERY["ph_high"], potential_low: str | None = MATERIAL_QUERY["potential_low"],
                  potential_high: str | None = MATERIAL_QUERY["potential_high"], scale: str | None = MATERIAL_QUERY["scale"]):
    window = dict(zip(WINDOW, (ph_low, ph_high, potential_low, potential_high, scale)))
    page = material_page_data(material_id, catalog, activity, temperature, axis, window)
    return render(request, "material.html", {"page": page}, json_twin=page.links["json_twin"])
