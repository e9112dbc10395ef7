"""Feasibility rules: minimum radii, wall thinning, strain, and their findings."""

from __future__ import annotations

import pytest

from fabplan.forming.limits import (
    bend_limits,
    limit_findings,
    minimum_radius,
    wall_inside,
    wall_outside,
)
from fabplan.stock.materials import MATERIALS
from fabplan.units import IN

ANNEALED = MATERIALS["cu-c12200-annealed"]
DRAWN = MATERIALS["cu-c12200-drawn"]


@pytest.mark.parametrize("od_in, wall_in, material, radius_in", [
    # source: Copper Tube Handbook (CDA), table of minimum bend radii on mechanical
    # benders (nominal size: OD): 1/4 (3/8 OD) annealed 3/4 in; 3/8 (1/2 OD) annealed
    # 1 1/2, drawn 1 3/4; 1/2 (5/8 OD) annealed 2 1/4, drawn 2 1/2; 3/4 (7/8 OD) 3 in
    # both; 1 (1 1/8 OD) annealed 4 in
    (0.375, 0.030, ANNEALED, 0.75),
    (0.500, 0.032, ANNEALED, 1.50),
    (0.500, 0.032, DRAWN, 1.75),
    (0.625, 0.040, ANNEALED, 2.25),
    (0.625, 0.040, DRAWN, 2.50),
    (0.875, 0.045, ANNEALED, 3.00),
    (0.875, 0.045, DRAWN, 3.00),
    (1.125, 0.050, ANNEALED, 4.00),
])
def test_copper_tube_minimum_radius_is_the_handbook_table(od_in, wall_in, material, radius_in):
    from fabplan.stock.profiles import Tube

    rule = minimum_radius(material, Tube(od_in * IN, wall_in * IN))
    assert rule.error_mm == pytest.approx(radius_in * IN)
    assert "Copper Tube Handbook" in rule.basis


def test_copper_tube_outside_the_table_is_scaled_and_says_so():
    from fabplan.stock.profiles import Tube

    # 1/4 in OD is below the table: the 3/8 in row's 2.0 x OD applies
    rule = minimum_radius(ANNEALED, Tube(0.25 * IN, 0.030 * IN))
    assert rule.error_mm == pytest.approx(2.0 * 0.25 * IN)
    assert "not in the table" in rule.basis
    # between 1/2 (3.0 D) and 5/8 (3.6 D) the ratio is interpolated
    mid = minimum_radius(ANNEALED, Tube(0.5625 * IN, 0.035 * IN))
    assert 3.0 * 0.5625 * IN < mid.error_mm < 3.6 * 0.5625 * IN


def test_wall_thinning_and_thickening_formulas():
    # source: tooling makers' formula (trade-notes.md): outside t 2R/(2R + D), inside
    # t 2R/(2R - D). Worked by hand: t = 0.032 in, D = 1/2 in, R = 1 1/2 in gives
    # 0.032 x 3/3.5 = 0.027429 in outside and 0.032 x 3/2.5 = 0.0384 in inside
    t, d, r = 0.032 * IN, 0.5 * IN, 1.5 * IN
    assert wall_outside(t, r, d) / IN == pytest.approx(0.027429, abs=1e-6)
    assert wall_inside(t, r, d) / IN == pytest.approx(0.0384, abs=1e-7)


def codes(findings):
    return sorted(f.code for f in findings)


def test_hard_aluminium_too_tight_gives_errors_with_remedies():
    from fabplan.stock.profiles import Tube

    prof = Tube(12.7, 1.47)
    mat = MATERIALS["al-6061-t6"]
    lim = [bend_limits(1, 15.0, mat, prof)]
    # a stand-in for springback: every bend opens by 5 % on release
    found = limit_findings(lim, mat, prof, "e", lambda held: 1.05 * held, {1: 15.75})
    assert {"bend-too-tight", "outer-strain-exceeds-elongation", "mandrel-needed"} <= set(
        codes(found))
    tight = next(f for f in found if f.code == "bend-too-tight")
    assert tight.severity == "error" and tight.element == "e"
    # in the builder's terms: the radius the shape gives, and the rule's minimum released
    assert "the 15.8 mm centreline radius" in tight.message
    assert f"smallest is {3.0 * 12.7 * 1.05:.1f} mm" in tight.message
    assert "O or T4" in tight.message
    strain = next(f for f in found if f.code == "outer-strain-exceeds-elongation")
    assert "42 %" in strain.message  # 12.7 / (2 x 15) = 0.423
    # one recommendation in every finding: the largest radius the fired rules need,
    # here 12 % strain: 12.7 / (2 x 0.12) = 52.9 mm held (over 4 x 12.7 = 50.8), x 1.05
    rec = f"at least {12.7 / 0.24 * 1.05:.1f} mm"
    for f in found:
        if f.code != "wall-thins":
            assert rec in f.message, f.code


def test_soft_copper_tube_at_two_and_a_half_d_is_fine():
    from fabplan.stock.profiles import Tube

    prof = Tube(6.35, 0.762)
    lim = [bend_limits(i, 15.8, ANNEALED, prof) for i in (1, 2)]
    assert limit_findings(lim, ANNEALED, prof, "e") == []
    assert lim[0].d_of_bend == pytest.approx(15.8 / 6.35)
    assert lim[0].wall_factor == pytest.approx(6.35 / 0.762)
    assert lim[0].outer_strain == pytest.approx(6.35 / (2 * 15.8))


def test_thin_wall_tube_warns_of_kinks_and_names_the_bends():
    from fabplan.stock.profiles import Tube

    prof = Tube(19.05, 0.8128)  # wall factor 23
    lim = [bend_limits(i, r, ANNEALED, prof) for i, r in ((1, 50.0), (2, 90.0), (3, 40.0))]
    found = limit_findings(lim, ANNEALED, prof, "e")
    kink = [f for f in found if f.code == "kink-risk"]
    assert len(kink) == 1 and kink[0].severity == "warning"
    assert "bends 1, 3" in kink[0].message
    assert "bending spring" in kink[0].message


def test_hard_copper_wire_rule_and_soft_wire_rule():
    from fabplan.stock.profiles import Round

    d = 2.588
    soft = minimum_radius(MATERIALS["cu-c11000-annealed"], Round(d))
    hard = minimum_radius(MATERIALS["cu-c11000-hard"], Round(d))
    # common practice (trade-notes.md): annealed inside radius ~1 d, hard-drawn >= 2-3 d
    assert soft.error_mm == pytest.approx(1.5 * d)
    assert hard.error_mm == pytest.approx(2.5 * d) and hard.warn_mm == pytest.approx(3.5 * d)
    found = limit_findings([bend_limits(1, 3.0 * d, MATERIALS["cu-c11000-hard"], Round(d))],
                           MATERIALS["cu-c11000-hard"], Round(d), "w")
    # 1/(2 x 3) = 17 % outer strain is over hard copper's 10 % elongation: a warning only,
    # the radius rule carries the error
    assert codes(found) == ["bend-tight", "outer-strain-exceeds-elongation"]
    assert all(f.severity == "warning" for f in found)
