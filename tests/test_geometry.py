"""Convex-polygon clipping, area and containment."""

import numpy as np
from hypothesis import assume, given, settings
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
