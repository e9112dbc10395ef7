"""Prices and money: currencies, price units, the cost of one stock piece.

Money is a plain float in the design's currency; amounts are shown to two
decimals. Lengths in mm, masses in kg.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Literal

from ..errors import DesignError
from ..units import FT, IN, M

__all__ = ["Currency", "parse_currency", "PriceUnit", "PRICE_UNITS", "piece_cost",
           "parse_mass", "LB_KG", "OZ_KG"]

# source: NIST SP 811, appendix B (exact definitions of the avoirdupois pound and ounce)
LB_KG = 0.45359237
OZ_KG = LB_KG / 16

PriceUnit = Literal["piece", "m", "ft", "in", "kg", "lb"]
PRICE_UNITS: tuple[PriceUnit, ...] = ("piece", "m", "ft", "in", "kg", "lb")
_LENGTH_PER = {"m": M, "ft": FT, "in": IN}
_MASS_PER = {"kg": 1.0, "lb": LB_KG}

# currency symbols accepted in place of an ISO 4217 code (written before the amount)
SYMBOLS = ("$", "€", "£", "¥", "₹", "₩", "₽", "₺", "₪", "₱", "₫", "₴", "₦", "฿", "R$", "A$",
           "C$", "NZ$", "HK$", "S$", "kr", "zł", "Kč", "Fr", "CHF")
_CODE = re.compile(r"[A-Z]{3}")


@dataclass(frozen=True)
class Currency:
    """An ISO 4217 code ("USD", shown "USD 12.50") or a symbol ("$", shown "$12.50")."""

    label: str
    is_code: bool

    def format(self, amount: float) -> str:
        """Two decimals with the code or symbol: "USD 1,234.50", "$1,234.50"."""
        sign = "-" if amount < 0 else ""
        text = f"{abs(round(amount, 2)):,.2f}"
        if self.is_code:
            return f"{sign}{self.label} {text}"
        return f"{sign}{self.label}{text}"


def parse_currency(value: object, field: str) -> Currency:
    """A currency: a three-letter ISO 4217 code such as "USD", "EUR", "GBP", or a symbol."""
    if isinstance(value, str):
        text = value.strip()
        if _CODE.fullmatch(text):
            return Currency(text, True)
        if text in SYMBOLS:
            return Currency(text, False)
        if _CODE.fullmatch(text.upper()):
            raise DesignError(f"write the currency code in capitals, e.g. {text.upper()!r}",
                              field=field, value=value)
    raise DesignError('unknown currency format: give a three-letter code such as "USD", "EUR" '
                      f'or "GBP", or one of the symbols {" ".join(SYMBOLS)}', field=field,
                      value=value)


def piece_cost(price: float, per: PriceUnit, length_mm: float, mass_per_m_kg: float) -> float:
    """The cost of one stock piece `length_mm` long (mm) at `price` per `per`
    (a piece, a metre/foot/inch of length, or a kilogram/pound of the stock,
    whose mass per metre is `mass_per_m_kg`, kg/m)."""
    if per == "piece":
        return price
    if per in _LENGTH_PER:
        return price * length_mm / _LENGTH_PER[per]
    kg = mass_per_m_kg * length_mm / 1000
    return price * kg / _MASS_PER[per]


_MASS_UNITS = {"kg": 1.0, "g": 1e-3, "lb": LB_KG, "lbs": LB_KG, "oz": OZ_KG}
_MASS = re.compile(r"\s*(?P<num>(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(?P<unit>[a-zA-Z]+)\s*")


def parse_mass(value: object, field: str) -> float:
    """A mass with its unit ("45 g", "0.2 kg", "1.5 oz", "2 lb") in kilograms; zero allowed."""
    if isinstance(value, str):
        m = _MASS.fullmatch(value)
        if m:
            unit = m.group("unit").lower()
            if unit not in _MASS_UNITS:
                raise DesignError(f"unknown mass unit {m.group('unit')!r}: use g, kg, oz or lb",
                                  field=field, value=value)
            kg = float(m.group("num")) * _MASS_UNITS[unit]
            if math.isfinite(kg):
                return kg
    raise DesignError('expected a mass with its unit, e.g. "45 g", "0.2 kg", "1.5 oz" or '
                      '"2 lb"', field=field, value=value)
