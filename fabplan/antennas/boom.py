"""Boom correction: how much longer a Yagi element must be cut for its mounting.

A metal boom shortens the elements electrically where they pass through or near
it; the element is cut longer by a correction that depends on the boom's size in
wavelengths and on whether the element touches the boom.

Units: mm; the boom's size also as a fraction of a wavelength.

Mountings (the design file's `mounting` values):
- "bonded-through": through the boom's centre, in electrical contact;
- "insulated": through the boom in insulating bushings;
- "above": on insulating clamps clear of the boom.

SOURCES (tags as in trade-notes.md)
- Bonded through a round boom: I. White, GM3SEK, TowerTalk mailing list (post
  answering a 6 m boom question) [S, read in this session]: correction as a
  fraction of the boom diameter
      733 B (0.055 - B) - 504 B (0.03 - B),  B = boom diameter / wavelength,
  "if the element ran through the centre of the boom, electrically connected on
  both sides". The post applies it to a square boom's side too [S].
- Insulated through the boom: half of that, C = 12.5975 B - 114.5 B^2, in
  I0JXX's table "Boom correction for through the boom insulated elements on 2
  meters & 70cm" (i0jxx.it, labelled "Correction for 2 meters G3SEK"), which also
  states the fit is "proven accurate for boom diameters smaller than .055
  wavelengths" [S, read]. The same table's 2 m rows (0.75, 1.0, 1.5, 1.75 in
  booms: 10.56, 13.66, 19.21, 21.67 % of the boom diameter, at a wavelength of
  82 in) are the checks in the tests.
- Insulated and above the boom: GM3SEK's post: "less than half of that ...
  almost zero" [S]. fabplan returns zero and gives the insulated-through figure
  as an upper bound.
- A second, looser statement (YU1AW's study as summarised at
  johnsonfrancis.org, "What is boom correction in Yagi antennas?") [S]: bonded
  25-45 % of the boom diameter, insulated 15-25 %; the tests check the fit lands
  in those bands for a typical 2 m boom.
- NBS Technical Note 688's boom chart was not readable in this session and is
  not used.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from ..errors import DesignError
from .common import require_positive, require_range

__all__ = ["Mounting", "MOUNTINGS", "BoomCorrection", "BOOM_LIMIT_WL", "bonded_fraction",
           "boom_correction", "correction_mm"]

Mounting = Literal["bonded-through", "insulated", "above"]
MOUNTINGS: tuple[Mounting, ...] = ("bonded-through", "insulated", "above")
BOOM_LIMIT_WL = 0.055  # I0JXX: the fit holds for booms under 0.055 wavelength [S]

_GM3SEK = "GM3SEK (I. White), TowerTalk post: bonded through-boom fit [S]"
_I0JXX = "I0JXX 2 m table after G3SEK: insulated through-boom, half the bonded fit [S]"


def bonded_fraction(boom_wl: float) -> float:
    """Correction as a fraction of the boom diameter, element bonded through (GM3SEK fit)."""
    require_range("boom_diameter / wavelength", boom_wl, 0.0, BOOM_LIMIT_WL,
                  "the published fit holds for booms under 0.055 wavelength")
    return 733.0 * boom_wl * (0.055 - boom_wl) - 504.0 * boom_wl * (0.03 - boom_wl)


@dataclass(frozen=True)
class BoomCorrection:
    """Boom correction for one element.

    correction_mm: length to add to the element's tip-to-tip length;
    fraction_of_boom: the same as a fraction of the boom diameter;
    upper_bound_mm: for "above", the insulated-through figure (the published
    statement is only "less than half ... almost zero"); basis: the source.
    """

    mounting: Mounting
    boom_diameter_mm: float
    boom_wl: float
    correction_mm: float
    fraction_of_boom: float
    upper_bound_mm: float
    basis: str


def boom_correction(boom_diameter_mm: float, element_diameter_mm: float, wavelength_mm: float,
                    mounting: Mounting) -> BoomCorrection:
    """The boom correction (mm) for an element of a Yagi on a metal boom.

    boom_diameter_mm: a round boom's outside diameter or a square boom's side;
    element_diameter_mm: the element's diameter (the published fit does not
    depend on it; it is checked to pass through the boom); wavelength_mm: at the
    design frequency; mounting: "bonded-through", "insulated" or "above".
    """
    require_positive("boom_diameter_mm", boom_diameter_mm)
    require_positive("element_diameter_mm", element_diameter_mm)
    require_positive("wavelength_mm", wavelength_mm)
    if mounting not in MOUNTINGS:
        raise DesignError(f"mounting is one of {', '.join(MOUNTINGS)}", field="mounting",
                          value=mounting)
    if mounting != "above" and element_diameter_mm >= boom_diameter_mm / 2:
        raise DesignError("an element through the boom must be under half the boom's "
                          "diameter", field="element_diameter_mm", value=element_diameter_mm)
    b = boom_diameter_mm / wavelength_mm
    bonded = bonded_fraction(b)
    insulated = bonded / 2
    if mounting == "bonded-through":
        frac, upper, basis = bonded, bonded, _GM3SEK
    elif mounting == "insulated":
        frac, upper, basis = insulated, insulated, _I0JXX
    else:
        frac, upper = 0.0, insulated
        basis = ("GM3SEK post: insulated and above the boom, 'less than half' the bonded "
                 "figure, 'almost zero' [S]; taken as zero, upper bound the insulated figure")
    return BoomCorrection(mounting=mounting, boom_diameter_mm=boom_diameter_mm, boom_wl=b,
                          correction_mm=frac * boom_diameter_mm, fraction_of_boom=frac,
                          upper_bound_mm=upper * boom_diameter_mm, basis=basis)


def correction_mm(boom_diameter_mm: float, element_diameter_mm: float, wavelength_mm: float,
                  mounting: Mounting) -> float:
    """`boom_correction(...).correction_mm`: the length (mm) to add."""
    return boom_correction(boom_diameter_mm, element_diameter_mm, wavelength_mm,
                           mounting).correction_mm
