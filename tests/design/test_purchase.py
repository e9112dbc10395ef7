"""The [purchase] table: every key checked, every error one line naming its field."""

from __future__ import annotations

import pytest

from fabplan.design.read import parse_design
from fabplan.errors import DesignError
from fabplan.plan import make_plan
from fabplan.units import parse_currency

OFFER = """
[purchase]
currency = {currency}
{purchase_extra}
[[purchase.offer]]
name = "stick"
length = "{length}"
price = {price}
{offer_extra}
"""


def _purchase(currency='"EUR"', length="3 m", price="12.5", purchase_extra="",
              offer_extra="") -> str:
    return OFFER.format(currency=currency, length=length, price=price,
                        purchase_extra=purchase_extra, offer_extra=offer_extra)


def test_settings_are_read(hairpin):
    d = parse_design(hairpin(_purchase(purchase_extra='spares = 2\nscrap_percent = 10\n'
                                                      'ends = "5 mm"',
                                       offer_extra='per = "m"\nsource = "yard"')))
    s = d.purchase
    assert s.currency.label == "EUR" and s.currency.is_code
    assert s.spares == 2 and s.scrap_percent == 10
    (o,) = s.offers
    assert (o.name, o.length_mm, o.price, o.per, o.ends_mm, o.source) == \
        ("stick", 3000, 12.5, "m", 5, "yard")
    assert o.usable_mm == 2990


def test_absent_table_gives_defaults(hairpin):
    s = parse_design(hairpin()).purchase
    assert s.offers == () and s.items == () and s.currency is None and not s.given


@pytest.mark.parametrize("kwargs, field, match", [
    ({"price": "0"}, "purchase.offer[1].price", "positive"),
    ({"price": "-3.5"}, "purchase.offer[1].price", "positive"),
    ({"price": '"12"'}, "purchase.offer[1].price", "expected a number"),
    ({"currency": '"usd"'}, "purchase.currency", "capitals"),
    ({"currency": '"dollars"'}, "purchase.currency", "unknown currency format"),
    ({"currency": "5"}, "purchase.currency", "unknown currency format"),
    ({"offer_extra": 'per = "yard"'}, "purchase.offer[1].per", "must be one of"),
    ({"offer_extra": 'lenght = "3 m"'}, "purchase.offer[1].lenght", "did you mean 'length'"),
    ({"offer_extra": 'ends = "2 m"'}, "purchase.offer[1].ends", "whole"),
    ({"purchase_extra": "spares = 1.5"}, "purchase.spares", "whole number"),
    ({"purchase_extra": "spares = -1"}, "purchase.spares", "at least 0"),
    ({"purchase_extra": "scrap_percent = 100"}, "purchase.scrap_percent", "less than 100"),
    ({"length": "3"}, "purchase.offer[1].length", "bare number"),
])
def test_bad_values_name_their_field(hairpin, kwargs, field, match):
    with pytest.raises(DesignError, match=match) as err:
        parse_design(hairpin(_purchase(**kwargs)))
    assert err.value.field == field
    assert "\n" not in str(err.value)


@pytest.mark.parametrize("item, field, match", [
    ('name = "balun"\nquantity = 0\nweight = "40 g"\nprice = 5.0', "quantity", "at least 1"),
    ('name = "balun"\nquantity = 2.5\nweight = "40 g"\nprice = 5.0', "quantity", "whole"),
    ('name = "balun"\nquantity = true\nweight = "40 g"\nprice = 5.0', "quantity", "whole"),
    ('name = "balun"\nweight = "40 stone"\nprice = 5.0', "weight", "unknown mass unit"),
    ('name = "balun"\nweight = "40"\nprice = 5.0', "weight", "mass with its unit"),
    ('name = "balun"\nweight = "40 g"\nprice = 0', "price", "positive"),
    ('name = "balun"\nweight = "40 g"', "price", "required"),
])
def test_bad_items_name_their_field(hairpin, item, field, match):
    text = hairpin(_purchase() + "\n[[purchase.item]]\n" + item + "\n")
    with pytest.raises(DesignError, match=match) as err:
        parse_design(text)
    assert err.value.field == f"purchase.item[1].{field}"


def test_offers_need_a_currency(hairpin):
    text = hairpin('[purchase]\n[[purchase.offer]]\nlength = "3 m"\nprice = 4.0\n')
    with pytest.raises(DesignError, match="required") as err:
        parse_design(text)
    assert err.value.field == "purchase.currency"


def test_a_piece_longer_than_any_stock_is_bad_input(hairpin):
    # the hairpin's cut length is about 235 mm; the only stock is 200 mm long
    with pytest.raises(DesignError, match="longer than any stock offered") as err:
        make_plan(parse_design(hairpin(_purchase(length="200 mm"))))
    assert err.value.field == "element[1]"
    assert "purchase.offer[1]" in str(err.value)


@pytest.mark.parametrize("text, shown", [("USD", "USD 1,234.50"), ("GBP", "GBP 1,234.50"),
                                         ("$", "$1,234.50"), ("€", "€1,234.50"),
                                         ("£", "£1,234.50")])
def test_currencies(text, shown):
    assert parse_currency(text, "c").format(1234.5) == shown
