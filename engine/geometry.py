"""Convex polygons in the (pH, E) plane: clipping by half-planes, area, containment.

A polygon is an (n, 2) array of vertices in counter-clockwise order with, for
each edge k (from vertex k to vertex k+1), an integer label saying which line
made it: the index of the competing species, or a negative number for the
window's own edges. Clipping a convex polygon by a half-plane keeps it convex
(Sutherland & Hodgman, Commun. ACM 17, 32, 1974).
"""

from dataclasses import dataclass

import numpy as np

EPS = 1e-12
"""Tolerance on a half-plane's value below which a vertex counts as on the line."""

WINDOW_EDGE = -1
"""Label of an edge that belongs to the plot or operating window."""


def rectangle(x_min: float, x_max: float, y_min: float, y_max: float) -> tuple[np.ndarray, np.ndarray]:
    """The rectangle [x_min, x_max] × [y_min, y_max], counter-clockwise, with window labels."""
    vertices = np.array([[x_min, y_min], [x_max, y_min], [x_max, y_max], [x_min, y_max]], dtype=float)
    return vertices, np.full(4, WINDOW_EDGE, dtype=int)


def clip(vertices: np.ndarray, labels: np.ndarray, a: float, b: float, c: float,
         label: int) -> tuple[np.ndarray, np.ndarray]:
    """Keep the part of a convex polygon where a + b·x + c·y ≤ 0; new edges get ``label``.

    >>> v, l = rectangle(0, 2, 0, 2)
    >>> v, l = clip(v, l, -1.0, 1.0, 0.0, 7)   # keep x <= 1
    >>> area(v)
    2.0
    """
    if len(vertices) == 0:
        return vertices, labels
    given = vertices.tolist()
    points, kept_labels = _clip_points(given, labels.tolist(), a, b, c, label)
    if points is given:
        return vertices, labels
    return np.array(points, dtype=float).reshape(-1, 2), np.array(kept_labels, dtype=int)


def _clip_points(points: list, edge_labels: list, a: float, b: float, c: float, label: int) -> tuple[list, list]:
    """:func:`clip` on plain lists of [x, y] points and edge labels (no arrays: this is the inner loop)."""
    count = len(points)
    values = [a + b * x + c * y for x, y in points]
    scale = EPS * max(1.0, abs(a), abs(b), abs(c))
    inside = [v <= scale for v in values]
    if all(inside):
        return points, edge_labels
    if not any(inside):
        return [], []
    out_points, out_labels = [], []
    for k in range(count):
        j = (k + 1) % count
        if inside[k]:
            out_points.append(points[k])
            out_labels.append(edge_labels[k])
            if not inside[j]:
                out_points.append(_crossing(points[k], points[j], values[k], values[j]))
                out_labels.append(label)
        elif inside[j]:
            out_points.append(_crossing(points[k], points[j], values[k], values[j]))
            out_labels.append(edge_labels[k])
    kept_points, kept_labels = [], []
    for k, point in enumerate(out_points):  # drop zero-length edges left where the line met a vertex
        following = out_points[(k + 1) % len(out_points)]
        if len(out_points) == 1 or abs(following[0] - point[0]) + abs(following[1] - point[1]) > 1e-12:
            kept_points.append(point)
            kept_labels.append(out_labels[k])
    if not kept_points:  # every point coincides: the piece has shrunk to a single point
        kept_points, kept_labels = out_points[:1], out_labels[:1]
    return kept_points, kept_labels


def _crossing(p: list, q: list, value_p: float, value_q: float) -> list:
    """The point where the segment p→q crosses the line on which the half-plane value is zero."""
    t = value_p / (value_p - value_q)
    return [p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])]


def area(vertices: np.ndarray) -> float:
    """Area of a simple polygon by the shoelace formula (positive when counter-clockwise).

    >>> area(rectangle(0, 3, 0, 2)[0])
    6.0
    """
    count = len(vertices)
    if count < 3:
        return 0.0
    points = vertices.tolist()
    total = 0.0
    for k in range(count):
        x0, y0 = points[k]
        x1, y1 = points[(k + 1) % count]
        total += x0 * y1 - x1 * y0
    return 0.5 * total


def contains(vertices: np.ndarray, x: float, y: float, tolerance: float = 1e-9) -> bool:
    """True when (x, y) lies inside or on a counter-clockwise convex polygon."""
    if len(vertices) < 3:
        return False
    following = np.roll(vertices, -1, axis=0)
    cross = (following[:, 0] - vertices[:, 0]) * (y - vertices[:, 1]) - (following[:, 1] - vertices[:, 1]) * (x - vertices[:, 0])
    return bool((cross >= -tolerance).all())


def is_convex(vertices: np.ndarray, tolerance: float = 1e-9) -> bool:
    """True when a counter-clockwise polygon turns left (or goes straight) at every vertex."""
    if len(vertices) < 3:
        return False
    edges = np.roll(vertices, -1, axis=0) - vertices
    following = np.roll(edges, -1, axis=0)
    cross = edges[:, 0] * following[:, 1] - edges[:, 1] * following[:, 0]
    return bool((cross >= -tolerance).all())


def edge_half_planes(vertices: np.ndarray) -> list[tuple[float, float, float]]:
    """The half-planes a + b·x + c·y ≤ 0 whose intersection is a counter-clockwise convex polygon."""
    points = vertices.tolist()
    planes = []
    for k, (px, py) in enumerate(points):
        qx, qy = points[(k + 1) % len(points)]
        dx, dy = qx - px, qy - py
        planes.append((-dy * px + dx * py, dy, -dx))
    return planes


def intersect(piece: np.ndarray, half_planes: list[tuple[float, float, float]]) -> np.ndarray:
    """The part of ``piece`` (a convex polygon, a segment or a point) inside a convex polygon given by its half-planes."""
    points = piece.tolist()
    labels = [WINDOW_EDGE] * len(points)
    for a, b, c in half_planes:
        if not points:
            break
        points, labels = _clip_points(points, labels, a, b, c, WINDOW_EDGE)
    return np.array(points, dtype=float).reshape(-1, 2)


def measure(vertices: np.ndarray, dimension: int) -> float:
    """Size of a piece: area (dimension 2), length (1) or 1 for a non-empty point (0).

    >>> measure(np.array([[0.0, 0.0], [3.0, 4.0]]), 1)
    5.0
    """
    if len(vertices) == 0:
        return 0.0
    if dimension == 2:
        return abs(area(vertices))
    if dimension == 1:
        spread = vertices[:, None, :] - vertices[None, :, :]
        return float(np.sqrt((spread ** 2).sum(axis=2)).max())
    return 1.0


@dataclass(frozen=True)
class VerticalProfile:
    """A convex piece seen along E: its pH span and its lower and upper edges as functions of pH.

    Each edge is a chain of vertices with increasing pH, so ``numpy.interp`` evaluates it exactly.
    """

    x_min: float
    x_max: float
    lower: tuple[np.ndarray, np.ndarray]
    upper: tuple[np.ndarray, np.ndarray]

    def below(self, x: np.ndarray) -> np.ndarray:
        """The lowest E of the piece at each pH in ``x`` (within the span)."""
        return np.interp(x, *self.lower)

    def above(self, x: np.ndarray) -> np.ndarray:
        """The highest E of the piece at each pH in ``x`` (within the span)."""
        return np.interp(x, *self.upper)


def vertical_profile(vertices: np.ndarray) -> VerticalProfile:
    """The profile of a counter-clockwise convex polygon, a segment or a point.

    Walking counter-clockwise from the lowest of the leftmost vertices runs along the lower edge
    to the rightmost vertices, then back along the upper edge.

    >>> p = vertical_profile(rectangle(0, 2, 0, 1)[0])
    >>> p.below(np.array([1.0])).tolist(), p.above(np.array([1.0])).tolist()
    ([0.0], [1.0])
    """
    points = vertices.tolist()
    xs = [x for x, _ in points]
    x_min, x_max = min(xs), max(xs)
    if x_max - x_min <= 1e-12:  # a point or a vertical segment
        ys = [y for _, y in points]
        return VerticalProfile(x_min, x_max, (np.array([x_min]), np.array([min(ys)])),
                               (np.array([x_min]), np.array([max(ys)])))
    if len(points) == 2:  # a slanted or horizontal segment: both edges are the segment
        line = _chain(sorted(points))
        return VerticalProfile(x_min, x_max, line, line)
    left = [k for k, x in enumerate(xs) if x <= x_min + 1e-12]
    right = [k for k, x in enumerate(xs) if x >= x_max - 1e-12]
    height = lambda k: points[k][1]  # noqa: E731
    lower = _walk(points, min(left, key=height), min(right, key=height))
    upper = _walk(points, max(right, key=height), max(left, key=height))[::-1]
    return VerticalProfile(x_min, x_max, _chain(lower), _chain(upper))


def _walk(points: list, first: int, last: int) -> list:
    """The vertices met walking counter-clockwise from index ``first`` to index ``last``, both included."""
    chain, k = [points[first]], first
    while k != last:
        k = (k + 1) % len(points)
        chain.append(points[k])
    return chain


def _chain(points: list) -> tuple[np.ndarray, np.ndarray]:
    return np.array([p[0] for p in points]), np.array([p[1] for p in points])


def vertical_overlap_shifts(piece: VerticalProfile, polygon: VerticalProfile) -> tuple[float, float] | None:
    """The interval of vertical shifts δ for which ``piece`` + (0, δ) meets the convex ``polygon``.

    Over the pH span they share, the largest shift is max(upper_polygon − lower_piece), a concave
    piecewise-linear function, and the smallest min(lower_polygon − upper_piece), a convex one:
    both reach their extremes at a vertex pH of either piece or at an end of the span, so
    evaluating there is exact. None when they share no pH.

    >>> square = vertical_profile(rectangle(0, 1, 0, 1)[0])
    >>> vertical_overlap_shifts(vertical_profile(np.array([[0.5, 3.0]])), square)
    (-3.0, -2.0)
    """
    low, high = max(piece.x_min, polygon.x_min), min(piece.x_max, polygon.x_max)
    if low > high + 1e-12:
        return None  # no pH in common: no vertical shift can make them meet
    high = max(low, high)
    xs = np.clip(np.concatenate((piece.lower[0], piece.upper[0], polygon.lower[0], polygon.upper[0], (low, high))),
                 low, high)
    largest = (polygon.above(xs) - piece.below(xs)).max()
    smallest = (polygon.below(xs) - piece.above(xs)).min()
    return float(smallest), float(largest)
