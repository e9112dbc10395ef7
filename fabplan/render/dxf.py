"""Jig drawings as DXF (R2013), one file per machine bed, at full size.

Reads a `JigLayout` (millimetres) and writes it in the drawing unit the shop
asked for: $INSUNITS 4 (mm) or 1 (inch), every coordinate scaled to match.
One layer per operation, coloured from the table shared with the SVG writer
(fabplan.render.operations); arcs are true ARC/CIRCLE entities or bulged
LWPOLYLINE segments; closed contours are closed polylines. The notes are the
bed's own, placed by the jig stage inside the bed. The same layout gives the
same bytes (fixed header timestamps and GUIDs).
"""

from __future__ import annotations

import io
import math

from ..jig.records import Bed, JigLayout
from ..jig.shapes import Arc, Circle, Contour, Line, RefPoint, Text
from ..units import IN
from .operations import OPERATIONS, bed_notes

__all__ = ["LAYERS", "INSUNITS", "bed_to_dxf"]

# operation -> (layer name, ACI colour), from the table the SVG writer shares
LAYERS: dict[str, tuple[str, int]] = {op: (o.layer, o.aci) for op, o in OPERATIONS.items()}
# DXF $INSUNITS codes (DXF reference, header section): 1 inch, 4 millimetre
INSUNITS = {"in": 1, "mm": 4}


def _bulge_points(c: Contour, k: float) -> list[tuple[float, float, float]]:
    pts = []
    for seg in c.segments:
        if isinstance(seg, Line):
            pts.append((seg.start[0] * k, seg.start[1] * k, 0.0))
            continue
        n = max(1, math.ceil(abs(seg.sweep_deg) / 90.0 - 1e-9))
        step = seg.sweep_deg / n
        for i in range(n):
            p = seg.point(seg.start_deg + i * step)
            pts.append((p[0] * k, p[1] * k, math.tan(math.radians(step) / 4)))
    return pts


def bed_to_dxf(layout: JigLayout, bed: Bed, status: str = "") -> bytes:
    """One bed of the layout as DXF bytes; `status` (e.g. that the plan has
    errors) goes in the lines the bed keeps free above its notes."""
    import ezdxf

    old = ezdxf.options.write_fixed_meta_data_for_testing
    # fixed creation/update dates, GUIDs and ezdxf marker: same layout, same bytes
    ezdxf.options.write_fixed_meta_data_for_testing = True
    try:
        return _bed_to_dxf(layout, bed, status)
    finally:
        ezdxf.options.write_fixed_meta_data_for_testing = old


def _bed_to_dxf(layout: JigLayout, bed: Bed, status: str) -> bytes:
    import ezdxf

    units = layout.settings.units
    k = 1.0 / IN if units == "in" else 1.0
    doc = ezdxf.new("R2013", setup=False, units=INSUNITS[units])
    doc.header["$MEASUREMENT"] = 0 if units == "in" else 1
    for name, colour in LAYERS.values():
        doc.layers.add(name, color=colour)
    msp = doc.modelspace()

    def attrs(op: str) -> dict[str, str]:
        return {"layer": LAYERS[op][0]}

    for placed in bed.parts:
        for item in placed.items():
            sh, a = item.shape, attrs(item.op)
            if isinstance(sh, Line):
                msp.add_line((sh.start[0] * k, sh.start[1] * k), (sh.end[0] * k, sh.end[1] * k),
                             dxfattribs=a)
            elif isinstance(sh, Arc):
                s, e = sh.ccw_angles()
                msp.add_arc((sh.centre[0] * k, sh.centre[1] * k), sh.radius * k, s % 360,
                            e % 360 if abs(e - s) < 360 else (s % 360) + 360, dxfattribs=a)
            elif isinstance(sh, Circle):
                msp.add_circle((sh.centre[0] * k, sh.centre[1] * k), sh.radius * k,
                               dxfattribs=a)
            elif isinstance(sh, Contour):
                only = sh.segments[0] if len(sh.segments) == 1 else None
                if isinstance(only, Arc) and abs(only.sweep_deg) >= 360 - 1e-9:
                    msp.add_circle((only.centre[0] * k, only.centre[1] * k), only.radius * k,
                                   dxfattribs=a)
                else:
                    msp.add_lwpolyline(_bulge_points(sh, k), format="xyb", close=True,
                                       dxfattribs=a)
            elif isinstance(sh, Text):
                msp.add_text(sh.text, height=sh.height * k, rotation=sh.rotation_deg % 360,
                             dxfattribs={**a, "insert": (sh.at[0] * k, sh.at[1] * k)})
            elif isinstance(sh, RefPoint):
                msp.add_point((sh.at[0] * k, sh.at[1] * k), dxfattribs=a)
    w, h = bed.width_mm * k, bed.height_mm * k
    msp.add_lwpolyline([(0, 0), (w, 0), (w, h), (0, h)], close=True,
                       dxfattribs=attrs("reference"))
    for sh in bed_notes(layout, bed, status):
        msp.add_text(sh.text, height=sh.height * k,
                     dxfattribs={**attrs("notes"), "insert": (sh.at[0] * k, sh.at[1] * k)})
    # register the CLASS records in a fixed order (ezdxf adds those of the
    # entity types in use from a set, whose order varies between runs)
    for dxftype in sorted(doc.entitydb.dxf_types_in_use()):
        doc.classes.add_class(dxftype)
    stream = io.StringIO()
    doc.write(stream)
    return stream.getvalue().encode("utf-8")
