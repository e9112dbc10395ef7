"""Plan -> Plan with an `ElementEstimate` on each element and the `Order`.

Each element is cut `quantity + spares` times (spares = the design's spare
pieces per element plus its scrap share of the quantity, rounded up); the
pieces are packed into the cheapest stock found by `cutting.pack`. The stock's
cost is shared among the elements by the length each consumes (its cuts and
their kerfs). Weights come from the stock's mass per metre.
"""

from __future__ import annotations

import dataclasses
import math

from ..errors import DesignError, Finding
from ..units import format_mm
from .config import PurchaseSettings
from .costing import piece_cost
from .cutting import StockOption, pack, remnant_mm
from .model import BuyLine, Cut, ElementEstimate, ItemLine, Order, StockPiece

__all__ = ["apply", "spares_for"]


def spares_for(name: str, quantity: int, settings: PurchaseSettings) -> int:
    """Extra pieces cut for element `name` of `quantity`: its spares (the design's
    per-element figure unless overridden for it) plus the scrap share, rounded up."""
    spares = dict(settings.spares_by_element).get(name, settings.spares)
    return spares + math.ceil(quantity * settings.scrap_percent / 100 - 1e-9)


def apply(plan):
    """The plan with weights, costs and the purchase plan added."""
    design = plan.design
    settings: PurchaseSettings = design.purchase or PurchaseSettings()
    kerf = design.shop.kerf_mm
    mass_per_m = plan.stock.mass_per_m_kg
    findings: list[Finding] = []
    lengths: list[float] = []
    labels: list[tuple[str, bool]] = []
    spares = {}
    for e in plan.elements:
        spares[e.name] = spares_for(e.name, e.quantity, settings)
        for n in range(e.quantity + spares[e.name]):
            lengths.append(e.cut_length_mm)
            labels.append((e.name, n >= e.quantity))
    offers = settings.offers
    costs = tuple(piece_cost(o.price, o.per, o.length_mm, mass_per_m) for o in offers)
    pieces: list[StockPiece] = []
    if offers:
        _check_fits(plan, offers, kerf)
        packing = pack(lengths, kerf, [StockOption(o.usable_mm, c)
                                       for o, c in zip(offers, costs)])
        for n, (o, cut_ids) in enumerate(packing.bins, 1):
            offer = offers[o]
            pos = offer.ends_mm
            cuts = []
            for i in cut_ids:
                cuts.append(Cut(labels[i][0], lengths[i], pos, labels[i][1]))
                pos += lengths[i] + kerf
            cut_lengths = [lengths[i] for i in cut_ids]
            used = sum(cut_lengths) + kerf * (len(cut_ids) - 1)
            pieces.append(StockPiece(n, offer.name, offer.length_mm, offer.ends_mm, costs[o],
                                     tuple(cuts), used,
                                     remnant_mm(offer.usable_mm, cut_lengths, kerf)))
        method = packing.method
        if not packing.proven_optimal:
            findings.append(Finding(
                "purchase-not-proven", "info",
                f"the purchase plan costs {_money(settings, packing.cost)} against a lower "
                f"bound of {_money(settings, packing.lower_bound_cost)}; the search could not "
                "prove it the cheapest, so a slightly cheaper mix of stock may exist"))
        lb_pieces, lb_cost, proven = (packing.lower_bound_pieces, packing.lower_bound_cost,
                                      packing.proven_optimal)
    else:
        # no finding: a design need not price its stock; the order says so
        method, lb_pieces, lb_cost, proven = "no stock offered", None, None, None
    buy = []
    for o, (offer, cost) in enumerate(zip(offers, costs)):
        count = sum(1 for p in pieces if p.offer == offer.name)
        if count:
            buy.append(BuyLine(offer.name, offer.length_mm, offer.usable_mm, count, cost,
                               offer.price, offer.per, cost * count,
                               mass_per_m * offer.length_mm * count / 1000, offer.source))
    items = tuple(ItemLine(i.name, i.quantity, i.weight_kg, i.price, i.weight_kg * i.quantity,
                           i.price * i.quantity, i.source) for i in settings.items)
    priced = bool(offers)
    stock_cost = sum(b.cost for b in buy) if priced else None
    stock_length = sum(p.length_mm for p in pieces)
    consumed = {e.name: (e.quantity + spares[e.name]) * (e.cut_length_mm + kerf)
                for e in plan.elements}
    total_consumed = sum(consumed.values())
    elements = []
    for e in plan.elements:
        if stock_cost is not None and total_consumed > 0:
            batch_cost = stock_cost * consumed[e.name] / total_consumed
            cost = batch_cost / e.quantity
        else:
            batch_cost = cost = None
        est = ElementEstimate(e.name, e.quantity, spares[e.name], e.cut_length_mm, e.mass_kg,
                              e.mass_kg * e.quantity, cost, batch_cost, settings.currency)
        elements.append(dataclasses.replace(e, estimate=est))
    order = Order(
        currency=settings.currency, kerf_mm=kerf, pieces=tuple(pieces), buy=tuple(buy),
        items=items, offers=offers, offer_costs=costs, cut_count=len(lengths),
        cut_length_mm=sum(lengths), stock_length_mm=stock_length,
        lower_bound_pieces=lb_pieces, lower_bound_cost=lb_cost, proven_optimal=proven,
        method=method, elements_weight_kg=sum(e.mass_kg * e.quantity for e in plan.elements),
        stock_weight_kg=mass_per_m * stock_length / 1000,
        items_weight_kg=sum(i.weight_kg for i in items),
        stock_cost=stock_cost, items_cost=sum(i.cost for i in items) if items else None)
    return dataclasses.replace(plan, elements=tuple(elements), order=order,
                               findings=plan.findings + tuple(findings))


def _money(settings: PurchaseSettings, amount: float) -> str:
    return settings.currency.format(amount) if settings.currency else f"{amount:.2f}"


def _check_fits(plan, offers, kerf: float) -> None:
    """Bad input: a piece longer than the usable length of every stock offered."""
    longest = max(offers, key=lambda o: o.usable_mm)
    single = isinstance(plan.design.raw.get("element"), dict)
    for n, e in enumerate(plan.elements, 1):
        if e.cut_length_mm > longest.usable_mm + 1e-6:
            raise DesignError(
                f"the cut length of {e.name!r}, {format_mm(e.cut_length_mm)} (trim included), "
                f"is longer than any stock offered: the longest usable length is "
                f"{format_mm(longest.usable_mm)} ({longest.field} {longest.name!r} less its "
                "unusable ends); offer longer stock or make the element shorter",
                field="element" if single else f"element[{n}]", source=plan.design.source)
