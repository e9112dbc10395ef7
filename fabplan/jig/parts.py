"""Building blocks of jig parts: holes, text boxes, plates, former discs and the
calibration squares. Lengths in mm; kerf applied as parts are built (outlines
grow and holes shrink by half of it).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from ..design.jig import JigSettings
from ..units import IN
from .records import JigPiece, Part
from .shapes import (
    Arc,
    Circle,
    Contour,
    Item,
    P,
    Text,
    contour_to_polygon,
    offset_contour,
    rounded_rect,
)

__all__ = ["Board", "text_box", "hole", "plate", "fits", "former_parts", "calibration_parts",
           "RECTANGLE_PREFERENCE"]

# a rectangular plate is simpler to cut and clamp: it is chosen unless the convex
# outline saves more than this factor of area (common practice, no source)
RECTANGLE_PREFERENCE = 1.15


@dataclass
class Board:
    """A plate being built: its items and the shapely obstacles already on it."""

    items: list[Item]
    keep_out: list[Any]  # shapely geometries that a cut line, pin or label must avoid
    texts: list[Any]  # shapely boxes of labels
    label_at: P = (0.0, 0.0)  # left end of the label block's first baseline
    label_boxes: tuple[Any, ...] = ()  # shapely boxes of the label block's lines
    cache: dict[str, Any] = field(default_factory=dict)


def text_box(t: Text) -> Any:
    from shapely.geometry import box

    return box(t.at[0], t.at[1] - 0.25 * t.height, t.at[0] + t.width, t.at[1] + 1.1 * t.height)


def hole(centre: P, diameter: float, grow: float, role: str) -> Item:
    return Item("drill", Circle(centre, diameter / 2 - grow), role)


def plate(element: str, kind: str, name: str, items: list[Item],
           rect: tuple[float, float, float, float], s: JigSettings,
           radii: tuple[float, float, float, float]) -> Part:
    g = s.kerf_mm / 2
    contour = offset_contour(rounded_rect(*rect, radii), g)
    return Part(name, kind, element, (Item("cut", contour, "outline"), *items),
                contour_to_polygon(contour))


def fits(part: Part, usable: tuple[float, float]) -> bool:
    x0, y0, x1, y1 = part.bounds()
    w, h = x1 - x0, y1 - y0
    return (w <= usable[0] and h <= usable[1]) or (h <= usable[0] and w <= usable[1])


def former_parts(e: JigPiece, s: JigSettings) -> list[Part]:
    g = s.kerf_mm / 2
    out = []
    for fm in e.forming.formers:
        r = fm.radius_mm
        outline = offset_contour(Contour((Arc((0.0, 0.0), r, 0.0, 360.0),)), g)
        items = [Item("cut", outline, f"former {fm.label}"),
                 hole((0.0, 0.0), s.bolt_hole_mm, g, "bolt-hole")]
        th = min(s.text_height_mm, r / 4)
        label = f"{fm.label} dia {2 * r:.2f}"
        y = s.bolt_hole_mm / 2 + 1.5
        if 0.62 * th * len(label) < 2 * math.sqrt(max(r * r - (y + th) ** 2, 0.0)):
            items.append(Item("engrave", Text((-0.31 * th * len(label), y), label, th), "label"))
        out.append(Part(f"{e.name}: former {fm.label}", "former", e.name, tuple(items),
                        contour_to_polygon(outline)))
    return out


def calibration_parts() -> list[Part]:
    """Engraved squares of 100 mm and 4 in to check the machine's scale."""
    from shapely.geometry import box

    out = []
    for size, label in ((100.0, "100 mm square"), (4 * IN, "4 in square")):
        items = (Item("engrave", rounded_rect(0.0, 0.0, size, size), f"calibration {label}"),
                 Item("engrave", Text((5.0, size / 2), label, 5.0), "label"))
        out.append(Part(f"calibration {label}", "calibration", "", items,
                        box(-1.0, -1.0, size + 1.0, size + 1.0)))
    return out
