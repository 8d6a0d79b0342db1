"""Plotly figures of E–pH diagrams: exact domain polygons, water lines and an operating window.

The look follows docs/DESIGN.md: each region kind has its own flat fill, ordered by lightness
(immunity lightest, corrosion darkest), and every label names the region in words under the species,
so nothing depends on colour alone.
"""

import itertools
import re

import numpy as np
import plotly.graph_objects as go

INK = "#1d262b"
"""Body text and label colour (docs/DESIGN.md)."""

REGION_STYLE = {
    "immunity": {"fill": "#f3f0f7", "line": "#4a4468"},
    "passivation": {"fill": "#b9e0c6", "line": "#1f5c3b"},
    "insulating film": {"fill": "#dcd08e", "line": "#5a5012"},
    "hydride": {"fill": "#b6a6de", "line": "#4c3a8c"},
    "corrosion": {"fill": "#e07fab", "line": "#8d1d52"},
}
"""Flat fill and outline of each region kind; the same hex values as ``--region-*`` in static/css/site.css."""

WATER_STYLE = {
    "hydrogen": {"name": "H₂/H₂O, 1 bar", "line": {"color": INK, "dash": "dash", "width": 1.6}},
    "oxygen": {"name": "O₂/H₂O, 1 bar", "line": {"color": INK, "dash": "dot", "width": 2.2}},
}
"""The two water lines: the same ink, long dashes for hydrogen and round dots for oxygen."""

ONSET_STYLE = {
    "hydrogen": {"color": "#4a565d", "dash": "dash", "width": 2.6},
    "oxygen": {"color": "#4a565d", "dash": "dot", "width": 3.0},
}
"""The material's own onsets (Tafel, at a current density): soft ink, heavier, the water lines' dash code, drawn
over the pH band of the medium their data were measured in (docs/DESIGN.md)."""

WINDOW_STYLE = {"color": "#0d5c63", "width": 2.5}
WINDOW_FILL = "rgba(13, 92, 99, 0.14)"
FONT = "system-ui, -apple-system, 'Segoe UI', Roboto, 'Noto Sans', Arial, sans-serif"

PLOT_ASPECT = 0.62
"""Height over width of the plotting area assumed when placing labels (the pages draw at about this shape)."""
CHAR_WIDTH = 0.0125
"""Width of one label character as a share of the plot width (12 px type on a ~700 px plot)."""
LINE_HEIGHT = 0.034
"""Height of one label line as a share of the plot width."""


def rich_formula(name: str) -> str:
    """A species name with sub- and superscripts in Plotly's HTML subset: ``CrO4^2-`` → ``CrO<sub>4</sub><sup>2-</sup>``.

    >>> rich_formula("Fe2O3"), rich_formula("HZnO2^-"), rich_formula("TiO2 (rutile)")
    ('Fe<sub>2</sub>O<sub>3</sub>', 'HZnO<sub>2</sub><sup>-</sup>', 'TiO<sub>2</sub> (rutile)')
    """
    formula, caret, charge = name.partition("^")
    head, space, label = formula.partition(" ")
    head = re.sub(r"(?<=[A-Za-z)])(\d+)", r"<sub>\1</sub>", head)
    return head + space + label + (f"<sup>{charge}</sup>" if caret else "")


def chebyshev_centre(points: np.ndarray) -> tuple[np.ndarray, float]:
    """Centre and radius of the largest circle inside a convex polygon (its Chebyshev centre).

    Exact: the optimum of max r s.t. nᵢ·x + r ≤ cᵢ (unit outward normals nᵢ) lies where three edge
    constraints are tight, so every triple is solved and the best feasible one kept (Boyd &
    Vandenberghe 2004, §8.5.1). Vertices in counter-clockwise or clockwise order.

    >>> centre, radius = chebyshev_centre(np.array([[0, 0], [4, 0], [4, 2], [0, 2]], float))
    >>> round(radius, 9), round(float(centre[1]), 9)
    (1.0, 1.0)
    """
    edges = np.roll(points, -1, axis=0) - points
    lengths = np.hypot(edges[:, 0], edges[:, 1])
    keep = lengths > 1e-12
    edges, starts, lengths = edges[keep], points[keep], lengths[keep]
    if len(edges) < 3:
        return points.mean(axis=0), 0.0
    normals = np.column_stack([edges[:, 1], -edges[:, 0]]) / lengths[:, None]
    if np.sum(edges[:, 0] * np.roll(edges[:, 1], -1) - edges[:, 1] * np.roll(edges[:, 0], -1)) < 0:
        normals = -normals  # clockwise: (dy, -dx) points inward
    offsets = np.sum(normals * starts, axis=1)
    best, best_r = points.mean(axis=0), 0.0
    for trio in itertools.combinations(range(len(normals)), 3):
        system = np.column_stack([normals[list(trio)], np.ones(3)])
        if abs(np.linalg.det(system)) < 1e-12:
            continue
        x, y, r = np.linalg.solve(system, offsets[list(trio)])
        if r > best_r and np.all(normals @ np.array([x, y]) + r <= offsets + 1e-9):
            best, best_r = np.array([x, y]), float(r)
    return best, best_r


def place_labels(domains: list[dict], ph_range: list[float], e_range: list[float]) -> list[dict]:
    """Where each domain's label goes, deterministically and without two labels overlapping.

    Each label sits at its domain's Chebyshev centre in plot-shaped coordinates. Domains are served
    largest first; a label is the species over its region word, shortened to the species alone when the
    two-line box does not fit the domain or would overlap a placed label, and left out when the domain is
    thinner than a line of type or even the short label would overlap (hover and the
    "Domains in words" list still name it). Returns one entry per domain:
    ``{"x", "y", "text"}`` with ``text`` None for a left-out label.
    """
    ph_span = ph_range[1] - ph_range[0]
    e_span = e_range[1] - e_range[0]
    scale = np.array([1.0 / ph_span, PLOT_ASPECT / e_span])
    origin = np.array([ph_range[0], e_range[0]])
    candidates = []
    for index, domain in enumerate(domains):
        shaped = (np.asarray(domain["polygon"], float) - origin) * scale
        centre, radius = chebyshev_centre(shaped)
        candidates.append((radius, index, centre))
    placed: list[tuple[np.ndarray, np.ndarray]] = []
    labels: list[dict] = [{"x": None, "y": None, "text": None} for _ in domains]
    for radius, index, centre in sorted(candidates, key=lambda c: (-c[0], c[1])):
        domain = domains[index]
        species = rich_formula(domain["formula"])
        region = domain["region"]
        width_species = len(domain["formula"].replace("^", "")) * CHAR_WIDTH
        choices = (
            (f"{species}<br><i>{region}</i>", max(width_species, len(region) * CHAR_WIDTH), 2 * LINE_HEIGHT),
            (species, width_species, LINE_HEIGHT),
        )
        for text, width, height in choices:
            half = np.array([width / 2 + 0.006, height / 2 + 0.004])
            fits = np.hypot(*half) <= radius * 1.35 if height > LINE_HEIGHT else radius >= 0.4 * LINE_HEIGHT
            centre = np.clip(centre, half, np.array([1.0, PLOT_ASPECT]) - half)
            clear = all(np.any(np.abs(centre - other) >= half + other_half) for other, other_half in placed)
            if fits and clear:
                placed.append((centre, half))
                x, y = centre / scale + origin
                labels[index] = {"x": float(x), "y": float(y), "text": text}
                break
    return labels


def scale_label(scales: dict, scale_id: str) -> str:
    """The reference electrode as a reader names it: the trade's abbreviation (SHE, RHE, SCE, MSE) when the
    id is one, otherwise the electrode's name from data/scales.toml (``HgHgO-1M`` → ``Hg/HgO in 1 M NaOH``).
    """
    if re.fullmatch(r"[A-Z]+", scale_id):
        return scale_id
    return scales[scale_id].name if scale_id in scales else scale_id


def diagram_spec(payload: dict, *, operating_window: list[list[float]] | None = None,
                 title: str | None = None, potential_offset: float = 0.0, scale: str = "SHE",
                 offset_slope: float = 0.0, onsets: list[dict] | None = None) -> dict:
    """A figure from a diagram payload (``app.payloads.diagram_payload``) as plain JSON: ``data`` (traces) and
    ``layout``, in plotly.js's own schema, built without plotly's figure objects.

    The potential axis is shown on ``scale`` (a label, see :func:`scale_label`):
    E_scale = E_SHE − potential_offset − offset_slope·pH (offset_slope is the Nernst slope for the RHE,
    0 otherwise). ``operating_window`` is a polygon [[pH, E vs SHE], …] drawn on top; ``onsets`` are the
    material's own hydrogen and oxygen onsets (``app.payloads.onset_lines_payload``) drawn beside the water lines.
    """

    def on_scale(ph: float, e: float) -> float:
        return e - potential_offset + offset_slope * ph

    data: list[dict] = []
    shown_regions: set[str] = set()
    ph_range = payload["limits"]["ph"]
    unit = f"V vs {scale}"
    shaped = []
    for domain in payload["domains"]:
        style = REGION_STYLE[domain["region"]]
        xs = [p[0] for p in domain["polygon"]] + [domain["polygon"][0][0]]
        ys = [on_scale(*p) for p in domain["polygon"]] + [on_scale(*domain["polygon"][0])]
        shaped.append({**domain, "polygon": list(zip(xs[:-1], ys[:-1]))})
        data.append({
            "fill": "toself", "fillcolor": style["fill"], "hoverinfo": "text", "hoveron": "fills",
            "legendgroup": domain["region"], "line": {"color": "rgba(29, 38, 43, 0.55)", "width": 0.8},
            "mode": "lines", "name": domain["region"], "showlegend": domain["region"] not in shown_regions,
            "text": f"{domain['formula']} ({domain['phase']}): {domain['region']}", "x": xs, "y": ys,
            "type": "scatter"})
        shown_regions.add(domain["region"])
    e_all = [y for d in shaped for _, y in d["polygon"]] or [0.0, 1.0]
    e_view = [min(e_all), max(e_all)]
    annotations = [  # each on a patch of its own fill, so a water line under it does not strike it through
        {"bgcolor": REGION_STYLE[domain["region"]]["fill"], "borderpad": 1, "font": {"color": INK, "size": 12},
         "showarrow": False, "text": label["text"], "x": label["x"], "y": label["y"]}
        for label, domain in zip(place_labels(shaped, ph_range, e_view), shaped) if label["text"]]
    for key, style in WATER_STYLE.items():
        line = payload["water"][key]
        data.append({
            "hovertemplate": f"{style['name']}<br>pH %{{x:.2f}}, E %{{y:.3f}} {unit}<extra></extra>",
            "line": dict(style["line"]), "mode": "lines", "name": style["name"], "x": list(ph_range),
            "y": [on_scale(ph, line["intercept"] + line["slope"] * ph) for ph in ph_range], "type": "scatter"})
    hydrogen = payload["water"]["hydrogen"]
    for onset in onsets or []:
        style = ONSET_STYLE[onset["gas"]]
        name = (f"{'H₂' if onset['gas'] == 'hydrogen' else 'O₂'} onset on {onset['material']}, "
                f"{onset['current_density_ma_cm2']:g} mA cm⁻² ({onset['medium']})")
        data.append({
            "hovertemplate": f"{name}: {onset['v_rhe']:.2f} V vs RHE<br>pH %{{x:.2f}}, E %{{y:.3f}} {unit}<extra></extra>",
            "line": dict(style), "mode": "lines", "name": name, "x": list(onset["ph"]),
            "y": [on_scale(ph, onset["v_rhe"] + hydrogen["intercept"] + hydrogen["slope"] * ph) for ph in onset["ph"]],
            "type": "scatter"})
    if operating_window:
        data.append({
            "fill": "toself", "fillcolor": WINDOW_FILL,
            "hovertemplate": f"operating window corner<br>pH %{{x:.2f}}, E %{{y:.3f}} {unit}<extra></extra>",
            "hoveron": "points+fills", "line": dict(WINDOW_STYLE), "marker": {"size": 6, "symbol": "diamond"},
            "mode": "lines+markers", "name": "operating window",
            "x": [p[0] for p in operating_window] + [operating_window[0][0]],
            "y": [on_scale(*p) for p in operating_window] + [on_scale(*operating_window[0])], "type": "scatter"})
    e_range = payload["limits"]["potential"]
    yaxis = {"title": {"text": f"E / {unit}"}, "zeroline": False, "hoverformat": ".3f"}
    if not offset_slope:
        yaxis["range"] = [e_range[0] - potential_offset, e_range[1] - potential_offset]
    layout = {
        "template": "simple_white",
        **({"annotations": annotations} if annotations else {}),
        "title": {"text": title or f"{payload['element']} · dissolved species at {payload['activity']:g} · "
                                   f"{payload['temperature_c']:g} °C", "x": 0.01, "xanchor": "left",
                  "y": 0.985, "yanchor": "top", "font": {"size": 14}},
        "xaxis": {"title": {"text": "pH"}, "range": list(ph_range), "zeroline": False, "hoverformat": ".2f"},
        "yaxis": yaxis,
        "font": {"family": FONT, "color": INK},
        "legend": {"orientation": "h", "x": 0, "xanchor": "left", "xref": "container", "y": 0, "yanchor": "bottom",
                   "yref": "container", "font": {"size": 11}, "bgcolor": "rgba(255,255,255,0)"},
        "margin": {"l": 64, "r": 16, "t": 40, "b": 100},
        "hoverlabel": {"font": {"family": FONT}},
    }
    return {"data": data, "layout": layout}


def diagram_figure(payload: dict, **options) -> go.Figure:
    """:func:`diagram_spec` as a plotly figure (for writing HTML, SVG or PNG files); same options."""
    return go.Figure(diagram_spec(payload, **options))


def write_figure(figure: go.Figure, path: str) -> None:
    """Write ``figure`` as .html (self-contained, works offline), .svg or .png (needs kaleido and Chromium)."""
    lower = path.lower()
    if lower.endswith(".html"):
        figure.write_html(path, include_plotlyjs=True, full_html=True,
                          config={"displaylogo": False, "showSendToCloud": False, "showEditInChartStudio": False})
    elif lower.endswith((".svg", ".png")):
        figure.write_image(path, width=900, height=650)
    else:
        raise ValueError("--out must end in .svg, .png or .html")


def axis_offsets(scales: dict, scale_id: str, temperature_c: float) -> tuple[float, float]:
    """(potential_offset, offset_slope) that put the potential axis on ``scale_id`` (see :func:`diagram_figure`).

    A fixed reference sits at E_X vs SHE (``engine.scales.scale_offset``); the RHE moves with pH by the
    Nernst slope (``engine.constants.nernst_slope``), so E_RHE = E_SHE + slope·pH.
    """
    from electrosieve.engine.constants import ZERO_CELSIUS, nernst_slope
    from electrosieve.engine.scales import needs_ph, scale_offset

    temperature_k = temperature_c + ZERO_CELSIUS
    offset = scale_offset(scales, scale_id, temperature_k)
    slope = nernst_slope(temperature_k) if needs_ph(scales, scale_id) else 0.0
    return offset, slope


def figure_dict(payload: dict, *, scales: dict, scale_id: str = "SHE", operating_window=None,
                title: str | None = None, onsets: list[dict] | None = None) -> dict:
    """The figure of a diagram payload as plain JSON (``data`` and ``layout``) for plotly.js in the page."""
    offset, slope = axis_offsets(scales, scale_id, payload["temperature_c"])
    figure = diagram_spec(payload, operating_window=operating_window, title=title, potential_offset=offset,
                          scale=scale_label(scales, scale_id), offset_slope=slope, onsets=onsets)
    layout = figure["layout"]
    layout.update(template={}, plot_bgcolor="#ffffff", paper_bgcolor="#ffffff")
    for axis in ("xaxis", "yaxis"):
        layout[axis].update(showline=True, linecolor="#444", ticks="outside", mirror=True)
    return figure
