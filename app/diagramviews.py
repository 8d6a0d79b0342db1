"""An element's diagram as the pages show it (its payload and figure), kept for the questions asked most recently.

Building a figure costs more than computing the diagram (the labels' placement, the traces), and the same
diagram comes back with every opening of a material page or a comparison, so both are kept per
(catalog, element, activity, temperature, axis, operating window, title): at most :data:`SIZE` of them,
least recently used dropped first. Callers read them and never change them.
"""

from collections import OrderedDict
from threading import Lock

from electrosieve.engine.catalog import Catalog
from electrosieve.engine.diagram import diagram
from electrosieve.engine.solution import Solution

from .figures import figure_dict
from .payloads import diagram_payload, onset_lines_payload

SIZE = 128
"""Diagram views kept. One is about 60 KB (a payload and a figure of about 20 domains; ``bench/memory.py``
measures it), so the cache stays under about 8 MB."""

_views: OrderedDict[tuple, tuple[dict, dict]] = OrderedDict()
_lock = Lock()


def diagram_view(catalog: Catalog, element: str, activity: float, temperature: float, *, axis: str,
                 operating_window: list[list[float]] | None = None, title: str | None = None,
                 solution: Solution = Solution(), onsets_of: str | None = None) -> tuple[dict, dict]:
    """(diagram payload, figure) of ``element`` under these conditions, the potential axis on ``axis``; with the
    electrolyte's per-ion and ligand activities of ``solution``, and material ``onsets_of``'s own onset lines."""
    window = tuple(tuple(point) for point in operating_window) if operating_window else None
    key = (catalog, element, activity, temperature, axis, window, title, solution, onsets_of)
    with _lock:
        kept = _views.get(key)
        if kept is not None:
            _views.move_to_end(key)
            return kept
    result = diagram(element, activity, temperature, catalog=catalog, **solution.diagram_arguments())
    payload = diagram_payload(result, catalog, solution)
    onsets = onset_lines_payload(onsets_of, result) if onsets_of else None
    figure = figure_dict(payload, scales=catalog.scales, scale_id=axis, operating_window=operating_window, title=title,
                         onsets=onsets)
    with _lock:
        _views[key] = (payload, figure)
        while len(_views) > SIZE:
            _views.popitem(last=False)
    return payload, figure


def clear() -> None:
    """Forget every kept view (benchmarks use it to time a first opening)."""
    with _lock:
        _views.clear()
