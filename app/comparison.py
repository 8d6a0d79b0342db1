"""The comparison: one to six candidates' diagrams and figures side by side under one operating window (the compare page's data)."""

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.errors import ElectrosieveError
from electrosieve.engine.scales import canonical_scale
from electrosieve.engine.screen import material_id
from electrosieve.engine.solution import make_solution

from . import urls
from .cautions import CAUTIONS
from .errors import Unprocessable, engine_error
from .diagramviews import diagram_view
from .models import CompareDiagram, ComparePage, FieldError
from .pages import form_choices, screen_result
from .payloads import citation, sources_payload
from .viewstate import ENGINE_FIELD_TO_PARAM, ViewQuery

COMPARE_RANGE = (1, 6)
"""How many candidates the page shows side by side."""


def chosen_materials(view: ViewQuery, catalog: Catalog) -> tuple[list[str], list[FieldError]]:
    """The compared material ids (``compare=…``, else the picked ``materials=…``), checked against the catalog."""
    given = view.compare or (view.materials if view.picked() == "names" else [])
    low, high = COMPARE_RANGE
    if not low <= len(dict.fromkeys(given)) <= high:
        given_count = len(dict.fromkeys(given))
        advice = f"untick {given_count - high}" if given_count > high else "tick at least one on the screen page"
        return [], [FieldError(loc=["query", "compare"],
                               msg=f"compare: choose {low} to {high} materials (given {given_count}); {advice}")]
    try:
        return list(dict.fromkeys(material_id(catalog, m) for m in given)), []
    except ElectrosieveError as error:
        return [], [engine_error(error, "query", {"materials": "compare"})]


def compare_page_data(view: ViewQuery, catalog: Catalog) -> ComparePage:
    """The one data object behind /compare and /compare.json."""
    scenario_in, errors = view.scenario_in()
    ids, pick_errors = chosen_materials(view, catalog)
    errors = errors + pick_errors
    axis = view.axis or (view.scale or "SHE")
    if not errors:
        try:
            axis = canonical_scale(catalog.scales, axis)
        except ElectrosieveError as error:
            errors.append(engine_error(error, "query", {"scale": "axis"}))
    result = None
    if not errors:
        try:
            result = screen_result(scenario_in.model_copy(update={"materials": ids, "family": None}), catalog,
                                where="query", rename=ENGINE_FIELD_TO_PARAM)
        except Unprocessable as problem:
            errors = problem.errors
    diagrams = []
    if result is not None:
        rows = {row["material"]: row for row in result["results"]}
        scenario = result["scenario"]
        try:
            solution = make_solution(catalog=catalog, temperature_c=scenario["temperature"],
                                     electrolyte=scenario["electrolyte"], ion_activities=scenario["ion_activities"],
                                     chloride=scenario["chloride"])
            for mid in ids:
                material = catalog.materials[mid]
                payload, figure = diagram_view(
                    catalog, material.element, scenario["activity"], scenario["temperature"], axis=axis,
                    operating_window=result["window"]["vertices_she"], solution=solution,
                    title=f"{material.name}: {material.element}, {scenario['temperature']:g} °C, "
                          f"dissolved at {scenario['activity']:g}")
                diagrams.append(CompareDiagram(
                    material=mid, name=material.name, element=material.element, row=rows.get(mid), diagram=payload,
                    figure=figure, links={"material": urls.material_page(mid, activity=scenario["activity"],
                                                                         temperature=scenario["temperature"],
                                                                         axis=axis, window=scenario)}))
        except ElectrosieveError as error:  # e.g. a scale not tabulated at this temperature
            errors.append(engine_error(error, "query", {"scale": "axis"}))
            diagrams = []
    citations = {}
    for item in diagrams:
        citations.update(sources_payload(catalog, item.element)["citations"])
    scale_row = catalog.scales.get(axis)
    if scale_row is not None and scale_row.source in catalog.sources:
        citations[scale_row.source] = citation(catalog, scale_row.source)
    links = {"page": urls.compare_page(view, ids or None), "json_twin": urls.compare_json(view, ids or None),
             "screen": urls.screen_page(view)}
    return ComparePage(query=view.form_values(), axis=axis, scenario=result["scenario"] if result else None,
                       rule=result["rule"] if result else "", window=result["window"] if result else None,
                       diagrams=diagrams, errors=errors, scales=form_choices(catalog)["scales"], links=links,
                       citations=citations, cautions=list(CAUTIONS))
