"""The screen page's selected candidate: its element's diagram under the operating window, built on the server.

The page shows the first-ranked candidate at first; clicking a row asks ``GET /screen/diagram`` for another
one, and the page's script only places the figure this module built.
"""

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.diagram import diagram
from electrosieve.engine.errors import ElectrosieveError

from . import urls
from .errors import engine_error
from .figures import figure_dict
from .models import FieldError
from .payloads import diagram_payload
from .viewstate import ViewQuery

__all__ = ["selected_diagram"]


def selected_diagram(view: ViewQuery, result: dict | None, catalog: Catalog, material: str | None = None
                     ) -> tuple[dict | None, list[FieldError]]:
    """The figure of one ranked candidate (``material``, else the first) with the window drawn, or the errors.

    Returns ``({"material", "name", "verdict", "reason", "figure", "link"}, [])``; ``(None, [])`` when there is
    no ranking to select from.
    """
    if not result or not result["results"]:
        return None, []
    rows = {row["material"].lower(): row for row in result["results"]}
    row = rows.get((material or result["results"][0]["material"]).lower())
    if row is None:
        return None, [FieldError(loc=["query", "material"],
                                 msg=f"material: {material!r} is not in this ranking; choose one of its rows")]
    scenario = result["scenario"]
    try:
        payload = diagram_payload(diagram(row["element"], scenario["activity"], scenario["temperature"],
                                          catalog=catalog), catalog)
        figure = figure_dict(payload, scales=catalog.scales, scale_id=scenario["scale"],
                             operating_window=result["window"]["vertices_she"],
                             title=f"{row['name']}: {row['element']}, {scenario['temperature']:g} °C, "
                                   f"dissolved at {scenario['activity']:g}")
    except ElectrosieveError as error:
        return None, [engine_error(error, "query", {"scale": "scale"})]
    return {"material": row["material"], "name": row["name"], "verdict": row["verdict"], "reason": row["reason"],
            "figure": figure, "link": urls.material_page(row["material"], activity=scenario["activity"],
                                                         temperature=scenario["temperature"], axis=scenario["scale"],
                                                         window=scenario)}, []
