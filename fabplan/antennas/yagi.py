"""Yagi starting dimensions: NBS Technical Note 688 and a diameter correction.

NBS Technical Note 688 (P. P. Viezbicke, "Yagi Antenna Design", National
Bureau of Standards, December 1976) gives, for six boom lengths, the measured
optimum lengths of the parasitic elements at one element diameter
(d/lambda = 0.0085), with the reflector 0.2 wavelength behind the driven
element, the directors' common spacing, and the gain over a half-wave dipole.
Those figures are in `TN688`.

Units: wavelengths where a name says `_wl`, mm and Hz otherwise.

SOURCES (tags as in trade-notes.md)
- TN 688 Table 1 (optimised parasitic lengths, spacings, gains): the report's
  cover and contents were read in this session (a stored copy of "Yagi Antenna
  Design", NBS Technical Note 688), its tables were not, so EVERY figure in
  `TN688` is from memory [M] and must be checked against the report before it is
  cited as exact. They are kept in this one table with that source string. The
  boom lengths, element counts and spacings are mutually consistent (boom =
  0.2 + directors x spacing), which is a check on the recollection, not a proof.
- TN 688 corrects for element diameter with a chart and for a metal boom with
  another; neither chart was read. fabplan's diameter correction instead keeps
  each element's self-reactance (Balanis, Antenna Theory, induced-EMF
  self-impedance of a dipole, eq. 8-61b, 3rd ed. [M]):
      X_in = X_m / sin^2(kl/2),
      X_m = 30 {2 Si(kl) + cos(kl)[2 Si(kl) - Si(2kl)]
                - sin(kl)[2 Ci(kl) - Ci(2kl) - Ci(2ka^2/l)]},
  the reason being that a parasitic element's current is set by its
  self-impedance against the (diameter-independent) mutual impedances. This is
  fabplan's use of a published formula, not TN 688's chart: say so on the sheet
  and let the electrical model confirm it. A known weakness: at exactly half a
  wavelength the induced-EMF reactance does not depend on the radius at all, so
  elements near 0.5 wavelength get too little correction. The boom correction is
  in boom.py.
- The driven element's length is not part of TN 688's optimisation (it was
  adjusted for match [M]); fabplan starts it at the induced-EMF resonant length
  for its diameter (X_in = 0), to be tuned with the electrical model. Balanis
  gives X_in = 42.5 ohm for an infinitely thin half-wave dipole (eq. 4-93 [M]),
  a check in the tests.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..errors import DesignError
from ..numeric import brentq
from .common import require_positive, require_range, wavelength_mm

__all__ = ["Tn688Design", "TN688", "TN688_SOURCE", "TN688_DIAMETER_WL", "YagiElement",
           "YagiStart", "tn688_design", "dipole_reactance_ohm", "resonant_length_wl",
           "equal_reactance_length_wl", "yagi_start"]

TN688_SOURCE = ("NBS Technical Note 688 (Viezbicke, Yagi Antenna Design, 1976), Table 1: "
                "optimised parasitic element lengths for six boom lengths, d/lambda = 0.0085, "
                "reflector spacing 0.2 wavelength [M: every figure from memory; the table "
                "was not readable in this session]")
TN688_DIAMETER_WL = 0.0085  # element diameter / wavelength of TN 688's measurements [M]
DIAMETER_RANGE_WL = (0.0005, 0.02)  # induced-EMF correction: thin elements only


@dataclass(frozen=True)
class Tn688Design:
    """One column of TN 688 Table 1 (lengths and spacings in wavelengths, gain in dBd)."""

    boom_length_wl: float
    reflector_length_wl: float
    director_lengths_wl: tuple[float, ...]
    reflector_spacing_wl: float
    director_spacing_wl: float
    gain_dbd: float

    @property
    def elements(self) -> int:
        """Reflector, driven element and directors."""
        return 2 + len(self.director_lengths_wl)


# TN 688 Table 1 [M, from memory; see TN688_SOURCE]
TN688: tuple[Tn688Design, ...] = (
    Tn688Design(0.4, 0.482, (0.424,), 0.2, 0.20, 7.1),
    Tn688Design(0.8, 0.482, (0.428, 0.424, 0.428), 0.2, 0.20, 9.2),
    Tn688Design(1.2, 0.482, (0.428, 0.420, 0.420, 0.428), 0.2, 0.25, 10.2),
    Tn688Design(2.2, 0.482, (0.432, 0.415, 0.407, 0.398, 0.390, 0.390, 0.390, 0.390, 0.398,
                             0.407), 0.2, 0.20, 12.25),
    Tn688Design(3.2, 0.482, (0.428, 0.420, 0.407, 0.398, 0.394, 0.390, 0.386, 0.386, 0.386,
                             0.386, 0.386, 0.386, 0.386, 0.386, 0.386), 0.2, 0.20, 13.4),
    Tn688Design(4.2, 0.475, (0.424, 0.424, 0.420, 0.407, 0.403, 0.398, 0.394, 0.390, 0.390,
                             0.390, 0.390, 0.390, 0.390), 0.2, 0.308, 14.2),
)


def tn688_design(boom_length_wl: float) -> Tn688Design:
    """The TN 688 column for `boom_length_wl` (one of 0.4, 0.8, 1.2, 2.2, 3.2, 4.2)."""
    for d in TN688:
        if abs(d.boom_length_wl - boom_length_wl) < 1e-9:
            return d
    options = ", ".join(f"{d.boom_length_wl:g}" for d in TN688)
    raise DesignError(f"TN 688 gives boom lengths {options} wavelength only",
                      field="boom_length_wl", value=boom_length_wl)


def dipole_reactance_ohm(length_wl: float, diameter_wl: float) -> float:
    """Induced-EMF input reactance (ohm, at the centre) of a thin centre-fed dipole.

    Balanis, Antenna Theory, eq. 8-61b with X_in = X_m / sin^2(kl/2) [M];
    valid for a thin element (diameter << length) not near a full wavelength.
    """
    from scipy.special import sici  # type: ignore[import-untyped, unused-ignore]

    require_range("length_wl", length_wl, 0.2, 0.8, "the induced-EMF reactance away from the "
                  "full-wave anti-resonance")
    require_positive("diameter_wl", diameter_wl)
    a = diameter_wl / 2
    kl = 2 * math.pi * length_wl
    si1, ci1 = sici(kl)
    si2, ci2 = sici(2 * kl)
    _, cia = sici(2 * 2 * math.pi * a * a / length_wl)
    xm = 30.0 * (2 * si1 + math.cos(kl) * (2 * si1 - si2)
                 - math.sin(kl) * (2 * ci1 - ci2 - cia))
    return float(xm / math.sin(kl / 2) ** 2)


def _check_diameter(field: str, diameter_wl: float) -> None:
    low, high = DIAMETER_RANGE_WL
    require_range(field, diameter_wl, low, high,
                  "the induced-EMF diameter correction holds for thin elements")


def resonant_length_wl(diameter_wl: float) -> float:
    """Length (wavelengths) at which a dipole of `diameter_wl` has zero reactance."""
    _check_diameter("diameter_wl", diameter_wl)
    return float(brentq(lambda L: dipole_reactance_ohm(L, diameter_wl), 0.40, 0.50, xtol=1e-12))


def equal_reactance_length_wl(length_wl: float, diameter_wl: float,
                              new_diameter_wl: float) -> float:
    """Length (wavelengths) at `new_diameter_wl` with the same self-reactance.

    The diameter correction of a parasitic element (see SOURCES).
    """
    require_range("length_wl", length_wl, 0.3, 0.55, "parasitic elements near a half wave")
    _check_diameter("diameter_wl", diameter_wl)
    _check_diameter("new_diameter_wl", new_diameter_wl)
    target = dipole_reactance_ohm(length_wl, diameter_wl)
    f = lambda L: dipole_reactance_ohm(L, new_diameter_wl) - target  # noqa: E731
    return float(brentq(f, 0.25, 0.62, xtol=1e-12))


@dataclass(frozen=True)
class YagiElement:
    """One element of a Yagi start: name, position from the reflector (mm), length (mm)."""

    name: str
    position_mm: float
    length_mm: float
    length_wl: float


@dataclass(frozen=True)
class YagiStart:
    """TN 688 starting dimensions scaled to a frequency and element diameter.

    Lengths are tip to tip with no boom correction (boom.py adds it); positions
    are measured from the reflector, each from that one datum; `boom_length_mm`
    is the reflector-to-last-director distance (TN 688's boom length).
    """

    frequency_hz: float
    wavelength_mm: float
    element_diameter_mm: float
    boom_length_mm: float
    gain_dbd: float
    elements: tuple[YagiElement, ...]
    basis: str


def yagi_start(frequency_hz: float, boom_length_wl: float,
               element_diameter_mm: float) -> YagiStart:
    """Starting dimensions for a Yagi of `boom_length_wl` (a TN 688 boom) at `frequency_hz`.

    Parasitic lengths from TN 688 at d/lambda 0.0085, moved to the element's own
    d/lambda by equal self-reactance; the driven element at its resonant length.
    """
    lam = wavelength_mm(frequency_hz)
    require_positive("element_diameter_mm", element_diameter_mm)
    design = tn688_design(boom_length_wl)
    d_wl = element_diameter_mm / lam
    _check_diameter("element_diameter_mm / wavelength", d_wl)

    def corrected(length: float) -> float:
        if abs(d_wl - TN688_DIAMETER_WL) < 1e-12:
            return length
        return equal_reactance_length_wl(length, TN688_DIAMETER_WL, d_wl)

    elems = [YagiElement("reflector", 0.0, corrected(design.reflector_length_wl) * lam,
                         corrected(design.reflector_length_wl))]
    de = resonant_length_wl(d_wl)
    pos = design.reflector_spacing_wl
    elems.append(YagiElement("driven", pos * lam, de * lam, de))
    for i, length in enumerate(design.director_lengths_wl, start=1):
        pos = design.reflector_spacing_wl + i * design.director_spacing_wl
        c = corrected(length)
        elems.append(YagiElement(f"director {i}", pos * lam, c * lam, c))
    basis = (f"{TN688_SOURCE}; diameter moved from d/lambda {TN688_DIAMETER_WL} to "
             f"{d_wl:.5f} by equal induced-EMF self-reactance (Balanis) [fabplan's method]; "
             "driven element at its induced-EMF resonant length, to be tuned")
    return YagiStart(frequency_hz=frequency_hz, wavelength_mm=lam,
                     element_diameter_mm=element_diameter_mm,
                     boom_length_mm=elems[-1].position_mm, gain_dbd=design.gain_dbd,
                     elements=tuple(elems), basis=basis)
