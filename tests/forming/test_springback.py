"""Springback: the section integral against closed forms and an independent
quadrature, the inverse (former radius and overbend), and calibration."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.errors import DesignError
from fabplan.forming.springback import (
    FlowLaw,
    SectionModel,
    calibrate_scale,
    final_for_held,
    held_for_final,
    law_for,
    section_model,
)
from fabplan.stock.materials import MATERIALS
from fabplan.stock.profiles import Round, Strip, Tube

STEEL_EPP = FlowLaw(200_000.0, 300.0)  # E = 200 GPa, Y = 300 MPa, no hardening
PROPS = settings(max_examples=40, derandomize=True, deadline=None)


def gardiner(x: float) -> float:
    """Ri/Rf = 4X^3 - 3X + 1, X = Y R / (E T)."""
    # source: Kalpakjian & Schmid, Manufacturing Engineering and Technology,
    # sheet-metal bending, springback (originally Gardiner, Trans. ASME 79, 1957)
    return 4 * x ** 3 - 3 * x + 1


def test_rectangle_reproduces_the_published_example():
    # source: Kalpakjian & Schmid springback formula; E = 200 GPa, Y = 300 MPa,
    # T = 1 mm, R = 10 mm (R at the neutral axis) gives Ri/Rf = 0.95501
    m = SectionModel(Strip(20.0, 1.0), STEEL_EPP)
    ratio = float(m.released(1 / 10.0)[0]) * 10.0  # Ri/Rf = kappa_f / kappa_i
    assert round(ratio, 5) == 0.95501
    assert ratio == pytest.approx(gardiner(300 * 10 / (200_000 * 1.0)), abs=1e-12)


@PROPS
@given(x=st.floats(0.001, 0.49), thickness=st.floats(0.3, 5.0))
def test_rectangle_matches_closed_form_over_its_range(x, thickness):
    # source: Kalpakjian & Schmid / Gardiner closed form, valid for X <= 0.5
    r = x * 200_000 * thickness / 300
    m = SectionModel(Strip(10.0, thickness), STEEL_EPP)
    assert float(m.released(1 / r)[0]) * r == pytest.approx(gardiner(x), abs=1e-10)


@pytest.mark.parametrize("profile, plastic", [
    # source: any strength-of-materials text: fully plastic moments
    (Strip(12.0, 2.0), 300 * 12.0 * 2.0 ** 2 / 4),            # Y B T^2 / 4
    (Round(4.0), 300 * 4.0 ** 3 / 6),                          # Y d^3 / 6
    (Tube(12.7, 1.0), 300 * (12.7 ** 3 - 10.7 ** 3) / 6),      # Y (D^3 - d^3) / 6
], ids=["rectangle", "solid-round", "tube"])
def test_fully_plastic_moments(profile, plastic):
    m = SectionModel(profile, STEEL_EPP)
    c = profile.depth_mm / 2
    # at a curvature 10^6 times first yield the elastic core is negligible
    assert float(m.moment(1e6 * STEEL_EPP.limit_strain / c)[0]) == pytest.approx(plastic,
                                                                                rel=1e-9)


def test_shape_factor_of_a_solid_round():
    # source: any strength-of-materials text: Mp/My = 16/(3 pi) for a solid round
    m = SectionModel(Round(3.0), STEEL_EPP)
    mp = float(m.moment(1e7 * STEEL_EPP.limit_strain / 1.5)[0])
    assert mp / m.first_yield_moment == pytest.approx(16 / (3 * math.pi), rel=1e-9)
    # and 1.5 for a rectangle (same texts)
    r = SectionModel(Strip(5.0, 1.0), STEEL_EPP)
    assert float(r.moment(1e7 * STEEL_EPP.limit_strain / 0.5)[0]) / r.first_yield_moment \
        == pytest.approx(1.5, rel=1e-9)


@pytest.mark.parametrize("key", ["cu-c11000-annealed", "al-6061-t6", "ss-304-annealed"])
@pytest.mark.parametrize("profile", [Round(3.0), Tube(9.525, 0.8128), Strip(10.0, 1.5)],
                         ids=["round", "tube", "strip"])
def test_section_integral_against_scipy_quad(key, profile):
    # independent check: scipy.integrate.quad of 2 int sigma(kappa y) y b(y) dy
    from scipy.integrate import quad

    law = law_for(MATERIALS[key])
    m = SectionModel(profile, law)
    c = profile.depth_mm / 2

    def width(y: float) -> float:
        if isinstance(profile, Strip):
            return profile.width_mm
        outer = 2 * math.sqrt(max(c * c - y * y, 0.0))
        if isinstance(profile, Tube):
            a = profile.id_mm / 2
            outer -= 2 * math.sqrt(max(a * a - y * y, 0.0))
        return outer

    for radius in (5 * c, 40 * c):
        k = 1 / radius
        breaks = [law.limit_strain / k, law.hardening_strain / k]
        if isinstance(profile, Tube):
            breaks.append(profile.id_mm / 2)
        pts = [b for b in breaks if 0 < b < c]
        val, _ = quad(lambda y, k=k: float(law.stress(np.array(k * y))) * y * width(y), 0, c,
                      points=pts or None, limit=200, epsabs=0, epsrel=1e-11)
        assert float(m.moment(k)[0]) == pytest.approx(2 * val, rel=1e-7)


def test_elastic_bend_springs_straight_and_limit_radius():
    # rho_e = E c / Y (trade-notes.md, from the elastic-plastic bending theory)
    m = SectionModel(Round(4.0), STEEL_EPP)
    assert m.elastic_limit_radius == pytest.approx(200_000 * 2.0 / 300)
    assert float(m.released(1 / (1.01 * m.elastic_limit_radius))[0]) == 0.0
    assert float(m.released(1 / (0.9 * m.elastic_limit_radius))[0]) > 0.0
    state = final_for_held(m, 1.5 * m.elastic_limit_radius, 90.0, 4.0)
    assert math.isinf(state.final_radius_mm)


MATS = sorted(MATERIALS)
PROFILES = [Round(2.588), Round(6.35), Tube(6.35, 0.762), Tube(12.7, 1.47), Strip(12.0, 1.0)]


@PROPS
@given(key=st.sampled_from(MATS), prof=st.sampled_from(PROFILES), ratio=st.floats(1.6, 40.0),
       angle=st.floats(10.0, 270.0), k=st.sampled_from([0.5, 0.4, 0.33]))
def test_round_trip_former_to_final(key, prof, ratio, angle, k):
    m = section_model(prof, law_for(MATERIALS[key]))
    r_final = ratio * prof.depth_mm
    held = held_for_final(m, r_final, angle, prof.depth_mm, k)
    assert held.held_radius_mm < r_final
    assert held.held_angle_deg > angle
    back = final_for_held(m, held.held_radius_mm, angle, prof.depth_mm, k)
    assert back.final_radius_mm == pytest.approx(r_final, rel=1e-9)
    assert back.held_angle_deg == pytest.approx(held.held_angle_deg, rel=1e-9)
    # the neutral axis keeps its length (K-factor neutral radius)
    dn = prof.depth_mm * (k - 0.5)
    assert held.held_angle_deg * (held.held_radius_mm + dn) == pytest.approx(
        angle * (r_final + dn), rel=1e-12)


PAIRS = [("cu-c11000-annealed", "cu-c11000-hard"), ("cu-c12200-annealed", "cu-c12200-drawn"),
         ("al-1100-o", "al-6061-t6"), ("brass-c26000-annealed", "brass-c26000-half-hard")]


@PROPS
@given(pair=st.sampled_from(PAIRS), prof=st.sampled_from(PROFILES), ratio=st.floats(2.0, 30.0))
def test_harder_temper_springs_back_more(pair, prof, ratio):
    soft, hard = (section_model(prof, law_for(MATERIALS[k])) for k in pair)
    r = ratio * prof.depth_mm
    s_soft = held_for_final(soft, r, 90.0, prof.depth_mm).springback_deg
    s_hard = held_for_final(hard, r, 90.0, prof.depth_mm).springback_deg
    assert s_hard > s_soft > 0


@PROPS
@given(key=st.sampled_from(MATS), prof=st.sampled_from(PROFILES), ratio=st.floats(1.6, 20.0),
       grow=st.floats(1.05, 3.0))
def test_larger_radius_springs_back_more(key, prof, ratio, grow):
    m = section_model(prof, law_for(MATERIALS[key]))
    r = ratio * prof.depth_mm
    a = held_for_final(m, r, 90.0, prof.depth_mm).springback_deg
    b = held_for_final(m, r * grow, 90.0, prof.depth_mm).springback_deg
    assert b > a


@pytest.mark.parametrize("model", ["hardening", "elastic-plastic"])
def test_springback_vanishes_as_yield_over_e_vanishes(model):
    law = law_for(MATERIALS["al-6061-t6"], model)
    prof = Tube(12.7, 1.47)
    values = [held_for_final(SectionModel(prof, law.scaled(f)), 30.0, 90.0, 12.7).springback_deg
              for f in (1.0, 0.1, 0.01, 0.001)]
    assert all(a > b for a, b in zip(values, values[1:]))
    assert values[-1] < 0.01
    # with no hardening, springback scales with Y/E for small X (Gardiner: 3X - 4X^3)
    if model == "elastic-plastic":
        assert values[-1] / values[-2] == pytest.approx(0.1, rel=0.02)


@pytest.mark.parametrize("model", ["hardening", "elastic-plastic"])
@pytest.mark.parametrize("factor", [0.6, 1.0, 1.7])
def test_calibration_recovers_the_flow_stress(model, factor):
    prof = Tube(6.35, 0.762)
    law = law_for(MATERIALS["cu-c12200-annealed"], model)
    disc = 10.0  # inside radius of the test bend
    true = SectionModel(prof, law.scaled(factor))
    state = final_for_held(true, disc + prof.depth_mm / 2, 90.0, prof.depth_mm)
    # the test bend: held at state.held_angle_deg, released to 90
    f = calibrate_scale(prof, law, disc, state.held_angle_deg, 90.0)
    assert f == pytest.approx(factor, rel=1e-6)


def test_calibration_rejects_a_bend_that_did_not_spring_back():
    with pytest.raises(DesignError, match="angle after release"):
        calibrate_scale(Round(3.0), law_for(MATERIALS["cu-c11000-hard"]), 10.0, 90.0, 90.0)


def test_soft_copper_springback_is_in_the_observed_range():
    # common practice, no source (trade-notes.md): soft copper springs back under 1 deg per
    # 90 deg, 6061-T6 about 4-6 deg; the computed values are first estimates
    cu = held_for_final(section_model(Tube(6.35, 0.762), law_for(MATERIALS["cu-c12200-annealed"])),
                        15.875, 90.0, 6.35)
    al = held_for_final(section_model(Round(6.35), law_for(MATERIALS["al-6061-t6"])),
                        25.0, 90.0, 6.35)
    assert 0 < cu.springback_deg < 1.0
    assert 3.0 < al.springback_deg < 7.0


def test_vectorised_inverse_matches_scalar():
    m = section_model(Round(3.0), law_for(MATERIALS["brass-c26000-half-hard"]))
    radii = np.array([5.0, 9.0, 30.0, 120.0])
    many = m.held_curvatures(1 / radii)
    one = [m.held_curvature(1 / r) for r in radii]
    assert np.allclose(many, one, rtol=1e-12)
    assert np.allclose(m.released(many), 1 / radii, rtol=1e-10)
