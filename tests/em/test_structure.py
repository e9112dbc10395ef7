"""Describing whole antennas: placement, loads, junctions found and declared, close approaches,
and the mesh of several wires."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.em.mesh import mesh_structure
from fabplan.em.solver import C0, fill_bytes, structure_model
from fabplan.em.structure import (
    Gap,
    Junction,
    Load,
    Placement,
    Port,
    Structure,
    TunedCapacitor,
    Wire,
    WireEnd,
    WireGap,
    close_pairs,
    resolve,
)
from fabplan.errors import FabplanError
from fabplan.geometry.path import Bend, BendPath, Straight


def rod(a, b, radius=1.0, **kw):
    return Wire((tuple(a), tuple(b)), radius, **kw)


def fed_dipole(length=480.0, gap=4.0, radius=1.0, x=0.0):
    return Wire(((x, 0.0, -length / 2), (x, 0.0, length / 2)), radius), \
        WireGap(0, length / 2, gap, Port())


# -- description -----------------------------------------------------------------------------
def test_placement_rotates_then_translates():
    # source: the right-hand rule for a rotation about +z (any vector algebra text): +x turns
    # to +y under a quarter turn
    p = Placement.about((0.0, 0.0, 1.0), 90.0, (10.0, 0.0, 0.0))
    assert np.allclose(p.apply(np.array([1.0, 0.0, 0.0])), [10.0, 1.0, 0.0])
    with pytest.raises(FabplanError, match="rotation"):
        Placement(((1.0, 0.0, 0.0), (0.0, 1.0, 0.0), (0.0, 0.0, -1.0)))  # a reflection


def test_placed_bend_path_keeps_its_shape():
    # common practice, no source: a rigid placement keeps every length
    path = BendPath((Straight(100.0), Bend(20.0, 90.0), Straight(50.0)))
    w = Wire(path, 1.0, placement=Placement.about((1.0, 1.0, 0.0), 37.0, (5.0, -3.0, 8.0)))
    topo = resolve(Structure((w,), wire_gaps=(WireGap(0, 10.0, 2.0, Port()),)))
    line = topo.centrelines[0]
    assert line.length == pytest.approx(path.centreline_length(), rel=1e-12)
    a, b = line.end_point("A"), line.end_point("B")
    local = np.linalg.norm(path.end_point() - np.asarray(path.origin))
    assert np.linalg.norm(b - a) == pytest.approx(local, rel=1e-12)


def test_series_and_parallel_loads():
    # source: impedance of series and parallel R, L, C (any circuit-theory text):
    # series Z = R + j w L + 1/(j w C); parallel 1/Z = 1/R + 1/(j w L) + j w C
    f = 10e6
    w = 2 * math.pi * f
    r, l_h, c = 50.0, 1e-6, 100e-12
    series = Load("s", "series", r, l_h, c).impedance(f)
    assert series == pytest.approx(complex(r, w * l_h - 1 / (w * c)), rel=1e-12)
    par = Load("p", "parallel", r, l_h, c).impedance(f)
    assert par == pytest.approx(1 / (1 / r + 1 / (1j * w * l_h) + 1j * w * c), rel=1e-12)
    # a capacitor's Q: ESR = X / Q (definition of Q for a series-loss capacitor)
    q = Load("c", c_f=c, q=400.0).impedance(f)
    assert q.real == pytest.approx(1 / (w * c) / 400.0, rel=1e-12)
    assert Load("c", c_f=c, esr_ohm=0.05).impedance(f).real == pytest.approx(0.05)
    assert Load("short").impedance(f) == 0
    with pytest.raises(FabplanError, match="not both"):
        Load("c", c_f=c, q=100.0, esr_ohm=0.1)
    with pytest.raises(FabplanError, match="open circuit"):
        Load("open", "parallel")


def test_bad_structures_are_one_line_errors():
    dip, gap = fed_dipole()
    with pytest.raises(FabplanError, match="no port"):
        resolve(Structure((dip,)))
    with pytest.raises(FabplanError, match="no wire number 3"):
        resolve(Structure((dip,), (Gap(WireEnd(3, "A"), WireEnd(0, "B"), Port()),)))
    with pytest.raises(FabplanError, match="port names must differ"):
        resolve(Structure((dip,), wire_gaps=(gap, WireGap(0, 100.0, 4.0, Port()))))
    with pytest.raises(FabplanError, match="names no port"):
        resolve(Structure((dip,), wire_gaps=(gap, WireGap(0, 100.0, 4.0,
                                                             TunedCapacitor(1e8, "other")))))
    with pytest.raises(FabplanError, match="below the ground"):
        resolve(Structure((dip,), wire_gaps=(gap,), ground_z_mm=0.0))
    with pytest.raises(FabplanError, match="increasing"):
        resolve(Structure((Wire(dip.path, 1.0, steps=((200.0, 0.8), (100.0, 0.6))),),
                          wire_gaps=(gap,)))
    with pytest.raises(FabplanError, match="apart"):  # a declared junction of far-off ends
        resolve(Structure((dip, rod((0, 0, 260), (0, 0, 400))), wire_gaps=(gap,),
                          junctions=(Junction((WireEnd(0, "B"), WireEnd(1, "A"))),)))


# -- junctions ---------------------------------------------------------------------------------
def test_coincident_ends_and_a_t_are_found():
    # common practice, no source: ends within a fraction of a radius are one node; an end on
    # another wire's interior is a T there
    dip, gap = fed_dipole()
    arm = rod((0, 0, 240.0), (0, 150.0, 240.0))  # from the dipole's top end, sideways
    stub = rod((0, 0, 100.0), (150.0, 0, 100.0))  # from the dipole's interior
    topo = resolve(Structure((dip, arm, stub), wire_gaps=(gap,)))
    joined = [sorted(n.members) for n in topo.nodes if len(n.members) > 1]
    assert [(0, 480.0), (1, 0.0)] in joined
    assert [(0, 340.0), (2, 0.0)] in joined
    assert topo.findings == []


def test_declared_junction_joins_ends_a_little_apart():
    # common practice, no source: a declared joint takes the ends to the first one's point
    dip, gap = fed_dipole()
    arm = rod((0, 1.5, 240.0), (0, 150.0, 240.0))  # 1.5 mm off, too far to be found
    with pytest.raises(FabplanError, match="join them with a junction"):
        resolve(Structure((dip, arm), wire_gaps=(gap,)))  # and the surfaces touch
    declared = Structure((dip, arm), wire_gaps=(gap,),
                         junctions=(Junction((WireEnd(0, "B"), WireEnd(1, "A"))),))
    nodes = [n for n in resolve(declared).nodes if len(n.members) == 2]
    assert len(nodes) == 1 and np.allclose(nodes[0].point, [0, 0, 240.0])


def test_wires_that_nearly_touch_are_named_and_crossing_ones_refused():
    # common practice, no source: conductors within a few diameters without a joint are a
    # warning naming the place; touching or crossing without one is an error
    dip, gap = fed_dipole()
    near = rod((4.0, 0, -100.0), (4.0, 0, 100.0), name="director")  # 4 mm beside it
    topo = resolve(Structure((dip, near), wire_gaps=(gap,)))
    (f,) = topo.findings
    assert f.code == "em-wires-nearly-touch" and f.severity == "warning"
    assert "director" in f.message and "mm along it" in f.message
    cross = rod((-50.0, 0, 50.0), (50.0, 0, 50.0))
    with pytest.raises(FabplanError, match="touch or cross"):
        resolve(Structure((dip, cross), wire_gaps=(gap,)))
    # joined at the crossing point as a T, the same wires are fine
    tee = rod((0.0, 0, 50.0), (50.0, 0, 50.0))
    assert resolve(Structure((dip, tee), wire_gaps=(gap,))).findings == []


@settings(max_examples=30, deadline=None, derandomize=True)
@given(st.integers(2, 300), st.floats(0.5, 20.0))
def test_close_pairs_match_brute_force(n, reach):
    # source: brute-force comparison of every pair's distance
    rng = np.random.default_rng(n)
    pts = rng.uniform(0, 60.0, (n, 3))
    i, j = close_pairs(pts, reach)
    got = set(zip(i.tolist(), j.tolist(), strict=True))
    d = np.linalg.norm(pts[:, None] - pts[None], axis=2)
    want = {(a, b) for a in range(n) for b in range(a + 1, n) if d[a, b] < reach}
    assert got == want


# -- the mesh of a structure ---------------------------------------------------------------
def test_mesh_has_nodes_at_junctions_steps_and_gap_faces():
    # the rules: a node on every junction and radius step, each gap one segment of its
    # real width, neighbours within 2:1 along every wire and across the junctions
    dip = Wire(((0.0, 0.0, -400.0), (0.0, 0.0, 400.0)), 6.0, steps=((250.0, 5.0), (550.0, 6.0)))
    stub = rod((0.0, 0.0, 150.0), (0.0, 120.0, 150.0), 1.0)
    s = Structure((dip, stub), wire_gaps=(WireGap(0, 400.0, 12.0, Port()),))
    mesh = mesh_structure(resolve(s), h_max_mm=30.0)
    on0 = mesh.wire == 0
    for step in (250.0, 550.0):
        assert np.min(np.abs(mesh.s0[on0] - step)) < 1e-9
    assert np.all(mesh.radius[on0 & (mesh.s1 <= 250.0 + 1e-9)] == 6.0)
    assert np.all(mesh.radius[on0 & (mesh.s0 >= 250.0 - 1e-9) & (mesh.s1 <= 550.0 + 1e-9)] == 5.0)
    (feed,) = mesh.feeds
    assert mesh.lengths[feed.segments[0]] == pytest.approx(12.0, abs=1e-9)
    assert mesh.lengths.max() <= 30.0 * (1 + 1e-9)
    # 2:1 between every pair of segments sharing a node (along wires and across the T)
    ln = mesh.lengths
    for node in range(len(mesh.nodes)):
        touching = np.nonzero((mesh.seg_start == node) | (mesh.seg_end == node))[0]
        if len(touching) > 1:
            assert ln[touching].max() / ln[touching].min() <= 2.0 + 1e-9
    (tee,) = mesh.junction_nodes
    assert np.allclose(mesh.nodes[tee], [0.0, 0.0, 150.0])


@settings(max_examples=25, deadline=None, derandomize=True)
@given(st.floats(100.0, 600.0), st.floats(10.0, 60.0), st.floats(30e6, 400e6),
       st.floats(10.0, 60.0), st.floats(1.0, 40.0))
def test_finer_mesh_never_has_fewer_unknowns(length, spacing, f_max, spw, extra):
    # issue 16: more segments per wavelength never gives fewer unknowns
    top = BendPath((Straight(length), Bend(spacing / 2, 180.0), Straight(length / 2)))
    s = Structure((Wire(top, 1.0), rod((0, -spacing / 3, 0), (0, -spacing / 3, -length / 2))),
                  wire_gaps=(WireGap(0, length / 3, 6.0, Port()),))
    counts = [structure_model(s, f_max_hz=f_max, seg_per_wavelength=x).unknowns
              for x in (spw, spw + extra)]
    assert counts[1] >= counts[0]


def test_a_structure_beyond_the_memory_bound_is_refused_before_filling():
    # the rule: refuse, with one clear line, structures that would exceed the bound
    dip, gap = fed_dipole()
    s = Structure((dip,), wire_gaps=(gap,))
    with pytest.raises(FabplanError, match=r"MiB .* above the bound"):
        structure_model(s, f_max_hz=300e6, max_fill_bytes=1e5)
    model = structure_model(s, f_max_hz=300e6)
    assert 1e5 < model.fill_bytes() < 64 * 2 ** 20
    # the estimate grows as the square of the segments (pairs of segments)
    assert fill_bytes(8000, 8000, False) / fill_bytes(4000, 4000, False) == pytest.approx(4, 0.05)


def test_frequency_limits_still_hold_for_structures():
    dip, gap = fed_dipole()
    model = structure_model(Structure((dip,), wire_gaps=(gap,)), f_max_hz=300e6)
    with pytest.raises(FabplanError, match="too long"):
        model.solve(C0 / 0.2)  # a 200 mm wavelength: 50 mm segments are too long
