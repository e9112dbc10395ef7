"""The PDF build sheet: one document that tells a builder everything, in order.

Sections: title block, stock and material, cut list, then per element the marks
and bend table, the bending steps, a drawing to scale and the jig's formers;
then the bill of material and cutting plan, the electrical check, findings and
safety cautions. Sections of later stages (forming, estimate, jig, electrical)
appear only when the Plan has them. Every table states its units; every page
carries its number. The bytes depend only on the Plan (reportlab invariant
mode: no dates, fixed document id).

The sheet reads the Plan and places text and lines; it decides no engineering
figure. Units: millimetres from the Plan, points on the page.
"""

from __future__ import annotations

import io
import math
from pathlib import Path

from .. import __version__
from ..units import format_frequency, format_inches, format_mm
from .fullscale import (PAPERS, PT_PER_MM, SHEET_PAPERS, element_geometry, mark_ids,
                        merge_labels, paper_size, prim_points, side_text)

__all__ = ["sheet_pdf", "SAFETY", "DRAWING_SCALES"]

# preferred drawing scales (1:n), smallest reduction first
DRAWING_SCALES = (1, 2, 2.5, 4, 5, 10, 20, 25, 50, 100)

SAFETY = (
    ("Power lines", "Keep every antenna, mast and ladder well clear of overhead power lines: "
     "site it so that nothing can reach a line if it falls or swings. Contact with a power line "
     "kills. Electrical codes forbid antennas over or near power conductors."),
    ("RF exposure", "Before transmitting, evaluate the station's RF exposure against your "
     "national limits (for example 47 CFR 1.1310 in the USA, or ICNIRP guidelines). Keep people "
     "away from the element while it radiates."),
    ("Lightning and grounding", "Bond the mast and a coaxial discharge unit to the building's "
     "grounding electrode system as your local electrical code requires. Disconnect feed lines "
     "when storms threaten."),
    ("Ladders and roofs", "Set a ladder at about 4 to 1, tie it off, and never work on a roof "
     "or tower alone. Use fall protection where required."),
    ("Hot solder and flux", "A soldering iron or torch burns; solder in ventilation, keep flux "
     "fumes away from your face, and wash your hands after handling lead solder."),
    ("Sharp cut ends", "Wear eye protection when cutting and bending: wire ends spring. Deburr "
     "every cut end and cap exposed ends."),
)
SAFETY_FOOTNOTE = ("These are reminders, not a complete safety guide. Local codes and licensed "
                   "practice come first: follow them where they differ from anything here.")


def _fmt_in(mm: float, den: int) -> str:
    return format_inches(mm, den)


class _Ctx:
    """Styles and formatting shared by the section builders."""

    def __init__(self, plan, paper: str) -> None:
        from reportlab.lib import colors
        from reportlab.lib.styles import ParagraphStyle, getSampleStyleSheet

        self.plan = plan
        self.den = plan.design.shop.fraction
        self.unit = plan.design.shop.units
        self.paper = paper
        ss = getSampleStyleSheet()
        self.colors = colors
        self.h1 = ParagraphStyle("h1", parent=ss["Heading1"], fontSize=15, leading=18,
                                 spaceAfter=4, spaceBefore=0)
        self.h2 = ParagraphStyle("h2", parent=ss["Heading2"], fontSize=12, leading=14,
                                 spaceBefore=10, spaceAfter=4, keepWithNext=1)
        self.h3 = ParagraphStyle("h3", parent=ss["Heading3"], fontSize=10, leading=12,
                                 spaceBefore=6, spaceAfter=3, keepWithNext=1)
        self.body = ParagraphStyle("body", parent=ss["BodyText"], fontSize=8.5, leading=10.5,
                                   spaceAfter=3)
        self.small = ParagraphStyle("small", parent=self.body, fontSize=7.5, leading=9)
        self.caption = ParagraphStyle("caption", parent=self.small, keepWithNext=1)
        self.cell = ParagraphStyle("cell", parent=self.body, fontSize=8, leading=9.5,
                                   spaceAfter=0)
        self.cellr = ParagraphStyle("cellr", parent=self.cell, alignment=2)
        self.pw, self.ph = (v * PT_PER_MM for v in PAPERS[paper])
        self.margin = 15 * PT_PER_MM
        self.frame_w = self.pw - 2 * self.margin

    def L(self, mm: float) -> str:
        """Both units, the shop's first: `27 15/16" (709.3 mm)`."""
        if self.unit == "in":
            return f"{format_inches(mm, self.den)} ({format_mm(mm)})"
        return f"{format_mm(mm)} ({format_inches(mm, self.den)})"

    def L2(self, mm: float):
        """Both units on two lines of a right-aligned table cell."""
        from reportlab.platypus import Paragraph

        first, second = self.L(mm).split(" (", 1)
        return Paragraph(f"{_esc(first)}<br/>({_esc(second)}", self.cellr)

    def p(self, text: str, style=None):
        from reportlab.platypus import Paragraph

        return Paragraph(_esc(text), style or self.body)

    def table(self, head: list[str], rows: list[list], widths: list[float] | None = None,
              align: str | None = None, caption: str | None = None):
        """A table with a header row; `widths` are fractions of the frame width;
        `align` one 'l' or 'r' per column. Returns a list of flowables."""
        from reportlab.pdfbase.pdfmetrics import stringWidth
        from reportlab.platypus import Paragraph, Table, TableStyle

        align = align or "l" * len(head)
        col_w = None if widths is None else [w * self.frame_w for w in widths]
        room = col_w or [self.frame_w / len(head)] * len(head)

        def cell(c, a, w):
            if not isinstance(c, str):
                return c
            # short figures stay plain text (quick to lay out); anything that
            # might not fit its column wraps as a paragraph
            if "\n" not in c and stringWidth(c, "Helvetica", 8) <= w - 7:
                return c
            return Paragraph(_esc(c), self.cellr if a == "r" else self.cell)

        cells = [[Paragraph(f"<b>{_esc(h)}</b>", self.cellr if a == "r" else self.cell)
                  for h, a in zip(head, align)]]
        for row in rows:
            cells.append([cell(c, a, w) for c, a, w in zip(row, align, room)])
        t = Table(cells, colWidths=col_w, repeatRows=1, hAlign="LEFT")
        t.setStyle(TableStyle([
            ("GRID", (0, 0), (-1, -1), 0.4, self.colors.Color(0.6, 0.6, 0.6)),
            ("BACKGROUND", (0, 0), (-1, 0), self.colors.Color(0.88, 0.88, 0.88)),
            ("VALIGN", (0, 0), (-1, -1), "TOP"),
            ("FONT", (0, 1), (-1, -1), "Helvetica", 8, 9.5),
            ("TOPPADDING", (0, 0), (-1, -1), 2), ("BOTTOMPADDING", (0, 0), (-1, -1), 2),
            ("LEFTPADDING", (0, 0), (-1, -1), 3), ("RIGHTPADDING", (0, 0), (-1, -1), 3),
        ] + [("ALIGN", (i, 1), (i, -1), "RIGHT") for i, a in enumerate(align) if a == "r"]
            + [("VALIGN", (0, 1), (-1, -1), "TOP")]))
        out = []
        if caption:
            out.append(self.p(caption, self.caption))
        out.append(t)
        return out


def _num(x: float, places: int = 1) -> str:
    """A figure to `places` decimals, never "-0.0"."""
    v = round(x, places)
    return f"{0.0 if v == 0 else v:.{places}f}"


def _esc(text: str) -> str:
    return str(text).replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


# -- sections -----------------------------------------------------------------------
def _title(ctx: _Ctx) -> list:
    from reportlab.platypus import Spacer

    plan = ctx.plan
    d = plan.design
    total = sum(e.quantity for e in plan.elements)
    units = (f"inches to 1/{ctx.den} first, mm in brackets" if ctx.unit == "in"
             else f"mm first, inches (1/{ctx.den}) in brackets")
    rows = [["Project", d.project, "", ""],
            ["Design file", Path(d.source).name, "Made by", f"fabplan {__version__}"],
            ["Elements", f"{len(plan.elements)} kind(s), {total} piece(s)", "Shop units", units],
            ["Stock", plan.stock.description, "Saw kerf", ctx.L(d.shop.kerf_mm)]]
    if d.notes:
        rows.insert(1, ["Notes", d.notes, "", ""])
    out = [ctx.p(f"Build sheet: {d.project}", ctx.h1)]
    errors = sum(f.severity == "error" for f in plan.findings)
    if errors:
        from reportlab.lib.styles import ParagraphStyle

        warn = ParagraphStyle("warn", parent=ctx.body, fontSize=10, leading=13,
                              textColor=ctx.colors.Color(0.7, 0.05, 0.05),
                              borderColor=ctx.colors.Color(0.7, 0.05, 0.05), borderWidth=1,
                              borderPadding=4, spaceBefore=4, spaceAfter=8)
        out.append(ctx.p(f"NOT BUILDABLE AS IT STANDS: {errors} error finding(s). Read the "
                         "Findings section and change the design before cutting any stock.",
                         warn))
    out += ctx.table(["item", "value", "item", "value"], rows, [0.13, 0.42, 0.12, 0.33])
    tbl = out[-1]
    from reportlab.platypus import TableStyle

    tbl.setStyle(TableStyle([("SPAN", (1, i), (3, i)) for i, r in enumerate(rows, 1)
                             if r[2] == ""]))
    out.append(Spacer(1, 4))
    out.append(ctx.p("Read it in order: cut, mark from the centre of the stock, bend in the "
                     "order given, check against the drawing. Lengths are along the stock's "
                     "neutral axis unless a table says otherwise.", ctx.small))
    return out


def _stock(ctx: _Ctx) -> list:
    s = ctx.plan.stock
    prof = s.profile
    if prof.kind == "round":
        size = f"round, diameter {ctx.L(prof.diameter_mm)}"
    elif prof.kind == "tube":
        size = f"tube, outside diameter {ctx.L(prof.od_mm)}, wall {format_mm(prof.wall_mm, 2)}"
    else:
        size = f"strip {format_mm(prof.width_mm, 2)} x {format_mm(prof.thickness_mm, 2)}"
    m = ctx.plan.design.stock.material
    rows = [["Section", size, s.source],
            ["Material", s.material_name, s.material_source],
            ["Properties", f"density {m.density_kg_m3:g} kg/m3; Young's modulus "
                           f"{m.youngs_modulus_mpa / 1000:g} GPa; yield {m.yield_mpa:g} MPa; "
                           f"resistivity {m.resistivity_ohm_m * 1e8:.2f} micro-ohm cm",
             "as for the material"],
            ["Mass per metre", f"{s.mass_per_m_kg * 1000:.1f} g/m", "from section and density"],
            ["K-factor", f"{s.k_factor:g} (where the neutral axis lies in a bend; 0.5 = on the "
                         "centreline)", "the design" if ctx.plan.design.stock.k_factor_given
             else "default for round stock"]]
    out = [ctx.p("Stock and material", ctx.h2)]
    out += ctx.table(["property", "value (unit)", "source"], rows, [0.2, 0.38, 0.42])
    return out


def _stock_piece(ctx: _Ctx, e) -> str:
    """Which stock pieces an element's cuts come from, as the estimate planned them."""
    order = ctx.plan.order
    if order is None:
        return f"any length of {ctx.plan.stock.description}"
    nums = [str(p.index) for p in order.pieces if any(c.element == e.name for c in p.cuts)]
    if not nums:
        return "see cutting plan"
    return ("stock piece " if len(nums) == 1 else "stock pieces ") + ", ".join(nums)


def _cut_list(ctx: _Ctx) -> list:
    rows = []
    for e in ctx.plan.elements:
        gap = "-" if e.gap_mm is None else ctx.L2(e.gap_mm)
        rows.append([e.name, str(e.quantity), ctx.L2(e.developed_length_mm), ctx.L2(e.trim_mm),
                     ctx.L2(e.cut_length_mm), gap, f"{e.mass_kg * 1000:.1f}",
                     _stock_piece(ctx, e)])
    out = [ctx.p("Cut list", ctx.h2)]
    out += ctx.table(["element", "qty", "developed length", "trim per end", "cut length",
                      "feed gap (not in length)", "mass per piece g", "from stock"], rows,
                     [0.2, 0.05, 0.12, 0.11, 0.12, 0.12, 0.09, 0.19], "lrrrrrrl",
                     caption="Lengths in inches (tape measure) and millimetres; mass in grams. "
                             "Cut length = developed length + trim at both ends.")
    return out


def _marks(ctx: _Ctx, e) -> list:
    mm_first = ctx.unit == "mm"

    def pair(x: float) -> list[str]:
        both = [_fmt_in(x, ctx.den), format_mm(x)]
        return both[::-1] if mm_first else both

    rows = []
    for mid, m in zip(mark_ids(e), e.marks):
        side = "-" if abs(m.from_centre_mm) < 1e-9 else ("A" if m.from_centre_mm < 0 else "B")
        rows.append([mid, m.label, side, *pair(abs(m.from_centre_mm)), *pair(m.from_end_mm)])
    units = ["mm", "in"] if mm_first else ["in", "mm"]
    out = [ctx.p("Marks from the centre of the stock", ctx.h3)]
    out += ctx.table(["mark", "what", "side", *(f"from centre {u}" for u in units),
                      *(f"from end A {u}" for u in units)], rows,
                     [0.07, 0.27, 0.06, 0.15, 0.15, 0.15, 0.15], "lllrrrr",
                     caption="Find the centre of the cut piece first and mark it; measure every "
                             "other mark from it towards end A or end B (tape measure to 1/"
                             f"{ctx.den} in, or millimetres). The from-end-A column is a check.")
    return out


def _bend_table(ctx: _Ctx, e) -> list:
    rows = []
    pitch = any(b.pitch_mm for b in e.bends)
    for b in e.bends:
        row = [str(b.index), ctx.L(b.straight_before_mm), f"{b.angle_deg:g}",
               f"{b.rotation_deg:g}", ctx.L(b.centreline_radius_mm), ctx.L(b.arc_length_mm)]
        if pitch:
            row.append(format_mm(b.pitch_mm))
        rows.append(row)
    head = ["bend", "straight before", "angle deg", "rotation deg", "centreline radius",
            "arc length (neutral axis)"]
    widths = [0.07, 0.2, 0.1, 0.11, 0.2, 0.2]
    if pitch:
        head.append("pitch per turn mm")
        widths = [w * 0.9 for w in widths] + [0.1]
    out = [ctx.p("Bend table", ctx.h3)]
    out += ctx.table(head, rows, widths, "lrrrrrr"[:len(head)],
                     caption="Trade order from end A; lengths in inches and millimetres, "
                             "angles in degrees. Rotation turns the stock about its own axis "
                             "before the bend (0 = same plane, same way as the last bend). "
                             f"After the last bend: {ctx.L(e.tail_straight_mm)} straight to "
                             "end B.")
    return out


def _which_way(b) -> str:
    """The bend's direction against the bend before it in trade order."""
    r = b.rotation_deg % 360
    if b.index == 1:
        return "in the drawing's plane (the first bend from end A)"
    prev = b.index - 1
    if abs(r) < 1e-6 or abs(r - 360) < 1e-6:
        return f"same plane, same way as bend {prev}"
    if abs(r - 180) < 1e-6:
        return f"same plane, the opposite way to bend {prev}"
    return f"turn the stock {b.rotation_deg:g} deg about its axis from bend {prev}'s plane"


def _steps(ctx: _Ctx, e) -> list:
    """Bending steps in order; with the forming stage, its order, tools and overbends."""
    ids = dict(zip(((m.kind, m.label) for m in e.marks), mark_ids(e)))

    def mark_of(index: int, what: str) -> str:
        return ids.get((f"bend-{what}", f"bend {index} {what}"), "")

    f = e.forming
    bends = {b.index: b for b in e.bends}
    order = list(f.bend_order) if f is not None and f.bend_order else sorted(bends)
    formers = {}
    tools = {}
    if f is not None:
        for former in f.formers:
            for i in former.bend_indices:
                formers[i] = former
        for t in f.tool_marks:
            tools[t.bend_index] = t
    rows = []
    for step, i in enumerate(order, 1):
        b = bends[i]
        where = f"{mark_of(i, 'start')} to {mark_of(i, 'end')}"
        if i in formers:
            fm = formers[i]
            tool = f"former {fm.label} ({format_mm(2 * fm.radius_mm)} dia)"
        elif i in tools:
            t = tools[i]
            tool = f"bender: pencil mark at {side_text(t.from_centre_mm, ctx.den)} on " \
                   f"the tool's {t.tool_reference}"
        elif f is not None:
            tool = f"{f.bend(i).method}, radius {format_mm(f.bend(i).former_radius_mm)}"
        else:
            tool = f"former or bender with {ctx.L(b.centreline_radius_mm)} centreline radius"
        if f is not None:
            bf = f.bend(i)
            how_far = (f"bend to {bf.overbend_deg:.1f} deg while held "
                       f"(+{bf.springback_deg:.1f} springback); {b.angle_deg:g} deg after "
                       "release")
        else:
            how_far = f"{b.angle_deg:g} deg (allow for springback: check with a test bend)"
        rows.append([str(step), f"bend {i}", where, tool, _which_way(b), how_far])
    out = [ctx.p("Bending steps", ctx.h3)]
    if not rows:
        return out + [ctx.p("No bends: cut to length and mark.")]
    out += ctx.table(["step", "bend", "between marks", "former or tool", "which way",
                      "how far (degrees)"], rows, [0.06, 0.08, 0.13, 0.27, 0.2, 0.26],
                     "llllll",
                     caption="Angles in degrees; the bend lies between the two marks (its "
                             "start and end on the straight stock).")
    if f is not None and f.splay_if_ignored_mm:
        out.append(ctx.p(f"If springback is ignored the legs open by about "
                         f"{ctx.L(f.splay_if_ignored_mm)}.", ctx.small))
    for note in (f.notes if f is not None else ()):
        out.append(ctx.p(note, ctx.small))
    return out


def _scale_for(width_mm: float, height_mm: float, room_w: float, room_h: float) -> float:
    for s in DRAWING_SCALES:
        if width_mm / s <= room_w and height_mm / s <= room_h:
            return s
    return DRAWING_SCALES[-1]


def _drawing(ctx: _Ctx, e) -> list:
    """The element to scale, with its straight runs, radii, marks and formers."""
    from reportlab.graphics.shapes import Circle, Drawing, Line, PolyLine, String
    from reportlab.lib import colors

    geo = element_geometry(e)
    x0, y0, x1, y1 = geo.bbox
    f = e.forming
    if f is not None:
        for fm in f.formers:
            cx, cy = fm.centre_mm
            x0, y0 = min(x0, cx - fm.radius_mm), min(y0, cy - fm.radius_mm)
            x1, y1 = max(x1, cx + fm.radius_mm), max(y1, cy + fm.radius_mm)
    pad = 16.0  # mm of paper round the drawing for labels
    room_w = ctx.frame_w / PT_PER_MM - 2 * pad
    room_h = 95.0
    s = _scale_for(x1 - x0, y1 - y0, room_w, room_h)
    k = PT_PER_MM / s  # pt per model mm
    w = ctx.frame_w
    h = (y1 - y0) * k + 2 * pad * PT_PER_MM + 14
    ox = (w - (x1 - x0) * k) / 2 - x0 * k
    oy = pad * PT_PER_MM + 14 - y0 * k

    def P(x, y):
        return ox + x * k, oy + y * k

    d = Drawing(w, h)
    grey = colors.Color(0.45, 0.45, 0.45)
    for prim in geo.centreline:
        pts = prim_points(prim, 36)
        if geo.planar:
            d.add(PolyLine([c for p in pts for c in P(*p)], strokeWidth=0.4,
                           strokeColor=grey, strokeDashArray=[5, 2, 1, 2]))
        else:
            d.add(PolyLine([c for p in pts for c in P(*p)], strokeWidth=0.7))
    for prim in geo.outline:
        pts = prim_points(prim, 36)
        d.add(PolyLine([c for p in pts for c in P(*p)], strokeWidth=0.8))
    # straight runs and radii, labelled outside the element
    cx_mid, cy_mid = (x0 + x1) / 2, (y0 + y1) / 2
    arcs = iter(e.bends)
    for prim in geo.centreline:
        if prim[0] == "L":
            (ax, ay), (bx, by) = prim[1], prim[2]
            length = math.hypot(bx - ax, by - ay)
            if length * k < 30:
                continue
            mx, my = (ax + bx) / 2, (ay + by) / 2
            nx, ny = -(by - ay) / length, (bx - ax) / length
            if (mx - cx_mid) * nx + (my - cy_mid) * ny < 0:
                nx, ny = -nx, -ny
            px, py = P(mx, my)
            off = e.conductor_diameter_mm / 2 * k + 19  # beyond the mark labels
            d.add(String(px + nx * off, py + ny * off - 3, ctx.L(length), fontSize=7,
                         textAnchor="middle"))
        elif prim[0] == "A":
            b = next(arcs)
            (cx, cy), r, start, extent = prim[1:]
            mid = math.radians(start + extent / 2)
            px, py = P(cx + r * math.cos(mid), cy + r * math.sin(mid))
            off = e.conductor_diameter_mm / 2 * k + 17  # beyond the mark labels
            c, sn = math.cos(mid), math.sin(mid)
            anchor = "start" if c > 0.3 else ("end" if c < -0.3 else "middle")
            tx, ty = px + c * off, py + sn * off - 3
            lines = [f"bend {b.index}: {b.angle_deg:g} deg",
                     f"R {ctx.L(b.centreline_radius_mm)}"]
            if sn < -0.3:
                ty -= 8
            for n, text in enumerate(lines):
                if anchor != "middle":
                    dy = 4 - 8 * n  # beside the bend: centred on its middle
                elif sn > 0:
                    dy = 3 + 8 * (1 - n)  # above it
                else:
                    dy = -8 * n  # below it
                d.add(String(tx, ty + dy, text, fontSize=7, textAnchor=anchor))
    if geo.planar:
        red = colors.Color(0.75, 0.1, 0.1)
        labels = []
        for mid, m, (px_, py_), (tx, ty) in geo.marks:
            ext = e.conductor_diameter_mm / 2 * k + 4
            px, py = P(px_, py_)
            d.add(Line(px - ty * ext, py + tx * ext, px + ty * ext, py - tx * ext,
                       strokeWidth=0.6, strokeColor=colors.Color(0.75, 0.1, 0.1)))
            # label on the side of the conductor away from the middle of the drawing
            nx, ny = -ty, tx
            if (px_ - cx_mid) * nx + (py_ - cy_mid) * ny < 0:
                nx, ny = -nx, -ny
            anchor = "start" if nx > 0.7 else ("end" if nx < -0.7 else "middle")
            labels.append((mid, px + nx * (ext + 3), py + ny * (ext + 5) - 2.5, anchor))
        for text, x, y, anchor in merge_labels(labels, 14.0):
            d.add(String(x, y, text, fontSize=6, textAnchor=anchor, fillColor=red))
    if f is not None:
        for fm in f.formers:
            px, py = P(*fm.centre_mm)
            d.add(Circle(px, py, fm.radius_mm * k, strokeWidth=0.5, fillColor=None,
                         strokeColor=colors.Color(0.1, 0.3, 0.8), strokeDashArray=[2, 1.5]))
            d.add(String(px, py - 2.5, fm.label, fontSize=6.5, textAnchor="middle",
                         fillColor=colors.Color(0.1, 0.3, 0.8)))
    # scale bar: 100 mm (or 10 mm at 1:1 too) drawn at the drawing's scale
    bar_mm = 100.0 if s >= 2 else 50.0
    d.add(Line(4, 6, 4 + bar_mm * k, 6, strokeWidth=1.5))
    d.add(String(8 + bar_mm * k, 3.5, f"{bar_mm:g} mm at this scale", fontSize=6.5))
    scale_txt = "1:1" if s == 1 else f"1:{s:g}"
    d.add(String(w, 3.5, f"Scale {scale_txt} when printed at 100 % on {ctx.paper.upper()}"
                 if ctx.paper == "a4" else
                 f"Scale {scale_txt} when printed at 100 % on {ctx.paper.title()}",
                 fontSize=7, textAnchor="end"))
    if not geo.planar:
        return [ctx.p("Drawing to scale (projected)", ctx.h3),
                ctx.p("The centreline seen square to the drawing's x-y plane. The element is "
                      "not flat, so lengths along the stock are not true here: mark from the "
                      "marks table or the full-scale template's marking strip.", ctx.small), d]
    return [ctx.p("Drawing to scale", ctx.h3),
            ctx.p("Outline solid, centreline dash-dot; red ticks are the marks (ids as in the "
                  "marks table)" + ("; blue dashed circles are the jig's formers."
                                    if f is not None and f.formers else "."), ctx.small), d]


def _jig(ctx: _Ctx, e) -> list:
    f = e.forming
    if f is None or not f.formers:
        return []
    rows = [[fm.label, ", ".join(str(i) for i in fm.bend_indices), ctx.L(2 * fm.radius_mm),
             f"{_num(fm.centre_mm[0])}, {_num(fm.centre_mm[1])}", f"{fm.wrap_deg:.1f}"]
            for fm in f.formers]
    out = [ctx.p("Jig: formers", ctx.h3)]
    out += ctx.table(["former", "bends", "diameter", "centre x, y mm", "wrap deg"], rows,
                     [0.1, 0.12, 0.3, 0.28, 0.12], "llrrr",
                     caption="Former diameters in inches and millimetres (springback "
                             "compensated), centres in mm in the drawing's plane, wrap in "
                             "degrees.")
    if f.former_spacing_mm:
        pairs = [[f"{a.label} to {b.label}", ctx.L(g)]
                 for a, b, g in zip(f.formers, f.formers[1:], f.former_spacing_mm)]
        out += ctx.table(["formers", "centre-to-centre spacing"], pairs, [0.2, 0.4], "lr",
                         caption="Spacing in inches and millimetres.")
    return out


def _money(currency, amount) -> str:
    if amount is None:
        return "-"
    return currency.format(amount) if currency is not None else f"{amount:,.2f}"


def _order(ctx: _Ctx) -> list:
    """Bill of material and cutting plan from the estimate stage."""
    from reportlab.platypus import Paragraph

    o = ctx.plan.order
    if o is None:
        return []
    cur = o.currency
    money_unit = f" ({cur.label})" if cur is not None else ""
    out = [ctx.p("Bill of material", ctx.h2)]
    if not o.buy:
        out.append(ctx.p(f"No stock offered in the design: {o.cut_count} cut(s), "
                         f"{ctx.L(o.cut_length_mm)} of stock in all before kerf and ends. Add "
                         "[purchase] offers for a buying and cutting plan."))
    rows = [[b.offer, ctx.L(b.length_mm), str(b.count), _money(cur, b.piece_cost),
             _money(cur, b.cost), f"{b.weight_kg:.3f}", b.source] for b in o.buy]
    for it in o.items:
        rows.append([it.name, "-", str(it.quantity), _money(cur, it.price_each),
                     _money(cur, it.cost), f"{it.weight_kg:.3f}", it.source])
    if not rows:
        return out + ctx.table(["weight", "kg"], [["elements as built",
                                                   f"{o.elements_weight_kg:.3f}"]],
                               [0.3, 0.2], "lr")
    out += ctx.table(["stock or item", "length", "qty", "each" + money_unit,
                      "cost" + money_unit, "weight kg", "source"], rows,
                     [0.2, 0.16, 0.05, 0.11, 0.11, 0.09, 0.28], "lrrrrrl",
                     caption="Lengths in inches and millimetres, weights in kilograms, money "
                             "in the design's currency" + ("" if cur else " (no prices given)")
                             + ".")
    totals = [["elements as built", f"{o.elements_weight_kg:.3f} kg", ""],
              ["stock bought", f"{o.stock_weight_kg:.3f} kg", _money(cur, o.stock_cost)],
              ["other items", f"{o.items_weight_kg:.3f} kg", _money(cur, o.items_cost)],
              ["total (built / to ship)",
               f"{o.total_weight_kg:.3f} kg / {o.shipping_weight_kg:.3f} kg",
               _money(cur, o.total_cost)]]
    out += ctx.table(["totals", "weight (kg)", "cost" + money_unit], totals, [0.3, 0.35, 0.2],
                     "lrr")
    if not o.pieces:
        return out
    out.append(ctx.p("Cutting plan", ctx.h3))
    rows = []
    for p in o.pieces:
        cuts = "<br/>".join(_esc(f"{c.element}{' (spare)' if c.spare else ''}: "
                                 f"{_fmt_in(c.length_mm, ctx.den)} ({format_mm(c.length_mm)}) "
                                 f"at {format_mm(c.start_mm)}") for c in p.cuts)
        rows.append([str(p.index), f"{p.offer}, {ctx.L(p.length_mm)}", Paragraph(cuts, ctx.cell),
                     ctx.L(p.remnant_mm) if p.remnant_mm > 0 else "none",
                     f"{p.utilisation * 100:.0f}"])
    out += ctx.table(["piece", "stock", "cuts: element: length at start from end A",
                      "usable offcut", "used %"], rows, [0.07, 0.22, 0.43, 0.18, 0.08],
                     "llllr",
                     caption=f"Lengths in inches and millimetres; kerf {ctx.L(o.kerf_mm)} per "
                             f"cut. {o.cut_count} cuts, {o.pieces_to_buy} stock piece(s); "
                             f"plan by {o.method}"
                             + ("; proven the fewest pieces" if o.proven_optimal else "") + ".")
    return out


def _electrical(ctx: _Ctx) -> list:
    """The electrical check: a summary per element and its SWR plot."""
    items = [e for e in ctx.plan.elements if e.electrical is not None]
    if not items and ctx.plan.electrical is None:
        return []
    out = [ctx.p("Electrical check", ctx.h2)]
    for e in items:
        el = e.electrical
        sw = el.sweep
        bw = ", ".join(f"SWR < {key}: {format_frequency(v)}" if v else
                       f"SWR < {key}: not reached in the sweep"
                       for key, v in sorted(sw.bandwidth_hz.items()))
        rows = [["target frequency", format_frequency(el.target_hz) if el.target_hz else "-"],
                ["resonance (reactance zero)", format_frequency(sw.resonance_hz)
                 if sw.resonance_hz else "none in the sweep"],
                ["lowest SWR", f"{sw.min_swr:.2f} at {format_frequency(sw.min_swr_hz)}"],
                ["bandwidth", bw or "-"],
                ["matching", f"{sw.matching}; SWR against {sw.system_ohm:g} ohm"],
                ["uncertainty", f"about {sw.uncertainty_frac * 100:.1f} % in frequency"],
                ["model size", f"{el.unknowns} unknowns"]]
        if sw.efficiency is not None:
            rows.insert(4, ["efficiency", f"{sw.efficiency * 100:.1f} %"])
        out.append(ctx.p(e.name, ctx.h3))
        out += ctx.table(["figure", "value (unit)"], rows, [0.3, 0.7], "ll")
        out.append(_swr_plot(ctx, sw))
        for note in el.notes:
            out.append(ctx.p(note, ctx.small))
    pe = ctx.plan.electrical
    if pe is not None:
        rows = [["matching", pe.matching], ["ground", pe.ground]]
        if pe.balun_loop_cut_length_mm is not None:
            rows.append(["balun loop cut length", f"{ctx.L(pe.balun_loop_cut_length_mm)} of "
                                                  f"{pe.balun_cable or 'coaxial cable'}"])
        if pe.feed_line_loss_db is not None:
            rows.append(["feed line loss (matched)", f"{pe.feed_line_loss_db:.2f} dB"])
        if pe.power_w is not None:
            rows.append(["transmitter power", f"{pe.power_w:g} W"])
        rows.append(["uncertainty", f"about {pe.uncertainty_frac * 100:.1f} % in frequency"])
        out.append(ctx.p("Matching and feed", ctx.h3))
        out += ctx.table(["figure", "value (unit)"], rows, [0.3, 0.7], "ll",
                         caption="Lengths in inches and millimetres; loss in dB; power in W.")
    return out


def _swr_plot(ctx: _Ctx, sw):
    from reportlab.graphics.charts.lineplots import LinePlot
    from reportlab.graphics.shapes import Drawing, String
    from reportlab.lib import colors

    w, h = ctx.frame_w, 150
    d = Drawing(w, h)
    lp = LinePlot()
    lp.x, lp.y, lp.width, lp.height = 45, 28, w - 70, h - 45
    mhz = [f / 1e6 for f in sw.freq_hz]
    top = 5.0
    series = [list(zip(mhz, [min(v, top) for v in sw.swr_system]))]
    if list(sw.swr_terminals) != list(sw.swr_system):
        series.append(list(zip(mhz, [min(v, top) for v in sw.swr_terminals])))
    lp.data = series
    lp.lines[0].strokeColor = colors.Color(0.1, 0.3, 0.8)
    lp.lines[0].strokeWidth = 1.2
    if len(series) > 1:
        lp.lines[1].strokeColor = colors.Color(0.6, 0.6, 0.6)
        lp.lines[1].strokeDashArray = [3, 2]
    lp.yValueAxis.valueMin, lp.yValueAxis.valueMax, lp.yValueAxis.valueStep = 1, top, 0.5
    lp.xValueAxis.valueMin, lp.xValueAxis.valueMax = min(mhz), max(mhz)
    lp.xValueAxis.labelTextFormat = "%.1f"
    lp.yValueAxis.labelTextFormat = "%.1f"
    lp.xValueAxis.labels.fontSize = lp.yValueAxis.labels.fontSize = 7
    d.add(lp)
    d.add(String(w / 2, 4, "frequency, MHz", fontSize=7.5, textAnchor="middle"))
    d.add(String(4, h - 10, f"SWR (1 to {top:g}; clipped above)", fontSize=7.5))
    legend = f"solid: at the feed line, against {sw.system_ohm:g} ohm"
    if len(series) > 1:
        legend += f"; dashed: at the element's terminals, against {sw.reference_ohm:g} ohm"
    d.add(String(w, h - 10, legend, fontSize=7, textAnchor="end"))
    return d


def _findings(ctx: _Ctx) -> list:
    out = [ctx.p("Findings", ctx.h2)]
    if not ctx.plan.findings:
        return out + [ctx.p("No findings: every check passed.")]
    words = {"error": "Must fix", "warning": "Check", "info": "Note"}
    rows = [[words.get(f.severity, f.severity), f.element or "whole design", f.message, f.code]
            for f in ctx.plan.findings]
    return out + ctx.table(["what to do", "element", "finding", "code"], rows,
                           [0.1, 0.16, 0.56, 0.18], "llll")


def _safety(ctx: _Ctx) -> list:
    from reportlab.platypus import Paragraph

    out = [ctx.p("Safety", ctx.h2)]
    for head, text in SAFETY:
        out.append(Paragraph(f"<b>{_esc(head)}.</b> {_esc(text)}", ctx.body))
    pe = ctx.plan.electrical
    for caution in (pe.cautions if pe is not None else ()):
        out.append(Paragraph(f"<b>From the electrical check.</b> {_esc(caution)}", ctx.body))
    out.append(ctx.p(SAFETY_FOOTNOTE, ctx.small))
    return out


def _element(ctx: _Ctx, e) -> list:
    from reportlab.platypus import CondPageBreak

    out = [CondPageBreak(120), ctx.p(f"Element: {e.name} ({e.spec.shape}), make {e.quantity}",
                                     ctx.h2),
           ctx.p(f"Cut length {ctx.L(e.cut_length_mm)}: developed length "
                 f"{ctx.L(e.developed_length_mm)} plus {ctx.L(e.trim_mm)} trim at each end"
                 + (f"; feed gap {ctx.L(e.gap_mm)} between the ends" if e.gap_mm else "")
                 + ".")]
    out += _marks(ctx, e)
    out += _bend_table(ctx, e)
    out += _steps(ctx, e)
    out += _drawing(ctx, e)
    out += _jig(ctx, e)
    est = e.estimate
    if est is not None:
        cost = ""
        if est.cost is not None:
            cost = (f"; stock cost {_money(est.currency, est.cost)} each, "
                    f"{_money(est.currency, est.batch_cost)} for the batch")
        out.insert(2, ctx.p(f"Weight {est.weight_kg * 1000:.1f} g each, "
                            f"{est.batch_weight_kg:.3f} kg for {e.quantity}; cut "
                            f"{est.quantity + est.spares} piece(s) including {est.spares} "
                            f"spare(s){cost}."))
    return out


# -- the document ---------------------------------------------------------------------
def sheet_pdf(plan, paper: str = "a4") -> bytes:
    """The build sheet of `plan` as PDF bytes (A4 or Letter)."""
    from reportlab.pdfgen import canvas
    from reportlab.platypus import KeepTogether, SimpleDocTemplate

    if paper not in SHEET_PAPERS:
        paper_size(paper)  # unknown paper: its own message
        from ..errors import DesignError

        raise DesignError("the build sheet prints on a4 or letter", field="--paper",
                          value=paper)
    ctx = _Ctx(plan, paper)
    story: list = []
    story += _title(ctx)
    story += _stock(ctx)
    story += _cut_list(ctx)
    for e in plan.elements:
        story += _element(ctx, e)
    story += _order(ctx)
    story += _electrical(ctx)
    story += _findings(ctx)
    story.append(KeepTogether(_safety(ctx)))

    project = plan.design.project

    class NumberedCanvas(canvas.Canvas):
        """Defers pages so that each can say "page N of M"."""

        def __init__(self, *args, **kwargs):
            super().__init__(*args, **kwargs)
            self._pages = []

        def showPage(self):
            self._pages.append(dict(self.__dict__))
            self._startPage()

        def save(self):
            total = len(self._pages)
            for state in self._pages:
                self.__dict__.update(state)
                self.setFont("Helvetica", 7.5)
                self.setFillGray(0.3)
                y = 8 * PT_PER_MM
                self.drawString(ctx.margin, y, project[:90])
                self.drawRightString(ctx.pw - ctx.margin, y,
                                     f"page {self._pageNumber} of {total}")
                self.drawCentredString(ctx.pw / 2, y, "build sheet; units on every table")
                super().showPage()
            super().save()

    buf = io.BytesIO()
    doc = SimpleDocTemplate(buf, pagesize=(ctx.pw, ctx.ph), leftMargin=ctx.margin,
                            rightMargin=ctx.margin, topMargin=ctx.margin,
                            bottomMargin=ctx.margin, title=f"Build sheet: {project}",
                            author="fabplan", creator=f"fabplan {__version__}",
                            subject="fabrication plan", invariant=1, pageCompression=1)
    doc.build(story, canvasmaker=NumberedCanvas)
    return buf.getvalue()
