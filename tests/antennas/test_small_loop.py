"""Small transmitting loop: the published formulas against hand working and tables."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import integrate

from fabplan.antennas.small_loop import (
    RADIATION_COEFFICIENT,
    LoopGeometry,
    analyse_loop,
    circle_inductance_h,
    conductor_loss_ohm,
    corner_mutual_inductance_h,
    coupling_loop,
    loop_inductance_h,
    polygon_inductance_h,
    radiation_resistance_ohm,
    skin_depth_mm,
    small_loop_findings,
    straight_wire_inductance_h,
    surface_resistance_ohm,
    tune_band,
)
from fabplan.errors import DesignError

MU0 = 4e-7 * math.pi
C0_MM = 299_792_458_000.0
RHO_CU = 1.72e-8  # ohm m, annealed copper (trade-notes.md, CDA data)


def test_radiation_coefficient_is_balanis_31171() -> None:
    # source: Balanis, Antenna Theory 3rd ed., eq. 5-24, R_r = 31,171 (S / lambda^2)^2
    # (from memory); by hand: (8/3) pi^3 eta with eta = 120 pi gives 320 pi^4 = 31170.9
    assert RADIATION_COEFFICIENT == pytest.approx(320 * math.pi ** 4, rel=1e-15)
    assert abs(RADIATION_COEFFICIENT - 31171) < 0.5


def test_radiation_resistance_square_tenth_wave() -> None:
    # source: salimwireless.com worked problem "Radiation resistance for a small square
    # loop ... of size lambda/10": A = lambda^2/100, R_r = 31,200 x 1e-4 = 3.12 ohm (read)
    f = 14e6
    lam = C0_MM / f
    r = radiation_resistance_ohm((lam / 10) ** 2, f)
    assert r == pytest.approx(3.12, rel=2e-3)  # their coefficient is 31,200, ours 31,171
    # the circular form 20 pi^2 (C/lambda)^4 (Balanis eq. 5-24, from memory) for C = 0.1 lambda
    circ = radiation_resistance_ohm(math.pi * (lam * 0.1 / (2 * math.pi)) ** 2, f)
    assert circ == pytest.approx(20 * math.pi ** 2 * 0.1 ** 4, rel=1e-12)


def test_circle_inductance_by_hand() -> None:
    # source: Grover, Inductance Calculations, single circular turn (from memory):
    # L = mu0 b (ln(8b/a) - 2); b = 0.5 m, a = 11 mm: 4 pi e-7 * 0.5 * (ln(363.64) - 2)
    by_hand = 4e-7 * math.pi * 0.5 * (math.log(8 * 0.5 / 0.011) - 2)
    assert by_hand == pytest.approx(2.448e-6, rel=1e-3)
    assert circle_inductance_h(1000, 22) == pytest.approx(by_hand, rel=1e-12)
    # uniform (DC) current adds the internal inductance mu0/(8 pi) per metre x 2 pi b = mu0 b/4
    diff = circle_inductance_h(1000, 22, "uniform") - circle_inductance_h(1000, 22)
    assert diff == pytest.approx(MU0 * 0.5 / 4, rel=1e-12)


def test_square_inductance_matches_grover_square_formula() -> None:
    # source: Grover, Inductance Calculations, square of round wire (from memory):
    # L = (2 mu0 s / pi) (ln(s/a) - 0.774); and by hand: 4 sides' self-inductance minus
    # twice the mutual inductance of the two pairs of opposite sides (adjacent sides are
    # perpendicular and contribute nothing)
    s, a = 1.0, 1e-3
    self_side = MU0 / (2 * math.pi) * (s * math.asinh(s / a) - math.hypot(s, a) + a)
    opposite = MU0 / (2 * math.pi) * (s * math.asinh(1.0) - math.sqrt(2) * s + s)
    by_hand = 4 * self_side - 4 * opposite
    computed = polygon_inductance_h(4, 1000, 2)
    assert computed == pytest.approx(by_hand, rel=1e-9)
    assert computed == pytest.approx(2 * MU0 * s / math.pi * (math.log(s / a) - 0.774), rel=2e-4)


@pytest.mark.parametrize(("sides", "theta"), [(3, 3.197), (4, 2.853), (6, 2.636), (8, 2.561)],
                         ids=["triangle", "square", "hexagon", "octagon"])
def test_polygon_matches_terman_shape_constants(sides: int, theta: float) -> None:
    # source: Terman, Radio Engineers' Handbook, single-turn loops of round wire
    # L = 0.002 l (ln(2l/rho) - theta) uH (cm), after Grover (constants from memory);
    # the constants are the thin-wire limit, so the wire is thin here (a/side = 1e-5)
    side_m, a_m = 1.0, 1e-5
    ell = sides * side_m
    computed = polygon_inductance_h(sides, 1000, 2 * a_m * 1000)
    terman = MU0 / (2 * math.pi) * ell * (math.log(2 * ell / a_m) - theta)
    assert computed == pytest.approx(terman, rel=1e-4)


def test_many_sided_polygon_tends_to_the_circle() -> None:
    # source: Grover's ring formula (from memory) as the limit of Grover's polygon method,
    # and Terman's circle constant 2.451 (from memory): by hand, with l = 2 pi b,
    # ln(2l/a) - (ln(8b/a) - 2) = ln(pi/2) + 2 = 2.4516
    assert math.log(math.pi / 2) + 2 == pytest.approx(2.451, abs=1e-3)
    per, d = 1000 * math.pi, 0.05
    poly = loop_inductance_h(LoopGeometry.with_perimeter(72, per, d))
    circ = circle_inductance_h(1000, d)
    assert poly == pytest.approx(circ, rel=2e-3)


@pytest.mark.parametrize("angle_deg", [45.0, 90.0, 135.0])
def test_corner_mutual_against_neumann_quadrature(angle_deg: float) -> None:
    # source: Neumann's formula M = mu0/(4 pi) cos(eps) int int ds dt / R, integrated by
    # scipy.integrate.dblquad (reference library)
    eps = math.radians(angle_deg)
    ell, m = 0.7, 1.3

    def integrand(t: float, s: float) -> float:
        return 1.0 / math.sqrt(s * s + t * t - 2 * s * t * math.cos(eps))

    val, _ = integrate.dblquad(integrand, 0, ell, 0, m, epsabs=1e-12, epsrel=1e-10)
    ref = MU0 / (4 * math.pi) * math.cos(eps) * val
    got = corner_mutual_inductance_h(700, 1300, eps)
    assert got == pytest.approx(ref, rel=1e-7, abs=1e-15)


def test_straight_wire_thin_limit() -> None:
    # source: Grover / Rosa, straight round wire at high frequency (from memory):
    # L = (mu0 l / 2 pi)(ln(2l/a) - 1) for l >> a
    ell, a = 2.0, 1e-4
    # (the exact form differs from the thin limit by terms of order a/l = 5e-5)
    assert straight_wire_inductance_h(2000, 0.2) == pytest.approx(
        MU0 * ell / (2 * math.pi) * (math.log(2 * ell / a) - 1), rel=2e-5)


def test_skin_depth_and_loss_by_hand() -> None:
    # source: trade-notes.md, copper at 146 MHz, delta ~ 5.5 um; delta = sqrt(rho/(pi f mu0))
    assert skin_depth_mm(146e6, RHO_CU) * 1000 == pytest.approx(5.5, abs=0.1)
    rs = surface_resistance_ohm(7.1e6, RHO_CU)
    assert rs == pytest.approx(math.sqrt(math.pi * 7.1e6 * MU0 * RHO_CU), rel=1e-12)
    # R = Rs l / (pi d): 3.1416 m of 22 mm tube
    assert conductor_loss_ohm(1000 * math.pi, 22, 7.1e6, RHO_CU) == pytest.approx(
        rs * math.pi / (math.pi * 0.022), rel=1e-12)


def test_worked_loop_by_hand() -> None:
    # source: series resonant circuit relations (any circuit text) and the formulas above,
    # worked by hand for a 1 m circle of 22 mm copper tube at 7.1 MHz and 100 W
    f, p = 7.1e6, 100.0
    lam = C0_MM / f / 1000  # m
    ind = 4e-7 * math.pi * 0.5 * (math.log(8 * 0.5 / 0.011) - 2)
    x = 2 * math.pi * f * ind
    rr = 31170.9 * ((math.pi * 0.25) / lam ** 2) ** 2
    rloss = math.sqrt(math.pi * f * MU0 * RHO_CU) * math.pi / (math.pi * 0.022)
    rtot = rr + rloss + 0.005  # plus a 5 milliohm joint
    pt = analyse_loop(LoopGeometry.circle(1000, 22), f, resistivity_ohm_m=RHO_CU, power_w=p,
                      joint_resistance_ohm=0.005)
    assert pt.reactance_ohm == pytest.approx(x, rel=1e-12)
    assert pt.radiation_resistance_ohm == pytest.approx(rr, rel=1e-5)
    assert pt.total_resistance_ohm == pytest.approx(rtot, rel=1e-5)
    assert pt.efficiency == pytest.approx(rr / rtot, rel=1e-5)
    assert pt.capacitance_f == pytest.approx(1 / (2 * math.pi * f * x), rel=1e-12)
    assert pt.capacitor_v_rms == pytest.approx(x * math.sqrt(p / rtot), rel=1e-5)
    assert pt.capacitor_v_peak == pytest.approx(math.sqrt(2) * pt.capacitor_v_rms, rel=1e-12)
    assert pt.q_loaded == pytest.approx(x / (2 * rtot), rel=1e-5)
    # the numbers a builder expects: about 205 pF, efficiency near 12 %, a few kV
    assert pt.capacitance_f == pytest.approx(205.3e-12, rel=1e-3)
    assert 4000 < pt.capacitor_v_rms < 6000
    assert pt.findings == ()


def test_capacitor_q_and_esr() -> None:
    g = LoopGeometry.circle(1000, 22)
    base = dict(resistivity_ohm_m=RHO_CU, power_w=100.0)
    a = analyse_loop(g, 7.1e6, capacitor_q=2000.0, **base)  # type: ignore[arg-type]
    # source: ESR = X / Q for a capacitor of quality factor Q (definition of Q)
    assert a.capacitor_loss_ohm == pytest.approx(a.reactance_ohm / 2000, rel=1e-12)
    b = analyse_loop(g, 7.1e6, capacitor_esr_ohm=a.capacitor_loss_ohm, **base)  # type: ignore[arg-type]
    assert b.total_resistance_ohm == pytest.approx(a.total_resistance_ohm, rel=1e-12)
    with pytest.raises(DesignError, match="not both"):
        analyse_loop(g, 7.1e6, capacitor_q=2000.0, capacitor_esr_ohm=0.01, **base)  # type: ignore[arg-type]


def test_bandwidths_agree_at_half_power() -> None:
    # source: Yaghjian & Best, IEEE TAP 53(4) 2005 (from memory): matched VSWR-s bandwidth
    # (s-1)/(Q sqrt(s)); at |Gamma|^2 = 1/2 (s = 5.83) it is the half-power bandwidth 2/Q
    s = (1 + math.sqrt(0.5)) / (1 - math.sqrt(0.5))
    assert (s - 1) / math.sqrt(s) == pytest.approx(2.0, rel=1e-12)
    pt = analyse_loop(LoopGeometry.circle(800, 15), 10.1e6, resistivity_ohm_m=RHO_CU,
                      power_w=10.0)
    assert pt.bandwidth_3db_hz == pytest.approx(2 * pt.frequency_hz / pt.q_unloaded, rel=1e-12)
    assert pt.bandwidth_swr2_hz == pytest.approx(
        pt.frequency_hz / (math.sqrt(2) * pt.q_unloaded), rel=1e-12)


def test_validity_limits_and_findings() -> None:
    g = LoopGeometry.circle(1000, 22)
    lam_hz = C0_MM / (math.pi * 1000)  # frequency at which C = 1 wavelength
    assert small_loop_findings(g, 0.05 * lam_hz, RHO_CU) == ()
    codes = [fd.code for fd in small_loop_findings(g, 0.2 * lam_hz, RHO_CU)]
    assert codes == ["small-loop-approximate"]
    with pytest.raises(DesignError, match="electrical model"):
        small_loop_findings(g, 0.35 * lam_hz, RHO_CU)
    thin = small_loop_findings(g, 0.05 * lam_hz, RHO_CU, wall_mm=0.01)
    assert [fd.code for fd in thin] == ["loop-wall-thin"]
    with pytest.raises(DesignError, match="thin beside the loop"):
        LoopGeometry.circle(100, 10)
    with pytest.raises(DesignError, match="3 or more sides"):
        LoopGeometry.polygon(2, 100, 1)


def test_band_tuning_capacitance_scales_as_one_over_f_squared() -> None:
    # source: C = 1/(omega^2 L) with L fixed: C_low / C_high = (f_high / f_low)^2
    g = LoopGeometry.polygon(8, 400, 15)
    band = tune_band(g, 7.0e6, 7.3e6, steps=4, resistivity_ohm_m=RHO_CU, power_w=50.0,
                     self_capacitance_f=0.0)
    assert band.capacitance_max_f / band.capacitance_min_f == pytest.approx((7.3 / 7.0) ** 2,
                                                                            rel=1e-12)
    caps = [p.capacitance_f for p in band.points]
    assert caps == sorted(caps, reverse=True)
    with_self = tune_band(g, 7.0e6, 7.3e6, steps=4, resistivity_ohm_m=RHO_CU, power_w=50.0,
                          self_capacitance_f=5e-12)
    assert with_self.capacitance_max_f == pytest.approx(band.capacitance_max_f - 5e-12,
                                                        rel=1e-12)


def test_polygon_area_and_octagon_geometry() -> None:
    # source: regular polygon area (n/2) R^2 sin(2 pi/n); octagon side s: area 2(1+sqrt 2) s^2
    g = LoopGeometry.polygon(8, 400, 15)
    assert g.area_mm2 == pytest.approx(2 * (1 + math.sqrt(2)) * 400 ** 2, rel=1e-12)
    assert g.inscribed_diameter_mm == pytest.approx(400 * (1 + math.sqrt(2)), rel=1e-12)


def test_coupling_loop_fifth() -> None:
    # common practice, no source: coupling loop about 1/5 of the main loop's diameter
    c = coupling_loop(1000)
    assert c.diameter_mm == pytest.approx(200)
    assert c.basis.startswith("[P]")


@settings(max_examples=40, derandomize=True, deadline=None)
@given(diameter=st.floats(300, 3000), wire_fraction=st.floats(0.004, 0.05),
       mhz=st.floats(3.5, 14.5), power=st.floats(1, 1000), joint=st.floats(0, 0.05))
def test_power_and_voltage_consistent(diameter: float, wire_fraction: float, mhz: float,
                                      power: float, joint: float) -> None:
    # source: P = I^2 R and V = I X (Ohm's law) for the matched series resonant loop
    g = LoopGeometry.circle(diameter, wire_fraction * diameter)
    f = mhz * 1e6
    if g.perimeter_mm / (C0_MM / f) > 0.3:
        with pytest.raises(DesignError):
            analyse_loop(g, f, resistivity_ohm_m=RHO_CU, power_w=power)
        return
    pt = analyse_loop(g, f, resistivity_ohm_m=RHO_CU, power_w=power, joint_resistance_ohm=joint)
    assert pt.current_a_rms ** 2 * pt.total_resistance_ohm == pytest.approx(power, rel=1e-12)
    assert pt.current_a_rms * pt.reactance_ohm == pytest.approx(pt.capacitor_v_rms, rel=1e-12)
    assert 0 < pt.efficiency < 1
    assert np.isfinite(pt.bandwidth_3db_hz)
