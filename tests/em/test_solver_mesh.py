"""Meshing bend paths for the solver, the thin-wire limits, and mesh convergence."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.optimize import brentq

from fabplan.em.mesh import arc_polygon, graded_straight, mesh_path
from fabplan.em.solver import C0, path_model, wire_model
from fabplan.errors import FabplanError
from fabplan.geometry.path import Arc3, Bend, BendPath, Straight
from fabplan.geometry.shapes import folded_dipole as fd


def folded(side=300.0, centre_spacing=25.0, gap=12.0, d=2.0, style="round", radius=None):
    p = fd.Params("side", side, "centre_spacing", centre_spacing, gap, 0.0, style, radius)
    return fd.build(p, d)


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.floats(5.0, 500.0), st.floats(0.1, 2 * math.pi * 3), st.floats(0.0, 50.0),
       st.integers(0, 30))
def test_arc_polygon_keeps_the_arc_length(radius, angle, pitch, extra):
    # common practice, no source (the rule): nodes pushed outward so the chords add
    # up to the arc length; the end nodes stay on the arc's ends
    arc = Arc3((1.0, 2.0, 3.0), radius, (1.0, 0.0, 0.0), (0.0, 1.0, 0.0), (0.0, 0.0, 1.0),
               angle, pitch, 0.0)
    n = max(2, math.ceil(angle / (math.pi / 2))) + extra
    pts = arc_polygon(arc, n)
    chords = np.linalg.norm(np.diff(pts, axis=0), axis=1).sum()
    assert chords == pytest.approx(arc.length, rel=1e-10)
    assert np.allclose(pts[0], arc.start) and np.allclose(pts[-1], arc.end)
    radial = np.linalg.norm((pts - np.asarray(arc.centre))[:, :2], axis=1)
    assert np.all(radial >= radius * (1 - 1e-12))


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.floats(1.0, 500.0), st.floats(0.5, 50.0), st.floats(0.5, 50.0), st.floats(1.0, 60.0))
def test_graded_straight(length, e1, e2, h):
    # common practice, no source: the ends no longer than asked, none above h, growth <= 2
    s = graded_straight(length, e1, e2, h)
    assert s.sum() == pytest.approx(length, rel=1e-12)
    assert s[0] <= min(e1, h) * (1 + 1e-9) or len(s) == 1
    assert s[-1] <= min(e2, h) * (1 + 1e-9) or len(s) == 1
    assert np.all(s <= h * (1 + 1e-9))
    if len(s) > 1:
        r = s[1:] / s[:-1]
        assert r.max() <= 2 + 1e-9 and r.min() >= 0.5 - 1e-9


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.floats(100.0, 1500.0), st.floats(10.0, 80.0), st.floats(2.0, 30.0),
       st.floats(50e6, 500e6), st.sampled_from(["round", "square"]))
def test_mesh_rules_on_folded_dipoles(side, spacing, gap, f_max, style):
    # the meshing rules: segment <= lambda/20 at f_max, >= 8 segments per 180 degrees
    # of bend, neighbours within 2:1 (the gap included), the gap one segment of its width,
    # and the polygon as long as the centreline plus the gap
    d = 2.0
    path = folded(side, spacing, min(gap, side / 3), d, style, 4.0 if style == "square" else None)
    h = C0 / f_max * 1e3 / 20
    if path.gap_mm > h:
        return
    mesh = mesh_path(path, h, 8)
    ln = mesh.lengths
    assert ln.max() <= h * (1 + 1e-9)
    ring = np.append(ln, ln[0])
    ratio = ring[1:] / ring[:-1]
    assert ratio.max() <= 2 + 1e-9 and ratio.min() >= 0.5 - 1e-9
    assert ln[mesh.source_segments[0]] == pytest.approx(path.gap_mm, abs=1e-9)
    assert ln.sum() == pytest.approx(path.centreline_length() + path.gap_mm, rel=1e-9)
    total_bend = sum(math.radians(b.angle_deg) for b in path.bends)
    assert len(ln) >= 8 * total_bend / math.pi


def test_path_model_feeds_the_gap_and_keeps_it_lossless():
    path = folded()
    model = path_model(path, 1.0, f_max_hz=470e6, resistivity_ohm_m=1.72e-8)
    gap_seg = model.mesh.source_segments[0]
    assert model.source_segments == (gap_seg,)
    assert model.internal_impedance(435e6)[gap_seg] == 0
    assert model.internal_impedance(435e6)[0] != 0
    assert model.unknowns == len(model.mesh.nodes)
    assert model.findings == []


def test_folded_dipole_resonance_converges_with_the_gap_fixed():
    # the convergence rule: with the gap held fixed, doubling the mesh density moves the
    # resonance (reactance zero) by less than 0.05 %
    path = folded(side=300.0, centre_spacing=25.0, gap=12.0, d=2.0)
    res = []
    for spw in (20.0, 40.0):
        model = path_model(path, 1.0, f_max_hz=470e6, seg_per_wavelength=spw)
        res.append(brentq(lambda f, m=model: m.impedance(f).imag, 390e6, 450e6, xtol=1.0))
    assert abs(res[1] / res[0] - 1) < 5e-4
    # and it is a folded dipole: about 4 x 73 ohm at resonance (Balanis, sec. 9.5), within 10 %
    assert model.impedance(res[1]).real == pytest.approx(4 * 73, rel=0.1)


def test_unknowns_cap_is_a_clear_error():
    with pytest.raises(FabplanError, match="unknowns.*cap of 50"):
        path_model(folded(side=1500.0), 1.0, f_max_hz=470e6, max_unknowns=50)


def test_thick_wire_is_refused():
    with pytest.raises(FabplanError, match="too thick"):
        path_model(folded(), 20.0, f_max_hz=470e6)


def test_path_without_gap_is_refused():
    path = BendPath((Straight(100.0), Bend(20.0, 90.0), Straight(100.0)))
    with pytest.raises(FabplanError, match="feed gap"):
        path_model(path, 1.0, f_max_hz=300e6)


def test_bend_tighter_than_the_wire_is_refused_and_tight_bend_warned():
    with pytest.raises(FabplanError, match="bend"):
        path_model(folded(style="square", radius=0.5), 1.0, f_max_hz=300e6)
    model = path_model(folded(style="square", radius=1.5, d=2.0), 1.0, f_max_hz=300e6)
    assert "em-tight-bend" in [f.code for f in model.findings]


def test_close_conductors_are_warned_and_touching_ones_refused():
    model = path_model(folded(centre_spacing=5.0, d=2.0), 1.0, f_max_hz=300e6)
    assert "em-conductors-close" in [f.code for f in model.findings]
    nodes = np.array([[0, 0, 0], [100, 0, 0], [100, 1.5, 0], [0, 1.5, 0]], float)
    with pytest.raises(FabplanError, match="touch"):
        wire_model(nodes, 1.0, closed=False, source_segments=[1])


def test_segment_shorter_than_the_radius_is_refused():
    nodes = np.array([[0, 0, 0], [50, 0, 0], [50.5, 0, 0], [100, 0, 0]], float)
    with pytest.raises(FabplanError, match="shorter than"):
        wire_model(nodes, 1.0, closed=False, source_segments=[1])


def test_segments_too_long_for_the_frequency_are_refused(em_wires):
    nodes, src = em_wires.dipole_nodes(500.0, gap=4.0, h=60.0)
    model = wire_model(nodes, 1.0, closed=False, source_segments=src)
    model.impedance(300e6)
    with pytest.raises(FabplanError, match="too long"):
        model.impedance(600e6)


def test_bad_inputs_name_the_field():
    with pytest.raises(FabplanError, match="source_segments"):
        wire_model(np.zeros((3, 3)) + [[0, 0, 0], [1, 0, 0], [2, 0, 0]], 0.1, closed=False,
                   source_segments=[5])
    with pytest.raises(FabplanError, match="coincide"):
        wire_model(np.array([[0, 0, 0], [0, 0, 0], [5, 0, 0]], float), 0.1, closed=False,
                   source_segments=[1])
    with pytest.raises(FabplanError, match="below the ground"):
        wire_model(np.array([[0, 0, 0], [5, 0, 0], [10, 0, 0]], float), 0.1, closed=False,
                   source_segments=[1], ground_z_mm=1.0)


def test_arc_polygon_refuses_too_few_segments():
    arc = Arc3((0.0, 0.0, 0.0), 10.0, (1.0, 0.0, 0.0), (0.0, 1.0, 0.0), (0.0, 0.0, 1.0),
               math.pi * 1.5, 0.0, 0.0)
    with pytest.raises(FabplanError, match="90 degrees"):
        arc_polygon(arc, 2)


def test_helix_between_corners_is_graded_and_keeps_its_length():
    # a quadrifilar loop: small corner bends beside long helical arms. The arms' segments
    # follow the size field (fine next to the corners, growing away from them) instead of
    # taking the corners' size all along; each arm's polygon keeps the arc's length (the
    # mesh rule) and neighbours stay within about 2:1
    from fabplan.em.mesh import mesh_structure
    from fabplan.em.structure import Gap as WGap
    from fabplan.em.structure import Port, Structure, Wire, WireEnd, resolve
    from fabplan.geometry.shapes import quadrifilar as q

    shape = q.loop_shape("l", 300.0, 680.0, 0.5, 8.0)
    path = q.loop_path(shape, 0.0, 0.0, 10.0, "right", 0.5)
    s = Structure((Wire(path, 1.03),), (WGap(WireEnd(0, "B"), WireEnd(0, "A"), Port()),))
    h = C0 / 145e6 * 1e3 / 20
    mesh = mesh_structure(resolve(s), h, 8, 2.0)
    wire = mesh.wire == 0
    lengths = mesh.lengths[wire]
    assert wire.sum() < 150  # evenly at the corners' size it would be several hundred
    assert lengths.max() > 10 * lengths.min()
    ratio = lengths[1:] / lengths[:-1]
    assert np.all((ratio < 2.05) & (ratio > 1 / 2.05))
    assert lengths.sum() == pytest.approx(path.centreline_length(), rel=1e-9)


def test_arc_polygon_at_given_fractions_keeps_the_length():
    # source: the mesh rule (module docstring): interior nodes pushed radially so that the
    # chords add up to the arc's length, now at uneven positions along a helix
    path = BendPath((Bend(150.0, 180.0, 0.0, 1400.0),))
    arc = path.primitives()[0]
    fractions = np.array([0.0, 0.02, 0.06, 0.15, 0.3, 0.5, 0.7, 0.85, 0.94, 0.98, 1.0])
    nodes = arc_polygon(arc, 10, fractions)
    assert float(np.linalg.norm(np.diff(nodes, axis=0), axis=1).sum()) == \
        pytest.approx(arc.length, rel=1e-12)
    assert np.allclose(nodes[0], arc.start) and np.allclose(nodes[-1], arc.end)
    with pytest.raises(FabplanError):
        arc_polygon(arc, 3, np.array([0.0, 0.9, 0.95, 1.0]))  # 162 degrees in one segment
