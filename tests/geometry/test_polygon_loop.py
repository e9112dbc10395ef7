"""The polygon-loop shape: a regular polygon, bent at its corners or joined by fittings."""

from __future__ import annotations

import math

import numpy as np
import pytest

from fabplan.design.read import parse_design
from fabplan.errors import DesignError
from fabplan.geometry.shapes import polygon_loop as pl

STOCK = '[stock]\ncatalogue = "water-l-1/2"\n[shop]\nunits = "mm"\n'


def element(keys: str) -> str:
    return STOCK + f'[[element]]\nname = "loop"\nshape = "polygon-loop"\n{keys}\n'


@pytest.mark.parametrize("key, value, side", [
    # source: regular polygon geometry (any geometry text): side = D sin(pi/n) for the
    # circumscribed diameter D, side = F tan(pi/n) for the distance across the flats
    ("diameter", 1000.0, 1000.0 * math.sin(math.pi / 8)),
    ("across_flats", 900.0, 900.0 * math.tan(math.pi / 8)),
    ("circumference", 3200.0, 400.0),
    ("side", 380.0, 380.0),
])
def test_sizes(key: str, value: float, side: float):
    p = parse_design(element(f'sides = 8\n{key} = "{value} mm"')).elements[0].params
    assert p.side_mm == pytest.approx(side, rel=1e-12)
    tuned = pl.tuned_keys(p)
    assert tuned[key][1] == pytest.approx(value, rel=1e-12)


def test_bent_octagon_developed_length():
    # source: trade-notes.md, rounded polygon L = sum of sides - 2 r sum tan(theta/2)
    # + r sum theta [P], less the gap
    p = pl.Params(8, 400.0, "bent", 60.0, None, 30.0)
    g = pl.geometry(p, 15.9)
    (piece,) = g.pieces
    theta = math.pi / 4
    want = 8 * 400.0 - 2 * 60.0 * 8 * math.tan(theta / 2) + 60.0 * 8 * theta - 30.0
    assert piece.path.centreline_length() == pytest.approx(want, rel=1e-12)
    assert piece.path.closure_error() < 1e-6
    assert len(piece.path.bends) == 8


def test_fittings_cut_each_tube_short_by_the_takeoff():
    # a fitting's take-off is what the tube loses at each corner (the module docstring):
    # a side is side - 2 t, the bottom halves side / 2 - gap / 2 - t; a joint spans
    # 2 t cos(pi / n) between the tubes' ends (the chord of the corner)
    p = pl.Params(8, 400.0, "fittings", None, 6.0, 30.0)
    g = pl.geometry(p, 15.9)
    lengths = [piece.path.centreline_length() for piece in g.pieces]
    assert len(g.pieces) == 9
    assert lengths[0] == pytest.approx(200 - 15 - 6) and lengths[-1] == pytest.approx(179.0)
    assert lengths[1:-1] == pytest.approx([388.0] * 7)
    joints = [gap for gap in g.gaps if gap.role == "joint"]
    assert len(joints) == 8
    for gap in joints:
        a = g.pieces[gap.a.piece].path.end_point()
        b = np.asarray(g.pieces[gap.b.piece].path.origin)
        assert float(np.linalg.norm(b - a)) == pytest.approx(gap.width_mm, abs=1e-9)
        assert gap.width_mm == pytest.approx(2 * 6.0 * math.cos(math.pi / 8))
    (feed,) = [gap for gap in g.gaps if gap.role == "feed"]
    a = g.pieces[feed.a.piece].path.end_point()
    b = np.asarray(g.pieces[feed.b.piece].path.origin)
    assert float(np.linalg.norm(b - a)) == pytest.approx(30.0)


def test_fittings_loop_cuts_and_finding(plan_of):
    plan = plan_of(element('sides = 6\nside = "300 mm"\ncorners = "fittings"\n'
                           'fitting_takeoff = "8 mm"\nfeed_gap = "20 mm"'))
    e = plan.elements[0]
    assert [round(p.cut_length_mm, 6) for p in e.pieces] == [132.0] + [284.0] * 5 + [132.0]
    assert "loop-fittings" in {f.code for f in plan.findings}
    assert all(not p.bends for p in e.pieces)


@pytest.mark.parametrize("keys, needle", [
    ('sides = 8\nside = "300 mm"\ncorners = "fittings"', "take-off"),
    ('sides = 8\nside = "300 mm"\nfitting_takeoff = "6 mm"', "fittings"),
    ('sides = 8\nside = "300 mm"\ncorners = "fittings"\nfitting_takeoff = "6 mm"\n'
     'bend_radius = "50 mm"', "bend_radius is for"),
    ('sides = 2\nside = "300 mm"', "sides"),
    ('sides = 8\nside = "300 mm"\ndiameter = "800 mm"', "only one"),
])
def test_bad_keys(keys: str, needle: str):
    with pytest.raises(DesignError, match=needle):
        parse_design(element(keys))
