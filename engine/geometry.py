"""Convex polygons in the (pH, E) plane: clipping by half-planes, area, containment.

A polygon is an (n, 2) array of vertices in counter-clockwise order with, for
each edge k (from vertex k to vertex k+1), an integer label saying which line
made it: the index of the competing species, or a negative number for the
window's own edges. Clipping a convex polygon by a half-plane keeps it convex
(Sutherland & Hodgman, Commun. ACM 17, 32, 1974). A stack is many polygons in
one (n, width, 2) array, padded by repeating vertices, so that one clip serves
them all (``clip_stack``).
"""

import numpy as np

EPS = 1e-12
"""Tolerance on a half-plane's value below which a vertex counts as on the line."""

SLIVER = 1e-12
"""Relative area below which a clipped piece of a polygon counts as empty (a line or a point, not an area)."""

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
    size = max(float(np.ptp(vertices[:, 0])), float(np.ptp(vertices[:, 1]))) or max(1.0, float(np.abs(vertices).max()))
    kept_points, kept_labels = _tidy(out_points, out_labels, size)
    whole = abs(_shoelace(points))
    if whole > 0 and (len(kept_points) < 3 or abs(_shoelace(kept_points)) <= SLIVER * whole):
        return vertices[:0], labels[:0]  # a line or a sliver cut from a real polygon: no area, so empty
    return np.array(kept_points, dtype=float).reshape(-1, 2), np.array(kept_labels, dtype=int)


def _tidy(points: list, labels: list, size: float) -> tuple[list, list]:
    """Drop repeated vertices (closer than EPS·size) and straight-through vertices between edges of one label.

    A piece that shrinks to one point keeps that point (a point window stays a point).
    """
    points, labels = list(points), list(labels)
    changed = True
    while changed and len(points) > 1:
        changed = False
        for k in range(len(points)):
            following = points[(k + 1) % len(points)]
            if abs(following[0] - points[k][0]) + abs(following[1] - points[k][1]) <= EPS * size:
                del points[(k + 1) % len(points)]  # the edge k→k+1 has no length; edge k+1 takes over
                del labels[k]
                changed = True
                break
            if len(points) >= 3:
                before = points[k - 1]
                turn = ((points[k][0] - before[0]) * (following[1] - points[k][1])
                        - (points[k][1] - before[1]) * (following[0] - points[k][0]))
                if labels[k - 1] == labels[k] and abs(turn) <= EPS * size * size:
                    del points[k], labels[k]
                    changed = True
                    break
    return points, labels


def _shoelace(points: list) -> float:
    """Signed area of a list of (x, y) vertices."""
    count = len(points)
    return 0.5 * sum(points[k][0] * points[(k + 1) % count][1] - points[(k + 1) % count][0] * points[k][1]
                     for k in range(count))


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


def stack(polygons: list[np.ndarray], width: int) -> np.ndarray:
    """Convex polygons as one (n, width, 2) array, each padded by repeating its last vertex.

    A repeated vertex adds a zero-length edge, which changes no area, no extent and no clip.

    >>> stack([rectangle(0, 1, 0, 1)[0]], 5)[0, 4].tolist()
    [0.0, 1.0]
    """
    points = np.empty((len(polygons), width, 2))
    for row, polygon in enumerate(polygons):
        count = len(polygon)
        points[row, :count] = polygon
        points[row, count:] = polygon[count - 1]
    return points


def clip_stack(points: np.ndarray, alive: np.ndarray, a, b, c) -> tuple[np.ndarray, np.ndarray]:
    """:func:`clip` of every polygon of a stack by the half-plane a + b·x + c·y ≤ 0, all at once: the same
    half-plane for every row (numbers ``a``, ``b``, ``c``) or one per row (arrays of the stack's length).

    Each edge k contributes its start vertex when inside and its crossing point when it crosses the
    line (Sutherland & Hodgman 1974); the kept points move to the front of their row, which is padded
    again with its last point. ``alive`` marks the rows that are not (yet) empty.

    >>> square = stack([rectangle(0, 2, 0, 2)[0]], 4)
    >>> half, alive = clip_stack(square, np.array([True]), -1.0, 1.0, 0.0)   # keep x <= 1
    >>> float(stack_areas(half)[0]), bool(alive[0])
    (2.0, True)
    """
    rows, width = points.shape[:2]
    a, b, c = (np.asarray(v, dtype=float).reshape(-1, 1) if np.ndim(v) else float(v) for v in (a, b, c))
    values = a + b * points[..., 0] + c * points[..., 1]
    scale = np.maximum(1.0, np.maximum(np.abs(a), np.maximum(np.abs(b), np.abs(c))))
    inside = values <= EPS * scale
    following = np.roll(points, -1, axis=1)
    following_values = np.roll(values, -1, axis=1)
    crossing = inside != np.roll(inside, -1, axis=1)
    t = values / np.where(crossing, values - following_values, 1.0)
    crossings = points + t[..., None] * (following - points)
    candidates = np.stack((points, crossings), axis=2).reshape(rows, 2 * width, 2)
    kept = np.stack((inside, crossing), axis=2).reshape(rows, 2 * width)
    counts = kept.sum(axis=1)
    new_width = max(int(counts.max(initial=0)), 1)
    order = np.argsort(~kept, axis=1, kind="stable")[:, :new_width]
    slots = np.minimum(np.arange(new_width)[None, :], np.maximum(counts - 1, 0)[:, None])
    order = np.take_along_axis(order, slots, axis=1)
    return np.take_along_axis(candidates, order[..., None], axis=1), alive & (counts > 0)


def stack_areas(points: np.ndarray) -> np.ndarray:
    """Shoelace area of every polygon of a stack (positive when counter-clockwise)."""
    x, y = points[..., 0], points[..., 1]
    return 0.5 * (x * np.roll(y, -1, axis=1) - np.roll(x, -1, axis=1) * y).sum(axis=1)
