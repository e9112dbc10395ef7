"""What a jig part is drawn with: the exact flat shapes of fabplan.geometry.planar
(lines, true arcs, circles, contours), text and reference points, each tagged
with the operation that makes it (cut, drill, engrave, reference, notes).

Every coordinate is millimetres in the part's own frame; angles are degrees,
counter-clockwise from +x.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from ..geometry.planar import (
    Arc,
    Circle,
    Contour,
    Line,
    P,
    Segment,
    clip_arc_x,
    clip_line_x,
    contour_to_polygon,
    inside_corners,
    offset_contour,
    rounded_rect,
)

__all__ = ["P", "Op", "OPERATIONS", "SAFE_CHAR_WIDTH", "Line", "Arc", "Circle", "Contour",
           "Text", "RefPoint", "Item", "Segment", "Shape", "offset_contour", "rounded_rect",
           "contour_to_polygon", "transform_shape", "clip_line_x", "clip_arc_x", "inside_corners"]

Op = Literal["cut", "drill", "engrave", "reference", "notes"]
# sans-serif capitals and figures run to about 0.8 of the text height per
# character (common practice for sizing text boxes, no source; the tests
# measure drawn text with ezdxf's own text extents)
SAFE_CHAR_WIDTH = 0.8
OPERATIONS: tuple[Op, ...] = ("cut", "drill", "engrave", "reference", "notes")


@dataclass(frozen=True)
class Text:
    """One line of text; `at` is the left end of its baseline (mm)."""

    at: P
    text: str
    height: float
    rotation_deg: float = 0.0

    @property
    def width(self) -> float:
        """Estimated width (mm) for placement: 0.62 x height per character."""
        return 0.62 * self.height * len(self.text)

    @property
    def safe_width(self) -> float:
        """A width (mm) the text does not exceed in a wide sans-serif face:
        `SAFE_CHAR_WIDTH` x height per character; for keeping text inside a
        part or a bed and clear of other things."""
        return SAFE_CHAR_WIDTH * self.height * len(self.text)


@dataclass(frozen=True)
class RefPoint:
    """A named reference point (e.g. the datum of the element's coordinates)."""

    at: P
    label: str


Shape = Line | Arc | Circle | Contour | Text | RefPoint


@dataclass(frozen=True)
class Item:
    """One shape and the operation that makes it; `role` tells what it is
    (e.g. "outline", "bolt-hole", "pin-hole", "former", "mark", "centreline")."""

    op: Op
    shape: Shape
    role: str = ""


def _tp(p: P, rotated: bool, dx: float, dy: float) -> P:
    x, y = (-p[1], p[0]) if rotated else p
    return (x + dx, y + dy)


def transform_shape(shape: Shape, rotated: bool, dx: float, dy: float) -> Shape:
    """The shape turned 90 degrees counter-clockwise (when `rotated`) about the
    origin, then moved by (dx, dy) mm."""
    turn = 90.0 if rotated else 0.0
    if isinstance(shape, Line):
        return Line(_tp(shape.start, rotated, dx, dy), _tp(shape.end, rotated, dx, dy))
    if isinstance(shape, Arc):
        return Arc(_tp(shape.centre, rotated, dx, dy), shape.radius, shape.start_deg + turn,
                   shape.sweep_deg)
    if isinstance(shape, Circle):
        return Circle(_tp(shape.centre, rotated, dx, dy), shape.radius)
    if isinstance(shape, Contour):
        return Contour(tuple(transform_shape(s, rotated, dx, dy)  # type: ignore[misc]
                             for s in shape.segments))
    if isinstance(shape, Text):
        return Text(_tp(shape.at, rotated, dx, dy), shape.text, shape.height,
                    shape.rotation_deg + turn)
    return RefPoint(_tp(shape.at, rotated, dx, dy), shape.label)


