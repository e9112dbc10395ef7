"""Matching devices: lines, stubs, hairpin L-network, gamma and T matches."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.antennas.matching import (
    current_division,
    gamma_input_ohm,
    gamma_match,
    hairpin_match,
    l_network_input_ohm,
    shorted_stub_length_mm,
    shorted_stub_reactance_ohm,
    t_match,
    t_match_input_ohm,
    two_wire_z0_approx_ohm,
    two_wire_z0_ohm,
    unequal_wire_z0_ohm,
)
from fabplan.errors import DesignError

C0_MM = 299_792_458_000.0


def test_two_wire_line_exact_and_handbook_forms() -> None:
    # source: Terman, Radio Engineers' Handbook / ARRL Antenna Book (from memory):
    # Z0 = 120 acosh(D/d), and 276 log10(2D/d) for D >> d; by hand 120 ln(10) = 276.3
    assert 120 * math.log(10) == pytest.approx(276.3, abs=0.05)
    assert two_wire_z0_ohm(100, 10) == pytest.approx(120 * math.acosh(10), rel=1e-15)
    assert two_wire_z0_ohm(100, 10) == pytest.approx(359.19, abs=0.01)  # by hand
    assert two_wire_z0_approx_ohm(100, 10) == pytest.approx(
        two_wire_z0_ohm(100, 10), rel=1e-3)  # D/d = 10: the forms agree to 0.1 %
    # the unequal-conductor form reduces to the equal one
    assert unequal_wire_z0_ohm(100, 10, 10) == pytest.approx(two_wire_z0_ohm(100, 10),
                                                             rel=1e-12)
    with pytest.raises(DesignError, match="spacing"):
        two_wire_z0_ohm(5, 10)


def test_shorted_stub_reactance_against_formula() -> None:
    # source: shorted lossless line Z = j Z0 tan(beta l) (any transmission-line text)
    f = 144e6
    lam = C0_MM / f
    assert shorted_stub_reactance_ohm(300, lam / 8, f) == pytest.approx(300, rel=1e-12)
    assert shorted_stub_reactance_ohm(300, lam / 16, f) == pytest.approx(
        300 * math.tan(math.pi / 8), rel=1e-12)
    # with a velocity factor the line is electrically longer
    assert shorted_stub_reactance_ohm(300, 0.66 * lam / 8, f, velocity_factor=0.66) == (
        pytest.approx(300, rel=1e-12))
    # inverse: inductive under a quarter wave, capacitive between a quarter and a half
    assert shorted_stub_length_mm(300, 300, f) == pytest.approx(lam / 8, rel=1e-12)
    ell = shorted_stub_length_mm(300, -300, f)
    assert ell == pytest.approx(3 * lam / 8, rel=1e-12)
    assert shorted_stub_reactance_ohm(300, ell, f) == pytest.approx(-300, rel=1e-9)


def test_hairpin_l_network_by_hand() -> None:
    # source: L-network design (any circuit text): Q = sqrt(Z/R - 1), X_s = Q R, X_p = Z/Q;
    # by hand for R = 22, Z = 50: Q = 1.128152, X_s = 24.8193, X_p = 44.3203
    f = 144.2e6
    hp = hairpin_match(22.0, 50.0, f, rod_spacing_mm=30.0, rod_diameter_mm=4.0,
                       element_reactance_ohm=-5.0)
    assert hp.q == pytest.approx(1.128152, rel=1e-6)
    assert hp.element_reactance_ohm == pytest.approx(-24.8193, abs=1e-4)
    assert hp.shunt_reactance_ohm == pytest.approx(44.3203, abs=1e-4)
    assert hp.reactance_change_ohm == pytest.approx(-19.8193, abs=1e-4)
    # the network terminated in the shortened element presents the system impedance
    zin = l_network_input_ohm(complex(22.0, hp.element_reactance_ohm), hp.shunt_reactance_ohm)
    assert abs(zin - 50.0) < 1e-9
    # the hairpin's stub really has that reactance (Z0 from its spacing)
    assert shorted_stub_reactance_ohm(two_wire_z0_ohm(30.0, 4.0), hp.length_mm, f) == (
        pytest.approx(hp.shunt_reactance_ohm, rel=1e-12))
    assert hp.inductance_h == pytest.approx(hp.shunt_reactance_ohm / (2 * math.pi * f))
    with pytest.raises(DesignError, match="below the system impedance"):
        hairpin_match(60.0, 50.0, f, rod_spacing_mm=30.0, rod_diameter_mm=4.0)


@settings(max_examples=40, derandomize=True, deadline=None)
@given(r=st.floats(5.0, 45.0), z=st.floats(50.0, 300.0))
def test_l_network_always_matches(r: float, z: float) -> None:
    hp = hairpin_match(r, z, 50e6, rod_spacing_mm=50.0, rod_diameter_mm=6.0)
    zin = l_network_input_ohm(complex(r, hp.element_reactance_ohm), hp.shunt_reactance_ohm)
    assert abs(zin - z) < 1e-9 * z


def test_current_division_from_charge_balance() -> None:
    # source: first principles: two thin parallel wires at one potential (antenna mode),
    # line charges q1 (rod, radius a1) and q2 (element, a2) at spacing s satisfy
    # q1 ln(1/a1) + q2 ln(1/s) = q2 ln(1/a2) + q1 ln(1/s); solved here as a 2x2 system
    s, d_rod, d_el = 40.0, 4.0, 12.0
    a1, a2 = d_rod / 2, d_el / 2
    m = np.array([[math.log(1 / a1) - math.log(1 / s), -(math.log(1 / a2) - math.log(1 / s))],
                  [1.0, 1.0]])
    q1, q2 = np.linalg.solve(m, np.array([0.0, 1.0]))
    assert current_division(s, d_rod, d_el) == pytest.approx(q2 / q1, rel=1e-12)
    assert current_division(s, 6.0, 6.0) == pytest.approx(1.0)


def test_t_match_over_the_whole_element_is_a_folded_dipole() -> None:
    # source: Balanis, Antenna Theory, folded dipole: a half-wave folded dipole of equal
    # conductors presents 4 x the dipole's impedance (from memory); with unequal conductors
    # (1 + a)^2 x (same model)
    f = 300e6
    lam = C0_MM / f
    zd = complex(73.1, 42.5)
    z = t_match_input_ohm(zd, f, t_length_mm=lam / 2, spacing_mm=20.0, rod_diameter_mm=5.0,
                          element_diameter_mm=5.0)
    assert z == pytest.approx(4 * zd, rel=1e-9)
    z2 = t_match_input_ohm(zd, f, t_length_mm=lam / 2, spacing_mm=20.0, rod_diameter_mm=3.0,
                           element_diameter_mm=8.0)
    alpha = current_division(20.0, 3.0, 8.0)
    assert z2 == pytest.approx((1 + alpha) ** 2 * zd, rel=1e-9)
    assert alpha > 1  # a thinner fed conductor steps up more than 4 (ARRL, from memory)


def _gamma_by_abcd(zd: complex, f: float, rod_mm: float, s: float, d_rod: float, d_el: float,
                   cap: float) -> complex:
    """The gamma's equivalent circuit cascaded with ABCD matrices.

    source: Balanis's folded-dipole decomposition written as a circuit: series capacitor,
    then the shorted rod-element line as a shunt stub, then an ideal transformer of
    impedance ratio (1 + a)^2 / 2, loaded by the element.
    """
    alpha = math.log(2 * s / d_rod) / math.log(2 * s / d_el)
    z0 = 60 * math.acosh((4 * s * s - d_rod ** 2 - d_el ** 2) / (2 * d_rod * d_el))
    beta = 2 * math.pi * f / C0_MM
    zt = 1j * z0 * math.tan(beta * rod_mm)
    n = math.sqrt((1 + alpha) ** 2 / 2)
    series = np.array([[1, -1j / (2 * math.pi * f * cap)], [0, 1]], dtype=complex)
    shunt = np.array([[1, 0], [1 / zt, 1]], dtype=complex)
    xfmr = np.array([[n, 0], [0, 1 / n]], dtype=complex)
    a, b, c, d = (series @ shunt @ xfmr).ravel()
    return complex((a * zd + b) / (c * zd + d))


@pytest.mark.parametrize(("zd", "f", "s", "d_rod", "d_el"), [
    (complex(25, 10), 14.15e6, 150.0, 12.0, 25.0),
    (complex(20, 5), 50.1e6, 60.0, 6.0, 16.0),
    (complex(30, 20), 144.2e6, 25.0, 4.0, 10.0),
], ids=["20m", "6m", "2m"])
def test_gamma_design_matches_and_agrees_with_the_circuit(zd: complex, f: float, s: float,
                                                          d_rod: float, d_el: float) -> None:
    g = gamma_match(zd, 50.0, f, spacing_mm=s, rod_diameter_mm=d_rod, element_diameter_mm=d_el)
    assert abs(g.input_ohm - 50.0) < 1e-9
    again = gamma_input_ohm(zd, f, rod_length_mm=g.rod_length_mm, spacing_mm=s,
                            rod_diameter_mm=d_rod, element_diameter_mm=d_el,
                            capacitance_f=g.capacitance_f)
    circuit = _gamma_by_abcd(zd, f, g.rod_length_mm, s, d_rod, d_el, g.capacitance_f)
    assert abs(again - circuit) < 1e-9
    assert 0 < g.rod_length_mm < C0_MM / f / 4
    assert g.capacitance_f > 0


def test_t_match_design_and_gamma_half_relation() -> None:
    f = 144.2e6
    zd = complex(25, 10)
    t = t_match(zd, 200.0, f, spacing_mm=40.0, rod_diameter_mm=2.0, element_diameter_mm=12.0)
    assert abs(t.input_ohm - 200.0) < 1e-9
    # a T is two gammas in series: same geometry, gamma rod half the T's length
    zt = t_match_input_ohm(zd, f, t_length_mm=t.t_length_mm, spacing_mm=40.0,
                           rod_diameter_mm=2.0, element_diameter_mm=12.0)
    zg = gamma_input_ohm(zd, f, rod_length_mm=t.t_length_mm / 2, spacing_mm=40.0,
                         rod_diameter_mm=2.0, element_diameter_mm=12.0)
    assert zt == pytest.approx(2 * zg, rel=1e-12)
    with pytest.raises(DesignError, match="most this match reaches"):
        t_match(zd, 200.0, f, spacing_mm=40.0, rod_diameter_mm=4.0, element_diameter_mm=10.0)
