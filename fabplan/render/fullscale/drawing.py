"""Drawing the 1:1 layout with reportlab: tiled pages with alignment crosses and
an assembly map, or one roll page; every page with its calibration bars.

Every string is set in the embedded Vera faces (fonts.py). The document asks
viewers not to scale it when printing (the PrintScaling viewer preference is
None), and the canvas runs in invariant mode: same Plan, same bytes.
"""

from __future__ import annotations

import io
from typing import Any

from ...errors import DesignError
from ...plan import Plan
from ...units import format_length, format_mm
from ..glyphs import printable, printable_canvas
from .arrange import Tiling, tile_layout
from .fonts import FONT, FONT_BOLD, register_fonts, text_width_mm
from .layout import Item, Layout, build_layout, wrap_text
from .papers import PAPERS, PT_PER_MM
from .tiling import FOOTER_MM, MARGIN_MM, OVERLAP_MM, row_name

__all__ = ["template_pdf", "draw_items", "draw_on_roll", "calibration_bars", "ACTUAL_SIZE"]


def _font(bold: bool) -> str:
    return FONT_BOLD if bold else FONT


def draw_on_roll(c: Any, items: list[Item], h_mm: float, rotate: bool) -> None:
    """Draw a layout on a one-page roll at 1:1 above the footer: as it is, or turned a
    quarter (layout x running down the page, layout y left to right) when `rotate`;
    `h_mm` is its height on the page."""
    k = PT_PER_MM
    base_y = (MARGIN_MM + FOOTER_MM) * k
    if rotate:
        c.saveState()
        c.translate(MARGIN_MM * k, base_y + h_mm * k)
        c.rotate(-90)
        draw_items(c, items, 0, 0)
        c.restoreState()
    else:
        draw_items(c, items, MARGIN_MM * k, base_y)


def draw_items(c: Any, items: list[Item], dx_pt: float, dy_pt: float,
               only: list[int] | None = None) -> None:
    """Draw layout items (mm) on a reportlab canvas at 1:1, offset by (dx, dy) pt;
    with `only`, just the items of those indices. Lines, arcs and boxes go
    first, in order; then every text, in one text object (set on its own
    baseline by a text matrix, so that no graphics state is saved per text)."""
    import math

    k = PT_PER_MM

    def X(x: float) -> float:
        return dx_pt + x * k

    def Y(y: float) -> float:
        return dy_pt + y * k

    chosen = items if only is None else [items[i] for i in only]
    state: tuple[float, tuple[float, ...], float] | None = None
    texts: list[Item] = []
    path: list[str] = []  # straight segments of one stroke, written as PDF path operators

    def flush() -> None:
        if path:
            c.addLiteral("n " + " ".join(path) + " S")
            path.clear()

    for it in chosen:
        if it.kind == "text":
            texts.append(it)
            continue
        if (it.width, it.dash, it.grey) != state:
            # set the stroke only when it changes: fewer operators, the same page
            flush()
            state = (it.width, it.dash, it.grey)
            c.setLineWidth(it.width)
            c.setDash(list(it.dash) and [v * k for v in it.dash])
            c.setStrokeGray(it.grey)
            c.setFillGray(it.grey)
        d = it.data
        if it.kind == "line":
            path.append(f"{X(d[0][0]):.3f} {Y(d[0][1]):.3f} m {X(d[1][0]):.3f} "
                        f"{Y(d[1][1]):.3f} l")
        elif it.kind == "poly":
            pts = d[0]
            path.append(f"{X(pts[0][0]):.3f} {Y(pts[0][1]):.3f} m " + " ".join(
                f"{X(x):.3f} {Y(y):.3f} l" for x, y in pts[1:]))
        elif it.kind == "rect":
            flush()
            c.setFillGray(0.82)
            c.addLiteral(f"n {X(d[0]):.3f} {Y(d[1]):.3f} {d[2] * k:.3f} {d[3] * k:.3f} re B")
            c.setFillGray(it.grey)
        elif it.kind == "arc":
            flush()
            (cx, cy), r, start, extent = d
            p = c.beginPath()
            p.arc(X(cx - r), Y(cy - r), X(cx + r), Y(cy + r), start, extent)
            c.drawPath(p, stroke=1, fill=0)
        elif it.kind == "circle":
            flush()
            c.circle(X(d[0]), Y(d[1]), d[2] * k, stroke=1, fill=0)
    flush()
    c.setDash([])
    c.setStrokeGray(0)
    c.setFillGray(0)
    if not texts:
        return
    t = c.beginText()
    font: tuple[str, float] | None = None
    for it in texts:
        x, y, words = it.data
        if (_font(it.bold), it.size) != font:
            font = (_font(it.bold), it.size)
            t.setFont(*font)
        ca, sa = math.cos(math.radians(it.angle)), math.sin(math.radians(it.angle))
        ca, sa = round(ca, 12), round(sa, 12)
        u = {"start": 0.0, "end": -it.tw, "middle": -it.tw / 2}[it.anchor] * k
        v = -0.35 * it.size if it.anchor == "middle" else 0.0
        t.setTextTransform(ca, sa, -sa, ca, X(x) + u * ca - v * sa, Y(y) + u * sa + v * ca)
        t.textOut(printable(words))
    c.drawText(t)


def calibration_bars(c: Any, x_pt: float, y_pt: float) -> None:
    """A 100 mm bar and a 4 in bar, one above the other, starting at (x, y) pt.
    Each bar is one filled rectangle of exactly its length, ticked every 10 mm
    or 1/2 in, with its name."""
    k = PT_PER_MM
    c.setFont(FONT, 7)
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
    c.setFont(FONT, 6)
    c.drawString(x_pt + 4 * 72 + 6, y_pt + 2.5 * k, "measure these: if a bar is not exactly "
                 "its length, the print is not to scale")


ACTUAL_SIZE = "PRINT AT ACTUAL SIZE (100 %): turn off 'fit to page' and any scaling"


def _fit(words: str, size: float, room_pt: float) -> str:
    """`words`, cut short with "..." to fit `room_pt` at `size`."""
    if text_width_mm(words, size) * PT_PER_MM <= room_pt:
        return words
    while words and text_width_mm(words + "...", size) * PT_PER_MM > room_pt:
        words = words[:-1]
    return words.rstrip(" ;,") + "..."


FOOTER_FORM = "fabplanFooter"


def _footer(c: Any, page_w_pt: float, label: str, carries: str = "") -> None:
    """The page's foot: the calibration bars and the instruction (drawn once in
    the document, as a form every page shows), then this page's own label."""
    k = PT_PER_MM
    x = MARGIN_MM * k + 34
    if not c.hasForm(FOOTER_FORM):
        c.beginForm(FOOTER_FORM)
        calibration_bars(c, x, MARGIN_MM * k + 2)
        c.setFont(FONT_BOLD, 8)
        c.drawString(MARGIN_MM * k, MARGIN_MM * k + 15.5 * k, ACTUAL_SIZE)
        c.endForm()
    c.doForm(FOOTER_FORM)
    c.setFont(FONT, 7.5)
    right = page_w_pt - MARGIN_MM * k
    room = right - (MARGIN_MM * k + text_width_mm(ACTUAL_SIZE, 8, True) * k + 12)
    c.drawRightString(right, MARGIN_MM * k + 15.5 * k, _fit(label, 7.5, room))
    if carries:
        c.setFont(FONT, 6.5)
        room = right - (x + 4 * 72 + 8)
        c.drawRightString(right, MARGIN_MM * k + 10.5 * k, _fit(f"carries: {carries}", 6.5,
                                                                room))


def template_pdf(plan: Plan, paper: str = "a4", overlap_mm: float = OVERLAP_MM) -> bytes:
    """The full-scale template of every element in the Plan as PDF bytes."""
    from reportlab import rl_config

    register_fonts()
    a85 = rl_config.useA85
    rl_config.useA85 = 0  # binary streams: smaller, and no pure-Python ASCII85 pass
    try:
        return _document(plan, paper, overlap_mm)
    finally:
        rl_config.useA85 = a85


def _document(plan: Plan, paper: str, overlap_mm: float) -> bytes:
    from reportlab.pdfgen import canvas

    buf = io.BytesIO()
    # the canvas's first font is the embedded one, so that no page refers to a
    # standard font the PDF does not carry
    c = printable_canvas(canvas.Canvas)(buf, invariant=1, pageCompression=1, initialFontName=FONT,
                      initialFontSize=8)
    c.setViewerPreference("PrintScaling", "None")
    c.setTitle(f"{plan.design.project}: full-scale template")
    c.setAuthor("fabplan")
    c.setCreator("fabplan")
    c.setSubject("1:1 template; print at actual size")
    if PAPERS[paper][1] is None:
        _roll(c, plan, build_layout(plan), paper)
    else:
        _tiled(c, plan, tile_layout(plan, paper, overlap_mm), paper)
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
    c.setFont(FONT_BOLD, 12)
    c.drawString(MARGIN_MM * k, (page_h - MARGIN_MM) * k - 12,
                 f"{plan.design.project}: full-scale template ({paper}, one page)")
    draw_on_roll(c, layout.items, h, rotate)
    _footer(c, width * k, f"{paper} page 1 of 1")
    c.showPage()


def _tiled(c: Any, plan: Plan, t: Tiling, paper: str) -> None:
    k = PT_PER_MM
    g = t.grid
    maps = _map_layout(plan, t, paper)
    total = len(maps) + len(t.printed)
    c.setPageSize((g.page_w * k, g.page_h * k))
    for n, page in enumerate(maps, 1):
        _map_page(c, plan, t, paper, page, n, total)
    for number, (r, col) in enumerate(t.printed, len(maps) + 1):  # row A at the top
        x0, y0 = g.box(r, col)[:2]
        c.setPageSize((g.page_w * k, g.page_h * k))
        dx, dy = MARGIN_MM * k - x0 * k, (MARGIN_MM + FOOTER_MM) * k - y0 * k
        c.saveState()
        p = c.beginPath()
        p.rect(MARGIN_MM * k, (MARGIN_MM + FOOTER_MM) * k, g.cw * k, g.ch * k)
        c.clipPath(p, stroke=0, fill=0)
        draw_items(c, t.items, dx, dy, t.buckets[(r, col)])
        c.restoreState()
        _tile_frame(c, col, r, g.rows, g.cw, g.ch, g.overlap)
        _footer(c, g.page_w * k, f"tile {g.name(r, col)}: row {row_name(r)} of {g.rows}, "
                                 f"column {col + 1} of {g.cols}   page {number} of {total}",
                t.reasons[(r, col)])
        c.showPage()


def _tile_frame(c: Any, col: int, r: int, rows: int, cw: float, ch: float,
                overlap: float) -> None:
    """Dashed lines where the neighbouring tile's edge falls (trim the overlap
    off one of the two sheets along it, or lay one sheet over the other)."""
    k = PT_PER_MM
    x0, y0 = MARGIN_MM * k, (MARGIN_MM + FOOTER_MM) * k
    c.setLineWidth(0.3)
    c.setStrokeGray(0.55)
    c.rect(x0, y0, cw * k, ch * k, stroke=1, fill=0)
    c.setDash([2, 2])
    c.setFont(FONT, 6)
    c.setFillGray(0.4)
    if col > 0:
        c.line(x0 + overlap * k, y0, x0 + overlap * k, y0 + ch * k)
        c.drawString(x0 + overlap * k + 2, y0 + 3, "overlap: lay over the tile to the left")
    if r < rows - 1:
        c.line(x0, y0 + overlap * k, x0 + cw * k, y0 + overlap * k)
    c.setDash([])
    c.setStrokeGray(0)
    c.setFillGray(0)


# -- the assembly map ----------------------------------------------------------------------
MAP_PT = 7.0  # legend and grid labels
MAP_LEAD_PT = 8.6


def _spans(names: list[tuple[int, int]]) -> str:
    """Left-out tiles as `B2, C5-C12`: runs along a row joined."""
    out = []
    i = 0
    while i < len(names):
        j = i
        while j + 1 < len(names) and names[j + 1] == (names[j][0], names[j][1] + 1):
            j += 1
        a, b = names[i], names[j]
        out.append(f"{row_name(a[0])}{a[1] + 1}"
                   + (f"-{row_name(b[0])}{b[1] + 1}" if j > i else ""))
        i = j + 1
    return ", ".join(out)


def _instructions(plan: Plan, t: Tiling, paper: str, maps: int) -> list[str]:
    g = t.grid
    unit, den = plan.design.shop.units, plan.design.shop.fraction
    name = paper.upper() if paper == "a4" else paper.title()
    turn = "landscape" if g.page_w > g.page_h else "portrait"
    left = g.rows * g.cols - len(t.printed)
    lines = [
        f"Full-scale template: {len(t.printed)} tile(s) to print, in a grid of {g.rows} row(s) "
        f"x {g.cols} column(s) on {name} ({turn}).",
        f"This map is page{'s' if maps > 1 else ''} 1{f'-{maps}' if maps > 1 else ''} of "
        f"{maps + len(t.printed)}."
        + (f" {left} tile(s) of the grid left out: nothing to mark or align on them (dashed "
           "grey); across such a gap, complete the grey bar or a straight line with a "
           "straightedge." if left else ""),
        "1. Print every page at actual size (100 %), no 'fit to page'. Measure the 100 mm and "
        "4 in bars at the foot of each page with a rule before you use any page.",
        f"2. Tiles overlap by {format_length(g.overlap, unit, den)}. Lay each tile over its "
        "left and lower neighbour so that the numbered crosses with the same number sit "
        "exactly on top of each other.",
        ("3. Tape the tiles flat. Lay the straight stock on the marking strip, centre on the "
         "centre tick, and mark at each tick; check the bent element against the 1:1 drawing."
         if t.strip_rows == 1 else
         "3. Tape the tiles flat. A long marking strip is folded into rows joined at ticks J1, "
         "J2, ...: mark the stock row by row as the note under the strip says; check the bent "
         "element against the 1:1 drawing."),
    ]
    return lines


def _legend(t: Tiling, first_tile_page: int) -> list[str]:
    g = t.grid
    out = [f"{g.name(r, c)} (page {n}): {t.reasons[(r, c)]}"
           for n, (r, c) in enumerate(t.printed, first_tile_page)]
    printed = set(t.printed)
    left = [tile for tile in g.tiles() if tile not in printed]
    if left:
        out.append(f"Left out: {_spans(left)}.")
    return out


class _MapPage:
    """What one map page holds: the instructions and map (first page only) and
    a run of legend lines in columns."""

    def __init__(self, first: bool, lines: list[str], cols: int, map_h_pt: float,
                 top_pt: float) -> None:
        self.first = first
        self.lines = lines
        self.cols = cols
        self.map_h_pt = map_h_pt
        self.top_pt = top_pt


MAP_CAPTION_PT = 26.0  # from the map's foot to the legend's heading
LEGEND_HEAD_PT = 11.0  # from the legend's heading to its first line


def _map_layout(plan: Plan, t: Tiling, paper: str) -> list[_MapPage]:
    """The map pages: the first with the instructions, the map and as much of the
    legend as fits below it; the rest of the legend on further pages."""
    k = PT_PER_MM
    g = t.grid
    width_pt = (g.page_w - 2 * MARGIN_MM) * k
    ncol = 2 if g.page_w < g.page_h else 3
    col_mm = (g.page_w - 2 * MARGIN_MM) / ncol - 4
    bottom = (MARGIN_MM + FOOTER_MM) * k + 8
    pages: list[_MapPage] = []
    for _ in range(3):  # page numbers in the legend depend on the number of map pages
        maps = max(1, len(pages))
        head = [piece for line in _instructions(plan, t, paper, maps)
                for piece in wrap_text(line, 9.5, width_pt / k)]
        lines = [piece for entry in _legend(t, maps + 1)
                 for piece in wrap_text(entry, MAP_PT, col_mm - 3)]
        top = (g.page_h - MARGIN_MM) * k - 32 - 12.5 * len(head) - 2
        room = top - bottom - MAP_CAPTION_PT - LEGEND_HEAD_PT
        need = -(-len(lines) // ncol) * MAP_LEAD_PT
        map_h = max(room - need, 0.5 * room)
        fits = max(1, int((room - map_h) / MAP_LEAD_PT + 1e-6)) * ncol
        pages = [_MapPage(True, lines[:fits], ncol, map_h, top)]
        rest = lines[fits:]
        cont_top = (g.page_h - MARGIN_MM) * k - 28
        per = max(1, int((cont_top - LEGEND_HEAD_PT - bottom) / MAP_LEAD_PT + 1e-6)) * ncol
        while rest:
            pages.append(_MapPage(False, rest[:per], ncol, 0.0, cont_top))
            rest = rest[per:]
        if len(pages) == maps:
            break
    return pages


def _map_page(c: Any, plan: Plan, t: Tiling, paper: str, page: _MapPage, n: int,
              total: int) -> None:
    k = PT_PER_MM
    g = t.grid
    left = MARGIN_MM * k
    top = (g.page_h - MARGIN_MM) * k
    width_pt = (g.page_w - 2 * MARGIN_MM) * k
    if page.first:
        c.setFont(FONT_BOLD, 13)
        c.drawString(left, top - 13, _fit(f"{plan.design.project}", 13, width_pt))
        c.setFont(FONT, 9.5)
        y = top - 32
        maps = total - len(t.printed)
        for line in _instructions(plan, t, paper, maps):
            for piece in wrap_text(line, 9.5, width_pt / k):
                c.drawString(left, y, piece)
                y -= 12.5
        y_legend = _draw_map(c, t, left + 16, page.top_pt, width_pt - 16, page.map_h_pt)
    else:
        c.setFont(FONT_BOLD, 11)
        c.drawString(left, top - 12, "Assembly map, continued: the tiles and what each carries")
        y_legend = page.top_pt
    c.setFont(FONT_BOLD, MAP_PT + 0.5)
    c.drawString(left, y_legend, "Printed tiles and what each carries (for marking and "
                                 "aligning):")
    c.setFont(FONT, MAP_PT)
    per_col = -(-len(page.lines) // page.cols)
    col_w = width_pt / page.cols
    for i, line in enumerate(page.lines):
        col, row = divmod(i, per_col)
        c.drawString(left + col * col_w, y_legend - LEGEND_HEAD_PT - row * MAP_LEAD_PT, line)
    _footer(c, g.page_w * k, f"assembly map   page {n} of {total}")
    c.showPage()


def _draw_map(c: Any, t: Tiling, x_pt: float, top_pt: float, avail_w: float,
              avail_h: float) -> float:
    """The whole layout scaled into the box below `top_pt`, the tiles over it,
    column numbers above and row letters to the left, clear of the drawing.
    Returns the y (pt) where the legend may start."""
    k = PT_PER_MM
    g = t.grid
    gw, gh = g.width, g.height
    label_h = MAP_PT + 3
    scale = min(avail_w / (gw * k), (avail_h - label_h) / (gh * k))
    mx = x_pt + (avail_w - gw * k * scale) / 2
    my = top_pt - label_h - gh * k * scale
    c.saveState()
    c.translate(mx, my)
    c.scale(scale, scale)
    draw_items(c, [it for it in t.items if it.kind != "text"], 0, 0)
    c.restoreState()
    printed = set(t.printed)
    c.setLineWidth(0.6)
    for r in range(g.rows):
        for col in range(g.cols):
            x0, y0 = col * g.sx, (g.rows - 1 - r) * g.sy
            if (r, col) in printed:
                c.setStrokeColorRGB(0.1, 0.3, 0.8)
                c.setDash([])
            else:
                c.setStrokeGray(0.7)
                c.setDash([3, 2])
            c.rect(mx + x0 * k * scale, my + y0 * k * scale, g.cw * k * scale,
                   g.ch * k * scale, stroke=1, fill=0)
    c.setDash([])
    c.setStrokeColorRGB(0, 0, 0)
    c.setFillColorRGB(0.1, 0.3, 0.8)
    c.setFont(FONT_BOLD, MAP_PT)
    # every n-th column and row named, so that no two names touch
    widest = max(text_width_mm(str(g.cols), MAP_PT, True),
                 text_width_mm(row_name(g.rows - 1), MAP_PT, True)) * k
    step_c = _every(g.sx * k * scale, widest + 3)
    step_r = _every(g.sy * k * scale, MAP_PT + 2)
    for col in range(0, g.cols, step_c):
        cx = mx + (col * g.sx + g.cw / 2) * k * scale
        c.drawCentredString(cx, top_pt - MAP_PT, str(col + 1))
    for r in range(0, g.rows, step_r):
        cy = my + ((g.rows - 1 - r) * g.sy + g.ch / 2) * k * scale
        c.drawRightString(mx - 4, cy - MAP_PT * 0.35, row_name(r))
    c.setFillColorRGB(0, 0, 0)
    c.setFont(FONT, MAP_PT)
    c.drawString(x_pt - 16, my - 11, _fit(
        "Assembly map (not to scale): printed tiles solid blue, left-out tiles dashed grey; "
        "rows lettered from the top, columns numbered from the left.", MAP_PT, avail_w + 16))
    return my - MAP_CAPTION_PT


def _every(pitch_pt: float, need_pt: float) -> int:
    step = 1
    while step * pitch_pt < need_pt:
        step += 1
    return step

