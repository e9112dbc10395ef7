"""Bend-path geometry: developed lengths against textbook formulas, invariants."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.geometry.path import Bend, BendPath, Straight, neutral_radius
from fabplan.geometry.shapes import circle_loop, delta_loop, folded_dipole, helix, rect_loop


def test_folded_dipole_hand_formula():
    # common practice, no source: developed length = 2 x side + pi x (inside spacing + d) - gap
    d, side, spacing, gap = 6.35, 900.0, 50.0, 12.0
    path = folded_dipole.build(folded_dipole.Params("side", side, "spacing", spacing, gap), d)
    assert path.developed_length(d) == pytest.approx(2 * side + math.pi * (spacing + d) - gap)
    assert path.closure_error() < 1e-9
    assert path.touching(d) == []


@pytest.mark.parametrize("turns", [[90, 90, 90, 90], [120, 120, 120]])
def test_rounded_polygon_formula(turns):
    # textbook geometry: L = sum sides - 2 r sum tan(theta/2) + r sum theta
    r, side, gap = 20.0, 300.0, 10.0
    if len(turns) == 4:
        path = rect_loop.build(rect_loop.Params(side, side, r, gap), 3.0)
    else:
        path = delta_loop.build(delta_loop.Params(side, side, r, gap), 3.0)
    th = np.radians(turns)
    expected = len(turns) * side - 2 * r * np.tan(th / 2).sum() + r * th.sum() - gap
    assert path.centreline_length() == pytest.approx(expected)
    assert path.closure_error() < 1e-9


def test_helix_formula():
    # textbook geometry: helix length = N sqrt((pi D)^2 + p^2)
    p = helix.Params(turns=7.5, diameter_mm=80.0, pitch_mm=35.0)
    path = helix.build(p, 2.0)
    assert path.centreline_length() == pytest.approx(7.5 * math.hypot(math.pi * 80, 35))
    pts, _ = path.sample(1.0)
    # the coil advances pitch x turns along its axis and keeps its diameter
    axis = np.asarray(path.primitives()[0].axis)
    along = pts @ axis
    assert along.max() - along.min() == pytest.approx(7.5 * 35.0, rel=1e-3)
    assert path.touching(2.0) == []


def test_circle_loop_closes_on_its_gap():
    p = circle_loop.Params(300.0, 12.0)
    path = circle_loop.build(p, 8.0)
    ends = np.linalg.norm(path.end_point() - np.asarray(path.origin))
    assert ends == pytest.approx(12.0)
    # chord 12 on a 150 mm radius circle: the arc left out is 2 asin(6/150) radians
    assert path.centreline_length() == pytest.approx(150 * (2 * math.pi - 2 * math.asin(6 / 150)))


def test_k_factor_moves_the_neutral_axis():
    # source: Machinery's Handbook, bend allowance BA = theta (R_inside + K T)
    assert neutral_radius(10.0, 4.0, 0.5) == pytest.approx(10.0)
    assert neutral_radius(10.0, 4.0, 0.35) == pytest.approx(8.0 + 0.35 * 4)
    path = BendPath((Straight(50), Bend(10.0, 90.0), Straight(50)))
    ba = math.pi / 2 * (8.0 + 0.35 * 4)
    assert path.developed_length(4.0, 0.35) == pytest.approx(100 + ba)


def test_rotation_makes_a_non_planar_path():
    flat = BendPath((Straight(100), Bend(20, 90), Straight(100), Bend(20, 90), Straight(100)))
    twisted = BendPath((Straight(100), Bend(20, 90), Straight(100), Bend(20, 90, 90.0),
                        Straight(100)))
    assert flat.is_planar() and not twisted.is_planar()
    assert flat.centreline_length() == pytest.approx(twisted.centreline_length())
    # after the out-of-plane bend the last run points along +/- z
    assert abs(twisted.end_tangent()[2]) == pytest.approx(1.0)


def test_touching_agrees_with_shapely():
    """The conductor touches itself exactly where shapely finds the buffered legs meeting."""
    from shapely.geometry import LineString

    d = 5.0
    for centre_spacing in (2.6, 4.9, 5.2, 8.0):  # a hairpin's legs, centre to centre
        path = BendPath((Straight(200), Bend(centre_spacing / 2, 180), Straight(200)))
        pts, s = path.sample(0.5)
        length = path.centreline_length()
        leg_a = LineString(pts[s <= 200][:, :2])
        leg_b = LineString(pts[s >= length - 200][:, :2])
        # source: shapely (GEOS) buffers as the reference for planar clearance
        expected = leg_a.buffer(d / 2, quad_segs=32).intersects(leg_b.buffer(d / 2, quad_segs=32))
        assert bool(path.touching(d)) == expected, centre_spacing
        assert expected == (centre_spacing <= d)


@settings(max_examples=60, deadline=None)
@given(st.lists(st.tuples(st.floats(1, 500), st.floats(5, 175), st.floats(5, 100),
                          st.sampled_from([0.0, 90.0, 180.0, 270.0])), min_size=1, max_size=6),
       st.floats(0, 500), st.floats(0.5, 10))
def test_developed_length_is_the_sum_of_its_pieces(rows, tail, depth):
    pieces = []
    for straight, angle, radius, rot in rows:
        pieces += [Straight(straight), Bend(radius, angle, rot)]
    pieces.append(Straight(tail))
    path = BendPath(tuple(pieces))
    spans = path.spans(depth, 0.4)
    total = sum(s for s, *_ in rows) + tail + sum(
        math.radians(a) * neutral_radius(r, depth, 0.4) for _, a, r, _ in rows)
    assert path.developed_length(depth, 0.4) == pytest.approx(total)
    # spans are in order, each starting after the previous ended, straights between
    ends = [0.0] + [s.end_mm for s in spans]
    for prev_end, span, (straight, *_rest) in zip(ends, spans, rows):
        assert span.start_mm - prev_end == pytest.approx(straight)
        assert span.straight_before_mm == pytest.approx(straight)
    # the 3D polyline's length equals the centreline length
    pts, _ = path.sample(0.25)
    poly = float(np.linalg.norm(np.diff(pts, axis=0), axis=1).sum())
    assert poly == pytest.approx(path.centreline_length(), rel=2e-3)


@settings(max_examples=60, deadline=None)
@given(st.floats(100, 3000), st.floats(5, 200), st.floats(1, 30), st.floats(0.5, 6),
       st.floats(0.1, 10))
def test_scaling_every_dimension_scales_every_length(side, spacing, gap, d, factor):
    p = folded_dipole.Params("side", side, "spacing", spacing, min(gap, side / 3))
    a = folded_dipole.build(p, d)
    b = a.scaled(factor)
    assert b.developed_length(d * factor) == pytest.approx(a.developed_length(d) * factor)
    for sa, sb in zip(a.spans(d), b.spans(d * factor)):
        assert sb.start_mm == pytest.approx(sa.start_mm * factor)
        assert sb.end_mm == pytest.approx(sa.end_mm * factor)
    assert b.closure_error() == pytest.approx(0.0, abs=1e-6 * factor * side)


# -- issue 15: the self-touch and planarity checks cost the same for any length --------------
def test_segment_distances_agree_with_shapely():
    """The exact least distance between two segments, against GEOS for flat ones
    and against a fine grid of both parameters for skew ones in 3D."""
    from shapely.geometry import LineString

    from fabplan.geometry.path import _segment_distances

    rng = np.random.default_rng(15)
    p0, p1, q0, q1 = (rng.uniform(-10, 10, (200, 3)) for _ in range(4))
    p1[:20] = p0[:20]  # some segments are points
    q1[10:30] = q0[10:30]
    p1[40:60] = p0[40:60] + 2.0 * (q1[40:60] - q0[40:60])  # some are parallel
    flat = [a.copy() for a in (p0, p1, q0, q1)]
    for a in flat:
        a[:, 2] = 0.0
    _, _, dist = _segment_distances(*flat)
    for k in range(200):
        # source: shapely (GEOS) distance between two line strings in the plane
        ref = LineString([flat[0][k, :2], flat[1][k, :2] + (1e-12 if k < 20 else 0)]).distance(
            LineString([flat[2][k, :2], flat[3][k, :2] + (1e-12 if 10 <= k < 30 else 0)]))
        assert dist[k] == pytest.approx(ref, abs=1e-6)
    s, t, dist = _segment_distances(p0, p1, q0, q1)
    grid = np.linspace(0, 1, 201)
    for k in range(0, 200, 7):
        a = p0[k] + grid[:, None] * (p1[k] - p0[k])
        b = q0[k] + grid[:, None] * (q1[k] - q0[k])
        brute = np.min(np.linalg.norm(a[:, None, :] - b[None, :, :], axis=2))
        assert dist[k] <= brute + 1e-9
        assert dist[k] >= brute - 0.02 * np.linalg.norm(p1[k] - p0[k] + q1[k] - q0[k]) - 1e-9
        assert 0 <= s[k] <= 1 and 0 <= t[k] <= 1
        assert np.linalg.norm(p0[k] + s[k] * (p1[k] - p0[k]) - q0[k] - t[k] * (q1[k] - q0[k])) \
            == pytest.approx(dist[k])


def _dense_least_distance(path: BendPath, d: float) -> float:
    """Reference: the least distance between centreline points sampled every d/40 that
    lie more than (pi/2) d + d/2 apart along the stock (scipy's k-d tree)."""
    from scipy.spatial import cKDTree

    pts, s = path.sample(d / 40)
    pairs = cKDTree(pts).query_pairs(1.5 * d, output_type="ndarray")
    if len(pairs) == 0:
        return math.inf
    far = np.abs(s[pairs[:, 0]] - s[pairs[:, 1]]) > (math.pi / 2) * d + d / 2
    if not far.any():
        return math.inf
    return float(np.min(np.linalg.norm(pts[pairs[far, 0]] - pts[pairs[far, 1]], axis=1)))


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.lists(st.tuples(st.floats(0, 40), st.floats(20, 350), st.floats(3, 15),
                          st.sampled_from([0.0, 90.0, 180.0, 33.0])), min_size=1, max_size=5),
       st.floats(0, 40), st.floats(2, 6))
def test_touching_agrees_with_dense_sampling(rows, tail, d):
    pieces: list = []
    for straight, angle, radius, rot in rows:
        pieces += ([Straight(straight)] if straight > 0 else []) + [Bend(radius, angle, rot)]
    if tail > 0:
        pieces.append(Straight(tail))
    path = BendPath(tuple(pieces))
    ref = _dense_least_distance(path, d)
    found = path.touching(d)
    if ref < 0.9 * d:
        assert found, ref
    elif ref > 1.05 * d:
        assert not found, (ref, found)


def test_touching_work_is_bounded_for_long_paths():
    """Before: a 1 km hairpin of 2 mm wire was sampled every 0.5 mm (4 million points,
    hundreds of MB). The chunks stay about TOUCH_CHUNKS however long the path."""
    from fabplan.geometry.path import TOUCH_CHUNKS

    long_hairpin = BendPath((Straight(250_000.0), Bend(50.0, 180.0), Straight(250_000.0)))
    starts, _, _, _ = long_hairpin._chunks(2.0)
    assert len(starts) <= 1.1 * TOUCH_CHUNKS
    assert long_hairpin.touching(2.0) == []
    touching = BendPath((Straight(250_000.0), Bend(0.9, 180.0), Straight(250_000.0)))
    assert touching.touching(2.0)  # legs 1.8 mm apart, centre to centre, for 2 mm wire
    coil = BendPath((Bend(50.0, 360.0 * 1000, 0.0, 5.0),))  # 1000 turns, 314 m of wire
    starts, _, _, _ = coil._chunks(2.0)
    assert len(starts) <= 1.1 * TOUCH_CHUNKS
    assert coil.touching(2.0) == []
    assert BendPath((Bend(50.0, 360.0 * 1000, 0.0, 1.9),)).touching(2.0)  # turns 1.9 mm apart


def test_is_planar_is_exact():
    flat_loop = rect_loop.build(rect_loop.Params(21_300.0, 21_300.0, 50.0, 20.0), 1.6)
    assert flat_loop.is_planar()
    assert not helix.build(helix.Params(3, 80.0, 35.0), 2.0).is_planar()
    # a twist of a thousandth of a degree lifts the far end of a 20 m run 0.35 mm
    twisted = BendPath((Straight(100), Bend(20, 90), Straight(100), Bend(20, 90, 0.001),
                        Straight(20_000)))
    assert not twisted.is_planar(tol_mm=0.1)
    assert twisted.is_planar(tol_mm=1.0)


def test_end_frame_is_where_the_next_piece_starts():
    # a bend after the frame turns towards the normal: a straight, then a 90 degree bend of
    # radius 5 to the left, ends 5 along y from the corner heading +y, its normal -x
    # (towards the centre of the bend it came from)
    p = BendPath((Straight(10.0), Bend(5.0, 90.0)))
    pos, t, n = p.end_frame()
    assert pos == pytest.approx([15.0, 5.0, 0.0])
    assert t == pytest.approx([0.0, 1.0, 0.0], abs=1e-12)
    assert n == pytest.approx([-1.0, 0.0, 0.0], abs=1e-12)
    longer = BendPath((Straight(10.0), Bend(5.0, 90.0), Bend(5.0, 90.0)))
    assert longer.end_point() == pytest.approx(pos + 5.0 * t + 5.0 * n)
