"""Plotly figures of E–pH diagrams: exact domain polygons, water lines and an operating window.

Regions are told apart by fill pattern and label as well as by colour; the
palette keeps the three regions apart for the common colour-vision deficiencies
(tints of blue, ochre and vermilion of differing lightness).
"""

import re

import plotly.graph_objects as go

REGION_STYLE = {
    "immunity": {"fill": "rgba(52, 101, 164, 0.30)", "line": "#274b7a", "pattern": ""},
    "passivation": {"fill": "rgba(222, 170, 60, 0.38)", "line": "#8a6414", "pattern": "/"},
    "corrosion": {"fill": "rgba(206, 92, 60, 0.30)", "line": "#8f3a22", "pattern": "x"},
}
"""Fill, outline and pattern of each region."""

def rich_formula(name: str) -> str:
    """A species name with sub- and superscripts in Plotly's HTML subset: ``CrO4^2-`` → ``CrO<sub>4</sub><sup>2-</sup>``.

    >>> rich_formula("Fe2O3"), rich_formula("HZnO2^-"), rich_formula("TiO2 (rutile)")
    ('Fe<sub>2</sub>O<sub>3</sub>', 'HZnO<sub>2</sub><sup>-</sup>', 'TiO<sub>2</sub> (rutile)')
    """
    formula, caret, charge = name.partition("^")
    head, space, label = formula.partition(" ")
    head = re.sub(r"(?<=[A-Za-z)])(\d+)", r"<sub>\1</sub>", head)
    return head + space + label + (f"<sup>{charge}</sup>" if caret else "")


WATER_STYLE = {"color": "#1b1b1b", "dash": "dash", "width": 1.6}
WINDOW_STYLE = {"color": "#6a3d9a", "width": 2.5}
WINDOW_FILL = "rgba(106, 61, 154, 0.10)"


def diagram_figure(payload: dict, *, operating_window: list[list[float]] | None = None,
                   title: str | None = None, potential_offset: float = 0.0, scale: str = "SHE",
                   offset_slope: float = 0.0) -> go.Figure:
    """A figure from a diagram payload (``app.payloads.diagram_payload``).

    The potential axis is shown on ``scale``: E_scale = E_SHE − potential_offset − offset_slope·pH
    (offset_slope is the Nernst slope for the RHE, 0 otherwise). ``operating_window`` is a polygon
    [[pH, E vs SHE], …] drawn on top.
    """

    def on_scale(ph: float, e: float) -> float:
        return e - potential_offset + offset_slope * ph

    figure = go.Figure()
    shown_regions: set[str] = set()
    for domain in payload["domains"]:
        style = REGION_STYLE[domain["region"]]
        xs = [p[0] for p in domain["polygon"]] + [domain["polygon"][0][0]]
        ys = [on_scale(*p) for p in domain["polygon"]] + [on_scale(*domain["polygon"][0])]
        label = f"{rich_formula(domain['formula'])} ({domain['phase']})"
        figure.add_trace(go.Scatter(
            x=xs, y=ys, mode="lines", fill="toself", fillcolor=style["fill"],
            fillpattern={"shape": style["pattern"], "fgcolor": style["line"], "size": 9, "solidity": 0.15},
            line={"color": style["line"], "width": 1.2}, name=domain["region"],
            legendgroup=domain["region"], showlegend=domain["region"] not in shown_regions,
            hoveron="fills", text=f"{label}: {domain['region']}", hoverinfo="text",
        ))
        shown_regions.add(domain["region"])
        centre_x = sum(xs[:-1]) / len(xs[:-1])
        centre_y = sum(ys[:-1]) / len(ys[:-1])
        figure.add_annotation(x=centre_x, y=centre_y, text=rich_formula(domain["formula"]), showarrow=False,
                              font={"size": 12, "color": "#1b1b1b"})
    ph_range = payload["limits"]["ph"]
    for key, name in (("hydrogen", "H2/H2O"), ("oxygen", "O2/H2O")):
        line = payload["water"][key]
        figure.add_trace(go.Scatter(
            x=ph_range, y=[on_scale(ph, line["intercept"] + line["slope"] * ph) for ph in ph_range],
            mode="lines", line=WATER_STYLE, name=f"{name} (1 bar)", hoverinfo="name",
        ))
    if operating_window:
        xs = [p[0] for p in operating_window] + [operating_window[0][0]]
        ys = [on_scale(*p) for p in operating_window] + [on_scale(*operating_window[0])]
        figure.add_trace(go.Scatter(x=xs, y=ys, mode="lines+markers", line=WINDOW_STYLE, fill="toself",
                                    fillcolor=WINDOW_FILL, marker={"size": 5}, name="operating window",
                                    hoveron="points+fills", hoverinfo="name"))
    e_range = payload["limits"]["potential"]
    figure.update_layout(
        title=title or f"{payload['element']}: E–pH diagram, dissolved species at {payload['activity']:g}, "
                       f"{payload['temperature_c']:g} °C",
        xaxis={"title": "pH", "range": ph_range, "zeroline": False},
        yaxis={"title": f"E / V vs {scale}", "zeroline": False,
               "range": None if offset_slope else [e_range[0] - potential_offset, e_range[1] - potential_offset]},
        template="simple_white", font={"family": "Inter, 'Segoe UI', Helvetica, Arial, sans-serif"},
        legend={"orientation": "h", "y": -0.15}, margin={"l": 60, "r": 20, "t": 50, "b": 40},
    )
    return figure


def write_figure(figure: go.Figure, path: str) -> None:
    """Write ``figure`` as .html (self-contained, works offline), .svg or .png (needs kaleido and Chromium)."""
    lower = path.lower()
    if lower.endswith(".html"):
        figure.write_html(path, include_plotlyjs=True, full_html=True)
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
                title: str | None = None) -> dict:
    """The figure of a diagram payload as plain JSON (``data`` and ``layout``) for plotly.js in the page."""
    import json

    offset, slope = axis_offsets(scales, scale_id, payload["temperature_c"])
    figure = diagram_figure(payload, operating_window=operating_window, title=title, potential_offset=offset,
                            scale=scale_id, offset_slope=slope)
    figure.update_layout(template=None, plot_bgcolor="#ffffff", paper_bgcolor="#ffffff",
                         xaxis={"showline": True, "linecolor": "#444", "ticks": "outside", "mirror": True},
                         yaxis={"showline": True, "linecolor": "#444", "ticks": "outside", "mirror": True})
    return json.loads(figure.to_json())
