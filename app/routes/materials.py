"""The materials list and one material's page: its diagram, boundary equations, species data with citations."""

import math

from fastapi import APIRouter, Depends, Query, Request
from fastapi.responses import HTMLResponse

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.diagram import diagram
from electrosieve.engine.limits import DEFAULT_ACTIVITY
from electrosieve.engine.errors import ElectrosieveError
from electrosieve.engine.scales import canonical_scale

from .. import urls
from ..cautions import CAUTIONS
from ..figures import figure_dict
from ..models import FieldError, MaterialPage, MaterialsPage
from ..payloads import diagram_payload, materials_payload, sources_payload
from .common import ERROR_RESPONSES, HTML_RESPONSES, Unprocessable, engine_error, get_catalog, not_found, render
from .screen import form_choices

router = APIRouter(tags=["pages"])


def materials_page_data(catalog: Catalog) -> MaterialsPage:
    return MaterialsPage(materials=materials_payload(catalog), catalog_version=catalog.version,
                         links={"page": urls.materials_page(), "json_twin": urls.materials_json()})


@router.get("/materials", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="Materials page: every candidate with price, abundance and hazards")
def materials_html(request: Request, catalog: Catalog = Depends(get_catalog)):
    page = materials_page_data(catalog)
    return render(request, "materials.html", {"page": page}, json_twin=page.links["json_twin"])


@router.get("/materials.json", response_model=MaterialsPage, responses=ERROR_RESPONSES,
            summary="Materials page data (JSON twin of /materials)")
def materials_json(catalog: Catalog = Depends(get_catalog)) -> MaterialsPage:
    return materials_page_data(catalog)


def _number(text: str | None, name: str, default: float, errors: list[FieldError]) -> float:
    if text is None or not text.strip():
        return default
    try:
        value = float(text)
    except ValueError:
        value = math.nan
    if not math.isfinite(value):
        errors.append(FieldError(loc=["query", name], msg=f"{name}: must be a finite number (given {text!r})"))
        return default
    return value


def material_page_data(material_id: str, catalog: Catalog, activity: str | None, temperature: str | None,
                       axis: str | None) -> MaterialPage:
    """The one data object behind /materials/{id} and its .json twin."""
    material = next((m for key, m in catalog.materials.items() if key.lower() == material_id.lower()), None)
    if material is None:
        raise not_found(f"no material {material_id!r}; see {urls.materials_page()}")
    errors: list[FieldError] = []
    activity_value = _number(activity, "activity", DEFAULT_ACTIVITY, errors)
    temperature_value = _number(temperature, "temperature", 25.0, errors)
    if errors:
        raise Unprocessable(errors)
    try:
        axis_id = canonical_scale(catalog.scales, axis or "SHE")
    except ElectrosieveError as error:
        raise Unprocessable([engine_error(error, "query", {"scale": "axis"})]) from None
    try:
        result = diagram(material.element, activity_value, temperature_value, catalog=catalog)
        payload = diagram_payload(result, catalog)
        figure = figure_dict(payload, scales=catalog.scales, scale_id=axis_id,
                             title=f"{material.name}: {material.element}, {temperature_value:g} °C, "
                                   f"dissolved at {activity_value:g}")
    except ElectrosieveError as error:
        raise Unprocessable([engine_error(error, "query", {"scale": "axis"})]) from None
    listed = next(row for row in materials_payload(catalog) if row["id"] == material.id)
    links = {"page": urls.material_page(material.id, activity=activity_value, temperature=temperature_value, axis=axis_id),
             "json_twin": urls.material_json(material.id, activity=activity_value, temperature=temperature_value,
                                             axis=axis_id),
             "diagram_api": urls.api_diagram(material.element, activity=activity_value, temperature=temperature_value),
             "sources_api": urls.api_sources(material.element), "materials": urls.materials_page()}
    return MaterialPage(material=listed, diagram=payload, figure=figure,
                        sources=sources_payload(catalog, material.element), scales=form_choices(catalog)["scales"],
                        axis=axis_id, links=links, cautions=list(CAUTIONS))


MATERIAL_QUERY = {
    "activity": Query(None, max_length=40, description="activity of dissolved species (default 1e-6)"),
    "temperature": Query(None, max_length=40, description="temperature [°C] (default 25)"),
    "axis": Query(None, max_length=40, description="reference scale of the potential axis (default SHE)"),
}


@router.get("/materials/{material_id}.json", response_model=MaterialPage, responses=ERROR_RESPONSES,
            summary="One material's page data (JSON twin of /materials/{id})")
def material_json(material_id: str, catalog: Catalog = Depends(get_catalog),
                  activity: str | None = MATERIAL_QUERY["activity"], temperature: str | None = MATERIAL_QUERY["temperature"],
                  axis: str | None = MATERIAL_QUERY["axis"]) -> MaterialPage:
    return material_page_data(material_id, catalog, activity, temperature, axis)


@router.get("/materials/{material_id}", response_class=HTMLResponse, response_model=None, responses=HTML_RESPONSES,
            summary="One material: diagram, boundary equations, species data with citations, hazards")
def material_html(request: Request, material_id: str, catalog: Catalog = Depends(get_catalog),
                  activity: str | None = MATERIAL_QUERY["activity"], temperature: str | None = MATERIAL_QUERY["temperature"],
                  axis: str | None = MATERIAL_QUERY["axis"]):
    page = material_page_data(material_id, catalog, activity, temperature, axis)
    return render(request, "material.html", {"page": page}, json_twin=page.links["json_twin"])
