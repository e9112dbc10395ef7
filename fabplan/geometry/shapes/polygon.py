"""A closed polygon with rounded corners, fed at a gap in its first side.

Used by the rectangular and triangular loops. Lengths are centreline lengths
of the sharp-cornered polygon (mm); turning angles in degrees.
"""

from __future__ import annotations

import math

from ..path import Bend, BendPath, Piece, Straight

__all__ = ["rounded_polygon", "setbacks", "polygon_straights"]


def setbacks(turns_deg: list[float], radius: float) -> list[float]:
    """Setback R tan(theta/2) of each corner (mm)."""
    return [radius * math.tan(math.radians(t) / 2) for t in turns_deg]


def polygon_straights(sides: list[float], turns_deg: list[float], radius: float, gap: float,
                      offset: float) -> list[float]:
    """Straight runs: first half of side 0, sides 1..n-1, second half of side 0.

    Corner i lies at the end of side i; the gap is on side 0, its centre
    `offset` from the middle of side 0 in the direction of travel.
    """
    t = setbacks(turns_deg, radius)
    n = len(sides)
    first = sides[0] / 2 - offset - gap / 2 - t[0]
    middle = [sides[i] - t[i - 1] - t[i] for i in range(1, n)]
    last = sides[0] / 2 + offset - gap / 2 - t[n - 1]
    return [first, *middle, last]


def rounded_polygon(sides: list[float], turns_deg: list[float], radius: float, gap: float,
                    offset: float, origin: tuple[float, float, float],
                    heading: tuple[float, float, float]) -> BendPath:
    """The loop as a bend path from end A (just past the gap) round to end B."""
    runs = polygon_straights(sides, turns_deg, radius, gap, offset)
    pieces: list[Piece] = []
    for i, run in enumerate(runs):
        if run > 1e-9:
            pieces.append(Straight(run))
        if i < len(turns_deg):
            pieces.append(Bend(radius, turns_deg[i]))
    hx, hy, _ = heading
    return BendPath(tuple(pieces), origin=origin, heading=heading, normal=(-hy, hx, 0.0),
                    gap_mm=gap)
