"""Bounds on [electrical] that a tuned loop or a long feed line needs."""

from __future__ import annotations

from fabplan.design.read import parse_design

BASE = """
[stock]
diameter = "2 mm"
material = "cu-c11000-annealed"
[[element]]
shape = "rect-loop"
side = "300 mm"
corner_radius = "10 mm"
feed_gap = "10 mm"
[electrical]
target = "14.1 MHz"
"""


def test_a_narrow_sweep_may_step_below_a_kilohertz():
    # a small tuned loop's half-power bandwidth is tens of kHz (common practice, no source):
    # a sweep of it takes steps of a few hundred Hz
    d = parse_design(BASE + 'sweep = { from = "14.09 MHz", to = "14.11 MHz", '
                            'step = "250 Hz" }\n')
    assert d.electrical.sweep_step_hz == 250.0


def test_a_feed_line_may_be_longer_than_the_default_length_bound():
    d = parse_design(BASE + '[electrical.feed_line]\nlength = "150 m"\nvelocity_factor = 0.66\n'
                            'loss_db_per_100m = 2.0\nloss_frequency = "14 MHz"\n')
    assert d.electrical.chain.feed_line.length_mm == 150_000.0
