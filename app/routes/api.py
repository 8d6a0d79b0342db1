"""The JSON API under /api/v1: the same payloads as the CLI's ``--json`` output."""

from fastapi import APIRouter, Depends, Path, Query
from fastapi.responses import Response

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.diagram import diagram, stable_at
from electrosieve.engine.electrolyte import electrolyte as make_electrolyte
from electrosieve.engine.inputs import ACTIVITY_RANGE, DEFAULT_ACTIVITY, LIGAND_ACTIVITY_RANGE, TEMPERATURE_RANGE_C
from electrosieve.engine.errors import ElectrosieveError
from electrosieve.engine.solution import Solution, make_solution

from .. import payloads, urls
from ..models import (DiagramOut, ElectrolyteOut, MaterialOut, PLOT, POTENTIAL_LIMIT, PointOut, ScaleOut, ScenarioIn, ScreenResult,
                      ShortlistCreate, ShortlistCreated, ShortlistPublic, SourcesOut)
from ..errors import Unprocessable, engine_error
from ..pages import screen_result
from ..shortlists import SAVE_REFUSALS, create_shortlist, find_shortlist, shortlist_public
from ..viewstate import parse_ion_activities
from .common import BODY_RESPONSES, ERROR_RESPONSES, get_catalog, get_storage

router = APIRouter(prefix=urls.API, tags=["api"])

ElementPath = Path(..., min_length=1, max_length=8, description="element symbol, e.g. Zn (case-insensitive)")
Activity = Query(DEFAULT_ACTIVITY, ge=ACTIVITY_RANGE[0], le=ACTIVITY_RANGE[1], allow_inf_nan=False,
                 description="activity of every dissolved species")
Temperature = Query(25.0, ge=TEMPERATURE_RANGE_C[0], le=TEMPERATURE_RANGE_C[1], allow_inf_nan=False,
                    description="temperature [°C]")
Electrolyte = Query(None, min_length=1, max_length=200,
                    description="electrolyte recipe, e.g. `0.6 M NaCl`, `seawater` (sets its ions' and chloride's activities)")
IonActivities = Query(None, min_length=1, max_length=400,
                      description="activities of named dissolved species, `NAME=A,…`, e.g. `Cu^2+=0.1` (URL-encoded)")
ChlorideActivity = Query(None, ge=LIGAND_ACTIVITY_RANGE[0], le=LIGAND_ACTIVITY_RANGE[1], allow_inf_nan=False,
                         description="free chloride activity (adds chloride complexes and salts)")


def _solution(catalog: Catalog, temperature: float, electrolyte: str | None, ion_activities: str | None,
              chloride: float | None, ph: float | None = None) -> Solution:
    try:
        return make_solution(catalog=catalog, temperature_c=temperature, ph=ph, electrolyte=electrolyte,
                             ion_activities=parse_ion_activities(ion_activities), chloride=chloride)
    except ElectrosieveError as error:
        raise Unprocessable([engine_error(error, "query")]) from None


def _diagram(element: str, activity: float, temperature: float, catalog: Catalog, solution: Solution = Solution()):
    try:
        return diagram(element, activity, temperature, catalog=catalog, **solution.diagram_arguments())
    except ElectrosieveError as error:
        where = "path" if error.field == "element" else "query"
        raise Unprocessable([engine_error(error, where)]) from None


@router.get("/materials", response_model=list[MaterialOut], responses=ERROR_RESPONSES,
            summary="Every candidate material with price, abundance and hazards")
def materials(catalog: Catalog = Depends(get_catalog)):
    return payloads.materials_payload(catalog)


@router.get("/scales", response_model=list[ScaleOut], responses=ERROR_RESPONSES,
            summary="The reference scales with their potentials vs SHE and sources")
def scales(catalog: Catalog = Depends(get_catalog)):
    return payloads.scales_payload(catalog)


@router.get("/sources/{element}", response_model=SourcesOut, responses=ERROR_RESPONSES,
            summary="An element's species data with the citations they resolve to")
def sources(element: str = ElementPath, catalog: Catalog = Depends(get_catalog)):
    try:
        system = catalog.system(element)
    except ElectrosieveError as error:
        raise Unprocessable([engine_error(error, "path")]) from None
    return payloads.sources_payload(catalog, system.element)


@router.get("/diagram/{element}", response_model=DiagramOut, responses=ERROR_RESPONSES,
            summary="An element's exact E-pH diagram (as `electrosieve diagram --json`)")
def diagram_json(element: str = ElementPath, activity: float = Activity, temperature: float = Temperature,
                 electrolyte: str | None = Electrolyte, ion_activities: str | None = IonActivities,
                 chloride: float | None = ChlorideActivity, catalog: Catalog = Depends(get_catalog)):
    solution = _solution(catalog, temperature, electrolyte, ion_activities, chloride)
    return payloads.diagram_payload(_diagram(element, activity, temperature, catalog, solution), catalog, solution)


@router.get("/point/{element}", response_model=PointOut, responses=ERROR_RESPONSES,
            summary="The stable species at one point (as `electrosieve point --json`)")
def point_json(element: str = ElementPath,
               ph: float = Query(..., ge=PLOT.ph_min, le=PLOT.ph_max, allow_inf_nan=False, description="pH"),
               potential: float = Query(..., ge=-POTENTIAL_LIMIT, le=POTENTIAL_LIMIT, allow_inf_nan=False,
                                        description="potential [V on `scale`]"),
               scale: str = Query("SHE", min_length=1, max_length=32, description="reference scale of `potential`"),
               activity: float = Activity, temperature: float = Temperature,
               electrolyte: str | None = Electrolyte, ion_activities: str | None = IonActivities,
               chloride: float | None = ChlorideActivity, catalog: Catalog = Depends(get_catalog)):
    solution = _solution(catalog, temperature, electrolyte, ion_activities, chloride, ph)
    result = _diagram(element, activity, temperature, catalog, solution)
    try:
        point = stable_at(result, catalog.scales, ph, potential, scale)
    except ElectrosieveError as error:
        raise Unprocessable([engine_error(error, "query")]) from None
    return payloads.point_payload(point, solution)


@router.get("/electrolyte", response_model=ElectrolyteOut, responses=ERROR_RESPONSES,
            summary="pH, ionic strength and free-ion activities of a recipe (as `electrosieve electrolyte --json`)")
def electrolyte_json(recipe: str = Query(..., min_length=1, max_length=200, description="e.g. `0.6 M NaCl`, `seawater`"),
                     temperature: float = Temperature):
    try:
        return payloads.electrolyte_payload(make_electrolyte(recipe, temperature, "recipe"))
    except ElectrosieveError as error:
        raise Unprocessable([engine_error(error, "query")]) from None


@router.post("/screen", response_model=ScreenResult, responses=BODY_RESPONSES,
             summary="Rank candidates over an operating window (as `electrosieve screen --json`)")
def screen_json(scenario: ScenarioIn, catalog: Catalog = Depends(get_catalog)):
    return screen_result(scenario, catalog)


@router.post("/shortlists", response_model=ShortlistCreated, status_code=201, responses={**BODY_RESPONSES, **SAVE_REFUSALS},
             summary="Save a ranked shortlist; returns its id and link")
def shortlists_create(body: ShortlistCreate, response: Response, catalog: Catalog = Depends(get_catalog),
                      storage=Depends(get_storage)) -> ShortlistCreated:
    stored = create_shortlist(body, catalog, storage)
    url = urls.shortlist_page(stored.id)
    response.headers["Location"] = url
    return ShortlistCreated(id=stored.id, url=url)


@router.get("/shortlists/{shortlist_id}", response_model=ShortlistPublic, responses=ERROR_RESPONSES,
            summary="A saved shortlist (404 when unknown)")
def shortlists_get(shortlist_id: str = Path(..., max_length=64), catalog: Catalog = Depends(get_catalog),
                   storage=Depends(get_storage)):
    return shortlist_public(find_shortlist(shortlist_id, storage), catalog)
