"""Plans: marks, cut lengths and findings for each shape."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.design.read import parse_design
from fabplan.plan import make_plan


def plan_of(text: str):
    return make_plan(parse_design(text))


@settings(max_examples=40, deadline=None)
@given(st.floats(200, 2000), st.floats(10, 150), st.floats(2, 30), st.floats(1, 8),
       st.one_of(st.just(0.0), st.floats(0.01, 50)))  # a length is 0 or at least 0.01 mm
def test_marks_are_symmetric_and_monotone(side, spacing, gap, d, trim):
    gap = min(gap, side / 4)
    text = f"""
[stock]
diameter = "{d} mm"
material = "cu-c11000-annealed"
[shop]
trim = "{trim} mm"
[[element]]
shape = "folded-dipole"
side = "{side} mm"
spacing = "{spacing} mm"
feed_gap = "{gap} mm"
"""
    e = plan_of(text).elements[0]
    pos = [m.from_centre_mm for m in e.piece.marks]
    assert pos == sorted(pos)
    # a centred feed gap makes the marks mirror images about the stock's centre
    for a, b in zip(pos, reversed(pos)):
        assert a == pytest.approx(-b, abs=1e-6)
    ends = [m.from_end_mm for m in e.piece.marks]
    assert ends == sorted(ends)
    for m in e.piece.marks:
        assert m.from_end_mm == pytest.approx(m.from_centre_mm + e.cut_length_mm / 2)
    assert e.cut_length_mm == pytest.approx(e.developed_length_mm + 2 * trim)


def test_folded_dipole_marks_against_hand_layout():
    # common practice, no source: with K = 0.5 each 180-degree end uses pi x R of stock
    # and the unbroken side's middle is the stock's centre
    e = plan_of("""
[stock]
diameter = "4 mm"
material = "cu-c11000-annealed"
[[element]]
shape = "folded-dipole"
side = "1000 mm"
centre_spacing = "60 mm"
feed_gap = "20 mm"
""").elements[0]
    r = 30.0
    bend2 = e.piece.bends[1]
    assert bend2.start_from_centre_mm == pytest.approx(500.0)
    assert bend2.end_from_centre_mm == pytest.approx(500.0 + math.pi * r)
    assert e.piece.bends[0].end_from_centre_mm == pytest.approx(-500.0)
    assert e.developed_length_mm == pytest.approx(2000 + 2 * math.pi * r - 20)


def test_findings_for_a_gap_wider_than_its_side():
    p = plan_of("""
[stock]
diameter = "4 mm"
material = "cu-c11000-annealed"
[[element]]
name = "stubby"
shape = "folded-dipole"
side = "30 mm"
spacing = "20 mm"
feed_gap = "40 mm"
""")
    codes = {f.code for f in p.findings if f.severity == "error"}
    assert "gap-wider-than-side" in codes
    assert all(f.element == "stubby" for f in p.findings if not f.code.startswith("jig-"))


def test_touching_conductors_are_an_error():
    p = plan_of("""
[stock]
diameter = "6 mm"
material = "cu-c11000-annealed"
[[element]]
shape = "rect-loop"
width = "300 mm"
height = "300 mm"
corner_radius = "10 mm"
feed_gap = "3 mm"
""")
    assert not any(f.code == "conductors-touch" for f in p.findings)
    p = plan_of("""
[stock]
diameter = "6 mm"
material = "cu-c11000-annealed"
[[element]]
shape = "helix"
turns = 4
diameter = "60 mm"
pitch = "5 mm"
""")
    assert any(f.code == "conductors-touch" and f.severity == "error" for f in p.findings)


def test_tight_bend_asks_for_a_k_factor():
    p = plan_of("""
[stock]
diameter = "6 mm"
material = "cu-c11000-annealed"
[[element]]
shape = "hairpin"
leg = "100 mm"
centre_spacing = "14 mm"
""")
    assert any(f.code == "k-factor-matters" for f in p.findings)


def test_custom_loop_must_close():
    base = """
[stock]
diameter = "3 mm"
material = "al-1100-o"
[[element]]
shape = "custom"
bends = [
  {{ straight = "95 mm", angle = 90, radius = "10 mm" }},
  {{ straight = "180 mm", angle = 90, radius = "10 mm" }},
  {{ straight = "180 mm", angle = 90, radius = "10 mm" }},
  {{ straight = "180 mm", angle = 90, radius = "10 mm" }},
]
tail = "{tail}"
feed_gap = "10 mm"
"""
    good = plan_of(base.format(tail="95 mm"))
    assert not any(f.code == "ends-do-not-meet" for f in good.findings)
    bad = plan_of(base.format(tail="60 mm"))
    assert any(f.code == "ends-do-not-meet" for f in bad.findings)


IMPOSSIBLE_CORNERS = """
[stock]
diameter = "4 mm"
material = "cu-c11000-annealed"
[[element]]
name = "square"
shape = "rect-loop"
side = "300 mm"
corner_radius = "400 mm"
feed_gap = "10 mm"
[electrical]
target = "300 MHz"
"""


def test_a_shape_that_cannot_be_made_stops_before_jig_and_model():
    """Issue 15: an impossible corner radius still ran the electrical model (and
    reported a segment 7e-14 mm long). The plan stops at the geometry error."""
    p = plan_of(IMPOSSIBLE_CORNERS)
    e = p.elements[0]
    assert {f.code for f in e.shape_errors} >= {"corner-radius-too-large"}
    assert e.electrical is None and p.electrical is None
    assert any(f.code == "em-not-run" for f in p.findings)
    assert not any(f.code.startswith(("jig-", "em-seg", "em-mesh")) for f in p.findings)
    assert not p.jig.beds or all(not b.parts for b in p.jig.beds)


def test_sweep_of_a_shape_that_cannot_be_made_is_one_line(cli, write_design):
    path = write_design(IMPOSSIBLE_CORNERS)
    for command in ("sweep", "tune"):
        r = cli(command, path, check_exit=2)
        assert r.stdout == ""
        line, = r.stderr.strip().splitlines()
        assert "element 'square'" in line and "cannot be made" in line
