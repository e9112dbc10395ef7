"""What the jig's DXF and SVG writers share: the operations' layers and colours,
and the notes of a bed.

Laser and router software assign an operation (cut, drill, engrave) by the
colour of a line, so the DXF and the SVG writers both read this one table: the
DXF layer gets the AutoCAD Colour Index (ACI) number, the SVG the RGB of that
same index in the standard ACI palette (1 red, 5 blue, 3 green, 8 grey,
6 magenta), so that a colour means the same operation in both files.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..jig.records import Bed, JigLayout
from ..jig.shapes import Op, Text
from ..units import wrap_words

__all__ = ["Operation", "OPERATIONS", "bed_notes"]


@dataclass(frozen=True)
class Operation:
    """One operation's layer: its name, ACI colour, the RGB of that colour,
    whether a machine runs it, and what it holds."""

    op: Op
    layer: str
    aci: int
    rgb: tuple[int, int, int]
    machined: bool
    holds: str

    @property
    def hex(self) -> str:
        return "#{:02x}{:02x}{:02x}".format(*self.rgb)


# source: the standard ACI palette (ACI 1 = 255,0,0; 3 = 0,255,0; 5 = 0,0,255;
# 6 = 255,0,255; 8 = 128,128,128), checked against ezdxf's aci2rgb in the tests
# one row per operation of fabplan.jig.shapes.OPERATIONS, in its order
OPERATIONS: dict[Op, Operation] = {
    "cut": Operation("cut", "JIG_CUT", 1, (255, 0, 0), True, "outlines to cut through"),
    "drill": Operation("drill", "JIG_DRILL", 5, (0, 0, 255), True, "holes to drill"),
    "engrave": Operation("engrave", "JIG_ENGRAVE", 3, (0, 255, 0), True,
                         "lines and text to engrave"),
    "reference": Operation("reference", "JIG_REFERENCE", 8, (128, 128, 128), False,
                           "references: do not machine"),
    "notes": Operation("notes", "JIG_NOTES", 6, (255, 0, 255), False,
                       "notes: do not machine"),
}


def bed_notes(layout: JigLayout, bed: Bed, status: str = "") -> list[Text]:
    """The bed's notes, under `status` (e.g. that the plan has errors) set in
    the lines the jig stage keeps free for it at the top of the bed."""
    lines = wrap_words(status, layout.note_chars) if status else []
    return [*(Text(at, line, layout.note_height_mm) for at, line in zip(bed.status_at, lines)),
            *bed.notes]
