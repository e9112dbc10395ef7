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


# -- issue 15: one-line errors instead of tracebacks, every error at once ------------------
def _error(text: str, source: str = "d.toml") -> DesignError:
    with pytest.raises(DesignError) as info:
        parse_design(text, source)
    for line in info.value.lines:
        assert "\n" not in line and line.startswith(f"{source}: "), line
    return info.value


@pytest.mark.parametrize("element, field, match", [
    ('side = "1e15 mm"\nspacing = "50 mm"', "element[1].side", "at most 100 m"),
    ('side = "1e30 mm"\nspacing = "50 mm"', "element[1].side", "at most 100 m"),
    ('side = "10000 m"\nspacing = "50 mm"', "element[1].side", "at most 100 m"),
    ('side = "900 mm"\nspacing = "50 mm"\nfeed_gap = "1e300 mm"', "element[1].feed_gap",
     "at most 100 m"),
    ('side = "900 mm"\nspacing = "50 mm"\ntrim = "1e30 mm"', "element[1].trim",
     "at most 500 mm"),
    ('side = "1' + "0" * 330 + '/3 in"\nspacing = "50 mm"', "element[1].side",
     r"\(336 characters\)"),
    ('side = "900 mm"\nspacing = "50 mm"\nquantity = 100001', "element[1].quantity",
     "at most 100000"),
])
def test_huge_values_are_one_line_errors(element, field, match):
    err = _error(design(element=element))
    assert err.field == field
    assert len(err.lines) == 1
    assert err.lines[0].startswith(f"d.toml: {field} = ")
    assert pytest.raises(DesignError, parse_design, design(element=element)).match(match)


def test_a_huge_number_is_not_an_overflow():
    err = _error(design(stock='diameter = "4 mm"\nmaterial = "cu-c11000-annealed"\n'
                              'k_factor = 1' + "0" * 400))
    assert err.field == "stock.k_factor" and "finite" in err.rule
    assert "(401 characters)" in str(err)


def test_shop_trim_and_kerf_have_their_own_bounds():
    err = _error(design(extra='[shop]\ntrim = "1e30 mm"\nkerf = "20 mm"\n'))
    assert [e.field for e in err.errors] == ["shop.kerf", "shop.trim"]
    assert "a saw's kerf" in err.lines[0] and "a bender's grip" in err.lines[1]


def test_deep_nesting_is_one_line():
    deep = "x = " + "[" * 100_000 + "]" * 100_000 + "\n"
    err = _error(deep + design())
    assert "nested too deep" in str(err)
    err = _error("x = " + "[" * 20 + "]" * 20 + "\n" + design())
    assert "nested 9 levels deep" in str(err)


def test_a_byte_order_mark_is_accepted(tmp_path):
    from fabplan.design.read import load_design

    path = tmp_path / "bom.toml"
    path.write_text(design(), encoding="utf-8-sig")  # as some editors save
    assert path.read_bytes()[:3] == b"\xef\xbb\xbf"
    assert load_design(path).elements[0].shape == "folded-dipole"


def test_a_file_too_large_is_refused(tmp_path):
    from fabplan.design.read import load_design

    path = tmp_path / "big.toml"
    path.write_text(design() + "# " + "x" * (1 << 20) + "\n", encoding="utf-8")
    with pytest.raises(DesignError, match="at most 1024 KiB") as info:
        load_design(path)
    assert str(info.value).startswith(str(path))


@pytest.mark.parametrize("key, shown", [
    ('"" = 1', 'element[1]."": unknown key'),
    ('"side " = "1 mm"', 'element[1]."side ": unknown key; did you mean \'side\'?'),
    ('"a\\u0007" = 1', 'element[1]."a\\u0007": unknown key'),
])
def test_odd_keys_are_shown_quoted(key, shown):
    err = _error(design(element=f'side = "900 mm"\nspacing = "50 mm"\n{key}'))
    assert err.lines[0].startswith(f"d.toml: {shown}")


def test_a_200_kb_value_is_shortened():
    value = "9" * 200_000
    err = _error(design(element=f'side = "{value}"\nspacing = "50 mm"'))
    assert len(str(err)) < 300
    assert "(200000 characters)" in str(err)


@pytest.mark.parametrize("where, text", [
    ("project.name", '[project]\nname = "a\\u0007b"\n'),
    ("project.notes", '[project]\nnotes = "line one\\nline two"\n'),
    ("element[2].name", '[[element]]\nname = "x\\u001b[31m"\nshape = "hairpin"\n'
                        'leg = "100 mm"\nspacing = "20 mm"\n'),
    ("purchase.offer[1].name", '[purchase]\ncurrency = "USD"\n[[purchase.offer]]\n'
                               'name = "a\\tb"\nlength = "3 m"\nprice = 1.0\n'),
    ("purchase.offer[1].source", '[purchase]\ncurrency = "USD"\n[[purchase.offer]]\n'
                                 'length = "3 m"\nprice = 1.0\nsource = "\\u0000"\n'),
    ("purchase.item[1].name", '[purchase]\ncurrency = "USD"\n[[purchase.item]]\n'
                              'name = "\\u202e"\nweight = "1 g"\nprice = 1.0\n'),
])
def test_control_characters_in_names_and_text_are_refused(where, text):
    err = _error(design() + text)
    assert err.field == where
    assert "one line of printable characters" in err.rule


def test_names_and_text_are_bounded():
    err = _error(design() + f'[project]\nname = "{"n" * 201}"\nnotes = "{"t" * 1001}"\n')
    assert [e.field for e in err.errors] == ["project.name", "project.notes"]
    assert "a name is at most 200 characters" in err.lines[0]
    assert "a text is at most 1000 characters" in err.lines[1]
    assert "(1001 characters)" in err.lines[1]


def test_every_error_in_the_file_at_once():
    text = design(stock='diameter = "4 mm"\nmaterial = "copper"',
                  element='side = "900 furlongs"\nspacing = 50\nquantity = 0\ncolour = "red"',
                  extra='[shop]\nfraction = 10\n[purchase]\ncurrency = "usd"\n')
    err = _error(text)
    fields = [e.field for e in err.errors]
    assert fields == ["stock.material", "shop.fraction", "element[1].quantity",
                      "element[1].colour", "element[1].side", "element[1].spacing",
                      "purchase.currency"]
    assert str(err) == err.lines[0]
    assert isinstance(err, DesignError) and err.field == "stock.material"


def test_a_failure_stops_what_depends_on_it():
    # each key's own error is reported, in both elements; the checks that combine an
    # element's keys (spacing against diameter, gap against side) are not, as they
    # would only repeat the first failure
    text = design(element='side = "900 mm"\nspacing = "50 furlongs"\nfeed_gap = "500 m"') + \
        '[[element]]\nname = "b"\nshape = "hairpin"\nleg = "0 mm"\nspacing = "20 mm"\n'
    err = _error(text)
    assert [e.field for e in err.errors] == ["element[1].spacing", "element[1].feed_gap",
                                             "element[2].leg"]
    # a misspelt shape: the rest of that element is not read against the wrong shape
    err = _error(design().replace('"folded-dipole"', '"folded-dipol"'))
    assert [e.field for e in err.errors] == ["element[1].shape"]


def test_elements_and_bends_are_bounded():
    many = "".join(f'[[element]]\nname = "e{i}"\nshape = "hairpin"\nleg = "100 mm"\n'
                   'spacing = "20 mm"\n' for i in range(101))
    err = _error('[stock]\ndiameter = "4 mm"\nmaterial = "cu-c11000-annealed"\n' + many)
    assert err.field == "element" and "at most 100" in err.rule
    rows = "".join('[[element.bends]]\nstraight = "10 mm"\nangle = 10\nradius = "10 mm"\n'
                   for _ in range(201))
    err = _error('[stock]\ndiameter = "4 mm"\nmaterial = "cu-c11000-annealed"\n'
                 '[element]\nshape = "custom"\n' + rows)
    assert err.field == "element.bends" and "at most 200" in err.rule


def test_a_piece_longer_than_500_m_is_refused_before_any_work():
    text = ('[stock]\ndiameter = "2 mm"\nmaterial = "cu-c11000-annealed"\n'
            '[[element]]\nshape = "helix"\nturns = 1000\ndiameter = "100 mm"\npitch = "1 m"\n')
    err = _error(text)
    assert err.field == "element[1]"
    # 1000 turns of sqrt((pi 100)^2 + 1000^2) mm: 1048.2 m (the textbook helix length)
    assert "1048.2 m long" in err.rule and "up to 500 m" in err.rule


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
