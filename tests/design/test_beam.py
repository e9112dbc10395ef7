"""Reading beams: [boom], element positions, matching devices made as parts."""

from __future__ import annotations

import pytest

from fabplan.design.read import parse_design
from fabplan.errors import DesignError
from fabplan.geometry.shapes import hairpin

HEAD = """
[stock]
catalogue = "al-rod-1/4"
[boom]
catalogue = "al-sq-1x1/16"
length = "1 m"
"""


def _design(elements: str, head: str = HEAD):
    return parse_design(head + elements)


def test_square_boom_from_the_catalogue():
    # common practice, no source: 1 x 1/16 in square aluminium tube
    d = _design('[[element]]\nshape = "straight"\nlength = "1 m"\nposition = "10 cm"\n')
    s = d.boom.stock
    assert s.section == "square" and s.outside_mm == pytest.approx(25.4)
    assert s.wall_mm == pytest.approx(25.4 / 16)
    # source: mass of a square tube = density x 4 t (a - t)
    assert s.mass_per_m_kg == pytest.approx(s.density_kg_m3 * 4 * s.wall_mm
                                            * (25.4 - s.wall_mm) * 1e-6)
    assert d.boom.datum == "rear" and d.boom.mounting == "insulated"


@pytest.mark.parametrize(("text", "field", "rule"), [
    ('[[element]]\nshape = "straight"\nlength = "1 m"\nposition = "10 cm"\nmounting = "glued"\n',
     "].mounting", "must be one of"),
    ('[[element]]\nshape = "straight"\nlength = "1 m"\nposition = "10 cm"\n'
     '[element.placement]\nat = ["0 mm", "0 mm", "0 mm"]\n', "placement", "not both"),
    ('[[element]]\nshape = "straight"\nlength = "1 m"\nfeed_gap = "2 cm"\n[element.match]\n'
     'kind = "hairpin"\nlength = "5 cm"\nspacing = "2 cm"\n', "match.spacing", "feed gap"),
    ('[[element]]\nshape = "straight"\nlength = "1 m"\nfeed_gap = "2 cm"\n[element.match]\n'
     'kind = "gamma"\nlength = "5 cm"\nspacing = "3 cm"\n', "match", "whole straight"),
    ('[[element]]\nshape = "straight"\nlength = "1 m"\n[element.match]\n'
     'kind = "hairpin"\nlength = "5 cm"\n', "match", "feed_gap"),
    ('[[element]]\nshape = "helix"\nturns = 3\ndiameter = "5 cm"\npitch = "1 cm"\n'
     'position = "10 cm"\n', "position", "no set way"),
])
def test_bad_beam_input_names_the_field(text, field, rule):
    with pytest.raises(DesignError, match=rule) as err:
        _design(text)
    assert field in (err.value.field or "")


def test_match_becomes_a_part_after_its_element():
    d = _design('[[element]]\nname = "driven"\nshape = "straight"\nlength = "95 cm"\n'
                'feed_gap = "25 mm"\nposition = "40 cm"\n[element.match]\nkind = "hairpin"\n'
                'length = "6 cm"\n[[element]]\nname = "director"\nshape = "straight"\n'
                'length = "90 cm"\nposition = "80 cm"\n')
    names = [e.name for e in d.elements]
    assert names == ["driven", "driven hairpin", "director"]
    part = d.elements[1]
    assert part.part_of == "driven" and part.shape == "hairpin"
    assert part.params.centre_spacing(6.35) == pytest.approx(25.0)  # the feed gap
    # its ends sit on the driven element's inner ends, in the assembly's frame
    p = hairpin.build(part.params, 6.35)
    ends = part.placement.apply([p.origin, p.end_point()])
    inner = d.elements[0].placement.apply([(-12.5, 0.0, 0.0), (12.5, 0.0, 0.0)])
    assert ends == pytest.approx(inner, abs=1e-9)


def test_offer_for_an_unknown_stock_is_bad_input():
    with pytest.raises(DesignError, match="catalogue") as err:
        _design('[[element]]\nshape = "straight"\nlength = "1 m"\n[purchase]\ncurrency = "USD"\n'
                '[[purchase.offer]]\nlength = "6 ft"\nprice = 5.0\nstock = "al-rod-9/16"\n')
    assert err.value.field == "purchase.offer[1].stock"
