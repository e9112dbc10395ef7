"""The build sheet's core sections: title block, stock, cut list, and for each piece
of stock its marks, bend table, bending steps, drawing to scale and jig formers."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from ... import __version__
from ...lengths.records import BendRow
from ...plan import ElementPlan, PiecePlan
from ...units import format_angle, format_inches, format_mm, format_money, format_number
from ..fullscale.geometry import mark_ids
from .context import Context, short_name
from .drawings import DRAWING_SCALES, assembly, drawing

__all__ = ["title", "stock", "cut_list", "element", "DRAWING_SCALES"]


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
            ["Stock", plan.stock.description, "Saw kerf", ctx.L(d.shop.kerf_mm)],
            ["Paper", _paper_text(ctx), "", ""]]
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


def _paper_text(ctx: Context) -> str:
    name = ctx.paper.upper() if ctx.paper == "a4" else ctx.paper.title()
    if ctx.paper_chosen:
        return f"{name}, as chosen (--paper); print at 100 % (actual size)"
    other = "a4" if ctx.paper == "letter" else "letter"
    shop = "inches" if ctx.unit == "in" else "millimetres"
    return (f"{name}: the default for a shop in {shop} (Letter for inches, A4 for "
            f"millimetres; --paper {other} for the other); print at 100 % (actual size)")


def stock(ctx: Context) -> list[Any]:
    s = ctx.plan.stock
    prof = s.profile
    if prof.kind == "round":
        size = f"round, diameter {ctx.L(prof.diameter_mm)}"
    elif prof.kind == "tube":
        size = f"tube, outside diameter {ctx.L(prof.od_mm)}, wall {ctx.size(prof.wall_mm)}"
    else:
        size = f"strip {ctx.size(prof.width_mm)} x {ctx.size(prof.thickness_mm)}"
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
            rows.append([short_name(name), str(e.quantity), ctx.L2(p.developed_length_mm),
                         ctx.L2(p.trim_mm), ctx.L2(p.cut_length_mm), gap,
                         f"{p.mass_kg * 1000:.1f}",
                         _stock_piece(ctx, name)])
    out = [ctx.p("Cut list", ctx.h2)]
    out += ctx.table(["element", "qty", "developed length", "trim per end", "cut length",
                      "feed gap (not in length)", "mass per piece g", "from stock"], rows,
                     [0.2, 0.05, 0.12, 0.11, 0.12, 0.12, 0.09, 0.19], "lrrrrrrl",
                     caption=f"{ctx.lengths_note}; mass in grams. Cut length = developed "
                             "length + trim at both ends.")
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
    if not e.bends:
        return [ctx.p("Bend table", ctx.h3), ctx.p("No bends: the piece stays straight.")]
    rows = []
    pitch = any(b.pitch_mm for b in e.bends)
    for b in e.bends:
        row = [str(b.index), ctx.L(b.straight_before_mm), format_angle(b.angle_deg),
               format_angle(b.rotation_deg), ctx.L(b.centreline_radius_mm),
               ctx.L(b.arc_length_mm)]
        if pitch:
            row.append(ctx.L(b.pitch_mm) if b.pitch_mm else "-")
        rows.append(row)
    head = ["bend", "straight before", "angle deg", "rotation deg", "centreline radius",
            "arc length (neutral axis)"]
    widths = [0.07, 0.2, 0.1, 0.11, 0.2, 0.2]
    if pitch:
        head.append("pitch per turn")
        widths = [w * 0.9 for w in widths] + [0.1]
    out = [ctx.p("Bend table", ctx.h3)]
    out += ctx.table(head, rows, widths, "lrrrrrr"[:len(head)],
                     caption=f"Trade order from end A. {ctx.lengths_note}; angles in "
                             "degrees. Rotation turns the stock about its own axis before the "
                             "bend (0 = same plane, same way as the bend before it in this "
                             "table). "
                             f"After the last bend: {ctx.L(e.tail_straight_mm)} straight to "
                             "end B.")
    return out


def _which_way(bends: dict[int, BendRow], i: int, prev: int | None, step: int) -> str:
    """Bend `i`'s direction against the bend made in the step before (`prev`,
    already made), from the rotations of the bend planes between them."""
    if prev is None:
        if len(bends) == 1:
            return "the only bend"
        return "the first bend made: it sets the plane; bend it the way the drawing shows"
    lo, hi = sorted((prev, i))
    turn = sum(bends[j].rotation_deg for j in range(lo + 1, hi + 1))
    if i < prev:  # counted back from the bend already made
        turn = -turn
    r = turn % 360
    made = f"bend {prev} (step {step - 1})"
    if min(r, 360 - r) < 0.05:
        return f"same plane, same way as {made}"
    if abs(r - 180) < 0.05:
        return f"same plane, the opposite way to {made}"
    r = r if r <= 180 else r - 360
    sense = "clockwise" if r > 0 else "anticlockwise"
    return (f"turn the stock {format_angle(abs(r))} deg {sense} (looking from end A towards "
            f"end B) from the plane of {made}")


def _side(ctx: Context, from_centre_mm: float) -> str:
    """`A 7 23/32" (195.9 mm)` in the shop's unit first: which half, how far from the centre."""
    if abs(from_centre_mm) < 1e-9:
        return "centre"
    return f"{'A' if from_centre_mm < 0 else 'B'} {ctx.L(abs(from_centre_mm))}"


def _helix_how_far(ctx: Context, b: BendRow, e: PiecePlan) -> tuple[str, str, str]:
    """A helix's step: the mandrel, the turns to wind and the pitch guide; the
    angle only as a reference."""
    f = e.forming
    turns = b.angle_deg / 360
    if f is None:
        return (f"mandrel for a {ctx.L(2 * b.centreline_radius_mm)} centreline diameter, "
                "smaller by the springback (make a test coil)",
                f"wind {format_angle(turns)} turns round the mandrel",
                f"{format_angle(turns)} turns at {ctx.L(b.pitch_mm)} pitch; the angle "
                f"({format_angle(b.angle_deg)} deg) is for reference only")
    bf = f.bend(b.index)
    held = bf.overbend_deg / 360
    tool = (f"winding mandrel {ctx.L(2 * bf.former_radius_mm)} diameter, with the pitch "
            f"guide ({ctx.L(b.pitch_mm)} from notch to notch)")
    way = ("wind the stock round the mandrel, laying each turn in the next notch of the "
           "pitch guide")
    how = (f"follow the turns: about {format_angle(held)} turns while held on the mandrel; "
           f"released, it opens to {format_angle(turns)} turns of "
           f"{ctx.L(2 * b.centreline_radius_mm)} centreline diameter. Check the pitch against "
           f"the guide ({ctx.L(b.pitch_mm)}) and set it by hand. The angle "
           f"({format_angle(bf.overbend_deg)} deg held, {format_angle(b.angle_deg)} deg "
           "released) is for reference only")
    return tool, way, how


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
    prev: int | None = None
    for step, i in enumerate(order, 1):
        b = bends[i]
        where = f"{mark_of(i, 'start')} to {mark_of(i, 'end')}"
        way = _which_way(bends, i, prev, step)
        if b.pitch_mm:
            tool, way, how_far = _helix_how_far(ctx, b, e)
            rows.append([str(step), f"bend {i}", where, tool, way, how_far])
            prev = i
            continue
        if i in formers:
            fm = formers[i]
            tool = f"former {fm.label} ({ctx.L(2 * fm.radius_mm)} dia)"
        elif i in tools:
            t = tools[i]
            tool = f"bender: pencil mark at {_side(ctx, t.from_centre_mm)} on the tool's " \
                   f"{t.tool_reference}"
        elif f is not None:
            tool = f"{f.bend(i).method}, radius {ctx.L(f.bend(i).former_radius_mm)}"
        else:
            tool = f"former or bender with {ctx.L(b.centreline_radius_mm)} centreline radius"
        if f is not None:
            bf = f.bend(i)
            how_far = (f"bend to {format_angle(bf.overbend_deg)} deg while held "
                       f"(+{format_angle(bf.springback_deg)} springback); "
                       f"{format_angle(b.angle_deg)} deg after release")
        else:
            how_far = (f"{format_angle(b.angle_deg)} deg (allow for springback: check with a "
                       "test bend)")
        rows.append([str(step), f"bend {i}", where, tool, way, how_far])
        prev = i
    out = [ctx.p("Bending steps", ctx.h3)]
    if not rows:
        return out + [ctx.p("No bends: cut to length and mark.")]
    out += ctx.table(["step", "bend", "between marks", "former or tool", "which way",
                      "how far"], rows, [0.06, 0.08, 0.13, 0.27, 0.2, 0.26],
                     "llllll",
                     caption=f"In the order to make them. Angles in degrees. "
                             f"{ctx.lengths_note}. The bend lies between the two marks (its "
                             "start and end on the straight stock); which way is against the "
                             "bend made in the step before.")
    if f is not None and f.splay_if_ignored_mm:
        out.append(ctx.p(f"If springback is ignored the legs open by about "
                         f"{ctx.L(f.splay_if_ignored_mm)}.", ctx.small))
    for note in (f.notes if f is not None else ()):
        out.append(ctx.p(note, ctx.small))
    return out


def _jig(ctx: Context, e: PiecePlan) -> list[Any]:
    f = e.forming
    if f is None or not f.formers:
        return []
    rows = [[fm.label, ", ".join(str(i) for i in fm.bend_indices), ctx.L(2 * fm.radius_mm),
             f"{format_number(fm.centre_mm[0])}, {format_number(fm.centre_mm[1])}",
             format_angle(fm.wrap_deg)]
            for fm in f.formers]
    out = [ctx.p("Jig: formers", ctx.h3)]
    out += ctx.table(["former", "bends", "diameter", "centre x, y mm", "wrap deg"], rows,
                     [0.1, 0.12, 0.3, 0.28, 0.12], "llrrr",
                     caption=f"{ctx.lengths_note}. Former diameters are springback "
                             "compensated; centres are the jig drawing's coordinates in mm; "
                             "wrap in degrees.")
    if f.former_spacing_mm:
        pairs = [[f"{a.label} to {b.label}", ctx.L(g)]
                 for a, b, g in zip(f.formers, f.formers[1:], f.former_spacing_mm)]
        out += ctx.table(["formers", "centre-to-centre spacing"], pairs, [0.2, 0.4], "lr",
                         caption=f"{ctx.lengths_note}.")
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
        out += drawing(ctx, e, p)
        out += _jig(ctx, p)
    out += assembly(ctx, e)
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
