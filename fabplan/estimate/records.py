"""What the estimate adds to the Plan: an `ElementEstimate` on each element and
an `Order` on the plan. Lengths in mm, masses in kg, money in the design's
currency (None when the design gives no prices).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..design.purchase import Offer
from ..units import Currency

__all__ = ["Cut", "StockPiece", "BuyLine", "ItemLine", "ElementEstimate", "Order",
           "UnofferedStock", "PieceGroup"]



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
    stock: str = ""  # which stock (catalogue key or description; "" the design's [stock])

    @property
    def utilisation(self) -> float:
        return sum(c.length_mm for c in self.cuts) / self.length_mm


@dataclass(frozen=True)
class PieceGroup:
    """Stock pieces cut alike (the same offer, the same cuts at the same places):
    `pieces` in the order they are numbered, the first standing for them all."""

    pieces: tuple[StockPiece, ...]

    @property
    def count(self) -> int:
        return len(self.pieces)

    @property
    def first(self) -> StockPiece:
        return self.pieces[0]


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
    stock: str = ""  # which stock (catalogue key or description; "" the design's [stock])


@dataclass(frozen=True)
class UnofferedStock:
    """Cuts of a stock no offer is for: the stock, how many cuts, their total length (mm)."""

    stock: str
    cuts: int
    length_mm: float


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



@dataclass(frozen=True)
class Order:
    """The purchase plan: stock pieces to buy, the cuts from each, weights and costs."""

    currency: Currency | None
    kerf_mm: float
    pieces: tuple[StockPiece, ...]
    buy: tuple[BuyLine, ...]
    items: tuple[ItemLine, ...]
    offers: tuple[Offer, ...]  # as given
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
    unoffered: tuple[UnofferedStock, ...] = ()  # stocks with cuts and no offer for them
    supports_weight_kg: float = 0.0  # what the elements mount on (a boom), as built

    @property
    def pieces_to_buy(self) -> int:
        return len(self.pieces)

    def piece_groups(self) -> tuple[PieceGroup, ...]:
        """The stock pieces, those cut alike gathered in one group (in the order of
        each group's first piece): a cutting plan of 4 500 identical coils reads as
        one line with its count."""
        groups: dict[tuple[object, ...], list[StockPiece]] = {}
        for piece in self.pieces:
            key = (piece.offer, tuple((c.element, round(c.length_mm, 6), round(c.start_mm, 6),
                                       c.spare) for c in piece.cuts))
            groups.setdefault(key, []).append(piece)
        return tuple(PieceGroup(tuple(g)) for g in groups.values())

    @property
    def utilisation(self) -> float | None:
        """Length of the cuts over the length of stock bought (None: nothing bought)."""
        return self.cut_length_mm / self.stock_length_mm if self.stock_length_mm else None

    @property
    def total_weight_kg(self) -> float:
        """The built elements, what they mount on (a boom) and the extra items."""
        return self.elements_weight_kg + self.supports_weight_kg + self.items_weight_kg

    @property
    def shipping_weight_kg(self) -> float:
        """The stock bought and the extra items."""
        return self.stock_weight_kg + self.items_weight_kg

    @property
    def total_cost(self) -> float | None:
        if self.stock_cost is None:  # the stock's cost is unknown
            return None
        return (self.stock_cost or 0.0) + (self.items_cost or 0.0)
