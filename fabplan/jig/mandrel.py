"""A helix's jig: a pitch guide to cut and a winding mandrel drawn to size.

The mandrel's diameter is the forming stage's former (springback-compensated);
the guide has a notch for each turn at the pitch, as wide as the wire plus the
design's notch clearance (`[jig] notch_clearance`), so the wire drops in and the
guide comes off the finished coil; its label states both figures.
"""

from __future__ import annotations

import math

from ..design.jig import JigSettings
from ..errors import Finding
from ..units import format_drawing_length
from .records import JigPiece, Part
from .shapes import (
    Arc,
    Contour,
    Item,
    Line,
    Text,
    contour_to_polygon,
    offset_contour,
    rounded_rect,
)

__all__ = ["helix_parts", "MAX_TURNS"]

MAX_TURNS = 500  # notches on one pitch guide


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
    reach = (n - 1) * pitch
    if n > MAX_TURNS or reach > max(s.bed_mm):
        return [], [Finding("jig-too-big", "error",
                            f"the pitch guide for {turns:g} turns at {pitch:g} mm pitch would be "
                            f"over {reach:.0f} mm long with {n} notches, more than the "
                            f"{s.bed_mm[0]:.0f} x {s.bed_mm[1]:.0f} mm bed takes (or the "
                            f"{MAX_TURNS} notches the jig stage draws); use a larger bed, or "
                            "wind the coil on a mandrel marked at the pitch", e.name)]
    notch = d + s.notch_clearance_mm
    nr = notch / 2
    end = max(10.0, nr + 6.0)
    th = s.text_height_mm
    label = [f"{e.name}: pitch guide",
             f"pitch {format_drawing_length(pitch, units)}",
             f"notch {format_drawing_length(notch, units)}: wire "
             f"{format_drawing_length(d, units)} + {s.notch_clearance_mm:.2f} mm clearance"]
    label_w = max(Text((0.0, 0.0), t, th).safe_width for t in label)
    length = max((n - 1) * pitch + 2 * end, label_w + 8.0)
    height = max(20.0, 3 * d, nr + 4.0 + len(label) * 1.6 * th + 2.0)
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
    items = [Item("cut", outline, "outline")]
    y = height - nr - 2.0 - 1.1 * th
    for text in label:
        items.append(Item("engrave", Text((4.0, y), text, th), "label"))
        y -= 1.6 * th
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
    wide = max(w, max(Text((0.0, 0.0), t, s.text_height_mm).safe_width for t in lines))
    mandrel = Part(f"{e.name}: winding mandrel", "mandrel", e.name, tuple(mitems),
                   box(-1.0, yt, wide + 1.0, mandrel_d + 1.0))
    parts = [guide, mandrel]
    findings = []
    if bf.former_radius_mm <= 0:
        findings.append(Finding("jig-mandrel", "error", "the mandrel radius is not positive",
                                e.name))
    return parts, findings
