"""Weights: mass per length of the stock bought against published tables, and the
weight and cost of elements, items and stock."""

from __future__ import annotations

import pytest

from fabplan.estimate.costing import piece_cost
from fabplan.units import FT, LB_KG, parse_mass

ONE_10FT = """
[purchase]
currency = "USD"
[[purchase.offer]]
name = "10 ft"
length = "10 ft"
price = 10.0
"""


def _lb_per_ft(plan) -> float:
    order = plan.order
    assert [b.count for b in order.buy] == [1]
    return order.stock_weight_kg / LB_KG / 10


@pytest.mark.parametrize("key, lb_per_ft", [
    ("acr-1/4", 0.0804),  # source: ASTM B280, table of ACR tube (1/4 x 0.030 in, 0.0804 lb/ft)
    ("acr-5/16", 0.109),  # from memory: ASTM B280 table (5/16 x 0.032 in)
    ("acr-3/8", 0.134),  # from memory: ASTM B280 table (3/8 x 0.032 in)
    ("acr-1/2", 0.182),  # from memory: ASTM B280 table (1/2 x 0.032 in)
])
def test_acr_tube_weight_per_foot(hairpin, plan_of, key, lb_per_ft):
    text = hairpin(ONE_10FT, stock=f'catalogue = "{key}"', spacing="100 mm", leg="200 mm")
    assert _lb_per_ft(plan_of(text)) == pytest.approx(lb_per_ft, rel=0.006)


@pytest.mark.parametrize("key, lb_per_ft", [
    # from memory: ASTM B88 / Copper Tube Handbook, table of water tube weights (lb/ft)
    ("water-k-1/2", 0.344), ("water-l-1/2", 0.285), ("water-m-1/2", 0.204),
    ("water-k-3/4", 0.641), ("water-l-3/4", 0.455), ("water-m-3/4", 0.328),
])
def test_water_tube_weight_per_foot(hairpin, plan_of, key, lb_per_ft):
    text = hairpin(ONE_10FT, stock=f'catalogue = "{key}"', spacing="150 mm", leg="300 mm")
    assert _lb_per_ft(plan_of(text)) == pytest.approx(lb_per_ft, rel=0.006)


@pytest.mark.parametrize("gauge, lb_per_kft", [
    # from memory: standard annealed copper wire tables (NBS Handbook 100), lb per 1000 ft
    (10, 31.43), (12, 19.77), (14, 12.43),
])
def test_awg_wire_weight(hairpin, plan_of, gauge, lb_per_kft):
    text = hairpin(ONE_10FT, stock=f'gauge = "AWG {gauge}"\nmaterial = "cu-c11000-annealed"')
    assert _lb_per_ft(plan_of(text)) * 1000 == pytest.approx(lb_per_kft, rel=0.005)


def test_element_and_batch_weights_follow_the_cut_length(hairpin, plan_of):
    plan = plan_of(hairpin(ONE_10FT, quantity=3, trim="10 mm"))
    e = plan.elements[0]
    per_m = plan.stock.mass_per_m_kg
    assert e.estimate.weight_kg == pytest.approx(per_m * e.cut_length_mm / 1000)
    assert e.estimate.batch_weight_kg == pytest.approx(3 * e.estimate.weight_kg)
    assert plan.order.elements_weight_kg == pytest.approx(3 * e.estimate.weight_kg)


def test_items_add_weight_and_cost(hairpin, plan_of):
    text = hairpin(ONE_10FT + """
[[purchase.item]]
name = "balun"
quantity = 4
weight = "1.5 oz"
price = 6.25
""", quantity=2)
    o = plan_of(text).order
    # source: NIST SP 811, appendix B: 1 oz = 28.349523125 g exactly
    assert o.items_weight_kg == pytest.approx(4 * 1.5 * 0.028349523125)
    assert o.items_cost == pytest.approx(25.0)
    assert o.total_cost == pytest.approx(o.stock_cost + 25.0)
    assert o.total_weight_kg == pytest.approx(o.elements_weight_kg + o.items_weight_kg)
    assert o.shipping_weight_kg == pytest.approx(o.stock_weight_kg + o.items_weight_kg)


@pytest.mark.parametrize("text, kg", [("45 g", 0.045), ("0.2 kg", 0.2), ("2 lb", 0.90718474),
                                      ("0 g", 0.0), (".5kg", 0.5)])
def test_parse_mass(text, kg):
    # source: NIST SP 811, appendix B (1 lb = 0.45359237 kg exactly)
    assert parse_mass(text, "w") == pytest.approx(kg)


def test_price_units_give_the_same_cost_for_the_same_rate():
    length = 3 * FT
    per_m = 0.25  # kg/m
    # 2.00 per foot, per metre at the same rate, per kg at the same rate: all 6.00
    assert piece_cost(2.0, "ft", length, per_m) == pytest.approx(6.0)
    assert piece_cost(2.0 / 0.3048, "m", length, per_m) == pytest.approx(6.0)
    kg = per_m * length / 1000
    assert piece_cost(6.0 / kg, "kg", length, per_m) == pytest.approx(6.0)
    assert piece_cost(6.0 / (kg / LB_KG), "lb", length, per_m) == pytest.approx(6.0)
    assert piece_cost(6.0, "piece", length, per_m) == 6.0
