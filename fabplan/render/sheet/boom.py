"""The build sheet's boom section: the assembly seen from above (the boom and every
element on it, each position dimensioned from the datum), the elements on the boom
with their boom correction, the drilling plan, the hardware, and the notes.

Every figure comes from the Plan (`Plan.boom`); this module only draws and lays out.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from ...boom.records import BoomPlan
from ...plan import ElementPlan
from ...units import format_mm
from .context import Context

__all__ = ["boom"]

ELEMENT_GREY = (0.15, 0.15, 0.15)
PART_BLUE = (0.1, 0.3, 0.8)


def boom(ctx: Context) -> list[Any]:
    """The boom section (nothing when the design has no boom)."""
    b = ctx.plan.boom
    if b is None:
        return []
    from reportlab.platypus import KeepTogether

    out: list[Any] = [ctx.p("Boom and assembly", ctx.h2)]
    out.append(ctx.p(
        f"Boom: {b.description}, {ctx.L(b.length_mm)} long, {b.material}; "
        f"{b.quantity} to build, {b.mass_kg * 1000:.0f} g each. Positions are measured from "
        f"the boom's {b.datum} end (the datum). Elements mount {b.mounting} unless the table "
        "says otherwise." + ("" if b.balance_mm is None else
                             f" The beam balances {ctx.L(b.balance_mm)} from the datum: clamp "
                             "it to the mast there."), ctx.body))
    out.append(KeepTogether([_drawing(ctx, b),
                             ctx.p("Assembly seen from above, to scale: the boom (grey) runs "
                                   "from the datum (left) forward; each element is drawn as "
                                   "modelled, its matching device in blue; every dimension is "
                                   "from the datum.", ctx.small)]))
    rows = []
    for m in b.mounts:
        e = _element(ctx, m.element)
        shape_cut = sum(p.shape_cut_mm for p in m.pieces)
        cut = sum(p.cut_length_mm for p in m.pieces)
        corr = ("-" if m.published_mm is None else
                f"{format_mm(m.correction_mm, 2)}" + (
                    "" if abs((m.published_mm or 0) - m.correction_mm) < 1e-9 else
                    f" (published {format_mm(m.published_mm, 2)})"))
        rows.append([m.element, ctx.L2(m.position_mm), m.mounting, corr,
                     ctx.L2(shape_cut), ctx.L2(cut),
                     "-" if m.hole_mm is None else format_mm(m.hole_mm, 1),
                     m.applied if e is None else f"{m.applied}; {len(e.pieces)} piece(s)"])
    out += ctx.table(["element", "from datum", "mounting", "boom correction mm",
                      "shape's cut", "cut length", "hole mm", "how the boom counts"], rows,
                     [0.12, 0.12, 0.1, 0.12, 0.12, 0.12, 0.07, 0.23], "lrlrrrrl",
                     caption="The boom correction is added to the element's cut, half at each "
                             "tip (the cut list and marks already include it). Source: "
                             + (b.mounts[0].basis if b.mounts and b.mounts[0].basis else
                                "GM3SEK's fit, I0JXX's table (fabplan.antennas.boom)") + ".")
    out.append(ctx.p("Drilling plan", ctx.h3))
    drows = []
    for n, h in enumerate(b.drilling.holes, 1):
        drows.append([f"H{n}", h.label, ctx.L2(h.from_datum_mm), f"{h.angle_deg:g}",
                      format_mm(h.diameter_mm, 1), "yes" if h.through else "no", h.purpose])
    out += ctx.table(["hole", "for", "from datum", "angle deg", "diameter mm", "through",
                      "purpose"], drows, [0.06, 0.18, 0.14, 0.09, 0.11, 0.08, 0.34], "llrrrll",
                     caption="Every hole from the one datum, never from the hole before. Angle "
                             "round the boom, counter-clockwise seen from the datum end, 0 on "
                             "top; a through hole comes out half a turn round. Print "
                             "drilling-1to1.pdf at actual size and wrap it round the boom to "
                             "mark them.")
    out.append(ctx.p("Hardware", ctx.h3))
    out += ctx.table(["item", "qty", "size", "note"],
                     [[x.item, str(x.quantity), x.size or "-", x.note] for x in b.bill],
                     [0.27, 0.06, 0.33, 0.34], "lrll")
    for note in b.notes:
        out.append(ctx.p(note, ctx.small))
    return out


def _element(ctx: Context, name: str) -> ElementPlan | None:
    return next((e for e in ctx.plan.elements if e.name == name), None)


def _points(e: ElementPlan) -> list[np.ndarray]:
    """Each piece of an element as modelled, placed (x, y in mm)."""
    out = []
    for piece in e.geometry.modelled.pieces:
        pts, _ = piece.path.sample(max(piece.path.centreline_length() / 120, 0.5))
        if e.placement is not None:
            pts = e.placement.apply(pts)
        out.append(pts[:, :2])
    return out


def _drawing(ctx: Context, b: BoomPlan) -> Any:
    from reportlab.graphics.shapes import Drawing, Line, PolyLine, Rect, String
    from reportlab.lib import colors
    from reportlab.pdfbase.pdfmetrics import stringWidth

    placed = [e for e in ctx.plan.elements if e.placement is not None]
    shapes = [(e, _points(e)) for e in placed]
    xs = [0.0, b.length_mm] + [float(p[:, 0].min()) for _, ps in shapes for p in ps] \
        + [float(p[:, 0].max()) for _, ps in shapes for p in ps]
    ys = [-b.outside_mm / 2, b.outside_mm / 2] + [float(p[:, 1].min()) for _, ps in shapes
                                                  for p in ps] \
        + [float(p[:, 1].max()) for _, ps in shapes for p in ps]
    x0, x1, y0, y1 = min(xs), max(xs), min(ys), max(ys)
    w = ctx.frame_w
    dims = len(b.mounts)
    dim_h = 16.0 * dims + 10
    room_h = 300.0
    k = min((w - 40) / max(x1 - x0, 1e-9), room_h / max(y1 - y0, 1e-9))
    h = (y1 - y0) * k + dim_h + 20
    d = Drawing(w, h)
    ox = 20 + ((w - 40) - (x1 - x0) * k) / 2 - x0 * k
    oy = dim_h + 10 - y0 * k

    def P(x: float, y: float) -> tuple[float, float]:
        return ox + x * k, oy + y * k

    bx, by = P(0.0, -b.outside_mm / 2)
    d.add(Rect(bx, by, b.length_mm * k, max(b.outside_mm * k, 1.5),
               fillColor=colors.Color(0.82, 0.82, 0.82), strokeColor=colors.Color(0.4, 0.4, 0.4),
               strokeWidth=0.6))
    for e, ps in shapes:
        col = PART_BLUE if e.spec.part_of is not None else ELEMENT_GREY
        for p in ps:
            coords = [c for q in p for c in P(float(q[0]), float(q[1]))]
            if len(coords) >= 4:
                d.add(PolyLine(coords, strokeWidth=1.4 if e.spec.part_of is None else 1.0,
                               strokeColor=colors.Color(*col)))
    # baseline dimensions from the datum, one row per element
    dx, _ = P(0.0 if b.datum == "rear" else b.length_mm, 0.0)
    d.add(Line(dx, 4, dx, by, strokeWidth=0.8, strokeColor=colors.black))
    d.add(String(dx, 0, "datum", fontSize=6.5, textAnchor="middle"))
    for row, m in enumerate(sorted(b.mounts, key=lambda m: m.position_mm)):
        ex, _ = P(m.x_mm, 0.0)
        yrow = 10 + 16.0 * (dims - row)
        d.add(Line(ex, yrow - 3, ex, by, strokeWidth=0.25, strokeColor=colors.Color(0.5, 0.5, 0.5),
                   strokeDashArray=[1.5, 1.5]))
        d.add(Line(dx, yrow, ex, yrow, strokeWidth=0.5, strokeColor=colors.black))
        for end in (dx, ex):
            d.add(Line(end, yrow - 2.5, end, yrow + 2.5, strokeWidth=0.5))
        text = f"{m.element}: {ctx.L(m.position_mm)}"
        if abs(ex - dx) > stringWidth(text, "Helvetica", 6.5) + 6:
            d.add(String((dx + ex) / 2, yrow + 2.0, text, fontSize=6.5, textAnchor="middle"))
        else:  # a short dimension: its words beyond its far end
            d.add(String(max(ex, dx) + 4, yrow - 2.0, text, fontSize=6.5))
    d.add(String(w - 20, h - 8, "forward (directors) ->", fontSize=7, textAnchor="end"))
    return d
