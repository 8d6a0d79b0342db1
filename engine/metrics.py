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
from .domains import SEVERITY, TIE
from .geometry import intersect, measure, vertical_overlap_shifts
from .window import OperatingWindow



@dataclass(frozen=True)
class Piece:
    """One species' share of the window."""

    species: str
    region: str
    fraction: float


def region_pieces(diagram: Diagram, window: OperatingWindow) -> list[Piece]:
    """Each species' share of the window, largest first; shares sum to 1."""
    vertices = window.vertices
    if window.dimension == 0:
        species = diagram.stable_species_at(*vertices[0])
        return [Piece(species.name, species.region, 1.0)]
    holders = {diagram.stable_species_at(*v) for v in vertices}
    if len(holders) == 1:
        species = holders.pop()
        if all(_inside(diagram, species, v) for v in vertices):
            return [Piece(species.name, species.region, 1.0)]
    sizes = []
    for domain in _overlapping(diagram.domains, vertices):
        size = measure(intersect(vertices, domain.half_planes), window.dimension)
        if size > 0:
            sizes.append((domain.species, size))
    total = sum(size for _, size in sizes)
    pieces = [Piece(s.name, s.region, size / total) for s, size in sizes if size / total > 1e-12]
    return sorted(pieces, key=lambda p: -p.fraction)


def _overlapping(domains, vertices: np.ndarray) -> list:
    """The domains whose bounding box meets the window's."""
    low_x, low_y = vertices.min(axis=0).tolist()
    high_x, high_y = vertices.max(axis=0).tolist()
    tolerance = 1e-12
    return [d for d in domains if not (d.bounds[0] > high_x + tolerance or d.bounds[2] < low_x - tolerance
                                       or d.bounds[1] > high_y + tolerance or d.bounds[3] < low_y - tolerance)]


def _inside(diagram: Diagram, species, point) -> bool:
    values = diagram.planes.at(*point)
    index = diagram.planes.species.index(species)
    return values[index] <= values.min() + TIE


def region_fractions(pieces: list[Piece]) -> dict[str, float]:
    """Fractions of the window in immunity, passivation and corrosion."""
    fractions = {region: 0.0 for region in SEVERITY}
    for piece in pieces:
        fractions[piece.region] += piece.fraction
    return {region: round(value, 12) for region, value in fractions.items()}


def instability(diagram: Diagram, window: OperatingWindow, species_name: str) -> tuple[float, tuple[float, float]]:
    """(max of Φ_candidate − min Φ over the window [eV per metal atom], the vertex where it occurs)."""
    planes = diagram.planes
    index = [s.name for s in planes.species].index(species_name)
    best = (-1.0, (0.0, 0.0))
    for ph, e in window.vertices:
        values = planes.at(ph, e)
        gap = float(values[index] - values.min())
        if gap > best[0] + 1e-12:
            best = (gap, (float(ph), float(e)))
    return max(best[0], 0.0), best[1]


def log10_dissolved_at(diagram: Diagram, solid: int, ph: float, potential: float) -> float:
    """log10 of Σ m_j·a_j over dissolved species j in equilibrium with solid ``solid`` at one point.

    Equilibrium with the solid: Φ_j° + (RT/F)·ln a_j / m_j = Φ_solid, so
    ln a_j = m_j·(Φ_solid − Φ_j°)/(RT/F), with Φ_j° the plane at unit activity.
    """
    planes = diagram.planes
    kt = thermal_voltage(planes.temperature_k)
    values = planes.at(ph, potential)
    dissolved = planes.dissolved
    m = planes.metal_atoms[dissolved]
    standard = values[dissolved] - kt * np.log(planes.activity) / m
    exponents = np.log(m) + m * (values[solid] - standard) / kt
    top = exponents.max()
    return float((top + np.log(np.exp(exponents - top).sum())) / np.log(10.0))


def max_dissolved(diagram: Diagram, window: OperatingWindow) -> tuple[float | None, tuple[float, float] | None]:
    """(largest log10 total dissolved metal [mol/kg, ≈ M] over the window, where it occurs); None without dissolved species."""
    planes = diagram.planes
    if not planes.dissolved.any():
        return None, None
    best: tuple[float, tuple[float, float]] | None = None
    for domain in _overlapping(diagram.solid_domains, window.vertices):
        for ph, e in intersect(window.vertices, domain.half_planes).tolist():
            value = log10_dissolved_at(diagram, domain.index, ph, e)
            if best is None or value > best[0] + 1e-12:
                best = (value, (float(ph), float(e)))
    return best if best else (None, None)


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
        shifts = vertical_overlap_shifts(window.vertices, domain.vertices)
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
