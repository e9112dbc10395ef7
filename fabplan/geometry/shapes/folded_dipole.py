"""Folded dipole: two parallel sides joined by 180-degree ends, one piece of stock.

The feed gap sits on one side (centred by default, or `feed_offset` from the
middle); the stock's ends face each other across it, and the stock's centre
falls in the middle of the unbroken side. The ends are round (one 180-degree
bend whose centreline radius is half the centre-to-centre spacing) or square
(two 90-degree bends of `bend_radius` joined by a short straight, for a tool
whose radius is smaller than half the spacing).
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from typing import Literal

from ...errors import DesignError, Finding
from ...section import Section
from ..path import Bend, BendPath, Piece, Straight
from .base import (
    Dimension,
    ParallelEnds,
    ShapeSpec,
    TunedValue,
    centre_to_centre,
    gap_and_offset,
    pick_one,
    spacing_centre,
)

NAME = "folded-dipole"
SUMMARY = "two parallel sides joined by 180-degree ends, fed at a gap in one side"


@dataclass(frozen=True)
class Params:
    length_kind: Literal["side", "inside_length", "overall_length"]
    length_mm: float
    spacing_kind: Literal["spacing", "centre_spacing"]
    spacing_mm: float
    feed_gap_mm: float
    feed_offset_mm: float = 0.0
    end_style: Literal["round", "square"] = "round"
    bend_radius_mm: float | None = None

    def centre_spacing(self, d: float) -> float:
        return centre_to_centre(self.spacing_kind, self.spacing_mm, d)

    def side(self, d: float) -> float:
        """Straight side length (centreline, mm)."""
        c = self.centre_spacing(d)
        if self.length_kind == "side":
            return self.length_mm
        if self.length_kind == "inside_length":
            # inside tip-to-tip = side + 2 x (end radius - d/2) = side + c - d
            return self.length_mm - (c - d)
        return self.length_mm - (c + d)

    def end_radius(self, d: float) -> float:
        if self.end_style == "square":
            return self.bend_radius_mm if self.bend_radius_mm is not None else d
        return self.centre_spacing(d) / 2


def read(sec: Section) -> Params:
    lkind, length = pick_one(sec, ("side", "inside_length", "overall_length"))
    skind, spacing = spacing_centre(sec)
    gap, offset = gap_and_offset(sec)
    style = sec.string("end_style", "round", choices=("round", "square"))
    radius = sec.length("bend_radius", None)
    if style == "round" and radius is not None:
        raise DesignError("a round end's radius follows from the spacing; set end_style = "
                          "\"square\" to use a bend radius", field=sec.field("bend_radius"))
    return Params(lkind, length, skind, spacing, gap, offset, style,  # type: ignore[arg-type]
                  radius)


def _straights(p: Params, d: float) -> tuple[float, float, float, float]:
    side = p.side(d)
    half_a = side / 2 - p.feed_offset_mm - p.feed_gap_mm / 2
    half_b = side / 2 + p.feed_offset_mm - p.feed_gap_mm / 2
    link = p.centre_spacing(d) - 2 * p.end_radius(d) if p.end_style == "square" else 0.0
    return side, half_a, half_b, link


def build(p: Params, d: float) -> BendPath:
    side, half_a, half_b, link = _straights(p, d)
    r = p.end_radius(d)
    if p.end_style == "round":
        ends: list[Piece] = [Bend(r, 180.0)]
    else:
        ends = [Bend(r, 90.0)] + ([Straight(link)] if link > 1e-9 else []) + [Bend(r, 90.0)]
    pieces = [Straight(max(half_a, 0.0)), *ends, Straight(side), *ends,
              Straight(max(half_b, 0.0))]
    pieces = [x for x in pieces if not (isinstance(x, Straight) and x.length_mm <= 0)]
    c = p.centre_spacing(d)
    origin = (p.feed_offset_mm + p.feed_gap_mm / 2, -c / 2, 0.0)
    return BendPath(tuple(pieces), origin=origin, gap_mm=p.feed_gap_mm)


def problems(p: Params, d: float) -> list[Finding]:
    side, half_a, half_b, link = _straights(p, d)
    out = []
    if p.centre_spacing(d) <= d:
        out.append(Finding("conductors-touch", "error",
                           f"centre-to-centre spacing {p.centre_spacing(d):.1f} mm is not more "
                           f"than the conductor diameter {d:.2f} mm: the sides touch; widen the "
                           "spacing"))
    if min(half_a, half_b) <= 0:
        out.append(Finding("gap-wider-than-side", "error",
                           f"feed gap {p.feed_gap_mm:.1f} mm (offset {p.feed_offset_mm:.1f} mm) "
                           f"does not fit in the {side:.1f} mm side: shorten the gap or the "
                           "offset, or lengthen the element"))
    if side <= 0:
        out.append(Finding("side-too-short", "error",
                           f"the straight side comes out {side:.1f} mm: the length is shorter "
                           "than the ends need; lengthen the element or narrow the spacing"))
    if p.end_style == "square" and link < -1e-9:
        out.append(Finding("end-radius-too-large", "error",
                           f"two {p.end_radius(d):.1f} mm bends need a centre spacing of at least "
                           f"{2 * p.end_radius(d):.1f} mm; use a smaller bend radius or round "
                           "ends"))
    return out


def governing(p: Params) -> tuple[str, float]:
    return p.length_kind, p.length_mm


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, length_mm=value)


KEYS = ("side", "inside_length", "overall_length", "spacing", "centre_spacing", "feed_gap",
        "feed_offset", "end_style", "bend_radius")


def tuned_keys(p: Params) -> dict[str, TunedValue]:
    return {p.length_kind: ("length", p.length_mm)}


def dimensions(p: Params, d: float) -> tuple[Dimension, ...]:
    """The length the user gave (above the unbroken side) and the spacing
    (between the sides, away from the feed gap)."""
    c = p.centre_spacing(d)
    if p.length_kind == "side":
        half, y = p.length_mm / 2, c / 2
    else:  # tip to tip, inside or outside, on the element's long axis
        half, y = p.length_mm / 2, 0.0
    length = Dimension(p.length_kind, p.length_mm, (-half, y, 0.0), (half, y, 0.0),
                       (0.0, 1.0, 0.0))
    x = p.side(d) / 4 * (-1.0 if p.feed_offset_mm >= 0 else 1.0)
    inner = d / 2 if p.spacing_kind == "spacing" else 0.0
    spacing = Dimension(p.spacing_kind, p.spacing_mm, (x, -c / 2 + inner, 0.0),
                        (x, c / 2 - inner, 0.0))
    return (length, spacing)


PARALLEL_ENDS = ParallelEnds(
    centre_spacing=lambda p, d: p.centre_spacing(d),
    is_round=lambda p: p.end_style == "round",
    squared=lambda p, r: dataclasses.replace(p, end_style="square", bend_radius_mm=r))

SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, PARALLEL_ENDS, dimensions=dimensions)
