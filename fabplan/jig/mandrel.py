"""A helix's jig: a pitch guide to cut and a winding mandrel drawn to size.

The mandrel's diameter is the forming stage's former (springback-compensated);
the guide has a notch for each turn at the pitch.
"""

from __future__ import annotations

import math

from ..design.jig import JigSettings
from ..errors import Finding
from ..units import format_drawing_length
from .records import JigPiece, Part
from .shapes import Arc, Contour, Item, Line, Text, contour_to_polygon, offset_contour, rounded_rect

__all__ = ["helix_parts"]


def helix_parts(e: JigPiece, s: JigSettings) -> tuple[list[Part], list[Finding]]:
    from shapely.geometry import box

    f = e.forming
    row = next(b for b in e.bends if b.pitch_mm)
    bf = f.bend(row.index)
    d = e.conductor_diameter_mm
    g = s.kerf_mm / 2
    turns = row.angle_deg / 360.0
    pitch = row.pitch_mm
    mandrel_d = 2 * bf.former_radius_mm
    coil = turns * pitch
    units = s.units
    # the pitch guide: a strip with a notch for each turn, laid along the mandrel
    n = math.floor(turns + 1e-9) + 1
    nr = d / 2
    end = max(10.0, nr + 6.0)
    length = (n - 1) * pitch + 2 * end
    height = max(20.0, 3 * d)
    segs: list[Line | Arc] = [Line((0.0, 0.0), (length, 0.0)), Line((length, 0.0),
                                                                 (length, height))]
    x = length
    for i in reversed(range(n)):
        cx = end + i * pitch
        segs.append(Line((x, height), (cx + nr, height)))
        segs.append(Arc((cx, height), nr, 0.0, -180.0))
        x = cx - nr
    segs.append(Line((x, height), (0.0, height)))
    segs.append(Line((0.0, height), (0.0, 0.0)))
    outline = offset_contour(Contour(tuple(segs)), g)
    th = min(s.text_height_mm, height / 4)
    items = [Item("cut", outline, "outline"),
             Item("engrave", Text((end, height / 4), f"{e.name}: pitch guide, pitch "
                                  f"{format_drawing_length(pitch, units)}", th), "label")]
    guide = Part(f"{e.name}: pitch guide", "pitch-guide", e.name, tuple(items),
                 contour_to_polygon(outline))
    # the mandrel, drawn to size as a reference (turned or cut from round bar)
    w = coil
    mitems: list[Item] = [Item("reference", rounded_rect(0.0, 0.0, w, mandrel_d),
                               "mandrel")]
    for i in range(n):
        xi = i * pitch
        if xi + pitch / 2 > coil + 1e-9:  # the front half of a turn lies on the mandrel
            break
        mitems.append(Item("reference", Line((xi, 0.0), (xi + pitch / 2, mandrel_d)), "turn"))
    lines = [f"{e.name}: winding mandrel (not to cut from plate)",
             f"mandrel dia {format_drawing_length(mandrel_d, units)} (springback-compensated)",
             f"{turns:g} turns at pitch {format_drawing_length(pitch, units)}, coil length "
             f"{format_drawing_length(coil, units)}",
             f"stock: {e.stock_description}"]
    yt = -4.0 - s.text_height_mm
    for text in lines:
        mitems.append(Item("notes", Text((0.0, yt), text, s.text_height_mm), "label"))
        yt -= 1.6 * s.text_height_mm
    wide = max(w, max(0.62 * s.text_height_mm * len(t) for t in lines))
    mandrel = Part(f"{e.name}: winding mandrel", "mandrel", e.name, tuple(mitems),
                   box(-1.0, yt, wide + 1.0, mandrel_d + 1.0))
    parts = [guide, mandrel]
    findings = []
    if bf.former_radius_mm <= 0:
        findings.append(Finding("jig-mandrel", "error", "the mandrel radius is not positive",
                                e.name))
    return parts, findings
