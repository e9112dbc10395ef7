"""The build sheet's core sections: title block, stock, cut list, and for each piece
of stock its marks, bend table, bending steps, drawing to scale and jig formers."""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any

from ... import __version__
from ...lengths.records import BendRow
from ...plan import ElementPlan, PiecePlan
from ...units import format_inches, format_mm, format_money, format_number
from ..fullscale.geometry import mark_ids, merge_labels, piece_drawing, prim_points, side_text
from ..fullscale.papers import PT_PER_MM
from .context import Context

__all__ = ["title", "stock", "cut_list", "element", "DRAWING_SCALES"]

# preferred drawing scales (1:n), smallest reduction first
DRAWING_SCALES = (1, 2, 2.5, 4, 5, 10, 20, 25, 50, 100)


def title(ctx: Context) -> list[Any]:
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


def stock(ctx: Context) -> list[Any]:
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


def _stock_piece(ctx: Context, name: str) -> str:
    """Which stock pieces an element's cuts come from, as the estimate planned them."""
    order = ctx.plan.order
    if order is None:
        return f"any length of {ctx.plan.stock.description}"
    nums = [str(p.index) for p in order.pieces if any(c.element == name for c in p.cuts)]
    if not nums:
        return "see cutting plan"
    return ("stock piece " if len(nums) == 1 else "stock pieces ") + ", ".join(nums)


def cut_list(ctx: Context) -> list[Any]:
    rows = []
    for e in ctx.plan.elements:
        for p in e.pieces:
            g = e.feed_gap_mm if len(e.pieces) == 1 else p.gap_mm
            gap = "-" if g is None else ctx.L2(g)
            name = e.piece_name(p)
            rows.append([name, str(e.quantity), ctx.L2(p.developed_length_mm), ctx.L2(p.trim_mm),
                         ctx.L2(p.cut_length_mm), gap, f"{p.mass_kg * 1000:.1f}",
                         _stock_piece(ctx, name)])
    out = [ctx.p("Cut list", ctx.h2)]
    out += ctx.table(["element", "qty", "developed length", "trim per end", "cut length",
                      "feed gap (not in length)", "mass per piece g", "from stock"], rows,
                     [0.2, 0.05, 0.12, 0.11, 0.12, 0.12, 0.09, 0.19], "lrrrrrrl",
                     caption="Lengths in inches (tape measure) and millimetres; mass in grams. "
                             "Cut length = developed length + trim at both ends.")
    return out


def _marks(ctx: Context, e: PiecePlan) -> list[Any]:
    mm_first = ctx.unit == "mm"

    def pair(x: float) -> list[str]:
        both = [format_inches(x, ctx.den), format_mm(x)]
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


def _bend_table(ctx: Context, e: PiecePlan) -> list[Any]:
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


def _which_way(b: BendRow) -> str:
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


def _steps(ctx: Context, e: PiecePlan) -> list[Any]:
    """Bending steps in order; with the forming stage, its order, tools and overbends."""
    ids: dict[tuple[str, str], str] = dict(zip(((m.kind, m.label) for m in e.marks),
                                               mark_ids(e)))

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


def _drawing(ctx: Context, e: PiecePlan) -> list[Any]:
    """The element to scale, with its straight runs, radii, marks and formers."""
    from reportlab.graphics.shapes import Circle, Drawing, Line, PolyLine, String
    from reportlab.lib import colors

    geo = piece_drawing(e)
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

    def P(x: float, y: float) -> tuple[float, float]:
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
        for mid, _m, (px_, py_), (tx, ty) in geo.marks:
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


def _jig(ctx: Context, e: PiecePlan) -> list[Any]:
    f = e.forming
    if f is None or not f.formers:
        return []
    rows = [[fm.label, ", ".join(str(i) for i in fm.bend_indices), ctx.L(2 * fm.radius_mm),
             f"{format_number(fm.centre_mm[0])}, {format_number(fm.centre_mm[1])}",
             f"{fm.wrap_deg:.1f}"]
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


def element(ctx: Context, e: ElementPlan) -> list[Any]:
    from reportlab.platypus import CondPageBreak

    out = [CondPageBreak(120), ctx.p(f"Element: {e.name} ({e.spec.shape}), make {e.quantity}",
                                     ctx.h2)]
    for p in e.pieces:
        gap = e.feed_gap_mm if len(e.pieces) == 1 else p.gap_mm
        if p.label:
            out.append(ctx.p(f"Piece: {p.label}", ctx.h3))
        out.append(ctx.p(f"Cut length {ctx.L(p.cut_length_mm)}: developed length "
                         f"{ctx.L(p.developed_length_mm)} plus {ctx.L(p.trim_mm)} trim at each "
                         "end" + (f"; feed gap {ctx.L(gap)} between the ends" if gap else "")
                         + "."))
        out += _marks(ctx, p)
        out += _bend_table(ctx, p)
        out += _steps(ctx, p)
        out += _drawing(ctx, p)
        out += _jig(ctx, p)
    est = e.estimate
    if est is not None:
        cost = ""
        if est.cost is not None:
            cost = (f"; stock cost {format_money(est.cost, est.currency)} each, "
                    f"{format_money(est.batch_cost, est.currency)} for the batch")
        out.insert(2, ctx.p(f"Weight {est.weight_kg * 1000:.1f} g each, "
                            f"{est.batch_weight_kg:.3f} kg for {e.quantity}; cut "
                            f"{est.quantity + est.spares} piece(s) including {est.spares} "
                            f"spare(s){cost}."))
    return out
