"""Rational fitting of sweeps: AAA on known functions, the adaptive loop on two antennas."""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from fabplan.em import farfield as ff
from fabplan.em.fitting import aaa, chebyshev_points, fit_sweep
from fabplan.em.solver import C0, wire_model
from fabplan.errors import FabplanError

RHO_CU = 1.72e-8


def arrowhead_eigenvalues(r, top):
    """Reference: the finite eigenvalues of the AAA arrowhead pencil by scipy's generalised
    eigensolver (Nakatsukasa, Sete & Trefethen 2018, sec. 2, eq. for poles and zeros)."""
    from scipy.linalg import eig

    m = len(r.support)
    e = np.zeros((m + 1, m + 1), dtype=complex)
    e[0, 1:] = top
    e[1:, 0] = 1.0
    e[1:, 1:] = np.diag(r.support)
    b = np.eye(m + 1)
    b[0, 0] = 0.0
    ev = eig(e, b, right=False)
    ev = ev[np.isfinite(ev) & (np.abs(ev) < 1e8)]
    return ev[np.argsort(ev.real)]


def test_aaa_recovers_a_rational_function_exactly():
    # source: Nakatsukasa, Sete & Trefethen, "The AAA algorithm for rational approximation",
    # SIAM J. Sci. Comput. 40 (2018), sec. 2-3: a rational function of type (m, m) sampled at
    # enough points is recovered to rounding after m + 1 support points; its poles and zeros
    # are the finite eigenvalues of the arrowhead pencil (checked against scipy.linalg.eig)
    poles = np.array([-1.5, 0.3 + 0.2j, 2j])
    x = np.linspace(-1.0, 1.0, 100)

    def f(t):
        return (t ** 2 + 2 * t - 1) / np.prod([t - p for p in poles], axis=0)

    r = aaa(x, f(x))
    assert r.degree == 3
    dense = np.linspace(-1.0, 1.0, 1001)
    assert np.abs(r(dense) - f(dense)).max() < 1e-13 * np.abs(f(dense)).max()
    assert np.array_equal(r(r.support), r.values)  # exact at the support points
    got = r.poles()
    assert np.abs(np.sort_complex(got) - np.sort_complex(poles)).max() < 1e-10
    assert np.abs(got - arrowhead_eigenvalues(r, r.weights)).max() < 1e-10
    zeros = r.zeros()  # the numerator t^2 + 2t - 1: -1 -+ sqrt(2)
    assert np.abs(np.sort(zeros.real) - [-1 - math.sqrt(2), -1 + math.sqrt(2)]).max() < 1e-10
    assert np.abs(zeros - arrowhead_eigenvalues(r, r.weights * r.values)).max() < 1e-9


def test_aaa_finds_poles_just_outside_the_interval():
    # source: tan(pi x / 2) has simple poles at x = +-1 with residue -2/pi (any calculus
    # text: tan(u) ~ -1/(u - pi/2)); sampled on [-0.99, 0.99], 0.01 from the poles
    x = np.linspace(-0.99, 0.99, 300)
    r = aaa(x, np.tan(np.pi * x / 2))
    dense = np.linspace(-0.99, 0.99, 2001)
    ref = np.tan(np.pi * dense / 2)
    assert np.abs(r(dense) - ref).max() < 1e-11 * np.abs(ref).max()
    p = r.poles()
    near = p[np.abs(p) < 1.5]
    assert np.abs(np.sort(near.real) - [-1.0, 1.0]).max() < 1e-10
    assert np.abs(near.imag).max() < 1e-10
    assert np.allclose(r.residues(near), -2 / np.pi, rtol=1e-8)


def test_aaa_input_rules():
    with pytest.raises(FabplanError, match="distinct"):
        aaa([0.0, 1.0, 1.0], [1.0, 2.0, 3.0])
    with pytest.raises(FabplanError, match="finite"):
        aaa([0.0, 1.0], [1.0, math.nan])
    assert np.allclose(chebyshev_points(5), [-1, -math.sqrt(0.5), 0, math.sqrt(0.5), 1])


def hard_function(f_hz):
    """Smooth in [100, 200] MHz except for a pole 0.15 % of the half band off the axis."""
    x = (f_hz - 150e6) / 50e6
    return 50 + 30j * x + 1 / (x - 0.3 - 0.003j) + np.exp(x)


def test_adaptive_refinement_triggers_near_a_pole_and_the_fit_is_exact_at_samples():
    # source: the function is known in closed form; its pole at x = 0.3 + 0.003j lies between
    # the first Chebyshev samples, which cannot see it: the loop must add solves there
    fit = fit_sweep(hard_function, 100e6, 200e6, rtol=1e-6)
    assert fit.converged
    assert fit.rounds[0][1] > 1e-4  # the first check failed: the fit was refined
    assert fit.solves > 7 + 2
    f = np.linspace(100e6, 200e6, 401)
    ref = hard_function(f)
    assert np.max(np.abs(fit.z(f) - ref) / np.abs(ref)) < 1e-6
    support = np.isin(fit.sample_x, fit.fits[0].support.real)
    assert support.sum() == len(fit.fits[0].support)
    assert np.array_equal(fit.z(fit.sample_hz[support]), fit.samples[support, 0])  # exact
    assert np.allclose(fit.z(fit.sample_hz), fit.samples[:, 0], rtol=1e-12, atol=0)
    pole = 150e6 + 50e6 * (0.3 + 0.003j)
    assert np.min(np.abs(fit.poles_hz() - pole)) < 1e-6 * abs(pole)
    with pytest.raises(FabplanError, match="does not extrapolate"):
        fit.z([99.9e6])
    with pytest.raises(FabplanError, match="f_lo_hz < f_hi_hz"):
        fit_sweep(hard_function, 200e6, 100e6)


def test_budget_exhausted_is_reported_not_hidden():
    fit = fit_sweep(hard_function, 100e6, 200e6, rtol=1e-6, max_solves=9)
    assert not fit.converged and fit.solves == 9 and fit.max_error > 1e-6


@pytest.fixture(scope="module")
def example_element():
    from fabplan import load_design, make_plan
    from fabplan.em.stage import structure_model_of
    from fabplan.plan import electrical_input
    example = Path(__file__).resolve().parents[2] / "examples" / "club-uhf-folded-dipoles.toml"
    plan = make_plan(load_design(example))
    settings = plan.design.electrical
    freqs = settings.frequencies()
    e = plan.elements[0]
    inputs = [electrical_input(plan.design, e.spec, e.geometry, e.pieces)]
    model = structure_model_of(inputs, settings, float(freqs[-1]), {})
    return model, freqs, settings.chain


def test_fit_reproduces_the_example_sweep(example_element):
    # reference: the solver's own 81-point sweep of the example's folded dipole (as planned,
    # released radii, copper tube), scipy's brentq on the true reactance for the resonance and
    # scipy's bounded minimiser on the true SWR through the example's coax balun
    from scipy.optimize import brentq, minimize_scalar

    model, freqs, chain = example_element
    assert len(freqs) == 81
    z = model.sweep(freqs)
    fit = fit_sweep(model.impedance, float(freqs[0]), float(freqs[-1]))
    assert fit.converged and fit.solves <= 11
    assert np.max(np.abs(fit.z(freqs) - z) / np.abs(z)) < 1e-6
    (res,) = fit.resonances()
    assert res.kind == "series"
    i = int(np.argmin(np.abs(z.imag)))
    true = brentq(lambda f: model.impedance(f).imag, freqs[i - 1], freqs[i + 1], xtol=1e-3)
    assert res.f_hz == pytest.approx(true, rel=1e-8)

    def gamma(f):
        zr = chain.at_radio(model.impedance(f), f)
        return abs((zr - 50.0) / (zr + 50.0))

    (low,) = fit.swr_minima(50.0, through=chain.at_radio)
    ref = minimize_scalar(gamma, bounds=(low.f_hz * 0.99, low.f_hz * 1.01), method="bounded",
                          options={"xatol": 1e-3})
    assert not low.at_edge
    assert low.swr == pytest.approx((1 + ref.fun) / (1 - ref.fun), rel=1e-8)
    assert low.f_hz == pytest.approx(ref.x, rel=1e-5)  # a broad minimum: poorly defined


def test_fit_reproduces_a_loop_through_antiresonance_and_resonance(em_wires):
    # reference: the solver's 81-point sweep of a 1 m circular loop from 100 to 340 MHz
    # (circumference 0.33 to 1.13 wavelengths): the antiresonance near half a wavelength and
    # the series resonance near one wavelength (Balanis, Antenna Theory 3rd ed., sec. 5.6,
    # loop impedance curves, from memory), located by scipy's brentq on the true reactance
    from scipy.optimize import brentq

    model = wire_model(em_wires.circle_nodes(1000.0 / (2 * math.pi), 48), 1.0, closed=True,
                       source_segments=[47], resistivity_ohm_m=RHO_CU)
    freqs = np.linspace(100e6, 340e6, 81)
    z = model.sweep(freqs)
    fit = fit_sweep(model.impedance, 100e6, 340e6)
    assert fit.converged and fit.solves < 25
    assert np.max(np.abs(fit.z(freqs) - z) / np.abs(z)) < 1e-6
    found = fit.resonances()
    assert [r.kind for r in found] == ["parallel", "series"]
    for r in found:
        i = int(np.argmin(np.abs(freqs - r.f_hz)))
        true = brentq(lambda f: model.impedance(f).imag, freqs[i - 2], freqs[i + 2], xtol=1e-3)
        assert r.f_hz == pytest.approx(true, rel=1e-8)
        assert r.r_ohm == pytest.approx(model.impedance(true).real, rel=1e-6)
    assert found[0].r_ohm > 10_000 > 300 > found[1].r_ohm  # high at antiresonance
    assert 0.45 < found[0].f_hz / C0 < 0.52 and 1.0 < found[1].f_hz / C0 < 1.1  # C / lambda
    polished = fit.resonances(polish=True)
    assert all(p.polished for p in polished)
    assert abs(model.impedance(polished[1].f_hz).imag) < 1e-6


def test_fit_of_impedance_and_gain_together(em_wires):
    # reference: the solver and the far field at every one of 81 frequencies; the fit takes
    # [Z, broadside gain (ratio)] from each solve and fits each on its own
    nodes, src = em_wires.dipole_nodes(1000.0, gap=4.0, h=25.0)
    model = wire_model(nodes, 2.0, closed=False, source_segments=src, resistivity_ohm_m=RHO_CU,
                       lossless_segments=src)

    def both(f):
        sol = model.solve(f)
        g = ff.far_field(sol, model).gain(np.array(math.pi / 2), np.array(0.0))
        return np.array([sol.z_in, float(g)])

    freqs = np.linspace(100e6, 200e6, 81)
    fit = fit_sweep(both, 100e6, 200e6)
    ref = np.array([both(f) for f in freqs])
    assert fit.converged and not fit.scalar
    for k in (0, 1):
        assert np.max(np.abs(fit.values(freqs, k) - ref[:, k]) / np.abs(ref[:, k])) < 1e-6
    assert np.max(np.abs(fit.values(freqs, 1).imag)) < 1e-9  # a real quantity stays real


def test_guided_by_the_first_component_the_others_still_fit(em_wires):
    # reference: the solver and the far field at 81 frequencies. The leave-one-out is taken
    # over the impedance only (`guide=1`, what the electrical stage asks); the gain, fitted
    # beside it and checked by every fresh solve, must still be reproduced to the tolerance
    nodes, src = em_wires.dipole_nodes(1000.0, gap=4.0, h=25.0)
    model = wire_model(nodes, 2.0, closed=False, source_segments=src, resistivity_ohm_m=RHO_CU,
                       lossless_segments=src)

    def both(f):
        sol = model.solve(f)
        g = ff.far_field(sol, model).gain(np.array(math.pi / 3), np.array(0.0))
        return np.array([sol.z_in, float(g)])

    freqs = np.linspace(100e6, 200e6, 81)
    fit = fit_sweep(both, 100e6, 200e6, rtol=1e-7, guide=1)
    ref = np.array([both(f) for f in freqs])
    assert fit.converged
    for k in (0, 1):
        assert np.max(np.abs(fit.values(freqs, k) - ref[:, k]) / np.abs(ref[:, k])) < 1e-6
    with pytest.raises(FabplanError, match="one component"):
        fit_sweep(both, 100e6, 200e6, guide=0)


@pytest.mark.parametrize("offset", [0.0, 1e-12, -1e-12, 3e-9, -3e-9])
def test_a_reactance_that_touches_zero_is_one_resonance_whatever_the_round_off(offset):
    # common practice, no source: Z = 40 + j(k (f - f0)^2 + offset) touches X = 0 at f0 (a
    # loop tuned by its capacitor at critical coupling); a hair above, on or a hair
    # below the axis it is the same one resonance at f0, at R = 40 ohm
    f0 = 14.175e6

    def z(f):
        return 40.0 + 1j * (1e-8 * (f - f0) ** 2 + offset)

    fit = fit_sweep(z, 14.125e6, 14.225e6)
    (res,) = fit.resonances()
    assert res.f_hz == pytest.approx(f0, rel=1e-6)
    assert res.r_ohm == pytest.approx(40.0, rel=1e-9)


def test_a_reactance_that_stays_clear_of_zero_has_no_resonance():
    # the touch rule must not invent one: the minimum of |X| here is 0.5 ohm
    fit = fit_sweep(lambda f: 40.0 + 1j * (1e-8 * (f - 14.175e6) ** 2 + 0.5),
                    14.125e6, 14.225e6)
    assert fit.resonances() == []
