"""What every shape template provides.

A shape reads its own keys from an `[[element]]` table into a frozen `params`
dataclass (lengths in mm), turns the params into a `BendPath` for a conductor
of a given outside diameter, and reports the problems it can see in its own
dimensions as findings. It also names its governing length (the one a tuner
scales to move the resonance) and can return params with that length changed.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Callable

from ...config import Section
from ...errors import DesignError, Finding
from ..path import BendPath

__all__ = ["ShapeSpec", "pick_one", "spacing_centre", "gap_and_offset", "arc_angle_of_chord",
           "centre_to_centre"]


@dataclass(frozen=True)
class ShapeSpec:
    name: str
    summary: str
    keys: tuple[str, ...]  # every key `read` may take from the element table
    read: Callable[[Section], Any]
    build: Callable[[Any, float], BendPath]
    problems: Callable[[Any, float], list[Finding]]
    governing: Callable[[Any], tuple[str, float]]
    with_governing: Callable[[Any, float], Any]
    has_feed: bool


def pick_one(sec: Section, keys: tuple[str, ...]) -> tuple[str, float]:
    """Exactly one of `keys` (all lengths) must be present; returns (key, mm)."""
    present = [k for k in keys if sec.has(k)]
    sec.mark_used(*keys)
    if len(present) != 1:
        names = " or ".join(f"`{k}`" for k in keys)
        if not present:
            raise DesignError(f"give one of {names}", field=sec.path)
        raise DesignError(f"give only one of {names}, not {' and '.join(present)}",
                          field=sec.path)
    return present[0], sec.length(present[0])


def spacing_centre(sec: Section) -> tuple[str, float]:
    """`spacing` (inside, between conductor surfaces) or `centre_spacing`."""
    return pick_one(sec, ("spacing", "centre_spacing"))


def centre_to_centre(kind: str, spacing_mm: float, diameter_mm: float) -> float:
    """Centre-to-centre spacing (mm) from `spacing` (inside) or `centre_spacing`."""
    return spacing_mm + diameter_mm if kind == "spacing" else spacing_mm


def gap_and_offset(sec: Section, default_gap_mm: float = 10.0) -> tuple[float, float]:
    """`feed_gap` (default 10 mm) and `feed_offset` (signed, default 0) in mm."""
    gap = sec.length("feed_gap", default_gap_mm)
    offset = sec.length("feed_offset", 0.0, allow_zero=True, allow_negative=True)
    return gap, offset


def arc_angle_of_chord(chord: float, radius: float) -> float:
    """Angle (rad) subtended by a chord on a circle."""
    return 2 * math.asin(min(1.0, chord / (2 * radius)))

