"""Bend order and marks for a hand or ratchet bender.

Positions are along the stock's neutral axis in mm, from cut end A (trim
included) unless named otherwise. A bend occupies [start, end] of the stock
(the Plan's bend rows); springback does not move these points, because the
neutral axis keeps its length.

Setback and gain (trade practice [P], trade-notes.md): the setback of a bend
is R tan(theta/2), the distance from a tangent point to the corner where the
two straight legs' centrelines meet; the gain is 2 x setback - arc, what the
stock saves by going round the bend instead of into the corner. Measured
corner to corner, bend k starts at

    sum of legs to corner k  -  sum of gains of bends before k  -  setback k

from end A, which is where `tool_marks` put it.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from .records import ToolMark

__all__ = ["BendSite", "setback", "gain", "bend_order", "grip_available", "tool_marks",
           "corner_legs", "starts_from_legs"]


@dataclass(frozen=True)
class BendSite:
    """One bend as the sequencing sees it (mm along the stock from cut end A)."""

    index: int
    start_mm: float
    end_mm: float
    angle_deg: float  # finished angle
    radius_mm: float  # finished centreline radius
    neutral_radius_mm: float  # finished neutral-axis radius
    bend_to_deg: float  # angle to bend to (overbend included)


def setback(radius_mm: float, angle_deg: float) -> float | None:
    """R tan(theta/2) (mm); None when the legs never meet (theta >= 180 deg)."""
    if angle_deg >= 180.0 - 1e-9:
        return None
    return radius_mm * math.tan(math.radians(angle_deg) / 2)


def gain(radius_mm: float, neutral_radius_mm: float, angle_deg: float) -> float | None:
    """2 x setback - arc on the neutral axis (mm); None at 180 deg and over."""
    sb = setback(radius_mm, angle_deg)
    if sb is None:
        return None
    return 2 * sb - math.radians(angle_deg) * neutral_radius_mm


def corner_legs(sites: Sequence[BendSite], total_mm: float) -> list[float] | None:
    """Leg lengths corner to corner (end A to corner 1, corner 1 to 2, ...,
    last corner to end B), or None if a bend is 180 deg or more."""
    legs = []
    prev_end = 0.0
    prev_sb = 0.0
    for s in sites:
        sb = setback(s.radius_mm, s.angle_deg)
        if sb is None:
            return None
        legs.append(prev_sb + (s.start_mm - prev_end) + sb)
        prev_end, prev_sb = s.end_mm, sb
    legs.append(prev_sb + total_mm - prev_end)
    return legs


def starts_from_legs(sites: Sequence[BendSite], legs: Sequence[float]) -> list[float]:
    """Where each bend starts (mm from end A), from the corner-to-corner legs,
    the setbacks and the gains."""
    out = []
    to_corner = 0.0
    gains = 0.0
    for s, leg in zip(sites, legs):
        to_corner += leg
        sb = setback(s.radius_mm, s.angle_deg)
        g = gain(s.radius_mm, s.neutral_radius_mm, s.angle_deg)
        out.append(to_corner - gains - (sb or 0.0))
        gains += g or 0.0
    return out


def grip_available(site: BendSite, formed: Sequence[BendSite], total_mm: float) -> float:
    """Longest straight stock beside `site` (mm), given the bends already formed."""
    left = site.start_mm - max([f.end_mm for f in formed if f.end_mm <= site.start_mm + 1e-9],
                               default=0.0)
    right = min([f.start_mm for f in formed if f.start_mm >= site.end_mm - 1e-9],
                default=total_mm) - site.end_mm
    return max(left, right)


def bend_order(sites: Sequence[BendSite], total_mm: float,
               grip_mm: float) -> tuple[list[int], dict[int, float]]:
    """An order in which every bend keeps `grip_mm` of straight beside it.

    Forming a bend only shortens the straights beside the others, so each step
    makes the most constrained bend that still has its grip. When none has,
    the one with the most straight goes next (and is reported short).
    Returns the bend indices in order and the grip each bend had."""
    left = list(sites)
    formed: list[BendSite] = []
    order: list[int] = []
    grips: dict[int, float] = {}
    while left:
        avail = [(grip_available(s, formed, total_mm), s) for s in left]
        ok = [(g, s) for g, s in avail if g >= grip_mm - 1e-9]
        if ok:
            g, pick = min(ok, key=lambda gs: (gs[0], gs[1].index))
        else:
            g, pick = max(avail, key=lambda gs: (gs[0], -gs[1].index))
        order.append(pick.index)
        grips[pick.index] = g
        formed.append(pick)
        left.remove(pick)
    return order, grips


def tool_marks(sites: Sequence[BendSite], order: Sequence[int], grips: dict[int, float],
               total_mm: float, centre_mm: float, tool_radius_mm: float,
               reference: str, direction: str) -> list[ToolMark]:
    """The pencil mark for each bend, in bend order.

    `reference` "bend-start": the tool's mark is where the bend begins;
    "corner": one tool centreline radius on (the corner of a 90-degree bend).
    `direction` "forward": the bend forms on the far side of the mark from end
    A; "reverse": on end A's side. `centre_mm`: the stock centre from end A."""
    by_index = {s.index: s for s in sites}
    out = []
    for step, idx in enumerate(order, 1):
        s = by_index[idx]
        offset = tool_radius_mm if reference == "corner" else 0.0
        pos = s.start_mm + offset if direction == "forward" else s.end_mm - offset
        out.append(ToolMark(step, idx, pos - centre_mm, pos, reference, s.bend_to_deg,
                            total_mm - pos, setback(s.radius_mm, s.angle_deg),
                            gain(s.radius_mm, s.neutral_radius_mm, s.angle_deg),
                            grips.get(idx, 0.0)))
    return out
