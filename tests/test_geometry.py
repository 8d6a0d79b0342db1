"""Convex-polygon clipping, area and containment."""

import numpy as np
from hypothesis import assume, example, given, settings
from hypothesis import strategies as st

from engine.geometry import area, clip, contains, is_convex, rectangle


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
def test_two_complementary_clips_tile_the_rectangle(a, b, c):
    assume(max(abs(a), abs(b), abs(c)) > 1e-6)
    vertices, labels = rectangle(-1, 2, -1, 1)
    kept, _ = clip(vertices, labels, a, b, c, 0)
    other, _ = clip(vertices, labels, -a, -b, -c, 1)
    assert abs(area(kept) + area(other) - area(vertices)) < 1e-9
    for polygon in (kept, other):
        if len(polygon) >= 3:
            assert is_convex(polygon)


def test_contains():
    vertices, _ = rectangle(0, 1, 0, 1)
    assert contains(vertices, 0.5, 0.5)
    assert contains(vertices, 1.0, 0.5)
    assert not contains(vertices, 1.5, 0.5)
    assert not contains(np.zeros((0, 2)), 0, 0)


@settings(max_examples=150, deadline=None)
@given(st.floats(-2, 2), st.floats(0, 1.5), st.floats(-1, 1), st.floats(0, 0.8), st.floats(-3, 3), st.floats(-3, 3))
@example(x=1.0, width=1.0, y=0.0, height=0.0, a=0.0, b=0.0)  # a segment touching the square at one pH
def test_vertical_overlap_shifts_match_a_scan(x, width, y, height, a, b):
    """Shift the piece in small steps and test overlap with `intersect` (a sampled check of the exact interval)."""
    from engine.geometry import edge_half_planes, intersect, vertical_overlap_shifts, vertical_profile

    polygon, labels = rectangle(-1, 1, -1, 1)
    polygon, _ = clip(polygon, labels, -0.5, a * 0.3, b * 0.3 + 0.01, 0)  # a convex, possibly slanted shape
    if len(polygon) < 3:
        return
    corners = [[x, y], [x + width, y], [x + width, y + height], [x, y + height]]
    piece = np.unique(np.array(corners), axis=0) if (width == 0 or height == 0) else np.array(corners)
    if width == 0 and height == 0:
        piece = np.array([[x, y]])
    elif width == 0 or height == 0:
        piece = np.array([corners[0], corners[2]])
    shifts = vertical_overlap_shifts(vertical_profile(piece), vertical_profile(polygon))
    planes = edge_half_planes(polygon)
    meets = [d for d in np.linspace(-6, 6, 1201) if len(intersect(piece + np.array([0.0, d]), planes))]
    if shifts is None:
        assert not meets
        return
    low, high = shifts
    assert all(low - 1e-6 <= d <= high + 1e-6 for d in meets)
    if high - low > 0.03:
        assert meets and meets[0] <= low + 0.011 and meets[-1] >= high - 0.011


def test_clip_down_to_a_single_point_keeps_it():
    # A segment from (1, 0) to (2, 0) clipped to x <= 1 is the point (1, 0), not nothing.
    vertices, labels = clip(np.array([[1.0, 0.0], [2.0, 0.0]]), np.array([-1, -1]), -1.0, 1.0, 0.0, 3)
    assert vertices.tolist() == [[1.0, 0.0]]
