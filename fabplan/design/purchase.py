"""The design's `[purchase]` table -> `PurchaseSettings`.

    [purchase]
    currency = "USD"          # ISO 4217 code or a symbol such as "$"
    ends = "5 mm"             # unusable length at each end of a stock piece (default 0)
    spares = 1                # spare pieces cut per element, beyond its quantity
    scrap_percent = 5         # and/or this share of each element's quantity, rounded up

    [purchase.spares_by_element]
    "driven element" = 2      # spare pieces for this element instead of `spares`

    [[purchase.offer]]        # one per stock length or source; the cheapest mix is bought
    name = "10 ft straight"
    stock = "al-1/2x0.058"    # the stock it is for: a catalogue key, the boom's too
                              # (default: [stock])
    length = "10 ft"
    price = 18.40
    per = "piece"             # or "m", "ft", "in" (per length) or "kg", "lb" (per weight)
    ends = "1/4 in"           # overrides [purchase].ends for this offer
    source = "supplier, date" # free text shown with the offer

    [[purchase.item]]         # extra parts bought with the stock
    name = "balun"
    quantity = 7
    weight = "40 g"           # each; g, kg, oz or lb
    price = 6.50              # each

Every key is checked; errors name the field.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Literal, TypeVar

from ..errors import DesignError, did_you_mean
from ..section import Section
from ..stock.catalogue import get_stock_item
from ..units import Currency, parse_currency, parse_mass
from .boom import SQUARE_CATALOGUE

__all__ = ["Offer", "LineItem", "PurchaseSettings", "read_purchase", "PriceUnit", "PRICE_UNITS"]

T = TypeVar("T")
PriceUnit = Literal["piece", "m", "ft", "in", "kg", "lb"]
PRICE_UNITS: tuple[PriceUnit, ...] = ("piece", "m", "ft", "in", "kg", "lb")


@dataclass(frozen=True)
class Offer:
    """Stock offered for sale: pieces `length_mm` long (mm) at `price` per `per`,
    with `ends_mm` (mm) unusable at each end."""

    name: str
    length_mm: float
    price: float
    per: PriceUnit
    ends_mm: float
    source: str
    field: str  # where it is in the design, e.g. "purchase.offer[2]"
    stock: str | None = None  # the catalogue key it is for; None: the design's [stock]

    @property
    def usable_mm(self) -> float:
        """Length that may be cut into pieces (mm)."""
        return self.length_mm - 2 * self.ends_mm


@dataclass(frozen=True)
class LineItem:
    """An extra part: `quantity` of them, each `weight_kg` (kg) and `price`."""

    name: str
    quantity: int
    weight_kg: float
    price: float
    source: str


@dataclass(frozen=True)
class PurchaseSettings:
    """What the design says about buying: currency, offers, extra items, spares."""

    currency: Currency | None = None
    offers: tuple[Offer, ...] = ()
    items: tuple[LineItem, ...] = ()
    spares: int = 0  # per element
    scrap_percent: float = 0.0  # of each element's quantity, rounded up to whole pieces
    given: bool = False  # the design has a [purchase] table
    spares_by_element: tuple[tuple[str, int], ...] = ()  # overrides `spares` for these


# bounds (see fabplan.design.model for the others)
MAX_OFFERS = 50  # stock offers (of every stock) compared by the purchase plan
MAX_ITEMS = 1000  # extra parts bought with the stock
MAX_SPARES = 10_000  # spare pieces of one element
MAX_ITEM_QUANTITY = 1_000_000  # of one extra part
MAX_PRICE = 1e9  # one price, in the design's currency
MAX_STOCK_LENGTH_MM = 1_000_000.0  # one stock piece or spool on offer: 1 km
STOCK_BOUND = "the longest spool of wire on sale is well under 1 km"


def read_purchase(top: Section, element_names: list[str] | None) -> PurchaseSettings:
    """Read `[purchase]` from the design's top-level section (defaults when absent).
    `element_names` are the design's elements (None when they could not be read:
    the names in `spares_by_element` are then not checked)."""
    sec = top.table("purchase", None)
    if sec is None:
        return PurchaseSettings()
    has_prices = sec.has("offer") or sec.has("item")
    currency = None
    if sec.has("currency") or has_prices:
        currency = parse_currency(sec.raw("currency"), sec.field("currency"))
    ends = sec.length("ends", 0.0, allow_zero=True, max_mm=MAX_STOCK_LENGTH_MM, bound=STOCK_BOUND)
    spares = sec.integer("spares", 0, low=0, high=MAX_SPARES)
    scrap = sec.number("scrap_percent", 0.0, low=0.0, high=100.0, high_open=True)
    offers = tuple(_each(sec, lambda s: _read_offer(s, ends),
                         sec.tables("offer", max_count=MAX_OFFERS)))
    names = [o.name for o in offers]
    for i, name in enumerate(names):
        if name in names[:i]:
            raise DesignError("two offers have the same name", field=f"{offers[i].field}.name",
                              value=name)
    items = tuple(_each(sec, _read_item, sec.tables("item", max_count=MAX_ITEMS)))
    by_element = _read_spares_by_element(sec.table("spares_by_element", None), element_names)
    sec.finish()
    return PurchaseSettings(currency, offers, items, spares, scrap, True, by_element)


def _each(sec: Section, read: Callable[[Section], T], tables: list[Section]) -> list[T]:
    """`read` of each table; with a collector, each on its own (the ones that
    failed are left out: their errors are recorded)."""
    if sec.collector is None:
        return [read(t) for t in tables]
    out = [sec.collector.attempt(read, t) for t in tables]
    return [x for x in out if x is not None]


def _read_spares_by_element(sec: Section | None,
                            names: list[str] | None) -> tuple[tuple[str, int], ...]:
    """`[purchase.spares_by_element]`: element name = spare pieces, for those elements."""
    if sec is None:
        return ()
    out = []
    for key in sec.keys():
        if names is not None and key not in names:
            hint = did_you_mean(key, names, 0.5)
            raise DesignError(f"{hint}no element has this name (elements: {', '.join(names)})",
                              field=sec.field(key))
        out.append((key, sec.integer(key, low=0, high=MAX_SPARES)))
    sec.finish()
    return tuple(out)


def _price(sec: Section) -> float:
    price = sec.raw("price")
    if isinstance(price, bool) or not isinstance(price, (int, float)):
        raise DesignError("expected a number (the amount in the [purchase] currency)",
                          field=sec.field("price"), value=price)
    if not price > 0 or price == float("inf"):
        raise DesignError("must be a positive amount", field=sec.field("price"), value=price)
    if price > MAX_PRICE:
        raise DesignError(f"must be at most {MAX_PRICE:,.0f}", field=sec.field("price"),
                          value=price)
    return float(price)


def _read_offer(sec: Section, default_ends: float) -> Offer:
    length = sec.length("length", max_mm=MAX_STOCK_LENGTH_MM, bound=STOCK_BOUND)
    name = sec.name("name", f"{sec.raw('length')} piece")
    price = _price(sec)
    per = sec.string("per", "piece", choices=PRICE_UNITS)
    ends = sec.length("ends", default_ends, allow_zero=True, max_mm=MAX_STOCK_LENGTH_MM,
                      bound=STOCK_BOUND)
    source = sec.string("source", "")
    stock = sec.string("stock", None)
    if stock is not None and stock not in SQUARE_CATALOGUE:  # a square boom tube's key is
        get_stock_item(stock, sec.field("stock"))  # its own; any other, the stock catalogue
    sec.finish()
    if 2 * ends >= length:
        where = sec.field("ends") if sec.has("ends") else "purchase.ends"
        raise DesignError(f"the unusable ends take the whole {sec.raw('length')} stock length",
                          field=where, value=ends)
    return Offer(name, length, price, per, ends, source, sec.path, stock)


def _read_item(sec: Section) -> LineItem:
    name = sec.name("name")
    quantity = sec.integer("quantity", 1, low=1, high=MAX_ITEM_QUANTITY)
    weight = parse_mass(sec.raw("weight"), sec.field("weight"))
    price = _price(sec)
    source = sec.string("source", "")
    sec.finish()
    return LineItem(name, quantity, weight, price, source)
