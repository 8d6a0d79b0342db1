"""Convex-polygon clipping, area and containment."""

import numpy as np
import pytest
from hypothesis import assume, example, given, settings
from hypothesis import strategies as st

from electrosieve.engine.geometry import area, clip, contains, is_convex, rectangle


def test_clip_keeps_the_half_plane_and_labels_the_new_edge():
    vertices, labels = rectangle(0, 4, 0, 2)
    vertices, labels = clip(vertices, labels, -2.0, 1.0, 0.0, 5)  # keep x <= 2
    assert area(vertices) == 8 / 2
    assert 5 in labels.tolist()


def test_clip_outside_gives_empty_polygon():
    vertices, labels = rectangle(0, 1, 0, 1)
    vertices, _ = clip(vertices, labels, 5.0, 0.0, 0.0, 1)
    assert len(vertices) == 0


@settings(max_examples=200, deadline=None)
@given(st.floats(-5, 5), st.floats(-3, 3), st.floats(-3, 3))
@example(1e-05, 1e-05, 8.3e-15)  # a line along the rectangle's left edge: once gave a zero-area polygon
def test_two_complementary_clips_tile_the_rectangle(a, b, c):
    assume(max(abs(a), abs(b), abs(c)) > 1e-6)
    vertices, labels = rectangle(-1, 2, -1, 1)
    kept, _ = clip(vertices, labels, a, b, c, 0)
    other, _ = clip(vertices, labels, -a, -b, -c, 1)
    assert abs(area(kept) + area(other) - area(vertices)) < 1e-9
    for polygon in (kept, other):
        if len(polygon) >= 3:
            assert is_convex(polygon)


def test_clip_along_an_edge_leaves_nothing_or_the_whole():
    vertices, labels = rectangle(-1, 2, -1, 1)
    kept, _ = clip(vertices, labels, 1e-05, 1e-05, 8.3e-15, 0)  # keep x <= -1: only the left edge
    other, _ = clip(vertices, labels, -1e-05, -1e-05, -8.3e-15, 1)
    assert len(kept) == 0
    assert area(other) == pytest.approx(area(vertices))


def test_a_sliver_below_the_relative_area_is_empty_but_a_small_window_is_kept():
    vertices, labels = rectangle(0, 1, 0, 1)
    sliver, _ = clip(vertices, labels, -1e-14, 1.0, 0.0, 0)  # keep x <= 1e-14
    assert len(sliver) == 0
    tiny, tiny_labels = rectangle(7.0, 7.0 + 1e-6, 0.5, 0.5 + 1e-6)  # a window of area 1e-12
    half, _ = clip(tiny, tiny_labels, -(7.0 + 5e-7), 1.0, 0.0, 0)  # keep its left half
    assert area(half) == pytest.approx(5e-13, rel=1e-6)
    assert is_convex(half)


def test_clip_drops_repeated_and_straight_through_vertices():
    vertices = np.array([[0, 0], [1, 0], [1, 0], [2, 0], [2, 1], [0, 1]], dtype=float)
    labels = np.full(6, -1)
    kept, kept_labels = clip(vertices, labels, -3.0, 1.0, 0.0, 0)  # cuts nothing, so nothing is tidied
    assert len(kept) == 6
    kept, kept_labels = clip(vertices, labels, -1.5, 1.0, 0.0, 0)  # keep x <= 1.5
    assert kept.tolist() == [[0, 0], [1.5, 0], [1.5, 1], [0, 1]]
    assert kept_labels.tolist() == [-1, 0, -1, -1]


def test_contains():
    vertices, _ = rectangle(0, 1, 0, 1)
    assert contains(vertices, 0.5, 0.5)
    assert contains(vertices, 1.0, 0.5)
    assert not contains(vertices, 1.5, 0.5)
    assert not contains(np.zeros((0, 2)), 0, 0)


def _random_convex(seed: int) -> np.ndarray:
    """A convex polygon: a rectangle cut by a few random lines (test data only)."""
    rng = np.random.default_rng(seed)
    vertices, labels = rectangle(*sorted(rng.uniform(-3, 3, 2)), *sorted(rng.uniform(-3, 3, 2)))
    for _ in range(int(rng.integers(0, 4))):
        a, b, c = rng.uniform(-1, 1, 3)
        cut, cut_labels = clip(vertices, labels, a, b, c, 0)
        if len(cut) >= 3:
            vertices, labels = cut, cut_labels
    return vertices


@settings(max_examples=150, deadline=None)
@given(st.lists(st.integers(0, 10_000), min_size=1, max_size=6), st.floats(-1, 1), st.floats(-1, 1), st.floats(-1, 1))
@example(seeds=[1], a=0.0, b=1.0, c=0.0)  # a vertical line through the middle of the plane
def test_clip_stack_matches_clip_one_polygon_at_a_time(seeds, a, b, c):
    from electrosieve.engine.geometry import clip_stack, stack, stack_areas

    polygons = [_random_convex(seed) for seed in seeds]
    stacked, alive = clip_stack(stack(polygons, max(len(p) for p in polygons) + 2), np.ones(len(polygons), bool), a, b, c)
    for row, polygon in enumerate(polygons):
        one, _ = clip(polygon, np.zeros(len(polygon), dtype=int), a, b, c, 0)
        assert bool(alive[row]) == (len(one) > 0)
        if len(one):
            assert stack_areas(stacked[row:row + 1])[0] == pytest.approx(area(one), abs=1e-9)
            # the same points, each kept vertex or crossing once, the padding repeating them
            assert {tuple(np.round(p, 9)) for p in stacked[row]} == {tuple(np.round(p, 9)) for p in one}


def test_clip_down_to_a_single_point_keeps_it():
    # A segment from (1, 0) to (2, 0) clipped to x <= 1 is the point (1, 0), not nothing.
    vertices, labels = clip(np.array([[1.0, 0.0], [2.0, 0.0]]), np.array([-1, -1]), -1.0, 1.0, 0.0, 3)
    assert vertices.tolist() == [[1.0, 0.0]]
