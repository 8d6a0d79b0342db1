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
from .diagram import check_number
from .domains import Window
from .errors import InputError
from .geometry import VerticalProfile, edge_half_planes, vertical_profile
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
    def half_planes(self) -> list[tuple[float, float, float]]:
        """The window as half-planes a + b·pH + c·E ≤ 0 (an area only; empty for a segment or a point)."""
        return edge_half_planes(self.vertices) if self.dimension == 2 else []

    @cached_property
    def profile(self) -> VerticalProfile:
        """The window's lower and upper edges as functions of pH."""
        return vertical_profile(self.vertices)


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


def operating_window(scales: dict, ph, potential, scale: str, temperature_c: float, plot: Window) -> OperatingWindow:
    """The operating window on the SHE scale, checked to lie inside the diagram window ``plot``."""
    scale = canonical_scale(scales, scale)
    ph_range = check_range(ph, "ph", plot.ph_min, plot.ph_max)
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
    if lowest < plot.e_min - 1e-9 or highest > plot.e_max + 1e-9:
        raise InputError(
            f"potential must stay within the diagram's {plot.e_min:g} to {plot.e_max:g} V vs SHE "
            f"(this window spans {lowest:.3f} to {highest:.3f} V vs SHE)", field="potential")
    dimension = 2 if len(unique) == 4 else (1 if len(unique) == 2 else 0)
    return OperatingWindow(corners=tuple((float(p), float(e)) for p, e in unique), dimension=dimension,
                           ph=ph_range, potential=e_range, scale=scale)
