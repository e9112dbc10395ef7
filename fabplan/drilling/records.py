"""Drilling patterns: the holes of one support, measured from one datum.

A support is a tube (round or square) of a given outside size. Every hole is placed
by its distance along the support from the datum (never from the previous hole, so
errors do not add up) and its angle around the support (degrees, counter-clockwise
seen from the datum end, 0 at the support's alignment line). A through hole is
drilled across the support: its exit lies 180 degrees round. Lengths in mm.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

__all__ = ["Hole", "DrillPattern"]


@dataclass(frozen=True)
class Hole:
    """One hole: its label, distance from the datum (mm), angle round the support
    (deg), diameter (mm), whether it goes through (the far side's exit at +180 deg),
    and what it is for."""

    label: str
    from_datum_mm: float
    angle_deg: float
    diameter_mm: float
    through: bool = True
    purpose: str = ""


@dataclass(frozen=True)
class DrillPattern:
    """The holes of one support: its name, section ("round" or "square"), outside
    diameter or width (mm), length (mm), what the datum is, and the holes in order
    from the datum."""

    name: str
    section: Literal["round", "square"]
    outside_mm: float
    length_mm: float
    datum: str
    holes: tuple[Hole, ...]

    @property
    def circumference_mm(self) -> float:
        """The distance round the support (mm): pi x D, or 4 x the width."""
        import math

        return math.pi * self.outside_mm if self.section == "round" else 4 * self.outside_mm
