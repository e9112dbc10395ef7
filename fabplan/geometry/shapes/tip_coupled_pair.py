"""A tip-coupled pair: a driven element and a reflector, each bent back at both ends
towards the other, so that the two make a rectangle broken by two small gaps where
their tips face each other.

Dimensions (the names of fabplan.antennas.tip_pair, mm): `width` (A, the long
sides, centreline to centreline of the corners), `driven_tail` (B), `tip_gap` (C,
between the facing tips, centre to centre), `reflector_tail` (D); the depth is
B + C + D. Or `frequency` alone: the starting dimensions of the published fits
(fabplan.antennas.tip_pair: Cebik's equations after Moxon) for the element's stock,
filled in by the design reader. The driven element is split at the middle of its
long side by `feed_gap` (two pieces of stock, fed across the gap); the reflector is
one piece. Corners are bends of `bend_radius` (default 4 x the stock diameter, inside the
2.5-5 d that hard aluminium rod asks for; common practice, no source), the sides
keeping their centreline positions.

In the element's frame the driven element's long side lies along x at y = 0 (the
feed gap at the origin), its tails run towards +y, and the reflector's long side
lies at y = B + C + D: placed on a boom across it (turn 90 degrees about z), the
reflector is behind the driven element.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

from ...errors import DesignError, Finding
from ...section import Section
from ..path import Bend, BendPath, Straight
from .base import ElementGeometry, End, Gap, PieceGeometry, ShapeSpec, TunedValue

NAME = "tip-coupled-pair"
SUMMARY = ("a driven element and a reflector bent back so that their tips face across a "
           "small gap (a two-element beam in a rectangle)")
DIMENSIONS = ("width", "driven_tail", "tip_gap", "reflector_tail")


@dataclass(frozen=True)
class Params:
    width_mm: float  # A
    driven_tail_mm: float  # B
    tip_gap_mm: float  # C
    reflector_tail_mm: float  # D
    feed_gap_mm: float = 10.0
    bend_radius_mm: float | None = None  # None: 4 x the stock diameter
    frequency_hz: float | None = None  # dimensions from the published fits (design reader)

    @property
    def depth_mm(self) -> float:
        return self.driven_tail_mm + self.tip_gap_mm + self.reflector_tail_mm

    def radius(self, d: float) -> float:
        return self.bend_radius_mm if self.bend_radius_mm is not None else 4 * d


def read(sec: Section) -> Params:
    given = [k for k in DIMENSIONS if sec.has(k)]
    gap = sec.length("feed_gap", 10.0)
    radius = sec.length("bend_radius", None)
    if sec.has("frequency"):
        if given:
            raise DesignError("give `frequency` (starting dimensions from the published fits) "
                              f"or the dimensions, not both (found {', '.join(given)})",
                              field=sec.field("frequency"))
        return Params(0.0, 0.0, 0.0, 0.0, gap, radius, sec.frequency("frequency"))
    if len(given) != len(DIMENSIONS):
        missing = [k for k in DIMENSIONS if k not in given]
        raise DesignError(f"give {', '.join(DIMENSIONS)} (missing {', '.join(missing)}), or "
                          "`frequency` for the published starting dimensions", field=sec.path)
    a, b, c, d = (sec.length(k) for k in DIMENSIONS)
    return Params(a, b, c, d, gap, radius)


def with_starting_dimensions(p: Params, diameter_mm: float) -> Params:
    """The params with the published starting dimensions for stock of `diameter_mm`
    at `p.frequency_hz` (unchanged when the dimensions were given)."""
    if p.frequency_hz is None:
        return p
    from ...antennas.tip_pair import tip_pair

    t = tip_pair(p.frequency_hz, diameter_mm)
    return dataclasses.replace(p, width_mm=t.width_mm, driven_tail_mm=t.driven_tail_mm,
                               tip_gap_mm=t.gap_mm, reflector_tail_mm=t.reflector_tail_mm)


def _paths(p: Params, d: float) -> tuple[BendPath, BendPath, BendPath]:
    r = p.radius(d)
    a, b, dd, g = p.width_mm, p.driven_tail_mm, p.reflector_tail_mm, p.feed_gap_mm
    e = p.depth_mm
    run = a / 2 - g / 2 - r
    side_a = BendPath((Straight(b - r), Bend(r, 90.0), Straight(run)),
                      origin=(-a / 2, b, 0.0), heading=(0.0, -1.0, 0.0), normal=(1.0, 0.0, 0.0))
    side_b = BendPath((Straight(run), Bend(r, 90.0), Straight(b - r)),
                      origin=(g / 2, 0.0, 0.0), heading=(1.0, 0.0, 0.0), normal=(0.0, 1.0, 0.0))
    reflector = BendPath((Straight(dd - r), Bend(r, 90.0), Straight(a - 2 * r), Bend(r, 90.0),
                          Straight(dd - r)), origin=(-a / 2, e - dd, 0.0),
                         heading=(0.0, 1.0, 0.0), normal=(1.0, 0.0, 0.0))
    return side_a, side_b, reflector


def build(p: Params, d: float) -> BendPath:
    """The reflector (the one piece that is whole); `geometry` gives every piece."""
    return _paths(p, d)[2]


def geometry(p: Params, d: float) -> ElementGeometry:
    side_a, side_b, reflector = _paths(p, d)
    return ElementGeometry((PieceGeometry("driven, side A", side_a),
                            PieceGeometry("driven, side B", side_b),
                            PieceGeometry("reflector", reflector)),
                           (Gap(End(0, "B"), End(1, "A"), p.feed_gap_mm, "feed"),))


def problems(p: Params, d: float) -> list[Finding]:
    out = []
    r = p.radius(d)
    for name, length in (("driven_tail", p.driven_tail_mm), ("reflector_tail",
                                                             p.reflector_tail_mm)):
        if length < r:
            out.append(Finding("tail-shorter-than-bend", "error",
                               f"the {name.replace('_', ' ')} of {length:.1f} mm is shorter than "
                               f"the {r:.1f} mm corner bend: use a smaller bend_radius or a "
                               "longer tail"))
    if p.width_mm / 2 - p.feed_gap_mm / 2 < r:
        out.append(Finding("gap-wider-than-side", "error",
                           f"the {p.feed_gap_mm:.1f} mm feed gap and the {r:.1f} mm corners do "
                           f"not fit in the {p.width_mm:.1f} mm width"))
    if p.tip_gap_mm <= d:
        out.append(Finding("conductors-touch", "error",
                           f"the tips are {p.tip_gap_mm:.1f} mm apart centre to centre, not more "
                           f"than the {d:.2f} mm stock: they touch; widen tip_gap"))
    return out


def governing(p: Params) -> tuple[str, float]:
    return "width", p.width_mm


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, width_mm=value)


def tuned_keys(p: Params) -> dict[str, TunedValue]:
    return {"width": ("length", p.width_mm)}


KEYS = (*DIMENSIONS, "frequency", "feed_gap", "bend_radius")

SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, geometry=geometry)
