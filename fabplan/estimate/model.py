"""What the estimate adds to the Plan: an `ElementEstimate` on each element and
an `Order` on the plan. Lengths in mm, masses in kg, money in the design's
currency (None when the design gives no prices).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from .costing import Currency

__all__ = ["Cut", "StockPiece", "BuyLine", "ItemLine", "ElementEstimate", "Order"]


def _r(x: float | None, places: int = 4) -> float | None:
    if x is None:
        return None
    v = round(float(x), places)
    return 0.0 if v == 0 else v


@dataclass(frozen=True)
class Cut:
    """One piece cut from a stock piece, `start_mm` from the stock's end A."""

    element: str
    length_mm: float
    start_mm: float
    spare: bool


@dataclass(frozen=True)
class StockPiece:
    """One stock piece to buy and the cuts that come from it, longest first."""

    index: int
    offer: str
    length_mm: float
    ends_mm: float  # unusable at each end
    cost: float | None
    cuts: tuple[Cut, ...]
    used_mm: float  # cuts plus kerfs
    remnant_mm: float  # usable length left after the last cut's kerf (0: none)

    @property
    def utilisation(self) -> float:
        return sum(c.length_mm for c in self.cuts) / self.length_mm


@dataclass(frozen=True)
class BuyLine:
    """How many pieces of one offer to buy."""

    offer: str
    length_mm: float
    usable_mm: float
    count: int
    piece_cost: float
    price: float
    per: str
    cost: float
    weight_kg: float
    source: str


@dataclass(frozen=True)
class ItemLine:
    name: str
    quantity: int
    weight_each_kg: float
    price_each: float
    weight_kg: float
    cost: float
    source: str


@dataclass(frozen=True)
class ElementEstimate:
    """Weight and cost of one element and of its batch (quantity, plus spares cut)."""

    name: str
    quantity: int
    spares: int
    cut_length_mm: float
    weight_kg: float  # one element, its cut length of stock
    batch_weight_kg: float  # quantity x weight (spares not included)
    cost: float | None  # one element's share of the stock bought (spares and offcuts shared)
    batch_cost: float | None
    currency: Currency | None

    def extend_json(self, d: dict[str, Any]) -> None:
        d["weight_kg"] = _r(self.weight_kg, 5)
        d["cost"] = _r(self.cost, 2)
        d["estimate"] = {
            "spares": self.spares,
            "pieces_to_cut": self.quantity + self.spares,
            "batch_weight_kg": _r(self.batch_weight_kg, 5),
            "batch_cost": _r(self.batch_cost, 2),
            "currency": None if self.currency is None else self.currency.label,
        }

    def text(self, unit: str, den: int) -> str:
        from .report import element_text

        return element_text(self, unit, den)


@dataclass(frozen=True)
class Order:
    """The purchase plan: stock pieces to buy, the cuts from each, weights and costs."""

    currency: Currency | None
    kerf_mm: float
    pieces: tuple[StockPiece, ...]
    buy: tuple[BuyLine, ...]
    items: tuple[ItemLine, ...]
    offers: tuple[Any, ...]  # config.Offer, as given
    offer_costs: tuple[float, ...]  # cost of one piece of each offer
    cut_count: int
    cut_length_mm: float  # all cuts, spares included
    stock_length_mm: float  # all stock bought
    lower_bound_pieces: int | None  # ceil(sum(l + k) / (U + k)) for the longest stock offered
    lower_bound_cost: float | None
    proven_optimal: bool | None
    method: str
    elements_weight_kg: float  # the elements built (quantities, no spares)
    stock_weight_kg: float
    items_weight_kg: float
    stock_cost: float | None
    items_cost: float | None

    @property
    def pieces_to_buy(self) -> int:
        return len(self.pieces)

    @property
    def utilisation(self) -> float | None:
        """Length of the cuts over the length of stock bought (None: nothing bought)."""
        return self.cut_length_mm / self.stock_length_mm if self.stock_length_mm else None

    @property
    def total_weight_kg(self) -> float:
        """The built elements and the extra items."""
        return self.elements_weight_kg + self.items_weight_kg

    @property
    def shipping_weight_kg(self) -> float:
        """The stock bought and the extra items."""
        return self.stock_weight_kg + self.items_weight_kg

    @property
    def total_cost(self) -> float | None:
        if self.stock_cost is None:  # the stock's cost is unknown
            return None
        return (self.stock_cost or 0.0) + (self.items_cost or 0.0)

    def extend_json(self, out: dict[str, Any]) -> None:
        out["order"] = order_dict(self)

    def text(self, unit: str, den: int) -> str:
        from .report import order_text

        return order_text(self, unit, den)


def order_dict(o: Order) -> dict[str, Any]:
    return {
        "currency": None if o.currency is None else o.currency.label,
        "kerf_mm": _r(o.kerf_mm),
        "offers": [{"name": f.name, "length_mm": _r(f.length_mm), "ends_mm": _r(f.ends_mm),
                    "usable_mm": _r(f.usable_mm), "price": f.price, "per": f.per,
                    "piece_cost": _r(c, 2), "source": f.source}
                   for f, c in zip(o.offers, o.offer_costs)],
        "buy": [{"offer": b.offer, "length_mm": _r(b.length_mm), "count": b.count,
                 "piece_cost": _r(b.piece_cost, 2), "cost": _r(b.cost, 2),
                 "weight_kg": _r(b.weight_kg, 5)} for b in o.buy],
        "pieces_to_buy": o.pieces_to_buy,
        "stock_pieces": [{
            "index": p.index, "offer": p.offer, "length_mm": _r(p.length_mm),
            "ends_mm": _r(p.ends_mm), "cost": _r(p.cost, 2),
            "cuts": [{"element": c.element, "length_mm": _r(c.length_mm),
                      "start_mm": _r(c.start_mm), "spare": c.spare} for c in p.cuts],
            "used_mm": _r(p.used_mm), "remnant_mm": _r(p.remnant_mm),
            "utilisation": _r(p.utilisation),
        } for p in o.pieces],
        "offcuts_mm": [_r(p.remnant_mm) for p in o.pieces if p.remnant_mm > 0],
        "cuts": o.cut_count,
        "cut_length_mm": _r(o.cut_length_mm),
        "stock_length_mm": _r(o.stock_length_mm),
        "utilisation": _r(o.utilisation),
        "lower_bound_pieces": o.lower_bound_pieces,
        "lower_bound_cost": _r(o.lower_bound_cost, 2),
        "proven_optimal": o.proven_optimal,
        "method": o.method,
        "items": [{"name": i.name, "quantity": i.quantity,
                   "weight_each_kg": _r(i.weight_each_kg, 5), "price_each": i.price_each,
                   "weight_kg": _r(i.weight_kg, 5), "cost": _r(i.cost, 2), "source": i.source}
                  for i in o.items],
        "weight_kg": {"elements": _r(o.elements_weight_kg, 5), "stock": _r(o.stock_weight_kg, 5),
                      "items": _r(o.items_weight_kg, 5), "built": _r(o.total_weight_kg, 5),
                      "shipping": _r(o.shipping_weight_kg, 5)},
        "cost": {"stock": _r(o.stock_cost, 2), "items": _r(o.items_cost, 2),
                 "total": _r(o.total_cost, 2)},
        "total_weight_kg": _r(o.total_weight_kg, 5),
        "total_cost": _r(o.total_cost, 2),
    }
