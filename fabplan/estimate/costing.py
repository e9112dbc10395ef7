"""The cost of one stock piece from its offer's price and price unit.

Money is a plain float in the design's currency. Lengths in mm, masses in kg.
"""

from __future__ import annotations

from ..design.purchase import PriceUnit
from ..units import FT, IN, LB_KG, M

__all__ = ["piece_cost"]

_LENGTH_PER = {"m": M, "ft": FT, "in": IN}
_MASS_PER = {"kg": 1.0, "lb": LB_KG}


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
