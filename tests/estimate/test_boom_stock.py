"""The boom in the purchase plan: cut from its own stock, weighed with the elements."""

from __future__ import annotations

import pytest

from fabplan.design.read import parse_design
from fabplan.errors import DesignError
from fabplan.plan import make_plan

ELEMENTS = """
[[element]]
name = "reflector"
shape = "straight"
length = "1000 mm"
position = "50 mm"
[[element]]
name = "driven"
shape = "straight"
length = "950 mm"
position = "450 mm"
"""
OFFERS = """
[purchase]
currency = "EUR"
[[purchase.offer]]
name = "rod, 2 m"
length = "2 m"
price = 5.0
[[purchase.offer]]
name = "square tube, {tube}"
stock = "al-sq-1x1/16"
length = "{tube}"
price = 12.0
"""


def _plan(beam_toml, boom_length="1000 mm", tube=None):
    text = beam_toml(ELEMENTS, boom='catalogue = "al-sq-1x1/16"', boom_length=boom_length)
    if tube is not None:
        text += OFFERS.format(tube=tube)
    return make_plan(parse_design(text))


def test_the_boom_is_cut_from_its_offer_and_weighed(beam_toml):
    plan = _plan(beam_toml, tube="1.5 m")
    o = plan.order
    assert o is not None
    (boom_piece,) = [p for p in o.pieces if any(c.element == "boom" for c in p.cuts)]
    assert boom_piece.offer == "square tube, 1.5 m"
    assert [c.length_mm for c in boom_piece.cuts] == [1000.0]
    # source: 6063 aluminium 2700 kg/m^3 (handbook value, from memory); 1 x 1/16 in square
    # tube: (25.4^2 - 22.225^2) mm^2 = 151.2 mm^2 of section, 0.408 kg per metre
    assert o.supports_weight_kg == pytest.approx(0.408, rel=0.01)
    assert o.total_weight_kg == pytest.approx(o.elements_weight_kg + o.supports_weight_kg)
    assert o.stock_cost == pytest.approx(5.0 + 12.0)  # one rod holds both elements
    assert not [f for f in plan.findings if f.code == "no-stock-offered"]


def test_a_boom_no_offer_is_for_is_named_and_still_weighed(beam_toml):
    text = beam_toml(ELEMENTS, boom='catalogue = "al-sq-1x1/16"') + (
        '[purchase]\ncurrency = "EUR"\n[[purchase.offer]]\nname = "rod"\nlength = "2 m"\n'
        'price = 5\n')
    plan = make_plan(parse_design(text))
    (f,) = [f for f in plan.findings if f.code == "no-stock-offered"]
    assert 'stock = "al-sq-1x1/16"' in f.message
    assert plan.order is not None and plan.order.supports_weight_kg > 0.4


def test_a_boom_longer_than_its_stock_is_refused(beam_toml):
    with pytest.raises(DesignError, match=r"boom, 1000.0 mm long, is longer than any stock"
                                          r" offered") as e:
        _plan(beam_toml, tube="900 mm")
    assert e.value.field == "boom.length"


def test_an_offer_names_a_boom_tube_or_a_stock_key_only(beam_toml):
    with pytest.raises(DesignError, match="al-sq-9x9"):
        parse_design(beam_toml(ELEMENTS, boom='catalogue = "al-sq-1x1/16"')
                     + OFFERS.format(tube="2 m").replace('"al-sq-1x1/16"', '"al-sq-9x9"'))
