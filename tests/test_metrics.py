"""Screening metrics against brute force: dense-grid fractions and densely sampled maxima (sampling is the check, not the method).

The brute force is vectorised over the sample points (one numpy pass per window) and computed here from the
planes alone, independently of ``engine.metrics``.
"""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from electrosieve.engine.catalog import default_catalog
from electrosieve.engine.constants import thermal_voltage
from electrosieve.engine.diagram import diagram
from electrosieve.engine.domains import SEVERITY, TIE, PlotLimits
from electrosieve.engine.metrics import largest_gap, margin, overlays, region_fractions
from electrosieve.engine.window import operating_window

CATALOG = default_catalog()
ELEMENTS = sorted(CATALOG.systems)


def _window(ph, potential, scale="SHE"):
    return operating_window(CATALOG.scales, ph, potential, scale, 25.0, PlotLimits())


def _grid(window, n=120, edges=False):
    """Points filling the window uniformly: a midpoint grid (or, with ``edges``, a grid including the
    window's edges and corners) on a possibly slanted area, n points on a segment, or the point."""
    v = window.vertices
    u = np.linspace(0, 1, n) if edges else (np.arange(n) + 0.5) / n
    if window.dimension == 0:
        return v[:1]
    if window.dimension == 1:
        return v[0] + np.linspace(0, 1, n)[:, None] * (v[1] - v[0])
    a, b = np.meshgrid(u, u, indexing="ij")
    bottom = v[0] + a[..., None] * (v[1] - v[0])
    top = v[3] + a[..., None] * (v[2] - v[3])
    return (bottom + b[..., None] * (top - bottom)).reshape(-1, 2)


def _values(planes, points):
    """Φ of every species (columns) at every point (rows) [eV per metal atom]."""
    return planes.offset + planes.ph_slope * points[:, :1] + planes.e_slope * points[:, 1:]


def _stable(planes, points):
    """Index of the most stable species at each point, ties settled as ``engine.domains.stable_index_at`` does."""
    values = _values(planes, points)
    tied = values <= values.min(axis=1, keepdims=True) + TIE
    severity = np.array([SEVERITY[region] for region in planes.regions])
    rank = severity * values.shape[1] - np.arange(values.shape[1])
    return np.where(tied, rank, -np.inf).argmax(axis=1)


def _overlay(result, window):
    return overlays([result], window)[0]


def _instability(result, window, phase):
    return largest_gap(_overlay(result, window).gaps[result.planes.index_of[phase]], window)


def _margin(result, window, accept):
    return margin(_overlay(result, window), result, window, accept)


def _fractions(result, window):
    return region_fractions(list(_overlay(result, window).pieces))


def _log10_dissolved(planes, points):
    """log10 Σ m_j·a_j over dissolved species j in equilibrium with the most stable solid, at each point.

    Equilibrium: Φ_j° + (RT/F)·ln a_j / m_j = Φ_solid, with Φ_j° the plane at unit activity.
    """
    values = _values(planes, points)
    kt = thermal_voltage(planes.temperature_k)
    solids = ~planes.dissolved
    solid_values = np.where(solids, values, np.inf).min(axis=1, keepdims=True)
    m = planes.metal_atoms
    standard = values - kt * np.log(planes.activity) / m
    activities = np.exp(m * (solid_values - standard) / kt)
    return np.log10(np.where(planes.dissolved, m * activities, 0.0).sum(axis=1))


@settings(max_examples=25, deadline=None)
@given(st.sampled_from(ELEMENTS), st.floats(-1.5, 11), st.floats(0.1, 5), st.floats(-2.0, 1.5), st.floats(0.05, 1.4),
       st.sampled_from(["SHE", "RHE"]))
def test_region_fractions_match_a_dense_grid(element, ph, ph_width, e, e_width, scale):
    window = _window([ph, ph + ph_width], [e, e + e_width], scale)
    result = diagram(element)
    exact = _fractions(result, window)
    regions = np.array(result.planes.regions)[_stable(result.planes, _grid(window))]
    for region in exact:
        sampled = float(np.mean(regions == region))
        # a 120 x 120 midpoint grid resolves a boundary crossing the window to about 2 cells (common practice)
        assert exact[region] == pytest.approx(sampled, abs=0.02)


@settings(max_examples=25, deadline=None)
@given(st.sampled_from(sorted(CATALOG.materials)), st.floats(-1.5, 12), st.floats(0.0, 4), st.floats(-2.0, 1.5),
       st.floats(0.0, 1.2), st.sampled_from(["SHE", "RHE", "SCE"]))
def test_instability_is_the_maximum_over_a_dense_sample(material_id, ph, ph_width, e, e_width, scale):
    material = CATALOG.materials[material_id]
    window = _window([ph, ph + ph_width], [e, e + e_width], scale)
    result = diagram(material.element)
    exact, _ = _instability(result, window, material.phase)
    values = _values(result.planes, _grid(window, 40, edges=True))
    sampled = float((values[:, result.planes.index_of[material.phase]] - values.min(axis=1)).max())
    assert exact >= sampled - 1e-9
    assert exact == pytest.approx(sampled, abs=1e-9)


@settings(max_examples=20, deadline=None)
@given(st.sampled_from(ELEMENTS), st.floats(-1.5, 12), st.floats(0.1, 4), st.floats(-1.5, 1.5), st.floats(0.05, 1.0))
def test_max_dissolved_is_the_maximum_over_a_dense_sample(element, ph, ph_width, e, e_width):
    window = _window([ph, ph + ph_width], [e, e + e_width])
    result = diagram(element)
    exact = _overlay(result, window).dissolved
    if exact is None:
        return
    n = 40
    values = _log10_dissolved(result.planes, _grid(window, n, edges=True)).reshape(n, n)
    sampled = values.max()
    # Between grid points the function can rise by at most about one neighbour-to-neighbour step
    # (it is piecewise smooth), which bounds what the grid can miss.
    step = max(np.abs(np.diff(values, axis=0)).max(), np.abs(np.diff(values, axis=1)).max())
    assert exact >= sampled - 1e-6
    assert exact <= sampled + step + 1e-6


def test_the_vectorised_brute_force_agrees_with_the_engine_point_by_point():
    # the sampled checks below rest on _stable: it must settle every point, boundaries included, as the engine does
    result = diagram("Zn")
    line = next(b for b in result.boundaries if {b.first.name, b.second.name} == {"Zn", "Zn^2+"})
    points = np.vstack([_grid(_window([0, 14], [-1.8, 1.8]), 30, edges=True), [[3.0, line.intercept]]])
    expected = [result.planes.index_of[result.stable_species_at(x, y).name] for x, y in points]
    assert _stable(result.planes, points).tolist() == expected


def test_point_on_a_boundary_takes_the_less_noble_side():
    # Zn/Zn2+ at 10^-6 lies at E = -0.7621 - 0.1775 = -0.9396 V (Nernst); exactly on it the point reports corrosion
    result = diagram("Zn")
    line = next(b for b in result.boundaries if {b.first.name, b.second.name} == {"Zn", "Zn^2+"})
    assert result.stable_species_at(3.0, line.intercept).name == "Zn^2+"
    assert _overlay(result, _window(3.0, line.intercept)).pieces[0].region == "corrosion"
    assert result.stable_species_at(3.0, line.intercept - 1e-6).name == "Zn"


def test_segment_fractions_are_by_length():
    # A vertical segment at pH 3 from -1.4 to -0.4 V crosses the Zn/Zn2+ line at -0.9396 V: 46.0% immunity by length.
    window = _window(3.0, [-1.4, -0.4])
    assert window.dimension == 1
    fractions = _fractions(diagram("Zn"), window)
    assert fractions["immunity"] == pytest.approx((1.4 - 0.9396) / 1.0, abs=1e-3)
    assert fractions["corrosion"] == pytest.approx(1 - fractions["immunity"], abs=1e-12)


def test_margin_of_a_point_below_the_copper_line():
    # Cu at pH 2, 0.0 V vs SHE: the Cu2+ line at 10^-6 is 0.340 - 0.1775 = 0.1625 V (Bard, Parsons & Jordan 1985, E° = 0.340 V)
    margin, capped = _margin(diagram("Cu"), _window(2.0, 0.0), {"immunity"})
    assert margin == pytest.approx(0.1625, abs=0.005)
    assert not capped


def test_margin_is_negative_inside_corrosion():
    # Zn at pH 3, -0.5 V: the window must move down to -0.9396 V to reach immunity: margin -440 mV.
    margin, _ = _margin(diagram("Zn"), _window(3.0, -0.5), {"immunity"})
    assert margin == pytest.approx(-(0.9396 - 0.5), abs=0.002)


def test_margin_zero_when_touching():
    result = diagram("Zn")
    line = next(b for b in result.boundaries if {b.first.name, b.second.name} == {"Zn", "Zn^2+"})
    margin, _ = _margin(result, _window(3.0, [line.intercept - 0.2, line.intercept]), {"immunity"})
    assert margin == pytest.approx(0.0, abs=1e-6)


@settings(max_examples=20, deadline=None)
@given(st.sampled_from(ELEMENTS), st.floats(0, 13), st.floats(0, 2), st.floats(-1.5, 1.2), st.floats(0, 0.6),
       st.sampled_from([("immunity",), ("immunity", "passivation")]))
def test_margin_matches_a_scan_of_shifts(element, ph, ph_width, e, e_width, accept):
    """Shift the window in 2 mV steps and find the first shift where it meets an unacceptable region (sampled check)."""
    window = _window([ph, ph + ph_width], [e, e + e_width])
    result = diagram(element)
    margin, capped = _margin(result, window, set(accept))
    if capped:
        return

    samples = np.vstack([_grid(window, 12), window.vertices])

    regions = np.array(result.planes.regions)

    def acceptable(shift):
        return bool(np.isin(regions[_stable(result.planes, samples + [0.0, shift])], accept).all())

    if margin > 0.004:
        assert acceptable(0.0)
        assert acceptable(margin - 0.003) and acceptable(-(margin - 0.003))
    elif margin < -0.004:
        assert not acceptable(0.0) or not acceptable(0.002) or not acceptable(-0.002)
