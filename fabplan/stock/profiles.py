"""Cross-sections of conductor stock: solid round, round tube, rectangular strip.

All lengths in millimetres; area mm^2, second moment mm^4, plastic section
modulus mm^3, mass per metre kg/m. Bending is about the axis that lies in the
bend plane's normal direction: for strip, the stock is bent flat (about its
thickness), so the thickness is the depth of the section.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from ..errors import DesignError
from ..units import IN

__all__ = ["Round", "Tube", "Strip", "Profile", "awg_diameter_mm", "swg_diameter_mm",
           "parse_gauge", "SWG_INCHES"]


@dataclass(frozen=True)
class Round:
    """Solid round wire or rod of diameter `diameter_mm`."""

    diameter_mm: float
    kind: Literal["round"] = "round"

    @property
    def depth_mm(self) -> float:
        """Depth of the section in the bend plane (the 'thickness' T)."""
        return self.diameter_mm

    @property
    def outer_diameter_mm(self) -> float:
        return self.diameter_mm

    @property
    def area_mm2(self) -> float:
        return math.pi * self.diameter_mm ** 2 / 4

    @property
    def second_moment_mm4(self) -> float:
        return math.pi * self.diameter_mm ** 4 / 64

    @property
    def plastic_modulus_mm3(self) -> float:
        return self.diameter_mm ** 3 / 6

    @property
    def equivalent_radius_mm(self) -> float:
        """Radius of the round wire that behaves alike electrically."""
        return self.diameter_mm / 2

    def mass_per_m_kg(self, density_kg_m3: float) -> float:
        return density_kg_m3 * self.area_mm2 * 1e-6

    def describe(self) -> str:
        return f"solid round {self.diameter_mm:.3f} mm ({self.diameter_mm / IN:.4f} in)"


@dataclass(frozen=True)
class Tube:
    """Round tube of outside diameter `od_mm` and wall `wall_mm`."""

    od_mm: float
    wall_mm: float
    kind: Literal["tube"] = "tube"

    @property
    def depth_mm(self) -> float:
        return self.od_mm

    @property
    def outer_diameter_mm(self) -> float:
        return self.od_mm

    @property
    def id_mm(self) -> float:
        return self.od_mm - 2 * self.wall_mm

    @property
    def area_mm2(self) -> float:
        return math.pi * (self.od_mm - self.wall_mm) * self.wall_mm

    @property
    def second_moment_mm4(self) -> float:
        return math.pi * (self.od_mm ** 4 - self.id_mm ** 4) / 64

    @property
    def plastic_modulus_mm3(self) -> float:
        return (self.od_mm ** 3 - self.id_mm ** 3) / 6

    @property
    def equivalent_radius_mm(self) -> float:
        return self.od_mm / 2

    def mass_per_m_kg(self, density_kg_m3: float) -> float:
        return density_kg_m3 * self.area_mm2 * 1e-6

    def describe(self) -> str:
        return (f"tube {self.od_mm:.3f} x {self.wall_mm:.3f} mm "
                f"({self.od_mm / IN:.3f} x {self.wall_mm / IN:.3f} in)")


@dataclass(frozen=True)
class Strip:
    """Rectangular strip `width_mm` wide and `thickness_mm` thick, bent flat."""

    width_mm: float
    thickness_mm: float
    kind: Literal["strip"] = "strip"

    @property
    def depth_mm(self) -> float:
        return self.thickness_mm

    @property
    def outer_diameter_mm(self) -> float:
        """The largest extent across the section (for clearances)."""
        return max(self.width_mm, self.thickness_mm)

    @property
    def area_mm2(self) -> float:
        return self.width_mm * self.thickness_mm

    @property
    def second_moment_mm4(self) -> float:
        return self.width_mm * self.thickness_mm ** 3 / 12

    @property
    def plastic_modulus_mm3(self) -> float:
        return self.width_mm * self.thickness_mm ** 2 / 4

    @property
    def equivalent_radius_mm(self) -> float:
        # a thin flat strip acts as a round wire of a quarter its width
        # (source: Balanis, Antenna Theory, equivalent radius of conductors)
        return max(self.width_mm, self.thickness_mm) / 4

    def mass_per_m_kg(self, density_kg_m3: float) -> float:
        return density_kg_m3 * self.area_mm2 * 1e-6

    def describe(self) -> str:
        return f"strip {self.width_mm:.2f} x {self.thickness_mm:.2f} mm"


Profile = Round | Tube | Strip


def awg_diameter_mm(gauge: int) -> float:
    """Diameter of an AWG size (0000 as -3 ... 0 as 0, then 1..56), in mm.

    ASTM B258: d = 0.005 in x 92^((36 - n)/39), rounded to 0.0001 in for
    0.010 in and larger and to 0.00001 in below.
    """
    d_in = 0.005 * 92 ** ((36 - gauge) / 39)
    d_in = round(d_in, 4) if d_in >= 0.010 else round(d_in, 5)
    return float(d_in * IN)


# BS 3737 standard wire gauge, inches [M]
SWG_INCHES: dict[int, float] = {
    -6: 0.500, -5: 0.464, -4: 0.432, -3: 0.400, -2: 0.372, -1: 0.348, 0: 0.324,
    1: 0.300, 2: 0.276, 3: 0.252, 4: 0.232, 5: 0.212, 6: 0.192, 7: 0.176, 8: 0.160,
    9: 0.144, 10: 0.128, 11: 0.116, 12: 0.104, 13: 0.092, 14: 0.080, 15: 0.072,
    16: 0.064, 17: 0.056, 18: 0.048, 19: 0.040, 20: 0.036, 21: 0.032, 22: 0.028,
    23: 0.024, 24: 0.022, 25: 0.020, 26: 0.018, 27: 0.0164, 28: 0.0148, 29: 0.0136,
    30: 0.0124,
}


def swg_diameter_mm(gauge: int) -> float:
    """Diameter of an SWG size (BS 3737 table) in mm."""
    return SWG_INCHES[gauge] * IN


def _gauge_number(text: str) -> int:
    """'12' -> 12; '0' -> 0; '00' or '2/0' -> -1; '0000' or '4/0' -> -3."""
    if "/" in text:
        count, zero = text.split("/", 1)
        if zero != "0" or not count.isdigit() or int(count) < 1:
            raise ValueError(text)
        return 1 - int(count)
    if text and set(text) == {"0"}:
        return 1 - len(text)
    return int(text)


def parse_gauge(text: object, field: str = "stock.gauge") -> float:
    """'AWG 4', 'awg 12', 'SWG 10', 'AWG 2/0' -> diameter in mm."""
    if not isinstance(text, str):
        raise DesignError('expected a gauge such as "AWG 10" or "SWG 12"', field=field,
                          value=text)
    parts = text.replace("#", " ").split()
    if len(parts) != 2 or parts[0].upper() not in {"AWG", "SWG"}:
        raise DesignError('expected a gauge such as "AWG 10" or "SWG 12"', field=field,
                          value=text)
    system = parts[0].upper()
    try:
        n = _gauge_number(parts[1])
    except ValueError:
        raise DesignError("not a gauge number", field=field, value=text) from None
    if system == "AWG":
        if not -3 <= n <= 40:
            raise DesignError("AWG sizes run from 4/0 to 40", field=field, value=text)
        return awg_diameter_mm(n)
    if n not in SWG_INCHES:
        raise DesignError("SWG sizes run from 7/0 to 30", field=field, value=text)
    return swg_diameter_mm(n)
