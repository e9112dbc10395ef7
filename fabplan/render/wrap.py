"""Wrap-around drilling templates: a strip of paper, at 1:1, as wide as the distance
round the support, to wrap round a boom or mast and drill through.

For each drilling pattern of the Plan (`Plan.drilling`: a beam's boom, a helix's
mast): the strip runs along the support from its datum edge (butted against the
datum end), its alignment line down the middle (laid along the support's line at
0 degrees), a glue tab past one long edge, the corners of a square support as fold
lines, a scale every 10 mm, and every hole as a circle of its diameter with a
cross at its centre, at its distance from the datum and its angle round (a through
hole's exit is drawn dashed half a turn round). The layout is decided here in mm
(fabplan.render.fullscale's `Item`s) and drawn by its `draw_items`: tiled over A4 or
Letter with overlapping tiles and numbered alignment crosses, or on one roll page;
every page carries the 100 mm and 4 in calibration bars.

Reads the Plan's drilling patterns; where a hole falls round the support comes from
fabplan.drilling.wrap. Same input, same bytes.
"""

from __future__ import annotations

import io
from collections.abc import Sequence
from typing import Any

from ..drilling.records import DrillPattern
from ..drilling.wrap import around_mm, exit_angle_deg, face_edges_mm
from ..errors import DesignError
from ..plan import Plan
from ..units import format_inches, format_mm
from .fullscale.drawing import ACTUAL_SIZE, calibration_bars, draw_items, draw_on_roll
from .fullscale.fonts import FONT, FONT_BOLD, register_fonts, text_width_mm
from .fullscale.layout import Item, Layout, item_box, shift
from .fullscale.papers import PAPERS, PT_PER_MM, paper_size
from .fullscale.tiling import (
    CROSS_MM,
    FOOTER_MM,
    MARGIN_MM,
    OVERLAP_MM,
    Grid,
    content_area,
    crosses,
    row_name,
    tile_count,
)
from .glyphs import printable_canvas

__all__ = ["wrap_layout", "wrap_pdf", "drilling_pdf", "TAB_MM", "END_MM"]

TAB_MM = 12.0  # glue tab past the strip's upper edge
END_MM = 40.0  # the strip runs this far past the last hole (within the support)
LABEL_MM = 26.0  # room above the strip for the hole labels


def wrap_layout(pattern: DrillPattern, den: int = 16) -> Layout:
    """The strip of one drilling pattern at 1:1 (mm, y up; x from the datum edge)."""
    c = pattern.circumference_mm
    half = c / 2
    last = max((h.from_datum_mm for h in pattern.holes), default=0.0)
    length = min(pattern.length_mm, last + END_MM) if pattern.length_mm > 0 else last + END_MM
    length = max(length, 60.0)
    items: list[Item] = []
    # strip outline: datum edge bold, the far end thin, the long edges cut lines
    items.append(Item("line", ((0.0, -half), (0.0, half + TAB_MM)), width=1.6))
    items.append(Item("line", ((length, -half), (length, half + TAB_MM)), width=0.4))
    items.append(Item("line", ((0.0, -half), (length, -half)), width=0.6))
    items.append(Item("line", ((0.0, half), (length, half)), width=0.6))
    items.append(Item("line", ((0.0, half + TAB_MM), (length, half + TAB_MM)), width=0.3,
                      dash=(2, 2), grey=0.4))
    items.append(Item("text", (length / 2, half + TAB_MM / 2,
                               "glue tab: wrap the strip round and stick this under the other "
                               "edge, edges exactly meeting"), size=6.5, anchor="middle",
                      grey=0.3))
    # alignment line and the square's corners
    items.append(Item("line", ((-6.0, 0.0), (length + 6.0, 0.0)), width=0.5,
                      dash=(6, 2, 1, 2)))
    x_label = 3.0
    while x_label < length - 60:
        items.append(Item("text", (x_label, 1.5, "ALIGNMENT LINE: lay along the support's line "
                                                 "(0 deg)"), size=6.5, bold=True))
        x_label += 200.0
    for y in face_edges_mm(pattern):
        if -half < y < half:
            items.append(Item("line", ((0.0, y), (length, y)), width=0.3, dash=(1, 1.5),
                              grey=0.45))
            items.append(Item("text", (length - 3, y + 1.0, "corner: fold here"), size=5.5,
                              anchor="end", grey=0.4))
    # scale along the lower edge: a tick every 10 mm, a number every 100 mm
    tick = 0.0
    while tick <= length + 1e-9:
        major = abs(tick / 100 - round(tick / 100)) < 1e-9
        mid = abs(tick / 50 - round(tick / 50)) < 1e-9
        items.append(Item("line", ((tick, -half), (tick, -half + (5.0 if major else 3.5 if mid
                                                                    else 2.0))), width=0.3))
        if major and tick > 0:
            items.append(Item("text", (tick + 0.8, -half + 5.5, f"{tick:.0f}"), size=5.5))
        tick += 10.0
    # holes
    for n, h in enumerate(pattern.holes, 1):
        x = h.from_datum_mm
        r = h.diameter_mm / 2
        y = around_mm(pattern.section, pattern.outside_mm, h.angle_deg)
        for yy in _on_strip(y, half):
            _hole(items, x, yy, r, dash=())
            items.append(Item("text", (x + r + 1.5, yy + 1.2, f"H{n}"), size=7, bold=True))
        label = f"H{n} {h.label}: dia {format_mm(h.diameter_mm)}"
        if h.through:
            ye = around_mm(pattern.section, pattern.outside_mm, exit_angle_deg(h.angle_deg))
            for yy in _on_strip(ye, half):
                _hole(items, x, yy, r, dash=(1.5, 1.2))
                items.append(Item("text", (x + r + 1.5, yy + 1.2, f"H{n} exit"), size=6))
        where = (f"{format_mm(x)} ({format_inches(x, den)}) from datum, {h.angle_deg:g} deg"
                 + (", through" if h.through else ""))
        base = half + TAB_MM + 6.0 + 9.0 * ((n - 1) % 2)  # two rows, alternating
        items.append(Item("text", (x, base + 1.0, label), size=6.5, anchor="middle",
                          bold=True))
        items.append(Item("text", (x, base - 2.4, where), size=5.5, anchor="middle"))
        items.append(Item("line", ((x, base - 4.0), (x, y + r + 0.5)), width=0.2, grey=0.5,
                          dash=(0.8, 0.8)))
    # the datum and the title
    items.append(Item("text", (-3.0, -half + 2.0, f"DATUM: butt this edge against {pattern.datum}"),
                      size=7, angle=90, bold=True, anchor="start"))
    items.append(Item("text", (0.0, half + TAB_MM + LABEL_MM - 3.0,
                               f"{pattern.name}: wrap-around drilling template, "
                               f"{pattern.section} {format_mm(pattern.outside_mm)}, distance "
                               f"round {format_mm(pattern.circumference_mm)}"), size=9,
                      bold=True))
    x0, y0 = -12.0, -half - 4.0
    x1, y1 = length + 10.0, half + TAB_MM + LABEL_MM
    for it in items:  # a text's advance width, for the drawing to anchor it
        if it.kind == "text":
            it.tw = text_width_mm(it.data[2], it.size, it.bold)
    shift(items, -x0, -y0)
    return Layout(items, x1 - x0, y1 - y0)


def _on_strip(y: float, half: float) -> tuple[float, ...]:
    """Where a point round the support falls on the strip: on the seam (half a turn
    from the alignment line) it is drawn at both long edges, which meet there."""
    return (half, -half) if abs(abs(y) - half) < 1e-6 else (y,)


def _hole(items: list[Item], x: float, y: float, r: float, dash: tuple[float, ...]) -> None:
    items.append(Item("circle", (x, y, r), width=0.6, dash=dash))
    arm = r + 2.5
    items.append(Item("line", ((x - arm, y), (x + arm, y)), width=0.25))
    items.append(Item("line", ((x, y - arm), (x, y + arm)), width=0.25))


def _footer(c: Any, page_w_pt: float, label: str) -> None:
    k = PT_PER_MM
    calibration_bars(c, MARGIN_MM * k + 34, MARGIN_MM * k + 2)
    c.setFont(FONT_BOLD, 8.5)
    c.drawString(MARGIN_MM * k, MARGIN_MM * k + 15.5 * k, ACTUAL_SIZE)
    c.setFont(FONT, 7.5)
    c.drawRightString(page_w_pt - MARGIN_MM * k, MARGIN_MM * k + 15.5 * k, label)


def _grid(layout: Layout, paper: str) -> Grid:
    """The tiles over a layout: portrait or landscape, whichever needs fewer pages
    (portrait on a tie)."""
    pw, ph = paper_size(paper)
    if ph is None:
        raise ValueError(f"{paper} is a roll: it is not tiled")
    best: Grid | None = None
    for w, h in ((pw, ph), (ph, pw)):
        cw, ch = content_area(w, h)
        g = Grid(w, h, tile_count(layout.width, cw, OVERLAP_MM),
                 tile_count(layout.height, ch, OVERLAP_MM), OVERLAP_MM)
        if best is None or g.cols * g.rows < best.cols * best.rows:
            best = g
    if best is None:  # pragma: no cover - two orientations were tried
        raise ValueError(paper)
    return best


def _tiles(c: Any, name: str, layout: Layout, paper: str, first_page: int,
           total: int) -> None:
    k = PT_PER_MM
    g = _grid(layout, paper)
    items = [Item(it.kind, it.data, it.width, it.dash, it.grey, it.size, it.angle, it.anchor,
                  it.bold, tw=it.tw) for it in layout.items]
    shift(items, (g.width - layout.width) / 2, (g.height - layout.height) / 2)
    if g.cols * g.rows > 1:
        for n, x, y in crosses(g.cols, g.rows, g.cw, g.ch, OVERLAP_MM):
            items += [Item("line", ((x - CROSS_MM / 2, y), (x + CROSS_MM / 2, y)), width=0.4),
                      Item("line", ((x, y - CROSS_MM / 2), (x, y + CROSS_MM / 2)), width=0.4),
                      Item("text", (x + 1.2, y + 1.2, str(n)), size=8, bold=True,
                           tw=text_width_mm(str(n), 8, True))]
    boxes = [item_box(it) if it.kind != "text" else None for it in items]
    page = first_page
    for r, col in g.tiles():
        x0, y0, x1, y1 = g.box(r, col)
        only = [i for i, b in enumerate(boxes)
                if b is None or not (b[2] < x0 or b[0] > x1 or b[3] < y0 or b[1] > y1)]
        c.setPageSize((g.page_w * k, g.page_h * k))
        c.saveState()
        p = c.beginPath()
        p.rect(MARGIN_MM * k, (MARGIN_MM + FOOTER_MM) * k, g.cw * k, g.ch * k)
        c.clipPath(p, stroke=0, fill=0)
        draw_items(c, items, MARGIN_MM * k - x0 * k, (MARGIN_MM + FOOTER_MM) * k - y0 * k,
                   only)
        c.restoreState()
        _footer(c, g.page_w * k, f"{name}: tile {row_name(r)}{col + 1} of {g.rows} x {g.cols} "
                                 f"(tiles left to right, crosses on crosses)   page {page} of "
                                 f"{total}")
        c.showPage()
        page += 1


def _roll(c: Any, name: str, layout: Layout, paper: str, page: int, total: int) -> None:
    k = PT_PER_MM
    width = PAPERS[paper][0]
    room = width - 2 * MARGIN_MM
    rotate = layout.width > room
    w, h = (layout.height, layout.width) if rotate else (layout.width, layout.height)
    if w > room:
        raise DesignError(f"the strip is {format_mm(w, 0)} across and does not fit a {paper} "
                          "roll; use a4/letter tiles", field="--paper", value=paper)
    page_h = h + 2 * MARGIN_MM + FOOTER_MM
    c.setPageSize((width * k, page_h * k))
    draw_on_roll(c, layout.items, h, rotate)
    _footer(c, width * k, f"{name}: {paper}, one page   page {page} of {total}")
    c.showPage()


def _pages(layout: Layout, paper: str) -> int:
    if PAPERS[paper][1] is None:
        return 1
    g = _grid(layout, paper)
    return g.cols * g.rows


def wrap_pdf(patterns: Sequence[DrillPattern], title: str, paper: str = "a4",
             den: int = 16) -> bytes:
    """Every pattern's wrap-around template, one after the other, as PDF bytes."""
    from reportlab.pdfgen import canvas

    paper_size(paper)
    if not patterns:
        raise DesignError("there are no holes to drill: no drilling template", field="drilling")
    register_fonts()
    layouts = [(p.name, wrap_layout(p, den)) for p in patterns]
    total = sum(_pages(lay, paper) for _, lay in layouts)
    buf = io.BytesIO()
    c = printable_canvas(canvas.Canvas)(buf, invariant=1, pageCompression=1, initialFontName=FONT,
                      initialFontSize=8)
    c.setViewerPreference("PrintScaling", "None")
    c.setTitle(f"{title}: wrap-around drilling templates")
    c.setAuthor("fabplan")
    c.setCreator("fabplan")
    c.setSubject("1:1 drilling templates; print at actual size")
    page = 1
    for name, lay in layouts:
        if PAPERS[paper][1] is None:
            _roll(c, name, lay, paper, page, total)
        else:
            _tiles(c, name, lay, paper, page, total)
        page += _pages(lay, paper)
    c.save()
    return buf.getvalue()


def drilling_pdf(plan: Plan, paper: str = "a4") -> bytes:
    """The wrap-around templates of every drilling pattern in the Plan."""
    return wrap_pdf(plan.drilling, plan.design.project, paper, plan.design.shop.fraction)
