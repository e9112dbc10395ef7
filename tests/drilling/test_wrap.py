"""Where a hole falls on a strip wrapped round its support."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.drilling.records import DrillPattern
from fabplan.drilling.wrap import around_mm, exit_angle_deg, face_edges_mm


def test_round_support_arc_length():
    # source: arc length s = r theta (any geometry text): pi D theta / 360
    d = 40.0
    assert around_mm("round", d, 90.0) == pytest.approx(math.pi * d / 4)
    assert around_mm("round", d, 270.0) == pytest.approx(-math.pi * d / 4)
    assert abs(around_mm("round", d, 180.0)) == pytest.approx(math.pi * d / 2)


def test_square_face_centres_and_corners():
    # source: the perimeter of a square of side a is 4 a; face centres are a apart round it
    a = 25.4
    assert around_mm("square", a, 0.0) == pytest.approx(0.0)
    assert around_mm("square", a, 90.0) == pytest.approx(a)
    assert around_mm("square", a, 270.0) == pytest.approx(-a)
    assert around_mm("square", a, 45.0) == pytest.approx(a / 2)  # the corner
    edges = face_edges_mm(DrillPattern("b", "square", a, 100.0, "end", ()))
    assert min(abs(x - a / 2) for x in edges) < 1e-9
    # a ray at atan(1/2) from the top meets the top face a/4 from its centre
    assert around_mm("square", a, math.degrees(math.atan(0.5))) == pytest.approx(a / 4)


@settings(max_examples=60, derandomize=True, deadline=None)
@given(st.floats(0.0, 359.0), st.sampled_from(["round", "square"]))
def test_a_through_hole_exits_half_way_round(angle, section):
    # source: a line through the axis meets the outside at two points half the distance
    # round apart (a circle, and a square by its central symmetry)
    c = math.pi * 30.0 if section == "round" else 120.0
    s1 = around_mm(section, 30.0, angle)
    s2 = around_mm(section, 30.0, exit_angle_deg(angle))
    assert (s2 - s1) % c == pytest.approx(c / 2, abs=1e-6)
    assert -c / 2 - 1e-9 < s1 <= c / 2 + 1e-9
