"""Exact stability domains: the lower envelope of the free-energy planes, clipped to a limits.

Species i is stable where Φ_i ≤ Φ_j for every j: an intersection of
half-planes, hence a convex polygon (Pourbaix 1966, Atlas, ch. 2). Each
domain is computed by clipping the limits with the half-plane of the
competitor that is most violated at the current vertices, until no vertex is
violated; for a convex polygon and linear constraints that proves the whole
polygon satisfies them, so the result is exact, not sampled.
"""

from dataclasses import dataclass

import numpy as np

from .geometry import EPS, WINDOW_EDGE, area, clip, rectangle
from .planes import Planes
from .species import Species

MIN_DOMAIN_AREA = 1e-12
"""Domains smaller than this fraction of the window's area are touching points or lines, not areas, and are
dropped (relative, as :func:`geometry.clip` treats slivers, so a tiny window still has its domains)."""


@dataclass(frozen=True)
class PlotLimits:
    """A rectangle of the E–pH plane: pH [–] and E [V vs SHE]."""

    ph_min: float = -2.0
    ph_max: float = 16.0
    e_min: float = -3.0
    e_max: float = 3.0

    @property
    def area(self) -> float:
        return (self.ph_max - self.ph_min) * (self.e_max - self.e_min)


@dataclass(frozen=True)
class Domain:
    """Where one species is the most stable: a convex polygon with its edges' neighbour indices."""

    index: int
    species: Species
    vertices: np.ndarray
    neighbours: np.ndarray

    @property
    def region(self) -> str:
        return self.species.region

    @property
    def area(self) -> float:
        return area(self.vertices)


@dataclass(frozen=True)
class Boundary:
    """The line between two neighbouring domains: E = intercept + slope·pH, or pH = ph for a vertical one."""

    first: Species
    second: Species
    start: tuple[float, float]
    end: tuple[float, float]
    intercept: float | None
    slope: float | None
    ph: float | None

    @property
    def equation(self) -> str:
        """The line as a hand derivation writes it, E in V vs SHE."""
        if self.ph is not None:
            return f"pH = {self.ph:.3f}"
        sign = "-" if self.slope < 0 else "+"
        return f"E = {self.intercept:.4f} {sign} {abs(self.slope):.4f} pH"


def envelope_piece(planes: Planes, index: int, vertices: np.ndarray, labels: np.ndarray,
                   competitors: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray]:
    """The part of a convex polygon (or segment, or point) where species ``index`` has the lowest Φ.

    Only species flagged in the boolean mask ``competitors`` compete (all by default). Each step
    clips by the competitor most violated at the current vertices; when no vertex is violated the
    whole convex piece satisfies every constraint, so the result is exact.
    """
    d_offset = planes.offset[index] - planes.offset
    d_ph = planes.ph_slope[index] - planes.ph_slope
    d_e = planes.e_slope[index] - planes.e_slope
    done = np.zeros(len(planes.offset), dtype=bool) if competitors is None else ~competitors
    done[index] = True
    while len(vertices):
        excess = d_offset[None, :] + d_ph[None, :] * vertices[:, :1] + d_e[None, :] * vertices[:, 1:]
        worst = excess.max(axis=0)
        worst[done] = -np.inf
        competitor = int(np.argmax(worst))
        tolerance = EPS * max(1.0, abs(d_offset[competitor]), abs(d_ph[competitor]), abs(d_e[competitor]))
        if worst[competitor] <= tolerance:
            break
        vertices, labels = clip(vertices, labels, d_offset[competitor], d_ph[competitor], d_e[competitor], competitor)
        done[competitor] = True
    return vertices, labels


def domain_of(planes: Planes, index: int, limits: PlotLimits, competitors: np.ndarray | None = None) -> Domain | None:
    """The domain of species ``index`` within ``limits``, or None when it is nowhere the most stable."""
    vertices, labels = envelope_piece(planes, index, *rectangle(limits.ph_min, limits.ph_max, limits.e_min, limits.e_max),
                                      competitors=competitors)
    if len(vertices) < 3 or area(vertices) < MIN_DOMAIN_AREA * limits.area:
        return None
    return Domain(index=index, species=planes.species[index], vertices=vertices, neighbours=labels)


def stability_domains(planes: Planes, limits: PlotLimits, competitors: np.ndarray | None = None) -> list[Domain]:
    """Every non-empty domain in ``limits``, in catalog order; together they tile the limits.

    With a boolean mask ``competitors`` only those species take part (e.g. the solids alone).
    """
    indices = range(len(planes.species)) if competitors is None else np.flatnonzero(competitors)
    return [d for i in indices if (d := domain_of(planes, int(i), limits, competitors)) is not None]


def boundaries(planes: Planes, domains: list[Domain]) -> list[Boundary]:
    """The lines between neighbouring domains, each reported once."""
    present = {d.index for d in domains}
    lines = []
    for domain in domains:
        count = len(domain.vertices)
        for k, other in enumerate(domain.neighbours):
            if other == WINDOW_EDGE or other not in present or other < domain.index:
                continue
            start = domain.vertices[k]
            end = domain.vertices[(k + 1) % count]
            lines.append(_boundary(planes, domain.index, int(other), start, end))
    return lines


def _boundary(planes: Planes, i: int, j: int, start: np.ndarray, end: np.ndarray) -> Boundary:
    """Φ_i = Φ_j solved for E (or for pH when both planes have the same E slope)."""
    d_offset = planes.offset[i] - planes.offset[j]
    d_ph = planes.ph_slope[i] - planes.ph_slope[j]
    d_e = planes.e_slope[i] - planes.e_slope[j]
    first, second = planes.species[i], planes.species[j]
    points = (float(start[0]), float(start[1])), (float(end[0]), float(end[1]))
    if abs(d_e) > 1e-12:
        return Boundary(first, second, *points, intercept=float(-d_offset / d_e), slope=float(-d_ph / d_e), ph=None)
    return Boundary(first, second, *points, intercept=None, slope=None, ph=float(-d_offset / d_ph))


TIE = 1e-9
"""Two Φ values closer than this [eV] are equal: the point lies on a boundary."""

SEVERITY = {"immunity": 0, "passivation": 1, "hydride": 2, "corrosion": 3}
"""On a boundary a point takes the less noble side: corrosion over passivation over immunity."""


def stable_index_at(planes: Planes, ph: float, potential: float) -> int:
    """Index of the species with the lowest Φ at (pH, E vs SHE [V]).

    On a boundary (Φ tied within :data:`TIE`) the species of the most severe region wins
    (:data:`SEVERITY`), then the earliest in catalog order: a documented, conservative answer.
    """
    values = planes.at(ph, potential)
    tied = np.flatnonzero(values <= values.min() + TIE)
    if len(tied) == 1:
        return int(tied[0])
    return int(max(tied, key=lambda i: (SEVERITY[planes.species[i].region], -i)))
