"""Far field: power balance, directivity and pattern shape against textbook dipoles."""

from __future__ import annotations

import math

import numpy as np
import pytest

from fabplan.em import farfield as ff
from fabplan.em.solver import C0, path_model, wire_model
from fabplan.geometry.shapes import folded_dipole as fd

LAM = 1000.0
F0 = C0 / (LAM * 1e-3)
RHO_CU = 1.72e-8


def balance(model, f):
    sol = model.solve(f)
    p_rad = ff.radiated_power(sol, model)
    return sol, p_rad, abs(sol.p_in_w - (p_rad + sol.p_loss_w)) / sol.p_in_w


def test_power_balance_free_space_dipole(em_wires):
    # source: conservation of energy (Poynting's theorem): input = radiated + conductor loss;
    # the radiated power here comes from integrating the far field, independently of the matrix
    nodes, src = em_wires.dipole_nodes(480.0, gap=4.0, h=20.0)
    model = wire_model(nodes, 0.1, closed=False, source_segments=src, resistivity_ohm_m=RHO_CU,
                       lossless_segments=src)
    sol, p_rad, err = balance(model, F0)
    assert err < 1e-4
    assert sol.p_loss_w > 0.01 * sol.p_in_w  # the loss is there to be balanced
    assert ff.radiation_efficiency(sol, model) == pytest.approx(sol.efficiency, abs=1e-4)


def test_power_balance_bent_folded_dipole_in_stainless():
    # source: Poynting's theorem, as above, on an element as bent (arcs, gap, closed loop)
    p = fd.Params("side", 300.0, "centre_spacing", 25.0, 12.0)
    model = path_model(fd.build(p, 2.0), 1.0, f_max_hz=470e6, resistivity_ohm_m=72e-8)
    for f in (400e6, 435e6):
        _, _, err = balance(model, f)
        assert err < 1e-4


def test_power_balance_over_ground(em_wires):
    # source: Poynting's theorem with image theory: only the upper half-space radiates
    nodes, src = em_wires.dipole_nodes(480.0, gap=4.0, h=20.0, axis=0)
    model = wire_model(nodes + [0, 0, 200.0], 0.1, closed=False, source_segments=src,
                       resistivity_ohm_m=RHO_CU, lossless_segments=src, ground_z_mm=0.0)
    _, _, err = balance(model, F0)
    assert err < 1e-4


def test_short_dipole_directivity(em_wires):
    # source: Balanis, Antenna Theory, sec. 4.2/4.3: a short dipole has D = 1.5 (1.76 dBi),
    # broadside; its pattern goes as sin^2(theta)
    nodes, src = em_wires.dipole_nodes(50.0, gap=2.0, h=5.0)
    model = wire_model(nodes, 0.05, closed=False, source_segments=src)
    sol = model.solve(F0)
    d = ff.directivity_pattern(sol, model, np.radians([90.0, 45.0, 0.0]), np.zeros(3))
    assert d[0] == pytest.approx(10 * math.log10(1.5), abs=0.02)
    assert d[1] - d[0] == pytest.approx(10 * math.log10(0.5), abs=0.02)  # sin^2(45)
    assert d[2] < -40


def test_half_wave_dipole_directivity_and_pattern(em_wires):
    # source: Balanis, Antenna Theory, sec. 4.6: D = 1.643 (2.15 dBi) and the E-plane field
    # cos(pi/2 cos theta)/sin theta for a sinusoidal current; the solved current of a wire of
    # 1e-5 wavelengths radius is nearly sinusoidal: the shape agrees within 0.1 dB
    nodes, src = em_wires.dipole_nodes(LAM / 2, gap=2.0, h=10.0)
    model = wire_model(nodes, 1e-5 * LAM, closed=False, source_segments=src)
    sol = model.solve(F0)
    theta = np.radians([90.0, 60.0, 30.0])
    d = ff.directivity_pattern(sol, model, theta, np.zeros(3))
    assert d[0] == pytest.approx(10 * math.log10(1.643), abs=0.05)
    shape = (np.cos(np.pi / 2 * np.cos(theta)) / np.sin(theta)) ** 2
    assert np.allclose(d - d[0], 10 * np.log10(shape), atol=0.1)


def test_gain_is_directivity_times_efficiency(em_wires):
    # source: IEEE Std 145 definitions: gain = radiation efficiency x directivity
    nodes, src = em_wires.dipole_nodes(480.0, gap=4.0, h=20.0)
    model = wire_model(nodes, 0.05, closed=False, source_segments=src, resistivity_ohm_m=72e-8,
                       lossless_segments=src)
    sol = model.solve(F0)
    th = np.radians([90.0, 50.0])
    g = ff.pattern(sol, model, th, np.zeros(2))
    d = ff.directivity_pattern(sol, model, th, np.zeros(2))
    eff = ff.radiation_efficiency(sol, model)
    assert eff < 0.97
    assert np.allclose(g - d, 10 * math.log10(eff), atol=1e-9)


def test_monopole_over_ground_has_twice_the_directivity(em_wires):
    # source: image theory (Balanis, sec. 4.7): the monopole radiates the dipole's power into
    # half the space: directivity 3.01 dB above the dipole's, none below the ground
    nodes, src = em_wires.dipole_nodes(480.0, gap=4.0, h=20.0, split_gap=True)
    dip = wire_model(nodes, 0.5, closed=False, source_segments=src)
    mono = wire_model(nodes[nodes[:, 2] >= 0], 0.5, closed=False, source_segments=[0],
                      ground_z_mm=0.0)
    th = np.radians([89.0, 60.0])
    d_dip = ff.directivity_pattern(dip.solve(F0), dip, th, np.zeros(2))
    s_m = mono.solve(F0)
    d_mono = ff.directivity_pattern(s_m, mono, th, np.zeros(2))
    assert np.allclose(d_mono - d_dip, 10 * math.log10(2), atol=0.01)
    assert ff.pattern(s_m, mono, np.radians([120.0]), np.zeros(1))[0] == -math.inf


def test_principal_planes_of_a_vertical_dipole(em_wires):
    # source: symmetry: a z-directed dipole is omnidirectional in the xy plane and has nulls
    # along its axis in the xz and yz planes
    nodes, src = em_wires.dipole_nodes(480.0, gap=4.0, h=20.0)
    model = wire_model(nodes, 0.5, closed=False, source_segments=src)
    planes = ff.principal_planes(model.solve(F0), model, step_deg=10.0)
    ang, xy = planes["xy"]
    assert len(ang) == 37 and np.ptp(xy) < 1e-6
    for name in ("xz", "yz"):
        a, g = planes[name]
        assert g[np.argmin(abs(a))] < -30  # theta = 0, along the wire
        assert g[np.argmin(abs(a - 90))] == pytest.approx(xy[0], abs=1e-6)
