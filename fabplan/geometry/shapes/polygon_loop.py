"""Regular polygon loop (an octagon, a hexagon, ...) with a gap in its bottom side.

The centreline is the regular polygon of `sides` equal sides; give its size as
one of `diameter` (across the corners of the sharp-cornered centreline),
`across_flats`, `circumference` (the sharp polygon's perimeter) or `side`. The
gap (`feed_gap`, for a feed or a tuning capacitor) is at the middle of the
bottom side; the loop stands in its x-y plane, the bottom side along x.

Corners:

- `corners = "bent"` (default): one piece of stock bent at each corner to
  `bend_radius` (centreline; default four stock diameters, common practice for
  hard-drawn tube [P]).
- `corners = "fittings"`: straight tubes joined by elbow fittings of
  360/sides degrees. A fitting's take-off (`fitting_takeoff`) is what the
  straight tube loses at each corner: each tube stops that far short of the
  sharp corner, so a side's tube is `side` - 2 x take-off (the bottom side's two
  halves also lose half the gap). Read the take-off from the fitting's
  data sheet or measure it: the distance from the corner's intersection point
  to the end of the tube when it is pushed home. In the electrical model each
  fitting is a conductor straight across the corner between the tubes' ends.

Lengths in mm, angles in degrees.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from typing import Literal

from ...antennas.small_loop import LoopGeometry
from ...errors import DesignError, Finding
from ...section import Section
from ..path import BendPath, Straight
from .base import ElementGeometry, End, Gap, PieceGeometry, ShapeSpec, TunedValue, pick_one
from .polygon import polygon_straights, rounded_polygon

__all__ = ["NAME", "Params", "read", "build", "geometry", "problems", "governing",
           "with_governing", "tuned_keys", "loop_geometry", "SPEC"]

NAME = "polygon-loop"
SUMMARY = ("regular polygon loop (octagon, ...) of bent tube or straight tubes and elbow "
           "fittings, with a gap for the feed or a tuning capacitor")

Corners = Literal["bent", "fittings"]
CORNERS: tuple[Corners, ...] = ("bent", "fittings")
_BEND_DIAMETERS = 4.0  # default centreline bend radius, in stock diameters [P]
_SIZES = ("diameter", "across_flats", "circumference", "side")


@dataclass(frozen=True)
class Params:
    """sides; side_mm: one side of the sharp-cornered centreline polygon; corners;
    bend_radius_mm (bent; None: four stock diameters); fitting_takeoff_mm
    (fittings); feed_gap_mm."""

    sides: int
    side_mm: float
    corners: Corners = "bent"
    bend_radius_mm: float | None = None
    fitting_takeoff_mm: float | None = None
    feed_gap_mm: float = 10.0

    @property
    def circumradius_mm(self) -> float:
        return self.side_mm / (2 * math.sin(math.pi / self.sides))

    @property
    def apothem_mm(self) -> float:
        return self.circumradius_mm * math.cos(math.pi / self.sides)

    @property
    def turn_deg(self) -> float:
        return 360.0 / self.sides


def read(sec: Section) -> Params:
    n = sec.integer("sides", low=3, high=64)
    kind, value = pick_one(sec, _SIZES)
    half = math.pi / n
    side = {"diameter": value * math.sin(half),
            "across_flats": value * math.tan(half),
            "circumference": value / n,
            "side": value}[kind]
    corners = sec.string("corners", "bent", choices=CORNERS)
    radius = sec.length("bend_radius", None)
    takeoff = sec.length("fitting_takeoff", None, allow_zero=True)
    if corners == "bent" and takeoff is not None:
        raise DesignError('fitting_takeoff is for corners = "fittings"',
                          field=sec.field("fitting_takeoff"), value=sec.raw("fitting_takeoff"))
    if corners == "fittings":
        if radius is not None:
            raise DesignError('bend_radius is for corners = "bent"; a fitting has its take-off',
                              field=sec.field("bend_radius"), value=sec.raw("bend_radius"))
        if takeoff is None:
            raise DesignError("give the fittings' take-off: how far each tube stops short of "
                              "the corner (from the fitting's data or measured)",
                              field=sec.field("fitting_takeoff"))
    return Params(n, side, corners, radius, takeoff, sec.length("feed_gap", 10.0))


def _radius(p: Params, d: float) -> float:
    return p.bend_radius_mm if p.bend_radius_mm is not None else _BEND_DIAMETERS * d


def build(p: Params, d: float) -> BendPath:
    """The bent polygon as one path (for fittings, the sharp polygon: see `geometry`)."""
    radius = _radius(p, d) if p.corners == "bent" else 0.0
    origin = (p.feed_gap_mm / 2, -p.apothem_mm, 0.0)
    return rounded_polygon([p.side_mm] * p.sides, [p.turn_deg] * p.sides, radius,
                           p.feed_gap_mm, 0.0, origin, (1.0, 0.0, 0.0))


def _direction(k: int, p: Params) -> tuple[float, float]:
    a = math.radians(k * p.turn_deg)
    return math.cos(a), math.sin(a)


def geometry(p: Params, d: float) -> ElementGeometry:
    if p.corners == "bent":
        path = build(p, d)
        return ElementGeometry((PieceGeometry("", path),),
                               (Gap(End(0, "B"), End(0, "A"), p.feed_gap_mm, "feed"),))
    t = p.fitting_takeoff_mm or 0.0
    s, g, n = p.side_mm, p.feed_gap_mm, p.sides
    corner = [(-s / 2, -p.apothem_mm)]  # corner k starts side k (side 0 along the bottom)
    for k in range(n - 1):
        dx, dy = _direction(k, p)
        corner.append((corner[-1][0] + s * dx, corner[-1][1] + s * dy))
    pieces = [PieceGeometry("bottom, right of the gap",
                            BendPath((Straight(s / 2 - g / 2 - t),),
                                     origin=(g / 2, -p.apothem_mm, 0.0)))]
    for k in range(1, n):
        dx, dy = _direction(k, p)
        x, y = corner[k]
        pieces.append(PieceGeometry(f"side {k + 1}", BendPath(
            (Straight(s - 2 * t),), origin=(x + t * dx, y + t * dy, 0.0), heading=(dx, dy, 0.0),
            normal=(-dy, dx, 0.0))))
    pieces.append(PieceGeometry("bottom, left of the gap",
                                BendPath((Straight(s / 2 - g / 2 - t),),
                                         origin=(-s / 2 + t, -p.apothem_mm, 0.0))))
    chord = 2 * t * math.cos(math.pi / n)
    gaps = [Gap(End(len(pieces) - 1, "B"), End(0, "A"), g, "feed")]
    gaps += [Gap(End(k, "B"), End(k + 1, "A"), chord, "joint") for k in range(n)]
    return ElementGeometry(tuple(pieces), tuple(gaps))


def loop_geometry(p: Params, d: float) -> LoopGeometry:
    """The sharp-cornered polygon for the small-loop formulas."""
    return LoopGeometry.polygon(p.sides, p.side_mm, d)


def problems(p: Params, d: float) -> list[Finding]:
    out: list[Finding] = []
    if p.corners == "bent":
        runs = polygon_straights([p.side_mm] * p.sides, [p.turn_deg] * p.sides, _radius(p, d),
                                 p.feed_gap_mm, 0.0)
        if min(runs[0], runs[-1]) < 0:
            out.append(Finding("gap-wider-than-side", "error",
                               f"the {p.feed_gap_mm:.1f} mm gap and the corners' bends do not "
                               "fit on the bottom side: shrink either or enlarge the loop"))
        if min(runs[1:-1]) < -1e-9:
            out.append(Finding("corner-radius-too-large", "error",
                               f"the {_radius(p, d):.1f} mm bend radius leaves no straight on "
                               "a side: use a smaller radius or fewer sides"))
        return out
    t = p.fitting_takeoff_mm or 0.0
    if p.side_mm - 2 * t <= d or p.side_mm / 2 - p.feed_gap_mm / 2 - t <= d:
        out.append(Finding("gap-wider-than-side", "error",
                           f"the fittings' {t:.1f} mm take-off (and the gap on the bottom side) "
                           f"leave no tube on a {p.side_mm:.1f} mm side: enlarge the loop"))
    out.append(Finding("loop-fittings", "info",
                       f"{p.sides} elbow fittings of {p.turn_deg:g} degrees at the corners "
                       f"(take-off {t:.1f} mm each): add them to [[purchase.item]] and solder "
                       "every joint all round (each joint's resistance is in series with the "
                       "loop: [element.capacitor] joint_resistance)"))
    return out


def governing(p: Params) -> tuple[str, float]:
    return "circumference", p.sides * p.side_mm


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, side_mm=value / p.sides)


def tuned_keys(p: Params) -> dict[str, TunedValue]:
    return {"side": ("length", p.side_mm),
            "circumference": ("length", p.sides * p.side_mm),
            "diameter": ("length", 2 * p.circumradius_mm),
            "across_flats": ("length", 2 * p.apothem_mm)}


KEYS = ("sides", *_SIZES, "corners", "bend_radius", "fitting_takeoff", "feed_gap")

SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, geometry=geometry, small_loop=loop_geometry)
