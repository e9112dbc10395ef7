"""Drawing the 1:1 layout with reportlab: tiled pages with alignment crosses and
an assembly map, or one roll page; every page with its calibration bars."""

from __future__ import annotations

import io
from typing import Any

from ...errors import DesignError
from ...plan import Plan
from ...units import format_mm
from .layout import Item, Layout, build_layout, shift
from .papers import PAPERS, PT_PER_MM
from .tiling import (
    CROSS_MM,
    FOOTER_MM,
    MARGIN_MM,
    OVERLAP_MM,
    connected,
    content_area,
    crosses,
    row_name,
    tile_grid,
)

__all__ = ["template_pdf", "draw_items", "calibration_bars", "ACTUAL_SIZE"]


def _font(bold: bool) -> str:
    return "Helvetica-Bold" if bold else "Helvetica"


def draw_items(c: Any, items: list[Item], dx_pt: float, dy_pt: float,
               clip: tuple[float, float, float, float] | None = None) -> None:
    """Draw layout items (mm) on a reportlab canvas at 1:1, offset by (dx, dy) pt.
    Items wholly outside `clip` (x0, y0, x1, y1 in mm) are skipped."""
    k = PT_PER_MM

    def X(x: float) -> float:
        return dx_pt + x * k

    def Y(y: float) -> float:
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


def _touches(it: Item, clip: tuple[float, float, float, float]) -> bool:
    d = it.data
    if it.kind == "line":
        xs, ys = (d[0][0], d[1][0]), (d[0][1], d[1][1])
    elif it.kind in ("arc", "circle"):
        (cx, cy), r = (d[0], d[1]) if it.kind == "arc" else ((d[0], d[1]), d[2])
        xs, ys = (cx - r, cx + r), (cy - r, cy + r)
    elif it.kind == "poly":
        xs, ys = tuple(p[0] for p in d[0]), tuple(p[1] for p in d[0])
    elif it.kind == "rect":
        xs, ys = (d[0], d[0] + d[2]), (d[1], d[1] + d[3])
    else:  # text: generous box
        reach = len(d[2]) * it.size * 0.6 / PT_PER_MM
        xs, ys = (d[0] - reach, d[0] + reach), (d[1] - reach, d[1] + reach)
    return not (max(xs) < clip[0] or min(xs) > clip[2] or max(ys) < clip[1] or min(ys) > clip[3])


def calibration_bars(c: Any, x_pt: float, y_pt: float) -> None:
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


def _footer(c: Any, page_w_pt: float, label: str) -> None:
    k = PT_PER_MM
    x = MARGIN_MM * k + 34
    calibration_bars(c, x, MARGIN_MM * k + 2)
    c.setFont("Helvetica-Bold", 8.5)
    c.drawString(MARGIN_MM * k, MARGIN_MM * k + 15.5 * k, ACTUAL_SIZE)
    c.setFont("Helvetica", 8)
    c.drawRightString(page_w_pt - MARGIN_MM * k, MARGIN_MM * k + 15.5 * k, label)


def template_pdf(plan: Plan, paper: str = "a4", overlap_mm: float = OVERLAP_MM) -> bytes:
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


def _roll(c: Any, plan: Plan, layout: Layout, paper: str) -> None:
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


def _tiled(c: Any, plan: Plan, layout: Layout, paper: str, overlap: float) -> None:
    k = PT_PER_MM
    pw, ph, cols, rows = tile_grid(layout.width, layout.height, paper, overlap)
    cw, ch = content_area(pw, ph)
    sx, sy = cw - overlap, ch - overlap
    # grow the layout to fill the grid, so the drawing sits in the middle
    gw, gh = cw + (cols - 1) * sx, ch + (rows - 1) * sy
    ox, oy = (gw - layout.width) / 2, (gh - layout.height) / 2
    items = [Item(it.kind, it.data, it.width, it.dash, it.grey, it.size, it.angle, it.anchor,
                  it.bold) for it in layout.items]
    shift(items, ox, oy)

    def box(r: int, col: int) -> tuple[float, float, float, float]:
        x0, y0 = col * sx, (rows - 1 - r) * sy
        return (x0, y0, x0 + cw, y0 + ch)

    grid = [(r, col) for r in range(rows) for col in range(cols)]
    printed = [t for t in grid if any(_touches(it, box(*t)) for it in items)]
    if not printed or not connected(printed):
        printed = grid
    alignment = crosses(cols, rows, cw, ch, overlap)
    for n, x, y in alignment:
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
        name = f"{row_name(r)}{col + 1}"
        _footer(c, pw * k, f"tile {name}: row {row_name(r)} of {rows}, column {col + 1} of "
                           f"{cols}   page {page} of {total}")
        c.showPage()


def _tile_frame(c: Any, col: int, r: int, cols: int, rows: int, cw: float, ch: float,
                overlap: float) -> None:
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


def _assembly_map(c: Any, plan: Plan, layout: Layout, items: list[Item], pw: float, ph: float,
                  cols: int, rows: int, cw: float, ch: float, overlap: float, gw: float,
                  gh: float, total: int, paper: str, printed: set[tuple[int, int]]) -> None:
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
                         f"{row_name(r)}{col + 1}" + (" (blank)" if blank else ""))
            if blank:
                c.setDash([])
                c.setStrokeColorRGB(0.1, 0.3, 0.8)
                c.setFillColorRGB(0.1, 0.3, 0.8)
    c.setStrokeColorRGB(0, 0, 0)
    c.setFillColorRGB(0, 0, 0)
    c.setFont("Helvetica", 7.5)
    c.drawString(left, my - 12, "Assembly map (not to scale): tiles in blue, "
                                "row letters from the top, column numbers from the left.")
    _footer(c, pw * k, f"assembly map   page 1 of {total}")
    c.showPage()
