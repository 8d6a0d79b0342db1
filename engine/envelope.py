"""Stability domains of many diagrams at once: :func:`engine.domains.envelope_piece` run in lockstep.

Every (diagram, species) pair is one row of a padded polygon stack. Each step, every row still
violated picks its own most violated competitor and is clipped by that half-plane, all rows in one
numpy pass; the arithmetic, the order of the clips, the tidying of repeated and straight-through
vertices and the sliver rule are those of :func:`engine.geometry.clip` and
:func:`engine.domains.domain_of`, so every domain comes out with the same vertices and edge labels,
bit for bit (``tests/test_envelope.py`` holds the two against each other). The result is exact, not
sampled: a convex polygon whose vertices satisfy every linear constraint satisfies it everywhere
(Pourbaix 1966, Atlas, ch. 2; Sutherland & Hodgman 1974).
"""

from dataclasses import dataclass

import numpy as np

from .domains import MIN_DOMAIN_AREA, PlotLimits
from .geometry import EPS, SLIVER, rectangle
from .planes import Planes


@dataclass(frozen=True)
class Job:
    """One diagram's domains to find: ``planes`` within ``limits``, only species flagged in ``competitors``
    (all when None) taking part, as :func:`engine.domains.stability_domains` takes them."""

    planes: Planes
    limits: PlotLimits
    competitors: np.ndarray | None = None


class _Stack:
    """Rows of convex polygons, each of ``count`` real vertices, padded with its last vertex and label."""

    def __init__(self, points: np.ndarray, labels: np.ndarray, count: np.ndarray):
        self.points, self.labels, self.count = points, labels, count

    def repad(self) -> None:
        """Pad every row after its last real vertex with that vertex (and label), trimming the width."""
        width = max(int(self.count.max(initial=0)), 1)
        self.points, self.labels = self.points[:, :width], self.labels[:, :width]
        last = np.maximum(self.count - 1, 0)[:, None]
        pad = np.arange(width)[None, :] >= self.count[:, None]
        rows = np.arange(len(self.count))[:, None]
        self.points = np.where(pad[..., None], self.points[rows, last], self.points)
        self.labels = np.where(pad, self.labels[rows, last], self.labels)


def domains_of(jobs: list[Job]) -> list[list[tuple[int, np.ndarray, np.ndarray]]]:
    """For each job, its non-empty domains as (species index, vertices, edge labels), in species order:
    what :func:`engine.domains.stability_domains` finds, computed for every job together."""
    width = max(len(job.planes.species) for job in jobs)
    table = np.zeros((3, len(jobs), width))
    taking_part = np.zeros((len(jobs), width), dtype=bool)
    for number, job in enumerate(jobs):
        planes, size = job.planes, len(job.planes.species)
        table[:, number, :size] = planes.offset, planes.ph_slope, planes.e_slope
        taking_part[number, :size] = True if job.competitors is None else job.competitors
    owners, indices = np.nonzero(taking_part)  # rows in job order, then species order
    d_off, d_ph, d_e = (part[owners, indices][:, None] - part[owners] for part in table)
    done = ~taking_part[owners]
    done[np.arange(len(owners)), indices] = True
    limits = [job.limits for job in jobs]
    boxes = np.array([rectangle(lim.ph_min, lim.ph_max, lim.e_min, lim.e_max)[0] for lim in limits])[owners]
    floors = np.array([MIN_DOMAIN_AREA * lim.area for lim in limits])[owners]
    stack = _Stack(boxes, np.full(boxes.shape[:2], -1, dtype=int), np.full(len(boxes), 4))
    # A species above one competitor by more than the tolerance at all four corners is above it everywhere in the
    # rectangle (Φ_i − Φ_j is linear), so no clipping order can leave it a vertex: its domain is empty.
    corners = d_off[:, None, :] + d_ph[:, None, :] * boxes[..., :1] + d_e[:, None, :] * boxes[..., 1:]
    scale = EPS * np.maximum(np.maximum(1.0, np.abs(d_off)), np.maximum(np.abs(d_ph), np.abs(d_e)))
    above = ((corners.min(axis=1) > scale) & ~done).any(axis=1)
    stack.count[above] = 0
    open_rows = np.flatnonzero(~above)
    while len(open_rows):
        points = stack.points[open_rows]
        x, y = points[..., :1], points[..., 1:]
        offs, phs, es = d_off[open_rows], d_ph[open_rows], d_e[open_rows]
        excess = offs[:, None, :] + phs[:, None, :] * x + es[:, None, :] * y
        worst = np.where(done[open_rows], -np.inf, excess.max(axis=1))
        competitor = worst.argmax(axis=1)
        at = np.arange(len(open_rows))
        a, b, c = offs[at, competitor], phs[at, competitor], es[at, competitor]
        tolerance = EPS * np.maximum(np.maximum(1.0, np.abs(a)), np.maximum(np.abs(b), np.abs(c)))
        active = (stack.count[open_rows] > 0) & (worst[at, competitor] > tolerance)
        open_rows = open_rows[active]  # a row with nothing left to clip never changes again
        if not len(open_rows):
            break
        _clip_rows(stack, open_rows, a[active], b[active], c[active], competitor[active], tolerance[active])
        done[open_rows, competitor[active]] = True
    found: list[list[tuple[int, np.ndarray, np.ndarray]]] = [[] for _ in jobs]
    areas = _shoelace(stack.points, stack.count)
    for row in range(len(boxes)):
        count = int(stack.count[row])
        if count < 3 or areas[row] < floors[row]:
            continue
        found[owners[row]].append((int(indices[row]), stack.points[row, :count].copy(),
                                   stack.labels[row, :count].copy()))
    return found


def _clip_rows(stack: _Stack, rows: np.ndarray, a: np.ndarray, b: np.ndarray, c: np.ndarray, label: np.ndarray,
               scale: np.ndarray) -> None:
    """:func:`engine.geometry.clip` of each of ``rows`` by its own half-plane a + b·x + c·y ≤ 0, in place:
    a row wholly inside is kept as it is, one wholly outside emptied, the others cut and tidied."""
    points, count = stack.points[rows], stack.count[rows]
    real = np.arange(points.shape[1])[None, :] < count[:, None]
    values = a[:, None] + b[:, None] * points[..., 0] + c[:, None] * points[..., 1]
    inside = values <= scale[:, None]
    stack.count[rows[~(inside & real).any(axis=1)]] = 0
    cut = np.flatnonzero((inside & real).any(axis=1) & ~(inside | ~real).all(axis=1))
    if not len(cut):
        return
    rows, points, count, real = rows[cut], points[cut], count[cut], real[cut]
    values, inside, label, labels = values[cut], inside[cut], label[cut], stack.labels[rows]
    width = points.shape[1]
    following = (np.arange(width)[None, :] + 1) % count[:, None]
    at = np.arange(len(rows))[:, None]
    next_points, next_values, next_inside = points[at, following], values[at, following], inside[at, following]
    crossing = real & (inside != next_inside)
    t = values / np.where(crossing, values - next_values, 1.0)
    crossings = points + t[..., None] * (next_points - points)
    candidates = np.stack((points, crossings), axis=2).reshape(len(rows), 2 * width, 2)
    candidate_labels = np.stack((labels, np.where(inside, label[:, None], labels)), axis=2).reshape(len(rows), 2 * width)
    kept = np.stack((inside & real, crossing), axis=2).reshape(len(rows), 2 * width)
    order = np.argsort(~kept, axis=1, kind="stable")
    clipped = _Stack(np.take_along_axis(candidates, order[..., None], axis=1),
                     np.take_along_axis(candidate_labels, order, axis=1), kept.sum(axis=1))
    clipped.repad()
    span = np.ptp(points, axis=1).max(axis=1)  # padding repeats real vertices: no change to the extent
    size = np.where(span > 0, span, np.maximum(1.0, np.abs(points).max(axis=(1, 2))))
    _tidy(clipped, size)
    whole = np.abs(_shoelace(points, count))
    piece = np.abs(_shoelace(clipped.points, clipped.count))
    sliver = (whole > 0) & ((clipped.count < 3) | (piece <= SLIVER * whole))
    _place(stack, rows, clipped.points, clipped.labels, np.where(sliver, 0, clipped.count))


def _widen(points: np.ndarray, labels: np.ndarray, width: int) -> tuple[np.ndarray, np.ndarray]:
    """A padded stack's arrays widened to ``width`` by repeating each row's last column."""
    extra = width - points.shape[1]
    if extra <= 0:
        return points, labels
    return (np.concatenate([points, np.repeat(points[:, -1:], extra, axis=1)], axis=1),
            np.concatenate([labels, np.repeat(labels[:, -1:], extra, axis=1)], axis=1))


def _place(stack: _Stack, rows: np.ndarray, points: np.ndarray, labels: np.ndarray, count: np.ndarray) -> None:
    """Write clipped (padded) rows back into the stack, widening it when a row gained a vertex."""
    width = max(stack.points.shape[1], points.shape[1])
    stack.points, stack.labels = _widen(stack.points, stack.labels, width)
    points, labels = _widen(points, labels, width)
    stack.points[rows], stack.labels[rows], stack.count[rows] = points, labels, count


def _tidy(stack: _Stack, size: np.ndarray) -> None:
    """:func:`engine.geometry._tidy` of every row, in place: each round drops the first repeated or
    straight-through vertex of each row, as the one-polygon loop does before it starts over."""
    while True:
        points, labels, count = stack.points, stack.labels, stack.count
        width = points.shape[1]
        k = np.arange(width)[None, :]
        real = k < count[:, None]
        modulus = np.maximum(count, 1)[:, None]
        following, before = (k + 1) % modulus, (k - 1) % modulus
        at = np.arange(len(count))[:, None]
        here, after, prior = points, points[at, following], points[at, before]
        tol = EPS * size[:, None]
        repeated = real & (count[:, None] > 1) & (
            np.abs(after[..., 0] - here[..., 0]) + np.abs(after[..., 1] - here[..., 1]) <= tol)
        turn = ((here[..., 0] - prior[..., 0]) * (after[..., 1] - here[..., 1])
                - (here[..., 1] - prior[..., 1]) * (after[..., 0] - here[..., 0]))
        straight = real & (count[:, None] >= 3) & (labels[at, before] == labels) & (
            np.abs(turn) <= EPS * size[:, None] * size[:, None])
        hit = repeated | straight
        changed = np.flatnonzero(hit.any(axis=1))
        if not len(changed):
            return
        first = hit[changed].argmax(axis=1)
        drop_point = np.where(repeated[changed, first], (first + 1) % count[changed], first)
        keep_points = np.arange(width)[None, :] != drop_point[:, None]
        keep_labels = np.arange(width)[None, :] != first[:, None]
        point_order = np.argsort(~keep_points, axis=1, kind="stable")
        label_order = np.argsort(~keep_labels, axis=1, kind="stable")
        stack.points[changed] = np.take_along_axis(points[changed], point_order[..., None], axis=1)
        stack.labels[changed] = np.take_along_axis(labels[changed], label_order, axis=1)
        stack.count[changed] = count[changed] - 1
        stack.repad()


def _shoelace(points: np.ndarray, count: np.ndarray) -> np.ndarray:
    """Signed area of each row's real vertices, summed term by term in vertex order as
    :func:`engine.geometry.area` sums them (so the sliver and area thresholds see the same numbers)."""
    width = points.shape[1]
    k = np.arange(width)[None, :]
    following = (k + 1) % np.maximum(count, 1)[:, None]
    at = np.arange(len(count))[:, None]
    after = points[at, following]
    terms = points[..., 0] * after[..., 1] - after[..., 0] * points[..., 1]
    return 0.5 * np.cumsum(np.where(k < count[:, None], terms, 0.0), axis=1)[:, -1]  # cumsum adds in order
