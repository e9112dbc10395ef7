"""Circular loop: a full circle of stock less the feed gap.

`diameter` is the centreline diameter (or give `circumference`, the full
centreline circle). The gap is a chord at the bottom of the circle.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from typing import Literal

from ...errors import Finding
from ...section import Section
from ..path import Bend, BendPath
from .base import Dimension, ShapeSpec, TunedValue, arc_angle_of_chord, pick_one

NAME = "circle-loop"
SUMMARY = "a full circle of stock less the feed gap"


@dataclass(frozen=True)
class Params:
    diameter_mm: float
    feed_gap_mm: float
    given: Literal["diameter", "circumference"] = "diameter"  # which the design gave


def read(sec: Section) -> Params:
    kind, value = pick_one(sec, ("diameter", "circumference"))
    diameter = value if kind == "diameter" else value / math.pi
    return Params(diameter, sec.length("feed_gap", 10.0), kind)  # type: ignore[arg-type]


def build(p: Params, d: float) -> BendPath:
    r = p.diameter_mm / 2
    gap_angle = arc_angle_of_chord(p.feed_gap_mm, r)
    phi0 = -math.pi / 2 + gap_angle / 2
    origin = (r * math.cos(phi0), r * math.sin(phi0), 0.0)
    heading = (-math.sin(phi0), math.cos(phi0), 0.0)
    normal = (-math.cos(phi0), -math.sin(phi0), 0.0)
    return BendPath((Bend(r, 360.0 - math.degrees(gap_angle)),), origin=origin, heading=heading,
                    normal=normal, gap_mm=p.feed_gap_mm)


def problems(p: Params, d: float) -> list[Finding]:
    if p.feed_gap_mm >= p.diameter_mm / 2:
        return [Finding("gap-wider-than-side", "error",
                        f"feed gap {p.feed_gap_mm:.1f} mm is too wide for a "
                        f"{p.diameter_mm:.1f} mm circle; keep it under a quarter of the "
                        "diameter")]
    return []


def governing(p: Params) -> tuple[str, float]:
    return "circumference", math.pi * p.diameter_mm


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, diameter_mm=value / math.pi)


KEYS = ("diameter", "circumference", "feed_gap")

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
                 tuned_keys, dimensions=dimensions)
