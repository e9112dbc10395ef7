"""The order the estimate adds to the Plan: what to buy, the cuts, spares, costs, JSON."""

from __future__ import annotations

import json
import math

import pytest

from fabplan.design.read import load_design, parse_design
from fabplan.plan import make_plan
from fabplan.render.json import plan_to_dict, plan_to_json
from fabplan.render.text import plan_to_text
from fabplan.units import FT, IN

STICKS = """
[purchase]
currency = "GBP"
ends = "5 mm"
{extra}
[[purchase.offer]]
name = "3 m stick"
length = "3000 mm"
price = 9.0
"""


def test_bundled_example_buys_the_cheapest_mix(example_path):
    plan = make_plan(load_design(example_path))
    o = plan.order
    cut = plan.elements[0].cut_length_mm
    # invented prices in the example: a 15 ft coil (21.50) holds 6 cuts, a 5 ft length at
    # 1.90 per ft (9.50) holds 2: 31.00 beats 2 coils (43.00) or a 50 ft coil (62.00)
    usable_15 = 15 * FT - 2 * 0.5 * IN
    assert math.floor(usable_15 / cut) == 6
    assert [(b.offer, b.count) for b in o.buy] == [("15 ft coil", 1), ("5 ft cut length", 1)]
    assert o.stock_cost == pytest.approx(31.0)
    assert o.proven_optimal
    assert sum(len(p.cuts) for p in o.pieces) == 7
    assert o.items_cost == pytest.approx(7 * 6.5 + 7 * 2.75)
    assert o.total_cost == pytest.approx(31.0 + 64.75)
    e = plan.elements[0].estimate
    assert e.batch_cost == pytest.approx(31.0)  # the only element carries the whole stock cost


def test_cut_positions_remnant_and_utilisation(hairpin, plan_of):
    plan = plan_of(hairpin(STICKS.format(extra=""), quantity=5, kerf="2 mm", leg="400 mm"))
    cut = plan.elements[0].cut_length_mm
    o = plan.order
    per = math.floor((2990 + 2) / (cut + 2))  # common practice, no source
    assert o.pieces_to_buy == math.ceil(5 / per)
    first = o.pieces[0]
    assert [c.start_mm for c in first.cuts] == pytest.approx(
        [5 + n * (cut + 2) for n in range(len(first.cuts))])
    assert first.remnant_mm == pytest.approx(2990 - len(first.cuts) * (cut + 2))
    assert o.utilisation == pytest.approx(5 * cut / (3000 * o.pieces_to_buy))


def test_spares_and_scrap_add_pieces(hairpin, plan_of):
    plan = plan_of(hairpin(STICKS.format(extra="spares = 1\nscrap_percent = 10"), quantity=12))
    e = plan.elements[0]
    # 1 spare + 10 % of 12 rounded up (2) = 3 spare pieces
    assert e.estimate.spares == 3
    cuts = [c for p in plan.order.pieces for c in p.cuts]
    assert len(cuts) == 15 and sum(c.spare for c in cuts) == 3
    assert plan.order.elements_weight_kg == pytest.approx(12 * e.mass_kg)


def test_element_costs_share_the_stock_cost(plan_of):
    text = """
[stock]
gauge = "AWG 10"
material = "cu-c11000-annealed"
[shop]
kerf = "1 mm"
[[element]]
name = "long"
shape = "hairpin"
quantity = 3
leg = "600 mm"
spacing = "30 mm"
[[element]]
name = "short"
shape = "hairpin"
quantity = 4
leg = "200 mm"
spacing = "30 mm"
[purchase]
currency = "$"
[[purchase.offer]]
length = "10 ft"
price = 3.0
per = "lb"
"""
    plan = plan_of(text)
    o = plan.order
    total = sum(e.estimate.batch_cost for e in plan.elements)
    assert total == pytest.approx(o.stock_cost)
    # per weight: the price of one piece is 3.00 x its weight in pounds
    piece_lb = plan.stock.mass_per_m_kg * 10 * FT / 1000 / 0.45359237
    assert o.buy[0].piece_cost == pytest.approx(3.0 * piece_lb)
    long, short = plan.elements
    ratio = (long.cut_length_mm + 1) / (short.cut_length_mm + 1)
    assert long.estimate.cost / short.estimate.cost == pytest.approx(ratio)


def test_plan_json_gains_weight_cost_and_order(example_path):
    plan = make_plan(load_design(example_path))
    d = json.loads(plan_to_json(plan))
    el = d["elements"][0]
    assert el["weight_kg"] == pytest.approx(plan.elements[0].mass_kg, abs=1e-5)
    assert el["cost"] == pytest.approx(31.0 / 7, abs=0.005)
    order = d["order"]
    for key in ("stock_pieces", "buy", "pieces_to_buy", "offcuts_mm", "utilisation",
                "lower_bound_pieces", "lower_bound_cost", "total_weight_kg", "total_cost"):
        assert key in order
    assert order["pieces_to_buy"] == 2 and order["currency"] == "USD"
    assert sum(len(p["cuts"]) for p in order["stock_pieces"]) == 7
    assert plan_to_dict(plan) == plan_to_dict(make_plan(load_design(example_path)))
    text = plan_to_text(plan)
    assert "Purchase plan" in text and "USD 31.00" in text


def test_no_offers_still_weighs(hairpin, plan_of):
    plan = plan_of(hairpin(quantity=2))
    o = plan.order
    assert o.pieces == () and o.total_cost is None and o.stock_cost is None
    assert o.elements_weight_kg == pytest.approx(2 * plan.elements[0].mass_kg)
    assert plan.elements[0].estimate.cost is None
    # no design-level finding added (the jig's advice on drilling is about the jig)
    assert all(f.element for f in plan.findings if not f.code.startswith("jig-"))


def test_same_input_same_order(hairpin):
    text = hairpin(STICKS.format(extra="spares = 2"), quantity=9, kerf="1.5 mm")
    a = plan_to_json(make_plan(parse_design(text)))
    b = plan_to_json(make_plan(parse_design(text)))
    assert a == b


def test_spares_for_one_element(hairpin, plan_of):
    text = hairpin(STICKS.format(extra='spares = 1\n[purchase.spares_by_element]\npin = 3\n'),
                   quantity=2)
    assert plan_of(text).elements[0].estimate.spares == 3
    with pytest.raises(Exception, match="did you mean 'pin'") as err:
        plan_of(hairpin(STICKS.format(extra='[purchase.spares_by_element]\npun = 3\n')))
    assert err.value.field == "purchase.spares_by_element.pun"


def test_an_order_of_too_many_cuts_is_refused_first(hairpin):
    """Before: 100 000 parts and more were packed cut by cut for minutes. The order's
    size is checked before any list of cuts is made, and names the largest quantity."""
    from fabplan.errors import DesignError
    from fabplan.estimate.stage import MAX_CUTS, estimate
    from fabplan.plan import core_element

    second = '\n[[element]]\nname = "b"\nshape = "hairpin"\nleg = "50 mm"\nspacing = "20 mm"\n' \
             'quantity = 100000\n[[element]]\nname = "c"\nshape = "hairpin"\nleg = "60 mm"\n' \
             'spacing = "20 mm"\nquantity = 100000\n'
    text = hairpin(quantity=90_000) + second
    design = parse_design(text, "big.toml")
    elements = [(spec, core_element(design, spec)[1]) for spec in design.elements]
    with pytest.raises(DesignError, match="290,000 cuts") as info:
        estimate(design, elements)
    assert info.value.field == "element[2].quantity" and MAX_CUTS == 250_000
    assert str(info.value).startswith("big.toml: element[2].quantity = 100000: ")


def test_stock_pieces_cut_alike_are_grouped(hairpin, plan_of):
    plan = plan_of(hairpin(STICKS.format(extra=""), quantity=200))
    o = plan.order
    groups = o.piece_groups()
    assert sum(g.count for g in groups) == o.pieces_to_buy
    assert len(groups) < o.pieces_to_buy
    seen = [p.index for g in groups for p in g.pieces]
    assert sorted(seen) == list(range(1, o.pieces_to_buy + 1))
    for g in groups:
        pattern = [(c.element, c.length_mm, c.start_mm) for c in g.first.cuts]
        assert all([(c.element, c.length_mm, c.start_mm) for c in p.cuts] == pattern
                   and p.offer == g.first.offer for p in g.pieces)
