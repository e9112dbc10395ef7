"""A quadrifilar helix's mast: the drilling pattern against hand working and against the
loops' own centrelines."""

from __future__ import annotations

import math

import numpy as np
import pytest

from fabplan.antennas.quadrifilar import design_qfh
from fabplan.drilling.mast import BELOW_MM, qfh_mast
from fabplan.errors import DesignError
from fabplan.geometry.shapes import quadrifilar as q


def test_half_turn_mast_by_hand():
    # worked by hand (the module docstring's layout): top radials 2 x 32 = 64 mm below the
    # mast's top end, the large loop's along the scribed line (0 deg), the small loop's 90
    # degrees on; each bottom radial a half turn on, so through the same line; holes the
    # conductor plus 0.5 mm; the mast 250 mm past the lowest hole
    d = design_qfh(137.5e6, conductor_diameter_mm=6.35, size_ratio=1.06)
    m = qfh_mast("qfh", d, 32.0, conductor_diameter_mm=6.35)
    by = {h.label: h for h in m.holes}
    assert by["large loop, top"].from_datum_mm == pytest.approx(64.0)
    assert by["small loop, top"].from_datum_mm == pytest.approx(64.0)
    assert by["large loop, bottom"].from_datum_mm == pytest.approx(64.0 + d.large.height_mm)
    assert by["small loop, bottom"].from_datum_mm == pytest.approx(64.0 + d.small.height_mm)
    assert [by[k].angle_deg for k in ("large loop, top", "large loop, bottom")] == [0.0, 0.0]
    assert [by[k].angle_deg for k in ("small loop, top", "small loop, bottom")] == [90.0, 90.0]
    assert all(h.through and h.diameter_mm == pytest.approx(6.85) for h in m.holes)
    assert m.length_mm == pytest.approx(64.0 + d.large.height_mm + BELOW_MM)
    assert m.circumference_mm == pytest.approx(math.pi * 32.0)
    assert [h.from_datum_mm for h in m.holes] == sorted(h.from_datum_mm for h in m.holes)
    with pytest.raises(DesignError, match="past its lowest hole"):
        qfh_mast("qfh", d, 32.0, conductor_diameter_mm=6.35, length_mm=300.0)


@pytest.mark.parametrize("turns, hand", [(0.5, "right"), (0.75, "right"), (0.75, "left"),
                                          (1.0, "left")])
def test_holes_lie_on_the_loops_radials(turns: float, hand: str):
    # the pattern (from the design method's heights and twists) against the shape's own
    # centrelines: each radial crosses the mast's axis at its hole's height, along the
    # hole's line (angle or angle + 180)
    p = q.Params(300.0, 680.0, 288.0, 652.8, turns=turns, handedness=hand,  # type: ignore
                 corner_radius_mm=10.0, feed_gap_mm=10.0, mast_diameter_mm=32.0,
                 small_top_offset_mm=12.0)
    m = q.mast_inputs(p, 2.0)
    assert m is not None
    pattern = qfh_mast("h", m.design, m.mast_diameter_mm,
                       conductor_diameter_mm=m.conductor_diameter_mm,
                       small_azimuth_deg=m.small_azimuth_deg,
                       small_top_offset_mm=m.small_top_offset_mm)
    margin = 64.0
    g = q.geometry(p, 2.0)
    for piece in g.pieces:
        pts, _ = piece.path.sample(1.0)
        r = np.hypot(pts[:, 0], pts[:, 1])
        for end in ("top", "bottom"):
            hole = next(h for h in pattern.holes
                        if h.label == f"{piece.label}, {end}")
            z = -(hole.from_datum_mm - margin)
            near = pts[(np.abs(pts[:, 2] - z) < 1e-6) & (r > 16.0) & (r < 100.0)]
            assert len(near) > 10  # the radial's straight at that height, outside the mast
            az = np.degrees(np.arctan2(near[:, 1], near[:, 0]))
            off = (az - hole.angle_deg + 90.0) % 180.0 - 90.0  # the line, either way along it
            assert np.all(np.abs(off) < 1e-6)


def test_plan_carries_the_mast(qfh_example_plan):
    (mast,) = qfh_example_plan.drilling
    assert mast.name == "helix: mast" and mast.section == "round"
    assert mast.outside_mm == pytest.approx(32.0) and mast.length_mm == pytest.approx(1200.0)
    assert len(mast.holes) == 4
