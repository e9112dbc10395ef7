"""Skin effect: the internal impedance of round wire and tube, and loss in the solver."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.em.loss import internal_impedance, skin_depth, surface_resistance
from fabplan.em.solver import C0, wire_model

RHO_CU = 1.72e-8  # ohm m, annealed copper (trade notes: CDA data, 1.71-1.72 uOhm cm)


def test_skin_depth_of_copper_at_146_mhz():
    # source: trade notes / any EM text: delta = sqrt(rho/(pi f mu0)); copper at 146 MHz ~ 5.5 um
    assert skin_depth(146e6, RHO_CU) == pytest.approx(5.5e-6, rel=0.02)


def test_wire_tends_to_dc_resistance_at_low_frequency():
    # source: Ramo, Whinnery & Van Duzer, Fields and Waves, internal impedance of a round wire:
    # Z -> rho / (pi a^2) when a << delta
    a = 1e-3
    z = internal_impedance(10.0, a, RHO_CU)
    assert z.real == pytest.approx(RHO_CU / (math.pi * a * a), rel=1e-6)
    assert 0 < z.imag < 1e-3 * z.real


def test_wire_tends_to_surface_resistance_at_high_frequency():
    # source: Ramo, Whinnery & Van Duzer, Fields and Waves: Z -> (1 + j) Rs / (2 pi a),
    # Rs = sqrt(omega mu rho / 2), when a >> delta
    a = 1e-3
    f = 10e9  # a / delta ~ 1500
    z = internal_impedance(f, a, RHO_CU)
    limit = surface_resistance(f, RHO_CU) / (2 * math.pi * a)
    assert z.real == pytest.approx(limit, rel=1e-3)
    assert z.imag == pytest.approx(limit, rel=1e-3)


def test_scaled_bessel_form_matches_the_plain_one():
    # source: scipy.special.iv with a complex argument (no scaling) where it does not overflow
    from scipy.special import iv, kv

    a, f = 1e-3, 2e6  # a / delta ~ 21
    gamma = (1 + 1j) / skin_depth(f, RHO_CU)
    plain = gamma * RHO_CU / (2 * math.pi * a) * iv(0, gamma * a) / iv(1, gamma * a)
    assert internal_impedance(f, a, RHO_CU) == pytest.approx(plain, rel=1e-12)
    b = 0.6e-3
    ga, gb = gamma * a, gamma * b
    tube = gamma * RHO_CU / (2 * math.pi * a) * (
        (iv(0, ga) * kv(1, gb) + kv(0, ga) * iv(1, gb))
        / (iv(1, ga) * kv(1, gb) - kv(1, ga) * iv(1, gb)))
    assert internal_impedance(f, a, RHO_CU, wall_m=a - b) == pytest.approx(tube, rel=1e-10)


def test_tube_limits():
    # source: Schelkunoff's tubular-conductor impedance (as above): DC resistance of the annulus
    # rho / (pi (a^2 - b^2)) at low frequency; a wall many skin depths thick acts as solid wire
    a, wall = 3.175e-3, 0.8e-3
    b = a - wall
    z_dc = internal_impedance(1.0, a, RHO_CU, wall_m=wall)
    assert z_dc.real == pytest.approx(RHO_CU / (math.pi * (a * a - b * b)), rel=1e-6)
    f = 1e9  # wall / delta ~ 380
    assert internal_impedance(f, a, RHO_CU, wall_m=wall) == pytest.approx(
        internal_impedance(f, a, RHO_CU), rel=1e-9)
    # a wall much thinner than the skin depth carries the current uniformly: the DC value
    thin = internal_impedance(1e3, a, RHO_CU, wall_m=1e-5)
    assert thin.real == pytest.approx(RHO_CU / (math.pi * (a * a - (a - 1e-5) ** 2)), rel=1e-3)


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.floats(1e3, 1e11), st.floats(0.05e-3, 10e-3))
def test_resistance_between_dc_and_surface_limits(f, a):
    # source: Ramo, Whinnery & Van Duzer: R rises monotonically from the DC value towards the
    # skin-effect value and never falls below either limit's lower envelope
    z = internal_impedance(f, a, RHO_CU)
    r_dc = RHO_CU / (math.pi * a * a)
    r_hf = surface_resistance(f, RHO_CU) / (2 * math.pi * a)
    assert z.real >= r_dc * (1 - 1e-9)
    assert z.real >= r_hf * (1 - 1e-9)
    assert z.real <= r_dc + r_hf * 1.01
    assert z.imag > 0
    assert internal_impedance(f * 1.5, a, RHO_CU).real >= z.real * (1 - 1e-9)
    assert math.isfinite(z.real) and math.isfinite(z.imag)


def test_half_wave_dipole_loss_resistance(em_wires):
    # source: Balanis, Antenna Theory, sec. 2.14: loss per unit length |I|^2 R'/2 with
    # R' = Rs / (2 pi a); for a sinusoidal half-wave current referred to the feed this gives
    # R_loss = Rs L / (4 pi a). The solved current of a real (finite-radius) dipole carries
    # ~9 % more |I|^2 than a pure sine, so that closed form is met within 15 %; the loss power
    # itself must equal |I|^2 R'/2 integrated over the solved current exactly.
    from scipy.optimize import brentq

    lam = 1000.0
    a = 0.5
    nodes, src = em_wires.dipole_nodes(lam / 2, gap=4.0, h=12.5)
    lossless = wire_model(nodes, a, closed=False, source_segments=src)
    f = brentq(lambda x: lossless.impedance(x).imag, 0.85 * C0 / lam * 1e3, C0 / lam * 1e3)
    lossy = wire_model(nodes, a, closed=False, source_segments=src, resistivity_ohm_m=RHO_CU,
                       lossless_segments=src)
    sol = lossy.solve(f)
    i0, i1 = lossy.segment_currents(sol)
    seg_len = lossy.segments.length
    sq = seg_len * (abs(i0) ** 2 + abs(i1) ** 2 + np.real(i0 * np.conj(i1))) / 3
    sq[src] = 0.0  # the gap carries no conductor
    r_per_m = internal_impedance(f, a * 1e-3, RHO_CU).real
    assert sol.p_loss_w == pytest.approx(0.5 * r_per_m * sq.sum(), rel=1e-9)
    r_loss = 2 * sol.p_loss_w / abs(1 / sol.z_in) ** 2
    expect = surface_resistance(f, RHO_CU) * (lam / 2) * 1e-3 / (4 * math.pi * a * 1e-3)
    assert r_loss == pytest.approx(expect, rel=0.15)
    assert sol.efficiency == pytest.approx(1 - sol.p_loss_w / sol.p_in_w, rel=1e-12)


def test_stainless_loses_more_than_copper(em_wires):
    # common practice, no source: loss scales with sqrt(resistivity) in the skin-effect regime
    lam = 1000.0
    f = C0 / (lam * 1e-3)
    nodes, src = em_wires.dipole_nodes(lam / 2, gap=4.0, h=25.0)
    losses = []
    for rho in (RHO_CU, 72e-8):
        sol = wire_model(nodes, 0.5, closed=False, source_segments=src, resistivity_ohm_m=rho,
                         lossless_segments=src).solve(f)
        losses.append(sol.p_loss_w / sol.p_in_w)
    assert losses[1] / losses[0] == pytest.approx(math.sqrt(72 / 1.72), rel=0.05)
    assert np.all(np.array(losses) < 0.2)


def test_loss_power_is_the_hermitian_form_of_the_loss_matrix(em_wires):
    # source: definition of dissipated power, P = 1/2 Re(I^H Z_loss I), on a bent wire whose
    # currents change phase along it (a long, lossy, off-resonance loop)
    nodes = em_wires.circle_nodes(400.0, 40)
    model = wire_model(nodes, 0.5, closed=True, source_segments=[0], resistivity_ohm_m=72e-8,
                       lossless_segments=[0])
    sol = model.solve(300e6)
    zl = model.loss_matrix(300e6)
    cur = sol.currents
    assert np.ptp(np.angle(cur)) > 0.5  # the phase does change along the loop
    assert sol.p_loss_w == pytest.approx(0.5 * float(np.real(np.conj(cur) @ zl @ cur)),
                                         rel=1e-12)
    assert np.allclose(zl, zl.T)
