"""The operating window: the cell's pH and potential ranges as a convex piece of the E–pH plane (vs SHE).

A pH range and a potential range on a fixed reference give a rectangle; on the
RHE the potential range follows the pH, E(SHE) = E(RHE) − (RT ln10/F)·pH, so
the window is a parallelogram (a slanted band). A point on one axis gives a
segment, a point on both a point: ``dimension`` is 2, 1 or 0.
"""

from dataclasses import dataclass
from functools import cached_property

import numpy as np

from .constants import ZERO_CELSIUS
from .domains import PlotLimits
from .errors import InputError
from .inputs import check_number
from .scales import canonical_scale, to_she


@dataclass(frozen=True)
class OperatingWindow:
    """The window's corners ((pH, E vs SHE), …) counter-clockwise, and its dimension (2, 1 or 0).

    Equal windows compare and hash equal, so results computed over one can be reused.
    """

    corners: tuple[tuple[float, float], ...]
    dimension: int
    ph: tuple[float, float]
    potential: tuple[float, float]
    scale: str

    @cached_property
    def vertices(self) -> np.ndarray:
        """The corners as an (n, 2) array [[pH, E vs SHE], …]."""
        return np.array(self.corners, dtype=float)

    @cached_property
    def band(self) -> "Band":
        """The window as a band of the E–pH plane (see :class:`Band`)."""
        corners = self.corners
        if self.dimension == 2:
            (p0, bottom_left), (p1, bottom_right), _, (_, top_left) = corners
            slope = (bottom_right - bottom_left) / (p1 - p0)
            return Band(p0, p1, slope, bottom_left - slope * p0, top_left - slope * p0)
        if self.dimension == 1:
            (x0, y0), (x1, y1) = corners
            if abs(x1 - x0) > 1e-12:  # a potential held on a pH range: a band of zero height
                slope = (y1 - y0) / (x1 - x0)
                return Band(min(x0, x1), max(x0, x1), slope, y0 - slope * x0, y0 - slope * x0)
            return Band(x0, x0, 0.0, min(y0, y1), max(y0, y1))  # one pH, a potential range
        (x, y), = corners
        return Band(x, x, 0.0, y, y)


@dataclass(frozen=True)
class Band:
    """ph_low ≤ pH ≤ ph_high and low ≤ E − slope·pH ≤ high [V vs SHE].

    Every operating window is such a band: its potential edges are parallel, of slope 0 on a fixed
    reference and −RT ln10/F on the RHE. Shearing E' = E − slope·pH (which keeps areas and vertical
    distances) turns it into the rectangle [ph_low, ph_high] × [low, high].
    """

    ph_low: float
    ph_high: float
    slope: float
    low: float
    high: float


def check_range(values, field: str, low: float, high: float, unit: str = "") -> tuple[float, float]:
    """A (low, high) pair from a number or a two-element list, finite, ordered and within [low, high]."""
    if isinstance(values, (list, tuple)):
        if len(values) not in (1, 2):
            raise InputError(f"{field} must be a number or a [low, high] pair (given {len(values)} values)", field=field)
        pair = [check_number(v, field) for v in values]
    else:
        pair = [check_number(values, field)]
    start, end = pair[0], pair[-1]
    if start > end:
        raise InputError(f"{field} range is inverted ({start:g} to {end:g}): give it low to high", field=field)
    if start < low or end > high:
        raise InputError(f"{field} must lie between {low:g} and {high:g}{unit} (given {start:g} to {end:g})", field=field)
    return start, end


def operating_window(scales: dict, ph, potential, scale: str, temperature_c: float, limits: PlotLimits) -> OperatingWindow:
    """The operating window on the SHE scale, checked to lie inside the diagram's plot ``limits``."""
    scale = canonical_scale(scales, scale)
    ph_range = check_range(ph, "ph", limits.ph_min, limits.ph_max)
    e_range = check_range(potential, "potential", -1e3, 1e3, " V")
    temperature_k = temperature_c + ZERO_CELSIUS
    corners_ph = [ph_range[0], ph_range[1], ph_range[1], ph_range[0]]
    corners_e = [e_range[0], e_range[0], e_range[1], e_range[1]]
    corners = [(p, to_she(scales, e, scale, p, temperature_k)) for p, e in zip(corners_ph, corners_e)]
    unique = []
    for point in corners:
        if not any(abs(point[0] - q[0]) < 1e-12 and abs(point[1] - q[1]) < 1e-12 for q in unique):
            unique.append(point)
    lowest, highest = min(e for _, e in unique), max(e for _, e in unique)
    if lowest < limits.e_min - 1e-9 or highest > limits.e_max + 1e-9:
        raise InputError(
            f"potential must stay within the diagram's {limits.e_min:g} to {limits.e_max:g} V vs SHE "
            f"(this window spans {lowest:.3f} to {highest:.3f} V vs SHE)", field="potential")
    dimension = 2 if len(unique) == 4 else (1 if len(unique) == 2 else 0)
    return OperatingWindow(corners=tuple((float(p), float(e)) for p, e in unique), dimension=dimension,
                           ph=ph_range, potential=e_range, scale=scale)
