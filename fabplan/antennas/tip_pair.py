"""Two bent elements whose tips face each other across a small gap: starting dimensions.

A driven element and a reflector, each bent back at both ends towards the other,
so the whole makes a rectangle broken by two small gaps between facing tips. The
coupling across the tips makes a two-element beam with a deep rear null and a
feed impedance near 50 ohm. The form is Les Moxon's (G6XN, HF Antennas for All
Locations, RSGB, 2nd ed. 1993 [M]); fabplan calls the shape a "tip-coupled
pair".

Dimensions (all in wavelengths in `TipPair*_wl`, mm otherwise), as in the
published design equations:
- A: width of the rectangle (the straight middle of each element, side to side);
- B: length of each of the driven element's bent-back tails;
- C: the gap between the facing tips;
- D: length of each of the reflector's tails;
- E: depth of the rectangle (front to back) = B + C + D.
The driven element's wire length is A + 2B, the reflector's A + 2D (sharp
corners, centreline).

SOURCES (tags as in trade-notes.md)
- L. B. Cebik, W4RNL, "Designing Moxon Rectangles by Equation and by Model"
  (article; its opening was read in this session [S], its equations were not):
  quadratic fits of A, B, C and D against D1 = log10(conductor diameter in
  wavelengths), for diameters 1e-5 to 1e-2 wavelength, giving a rectangle
  resonant near 50 ohm with its best front-to-back at the design frequency.
  The coefficients below are as recalled [M: every coefficient from memory];
  check them against the article before citing them as exact, and let the
  electrical model confirm the result.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .common import require_positive, require_range, wavelength_mm

__all__ = ["TipPair", "TIP_PAIR_COEFFICIENTS", "TIP_PAIR_SOURCE", "tip_pair_wl", "tip_pair"]

TIP_PAIR_SOURCE = ("Cebik (W4RNL), 'Designing Moxon Rectangles by Equation and by Model': "
                   "fits in log10(diameter / wavelength), 1e-5 to 1e-2 wavelength [M: "
                   "coefficients from memory]; form after Moxon (G6XN), HF Antennas for All "
                   "Locations [M]")
# (quadratic, linear, constant) in D1 = log10(d / lambda) [M]
TIP_PAIR_COEFFICIENTS: dict[str, tuple[float, float, float]] = {
    "A": (-0.0008571428571, -0.009571428571, 0.3398571429),
    "B": (-0.002142857143, -0.02035714286, 0.008285714286),
    "C": (0.001809523381, 0.01780952381, 0.05164285714),
    "D": (0.0, 0.001, 0.07178571429),
}
DIAMETER_RANGE_WL = (1e-5, 1e-2)


@dataclass(frozen=True)
class TipPair:
    """Starting dimensions (mm) of a tip-coupled pair; see the module docstring."""

    frequency_hz: float
    wavelength_mm: float
    conductor_diameter_mm: float
    width_mm: float  # A
    driven_tail_mm: float  # B
    gap_mm: float  # C
    reflector_tail_mm: float  # D
    depth_mm: float  # E = B + C + D
    driven_length_mm: float  # A + 2B
    reflector_length_mm: float  # A + 2D
    basis: str


def tip_pair_wl(diameter_wl: float) -> tuple[float, float, float, float, float]:
    """(A, B, C, D, E) in wavelengths for a conductor of `diameter_wl` wavelengths."""
    low, high = DIAMETER_RANGE_WL
    require_range("conductor_diameter / wavelength", diameter_wl, low, high,
                  "the published fits cover 1e-5 to 1e-2 wavelength")
    x = math.log10(diameter_wl)

    def fit(key: str) -> float:
        q, lin, c = TIP_PAIR_COEFFICIENTS[key]
        return q * x * x + lin * x + c

    a, b, c, d = fit("A"), fit("B"), fit("C"), fit("D")
    return a, b, c, d, b + c + d


def tip_pair(frequency_hz: float, conductor_diameter_mm: float) -> TipPair:
    """Starting dimensions of a tip-coupled pair at `frequency_hz` (Hz)."""
    require_positive("conductor_diameter_mm", conductor_diameter_mm)
    lam = wavelength_mm(frequency_hz)
    a, b, c, d, e = tip_pair_wl(conductor_diameter_mm / lam)
    return TipPair(frequency_hz=frequency_hz, wavelength_mm=lam,
                   conductor_diameter_mm=conductor_diameter_mm, width_mm=a * lam,
                   driven_tail_mm=b * lam, gap_mm=c * lam, reflector_tail_mm=d * lam,
                   depth_mm=e * lam, driven_length_mm=(a + 2 * b) * lam,
                   reflector_length_mm=(a + 2 * d) * lam, basis=TIP_PAIR_SOURCE)
