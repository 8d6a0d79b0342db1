"""Screening metrics of one element over an operating window, all exact (no sampling).

- ``region_fractions``: the share of the window in each domain, by area, length or point.
- ``instability``: max over the window of Φ_candidate − min Φ [eV per metal atom]; the
  function is convex and piecewise linear, so its maximum lies at a vertex of the window.
- ``max_dissolved``: the largest total dissolved-metal activity in equilibrium with the most
  stable solid; inside one solid's sub-domain its log is a log-sum-exp of linear functions
  (convex), so its maximum lies at a vertex of one of those sub-domains.
- ``potential_margin``: how far the window can shift along E before meeting an unacceptable
  domain, or (negative) how far it must shift to leave one.
"""

from dataclasses import dataclass

import numpy as np

from .constants import thermal_voltage
from .diagram import Diagram
from .domains import SEVERITY, lowest
from .geometry import intersect, measure, vertical_overlap_shifts
from .window import OperatingWindow


@dataclass(frozen=True)
class Piece:
    """One species' share of the window."""

    species: str
    region: str
    fraction: float


def region_pieces(diagram: Diagram, window: OperatingWindow) -> list[Piece]:
    """Each species' share of the window, largest first; shares sum to 1.

    When one species is the most stable at every vertex of the (convex) window it is the most
    stable over all of it, since each Φ_i − Φ_j is linear.
    """
    planes = diagram.planes
    holders = {lowest(planes, values) for values in planes.at_points(window.vertices)}
    if len(holders) == 1:
        species = planes.species[holders.pop()]
        return [Piece(species.name, species.region, 1.0)]
    sizes = []
    for domain in _overlapping(diagram.domains, window.vertices):
        size = measure(_common_part(domain, window), window.dimension)
        if size > 0:
            sizes.append((domain.species, size))
    total = sum(size for _, size in sizes)
    pieces = [Piece(s.name, s.region, size / total) for s, size in sizes if size / total > 1e-12]
    return sorted(pieces, key=lambda p: -p.fraction)


def _common_part(domain, window: OperatingWindow) -> np.ndarray:
    """The vertices of domain ∩ window: the domain clipped by the window's edges (an area), or the
    window (a segment or point) clipped by the domain's."""
    if window.dimension == 2:
        return intersect(domain.vertices, window.half_planes)
    return intersect(window.vertices, domain.half_planes)


def _overlapping(domains, vertices: np.ndarray) -> list:
    """The domains whose bounding box meets the window's."""
    low_x, low_y = vertices.min(axis=0).tolist()
    high_x, high_y = vertices.max(axis=0).tolist()
    tolerance = 1e-12
    return [d for d in domains if not (d.bounds[0] > high_x + tolerance or d.bounds[2] < low_x - tolerance
                                       or d.bounds[1] > high_y + tolerance or d.bounds[3] < low_y - tolerance)]


def region_fractions(pieces: list[Piece]) -> dict[str, float]:
    """Fractions of the window in immunity, passivation and corrosion."""
    fractions = {region: 0.0 for region in SEVERITY}
    for piece in pieces:
        fractions[piece.region] += piece.fraction
    return {region: round(value, 12) for region, value in fractions.items()}


def vertex_gaps(diagram: Diagram, window: OperatingWindow) -> list[list[float]]:
    """Φ_i − min Φ [eV per metal atom] for each species i (rows) at each window corner (columns)."""
    values = diagram.planes.at_points(window.vertices)
    return (values - values.min(axis=1, keepdims=True)).T.tolist()


def largest_gap(gaps: list[float], window: OperatingWindow) -> tuple[float, tuple[float, float]]:
    """(the largest of one species' corner gaps, the first corner where it occurs)."""
    top = max(gaps)
    corner = next(k for k, gap in enumerate(gaps) if gap >= top - 1e-12)
    return max(top, 0.0), window.corners[corner]


def instability(diagram: Diagram, window: OperatingWindow, species_name: str) -> tuple[float, tuple[float, float]]:
    """(max of Φ_candidate − min Φ over the window [eV per metal atom], the corner where it occurs)."""
    return largest_gap(vertex_gaps(diagram, window)[diagram.planes.index_of[species_name]], window)


def log10_dissolved_at(diagram: Diagram, solid: int, ph: float, potential: float) -> float:
    """log10 of Σ m_j·a_j over dissolved species j in equilibrium with solid ``solid`` at one point."""
    return float(_log10_dissolved(diagram.planes, np.array([[ph, potential]]), np.array([solid]))[0])


def _log10_dissolved(planes, points: np.ndarray, solids: np.ndarray) -> np.ndarray:
    """log10 Σ m_j·a_j at each point, each in equilibrium with its own solid.

    Equilibrium with the solid: Φ_j° + (RT/F)·ln a_j / m_j = Φ_solid, so
    ln a_j = m_j·(Φ_solid − Φ_j°)/(RT/F), with Φ_j° the plane at unit activity.
    """
    kt = thermal_voltage(planes.temperature_k)
    values = planes.at_points(points)
    dissolved = planes.dissolved
    m = planes.metal_atoms[dissolved]
    standard = values[:, dissolved] - kt * np.log(planes.activity) / m
    solid_values = values[np.arange(len(points)), solids][:, None]
    exponents = np.log(m) + m * (solid_values - standard) / kt
    top = exponents.max(axis=1, keepdims=True)
    return (top[:, 0] + np.log(np.exp(exponents - top).sum(axis=1))) / np.log(10.0)


def max_dissolved(diagram: Diagram, window: OperatingWindow) -> tuple[float | None, tuple[float, float] | None]:
    """(largest log10 total dissolved metal [mol/kg, ≈ M] over the window, where it occurs); None without dissolved species."""
    planes = diagram.planes
    if not planes.dissolved.any():
        return None, None
    corners, solids = [], []
    for domain in _overlapping(diagram.solid_domains, window.vertices):
        part = _common_part(domain, window).tolist()
        corners.extend(part)
        solids.extend([domain.index] * len(part))
    if not corners:
        return None, None
    values = _log10_dissolved(planes, np.array(corners), np.array(solids))
    best = int(np.argmax(values >= values.max() - 1e-12))
    ph, e = corners[best]
    return float(values[best]), (float(ph), float(e))


def potential_margin(diagram: Diagram, window: OperatingWindow, accept: set[str]) -> tuple[float, bool]:
    """(signed margin [V], capped): shift along E to first meet an unacceptable domain (≥ 0),
    or minus the shift needed to leave the unacceptable ones (< 0).

    ``capped`` is True when the answer is limited by the diagram's own potential window.
    """
    plot = diagram.window
    low_cap = plot.e_min - window.vertices[:, 1].min()
    high_cap = plot.e_max - window.vertices[:, 1].max()
    intervals = []
    for domain in diagram.domains:
        if domain.region in accept:
            continue
        shifts = vertical_overlap_shifts(window.profile, domain.profile)
        if shifts is not None:
            intervals.append(shifts)
    intervals.sort()
    merged: list[list[float]] = []
    for start, end in intervals:
        if merged and start <= merged[-1][1] + 1e-9:
            merged[-1][1] = max(merged[-1][1], end)
        else:
            merged.append([start, end])
    tolerance = 1e-9
    for start, end in merged:
        if abs(start) <= tolerance or abs(end) <= tolerance:
            return 0.0, False  # the window touches an unacceptable domain
        if start < 0 < end:
            escapes = []
            if end < high_cap - tolerance:
                escapes.append(end)
            if start > low_cap + tolerance:
                escapes.append(-start)
            if not escapes:
                return -min(end, -start), True
            return -min(escapes), False
    above = min([start for start, _ in merged if start > 0], default=np.inf)
    below = min([-end for _, end in merged if end < 0], default=np.inf)
    up = (above, False) if above <= high_cap else (high_cap, True)
    down = (below, False) if below <= -low_cap else (-low_cap, True)
    distance, capped = min(up, down)
    return float(distance), capped
