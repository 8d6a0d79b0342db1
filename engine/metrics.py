"""Screening metrics of elements over an operating window, all exact (no sampling).

The window is a band of the E–pH plane (``engine.window.Band``). Shearing E' = E − slope·pH turns it
into a rectangle, and every domain polygon of every element is clipped by it at once
(``engine.geometry.clip_stack``): first by its pH edges, then by its potential edges.

``overlays`` answers every question below for many diagrams at once:

- ``pieces`` (and ``region_fractions``): the share of the window in each domain, by area, length or point.
- ``gaps`` (and ``largest_gap``): max over the window of Φ_candidate − min Φ [eV per metal atom]; the
  function is convex and piecewise linear, so its maximum lies at a corner of the window.
- ``dissolved``: the largest total dissolved-metal activity in equilibrium with the most
  stable solid; inside one solid's sub-domain its log is a log-sum-exp of linear functions
  (convex), so its maximum lies at a vertex of one of those sub-domains.
- ``reach`` (and ``margin``): how far the window can shift along E before meeting an unacceptable
  domain, or (negative) how far it must shift to leave one. Clipped to the window's pH edges, a
  domain spans E' from its lowest to its highest point; the window meets it exactly for the
  shifts from lowest − high to highest − low.
"""

from dataclasses import dataclass

import numpy as np

from .constants import thermal_voltage
from .diagram import Diagram
from .domains import SEVERITY, TIE
from .geometry import clip_stack, stack_areas
from .window import OperatingWindow


@dataclass(frozen=True)
class Piece:
    """One species' share of the window."""

    species: str
    region: str
    fraction: float


@dataclass(frozen=True)
class Overlay:
    """What the window meets on one element's diagram."""

    pieces: tuple[Piece, ...]
    """Each species' share of the window, largest first; shares sum to 1."""
    reach: tuple[tuple[str, float, float], ...]
    """(region, lowest, highest) vertical shift [V] at which the window meets each domain it can meet."""
    dissolved: float | None
    """Largest log10 total dissolved metal over the window; None without dissolved species."""
    dissolved_at: tuple[float, float] | None
    gaps: list[list[float]]
    """Φ_i − min Φ [eV per metal atom] of each species i (rows) at each window corner (columns)."""


def overlays(diagrams: list[Diagram], window: OperatingWindow) -> list[Overlay]:
    """The overlay of ``window`` on each diagram, every polygon clipped in one pass."""
    band = window.band
    stacks = [d.outline_stack for d in diagrams]
    width = max(s.shape[1] for s in stacks)
    points = np.concatenate([_widen(s, width) for s in stacks])
    points[..., 1] -= band.slope * points[..., 0]  # shear: the band becomes a rectangle
    alive = np.ones(len(points), dtype=bool)
    points, alive = clip_stack(points, alive, band.ph_low, -1.0, 0.0)
    points, alive = clip_stack(points, alive, -band.ph_high, 1.0, 0.0)
    reach_low = points[..., 1].min(axis=1) - band.high
    reach_high = points[..., 1].max(axis=1) - band.low
    reaches = alive.copy()
    points, alive = clip_stack(points, alive, band.low, 0.0, -1.0)
    points, alive = clip_stack(points, alive, -band.high, 0.0, 1.0)
    sizes = _sizes(points, alive, window)
    points[..., 1] += band.slope * points[..., 0]  # back to E vs SHE
    table = _SpeciesTable(diagrams)
    corner_values = table.values_at(np.arange(len(diagrams))[:, None], window.vertices[None, :, :])
    holders = table.lowest(corner_values)
    gaps = corner_values - corner_values.min(axis=2, keepdims=True)
    solid_rows, solid_owner, solid_element, domain_rows = [], [], [], []
    row = 0
    for k, diagram in enumerate(diagrams):
        count = len(diagram.domains)
        domain_rows.append(range(row, row + count))
        solids = diagram.solid_domains
        solid_rows.extend(range(row + count, row + count + len(solids)))
        solid_owner.extend(d.index for d in solids)
        solid_element.extend([k] * len(solids))
        row += count + len(solids)
    dissolved = _largest_dissolved(table, np.array(solid_element), np.array(solid_owner), points[solid_rows],
                                   alive[solid_rows])
    results = []
    for k, diagram in enumerate(diagrams):
        rows, regions = domain_rows[k], diagram.planes.regions
        results.append(Overlay(
            pieces=_pieces(diagram, holders[k], sizes[rows.start:rows.stop], window),
            reach=tuple((regions[d.index], float(reach_low[r]), float(reach_high[r]))
                        for d, r in zip(diagram.domains, rows) if reaches[r]),
            dissolved=dissolved[k][0], dissolved_at=dissolved[k][1],
            gaps=gaps[k, :, :len(regions)].T.tolist()))
    return results


def _widen(points: np.ndarray, width: int) -> np.ndarray:
    """A stack padded to ``width`` points per polygon by repeating each last point."""
    missing = width - points.shape[1]
    return points if not missing else np.concatenate([points, np.repeat(points[:, -1:], missing, axis=1)], axis=1)


def _sizes(points: np.ndarray, alive: np.ndarray, window: OperatingWindow) -> np.ndarray:
    """Each clipped polygon's share of the window by area (an area window), length along a segment
    (taken along the axis the segment spans: a common factor) or presence (a point)."""
    if window.dimension == 2:
        return np.where(alive, np.abs(stack_areas(points)), 0.0)
    if window.dimension == 1:
        axis = 1 if window.band.ph_low == window.band.ph_high else 0
        return np.where(alive, np.ptp(points[..., axis], axis=1), 0.0)
    return alive.astype(float)


def _pieces(diagram: Diagram, holders: np.ndarray, sizes: np.ndarray, window: OperatingWindow) -> tuple[Piece, ...]:
    """Each species' share from the clipped sizes of its domains.

    When one species is the most stable at every corner of the (convex) window it is the most
    stable over all of it, since each Φ_i − Φ_j is linear: then it holds the whole window, which
    also settles a point or a segment lying on a boundary (:func:`engine.domains.stable_index_at`).
    """
    if window.dimension == 0 or len(set(holders.tolist())) == 1:
        species = diagram.planes.species[int(holders[0])]
        return (Piece(species.name, species.region, 1.0),)
    total = float(sizes.sum())
    pieces = [Piece(d.species.name, d.region, float(size) / total)
              for d, size in zip(diagram.domains, sizes) if size / total > 1e-12]
    return tuple(sorted(pieces, key=lambda p: -p.fraction))


class _SpeciesTable:
    """The planes of several diagrams side by side, padded to one width (padding never the lowest)."""

    def __init__(self, diagrams: list[Diagram]):
        width = max(len(d.planes.species) for d in diagrams)
        shape = (len(diagrams), width)
        self.offset, self.ph_slope, self.e_slope = np.full(shape, np.inf), np.zeros(shape), np.zeros(shape)
        self.metal_atoms, self.severity = np.ones(shape), np.zeros(shape)
        self.dissolved = np.zeros(shape, dtype=bool)
        self.kt = np.array([thermal_voltage(d.planes.temperature_k) for d in diagrams])
        self.log_activity = np.log([d.planes.activity for d in diagrams])
        for k, d in enumerate(diagrams):
            planes, size = d.planes, len(d.planes.species)
            self.offset[k, :size], self.ph_slope[k, :size], self.e_slope[k, :size] = planes.offset, planes.ph_slope, planes.e_slope
            self.metal_atoms[k, :size], self.dissolved[k, :size] = planes.metal_atoms, planes.dissolved
            self.severity[k, :size] = [SEVERITY[region] for region in planes.regions]

    def values_at(self, rows: np.ndarray, points: np.ndarray) -> np.ndarray:
        """Φ of every species (last axis) of diagram ``rows`` at ``points`` [..., (pH, E)]."""
        x, y = points[..., :1], points[..., 1:]
        return self.offset[rows] + self.ph_slope[rows] * x + self.e_slope[rows] * y

    def lowest(self, values: np.ndarray) -> np.ndarray:
        """Index of the lowest Φ along the last axis, ties settled as :func:`engine.domains.stable_index_at` does."""
        tied = values <= values.min(axis=-1, keepdims=True) + TIE
        rank = self.severity[:, None, :] * values.shape[-1] - np.arange(values.shape[-1])
        return np.where(tied, rank, -np.inf).argmax(axis=-1)


def _largest_dissolved(table: _SpeciesTable, elements: np.ndarray, owners: np.ndarray, points: np.ndarray,
                       alive: np.ndarray) -> list[tuple[float | None, tuple[float, float] | None]]:
    """For each diagram of ``table``: (largest log10 Σ m_j·a_j over the points, where), or (None, None).

    Row r of ``points`` holds the vertices of one solid's part of the window: the solid ``owners[r]``
    of diagram ``elements[r]``. Equilibrium with the solid: Φ_j° + (RT/F)·ln a_j / m_j = Φ_solid, so
    ln a_j = m_j·(Φ_solid − Φ_j°)/(RT/F), with Φ_j° the plane at unit activity.
    """
    rows = elements[:, None]
    values = table.values_at(rows, points)
    kt = table.kt[rows][..., None]
    m = table.metal_atoms[rows]
    standard = values - kt * table.log_activity[rows][..., None] / m
    solid_values = np.take_along_axis(values, owners[:, None, None], axis=2)
    with np.errstate(invalid="ignore", divide="ignore"):  # padding, solids and dead rows are masked out
        exponents = np.where(table.dissolved[rows], np.log(m) + m * (solid_values - standard) / kt, -np.inf)
        top = exponents.max(axis=2)
        ok = np.isfinite(top) & alive[:, None]
        safe_top = np.where(ok, top, 0.0)
        total = np.log(np.exp(exponents - safe_top[..., None]).sum(axis=2))
    logs = np.where(ok, (safe_top + total) / np.log(10.0), -np.inf)
    answers: list[tuple[float | None, tuple[float, float] | None]] = [(None, None)] * len(table.kt)
    if not len(elements):
        return answers
    starts = np.flatnonzero(np.r_[True, elements[1:] != elements[:-1]])  # rows come grouped by diagram
    best = np.maximum.reduceat(logs.max(axis=1), starts)
    counts = np.diff(np.r_[starts, len(elements)])
    hits = np.flatnonzero((logs >= np.repeat(best - 1e-12, counts)[:, None]).ravel())
    width = logs.shape[1]
    firsts = hits[np.minimum(np.searchsorted(hits, starts * width), len(hits) - 1)] if len(hits) else []
    flat_points = points.reshape(-1, 2)
    for k, value, first in zip(elements[starts].tolist(), best.tolist(), list(firsts)):
        if np.isfinite(value):
            ph, e = flat_points[first].tolist()
            answers[k] = (float(logs.ravel()[first]), (ph, e))
    return answers


def region_fractions(pieces: list[Piece]) -> dict[str, float]:
    """Fractions of the window in immunity, passivation and corrosion."""
    fractions = {region: 0.0 for region in SEVERITY}
    for piece in pieces:
        fractions[piece.region] += piece.fraction
    return fractions


def largest_gap(gaps: list[float], window: OperatingWindow) -> tuple[float, tuple[float, float]]:
    """(the largest of one species' corner gaps, the first corner where it occurs)."""
    top = max(gaps)
    corner = next(k for k, gap in enumerate(gaps) if gap >= top - 1e-12)
    return max(top, 0.0), window.corners[corner]


def margin(overlay: Overlay, diagram: Diagram, window: OperatingWindow, accept: set[str]) -> tuple[float, bool]:
    """(signed margin [V], capped): shift along E to first meet an unacceptable domain (≥ 0),
    or minus the shift needed to leave the unacceptable ones (< 0).

    ``capped`` is True when the answer is limited by the diagram's own potential limits.
    """
    plot = diagram.limits
    low_cap = plot.e_min - window.vertices[:, 1].min()
    high_cap = plot.e_max - window.vertices[:, 1].max()
    intervals = sorted((low, high) for region, low, high in overlay.reach if region not in accept)
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
