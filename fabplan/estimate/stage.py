"""The estimate stage: weight, cost and the purchase plan.

Each element is cut `quantity + spares` times (spares = the design's spare
pieces per element plus its scrap share of the quantity, rounded up), each
time every piece of stock it is made of; the cuts are packed into the
cheapest stock found by `cutting.pack`. The stock's cost is shared among the
elements by the length each consumes (its cuts and their kerfs). Weights come
from the stock's mass per metre.

Pure: no files, no printing. mm, kg, the design's currency.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from ..design.model import Design, ElementSpec
from ..design.purchase import Offer, PurchaseSettings
from ..errors import DesignError, Finding
from ..lengths.records import PieceCore
from ..lengths.stage import stock_summary
from ..units import format_mm, format_money
from .costing import piece_cost
from .cutting import StockOption, pack, remnant_mm
from .records import BuyLine, Cut, ElementEstimate, ItemLine, Order, StockPiece

__all__ = ["EstimateResult", "estimate", "spares_for"]


@dataclass(frozen=True)
class EstimateResult:
    """Each element's weight and cost (in the design's order) and the purchase plan."""

    elements: tuple[ElementEstimate, ...]
    order: Order
    findings: tuple[Finding, ...]


def spares_for(name: str, quantity: int, settings: PurchaseSettings) -> int:
    """Extra pieces cut for element `name` of `quantity`: its spares (the design's
    per-element figure unless overridden for it) plus the scrap share, rounded up."""
    spares = dict(settings.spares_by_element).get(name, settings.spares)
    return spares + math.ceil(quantity * settings.scrap_percent / 100 - 1e-9)


def _cut_name(spec: ElementSpec, piece: PieceCore) -> str:
    return spec.name if not piece.label else f"{spec.name}, {piece.label}"


def estimate(design: Design,
             elements: Sequence[tuple[ElementSpec, Sequence[PieceCore]]]) -> EstimateResult:
    """Weights, costs and the purchase plan for `elements`: each element's spec
    with the pieces of stock it is made of."""
    settings: PurchaseSettings = design.purchase or PurchaseSettings()
    kerf = design.shop.kerf_mm
    mass_per_m = stock_summary(design.stock).mass_per_m_kg
    findings: list[Finding] = []
    lengths: list[float] = []
    labels: list[tuple[str, bool]] = []
    spares = {}
    for spec, pieces_of in elements:
        spares[spec.name] = spares_for(spec.name, spec.quantity, settings)
        for n in range(spec.quantity + spares[spec.name]):
            for piece in pieces_of:
                lengths.append(piece.cut_length_mm)
                labels.append((_cut_name(spec, piece), n >= spec.quantity))
    offers = settings.offers
    costs = tuple(piece_cost(o.price, o.per, o.length_mm, mass_per_m) for o in offers)
    pieces: list[StockPiece] = []
    if offers:
        _check_fits(design, elements, offers)
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
                f"the purchase plan costs {format_money(packing.cost, settings.currency)} against "
                f"a lower bound of {format_money(packing.lower_bound_cost, settings.currency)}; "
                "the search could not "
                "prove it the cheapest, so a slightly cheaper mix of stock may exist"))
        lb_pieces, lb_cost, proven = (packing.lower_bound_pieces, packing.lower_bound_cost,
                                      packing.proven_optimal)
    else:
        # no finding: a design need not price its stock; the order says so
        method, lb_pieces, lb_cost, proven = "no stock offered", None, None, None
    buy = []
    for offer, each in zip(offers, costs):
        count = sum(1 for p in pieces if p.offer == offer.name)
        if count:
            buy.append(BuyLine(offer.name, offer.length_mm, offer.usable_mm, count, each,
                               offer.price, offer.per, each * count,
                               mass_per_m * offer.length_mm * count / 1000, offer.source))
    items = tuple(ItemLine(i.name, i.quantity, i.weight_kg, i.price, i.weight_kg * i.quantity,
                           i.price * i.quantity, i.source) for i in settings.items)
    priced = bool(offers)
    stock_cost = sum(b.cost for b in buy) if priced else None
    stock_length = sum(p.length_mm for p in pieces)
    consumed = {spec.name: (spec.quantity + spares[spec.name])
                * sum(p.cut_length_mm + kerf for p in pieces_of)
                for spec, pieces_of in elements}
    total_consumed = sum(consumed.values())
    estimates = []
    built_kg = 0.0
    for spec, pieces_of in elements:
        batch_cost: float | None = None
        cost: float | None = None
        if stock_cost is not None and total_consumed > 0:
            batch_cost = stock_cost * consumed[spec.name] / total_consumed
            cost = batch_cost / spec.quantity
        mass = sum(p.mass_kg for p in pieces_of)
        built_kg += mass * spec.quantity
        estimates.append(ElementEstimate(spec.name, spec.quantity, spares[spec.name],
                                         sum(p.cut_length_mm for p in pieces_of), mass,
                                         mass * spec.quantity, cost, batch_cost,
                                         settings.currency))
    order = Order(
        currency=settings.currency, kerf_mm=kerf, pieces=tuple(pieces), buy=tuple(buy),
        items=items, offers=offers, offer_costs=costs, cut_count=len(lengths),
        cut_length_mm=sum(lengths), stock_length_mm=stock_length,
        lower_bound_pieces=lb_pieces, lower_bound_cost=lb_cost, proven_optimal=proven,
        method=method, elements_weight_kg=built_kg,
        stock_weight_kg=mass_per_m * stock_length / 1000,
        items_weight_kg=sum(i.weight_kg for i in items),
        stock_cost=stock_cost, items_cost=sum(i.cost for i in items) if items else None)
    return EstimateResult(tuple(estimates), order, tuple(findings))


def _check_fits(design: Design, elements: Sequence[tuple[ElementSpec, Sequence[PieceCore]]],
                offers: Sequence[Offer]) -> None:
    """Bad input: a piece longer than the usable length of every stock offered."""
    longest = max(offers, key=lambda o: o.usable_mm)
    single = isinstance(design.raw.get("element"), dict)
    for n, (spec, pieces_of) in enumerate(elements, 1):
        for piece in pieces_of:
            if piece.cut_length_mm > longest.usable_mm + 1e-6:
                raise DesignError(
                    f"the cut length of {_cut_name(spec, piece)!r}, "
                    f"{format_mm(piece.cut_length_mm)} (trim included), is longer than any "
                    f"stock offered: the longest usable length is "
                    f"{format_mm(longest.usable_mm)} ({longest.field} {longest.name!r} less its "
                    "unusable ends); offer longer stock or make the element shorter",
                    field="element" if single else f"element[{n}]", source=design.source)
