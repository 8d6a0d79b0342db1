"""Convex polygons in the (pH, E) plane: clipping by half-planes, area, containment.

A polygon is an (n, 2) array of vertices in counter-clockwise order with, for
each edge k (from vertex k to vertex k+1), an integer label saying which line
made it: the index of the competing species, or a negative number for the
window's own edges. Clipping a convex polygon by a half-plane keeps it convex
(Sutherland & Hodgman, Commun. ACM 17, 32, 1974).
"""

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
    count = len(vertices)
    if count == 0:
        return vertices, labels
    points = vertices.tolist()
    values = [a + b * x + c * y for x, y in points]
    scale = EPS * max(1.0, abs(a), abs(b), abs(c))
    inside = [v <= scale for v in values]
    if all(inside):
        return vertices, labels
    if not any(inside):
        return vertices[:0], labels[:0]
    edge_labels = labels.tolist()
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
    return np.array(kept_points, dtype=float).reshape(-1, 2), np.array(kept_labels, dtype=int)


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
    labels = np.full(len(piece), WINDOW_EDGE, dtype=int)
    for a, b, c in half_planes:
        piece, labels = clip(piece, labels, a, b, c, WINDOW_EDGE)
        if len(piece) == 0:
            break
    return piece


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


def convex_hull(points: np.ndarray) -> np.ndarray:
    """Counter-clockwise convex hull by Andrew's monotone chain (Andrew, Inf. Proc. Lett. 9, 216, 1979).

    >>> convex_hull(np.array([[0, 0], [1, 0], [1, 1], [0, 1], [0.5, 0.5]])).tolist()
    [[0.0, 0.0], [1.0, 0.0], [1.0, 1.0], [0.0, 1.0]]
    """
    unique = sorted({(float(x), float(y)) for x, y in points})
    if len(unique) <= 2:
        return np.array(unique, dtype=float)

    def cross(o, a, b):
        return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])

    lower: list = []
    for p in unique:
        while len(lower) >= 2 and cross(lower[-2], lower[-1], p) <= 0:
            lower.pop()
        lower.append(p)
    upper: list = []
    for p in reversed(unique):
        while len(upper) >= 2 and cross(upper[-2], upper[-1], p) <= 0:
            upper.pop()
        upper.append(p)
    return np.array(lower[:-1] + upper[:-1], dtype=float)


def vertical_overlap_shifts(piece: np.ndarray, polygon: np.ndarray) -> tuple[float, float] | None:
    """The interval of vertical shifts δ for which ``piece`` + (0, δ) meets the convex ``polygon``.

    The shifts form the intersection of the line x = 0 with the Minkowski sum polygon ⊕ (−piece),
    itself the convex hull of pairwise vertex differences (de Berg et al., Computational Geometry,
    3rd ed., 2008, §13.3). None when no vertical shift makes them meet.

    >>> square = rectangle(0, 1, 0, 1)[0]
    >>> vertical_overlap_shifts(np.array([[0.5, 3.0]]), square)
    (-3.0, -2.0)
    """
    if polygon[:, 0].min() > piece[:, 0].max() + 1e-12 or polygon[:, 0].max() < piece[:, 0].min() - 1e-12:
        return None  # no pH in common: no vertical shift can make them meet
    differences = (polygon[:, None, :] - piece[None, :, :]).reshape(-1, 2)
    hull = convex_hull(differences)
    xs, ys = hull[:, 0], hull[:, 1]
    if xs.min() > 1e-12 or xs.max() < -1e-12:
        return None
    crossings = list(ys[np.abs(xs) <= 1e-12])
    count = len(hull)
    for k in range(count):
        x0, y0 = hull[k]
        x1, y1 = hull[(k + 1) % count]
        if (x0 < 0 < x1) or (x1 < 0 < x0):
            crossings.append(y0 + (0 - x0) * (y1 - y0) / (x1 - x0))
    if not crossings:
        return None
    return float(min(crossings)), float(max(crossings))
