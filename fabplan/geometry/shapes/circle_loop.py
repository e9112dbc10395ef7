"""Circular loop: a full circle of stock less the feed gap.

`diameter` is the centreline diameter (or give `circumference`, the full
centreline circle). The gap is a chord at the bottom of the circle.

`rolled = true`: a large ring (a transmitting loop of thick tube) is rolled to
its radius in passes, in a ring roller or by hand round a template, not bent on
a disc: the forming stage gives the radius to roll to (springback from the
moment-curvature model) and no jig is drawn.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from typing import Literal

from ...antennas.small_loop import LoopGeometry
from ...errors import Finding
from ...section import Section
from ..path import Bend, BendPath
from .base import (
    Dimension,
    ElementGeometry,
    End,
    Gap,
    PieceGeometry,
    ShapeSpec,
    TunedValue,
    arc_angle_of_chord,
    pick_one,
)

NAME = "circle-loop"
SUMMARY = "a full circle of stock less the feed gap"


@dataclass(frozen=True)
class Params:
    diameter_mm: float
    feed_gap_mm: float
    given: Literal["diameter", "circumference"] = "diameter"  # which the design gave
    rolled: bool = False


ROLL_HINT_MM = 600.0  # a circle this large is rolled rather than bent on a disc [P]


def read(sec: Section) -> Params:
    kind, value = pick_one(sec, ("diameter", "circumference"))
    diameter = value if kind == "diameter" else value / math.pi
    return Params(diameter, sec.length("feed_gap", 10.0), kind,  # type: ignore[arg-type]
                  sec.boolean("rolled", False))


def build(p: Params, d: float) -> BendPath:
    r = p.diameter_mm / 2
    gap_angle = arc_angle_of_chord(p.feed_gap_mm, r)
    phi0 = -math.pi / 2 + gap_angle / 2
    origin = (r * math.cos(phi0), r * math.sin(phi0), 0.0)
    heading = (-math.sin(phi0), math.cos(phi0), 0.0)
    normal = (-math.cos(phi0), -math.sin(phi0), 0.0)
    return BendPath((Bend(r, 360.0 - math.degrees(gap_angle)),), origin=origin, heading=heading,
                    normal=normal, gap_mm=p.feed_gap_mm)


def geometry(p: Params, d: float) -> ElementGeometry:
    return ElementGeometry((PieceGeometry("", build(p, d), rolled=p.rolled),),
                           (Gap(End(0, "B"), End(0, "A"), p.feed_gap_mm, "feed"),))


def loop_geometry(p: Params, d: float) -> LoopGeometry:
    """The circle for the small-loop formulas."""
    return LoopGeometry.circle(p.diameter_mm, d)


def problems(p: Params, d: float) -> list[Finding]:
    if p.feed_gap_mm >= p.diameter_mm / 2:
        return [Finding("gap-wider-than-side", "error",
                        f"feed gap {p.feed_gap_mm:.1f} mm is too wide for a "
                        f"{p.diameter_mm:.1f} mm circle; keep it under a quarter of the "
                        "diameter")]
    if p.diameter_mm > ROLL_HINT_MM and not p.rolled:
        return [Finding("loop-roll-it", "info",
                        f"a {p.diameter_mm:.0f} mm circle is usually rolled (a ring roller, or "
                        "by hand round a template) rather than bent round a disc: set rolled = "
                        "true for the radius to roll to, and no disc jig")]
    return []


def governing(p: Params) -> tuple[str, float]:
    return "circumference", math.pi * p.diameter_mm


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, diameter_mm=value / math.pi)


KEYS = ("diameter", "circumference", "feed_gap", "rolled")

def tuned_keys(p: Params) -> dict[str, TunedValue]:
    return {"diameter": ("length", p.diameter_mm),
            "circumference": ("length", math.pi * p.diameter_mm)}


def dimensions(p: Params, d: float) -> tuple[Dimension, ...]:
    """The centreline diameter across the circle (the circumference, when the
    design gave that, drawn as the diameter it makes)."""
    r = p.diameter_mm / 2
    value = p.diameter_mm if p.given == "diameter" else math.pi * p.diameter_mm
    return (Dimension(p.given, value, (-r, 0.0, 0.0), (r, 0.0, 0.0)),)


SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, dimensions=dimensions, geometry=geometry, small_loop=loop_geometry)
