"""Material records: density, stiffness, strength, hardening, resistivity.

Units: density kg/m^3, stresses MPa (N/mm^2), resistivity ohm*m, elongation as a
fraction. Every row names its source; "[M]" marks a figure recalled from the
named source (verify before relying on it as exact), "[E]" an engineering
estimate chosen to be typical of the temper, "[P]" common practice.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from typing import Literal

from ..errors import DesignError, did_you_mean

__all__ = ["Material", "MATERIALS", "get_material", "Family", "OVERRIDABLE"]

Family = Literal["copper", "aluminium", "brass", "stainless", "copper-clad-steel"]


@dataclass(frozen=True)
class Material:
    """One material in one temper."""

    key: str
    name: str
    family: Family
    temper: Literal["annealed", "half-hard", "hard"]
    density_kg_m3: float
    youngs_modulus_mpa: float
    yield_mpa: float
    hollomon_k_mpa: float
    hollomon_n: float
    resistivity_ohm_m: float
    elongation: float
    source: str
    # where RF current flows in a cladding of another metal (copper-clad steel),
    # the resistivity that sets the loss once the skin depth is inside it
    rf_resistivity_ohm_m: float | None = None

    @property
    def conductivity_iacs(self) -> float:
        """Conductivity in % IACS (172.41 / resistivity in micro-ohm cm)."""
        return 172.41 / (self.resistivity_ohm_m * 1e8)

    def overridden(self, **changes: float) -> Material:
        """A copy with some properties replaced (design-file overrides)."""
        if not changes:
            return self
        note = ", ".join(f"{k} from the design" for k in sorted(changes))
        fields: dict[str, object] = {**changes, "source": f"{self.source}; {note}"}
        return dataclasses.replace(self, **fields)  # type: ignore[arg-type]


# properties a design may override, by key name (all numbers in the units above)
OVERRIDABLE = ("density_kg_m3", "youngs_modulus_mpa", "yield_mpa", "hollomon_k_mpa",
               "hollomon_n", "resistivity_ohm_m", "elongation")

_CDA = "Copper Development Association property data"
_KS = "Kalpakjian & Schmid, Manufacturing Engineering and Technology, table of K and n [M]"
_AA = "Aluminum Association typical properties"

MATERIALS: dict[str, Material] = {m.key: m for m in (
    Material("cu-c11000-annealed", "Copper C11000 (ETP), annealed", "copper", "annealed",
             8890, 117_000, 69, 315, 0.54, 1.72e-8, 0.45,
             f"{_CDA} (density, E, resistivity); yield [M]; K, n: {_KS}"),
    Material("cu-c11000-hard", "Copper C11000 (ETP), hard-drawn", "copper", "hard",
             8890, 117_000, 310, 380, 0.05, 1.78e-8, 0.10,
             f"{_CDA} (density, E); yield and resistivity [M]; K, n [E] for a drawn temper"),
    Material("cu-c12200-annealed", "Copper C12200 (DHP) tube, annealed", "copper", "annealed",
             8940, 117_000, 69, 315, 0.54, 2.03e-8, 0.45,
             f"{_CDA}: density, E, resistivity (>= 85 % IACS); yield [M]; K, n: {_KS}"),
    Material("cu-c12200-drawn", "Copper C12200 (DHP) tube, drawn", "copper", "hard",
             8940, 117_000, 310, 380, 0.05, 2.03e-8, 0.10,
             f"{_CDA}: density, E, resistivity; yield [M]; K, n [E] for a drawn temper"),
    Material("al-6061-t6", "Aluminium 6061-T6", "aluminium", "hard",
             2700, 68_900, 276, 410, 0.05, 3.99e-8, 0.12,
             f"{_AA} (density, E, yield, resistivity); K, n: {_KS}"),
    Material("al-6063-t5", "Aluminium 6063-T5", "aluminium", "half-hard",
             2690, 68_900, 145, 230, 0.10, 3.13e-8, 0.12,
             f"{_AA} (density, E, yield, resistivity); K, n [E]"),
    Material("al-6063-t832", "Aluminium 6063-T832 drawn tube", "aluminium", "hard",
             2690, 68_900, 241, 320, 0.06, 3.25e-8, 0.10,
             f"{_AA} (density, E) ; yield and resistivity [M]; K, n [E]"),
    Material("al-1100-o", "Aluminium 1100-O", "aluminium", "annealed",
             2710, 69_000, 34, 180, 0.20, 2.92e-8, 0.35,
             f"{_AA} [M]; K, n: {_KS}"),
    Material("brass-c26000-annealed", "Brass C26000 (70/30), annealed", "brass", "annealed",
             8530, 110_000, 145, 900, 0.49, 6.16e-8, 0.55,
             f"{_CDA} (density, E, yield, resistivity); K, n: {_KS}"),
    Material("brass-c26000-half-hard", "Brass C26000 (70/30), half-hard", "brass", "half-hard",
             8530, 110_000, 345, 600, 0.15, 6.16e-8, 0.25,
             f"{_CDA} (density, E, yield, resistivity); K, n [E]"),
    Material("ss-304-annealed", "Stainless steel 304, annealed", "stainless", "annealed",
             8000, 193_000, 215, 1275, 0.45, 72e-8, 0.40,
             f"ASTM A240 / producers' typical data (density, E, yield, resistivity); K, n: {_KS}"),
    Material("ccs-40-hard", "Copper-clad steel wire, 40 % IACS, hard-drawn", "copper-clad-steel",
             "hard", 8150, 180_000, 550, 700, 0.08, 4.31e-8, 0.02,
             "ASTM B227/B910 grades [M] (density, E, strength); resistivity from 40 % IACS; "
             "K, n [E]", rf_resistivity_ohm_m=1.72e-8),
)}


def get_material(key: str, field: str = "stock.material") -> Material:
    """The material with this key, or an error listing the known keys."""
    try:
        return MATERIALS[key]
    except KeyError:
        hint = did_you_mean(key, MATERIALS, 0.5)
        raise DesignError(f"unknown material; {hint}known: {', '.join(MATERIALS)}",
                          field=field, value=key) from None
