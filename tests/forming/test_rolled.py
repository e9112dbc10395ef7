"""A large ring rolled in passes: its rolling radius, and no disc jig."""

from __future__ import annotations

import pytest

from fabplan.forming.springback import final_for_held

RING = """
[stock]
catalogue = "water-l-3/4"
[shop]
units = "mm"
[[element]]
name = "loop"
shape = "circle-loop"
diameter = "1000 mm"
feed_gap = "20 mm"
rolled = true
"""


def test_rolled_ring_has_a_rolling_radius_and_no_jig(plan_of):
    # source: the moment-curvature model (Marciniak, Duncan & Hu, Mechanics of Sheet Metal
    # Forming, ch. 6, from memory; forming/springback.py): the ring is rolled to the held
    # radius that springs back to the finished one, the figure a former would have; its
    # release, computed again from the held radius, gives the finished radius
    plan = plan_of(RING)
    ring = plan.element("loop").piece
    assert ring.rolled and ring.forming is not None and ring.forming.method == "rolled"
    (b,) = ring.forming.bends
    assert b.method == "rolled" and b.former_centreline_radius_mm < 500.0
    assert b.final_radius_mm == pytest.approx(500.0)
    assert not ring.forming.formers and not ring.forming.jig_marks
    assert any("rolled ring" in n and f"{b.former_centreline_radius_mm:.1f}" in n
               for n in ring.forming.notes)
    assert plan.jig is not None and not [p for bed in plan.jig.beds for p in bed.parts
                                         if p.part.element == "loop"]
    from fabplan.design.forming import FormingSettings
    from fabplan.forming.stage import stock_model

    sm = stock_model(plan.design.stock, FormingSettings())
    again = final_for_held(sm.model, b.former_centreline_radius_mm, 1.0,
                           ring.stock.profile.depth_mm, plan.design.stock.k_factor)
    assert again.final_radius_mm == pytest.approx(500.0, rel=1e-6)
    unrolled = plan_of(RING.replace("rolled = true\n", ""))
    bent = unrolled.element("loop").piece
    assert bent.forming is not None and bent.forming.formers
    assert bent.forming.bends[0].former_centreline_radius_mm == pytest.approx(
        b.former_centreline_radius_mm, rel=1e-12)
    assert "loop-roll-it" in {f.code for f in unrolled.findings}
