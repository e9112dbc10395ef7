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

from ..design.model import Design, ElementSpec, StockSpec
from ..design.purchase import Offer, PurchaseSettings
from ..errors import DesignError, Finding
from ..lengths.records import PieceCore
from ..lengths.stage import stock_summary
from ..units import format_mm, format_money
from .costing import piece_cost
from .cutting import StockOption, pack, remnant_mm
from .records import BuyLine, Cut, ElementEstimate, ItemLine, Order, StockPiece, UnofferedStock

__all__ = ["Support", "EstimateResult", "estimate", "spares_for", "MAX_CUTS"]

# Cuts in one order (every element's quantity and spares, times its pieces of stock):
# 250 000 is twice the 100 000 parts a large production order holds, and keeps the
# order's records (one per cut) to a few tens of megabytes.
MAX_CUTS = 250_000


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


@dataclass
class _Group:
    """The cuts of one stock and the offers for it."""

    name: str  # "" for the design's [stock]; else its catalogue key or description
    stock: object  # the element stock (StockSpec) or a support's key
    catalogue: str | None
    description: str
    mass_per_m: float
    offers: list[Offer]
    lengths: list[float]
    labels: list[tuple[str, bool]]


@dataclass(frozen=True)
class Support:
    """A part the elements are mounted on, cut from stock of its own (a boom): its name,
    its stock's catalogue key (None when given by its sizes), description and mass per
    metre (kg/m), its length (mm) and how many are built."""

    name: str
    catalogue: str | None
    description: str
    mass_per_m_kg: float
    length_mm: float
    quantity: int


def _stock_name(design: Design, stock: StockSpec) -> str:
    if stock == design.stock:
        return ""
    return stock.catalogue or stock.description


def _groups(design: Design, elements: Sequence[tuple[ElementSpec, Sequence[PieceCore]]],
            offers: Sequence[Offer], spares: dict[str, int],
            supports: Sequence[Support] = ()) -> list[_Group]:
    """The cuts grouped by stock, in the order the stocks first appear (the design's
    [stock] first, the supports' last); each group with the offers for it: an offer
    naming the stock's catalogue key, or (for the design's [stock]) an offer naming
    none."""
    groups: dict[object, _Group] = {}

    def offered(catalogue: str | None, is_design: bool) -> list[Offer]:
        return [o for o in offers if (o.stock is None and is_design)
                or (o.stock is not None and o.stock == catalogue)]

    def group(stock: StockSpec) -> _Group:
        if stock not in groups:
            groups[stock] = _Group(_stock_name(design, stock), stock, stock.catalogue,
                                   stock.description, stock_summary(stock).mass_per_m_kg,
                                   offered(stock.catalogue, stock == design.stock), [], [])
        return groups[stock]

    group(design.stock)
    for spec, pieces_of in elements:
        for n in range(spec.quantity + spares[spec.name]):
            for piece in pieces_of:
                g = group(piece.stock.spec)
                g.lengths.append(piece.cut_length_mm)
                g.labels.append((_cut_name(spec, piece), n >= spec.quantity))
    for sup in supports:
        key = ("support", sup.catalogue or sup.description)
        if key not in groups:
            groups[key] = _Group(sup.catalogue or sup.description, key, sup.catalogue,
                                 sup.description, sup.mass_per_m_kg,
                                 offered(sup.catalogue, False) if sup.catalogue else [], [], [])
        for _ in range(sup.quantity):
            groups[key].lengths.append(sup.length_mm)
            groups[key].labels.append((sup.name, False))
    return [g for g in groups.values() if g.lengths or g.stock == design.stock]


def estimate(design: Design,
             elements: Sequence[tuple[ElementSpec, Sequence[PieceCore]]],
             supports: Sequence[Support] = ()) -> EstimateResult:
    """Weights, costs and the purchase plan for `elements`: each element's spec
    with the pieces of stock it is made of, and the `supports` they mount on (a
    boom). Each stock's cuts are packed into the offers for that stock
    (`[[purchase.offer]] stock = "..."`); the cuts of a stock no offer is for are
    listed as not offered."""
    settings: PurchaseSettings = design.purchase or PurchaseSettings()
    kerf = design.shop.kerf_mm
    findings: list[Finding] = []
    spares = {spec.name: spares_for(spec.name, spec.quantity, settings)
              for spec, _ in elements}
    _check_cut_count(design, elements, spares)
    offers = settings.offers
    groups = _groups(design, elements, offers, spares, supports)
    cost_of = {o.name: piece_cost(o.price, o.per, o.length_mm, g.mass_per_m)
               for g in groups for o in g.offers}
    costs = tuple(cost_of.get(o.name, piece_cost(o.price, o.per, o.length_mm,
                                                  stock_summary(design.stock).mass_per_m_kg))
                  for o in offers)
    pieces: list[StockPiece] = []
    buy: list[BuyLine] = []
    unoffered: list[UnofferedStock] = []
    methods: list[str] = []
    lb_pieces: int | None = None
    lb_cost: float | None = None
    proven: bool | None = None
    group_cost: dict[str, float] = {}
    stock_length = 0.0
    stock_weight = 0.0
    if offers:
        _check_fits(design, elements, groups)
    for g in groups:
        if not g.offers:
            if offers and g.lengths:
                unoffered.append(UnofferedStock(g.name or g.description, len(g.lengths),
                                                sum(g.lengths)))
                findings.append(Finding(
                    "no-stock-offered", "info",
                    f"no [[purchase.offer]] is for {g.name or g.description}: its "
                    f"{len(g.lengths)} cut(s) are not in the purchase plan or its cost; add an "
                    f"offer with stock = \"{g.catalogue or 'its catalogue key'}\""))
            continue
        g_costs = [cost_of[o.name] for o in g.offers]
        packing = pack(g.lengths, kerf, [StockOption(o.usable_mm, c)
                                         for o, c in zip(g.offers, g_costs)])
        mine: list[StockPiece] = []
        for o, cut_ids in packing.bins:
            offer = g.offers[o]
            pos = offer.ends_mm
            cuts = []
            for i in cut_ids:
                cuts.append(Cut(g.labels[i][0], g.lengths[i], pos, g.labels[i][1]))
                pos += g.lengths[i] + kerf
            cut_lengths = [g.lengths[i] for i in cut_ids]
            used = sum(cut_lengths) + kerf * (len(cut_ids) - 1)
            mine.append(StockPiece(len(pieces) + len(mine) + 1, offer.name, offer.length_mm,
                                   offer.ends_mm, g_costs[o], tuple(cuts), used,
                                   remnant_mm(offer.usable_mm, cut_lengths, kerf), g.name))
        pieces += mine
        if packing.method not in methods:
            methods.append(packing.method)
        if not packing.proven_optimal:
            findings.append(Finding(
                "purchase-not-proven", "info",
                f"the purchase plan{' of ' + g.name if g.name else ''} costs "
                f"{format_money(packing.cost, settings.currency)} against "
                f"a lower bound of {format_money(packing.lower_bound_cost, settings.currency)}; "
                "the search could not "
                "prove it the cheapest, so a slightly cheaper mix of stock may exist"))
        lb_pieces = (lb_pieces or 0) + packing.lower_bound_pieces
        lb_cost = (lb_cost or 0.0) + packing.lower_bound_cost
        proven = (proven is not False) and packing.proven_optimal
        for offer, each in zip(g.offers, g_costs):
            count = sum(1 for p in mine if p.offer == offer.name)
            if count:
                buy.append(BuyLine(offer.name, offer.length_mm, offer.usable_mm, count, each,
                                   offer.price, offer.per, each * count,
                                   g.mass_per_m * offer.length_mm * count / 1000, offer.source,
                                   g.name))
        group_cost[g.name] = sum(p.cost or 0.0 for p in mine)
        length = sum(p.length_mm for p in mine)
        stock_length += length
        stock_weight += g.mass_per_m * length / 1000
    # no finding when nothing is offered: a design need not price its stock; the order says so
    method = "; ".join(methods) if methods else "no stock offered"
    items = tuple(ItemLine(i.name, i.quantity, i.weight_kg, i.price, i.weight_kg * i.quantity,
                           i.price * i.quantity, i.source) for i in settings.items)
    stock_cost = sum(b.cost for b in buy) if offers else None
    # each element's share of each stock's cost, by the length of that stock it consumes
    consumed: dict[tuple[str, str], float] = {}
    for spec, pieces_of in elements:
        for piece in pieces_of:
            key = (spec.name, _stock_name(design, piece.stock.spec))
            consumed[key] = consumed.get(key, 0.0) + (
                (spec.quantity + spares[spec.name]) * (piece.cut_length_mm + kerf))
    by_stock: dict[str, float] = {}
    for (_, name), v in consumed.items():
        by_stock[name] = by_stock.get(name, 0.0) + v
    estimates = []
    built_kg = 0.0
    for spec, pieces_of in elements:
        batch_cost: float | None = None
        cost: float | None = None
        if stock_cost is not None:
            batch_cost = sum(group_cost.get(name, 0.0) * v / by_stock[name]
                             for (el, name), v in consumed.items()
                             if el == spec.name and by_stock[name] > 0)
            cost = batch_cost / spec.quantity
        mass = sum(p.mass_kg for p in pieces_of)
        built_kg += mass * spec.quantity
        estimates.append(ElementEstimate(spec.name, spec.quantity, spares[spec.name],
                                         sum(p.cut_length_mm for p in pieces_of), mass,
                                         mass * spec.quantity, cost, batch_cost,
                                         settings.currency))
    all_lengths = [x for g in groups for x in g.lengths]
    order = Order(
        currency=settings.currency, kerf_mm=kerf, pieces=tuple(pieces), buy=tuple(buy),
        items=items, offers=offers, offer_costs=costs, cut_count=len(all_lengths),
        cut_length_mm=sum(all_lengths), stock_length_mm=stock_length,
        lower_bound_pieces=lb_pieces, lower_bound_cost=lb_cost, proven_optimal=proven,
        method=method, elements_weight_kg=built_kg,
        supports_weight_kg=sum(x.mass_per_m_kg * x.length_mm / 1000 * x.quantity
                               for x in supports),
        stock_weight_kg=stock_weight,
        items_weight_kg=sum(i.weight_kg for i in items),
        stock_cost=stock_cost, items_cost=sum(i.cost for i in items) if items else None,
        unoffered=tuple(unoffered))
    return EstimateResult(tuple(estimates), order, tuple(findings))


def _element_field(design: Design, index: int) -> str:
    """How the design file names its element number `index` (from 1)."""
    return "element" if isinstance(design.raw.get("element"), dict) else f"element[{index}]"


def _check_cut_count(design: Design,
                     elements: Sequence[tuple[ElementSpec, Sequence[PieceCore]]],
                     spares: dict[str, int]) -> None:
    """Bad input: more than MAX_CUTS cuts in the order (checked before any list of
    cuts is made)."""
    counts = [(spec.quantity + spares[spec.name]) * len(pieces_of)
              for spec, pieces_of in elements]
    total = sum(counts)
    if total > MAX_CUTS:
        most = max(range(len(counts)), key=lambda i: counts[i])
        raise DesignError(
            f"the order comes to {total:,} cuts (quantities and spares times pieces of stock); "
            f"fabplan plans at most {MAX_CUTS:,} cuts in one order: lower the quantities or "
            "the spares, or plan the order in parts",
            field=f"{_element_field(design, most + 1)}.quantity",
            value=elements[most][0].quantity, source=design.source)


def _check_fits(design: Design, elements: Sequence[tuple[ElementSpec, Sequence[PieceCore]]],
                groups: Sequence[_Group]) -> None:
    """Bad input: a piece longer than the usable length of every offer for its stock."""
    longest_of = {g.stock: max(g.offers, key=lambda o: o.usable_mm) for g in groups if g.offers}
    for n, (spec, pieces_of) in enumerate(elements, 1):
        for piece in pieces_of:
            longest = longest_of.get(piece.stock.spec)
            if longest is None:
                continue
            if piece.cut_length_mm > longest.usable_mm + 1e-6:
                raise DesignError(
                    f"the cut length of {_cut_name(spec, piece)!r}, "
                    f"{format_mm(piece.cut_length_mm)} (trim included), is longer than any "
                    f"stock offered: the longest usable length is "
                    f"{format_mm(longest.usable_mm)} ({longest.field} {longest.name!r} less its "
                    "unusable ends); offer longer stock or make the element shorter",
                    field=_element_field(design, n), source=design.source)
    for g in groups:
        if not isinstance(g.stock, tuple) or not g.offers:
            continue  # elements' stock above; a support no offer is for is not bought
        longest = max(g.offers, key=lambda o: o.usable_mm)
        for length, (name, _) in zip(g.lengths, g.labels):
            if length > longest.usable_mm + 1e-6:
                raise DesignError(
                    f"the {name}, {format_mm(length)} long, is longer than any stock offered "
                    f"for it: the longest usable length is {format_mm(longest.usable_mm)} "
                    f"({longest.field} {longest.name!r} less its unusable ends); offer longer "
                    "stock", field=f"{name}.length", source=design.source)
