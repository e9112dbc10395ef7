"""Jig drawings as SVG for laser software, one file per machine bed.

Plain text written by hand: width and height in millimetres and a viewBox in
millimetres (one user unit = 1 mm), y flipped so the drawing reads the same
way up as the DXF. Hairline strokes, one colour per operation (cut red, drill
blue, engrave black, reference green; notes go in <desc>). Same layout, same
bytes.
"""

from __future__ import annotations

from xml.sax.saxutils import escape, quoteattr

from ..jig.records import Bed, JigLayout
from ..jig.shapes import Arc, Circle, Contour, Line, RefPoint, Text

__all__ = ["COLOURS", "HAIRLINE_MM", "bed_to_svg"]

COLOURS: dict[str, str] = {
    "cut": "#ff0000",
    "drill": "#0000ff",
    "engrave": "#000000",
    "reference": "#00ff00",
    "notes": "#ff00ff",
}
HAIRLINE_MM = 0.025  # about 0.001 in: read as a hairline (cut line) by laser software


def _n(x: float) -> str:
    s = f"{x:.4f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def bed_to_svg(layout: JigLayout, bed: Bed) -> bytes:
    """One bed of the layout as SVG bytes (UTF-8)."""
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

    groups: dict[str, list[str]] = {op: [] for op in COLOURS}
    for placed in bed.parts:
        for item in placed.items():
            sh, out = item.shape, groups[item.op]
            role = f" data-role={quoteattr(item.role)}" if item.role else ""
            if isinstance(sh, Line):
                out.append(f'<line{role} x1="{_n(sh.start[0])}" y1="{_n(H - sh.start[1])}" '
                           f'x2="{_n(sh.end[0])}" y2="{_n(H - sh.end[1])}"/>')
            elif isinstance(sh, Arc):
                out.append(f'<path{role} d="{arc_path(sh)}"/>')
            elif isinstance(sh, Circle):
                out.append(f'<circle{role} cx="{_n(sh.centre[0])}" cy="{_n(H - sh.centre[1])}" '
                           f'r="{_n(sh.radius)}"/>')
            elif isinstance(sh, Contour):
                only = sh.segments[0] if len(sh.segments) == 1 else None
                if isinstance(only, Arc) and abs(only.sweep_deg) >= 360 - 1e-9:
                    out.append(f'<circle{role} cx="{_n(only.centre[0])}" '
                               f'cy="{_n(H - only.centre[1])}" r="{_n(only.radius)}"/>')
                    continue
                d = [f"M {pt(sh.segments[0].start)}"]
                for seg in sh.segments:
                    if isinstance(seg, Line):
                        d.append(f"L {pt(seg.end)}")
                    else:
                        d.append(arc_path(seg).split(" ", 3)[3])
                out.append(f'<path{role} d="{" ".join(d)} Z"/>')
            elif isinstance(sh, Text):
                x, y = _n(sh.at[0]), _n(H - sh.at[1])
                rot = f' transform="rotate({_n(-sh.rotation_deg)} {x} {y})"' \
                    if sh.rotation_deg % 360 else ""
                out.append(f'<text{role} x="{x}" y="{y}" font-size="{_n(sh.height * 1.4)}"'
                           f'{rot}>{escape(sh.text)}</text>')
            elif isinstance(sh, RefPoint):
                out.append(f'<circle{role} cx="{_n(sh.at[0])}" cy="{_n(H - sh.at[1])}" r="0.5">'
                           f'<title>{escape(sh.label)}</title></circle>')
    notes = "\n".join([*layout.notes, *bed.notes])
    lines = ['<?xml version="1.0" encoding="UTF-8"?>',
             f'<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="{_n(W)}mm" '
             f'height="{_n(H)}mm" viewBox="0 0 {_n(W)} {_n(H)}">',
             f"<title>{escape(layout.title)}: bed {bed.index}</title>",
             f"<desc>{escape(notes)}</desc>"]
    for op, colour in COLOURS.items():
        if not groups[op]:
            continue
        lines.append(f'<g id={quoteattr(op)} fill="none" stroke={quoteattr(colour)} '
                     f'stroke-width="{_n(HAIRLINE_MM)}" font-family="sans-serif">')
        for el in groups[op]:
            if el.startswith("<text"):
                el = el.replace("<text", f'<text fill="{colour}" stroke="none"', 1)
            lines.append("  " + el)
        lines.append("</g>")
    lines.append("</svg>")
    return ("\n".join(lines) + "\n").encode("utf-8")
