"""A capacitor-tuned small loop with a coupling loop: the electrical stage's loop figures."""

from __future__ import annotations

import math

import numpy as np
import pytest

from fabplan.em.loop import capacitor_voltage_v

LOOP = """
[project]
name = "test loop"
[stock]
catalogue = "water-l-1/2"
[shop]
units = "mm"
[[element]]
name = "loop"
shape = "circle-loop"
diameter = "{D} mm"
feed_gap = "10 mm"
[element.placement]
at = ["0 mm", "0 mm", "0 mm"]
[element.capacitor]
q = 1000
{cap}
[[element]]
name = "coupler"
shape = "circle-loop"
diameter = "{d} mm"
feed_gap = "5 mm"
[element.stock]
catalogue = "awg-12"
[element.placement]
at = ["0 mm", "{y} mm", "0 mm"]
[electrical]
target = "7.1 MHz"
{band}
sweep = {{ from = "7.0995 MHz", to = "7.1005 MHz", step = "0.0005 MHz" }}
power = "100 W"
resistivity = 1.72e-8
"""


def loop_text(D: float = 600.0, d: float = 150.0, y: float = 140.0, cap: str = "",
              band: str = 'band = { from = "7.0 MHz", to = "7.3 MHz" }') -> str:
    return LOOP.format(D=D, d=d, y=y, cap=cap, band=band)


@pytest.fixture(scope="module")
def small():
    """A 600 mm circle of 1/2 in tube at 7.1 MHz (C/lambda 0.045) and its coupling loop."""
    from fabplan.design.read import parse_design
    from fabplan.plan import make_plan

    return make_plan(parse_design(loop_text()))


def loop_of(plan):
    (st,) = plan.electrical.structures
    assert st.loop is not None
    return st.loop


def test_small_loop_formulas_against_the_model(small, plan_of):
    # source: Balanis, Antenna Theory 3rd ed., eq. 5-24 (small loop R_r = 320 pi^4
    # (A / lambda^2)^2) and Grover, Inductance Calculations (circular ring, surface
    # current, L = mu0 b (ln(8b/a) - 2)), from memory: limits for a small loop, so the
    # model (the loop alone, its gap driven) approaches them as C/lambda falls, its
    # error about as (C/lambda)^2; at C/lambda = 0.045 within 3 % and 1.5 % (as the
    # solver's own test at 0.05). Skin-effect loss R_s l / (pi d) (Ramo, Whinnery & Van
    # Duzer, from memory) within 2 % (the current is uniform to cos(k C / 2))
    lf = loop_of(small)
    assert lf.circumference_wl == pytest.approx(math.pi * 600 / (299792458e3 / 7.1e6), rel=1e-9)
    r_err = lf.radiation_resistance_model_ohm / lf.radiation_resistance_formula_ohm - 1
    l_err = lf.inductance_model_h / lf.inductance_formula_h - 1
    assert abs(r_err) < 0.03
    assert abs(l_err) < 0.015
    assert lf.conductor_loss_model_ohm == pytest.approx(lf.conductor_loss_formula_ohm, rel=0.02)
    bigger = loop_of(plan_of(loop_text(D=800, d=200, y=187, band="")))
    r_big = bigger.radiation_resistance_model_ohm / bigger.radiation_resistance_formula_ohm - 1
    ratio = (bigger.circumference_wl / lf.circumference_wl) ** 2
    assert r_big / r_err == pytest.approx(ratio, rel=0.15)


def test_capacitor_voltage_by_hand(small):
    # source: the series resonant circuit (trade-notes.md, small loop): I = sqrt(P / R),
    # V = I X; by hand, 100 W into 0.25 ohm is 20 A, across 200 ohm 4000 V RMS
    assert capacitor_voltage_v(100.0, 0.25, 200.0) == pytest.approx(4000.0, rel=1e-12)
    lf = loop_of(small)
    # the model's capacitor voltage against V = X sqrt(P / R) with R the sum of the parts:
    # the loop's radiation and conductor resistance (the loop alone), the capacitor's X/Q;
    # the rest (the coupling loop's own loss) is a few percent
    r_parts = (lf.radiation_resistance_model_ohm + lf.conductor_loss_model_ohm
               + lf.capacitor_loss_ohm + lf.joint_loss_ohm)
    x = 1 / (2 * math.pi * lf.f_hz * lf.capacitance_f)
    assert lf.reactance_ohm == pytest.approx(x, rel=1e-12)
    assert lf.capacitor_loss_ohm == pytest.approx(x / 1000, rel=1e-12)
    assert lf.capacitor_v_rms == pytest.approx(capacitor_voltage_v(100.0, r_parts, x), rel=0.03)
    assert lf.capacitor_v_peak == pytest.approx(math.sqrt(2) * lf.capacitor_v_rms, rel=1e-9)
    assert lf.current_a_rms == pytest.approx(lf.capacitor_v_rms / x, rel=1e-3)


def test_capacitance_across_the_band(small):
    # source: C = 1 / (omega^2 L) (the series resonant circuit) with L the same at every
    # frequency for a small loop (Grover's surface-current inductance): C f^2 constant
    # to the loop's self-resonance correction, under 1 % here; the model retunes the
    # capacitor at each frequency so that the feed's reactance is zero
    lf = loop_of(small)
    f = np.array([p.f_hz for p in lf.band])
    c = np.array([p.capacitance_f for p in lf.band])
    assert f[0] == 7.0e6 and f[-1] == 7.3e6 and len(f) == 5
    assert np.all(np.diff(c) < 0)
    assert np.ptp(c * f ** 2) / np.mean(c * f ** 2) < 0.01
    assert lf.capacitance_range_f == (pytest.approx(c.min()), pytest.approx(c.max()))
    assert c.min() < lf.capacitance_f < c.max()
    for p in lf.band:
        assert abs(p.feed_z_ohm.imag) < 1e-6 * abs(p.feed_z_ohm)
        assert p.capacitor_v_peak == pytest.approx(math.sqrt(2) * p.capacitor_v_rms)
    assert lf.capacitor_v_peak_max == max([lf.capacitor_v_peak] +
                                          [p.capacitor_v_peak for p in lf.band])


def test_q_and_bandwidth_against_the_feed_impedance(small):
    # source: Yaghjian & Best, IEEE Trans. Antennas Propag. 53(4), 2005 (from memory):
    # Q = (omega / 2 R) |dZ/d omega| at a tuned feed, which for a series RLC is X / R
    # (worked by hand); the matched half-power bandwidth is 2 f / Q and the SWR 2
    # bandwidth f (s - 1) / (Q sqrt(s))
    lf = loop_of(small)
    el = small.element("coupler").electrical
    f = np.array(el.sweep.freq_hz)
    z = np.array(el.sweep.z_ohm)
    assert f[1] == pytest.approx(lf.f_hz)
    dz = (z[2] - z[0]) / (2 * math.pi * (f[2] - f[0]))
    q_z = 2 * math.pi * f[1] * abs(dz) / (2 * z[1].real)
    assert q_z == pytest.approx(lf.q_unloaded, rel=0.05)
    assert lf.q_loaded == pytest.approx(lf.q_unloaded / 2, rel=1e-12)
    assert lf.bandwidth_hz == pytest.approx(2 * lf.f_hz / lf.q_unloaded, rel=1e-12)
    assert lf.bandwidth_swr2_hz == pytest.approx(lf.f_hz / (lf.q_unloaded * math.sqrt(2)))


def test_joints_add_their_resistance(small, plan_of):
    # four joints of 5 milliohm are 20 milliohm in series with the loop current
    with_joints = loop_of(plan_of(loop_text(cap='joint_resistance = "5 mohm"\njoints = 4',
                                            band="")))
    lf = loop_of(small)
    assert with_joints.joint_loss_ohm == pytest.approx(0.020) and with_joints.joints == 4
    extra = with_joints.total_resistance_ohm - lf.total_resistance_ohm
    assert extra == pytest.approx(0.020 + (with_joints.capacitor_loss_ohm
                                           - lf.capacitor_loss_ohm), rel=0.02)
    assert with_joints.efficiency < lf.efficiency


def test_coupling_loop_check_and_cautions(small, loop_example_plan):
    found = {f.code: f for f in small.findings}
    lf = loop_of(small)
    assert lf.feed_swr > 2 and "loop-coupling-mismatch" in found
    assert lf.coupling_rule_diameter_mm == pytest.approx(120.0)  # a fifth of 600 mm [P]
    assert lf.coupling_diameter_mm == pytest.approx(150.0)
    assert "loop-coupling-mismatch" not in {f.code for f in loop_example_plan.findings}
    kv = f"{lf.capacitor_v_peak_max / 1000:.1f} kV"
    assert any(kv in c and "RF high voltage" in c for c in small.electrical.cautions)


def test_rating_below_the_voltage_is_an_error(plan_of):
    plan = plan_of(loop_text(cap='rating = "1 kV"', band=""))
    (f,) = [f for f in plan.findings if f.code == "em-capacitor-overvoltage"]
    assert f.severity == "error" and plan.has_errors


def test_fixed_capacitor_has_no_range(plan_of):
    plan = plan_of(loop_text(cap='capacitance = "356 pF"'))
    lf = loop_of(plan)
    assert not lf.solved and lf.capacitance_f == pytest.approx(356e-12)
    assert lf.capacitance_range_f is None and not lf.band
    assert any("fixed" in n for n in lf.notes)


def test_weak_coupling_is_set_nearest_resonance(plan_of):
    # a small coupling loop in the middle couples too weakly for X = 0 at its feed: the
    # capacitor is set for the feed's least phase angle, the figures still come
    plan = plan_of(loop_text(d=60.0, y=0.0, band=""))
    lf = loop_of(plan)
    assert abs(lf.feed_z_ohm.imag) > 0.01 * abs(lf.feed_z_ohm)
    assert any("nearest resonance" in n for n in lf.notes)
    assert "loop-coupling-mismatch" in {f.code for f in plan.findings}
