"""Screening metrics against brute force: dense-grid fractions and densely sampled maxima (sampling is the check, not the method)."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.diagram import diagram
from electrosieve.engine.domains import Window
from electrosieve.engine.metrics import (instability, log10_dissolved_at, max_dissolved, potential_margin, region_fractions,
                            region_pieces)
from electrosieve.engine.window import operating_window

CATALOG = default_catalog()
ELEMENTS = sorted(CATALOG.systems)


def _window(ph, potential, scale="SHE"):
    return operating_window(CATALOG.scales, ph, potential, scale, 25.0, Window())


def _grid(window, n=120, edges=False):
    """Points filling the window uniformly: a midpoint grid (or, with ``edges``, a grid including the
    window's edges and corners) on a possibly slanted area, n points on a segment, or the point."""
    v = window.vertices
    u = np.linspace(0, 1, n) if edges else (np.arange(n) + 0.5) / n
    if window.dimension == 0:
        return v[:1]
    if window.dimension == 1:
        return np.array([v[0] + a * (v[1] - v[0]) for a in np.linspace(0, 1, n)])
    points = []
    for a in u:
        bottom = v[0] + a * (v[1] - v[0])
        top = v[3] + a * (v[2] - v[3])
        points.extend(bottom + b * (top - bottom) for b in u)
    return np.array(points)


@settings(max_examples=25, deadline=None)
@given(st.sampled_from(ELEMENTS), st.floats(-1.5, 11), st.floats(0.1, 5), st.floats(-2.0, 1.5), st.floats(0.05, 1.4),
       st.sampled_from(["SHE", "RHE"]))
def test_region_fractions_match_a_dense_grid(element, ph, ph_width, e, e_width, scale):
    window = _window([ph, ph + ph_width], [e, e + e_width], scale)
    result = diagram(element)
    exact = region_fractions(region_pieces(result, window))
    points = _grid(window)
    regions = [result.stable_species_at(x, y).region for x, y in points]
    for region in exact:
        sampled = regions.count(region) / len(regions)
        # a 120 x 120 midpoint grid resolves a boundary crossing the window to about 2 cells (common practice)
        assert exact[region] == pytest.approx(sampled, abs=0.02)


@settings(max_examples=25, deadline=None)
@given(st.sampled_from(sorted(CATALOG.materials)), st.floats(-1.5, 12), st.floats(0.0, 4), st.floats(-2.0, 1.5),
       st.floats(0.0, 1.2), st.sampled_from(["SHE", "RHE", "SCE"]))
def test_instability_is_the_maximum_over_a_dense_sample(material_id, ph, ph_width, e, e_width, scale):
    material = CATALOG.materials[material_id]
    window = _window([ph, ph + ph_width], [e, e + e_width], scale)
    result = diagram(material.element)
    exact, _ = instability(result, window, material.phase)
    index = [s.name for s in result.planes.species].index(material.phase)
    sampled = max(float(result.planes.at(x, y)[index] - result.planes.at(x, y).min()) for x, y in _grid(window, 40, edges=True))
    assert exact >= sampled - 1e-9
    assert exact == pytest.approx(sampled, abs=1e-9)


@settings(max_examples=20, deadline=None)
@given(st.sampled_from(ELEMENTS), st.floats(-1.5, 12), st.floats(0.1, 4), st.floats(-1.5, 1.5), st.floats(0.05, 1.0))
def test_max_dissolved_is_the_maximum_over_a_dense_sample(element, ph, ph_width, e, e_width):
    window = _window([ph, ph + ph_width], [e, e + e_width])
    result = diagram(element)
    exact, _ = max_dissolved(result, window)
    if exact is None:
        return
    solids = np.flatnonzero(~result.planes.dissolved)

    def sampled_at(x, y):
        values = result.planes.at(x, y)
        solid = int(solids[np.argmin(values[solids])])
        return log10_dissolved_at(result, solid, x, y)

    n = 40
    values = np.array([sampled_at(x, y) for x, y in _grid(window, n, edges=True)]).reshape(n, n)
    sampled = values.max()
    # Between grid points the function can rise by at most about one neighbour-to-neighbour step
    # (it is piecewise smooth), which bounds what the grid can miss.
    step = max(np.abs(np.diff(values, axis=0)).max(), np.abs(np.diff(values, axis=1)).max())
    assert exact >= sampled - 1e-6
    assert exact <= sampled + step + 1e-6


def test_point_on_a_boundary_takes_the_less_noble_side():
    # Zn/Zn2+ at 10^-6 lies at E = -0.7621 - 0.1775 = -0.9396 V (Nernst); exactly on it the point reports corrosion
    result = diagram("Zn")
    line = next(b for b in result.boundaries if {b.first.name, b.second.name} == {"Zn", "Zn^2+"})
    assert result.stable_species_at(3.0, line.intercept).name == "Zn^2+"
    assert region_pieces(result, _window(3.0, line.intercept))[0].region == "corrosion"
    assert result.stable_species_at(3.0, line.intercept - 1e-6).name == "Zn"


def test_segment_fractions_are_by_length():
    # A vertical segment at pH 3 from -1.4 to -0.4 V crosses the Zn/Zn2+ line at -0.9396 V: 46.0% immunity by length.
    window = _window(3.0, [-1.4, -0.4])
    assert window.dimension == 1
    fractions = region_fractions(region_pieces(diagram("Zn"), window))
    assert fractions["immunity"] == pytest.approx((1.4 - 0.9396) / 1.0, abs=1e-3)
    assert fractions["corrosion"] == pytest.approx(1 - fractions["immunity"], abs=1e-12)


def test_margin_of_a_point_below_the_copper_line():
    # Cu at pH 2, 0.0 V vs SHE: the Cu2+ line at 10^-6 is 0.340 - 0.1775 = 0.1625 V (Bard, Parsons & Jordan 1985, E° = 0.340 V)
    margin, capped = potential_margin(diagram("Cu"), _window(2.0, 0.0), {"immunity"})
    assert margin == pytest.approx(0.1625, abs=0.005)
    assert not capped


def test_margin_is_negative_inside_corrosion():
    # Zn at pH 3, -0.5 V: the window must move down to -0.9396 V to reach immunity: margin -440 mV.
    margin, _ = potential_margin(diagram("Zn"), _window(3.0, -0.5), {"immunity"})
    assert margin == pytest.approx(-(0.9396 - 0.5), abs=0.002)


def test_margin_zero_when_touching():
    result = diagram("Zn")
    line = next(b for b in result.boundaries if {b.first.name, b.second.name} == {"Zn", "Zn^2+"})
    margin, _ = potential_margin(result, _window(3.0, [line.intercept - 0.2, line.intercept]), {"immunity"})
    assert margin == pytest.approx(0.0, abs=1e-6)


@settings(max_examples=20, deadline=None)
@given(st.sampled_from(ELEMENTS), st.floats(0, 13), st.floats(0, 2), st.floats(-1.5, 1.2), st.floats(0, 0.6),
       st.sampled_from([("immunity",), ("immunity", "passivation")]))
def test_margin_matches_a_scan_of_shifts(element, ph, ph_width, e, e_width, accept):
    """Shift the window in 2 mV steps and find the first shift where it meets an unacceptable region (sampled check)."""
    window = _window([ph, ph + ph_width], [e, e + e_width])
    result = diagram(element)
    margin, capped = potential_margin(result, window, set(accept))
    if capped:
        return

    samples = np.vstack([_grid(window, 12), window.vertices])

    def acceptable(shift):
        return all(result.stable_species_at(x, y + shift).region in accept for x, y in samples)

    if margin > 0.004:
        assert acceptable(0.0)
        assert acceptable(margin - 0.003) and acceptable(-(margin - 0.003))
    elif margin < -0.004:
        assert not acceptable(0.0) or not acceptable(0.002) or not acceptable(-0.002)
