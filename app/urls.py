"""Every URL the app links to, built in one place (templates call these; they never concatenate URLs).

Paths:

| page | HTML | JSON twin | CSV |
|---|---|---|---|
| screen | ``/`` (also ``/screen``) | ``/screen.json`` | ``/screen.csv`` |
| compare | ``/compare`` | ``/compare.json`` | |
| materials | ``/materials`` | ``/materials.json`` | |
| one material | ``/materials/{id}`` | ``/materials/{id}.json`` | |
| shortlist | ``/s/{id}`` | ``/s/{id}.json`` (= ``/api/v1/shortlists/{id}``) | ``/s/{id}.csv`` |

>>> from electrosieve.app.viewstate import ViewQuery
>>> screen_page(ViewQuery(ph_low="7", potential_low="0"))
'/?ph_low=7&ph_high=&potential_low=0&potential_high=&scale=SHE&temperature=25&activity=1e-6&role=anode'
>>> material_page("Pt", activity=1e-4)
'/materials/Pt?activity=0.0001'
"""

from urllib.parse import quote, urlencode

from .assets import PLOTLY_VERSION, static_version

API = "/api/v1"


def with_query(path: str, pairs) -> str:
    """``path`` with the (name, value) pairs as its query string (nothing appended when there are none)."""
    pairs = list(pairs)
    return f"{path}?{urlencode(pairs)}" if pairs else path


def _view_pairs(view, *, scenario_only: bool = True) -> list[tuple[str, str]]:
    return [] if view is None else view.params(scenario_only=scenario_only)


def screen_page(view=None) -> str:
    return with_query("/", _view_pairs(view))


def screen_json(view=None) -> str:
    return with_query("/screen.json", _view_pairs(view))


def screen_csv(view=None) -> str:
    return with_query("/screen.csv", _view_pairs(view))


def screen_picture(view=None) -> str:
    """The ranking as a picture (SVG): one strip per candidate, the operating window's fate."""
    return with_query("/screen/picture.svg", _view_pairs(view))


def screen_ranking(view=None) -> str:
    """The screen page's ranked pieces alone, as HTML the page's script swaps in."""
    return with_query("/screen/ranking", _view_pairs(view))


def _compare_pairs(view, materials, axis) -> list[tuple[str, str]]:
    pairs = _view_pairs(view)
    pairs += [("compare", m) for m in (materials if materials is not None else (view.compare if view else []))]
    axis = axis if axis is not None else (view.axis if view else "")
    if axis:
        pairs.append(("axis", axis))
    return pairs


def compare_page(view=None, materials=None, axis=None) -> str:
    return with_query("/compare", _compare_pairs(view, materials, axis))


def compare_json(view=None, materials=None, axis=None) -> str:
    return with_query("/compare.json", _compare_pairs(view, materials, axis))


def _material_pairs(activity, temperature, axis) -> list[tuple[str, str]]:
    pairs = []
    if activity is not None:
        pairs.append(("activity", f"{activity:g}"))
    if temperature is not None:
        pairs.append(("temperature", f"{temperature:g}"))
    if axis:
        pairs.append(("axis", axis))
    return pairs


def _window_pairs(scenario) -> list[tuple[str, str]]:
    """The operating window of a screen's scenario (its payload: ``ph``, ``potential`` as a number or a pair, ``scale``)."""
    if not scenario:
        return []
    get = scenario.get if isinstance(scenario, dict) else lambda name: getattr(scenario, name)
    pairs = []
    for name in ("ph", "potential"):
        value = get(name)
        low, high = (value[0], value[1]) if isinstance(value, (list, tuple)) else (value, None)
        pairs += [(f"{name}_low", f"{low:g}"), (f"{name}_high", "" if high is None else f"{high:g}")]
    return pairs + [("scale", get("scale"))]


def material_page(material_id: str, *, activity=None, temperature=None, axis=None, window=None) -> str:
    """One material's page; ``window`` (a screen's scenario payload) keeps its operating window drawn there.

    >>> material_page("Pt", axis="RHE", window={"ph": [0, 1], "potential": 1.6, "scale": "RHE"})
    '/materials/Pt?axis=RHE&ph_low=0&ph_high=1&potential_low=1.6&potential_high=&scale=RHE'
    """
    return with_query(f"/materials/{quote(material_id, safe='')}",
                      _material_pairs(activity, temperature, axis) + _window_pairs(window))


def screen_diagram(view=None, material: str = "") -> str:
    """The screen page's selected candidate: its diagram under the window, as HTML the page's script places."""
    return with_query("/screen/diagram", _view_pairs(view) + ([("material", material)] if material else []))


def material_json(material_id: str, *, activity=None, temperature=None, axis=None) -> str:
    return with_query(f"/materials/{quote(material_id, safe='')}.json", _material_pairs(activity, temperature, axis))


def materials_page() -> str:
    return "/materials"


def materials_json() -> str:
    return "/materials.json"


def shortlist_page(shortlist_id: str) -> str:
    return f"/s/{quote(shortlist_id, safe='')}"


def shortlist_json(shortlist_id: str) -> str:
    return f"/s/{quote(shortlist_id, safe='')}.json"


def shortlist_csv(shortlist_id: str) -> str:
    return f"/s/{quote(shortlist_id, safe='')}.csv"


def shortlist_form() -> str:
    """Where the screen page's no-JavaScript "Save as shortlist" form posts."""
    return "/shortlists"


def api_shortlists() -> str:
    return f"{API}/shortlists"


def api_shortlist(shortlist_id: str) -> str:
    return f"{API}/shortlists/{quote(shortlist_id, safe='')}"


def api_diagram(element: str, *, activity=None, temperature=None) -> str:
    return with_query(f"{API}/diagram/{quote(element, safe='')}", _material_pairs(activity, temperature, None))


def api_sources(element: str) -> str:
    return f"{API}/sources/{quote(element, safe='')}"


def static(path: str) -> str:
    """A file under ``static/``, its URL versioned by the files' digest (``app.assets``)."""
    return f"/static/{quote(path)}?v={static_version()}"


def plotly_js() -> str:
    """plotly.js as bundled in the plotly package (served locally: no CDN), its version in the path."""
    return f"/vendor/plotly-{PLOTLY_VERSION}.min.js"


def docs() -> str:
    return "/docs"
