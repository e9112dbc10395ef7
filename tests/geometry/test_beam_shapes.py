"""The beam shapes: telescoping straights (pieces, overlaps, fit marks, the stepped
conductor the model sees) and the tip-coupled pair (its rectangle)."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from fabplan.antennas.tip_pair import tip_pair
from fabplan.design.read import parse_design
from fabplan.geometry.shapes import hairpin, straight, tip_coupled_pair
from fabplan.geometry.shapes.base import PieceStock
from fabplan.plan import make_plan

IN = 25.4


def _telescoping(gap: float | None) -> straight.Params:
    s = (straight.TubeSection(PieceStock(catalogue="a"), 600.0, 0.0),
         straight.TubeSection(PieceStock(catalogue="b"), 500.0, 76.2),
         straight.TubeSection(PieceStock(catalogue="c"), None, 76.2))
    return straight.Params(2800.0, gap, s)


@pytest.mark.parametrize("gap", [None, 20.0])
def test_telescoping_pieces_add_up_and_overlap(gap):
    # common practice, no source: each outer tube is its exposed length plus the overlap it
    # slides into the tube before it; exposed lengths from the centre add to half the length
    p = _telescoping(gap)
    g = straight.geometry(p, 15.9)
    e = straight.exposed_lengths(p)
    assert sum(e) == pytest.approx(1400.0) and e[-1] == pytest.approx(300.0)
    lengths = {piece.label: piece.path.centreline_length() for piece in g.pieces}
    if gap is None:
        assert lengths["centre tube"] == pytest.approx(1200.0)
    else:
        assert lengths["centre tube, side A"] == pytest.approx(600.0 - gap / 2)
        assert g.feed is not None and g.feed.width_mm == gap
    assert lengths["tube 2, side B"] == pytest.approx(500.0 + 76.2)
    assert lengths["tube 3, side A"] == pytest.approx(300.0 + 76.2)
    # the tips are the element's ends, tip to tip 2800 mm
    tip_a = next(x for x in g.pieces if x.label == "tube 3, side A")
    tip_b = next(x for x in g.pieces if x.label == "tube 3, side B")
    assert tip_a.tips == ("A",) and tip_b.tips == ("B",)
    assert tip_b.path.end_point()[0] - tip_a.path.origin[0] == pytest.approx(2800.0)
    # each outer tube's fit mark is where it enters the tube before it
    inner_end_b = 600.0  # tube 2 side B enters the centre tube at x = 600
    mark = tip_b.marks[0][1]
    assert tip_b.path.origin[0] + mark == pytest.approx(600.0 + 500.0)
    t2b = next(x for x in g.pieces if x.label == "tube 2, side B")
    assert t2b.path.origin[0] + t2b.marks[0][1] == pytest.approx(inner_end_b)
    assert g.pieces[t2b.inside].label in ("centre tube", "centre tube, side B")
    # the model: one conductor per side, stepping where the tubes do
    model = g.modelled.pieces
    steps = [s for s, _ in model[0].conductor_of]
    if gap is None:
        assert len(model) == 1 and steps == pytest.approx([0.0, 300.0, 800.0, 2000.0, 2500.0])
    else:
        assert len(model) == 2 and steps == pytest.approx([0.0, 300.0, 800.0])


def test_telescoping_tubes_must_slide_into_each_other(plan_of):
    text = """
[stock]
catalogue = "al-5/8x0.058"
[[element]]
shape = "straight"
length = "2800 mm"
sections = [{{ catalogue = "{a}", length = "600 mm" }}, {{ catalogue = "{b}" }}]
"""
    ok = plan_of(text.format(a="al-5/8x0.058", b="al-1/2x0.058"))
    assert not any(f.code.startswith("tube-") for f in ok.findings)
    # each piece of its own stock: the catalogue's sizes and masses per piece
    pieces = ok.elements[0].pieces
    assert pieces[0].stock.spec.catalogue == "al-5/8x0.058"
    assert pieces[1].stock.spec.catalogue == "al-1/2x0.058"
    assert pieces[1].mass_kg < pieces[0].mass_kg
    bad = plan_of(text.format(a="al-1/2x0.058", b="al-5/8x0.058"))
    assert any(f.code == "tube-does-not-fit" for f in bad.findings)
    solid = plan_of(text.format(a="al-rod-3/8", b="al-rod-1/4"))
    assert any(f.code == "tube-does-not-fit" for f in solid.findings)
    # the fit mark is on the straight stock's marks
    fit = [m for m in ok.elements[0].pieces[1].marks if m.kind == "fit"]
    assert len(fit) == 1 and fit[0].from_end_mm == pytest.approx(800.0)


def test_tip_coupled_pair_is_the_published_rectangle():
    # source: Cebik's fits (fabplan.antennas.tip_pair, from memory): the driven element's
    # tails end C short of the reflector's, the depth is B + C + D
    p = tip_coupled_pair.Params(745.0, 95.0, 38.0, 144.0, 15.0, 10.0)
    g = tip_coupled_pair.geometry(p, 6.35)
    side_a, side_b, reflector = (x.path for x in g.pieces)
    assert np.asarray(side_a.origin) == pytest.approx((-372.5, 95.0, 0.0))
    assert side_b.end_point() == pytest.approx((372.5, 95.0, 0.0))
    assert np.asarray(reflector.origin) == pytest.approx((-372.5, 95.0 + 38.0, 0.0))
    assert reflector.end_point() == pytest.approx((372.5, 95.0 + 38.0, 0.0))
    assert side_a.end_point() == pytest.approx((-7.5, 0.0, 0.0))
    assert np.asarray(side_b.origin) == pytest.approx((7.5, 0.0, 0.0))
    assert g.feed is not None and g.feed.width_mm == 15.0
    # the reflector's long side at the depth, its two corners of 90 degrees
    mid = reflector.point_at(reflector.centreline_length() / 2)[0]
    assert mid == pytest.approx((0.0, 95.0 + 38.0 + 144.0, 0.0))
    assert [b.angle_deg for b in reflector.bends] == [90.0, 90.0]


def test_tip_coupled_pair_from_its_frequency():
    d = parse_design('[stock]\ncatalogue = "al-rod-1/4"\n[[element]]\nshape = '
                     '"tip-coupled-pair"\nfrequency = "144.2 MHz"\nbend_radius = "30 mm"\n')
    p = d.elements[0].params
    t = tip_pair(144.2e6, 6.35)
    assert (p.width_mm, p.driven_tail_mm, p.tip_gap_mm, p.reflector_tail_mm) == pytest.approx(
        (t.width_mm, t.driven_tail_mm, t.gap_mm, t.reflector_tail_mm))
    plan = make_plan(dataclasses.replace(d, electrical=None))
    assert [piece.label for piece in plan.elements[0].pieces] == [
        "driven, side A", "driven, side B", "reflector"]


def test_a_matching_hairpin_keeps_its_ends_where_its_frame_is():
    # its frame at the legs' ends: a new leg length keeps the ends on the feed terminals
    for leg in (40.0, 90.0):
        p = hairpin.Params(leg, "centre_spacing", 25.0, "round", None, anchor="ends")
        path = hairpin.build(p, 4.0)
        assert np.asarray(path.origin) == pytest.approx((0.0, -12.5, 0.0))
        assert path.end_point() == pytest.approx((0.0, 12.5, 0.0))
