"""The 1:1 layout: each piece's marking strip and its bent drawing, stacked (mm).

"Decide, then draw": this module decides where every line and label goes, as
`Item`s in millimetres with y up; drawing.py only draws them.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from ...plan import PiecePlan, Plan
from ...units import format_inches, format_mm
from .geometry import (
    PieceDrawing,
    bbox,
    mark_ids,
    merge_labels,
    piece_drawing,
    prim_points,
    side_text,
)
from .papers import PT_PER_MM

__all__ = ["Item", "Layout", "build_layout", "shift", "GUTTER_MM", "LABEL_GAP_MM"]

GUTTER_MM = 6.0  # space round the drawing inside the layout
STRIP_TICK_MM = 7.0  # tick beyond each side of the strip
CENTRE_TICK_MM = 12.0
TOOL_TICK_MM = 16.0  # bender marks: dashed ticks below the strip
LABEL_GAP_MM = 7.5  # least distance between neighbouring mark labels


@dataclass
class Item:
    """One thing drawn in the layout (mm, y up)."""

    kind: str  # "line", "arc", "poly", "circle", "text", "rect"
    data: tuple[Any, ...]
    width: float = 0.5  # stroke width, pt
    dash: tuple[float, ...] = ()
    grey: float = 0.0
    size: float = 7.0  # text size, pt
    angle: float = 0.0  # text rotation, degrees
    anchor: str = "start"
    bold: bool = False


@dataclass
class Layout:
    """Everything drawn at 1:1 (mm), with the origin at the layout's lower left."""

    items: list[Item]
    width: float
    height: float


def _strip(e: PiecePlan, den: int) -> tuple[list[Item], tuple[float, float, float, float]]:
    """The straight stock at true length, centre at x = 0, with a tick at every mark."""
    half = e.conductor_diameter_mm / 2
    a, b = -e.cut_length_mm / 2, e.cut_length_mm / 2
    items = [Item("rect", (a, -half, b - a, 2 * half), width=0.6, grey=0.0),
             Item("line", ((a - 8, 0), (b + 8, 0)), width=0.3, dash=(6, 2, 1, 2))]
    base = half + CENTRE_TICK_MM + 5  # labels start here, joined to their ticks by leaders
    top = base
    label_x = _spread([m.from_centre_mm for m in e.marks], LABEL_GAP_MM)
    for mid, m, lx in zip(mark_ids(e), e.marks, label_x):
        x = m.from_centre_mm
        ext = CENTRE_TICK_MM if m.kind == "centre" else STRIP_TICK_MM
        items.append(Item("line", ((x, -half - ext), (x, half + ext)),
                          width=0.8 if m.kind == "centre" else 0.5))
        items.append(Item("poly", (((x, half + ext), (lx, base - 2.5), (lx, base - 0.8)),),
                          width=0.25, grey=0.35))
        # two lines reading upwards, one each side of the leader
        lines = (f"{mid}  {m.label}", side_text(m.from_centre_mm, den))
        for n, words in enumerate(lines):
            items.append(Item("text", (lx - 0.5 if n == 0 else lx + 0.6 + 7 * 0.75 / PT_PER_MM,
                                       base, words), size=7, angle=90,
                              bold=m.kind == "centre"))
            top = max(top, base + len(words) * 7 * 0.5 / PT_PER_MM)
    bottom = -half - STRIP_TICK_MM
    tools = e.forming.tool_marks if e.forming is not None else ()
    tool_x = _spread([t.from_centre_mm for t in tools], LABEL_GAP_MM)
    for t, lx in zip(tools, tool_x):
        # where the pencil mark goes for a hand bender: below the strip, reading up
        x = t.from_centre_mm
        items.append(Item("line", ((x, -half), (x, -half - TOOL_TICK_MM)), width=0.8,
                          dash=(1.5, 0.8)))
        items.append(Item("poly", (((x, -half - TOOL_TICK_MM), (lx, -half - TOOL_TICK_MM - 2),
                                    (lx, -half - TOOL_TICK_MM - 3)),), width=0.25, grey=0.35))
        lines = (f"T{t.step}  bend {t.bend_index} to {t.bend_to_deg:.1f} deg",
                 f"at the tool's {t.tool_reference} mark")
        for n, words in enumerate(lines):
            items.append(Item("text", (lx - 0.5 if n == 0 else lx + 0.6 + 7 * 0.75 / PT_PER_MM,
                                       -half - TOOL_TICK_MM - 3.5, words), size=7, angle=90,
                              anchor="end"))
            bottom = min(bottom, -half - TOOL_TICK_MM - 3.5 - len(words) * 7 * 0.5 / PT_PER_MM)
    note = (f"Marking strip: lay the straight stock on the grey bar, centre on "
            f"M{_centre_index(e)}, and mark at each tick. Cut length "
            f"{format_inches(e.cut_length_mm, den)} ({format_mm(e.cut_length_mm)}); stock "
            f"{format_mm(e.conductor_diameter_mm, 2)} wide.")
    if tools:
        note += " Dashed ticks T1, T2, ... below: bender marks, in bending order."
    items.append(Item("text", (a, bottom - 6, note), size=8))
    return items, (a - 8, bottom - 9, b + 8, top)


def _spread(xs: list[float], gap: float) -> list[float]:
    """Label positions near `xs` (mm) but at least `gap` apart: each run of labels
    that would crowd is spread evenly about the middle of its marks."""
    order = sorted(range(len(xs)), key=lambda i: xs[i])
    groups: list[list[int]] = []
    for i in order:
        groups.append([i])
        while len(groups) > 1:
            a, b = groups[-2], groups[-1]
            a_last = _group_pos(a, xs, gap)[-1]
            b_first = _group_pos(b, xs, gap)[0]
            if b_first - a_last >= gap - 1e-9:
                break
            groups[-2:] = [a + b]
    out = list(xs)
    for g in groups:
        for i, x in zip(g, _group_pos(g, xs, gap)):
            out[i] = x
    return out


def _group_pos(g: list[int], xs: list[float], gap: float) -> list[float]:
    mid = sum(xs[i] for i in g) / len(g)
    return [mid + (k - (len(g) - 1) / 2) * gap for k in range(len(g))]


def _centre_index(e: PiecePlan) -> int:
    for i, m in enumerate(e.marks):
        if m.kind == "centre":
            return i + 1
    return 1


def _bent(e: PiecePlan, geo: PieceDrawing,
          den: int) -> tuple[list[Item], tuple[float, float, float, float]]:
    """The bent element at 1:1 with its marks and the jig's formers."""
    items: list[Item] = []
    pts: list[tuple[float, float]] = []
    for prim in geo.centreline:
        if prim[0] == "L":
            items.append(Item("line", (prim[1], prim[2]), width=0.3, dash=(6, 2, 1, 2)))
        elif prim[0] == "A":
            items.append(Item("arc", prim[1:], width=0.3, dash=(6, 2, 1, 2)))
        else:
            items.append(Item("poly", (prim[1],), width=0.4))
        pts += prim_points(prim)
    for prim in geo.outline:
        items.append(Item("line" if prim[0] == "L" else "arc",
                          (prim[1], prim[2]) if prim[0] == "L" else prim[1:], width=0.7))
        pts += prim_points(prim)
    half = e.conductor_diameter_mm / 2
    if geo.planar:
        mx, my = (geo.bbox[0] + geo.bbox[2]) / 2, (geo.bbox[1] + geo.bbox[3]) / 2
        labels = []
        for mid, _m, (px, py), (tx, ty) in geo.marks:
            ext = half + 4
            items.append(Item("line", ((px - ty * ext, py + tx * ext),
                                       (px + ty * ext, py - tx * ext)), width=0.5))
            nx, ny = -ty, tx  # label on the outside of the element
            if (px - mx) * nx + (py - my) * ny < 0:
                nx, ny = -nx, -ny
            anchor = "start" if nx > 0.7 else ("end" if nx < -0.7 else "middle")
            labels.append((mid, px + nx * (ext + 2.5), py + ny * (ext + 2.5), anchor))
            pts.append((px + nx * (ext + 5), py + ny * (ext + 5)))
        for text, x, y, anchor in merge_labels(labels, 4.0):
            items.append(Item("text", (x, y - (0 if anchor == "middle" else 0.8), text),
                              size=6.5, anchor=anchor))
    forming = e.forming
    if forming is not None:
        for f in forming.formers:
            cx, cy = f.centre_mm
            items.append(Item("circle", (cx, cy, f.radius_mm), width=0.6, dash=(3, 2)))
            items.append(Item("line", ((cx - 3, cy), (cx + 3, cy)), width=0.3))
            items.append(Item("line", ((cx, cy - 3), (cx, cy + 3)), width=0.3))
            items.append(Item("text", (cx, cy + 4.5, f"former {f.label}"), size=6,
                              anchor="middle"))
            items.append(Item("text", (cx, cy - 4.5, f"{format_mm(2 * f.radius_mm)} dia"),
                              size=6, anchor="middle"))
            pts += [(cx - f.radius_mm, cy - f.radius_mm), (cx + f.radius_mm, cy + f.radius_mm)]
        for (f1, f2), gap in zip(zip(forming.formers, forming.formers[1:]),
                                 forming.former_spacing_mm):
            (x1, y1), (x2, y2) = f1.centre_mm, f2.centre_mm
            items.append(Item("line", ((x1, y1), (x2, y2)), width=0.3, dash=(1, 1.5)))
            items.append(Item("text", ((x1 + x2) / 2, (y1 + y2) / 2 + 1.5,
                                       f"{f1.label}-{f2.label} centres {format_mm(gap)} "
                                       f"({format_inches(gap, den)})"), size=6, anchor="middle"))
    box = bbox(pts) if pts else (0, 0, 1, 1)
    title = ("Bent element at 1:1 (centreline dash-dot, outline solid, formers dashed)"
             if geo.planar else "Bent element, top view (projection; not for marking)")
    items.append(Item("text", (box[0], box[3] + 5, title), size=8))
    return items, (box[0], box[1], max(box[2], box[0] + 120), box[3] + 9)


def shift(items: list[Item], dx: float, dy: float) -> None:
    for it in items:
        d = it.data
        if it.kind == "line":
            it.data = ((d[0][0] + dx, d[0][1] + dy), (d[1][0] + dx, d[1][1] + dy))
        elif it.kind == "arc":
            it.data = ((d[0][0] + dx, d[0][1] + dy), *d[1:])
        elif it.kind == "poly":
            it.data = (tuple((x + dx, y + dy) for x, y in d[0]),)
        elif it.kind in ("circle", "text", "rect"):
            it.data = (d[0] + dx, d[1] + dy, *d[2:])


def build_layout(plan: Plan) -> Layout:
    """Every piece's marking strip and bent drawing, stacked, at 1:1 (mm)."""
    den = plan.design.shop.fraction
    items: list[Item] = []
    y = GUTTER_MM
    width = 0.0
    for e, piece in reversed([(el, p) for el in plan.elements for p in el.pieces]):
        geo = piece_drawing(piece)
        for part in (_bent(piece, geo, den), _strip(piece, den)):
            its, (x0, y0, x1, y1) = part
            shift(its, GUTTER_MM - x0, y - y0)
            items += its
            y += (y1 - y0) + GUTTER_MM
            width = max(width, x1 - x0 + 2 * GUTTER_MM)
        head = Item("text", (GUTTER_MM, y - 4, f"{e.piece_name(piece)}  (x {e.quantity})"),
                    size=11, bold=True)
        items.append(head)
        y += 6 + GUTTER_MM
    return Layout(items, width, y)
