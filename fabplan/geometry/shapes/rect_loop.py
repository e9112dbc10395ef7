"""Rectangular (or square) loop with rounded corners, fed at the middle of a side.

`width` and `height` are centreline dimensions (centre of the conductor on one
side to the centre on the other); `side` makes a square. `feed_side` picks the
side that carries the feed gap.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

from ...errors import DesignError, Finding
from ...section import Section
from ..path import BendPath
from .base import Dimension, ShapeSpec, TunedValue, gap_and_offset
from .polygon import polygon_straights, rounded_polygon

NAME = "rect-loop"
SUMMARY = "rectangular or square loop with rounded corners, fed at the middle of a side"

_SIDES = ("bottom", "right", "top", "left")


@dataclass(frozen=True)
class Params:
    width_mm: float
    height_mm: float
    corner_radius_mm: float
    feed_gap_mm: float
    feed_offset_mm: float = 0.0
    feed_side: str = "bottom"
    side_given: bool = False  # the design gave `side` (a square), not width and height

    def sides(self) -> list[float]:
        w, h = self.width_mm, self.height_mm
        return [w, h, w, h] if self.feed_side in ("bottom", "top") else [h, w, h, w]


def read(sec: Section) -> Params:
    if sec.has("side"):
        if sec.has("width") or sec.has("height"):
            raise DesignError("give `side` for a square or `width` and `height`, not both",
                              field=sec.path)
        w = h = sec.length("side")
    else:
        sec.mark_used("side")
        w, h = sec.length("width"), sec.length("height")
    r = sec.length("corner_radius")
    gap, offset = gap_and_offset(sec)
    side = sec.string("feed_side", "bottom", choices=_SIDES)
    return Params(w, h, r, gap, offset, side, sec.has("side"))


def build(p: Params, d: float) -> BendPath:
    w, h = p.width_mm, p.height_mm
    g = p.feed_gap_mm / 2 + p.feed_offset_mm
    origin, heading = {
        "bottom": ((g, -h / 2, 0.0), (1.0, 0.0, 0.0)),
        "right": ((w / 2, g, 0.0), (0.0, 1.0, 0.0)),
        "top": ((-g, h / 2, 0.0), (-1.0, 0.0, 0.0)),
        "left": ((-w / 2, -g, 0.0), (0.0, -1.0, 0.0)),
    }[p.feed_side]
    return rounded_polygon(p.sides(), [90.0] * 4, p.corner_radius_mm, p.feed_gap_mm,
                           p.feed_offset_mm, origin, heading)


def problems(p: Params, d: float) -> list[Finding]:
    out = []
    runs = polygon_straights(p.sides(), [90.0] * 4, p.corner_radius_mm, p.feed_gap_mm,
                             p.feed_offset_mm)
    if min(runs[0], runs[-1]) < 0:
        out.append(Finding("gap-wider-than-side", "error",
                           f"feed gap {p.feed_gap_mm:.1f} mm and corner radius "
                           f"{p.corner_radius_mm:.1f} mm do not fit on the fed side; shrink "
                           "either or enlarge the loop"))
    if min(runs[1:-1]) < -1e-9:
        out.append(Finding("corner-radius-too-large", "error",
                           f"corner radius {p.corner_radius_mm:.1f} mm is more than half a side; "
                           "use a smaller radius or a circular loop"))
    return out


def governing(p: Params) -> tuple[str, float]:
    return "perimeter", 2 * (p.width_mm + p.height_mm)


def with_governing(p: Params, value: float) -> Params:
    f = value / (2 * (p.width_mm + p.height_mm))
    return dataclasses.replace(p, width_mm=p.width_mm * f, height_mm=p.height_mm * f)


KEYS = ("side", "width", "height", "corner_radius", "feed_gap", "feed_offset", "feed_side")

def tuned_keys(p: Params) -> dict[str, TunedValue]:
    out: dict[str, TunedValue] = {"width": ("length", p.width_mm),
                                  "height": ("length", p.height_mm)}
    if abs(p.width_mm - p.height_mm) < 1e-9:
        out["side"] = ("length", p.width_mm)
    return out


def dimensions(p: Params, d: float) -> tuple[Dimension, ...]:
    """Centreline width above the loop and height beside it (or the one side of
    a square), between the sharp corners the rounded ones cut off."""
    w, h = p.width_mm / 2, p.height_mm / 2
    top = ((-w, h, 0.0), (w, h, 0.0), (0.0, 1.0, 0.0))
    if p.side_given:
        return (Dimension("side", p.width_mm, *top),)
    return (Dimension("width", p.width_mm, *top),
            Dimension("height", p.height_mm, (w, -h, 0.0), (w, h, 0.0), (1.0, 0.0, 0.0)))


SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, dimensions=dimensions)
