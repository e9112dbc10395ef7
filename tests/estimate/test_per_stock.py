"""Purchases planned per stock: offers name the stock they are for."""

from __future__ import annotations

import pytest

TEXT = """
[project]
name = "telescoping"
[stock]
catalogue = "al-5/8x0.058"
[shop]
units = "mm"
[[element]]
name = "reflector"
shape = "straight"
length = "2800 mm"
quantity = 2
sections = [{{ catalogue = "al-3/4x0.058", length = "600 mm" }}, {{ catalogue = "al-5/8x0.058" }}]
[purchase]
currency = "USD"
[[purchase.offer]]
name = "5/8 tube, 6 ft"
length = "6 ft"
price = 12.0
{extra}
"""


def test_each_stock_is_packed_into_its_own_offers(plan_of):
    plan = plan_of(TEXT.format(extra='[[purchase.offer]]\nname = "3/4 tube, 6 ft"\n'
                                     'stock = "al-3/4x0.058"\nlength = "6 ft"\nprice = 14.0\n'))
    o = plan.order
    # the 3/4 in centre tubes (1200 mm) one to a 6 ft piece; the 5/8 in tips (2 x 876.2 mm
    # a beam) two to a piece: source: bin packing by hand, 1828.8 mm pieces
    by_stock = {}
    for p in o.pieces:
        by_stock.setdefault(p.stock, []).append(p)
        assert all(c.length_mm <= p.length_mm for c in p.cuts)
    assert len(by_stock["al-3/4x0.058"]) == 2
    assert len(by_stock[""]) == 2
    assert all(c.element.startswith("reflector, centre") for p in by_stock["al-3/4x0.058"]
               for c in p.cuts)
    assert o.stock_cost == pytest.approx(2 * 14.0 + 2 * 12.0)
    assert not o.unoffered
    # weights per stock: each piece's own mass per metre
    pieces = plan.elements[0].pieces
    assert o.elements_weight_kg == pytest.approx(2 * sum(p.mass_kg for p in pieces))


def test_cuts_of_a_stock_without_offers_are_listed(plan_of):
    plan = plan_of(TEXT.format(extra=""))
    o = plan.order
    assert [(u.stock, u.cuts) for u in o.unoffered] == [("al-3/4x0.058", 2)]
    assert any(f.code == "no-stock-offered" for f in plan.findings)
    assert all(p.stock == "" for p in o.pieces)
