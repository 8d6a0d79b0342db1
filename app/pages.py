"""Each page's data object, built from the parsed view state (HTML and its ``.json`` twin share it).

The builders call the engine and ``app.payloads``; they know nothing of HTTP beyond raising
:class:`app.errors.Unprocessable` with FieldErrors naming the query parameter at fault.
"""

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.diagram import diagram
from electrosieve.engine.errors import ElectrosieveError
from electrosieve.engine.inputs import DEFAULT_ACTIVITY
from electrosieve.engine.ranking import RANK_KEYS
from electrosieve.engine.roles import roles
from electrosieve.engine.scales import canonical_scale
from electrosieve.engine.screen import screen

from . import urls
from .cautions import CAUTIONS
from .errors import Unprocessable, engine_error, not_found
from .diagramviews import diagram_view
from .models import Choice, FieldError, MaterialPage, MaterialsPage, RoleChoice, ScenarioIn, ScreenLinks, ScreenPage
from .payloads import citation, materials_payload, onset_lines_payload, screen_payload, sources_payload
from .viewstate import ENGINE_FIELD_TO_PARAM, ViewQuery, checked_scenario, parse_number

def screen_result(scenario: ScenarioIn, catalog: Catalog, *, where: str | list = "body", rename: dict | None = None) -> dict:
    """The screen payload (``app.payloads.screen_payload`` of ``engine.screen.screen``) or an :class:`Unprocessable`."""
    if not catalog.materials:
        raise Unprocessable([FieldError(loc=[*([where] if isinstance(where, str) else where), "materials"],
                                        msg="materials: the catalog has no materials (data/materials.toml is missing)")])
    try:
        checked = checked_scenario(scenario, catalog)
        return screen_payload(screen(checked, catalog))
    except ElectrosieveError as error:
        raise Unprocessable([engine_error(error, where, rename)]) from None


def screen_view(view: ViewQuery, catalog: Catalog) -> tuple[dict | None, list[FieldError]]:
    """The screen result a page's view asks for, or the errors naming its query parameters."""
    scenario, errors = view.scenario_in()
    if errors:
        return None, errors
    try:
        return screen_result(scenario, catalog, where="query", rename=ENGINE_FIELD_TO_PARAM), []
    except Unprocessable as problem:
        return None, problem.errors


def form_choices(catalog: Catalog) -> dict:
    """The form's pickers: reference scales, families present in the catalog, materials, ranking keys."""
    families = sorted({m.family for m in catalog.materials.values()})
    return {
        "scales": [Choice(value=key, label=f"{key}: {row.name}") for key, row in catalog.scales.items()],
        "families": [Choice(value=f, label=f) for f in families],
        "materials": [Choice(value=m.id, label=f"{m.name} ({m.family})") for m in catalog.materials.values()],
        "ranking_keys": [Choice(value=k, label=text) for k, text in RANK_KEYS.items()],
        "roles": [RoleChoice(value=role.name, label=role.title, description=role.description, rule=role.rule)
                  for role in roles().values()],
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


def materials_page_data(catalog: Catalog) -> MaterialsPage:
    return MaterialsPage(materials=materials_payload(catalog), catalog_version=catalog.version,
                         links={"page": urls.materials_page(), "json_twin": urls.materials_json()})


def _number(text: str | None, name: str, default: float, errors: list[FieldError]) -> float:
    if text is None or not text.strip():
        return default
    try:
        return parse_number(text, name)
    except ElectrosieveError as error:
        errors.append(FieldError(loc=["query", name], msg=error.message))
        return default


def material_window(material_id: str, catalog: Catalog, window: dict | None, activity: float, temperature: float
                    ) -> tuple[dict | None, str | None]:
    """A screen's operating window carried to a material's page (``ph_low``…``scale`` as typed) and the way back.

    Returns (the screen payload of this one material under that window, the screen page's URL) or (None, None)
    when no window was given.
    """
    given = {name: value for name, value in (window or {}).items() if value is not None}
    if given.get("scale"):  # checked even with no window to draw: a wrong scale is never silently ignored
        try:
            canonical_scale(catalog.scales, given["scale"])
        except ElectrosieveError as error:
            raise Unprocessable([engine_error(error, "query", {})]) from None
    if not given.get("ph_low") and not given.get("potential_low"):
        return None, None
    view = ViewQuery(**given, activity=f"{activity:g}", temperature=f"{temperature:g}")
    scenario, errors = view.scenario_in()
    if errors:
        raise Unprocessable(errors)
    result = screen_result(scenario.model_copy(update={"materials": [material_id], "family": None}), catalog,
                           where="query", rename=ENGINE_FIELD_TO_PARAM)
    return result, urls.screen_page(view)


def material_page_data(material_id: str, catalog: Catalog, activity: str | None, temperature: str | None,
                       axis: str | None, window: dict | None = None) -> MaterialPage:
    """The one data object behind /materials/{id} and its .json twin (``window``: a screen's window to draw)."""
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
    screened, back = material_window(material.id, catalog, window, activity_value, temperature_value)
    try:
        payload, figure = diagram_view(catalog, material.element, activity_value, temperature_value, axis=axis_id,
                                       operating_window=screened["window"]["vertices_she"] if screened else None,
                                       title=f"{material.name}: {material.element}, {temperature_value:g} °C, "
                                             f"dissolved at {activity_value:g}", onsets_of=material.id)
        onsets = onset_lines_payload(material.id, diagram(material.element, activity_value, temperature_value,
                                                          catalog=catalog))
    except ElectrosieveError as error:
        raise Unprocessable([engine_error(error, "query", {"scale": "axis"})]) from None
    listed = next(row for row in materials_payload(catalog) if row["id"] == material.id)
    links = {"page": urls.material_page(material.id, activity=activity_value, temperature=temperature_value, axis=axis_id),
             "json_twin": urls.material_json(material.id, activity=activity_value, temperature=temperature_value,
                                             axis=axis_id),
             "diagram_api": urls.api_diagram(material.element, activity=activity_value, temperature=temperature_value),
             "sources_api": urls.api_sources(material.element), "materials": urls.materials_page()}
    if screened:
        links["page"] = urls.material_page(material.id, activity=activity_value, temperature=temperature_value,
                                           axis=axis_id, window=screened["scenario"])
        links["screen"] = back
    return MaterialPage(material=listed, diagram=payload, figure=figure,
                        sources=sources_payload(catalog, material.element), scales=form_choices(catalog)["scales"],
                        axis=axis_id, links=links, cautions=list(CAUTIONS),
                        unchecked=[species.name for species in catalog.unchecked(material.element)], onsets=onsets)
