"""Figures built as plain JSON are what plotly's own figure objects make of them, and the page cache is bounded."""

import json

import plotly.graph_objects as go
import pytest

from electrosieve.app import diagramviews
from electrosieve.app.figures import figure_dict
from electrosieve.app.payloads import diagram_payload
from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.diagram import diagram

CATALOG = default_catalog()
WINDOW = [[3.0, 0.0], [5.0, 0.0], [5.0, 0.5], [3.0, 0.5]]


@pytest.mark.parametrize("element, axis, temperature", [("Zn", "SHE", 25.0), ("Fe", "RHE", 60.0),
                                                         ("Cu", "SCE", 25.0), ("Ti", "AgAgCl-3M", 40.0)])
def test_plain_figure_passes_through_plotly_unchanged(element, axis, temperature):
    # plotly validates every property name and value on the way in; nothing is added, dropped or changed
    payload = diagram_payload(diagram(element, 1e-6, temperature), CATALOG)
    figure = figure_dict(payload, scales=CATALOG.scales, scale_id=axis, operating_window=WINDOW, title="t")
    through = go.Figure(figure)
    through.update_layout(template=None)  # on construction plotly reads {} as "its default template"
    assert json.loads(through.to_json()) == figure


def test_diagram_views_are_reused_and_bounded(monkeypatch):
    diagramviews.clear()
    first = diagramviews.diagram_view(CATALOG, "Zn", 1e-6, 25.0, axis="SHE", operating_window=WINDOW)
    again = diagramviews.diagram_view(CATALOG, "Zn", 1e-6, 25.0, axis="SHE", operating_window=WINDOW)
    assert again[0] is first[0] and again[1] is first[1]
    other = diagramviews.diagram_view(CATALOG, "Zn", 1e-6, 25.0, axis="RHE", operating_window=WINDOW)
    assert other[1] is not first[1] and other[1]["layout"]["yaxis"]["title"]["text"] == "E / V vs RHE"
    monkeypatch.setattr(diagramviews, "SIZE", 3)
    for activity in (1e-2, 1e-3, 1e-4, 1e-5):
        diagramviews.diagram_view(CATALOG, "Zn", activity, 25.0, axis="SHE")
    assert len(diagramviews._views) == 3
    diagramviews.clear()
