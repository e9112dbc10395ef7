"""Design files: every key validated, every error one line naming field, value and rule."""

from __future__ import annotations

import math

import pytest

from fabplan.design.read import parse_design
from fabplan.errors import DesignError
from fabplan.plan import make_plan

BASE = """
[stock]
{stock}

[[element]]
shape = "folded-dipole"
{element}
"""


def design(stock='diameter = "4 mm"\nmaterial = "cu-c11000-annealed"',
           element='side = "900 mm"\nspacing = "50 mm"', extra=""):
    return BASE.format(stock=stock, element=element) + extra


def test_minimal_design_reads():
    d = parse_design(design())
    assert d.elements[0].quantity == 1
    assert d.stock.profile.diameter_mm == 4.0
    assert d.shop.units == "in" and d.shop.fraction == 32


@pytest.mark.parametrize("stock, element, extra, match", [
    ('diameter = "4 mm"\nmaterial = "cu-c11000-annealed"', 'side = "900 mm"\nspacng = "50 mm"',
     "", r"element\[1\]\.spacng: unknown key; did you mean 'spacing'\?"),
    ('diameter = "4 mm"\nmaterial = "copper"', 'side = "900 mm"\nspacing = "50 mm"', "",
     r"stock\.material = 'copper': unknown material"),
    ('diameter = 4\nmaterial = "cu-c11000-annealed"', 'side = "900 mm"\nspacing = "50 mm"', "",
     r"stock\.diameter = 4: a bare number has no unit"),
    ('diameter = "4 mm"\ngauge = "AWG 10"\nmaterial = "cu-c11000-annealed"',
     'side = "900 mm"\nspacing = "50 mm"', "", "give exactly one of"),
    ('catalogue = "acr-1/3"', 'side = "900 mm"\nspacing = "50 mm"', "",
     r"stock\.catalogue = 'acr-1/3': not in the stock catalogue; did you mean"),
    ('diameter = "4 mm"\nmaterial = "cu-c11000-annealed"',
     'side = "900 mm"\nspacing = "50 mm"\nquantity = 2.5', "",
     r"element\[1\]\.quantity = 2\.5: expected a whole number"),
    ('diameter = "4 mm"\nmaterial = "cu-c11000-annealed"',
     'side = "900 mm"\nspacing = "50 mm"\nquantity = 0', "",
     r"element\[1\]\.quantity = 0: must be at least 1"),
    ('diameter = "4 mm"\nmaterial = "cu-c11000-annealed"',
     'side = "900 mm"\ninside_length = "950 mm"\nspacing = "50 mm"', "", "give only one of"),
    ('diameter = "4 mm"\nmaterial = "cu-c11000-annealed"', 'spacing = "50 mm"', "",
     "give one of `side` or `inside_length` or `overall_length`"),
    ('diameter = "4 mm"\nmaterial = "cu-c11000-annealed"', 'side = "900 mm"\nspacing = "50 mm"',
     '[shop]\nfraction = 10\n', r"shop\.fraction = 10: must be one of 8, 16, 32, 64"),
    ('diameter = "4 mm"\nmaterial = "cu-c11000-annealed"', 'side = "900 mm"\nspacing = "50 mm"',
     '[shop]\nunits = "cubits"\n', r"shop\.units = 'cubits'"),
    ('diameter = "4 mm"\nmaterial = "cu-c11000-annealed"', 'side = "900 mm"\nspacing = "50 mm"',
     '[colour]\nred = 1\n', r"colour: unknown key"),
    ('tube = { od = "6 mm", wall = "3 mm" }\nmaterial = "cu-c12200-annealed"',
     'side = "900 mm"\nspacing = "50 mm"', "", "wall must be less than half"),
])
def test_errors(stock, element, extra, match):
    with pytest.raises(DesignError, match=match) as info:
        parse_design(design(stock, element, extra), "d.toml")
    line = str(info.value)
    assert "\n" not in line and line.startswith("d.toml: ")


def test_unknown_shape_suggests():
    text = design().replace('shape = "folded-dipole"', 'shape = "folded-dipol"')
    with pytest.raises(DesignError, match="did you mean 'folded-dipole'"):
        parse_design(text)


def test_not_toml():
    with pytest.raises(DesignError, match="not valid TOML"):
        parse_design("[stock\n", "x.toml")


def test_property_override_names_its_source():
    d = parse_design(design(extra="") .replace(
        'material = "cu-c11000-annealed"',
        'material = "cu-c11000-annealed"\nproperties = { yield_mpa = 90.0 }'))
    assert d.stock.material.yield_mpa == 90.0
    assert "yield_mpa from the design" in d.stock.material.source


def test_several_elements_and_names():
    text = design() + """
[[element]]
name = "reflector"
shape = "hairpin"
leg = "100 mm"
spacing = "20 mm"
quantity = 3
"""
    d = parse_design(text)
    assert [e.name for e in d.elements] == ["element 1", "reflector"]
    dup = text.replace('name = "reflector"', 'name = "element 1"')
    with pytest.raises(DesignError, match="same name"):
        parse_design(dup)


def test_inside_and_overall_length_give_the_same_side():
    d_mm = 4.0
    a = make_plan(parse_design(design(element='side = "900 mm"\nspacing = "50 mm"')))
    b = make_plan(parse_design(design(element='inside_length = "950 mm"\nspacing = "50 mm"')))
    c = make_plan(parse_design(design(
        element='overall_length = "958 mm"\ncentre_spacing = "54 mm"')))
    # inside tip-to-tip = side + inside spacing; outside = side + spacing + 2 d
    assert b.elements[0].developed_length_mm == pytest.approx(a.elements[0].developed_length_mm)
    assert c.elements[0].developed_length_mm == pytest.approx(a.elements[0].developed_length_mm)
    assert a.elements[0].developed_length_mm == pytest.approx(
        2 * 900 + math.pi * (50 + d_mm) - 10.0)


@pytest.mark.parametrize("extra, needle", [
    ('band = { from = "14.35 MHz", to = "14.0 MHz" }', "must be above"),
    ('band = { from = "7 MHz", to = "21 MHz" }', "an octave"),
])
def test_electrical_band_is_checked(extra: str, needle: str):
    text = ('[stock]\ncatalogue = "acr-1/4"\n[[element]]\nshape = "circle-loop"\n'
            f'diameter = "300 mm"\n[electrical]\ntarget = "14.1 MHz"\n{extra}\n')
    with pytest.raises(DesignError, match=needle):
        parse_design(text)


def test_capacitor_joints_are_read():
    text = ('[stock]\ncatalogue = "acr-1/4"\n[[element]]\nshape = "circle-loop"\n'
            'diameter = "300 mm"\n[element.capacitor]\njoint_resistance = "2 mohm"\njoints = 3\n')
    cap = parse_design(text).elements[0].capacitor
    assert cap.joint_resistance_ohm == pytest.approx(0.002) and cap.joints == 3
    with pytest.raises(DesignError, match="joint_resistance"):
        parse_design(text.replace('joint_resistance = "2 mohm"\n', ""))
