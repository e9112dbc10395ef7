"""The full-scale (1:1) template: a PDF to print at actual size and mark from.

Each element gets a marking strip (the straight stock at true length with a
tick at every mark, measured from the centre) and a drawing of the bent
element (centreline, outline, marks and, when the forming stage has run, the
jig's formers), all as vectors at 1:1. The layout is tiled over A4 or Letter
pages with an overlap, numbered alignment crosses in the overlaps, row/column
tile labels and an assembly map on the first page; or put on one large-format
roll page. Every page carries a 100 mm and a 4 in calibration bar.

This module also holds the drawing helpers the build sheet shares: paper
sizes, the element's 2D geometry and where each mark falls on it. It reads
the Plan and places lines; it decides no engineering figure.

Units: millimetres in the layout, PDF points (1/72 in) on the page.
"""

from __future__ import annotations

import io
import math
from dataclasses import dataclass
from typing import Literal

from ..errors import DesignError
from ..units import IN, format_inches, format_mm

__all__ = ["PAPERS", "SHEET_PAPERS", "TEMPLATE_PAPERS", "Paper", "PT_PER_MM", "Layout",
           "ElementGeometry", "element_geometry", "merge_labels", "tile_grid", "template_pdf",
           "paper_size",
           "side_text"]

PT_PER_MM = 72 / 25.4

Paper = Literal["a4", "letter", "roll-610mm", "roll-914mm"]
# (width, height) in mm; a roll's height is set by the drawing
PAPERS: dict[str, tuple[float, float | None]] = {
    "a4": (210.0, 297.0),
    "letter": (8.5 * IN, 11 * IN),
    "roll-610mm": (610.0, None),
    "roll-914mm": (914.0, None),
}
SHEET_PAPERS = ("a4", "letter")
TEMPLATE_PAPERS = tuple(PAPERS)

MARGIN_MM = 10.0  # unprintable edge most office printers leave, and some
FOOTER_MM = 26.0  # band for the tile label, the calibration bars and the instruction
OVERLAP_MM = 15.0  # tiles overlap by this much; alignment crosses sit in the overlap
CROSS_MM = 10.0  # arm length of an alignment cross
GUTTER_MM = 6.0  # space round the drawing inside the layout
STRIP_TICK_MM = 7.0  # tick beyond each side of the strip
CENTRE_TICK_MM = 12.0
TOOL_TICK_MM = 16.0  # bender marks: dashed ticks below the strip
LABEL_GAP_MM = 7.5  # least distance between neighbouring mark labels


def paper_size(paper: str) -> tuple[float, float | None]:
    """The paper's (width, height) in mm (height None for a roll)."""
    if paper not in PAPERS:
        raise DesignError(f"unknown paper; use one of {', '.join(PAPERS)}", field="--paper",
                          value=paper)
    return PAPERS[paper]


def side_text(from_centre_mm: float, den: int) -> str:
    """`A 7 23/32" (195.9 mm)`: which half of the stock and how far from the centre."""
    if abs(from_centre_mm) < 1e-9:
        return "centre"
    side = "A" if from_centre_mm < 0 else "B"
    d = abs(from_centre_mm)
    return f"{side} {format_inches(d, den)} ({format_mm(d)})"


# -- the element's 2D geometry -------------------------------------------------
@dataclass(frozen=True)
class ElementGeometry:
    """An element in its drawing plane (mm).

    `centreline` and `outline` hold ("L", (x0, y0), (x1, y1)) lines and
    ("A", (cx, cy), r, start_deg, extent_deg) arcs; for a non-planar element
    `centreline` is a ("P", points) projection and `outline` is empty.
    `marks` holds (mark id, Mark, point, unit tangent) on the centreline.
    """

    planar: bool
    centreline: tuple
    outline: tuple
    marks: tuple
    bbox: tuple[float, float, float, float]


def _arc_points(cx, cy, r, start, extent, n=24):
    return [(cx + r * math.cos(math.radians(start + extent * i / n)),
             cy + r * math.sin(math.radians(start + extent * i / n))) for i in range(n + 1)]


def prim_points(prim, n: int = 24) -> list[tuple[float, float]]:
    """Points along one 2D primitive (for bounding boxes and scaled drawings)."""
    if prim[0] == "L":
        return [prim[1], prim[2]]
    if prim[0] == "A":
        return _arc_points(*prim[1], prim[2], prim[3], prim[4], n)
    return list(prim[1])


def _bbox(points) -> tuple[float, float, float, float]:
    xs = [p[0] for p in points]
    ys = [p[1] for p in points]
    return (min(xs), min(ys), max(xs), max(ys))


def mark_ids(e) -> list[str]:
    """"M1", "M2", ... for the element's marks, in order from end A."""
    return [f"M{i + 1}" for i in range(len(e.marks))]


def element_geometry(e) -> ElementGeometry:
    """The 2D drawing of one ElementPlan: centreline, outline and mark points."""
    from ..geometry.path import Arc3

    prims = e.path.primitives()
    half = e.conductor_diameter_mm / 2
    arcs = iter(e.bends)
    walk = []  # (primitive, neutral length)
    for prim in prims:
        walk.append((prim, next(arcs).arc_length_mm if isinstance(prim, Arc3) else prim.length))
    marks = []
    for mid, m in zip(mark_ids(e), e.marks):
        point, tangent = _point_at(walk, m.from_end_mm - e.trim_mm)
        marks.append((mid, m, point, tangent))
    if not e.planar:
        pts, _ = e.path.sample(max(e.path.centreline_length() / 600, 0.5))
        poly = tuple((float(p[0]), float(p[1])) for p in pts)
        return ElementGeometry(False, (("P", poly),), (), tuple(marks), _bbox(poly))
    centre, outline = [], []
    for prim in prims:
        if isinstance(prim, Arc3):
            cx, cy = prim.centre[0], prim.centre[1]
            start = math.degrees(math.atan2(prim.u[1], prim.u[0]))
            ccw = prim.u[0] * prim.v[1] - prim.u[1] * prim.v[0] > 0
            extent = math.degrees(prim.angle) * (1 if ccw else -1)
            centre.append(("A", (cx, cy), prim.radius, start, extent))
            for r in (prim.radius - half, prim.radius + half):
                if r > 1e-9:
                    outline.append(("A", (cx, cy), r, start, extent))
        else:
            (x0, y0), (x1, y1) = prim.start[:2], prim.end[:2]
            length = math.hypot(x1 - x0, y1 - y0)
            if length < 1e-9:
                continue
            nx, ny = -(y1 - y0) / length * half, (x1 - x0) / length * half
            centre.append(("L", (x0, y0), (x1, y1)))
            outline.append(("L", (x0 + nx, y0 + ny), (x1 + nx, y1 + ny)))
            outline.append(("L", (x0 - nx, y0 - ny), (x1 - nx, y1 - ny)))
    # square caps at the two ends
    for (_, _, (px, py), (tx, ty)) in (marks[0], marks[-1]) if marks else ():
        outline.append(("L", (px - ty * half, py + tx * half), (px + ty * half, py - tx * half)))
    pts = [p for prim in outline or centre for p in prim_points(prim)]
    return ElementGeometry(True, tuple(centre), tuple(outline), tuple(marks), _bbox(pts))


def _point_at(walk, s: float):
    """The centreline point and unit tangent (x, y) at neutral-axis distance `s`
    (mm) from the path's start: straights keep their length, a bend is shared
    out in proportion to its angle."""
    from ..geometry.path import Arc3

    cursor = 0.0
    for i, (prim, length) in enumerate(walk):
        last = i == len(walk) - 1
        if s <= cursor + length + 1e-9 or last:
            f = 0.0 if length <= 0 else min(max((s - cursor) / length, 0.0), 1.0)
            if isinstance(prim, Arc3):
                phi = f * prim.angle
                p = prim.point(phi)
                d = (prim.radius * (-math.sin(phi) * _a(prim.u) + math.cos(phi) * _a(prim.v))
                     + prim.pitch / (2 * math.pi) * _a(prim.axis))
            else:
                p = _a(prim.start) * (1 - f) + _a(prim.end) * f
                d = _a(prim.end) - _a(prim.start)
            n = math.hypot(float(d[0]), float(d[1])) or 1.0
            return (float(p[0]), float(p[1])), (float(d[0]) / n, float(d[1]) / n)
        cursor += length
    return (0.0, 0.0), (1.0, 0.0)


def _a(v):
    import numpy as np

    return np.asarray(v, dtype=float)


# -- the 1:1 layout ------------------------------------------------------------
@dataclass
class Item:
    """One thing drawn in the layout (mm, y up)."""

    kind: str  # "line", "arc", "poly", "circle", "text", "rect"
    data: tuple
    width: float = 0.5  # stroke width, pt
    dash: tuple = ()
    grey: float = 0.0
    size: float = 7.0  # text size, pt
    angle: float = 0.0  # text rotation, degrees
    anchor: str = "start"
    bold: bool = False


@dataclass
class Layout:
    """Everything drawn at 1:1 (mm), with the origin at the layout's lower left."""

    items: list
    width: float
    height: float


def _strip(e, den: int) -> tuple[list, tuple]:
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


def merge_labels(labels: list[tuple], min_dist: float) -> list[tuple]:
    """Join labels (text, x, y, *extra) closer than `min_dist` to an earlier one
    into one "M3, M4" label at the earlier place, keeping its extras (same units
    as the positions)."""
    out: list[list] = []
    for text, x, y, *extra in labels:
        for g in out:
            if math.hypot(g[1] - x, g[2] - y) < min_dist:
                g[0] += f", {text}"
                break
        else:
            out.append([text, x, y, *extra])
    return [tuple(g) for g in out]


def _group_pos(g: list[int], xs: list[float], gap: float) -> list[float]:
    mid = sum(xs[i] for i in g) / len(g)
    return [mid + (k - (len(g) - 1) / 2) * gap for k in range(len(g))]


def _centre_index(e) -> int:
    for i, m in enumerate(e.marks):
        if m.kind == "centre":
            return i + 1
    return 1


def _bent(e, geo: ElementGeometry, den: int) -> tuple[list, tuple]:
    """The bent element at 1:1 with its marks and the jig's formers."""
    items: list = []
    pts = []
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
        for mid, m, (px, py), (tx, ty) in geo.marks:
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
    box = _bbox(pts) if pts else (0, 0, 1, 1)
    title = ("Bent element at 1:1 (centreline dash-dot, outline solid, formers dashed)"
             if geo.planar else "Bent element, top view (projection; not for marking)")
    items.append(Item("text", (box[0], box[3] + 5, title), size=8))
    return items, (box[0], box[1], max(box[2], box[0] + 120), box[3] + 9)


def _shift(items: list, dx: float, dy: float) -> None:
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


def build_layout(plan) -> Layout:
    """Every element's marking strip and bent drawing, stacked, at 1:1 (mm)."""
    den = plan.design.shop.fraction
    items: list = []
    y = GUTTER_MM
    width = 0.0
    for e in reversed(plan.elements):
        geo = element_geometry(e)
        for part in (_bent(e, geo, den), _strip(e, den)):
            its, (x0, y0, x1, y1) = part
            _shift(its, GUTTER_MM - x0, y - y0)
            items += its
            y += (y1 - y0) + GUTTER_MM
            width = max(width, x1 - x0 + 2 * GUTTER_MM)
        head = Item("text", (GUTTER_MM, y - 4, f"{e.name}  (x {e.quantity})"), size=11,
                    bold=True)
        items.append(head)
        y += 6 + GUTTER_MM
    return Layout(items, width, y)


# -- tiling --------------------------------------------------------------------
def content_area(paper_w: float, paper_h: float) -> tuple[float, float]:
    """The drawable width and height (mm) of a tile page, inside the margins and footer."""
    return paper_w - 2 * MARGIN_MM, paper_h - 2 * MARGIN_MM - FOOTER_MM


def tile_count(length_mm: float, room_mm: float, overlap_mm: float = OVERLAP_MM) -> int:
    """How many tiles of `room_mm` overlapping by `overlap_mm` cover `length_mm`."""
    if length_mm <= room_mm:
        return 1
    return math.ceil((length_mm - overlap_mm) / (room_mm - overlap_mm) - 1e-9)


def tile_grid(width_mm: float, height_mm: float, paper: str,
              overlap_mm: float = OVERLAP_MM) -> tuple[float, float, int, int]:
    """Page (w, h) in mm, columns and rows for a layout; portrait or landscape,
    whichever needs fewer pages (portrait on a tie)."""
    pw, ph = paper_size(paper)
    best = None
    for w, h in ((pw, ph), (ph, pw)):
        cw, ch = content_area(w, h)
        cols, rows = tile_count(width_mm, cw, overlap_mm), tile_count(height_mm, ch, overlap_mm)
        if best is None or cols * rows < best[2] * best[3]:
            best = (w, h, cols, rows)
    return best


def _crosses(cols: int, rows: int, cw: float, ch: float,
             overlap: float) -> list:
    """Numbered alignment crosses in the middle of each overlap band."""
    sx, sy = cw - overlap, ch - overlap
    xs_band = [c * sx + overlap / 2 for c in range(1, cols)]
    ys_band = [r * sy + overlap / 2 for r in range(1, rows)]
    xs_mid = [c * sx + cw / 2 for c in range(cols)]
    ys_mid = [r * sy + ch / 2 for r in range(rows)]
    pts = sorted({(round(x, 6), round(y, 6)) for x in xs_band for y in ys_band + ys_mid}
                 | {(round(x, 6), round(y, 6)) for x in xs_mid for y in ys_band},
                 key=lambda p: (-p[1], p[0]))
    return [(i + 1, x, y) for i, (x, y) in enumerate(pts)]


def _row_name(r: int) -> str:
    name = ""
    r += 1
    while r:
        r, rem = divmod(r - 1, 26)
        name = chr(65 + rem) + name
    return name


# -- drawing with reportlab --------------------------------------------------------
def _font(bold: bool) -> str:
    return "Helvetica-Bold" if bold else "Helvetica"


def draw_items(c, items: list, dx_pt: float, dy_pt: float,
               clip: tuple[float, float, float, float] | None = None) -> None:
    """Draw layout items (mm) on a reportlab canvas at 1:1, offset by (dx, dy) pt.
    Items wholly outside `clip` (x0, y0, x1, y1 in mm) are skipped."""
    k = PT_PER_MM

    def X(x):
        return dx_pt + x * k

    def Y(y):
        return dy_pt + y * k

    for it in items:
        if clip is not None and not _touches(it, clip):
            continue
        c.setLineWidth(it.width)
        c.setDash(list(it.dash) and [v * k for v in it.dash])
        c.setStrokeGray(it.grey)
        c.setFillGray(it.grey)
        d = it.data
        if it.kind == "line":
            c.line(X(d[0][0]), Y(d[0][1]), X(d[1][0]), Y(d[1][1]))
        elif it.kind == "arc":
            (cx, cy), r, start, extent = d
            p = c.beginPath()
            p.arc(X(cx - r), Y(cy - r), X(cx + r), Y(cy + r), start, extent)
            c.drawPath(p, stroke=1, fill=0)
        elif it.kind == "poly":
            p = c.beginPath()
            pts = d[0]
            p.moveTo(X(pts[0][0]), Y(pts[0][1]))
            for x, y in pts[1:]:
                p.lineTo(X(x), Y(y))
            c.drawPath(p, stroke=1, fill=0)
        elif it.kind == "circle":
            c.circle(X(d[0]), Y(d[1]), d[2] * k, stroke=1, fill=0)
        elif it.kind == "rect":
            c.setFillGray(0.82)
            c.rect(X(d[0]), Y(d[1]), d[2] * k, d[3] * k, stroke=1, fill=1)
        elif it.kind == "text":
            c.setFillGray(0)
            c.setFont(_font(it.bold), it.size)
            c.saveState()
            c.translate(X(d[0]), Y(d[1]))
            c.rotate(it.angle)
            if it.anchor == "middle":
                c.drawCentredString(0, -it.size * 0.35, d[2])
            elif it.anchor == "end":
                c.drawRightString(0, 0, d[2])
            else:
                c.drawString(0, 0, d[2])
            c.restoreState()
    c.setDash([])
    c.setStrokeGray(0)
    c.setFillGray(0)


def _touches(it: Item, clip) -> bool:
    d = it.data
    if it.kind == "line":
        xs, ys = (d[0][0], d[1][0]), (d[0][1], d[1][1])
    elif it.kind in ("arc", "circle"):
        (cx, cy), r = (d[0], d[1]) if it.kind == "arc" else ((d[0], d[1]), d[2])
        xs, ys = (cx - r, cx + r), (cy - r, cy + r)
    elif it.kind == "poly":
        xs, ys = [p[0] for p in d[0]], [p[1] for p in d[0]]
    elif it.kind == "rect":
        xs, ys = (d[0], d[0] + d[2]), (d[1], d[1] + d[3])
    else:  # text: generous box
        reach = len(d[2]) * it.size * 0.6 / PT_PER_MM
        xs, ys = (d[0] - reach, d[0] + reach), (d[1] - reach, d[1] + reach)
    return not (max(xs) < clip[0] or min(xs) > clip[2] or max(ys) < clip[1] or min(ys) > clip[3])


def calibration_bars(c, x_pt: float, y_pt: float) -> None:
    """A 100 mm bar and a 4 in bar, one above the other, starting at (x, y) pt.
    Each bar is one filled rectangle of exactly its length, ticked every 10 mm
    or 1/2 in, with its name."""
    k = PT_PER_MM
    c.setFont("Helvetica", 7)
    for row, (length, step, name) in enumerate(((100 * k, 10 * k, "100 mm"),
                                                 (4 * 72.0, 36.0, "4 in"))):
        y = y_pt + (1 - row) * 5.5 * k
        c.drawRightString(x_pt - 4, y, name)
        c.setFillGray(0)
        c.rect(x_pt, y, length, 1.2 * k, stroke=0, fill=1)
        c.setLineWidth(0.3)
        n = round(length / step)
        for i in range(n + 1):
            tick = (2.4 if i % 2 == 0 else 1.8) * k
            c.line(x_pt + i * step, y + 1.2 * k, x_pt + i * step, y + tick)
    c.setFont("Helvetica", 6.5)
    c.drawString(x_pt + 4 * 72 + 6, y_pt + 2.5 * k, "measure these: if a bar is not "
                 "exactly its length, the print is not to scale")


ACTUAL_SIZE = "PRINT AT ACTUAL SIZE (100 %): turn off 'fit to page' and any scaling"


def _footer(c, page_w_pt: float, label: str) -> None:
    k = PT_PER_MM
    x = MARGIN_MM * k + 34
    calibration_bars(c, x, MARGIN_MM * k + 2)
    c.setFont("Helvetica-Bold", 8.5)
    c.drawString(MARGIN_MM * k, MARGIN_MM * k + 15.5 * k, ACTUAL_SIZE)
    c.setFont("Helvetica", 8)
    c.drawRightString(page_w_pt - MARGIN_MM * k, MARGIN_MM * k + 15.5 * k, label)


def template_pdf(plan, paper: str = "a4", overlap_mm: float = OVERLAP_MM) -> bytes:
    """The full-scale template of every element in the Plan as PDF bytes."""
    from reportlab.pdfgen import canvas

    layout = build_layout(plan)
    buf = io.BytesIO()
    c = canvas.Canvas(buf, invariant=1, pageCompression=1)
    c.setTitle(f"{plan.design.project}: full-scale template")
    c.setAuthor("fabplan")
    c.setCreator("fabplan")
    c.setSubject("1:1 template; print at actual size")
    if PAPERS[paper][1] is None:
        _roll(c, plan, layout, paper)
    else:
        _tiled(c, plan, layout, paper, overlap_mm)
    c.save()
    return buf.getvalue()


def _roll(c, plan, layout: Layout, paper: str) -> None:
    k = PT_PER_MM
    width = PAPERS[paper][0]
    room = width - 2 * MARGIN_MM
    rotate = layout.width > room
    w, h = (layout.height, layout.width) if rotate else (layout.width, layout.height)
    if w > room:
        raise DesignError(f"the drawing is {format_mm(min(layout.width, layout.height), 0)} "
                          f"across and does not fit a {paper} roll; use a wider roll or a4/letter "
                          "tiles", field="--paper", value=paper)
    page_h = h + 2 * MARGIN_MM + FOOTER_MM + 12
    c.setPageSize((width * k, page_h * k))
    c.setFont("Helvetica-Bold", 12)
    c.drawString(MARGIN_MM * k, (page_h - MARGIN_MM) * k - 12,
                 f"{plan.design.project}: full-scale template ({paper}, one page)")
    base_y = (MARGIN_MM + FOOTER_MM) * k
    if rotate:
        c.saveState()
        # layout x runs down the page, layout y runs left to right
        c.translate(MARGIN_MM * k, base_y + h * k)
        c.rotate(-90)
        draw_items(c, layout.items, 0, 0)
        c.restoreState()
    else:
        draw_items(c, layout.items, MARGIN_MM * k, base_y)
    _footer(c, width * k, f"{paper} page 1 of 1")
    c.showPage()


def _tiled(c, plan, layout: Layout, paper: str, overlap: float) -> None:
    k = PT_PER_MM
    pw, ph, cols, rows = tile_grid(layout.width, layout.height, paper, overlap)
    cw, ch = content_area(pw, ph)
    sx, sy = cw - overlap, ch - overlap
    # grow the layout to fill the grid, so the drawing sits in the middle
    gw, gh = cw + (cols - 1) * sx, ch + (rows - 1) * sy
    ox, oy = (gw - layout.width) / 2, (gh - layout.height) / 2
    items = [Item(it.kind, it.data, it.width, it.dash, it.grey, it.size, it.angle, it.anchor,
                  it.bold) for it in layout.items]
    _shift(items, ox, oy)

    def box(r: int, col: int) -> tuple[float, float, float, float]:
        x0, y0 = col * sx, (rows - 1 - r) * sy
        return (x0, y0, x0 + cw, y0 + ch)

    grid = [(r, col) for r in range(rows) for col in range(cols)]
    printed = [t for t in grid if any(_touches(it, box(*t)) for it in items)]
    if not printed or not _connected(printed):
        printed = grid
    crosses = _crosses(cols, rows, cw, ch, overlap)
    for n, x, y in crosses:
        items += [Item("line", ((x - CROSS_MM / 2, y), (x + CROSS_MM / 2, y)), width=0.4),
                  Item("line", ((x, y - CROSS_MM / 2), (x, y + CROSS_MM / 2)), width=0.4),
                  Item("text", (x + 1.2, y + 1.2, str(n)), size=8, bold=True)]
    total = len(printed) + 1
    c.setPageSize((pw * k, ph * k))
    _assembly_map(c, plan, layout, items, pw, ph, cols, rows, cw, ch, overlap, gw, gh, total,
                  paper, set(printed))
    for page, (r, col) in enumerate(printed, 2):  # row A at the top
        x0, y0 = box(r, col)[:2]
        c.setPageSize((pw * k, ph * k))
        dx, dy = MARGIN_MM * k - x0 * k, (MARGIN_MM + FOOTER_MM) * k - y0 * k
        c.saveState()
        p = c.beginPath()
        p.rect(MARGIN_MM * k, (MARGIN_MM + FOOTER_MM) * k, cw * k, ch * k)
        c.clipPath(p, stroke=0, fill=0)
        draw_items(c, items, dx, dy, box(r, col))
        c.restoreState()
        _tile_frame(c, col, r, cols, rows, cw, ch, overlap)
        name = f"{_row_name(r)}{col + 1}"
        _footer(c, pw * k, f"tile {name}: row {_row_name(r)} of {rows}, column {col + 1} of "
                           f"{cols}   page {page} of {total}")
        c.showPage()


def _connected(tiles: list[tuple[int, int]]) -> bool:
    """Whether the tiles join up through shared alignment crosses (edge or
    corner neighbours), so that they can be laid out from any one of them."""
    left = set(tiles)
    todo = [tiles[0]]
    left.discard(tiles[0])
    while todo:
        r, c = todo.pop()
        for dr in (-1, 0, 1):
            for dc in (-1, 0, 1):
                t = (r + dr, c + dc)
                if t in left:
                    left.discard(t)
                    todo.append(t)
    return not left


def _tile_frame(c, col, r, cols, rows, cw, ch, overlap) -> None:
    """Dashed lines where the neighbouring tile's edge falls (trim the overlap
    off one of the two sheets along it, or lay one sheet over the other)."""
    k = PT_PER_MM
    x0, y0 = MARGIN_MM * k, (MARGIN_MM + FOOTER_MM) * k
    c.setLineWidth(0.3)
    c.setStrokeGray(0.55)
    c.rect(x0, y0, cw * k, ch * k, stroke=1, fill=0)
    c.setDash([2, 2])
    c.setFont("Helvetica", 6)
    c.setFillGray(0.4)
    if col > 0:
        c.line(x0 + overlap * k, y0, x0 + overlap * k, y0 + ch * k)
        c.drawString(x0 + overlap * k + 2, y0 + 3, "overlap: lay over the tile to the left")
    if r < rows - 1:
        c.line(x0, y0 + overlap * k, x0 + cw * k, y0 + overlap * k)
    c.setDash([])
    c.setStrokeGray(0)
    c.setFillGray(0)


def _assembly_map(c, plan, layout, items, pw, ph, cols, rows, cw, ch, overlap, gw, gh,
                  total, paper, printed) -> None:
    k = PT_PER_MM
    top = (ph - MARGIN_MM) * k
    left = MARGIN_MM * k
    c.setFont("Helvetica-Bold", 13)
    c.drawString(left, top - 13, f"{plan.design.project}")
    c.setFont("Helvetica", 9.5)
    name = paper.upper() if paper == "a4" else paper.title()
    turn = "landscape" if pw > ph else "portrait"
    lines = [
        f"Full-scale template: {len(printed)} tile(s) to print, in a grid of {rows} row(s) x "
        f"{cols} column(s) on {name} ({turn}).",
        f"This map is page 1 of {total}."
        + (f" {cols * rows - len(printed)} blank tile(s) of the grid are left out (grey)."
           if len(printed) < cols * rows else ""),
        "1. Print every page at actual size (100 %), no 'fit to page'. Measure the 100 mm and",
        "    4 in bars at the foot of each page with a rule before you use any page.",
        f"2. Tiles overlap by {format_mm(overlap, 0)}. Lay each tile over its left and lower "
        "neighbour",
        "    so that the numbered crosses with the same number sit exactly on top of each other.",
        "3. Tape the tiles flat. Lay the straight stock on the marking strip, centre on the",
        "    centre tick, and mark at each tick; check the bent element against the 1:1 drawing.",
    ]
    y = top - 32
    for line in lines:
        c.drawString(left, y, line)
        y -= 12.5
    # the map: the whole layout scaled into the rest of the page
    avail_w = (pw - 2 * MARGIN_MM) * k
    avail_h = y - 14 - (MARGIN_MM + FOOTER_MM) * k
    scale = min(avail_w / (gw * k), avail_h / (gh * k))
    mx = left + (avail_w - gw * k * scale) / 2
    my = y - 10 - gh * k * scale
    c.saveState()
    c.translate(mx, my)
    c.scale(scale, scale)
    draw_items(c, [it for it in items if it.kind != "text"], 0, 0)
    c.restoreState()
    sx, sy = cw - overlap, ch - overlap
    c.setLineWidth(0.6)
    c.setStrokeColorRGB(0.1, 0.3, 0.8)
    c.setFillColorRGB(0.1, 0.3, 0.8)
    for r in range(rows):
        for col in range(cols):
            x0 = col * sx
            y0 = (rows - 1 - r) * sy
            blank = (r, col) not in printed
            if blank:
                c.setStrokeGray(0.7)
                c.setFillGray(0.7)
                c.setDash([3, 2])
            c.rect(mx + x0 * k * scale, my + y0 * k * scale, cw * k * scale, ch * k * scale,
                   stroke=1, fill=0)
            c.setFont("Helvetica-Bold", 10)
            c.drawString(mx + (x0 + 3) * k * scale + 2, my + (y0 + ch - 3) * k * scale - 10,
                         f"{_row_name(r)}{col + 1}" + (" (blank)" if blank else ""))
            if blank:
                c.setDash([])
                c.setStrokeColorRGB(0.1, 0.3, 0.8)
                c.setFillColorRGB(0.1, 0.3, 0.8)
    c.setStrokeColorRGB(0, 0, 0)
    c.setFillColorRGB(0, 0, 0)
    c.setFont("Helvetica", 7.5)
    c.drawString(left, my - 12, f"Assembly map (not to scale): tiles in blue, "
                                f"row letters from the top, column numbers from the left.")
    _footer(c, pw * k, f"assembly map   page 1 of {total}")
    c.showPage()
