"""Closed sets of words that both a design file and the command line take, in a
module without imports, so that the command line can list them as choices without
loading the design reader."""

from __future__ import annotations

from typing import Literal

__all__ = ["DrawingUnit", "DRAWING_UNITS"]

DrawingUnit = Literal["mm", "in"]
DRAWING_UNITS: tuple[DrawingUnit, ...] = ("mm", "in")
