"""Triangle (delta) loop with rounded corners, fed at the apex or at the middle
of the base.

`side` gives an equilateral triangle; `base` with `legs` an isosceles one. All
are centreline lengths of the sharp-cornered triangle (mm). Fed at the apex,
the stock's ends lie on the two legs with the feed gap between them and only
the two base corners are bent.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

from ...errors import DesignError, Finding
from ...section import Section
from ..path import Bend, BendPath, Straight
from .base import Dimension, ShapeSpec, TunedValue, gap_and_offset
from .polygon import polygon_straights, rounded_polygon, setbacks

NAME = "delta-loop"
SUMMARY = "triangular loop with rounded corners, fed at the apex or the middle of the base"


@dataclass(frozen=True)
class Params:
    base_mm: float
    legs_mm: float
    corner_radius_mm: float
    feed_gap_mm: float
    feed_offset_mm: float = 0.0
    feed: str = "base"
    side_given: bool = False  # the design gave `side` (equilateral), not base and legs

    @property
    def base_angle(self) -> float:
        """Interior angle at a base corner (rad)."""
        return math.acos(min(1.0, self.base_mm / (2 * self.legs_mm)))

    @property
    def height(self) -> float:
        return math.sqrt(max(0.0, self.legs_mm ** 2 - (self.base_mm / 2) ** 2))


def read(sec: Section) -> Params:
    if sec.has("side"):
        if sec.has("base") or sec.has("legs"):
            raise DesignError("give `side` for an equilateral triangle or `base` and `legs`, "
                              "not both", field=sec.path)
        base = legs = sec.length("side")
    else:
        sec.mark_used("side")
        base, legs = sec.length("base"), sec.length("legs")
    if 2 * legs <= base:
        raise DesignError("two legs must be longer than the base to close a triangle",
                          field=sec.field("legs"), value=sec.raw("legs"))
    r = sec.length("corner_radius")
    gap, offset = gap_and_offset(sec)
    feed = sec.string("feed", "base", choices=("base", "apex"))
    if feed == "apex" and offset:
        raise DesignError("an apex feed has no offset", field=sec.field("feed_offset"))
    return Params(base, legs, r, gap, offset, feed, sec.has("side"))


def _turns(p: Params) -> tuple[float, float]:
    """Exterior (turning) angles at a base corner and at the apex, degrees."""
    beta = p.base_angle
    return math.degrees(math.pi - beta), math.degrees(2 * beta)


def _apex_runs(p: Params) -> tuple[float, float, float]:
    t_base, t_apex = _turns(p)
    e = p.feed_gap_mm / (2 * math.sin(math.radians(180 - t_apex) / 2))
    sb = setbacks([t_base], p.corner_radius_mm)[0]
    return e, p.legs_mm - e - sb, p.base_mm - 2 * sb


def build(p: Params, d: float) -> BendPath:
    t_base, t_apex = _turns(p)
    h = p.height
    if p.feed == "base":
        origin = (p.feed_offset_mm + p.feed_gap_mm / 2, 0.0, 0.0)
        return rounded_polygon([p.base_mm, p.legs_mm, p.legs_mm], [t_base, t_apex, t_base],
                               p.corner_radius_mm, p.feed_gap_mm, p.feed_offset_mm, origin,
                               (1.0, 0.0, 0.0))
    e, leg_run, base_run = _apex_runs(p)
    dx, dy = -p.base_mm / 2 / p.legs_mm, -h / p.legs_mm
    origin = (e * dx, h + e * dy, 0.0)
    pieces = (Straight(leg_run), Bend(p.corner_radius_mm, t_base), Straight(base_run),
              Bend(p.corner_radius_mm, t_base), Straight(leg_run))
    return BendPath(pieces, origin=origin, heading=(dx, dy, 0.0), normal=(-dy, dx, 0.0),
                    gap_mm=p.feed_gap_mm)


def problems(p: Params, d: float) -> list[Finding]:
    t_base, t_apex = _turns(p)
    if p.feed == "base":
        runs = polygon_straights([p.base_mm, p.legs_mm, p.legs_mm], [t_base, t_apex, t_base],
                                 p.corner_radius_mm, p.feed_gap_mm, p.feed_offset_mm)
    else:
        _, leg_run, base_run = _apex_runs(p)
        runs = [leg_run, base_run, leg_run]
    if min(runs) < -1e-9:
        return [Finding("corner-radius-too-large", "error",
                        f"corner radius {p.corner_radius_mm:.1f} mm and feed gap "
                        f"{p.feed_gap_mm:.1f} mm leave no straight on a side; use a smaller "
                        "radius or a larger triangle")]
    return []


def governing(p: Params) -> tuple[str, float]:
    return "perimeter", p.base_mm + 2 * p.legs_mm


def with_governing(p: Params, value: float) -> Params:
    f = value / (p.base_mm + 2 * p.legs_mm)
    return dataclasses.replace(p, base_mm=p.base_mm * f, legs_mm=p.legs_mm * f)


KEYS = ("side", "base", "legs", "corner_radius", "feed_gap", "feed_offset", "feed")

def tuned_keys(p: Params) -> dict[str, TunedValue]:
    out: dict[str, TunedValue] = {"base": ("length", p.base_mm), "legs": ("length", p.legs_mm)}
    if abs(p.base_mm - p.legs_mm) < 1e-9:
        out["side"] = ("length", p.base_mm)
    return out


def dimensions(p: Params, d: float) -> tuple[Dimension, ...]:
    """The base below the triangle and a leg beside it (or the one side of an
    equilateral triangle), between the sharp corners."""
    b, h = p.base_mm / 2, p.height
    base = ((-b, 0.0, 0.0), (b, 0.0, 0.0), (0.0, -1.0, 0.0))
    if p.side_given:
        return (Dimension("side", p.base_mm, *base),)
    n = math.hypot(h, b)
    return (Dimension("base", p.base_mm, *base),
            Dimension("legs", p.legs_mm, (b, 0.0, 0.0), (0.0, h, 0.0), (h / n, b / n, 0.0)))


SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, dimensions=dimensions)
