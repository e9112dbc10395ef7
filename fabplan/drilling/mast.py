"""A quadrifilar helix's mast: the holes its radials pass through, as a drilling pattern.

Each loop's top radial and its bottom radial pass straight through the mast (the
top one in two halves that end inside it at the feed), so each is one through
hole drilled across the mast: its entry at the listed angle, its exit 180 degrees
round. Heights come from fabplan.antennas.quadrifilar.mast_drilling (the design
method's loops: radial centrelines at the loop's height apart; each bottom
radial turned from its top by the arm's twist).

Datum: the mast's top end, cut square. The top radials lie `top_margin_mm` below
it (default: twice the mast's diameter, and at least 30 mm, so the tube does not
split at the hole [P]). Angles: counter-clockwise seen from the top end, from a
line scribed along the mast (the large loop's top radial lies on it). Holes are
the conductor's diameter plus `clearance_mm` (0.5 mm: a sliding fit [P]).
Millimetres and degrees.
"""

from __future__ import annotations

from ..antennas.quadrifilar import QfhDesign, mast_drilling
from ..errors import DesignError
from .records import DrillPattern, Hole

__all__ = ["qfh_mast", "BELOW_MM", "CLEARANCE_MM", "MIN_MARGIN_MM"]

BELOW_MM = 250.0  # mast left below the lowest hole for a clamp or a mount [P]
CLEARANCE_MM = 0.5  # hole over the conductor's diameter [P]
MIN_MARGIN_MM = 30.0  # top hole at least this far below the mast's end [P]


def qfh_mast(name: str, design: QfhDesign, mast_diameter_mm: float, *,
             conductor_diameter_mm: float, small_azimuth_deg: float = 90.0,
             small_top_offset_mm: float = 0.0, length_mm: float | None = None,
             top_margin_mm: float | None = None,
             clearance_mm: float = CLEARANCE_MM) -> DrillPattern:
    """The drilling pattern of the mast of `design` (the element `name`'s helix).

    mast_diameter_mm: the mast's outside diameter; small_azimuth_deg: the small loop's
    top radial from the large one's (+90 or -90); small_top_offset_mm: how far it lies
    below the large one's; length_mm: the mast's length (default: to the lowest hole
    plus BELOW_MM); top_margin_mm: the top radials below the mast's top end.
    """
    drill = mast_drilling(design, mast_diameter_mm, small_top_offset_mm=small_top_offset_mm,
                          small_turn_deg=small_azimuth_deg)
    margin = (top_margin_mm if top_margin_mm is not None
              else max(2 * mast_diameter_mm, MIN_MARGIN_MM))
    hole_d = conductor_diameter_mm + clearance_mm
    holes: list[Hole] = []
    seen: set[tuple[str, str]] = set()
    for h in drill.holes:  # two entries per radial: the one in [0, 180) is drilled
        key = (h.loop, h.end)
        if key in seen:
            continue
        pair = [x for x in drill.holes if (x.loop, x.end) == key]
        angle = min(x.azimuth_deg for x in pair) % 360.0
        seen.add(key)
        what = ("top radial: its two halves enter from each side and end at the feed "
                "inside the mast" if h.end == "top" else
                "bottom radial: one straight through the mast")
        holes.append(Hole(f"{h.loop} loop, {h.end}", margin + h.from_top_mm, angle, hole_d,
                          True, f"{h.loop} loop's {what}"))
    holes.sort(key=lambda x: (x.from_datum_mm, x.angle_deg))
    lowest = max(x.from_datum_mm for x in holes)
    length = length_mm if length_mm is not None else lowest + BELOW_MM
    if length < lowest + hole_d:
        raise DesignError(f"the mast must reach past its lowest hole ({lowest:.0f} mm from the "
                          "top)", field="mast_length", value=length)
    return DrillPattern(f"{name}: mast", "round", mast_diameter_mm, length,
                        "the mast's top end, cut square; angles counter-clockwise seen from "
                        "the top, from a line scribed along the mast", tuple(holes))
