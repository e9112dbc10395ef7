"""Jig drawings as SVG for laser software, one file per machine bed.

Plain text written by hand: width and height in millimetres and a viewBox in
millimetres (one user unit = 1 mm), y flipped so the drawing reads the same
way up as the DXF. Same layout, same bytes.

Layers: one top-level group per operation, in the order and with the colours
of the table the DXF writer uses (fabplan.render.operations), so a colour
means the same operation in both files. Each group's id is the DXF layer's
name, and it carries `inkscape:groupmode="layer"` and `inkscape:label`, the
attributes by which Inkscape (and editors that follow it) list a group as a
layer; other editors show the group by its id.

Strokes: hairline for cutting, visible on screen. Every line is drawn with
`vector-effect="non-scaling-stroke"` and a stroke width of 0.5 (`STROKE`):
a non-scaling stroke is measured in the viewer's own pixels, not in the
drawing's millimetres, so it shows as a thin line at any zoom (a 0.025 mm
stroke in drawing units all but vanishes at a whole-bed view), and never
thickens when zoomed in, which is what laser software reading the file by
colour expects of a cut line. Software that ignores vector-effect reads a
0.5 mm stroke: assign operations by colour there, as laser software does,
not by stroke width. Text is filled, without a stroke. The bed's notes are
drawn on the NOTES layer and repeated in <desc>.
"""

from __future__ import annotations

from xml.sax.saxutils import escape, quoteattr

from ..jig.records import Bed, JigLayout
from ..jig.shapes import Arc, Circle, Contour, Line, RefPoint, Shape, Text
from .operations import OPERATIONS, bed_notes

__all__ = ["COLOURS", "STROKE", "INKSCAPE_NS", "bed_to_svg"]

# operation -> stroke colour, from the table the DXF writer shares
COLOURS: dict[str, str] = {op: o.hex for op, o in OPERATIONS.items()}
STROKE = 0.5  # non-scaling stroke width, in the viewer's pixels
INKSCAPE_NS = "http://www.inkscape.org/namespaces/inkscape"


def _n(x: float) -> str:
    s = f"{x:.4f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def bed_to_svg(layout: JigLayout, bed: Bed, status: str = "") -> bytes:
    """One bed of the layout as SVG bytes (UTF-8); `status` (e.g. that the plan
    has errors) goes in the lines the bed keeps free above its notes."""
    W, H = bed.width_mm, bed.height_mm

    def pt(p: tuple[float, float]) -> str:
        return f"{_n(p[0])} {_n(H - p[1])}"

    def arc_to(a: Arc, end_deg: float) -> str:
        sweep = end_deg - a.start_deg
        flag = 0 if sweep > 0 else 1  # y is flipped: counter-clockwise becomes sweep 0
        large = 1 if abs(sweep) > 180 else 0
        return f"A {_n(a.radius)} {_n(a.radius)} 0 {large} {flag} {pt(a.point(end_deg))}"

    def arc_path(a: Arc) -> str:
        parts = [f"M {pt(a.start)}"]
        n = 2 if abs(a.sweep_deg) > 359 else 1
        for i in range(1, n + 1):
            sub = Arc(a.centre, a.radius, a.start_deg + (i - 1) * a.sweep_deg / n,
                      a.sweep_deg / n)
            parts.append(arc_to(sub, sub.start_deg + sub.sweep_deg))
        return " ".join(parts)

    ns = ' vector-effect="non-scaling-stroke"'

    def draw(sh: Shape, out: list[str], role_name: str) -> None:
        role = f" data-role={quoteattr(role_name)}" if role_name else ""
        if isinstance(sh, Line):
            out.append(f'<line{role} x1="{_n(sh.start[0])}" y1="{_n(H - sh.start[1])}" '
                       f'x2="{_n(sh.end[0])}" y2="{_n(H - sh.end[1])}"{ns}/>')
        elif isinstance(sh, Arc):
            out.append(f'<path{role} d="{arc_path(sh)}"{ns}/>')
        elif isinstance(sh, Circle):
            out.append(f'<circle{role} cx="{_n(sh.centre[0])}" cy="{_n(H - sh.centre[1])}" '
                       f'r="{_n(sh.radius)}"{ns}/>')
        elif isinstance(sh, Contour):
            only = sh.segments[0] if len(sh.segments) == 1 else None
            if isinstance(only, Arc) and abs(only.sweep_deg) >= 360 - 1e-9:
                out.append(f'<circle{role} cx="{_n(only.centre[0])}" '
                           f'cy="{_n(H - only.centre[1])}" r="{_n(only.radius)}"{ns}/>')
                return
            d = [f"M {pt(sh.segments[0].start)}"]
            for seg in sh.segments:
                if isinstance(seg, Line):
                    d.append(f"L {pt(seg.end)}")
                else:
                    d.append(arc_path(seg).split(" ", 3)[3])
            out.append(f'<path{role} d="{" ".join(d)} Z"{ns}/>')
        elif isinstance(sh, Text):
            x, y = _n(sh.at[0]), _n(H - sh.at[1])
            rot = f' transform="rotate({_n(-sh.rotation_deg)} {x} {y})"' \
                if sh.rotation_deg % 360 else ""
            out.append(f'<text{role} x="{x}" y="{y}" font-size="{_n(sh.height * 1.4)}"'
                       f'{rot}>{escape(sh.text)}</text>')
        elif isinstance(sh, RefPoint):
            out.append(f'<circle{role} cx="{_n(sh.at[0])}" cy="{_n(H - sh.at[1])}" r="0.5"{ns}>'
                       f'<title>{escape(sh.label)}</title></circle>')

    groups: dict[str, list[str]] = {op: [] for op in COLOURS}
    notes = bed_notes(layout, bed, status)
    for placed in bed.parts:
        for item in placed.items():
            draw(item.shape, groups[item.op], item.role)
    for note in notes:
        draw(note, groups["notes"], "note")
    lines = ['<?xml version="1.0" encoding="UTF-8"?>',
             f'<svg xmlns="http://www.w3.org/2000/svg" xmlns:inkscape="{INKSCAPE_NS}" '
             f'version="1.1" width="{_n(W)}mm" height="{_n(H)}mm" '
             f'viewBox="0 0 {_n(W)} {_n(H)}">',
             f"<title>{escape(layout.title)}: bed {bed.index}</title>",
             f"<desc>{escape(chr(10).join(n.text for n in notes))}</desc>",
             "<!-- one layer per operation: a top-level group with the DXF layer's name as its "
             "id and colour, marked as a layer for vector editors (inkscape:groupmode, "
             "inkscape:label); strokes are non-scaling hairlines -->"]
    for op, o in OPERATIONS.items():
        if not groups[op]:
            continue
        lines.append(f'<g id={quoteattr(o.layer)} inkscape:groupmode="layer" '
                     f'inkscape:label={quoteattr(f"{o.layer} ({o.holds})")} fill="none" '
                     f'stroke={quoteattr(o.hex)} stroke-width="{_n(STROKE)}" '
                     'font-family="sans-serif">')
        for el in groups[op]:
            if el.startswith("<text"):
                el = el.replace("<text", f'<text fill="{o.hex}" stroke="none"', 1)
            lines.append("  " + el)
        lines.append("</g>")
    lines.append("</svg>")
    return ("\n".join(lines) + "\n").encode("utf-8")
