"""What the jig stage adds to the Plan: parts laid out on machine beds.

Every length is millimetres. A `Part` is one piece to make (a plate, a
former disc, a splice, a mandrel drawing), a set of `Item`s in its own frame;
a `Bed` holds parts placed without overlap; the `JigLayout` holds the beds and
the findings about them.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from ..design.jig import JigSettings
from ..errors import Finding
from ..forming.records import ElementForming
from ..geometry.path import BendPath
from ..lengths.records import BendRow, PieceCore
from .shapes import Item, P, Text, transform_shape

__all__ = ["JigPiece", "Part", "Placed", "Bed", "JigLayout"]


@dataclass(frozen=True)
class JigPiece:
    """One piece of stock to make a jig for: its name on the drawings, its core
    figures and how it is formed."""

    name: str
    core: PieceCore
    forming: ElementForming

    @property
    def path(self) -> BendPath:
        return self.core.path

    @property
    def bends(self) -> tuple[BendRow, ...]:
        return self.core.bends

    @property
    def planar(self) -> bool:
        return self.core.planar

    @property
    def conductor_diameter_mm(self) -> float:
        return self.core.conductor_diameter_mm

    @property
    def stock_description(self) -> str:
        return self.core.stock.description


@dataclass(frozen=True)
class Part:
    """One piece to make (or a drawing to keep), in its own frame (mm)."""

    name: str
    kind: str  # plate, section, end-plate, former, splice, spacing-bar, pitch-guide, mandrel,
    #            calibration
    element: str
    items: tuple[Item, ...]
    outline: Any = field(compare=False, repr=False)  # shapely Polygon: extent incl. kerf

    def bounds(self) -> tuple[float, float, float, float]:
        return tuple(self.outline.bounds)


@dataclass(frozen=True)
class Placed:
    """A part on a bed: turned 90 degrees counter-clockwise when `rotated`,
    then moved by (dx, dy) mm."""

    part: Part
    dx: float
    dy: float
    rotated: bool = False

    def items(self) -> list[Item]:
        return [Item(i.op, transform_shape(i.shape, self.rotated, self.dx, self.dy), i.role)
                for i in self.part.items]

    def outline(self) -> Any:
        from shapely import affinity

        g = self.part.outline
        if self.rotated:
            g = affinity.rotate(g, 90.0, origin=(0.0, 0.0))
        return affinity.translate(g, self.dx, self.dy)


@dataclass(frozen=True)
class Bed:
    """One machine bed: its parts, and the notes in the strip kept free for them
    along its top edge (text placed in the bed's frame, mm). `status_at` are the
    left ends of the baselines kept free above the notes for a line a renderer
    may add (e.g. that the plan has errors), each of at most
    `JigLayout.note_chars` characters of `JigLayout.note_height_mm`."""

    index: int  # 1-based
    width_mm: float
    height_mm: float
    parts: tuple[Placed, ...]
    notes: tuple[Text, ...] = ()
    status_at: tuple[P, ...] = ()


@dataclass(frozen=True)
class JigLayout:
    """The beds of every piece's jig. `notes` are the notes every bed carries
    (as text, also placed on each bed); `note_height_mm` and `note_chars` are
    the notes' text height and line length on the beds."""

    title: str
    settings: JigSettings
    beds: tuple[Bed, ...]
    findings: tuple[Finding, ...]
    notes: tuple[str, ...] = ()
    note_height_mm: float = 3.5
    note_chars: int = 80
