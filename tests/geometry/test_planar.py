"""Exact jig primitives: kerf offsets keep arcs as arcs and match shapely's
buffer (the reference), clipping, and inside-corner detection."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from shapely.geometry import Polygon

from fabplan.jig.shapes import (
    Arc,
    Contour,
    Line,
    clip_arc_x,
    contour_to_polygon,
    inside_corners,
    offset_contour,
    rounded_rect,
)

FINE = 0.25  # degrees per sampled arc step: chord error far below 0.001 mm here


@settings(max_examples=40, deadline=None, derandomize=True)
@given(w=st.floats(20, 800), h=st.floats(20, 500), r=st.floats(0, 10), k=st.floats(0.05, 4))
def test_grown_contour_area_change_is_perimeter_times_half_kerf(w, h, r, k):
    c = rounded_rect(0.0, 0.0, w, h, r)
    grown = offset_contour(c, k / 2)
    a0 = contour_to_polygon(c, FINE).area
    a1 = contour_to_polygon(grown, FINE).area
    # convex outline grown by g: area + perimeter*g + pi*g^2 (Steiner's formula)
    expected = c.length * k / 2 + math.pi * (k / 2) ** 2
    assert a1 - a0 == pytest.approx(expected, rel=1e-4)
    # and shapely's own buffer of the original agrees with the grown outline
    ref = contour_to_polygon(c, FINE).buffer(k / 2, quad_segs=90)
    assert ref.symmetric_difference(contour_to_polygon(grown, FINE)).area < 1e-3 * expected
    assert all(isinstance(s, (Line, Arc)) for s in grown.segments)


def test_grown_rounded_rect_keeps_true_arcs_with_bigger_radii():
    grown = offset_contour(rounded_rect(0, 0, 100, 50, 10.0), 0.15)
    arcs = [s for s in grown.segments if isinstance(s, Arc)]
    assert len(arcs) == 4 and all(a.radius == pytest.approx(10.15) for a in arcs)


def test_sharp_corners_grow_round_like_a_round_tool():
    grown = offset_contour(rounded_rect(0, 0, 100, 50, 0.0), 1.0)
    arcs = [s for s in grown.segments if isinstance(s, Arc)]
    assert [a.radius for a in arcs] == [1.0] * 4
    ref = Polygon([(0, 0), (100, 0), (100, 50), (0, 50)]).buffer(1.0, quad_segs=90)
    assert contour_to_polygon(grown, FINE).symmetric_difference(ref).area < 1e-3


def _notched(notch_r: float) -> Contour:
    """A strip 100 x 20 with one semicircular notch of `notch_r` in its top edge."""
    return Contour((Line((0, 0), (100, 0)), Line((100, 0), (100, 20)),
                    Line((100, 20), (50 + notch_r, 20)), Arc((50, 20), notch_r, 0.0, -180.0),
                    Line((50 - notch_r, 20), (0, 20)), Line((0, 20), (0, 0))))


def test_concave_arc_shrinks_and_matches_shapely_buffer():
    c = _notched(4.0)
    g = 0.2
    grown = offset_contour(c, g)
    notch = [s for s in grown.segments if isinstance(s, Arc) and s.sweep_deg < 0]
    assert notch[0].radius == pytest.approx(3.8)
    ref = contour_to_polygon(c, FINE).buffer(g, quad_segs=90)
    assert contour_to_polygon(grown, FINE).symmetric_difference(ref).area < 1e-3


def test_inside_corners_found_for_a_router_bit():
    assert inside_corners(rounded_rect(0, 0, 100, 50, 5.0), 3.175) == []
    tight = inside_corners(_notched(2.0), 3.175)
    assert len(tight) == 1 and tight[0][1] == pytest.approx(2.0)
    assert inside_corners(_notched(4.0), 3.175) == []
    ell = Contour((Line((0, 0), (60, 0)), Line((60, 0), (60, 20)), Line((60, 20), (20, 20)),
                   Line((20, 20), (20, 60)), Line((20, 60), (0, 60)), Line((0, 60), (0, 0))))
    assert inside_corners(ell, 3.175) == [((20, 20), 0.0)]


@pytest.mark.parametrize("start, sweep", [(0.0, 360.0), (30.0, 200.0), (-10.0, -250.0)])
def test_clipped_arc_pieces_cover_exactly_the_strip(start, sweep):
    arc = Arc((0.0, 0.0), 10.0, start, sweep)
    pieces = clip_arc_x(arc, -4.0, 3.0)
    # every piece lies in the strip, and their length is the arc's length there
    # (reference: dense sampling of the arc)
    n = 200_000
    inside = sum(1 for i in range(n)
                 if -4.0 <= arc.point(start + sweep * (i + 0.5) / n)[0] <= 3.0) / n
    assert sum(p.length for p in pieces) == pytest.approx(inside * arc.length, abs=1e-3)
    for p in pieces:
        for t in (0.0, 0.5, 1.0):
            assert -4.0 - 1e-9 <= p.point(p.start_deg + t * p.sweep_deg)[0] <= 3.0 + 1e-9
