"""Quadrifilar helix: self-phasing, loop geometry and mast drilling."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.antennas.quadrifilar import (
    MastDrilling,
    arm_azimuth_deg,
    corner_gain_mm,
    design_qfh,
    helix_arm_length_mm,
    loop_for_length,
    mast_drilling,
    qfh_loop,
    quadrature_deg,
    radial_straight_mm,
    self_phasing,
)
from fabplan.errors import DesignError

C0_MM = 299_792_458_000.0


@pytest.mark.parametrize("q", [5.0, 10.0, 25.0])
def test_self_phasing_gives_plus_minus_45_degrees(q: float) -> None:
    # source: PA1ARE, "Quadrifilar Helix Antenna" (read): large loop inductive with X = R,
    # small loop capacitive with X = -R, currents 90 degrees apart; series RLC model
    # Z = R (1 + j Q (f/f0 - f0/f)) (circuit theory)
    sp = self_phasing(q)
    assert sp.phase_large_deg == pytest.approx(45.0, abs=1e-9)
    assert sp.phase_small_deg == pytest.approx(-45.0, abs=1e-9)
    x = sp.frequency_ratio
    r = 1.0
    z_large = r * (1 + 1j * q * (x - 1 / x))  # resonant at f / x, used at f
    z_small = r * (1 + 1j * q * (1 / x - x))  # resonant at f x
    assert z_large == pytest.approx(1 + 1j, abs=1e-12)
    assert quadrature_deg(z_large, z_small) == pytest.approx(90.0, abs=1e-9)
    # the pair in parallel is R(1+j) R(1-j) / (2R) = R: purely resistive (by hand)
    assert z_large * z_small / (z_large + z_small) == pytest.approx(r, abs=1e-12)
    # lengths scale inversely with resonance: large / small = x^2
    assert sp.size_ratio == pytest.approx(x * x, rel=1e-15)


def test_q_ten_ratio_by_hand() -> None:
    # by hand: x - 1/x = 0.1 -> x = (0.1 + sqrt(4.01)) / 2 = 1.051249, x^2 = 1.105125
    assert self_phasing(10.0).size_ratio == pytest.approx(1.105125, rel=1e-6)


def test_helix_arm_length_against_a_fine_polyline() -> None:
    # source: arc length of the helix (R cos t, R sin t, c t) integrated numerically
    d, h, turns = 300.0, 700.0, 0.5
    t = np.linspace(0.0, 2 * math.pi * turns, 20001)
    pts = np.column_stack([d / 2 * np.cos(t), d / 2 * np.sin(t), h * t / t[-1]])
    polyline = float(np.sum(np.linalg.norm(np.diff(pts, axis=0), axis=1)))
    assert helix_arm_length_mm(d, h, turns) == pytest.approx(polyline, rel=1e-8)
    # trade-notes.md: helix N sqrt((pi D)^2 + p^2), here N = 1/2 and p = 2H
    assert helix_arm_length_mm(d, h, turns) == pytest.approx(
        0.5 * math.hypot(math.pi * d, 2 * h), rel=1e-12)


def test_corner_gain_ninety_degrees() -> None:
    # source: trade-notes.md [P]: gain = 2R tan(theta/2) - R theta, 90 degrees: 0.4292 R
    assert corner_gain_mm(10.0) == pytest.approx(4.292, abs=1e-3)


def test_loop_developed_length_by_hand() -> None:
    lp = qfh_loop("large", 300.0, 700.0, 0.5, corner_radius_mm=15.0, feed_gap_mm=6.0)
    arm = math.hypot(700.0, math.pi * 300.0 * 0.5)
    # 2 radials + 2 arms, four 90-degree corners of radius 15, minus the feed gap
    by_hand = 2 * 300 + 2 * arm - 4 * (2 * 15 - math.pi * 15 / 2) - 6
    assert lp.developed_length_mm == pytest.approx(by_hand, rel=1e-12)
    assert lp.pitch_angle_deg == pytest.approx(math.degrees(math.atan2(700, math.pi * 150)))
    assert lp.twist_deg == 180.0


@settings(max_examples=40, derandomize=True, deadline=None)
@given(length=st.floats(500, 5000), ratio=st.floats(0.2, 1.2), turns=st.floats(0.25, 2.0),
       radius_fraction=st.floats(0.0, 0.005))
def test_loop_for_length_round_trip(length: float, ratio: float, turns: float,
                                    radius_fraction: float) -> None:
    lp = loop_for_length("x", length, ratio, turns, corner_radius_mm=radius_fraction * length)
    assert lp.developed_length_mm == pytest.approx(length, rel=1e-12)
    assert lp.diameter_mm / lp.height_mm == pytest.approx(ratio, rel=1e-12)


def test_design_scales_loops_by_the_ratio() -> None:
    f = 137.5e6
    lam = C0_MM / f
    d = design_qfh(f, conductor_diameter_mm=6.0, size_ratio=1.1, corner_radius_mm=12.0,
                   loop_length_wl=1.0)
    assert d.large.developed_length_mm * d.small.developed_length_mm == pytest.approx(
        lam ** 2, rel=1e-12)  # geometric mean is one wavelength
    assert d.large.developed_length_mm / d.small.developed_length_mm == pytest.approx(1.1)
    for lp in (d.large, d.small):
        assert lp.diameter_mm / lp.height_mm == pytest.approx(0.44, rel=1e-12)
    assert d.large.diameter_mm > d.small.diameter_mm
    from_q = design_qfh(f, conductor_diameter_mm=6.0, q_loop=10.0)
    assert from_q.size_ratio == pytest.approx(self_phasing(10.0).size_ratio)


def test_design_rejects_bad_input() -> None:
    with pytest.raises(DesignError, match="one of the two"):
        design_qfh(137.5e6, conductor_diameter_mm=6.0)
    with pytest.raises(DesignError, match="one of the two"):
        design_qfh(137.5e6, conductor_diameter_mm=6.0, size_ratio=1.1, q_loop=10)
    with pytest.raises(DesignError, match="handedness"):
        design_qfh(137.5e6, conductor_diameter_mm=6.0, size_ratio=1.1,
                   handedness="clockwise")  # type: ignore[arg-type]
    with pytest.raises(DesignError, match="radius"):
        design_qfh(137.5e6, conductor_diameter_mm=6.0, size_ratio=1.1, corner_radius_mm=2.0)
    with pytest.raises(DesignError, match="size_ratio"):
        design_qfh(137.5e6, conductor_diameter_mm=6.0, size_ratio=0.9)


def test_mast_holes_half_turn() -> None:
    # source: lloydm.net "137 MHz Quadrifilar Helix" (read): the four top tubes at one
    # height, each loop's bottom tube through the mast at its own height (900 and 1000 mm
    # below the top in that build)
    d = design_qfh(137.5e6, conductor_diameter_mm=9.5, size_ratio=1.11, corner_radius_mm=20)
    m = mast_drilling(d, 32.0)
    tops = [h for h in m.holes if h.end == "top"]
    assert {h.from_top_mm for h in tops} == {0.0}
    assert sorted(h.azimuth_deg for h in tops) == [0.0, 90.0, 180.0, 270.0]
    assert not any(h.through for h in tops)
    bottoms = {(h.loop, h.azimuth_deg): h for h in m.holes if h.end == "bottom"}
    assert bottoms[("large", 0.0)].from_top_mm == pytest.approx(d.large.height_mm)
    assert bottoms[("small", 90.0)].from_top_mm == pytest.approx(d.small.height_mm)
    assert all(h.through for h in bottoms.values())
    # a half turn brings each arm to the opposite side: the bottom radial lies in the top
    # radial's plane, so its holes share the top holes' azimuths
    assert set(bottoms) == {("large", 0.0), ("large", 180.0), ("small", 90.0), ("small", 270.0)}
    assert m.circumference_mm == pytest.approx(math.pi * 32.0)
    assert bottoms[("small", 90.0)].arc_mm == pytest.approx(math.pi * 32.0 / 4)


def test_mid_height_marks_show_handedness() -> None:
    right = mast_drilling(design_qfh(137.5e6, conductor_diameter_mm=6, size_ratio=1.1,
                                     handedness="right"), 25.0)
    left = mast_drilling(design_qfh(137.5e6, conductor_diameter_mm=6, size_ratio=1.1,
                                    handedness="left"), 25.0)

    def mark(m_: MastDrilling, loop: str, arm: int) -> float:
        return next(k.azimuth_deg for k in m_.marks if k.loop == loop and k.arm == arm)

    # right-handed: rises counter-clockwise, so going down from 0 it is at -90 = 270
    assert mark(right, "large", 0) == pytest.approx(270.0)
    assert mark(left, "large", 0) == pytest.approx(90.0)
    assert mark(right, "small", 0) == pytest.approx(0.0)  # starts at 90


def test_three_quarter_turn_bottom_azimuth() -> None:
    # a right-handed 3/4-turn arm from azimuth 0 ends at 0 - 270 = 90 degrees
    assert arm_azimuth_deg(0.0, 1.0, 0.75, "right") == pytest.approx(90.0)
    assert arm_azimuth_deg(0.0, 1.0, 0.75, "left") == pytest.approx(270.0)
    d = design_qfh(400e6, conductor_diameter_mm=2.0, size_ratio=1.08, turns=0.75)
    m = mast_drilling(d, 10.0)
    large_bottom = sorted(h.azimuth_deg for h in m.holes
                          if h.loop == "large" and h.end == "bottom")
    assert large_bottom == pytest.approx([90.0, 270.0])


def test_mast_too_fat_is_refused() -> None:
    d = design_qfh(435e6, conductor_diameter_mm=3.0, size_ratio=1.1)
    with pytest.raises(DesignError, match="mast"):
        mast_drilling(d, d.small.diameter_mm)


def test_radial_straight_by_hand() -> None:
    lp = qfh_loop("large", 300.0, 700.0, 0.5, corner_radius_mm=15.0)
    # half the diameter, less the bend's setback (r tan 45 = r) and the mast's radius
    assert radial_straight_mm(lp, 32.0) == pytest.approx(150 - 15 - 16)
    with pytest.raises(DesignError, match="thinner mast"):
        radial_straight_mm(lp, 280.0)
