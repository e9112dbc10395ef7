"""Rewriting a design file: only the asked values change; comments and layout stay."""

from __future__ import annotations

import dataclasses
import tomllib

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.design.read import parse_design
from fabplan.design.rewrite import rewrite_element
from fabplan.errors import DesignError
from fabplan.geometry.shapes import SHAPES

DESIGN = """
[project]
name = "rewrite test"

[stock]
diameter = "4 mm"
material = "cu-c11000-annealed"

[shop]
units = "{units}"

[[element]]
name = "fd"
shape = "folded-dipole"   # a comment that must survive
side = "{side}"
centre_spacing = "40 mm"
feed_gap = "12 mm"
"""


def design(side="950 mm", units="mm"):
    text = DESIGN.format(side=side, units=units)
    return text, parse_design(text, "t.toml")


def rewrite_design(text, d, name, new_params):
    e = next(e for e in d.elements if e.name == name)
    return rewrite_element(text, d, name, SHAPES[e.shape].tuned_keys(new_params))


@pytest.mark.parametrize("units, expect", [("mm", '"937.125 mm"'), ("in", '"36.8947 in"')])
def test_rewrite_replaces_only_the_governing_value(units, expect):
    text, d = design(units=units)
    new_params = dataclasses.replace(d.elements[0].params,
                                     length_mm=937.125 if units == "mm" else 36.8947 * 25.4)
    new_text, changes = rewrite_design(text, d, "fd", new_params)
    assert list(changes) == ["side"]
    old_lines, new_lines = text.split("\n"), new_text.split("\n")
    diff = [(a, b) for a, b in zip(old_lines, new_lines) if a != b]
    assert len(old_lines) == len(new_lines) and len(diff) == 1
    assert diff[0][1] == f"side = {expect}"
    assert "# a comment that must survive" in new_text
    assert tomllib.loads(new_text)["element"][0]["side"] == expect.strip('"')


def test_rewrite_scales_a_loop_given_by_its_sides():
    text = """[stock]
diameter = "3 mm"
material = "cu-c11000-annealed"

[shop]
units = "mm"

[[element]]
name = "quad"
shape = "rect-loop"
width = "500 mm"   # across
height = "250 mm"
corner_radius = "20 mm"
feed_gap = "10 mm"
"""
    d = parse_design(text)
    spec = SHAPES["rect-loop"]
    key, perimeter = spec.governing(d.elements[0].params)
    assert key == "perimeter" and perimeter == pytest.approx(1500.0)
    new_params = spec.with_governing(d.elements[0].params, 1530.0)
    new_text, changes = rewrite_design(text, d, "quad", new_params)
    assert changes == {"width": "510.000 mm", "height": "255.000 mm"}
    assert 'width = "510.000 mm"   # across' in new_text


def test_rewrite_changes_an_inline_table_too():
    text = """element = [{ name = "fd", shape = "folded-dipole", side = "900 mm", spacing = "4cm" }]

[stock]
diameter = "3 mm"
material = "cu-c11000-annealed"
"""
    d = parse_design(text)
    p = dataclasses.replace(d.elements[0].params, length_mm=910.0)
    new_text, changes = rewrite_design(text, d, "fd", p)
    assert changes == {"side": "35.8268 in"}
    assert parse_design(new_text).elements[0].params.length_mm == pytest.approx(910.0, abs=0.01)


def test_rewrite_refuses_what_it_cannot_find():
    d = parse_design(DESIGN.format(side="950 mm", units="mm"))
    with pytest.raises(DesignError, match="by hand"):
        rewrite_element(DESIGN.format(side="950 mm", units="mm"), d, "fd",
                        {"overall_length": ("length", 1000.0)})


@settings(max_examples=40, deadline=None, derandomize=True)
@given(side=st.floats(200.0, 3000.0), units=st.sampled_from(["mm", "in"]))
def test_rewrite_round_trips_any_length(side, units):
    text, d = design(units=units)
    p = dataclasses.replace(d.elements[0].params, length_mm=side)
    new_text, _ = rewrite_design(text, d, "fd", p)
    # the design file keeps the length to better than 0.01 mm
    assert parse_design(new_text).elements[0].params.length_mm == pytest.approx(side, abs=0.01)
