"""The 1:1 layout: each piece's marking strip and its bent drawing, as blocks (mm).

"Decide, then draw": this module decides every line and label as `Item`s in
millimetres with y up; drawing.py only draws them. Each item says what it
shows (`why`: "M3", "F1", "bend 2", "turn 4", "J1", ...; empty for a plain
stretch of bar or straight line), so that the tiler can tell a page worth
printing from one that is not. Labels are grouped (`group`): the texts of one
label and its leader move together when the tiler moves a label off a seam.

A piece is three kinds of block, stacked from the top: its heading, its
marking strip (one row, or several when the strip is folded to fit the page
grid; each row a block), and its bent drawing. Text widths are measured in
the embedded font (fonts.py), so every block knows its true extent.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass, replace
from typing import Any

from ...plan import PiecePlan, Plan
from ...units import LengthUnit, format_inches, format_length, format_mm
from .fonts import ASCENT, DESCENT, text_width_mm
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

__all__ = ["Item", "Block", "Layout", "PieceBlocks", "build_layout", "piece_blocks", "stack",
           "materialize", "Placement", "Piece", "Source", "pieces_of",
           "shift", "item_box", "text_box", "turn_marks", "GUTTER_MM", "LABEL_GAP_MM",
           "STRIP_TICK_MM", "CENTRE_TICK_MM", "TOOL_TICK_MM", "JOIN_TICK_MM", "TURN_TICK_MM",
           "ROLL_WRAP_MM", "text", "wrap_text"]

GUTTER_MM = 6.0  # space round the drawing inside the layout
STRIP_TICK_MM = 7.0  # tick beyond each side of the strip
CENTRE_TICK_MM = 12.0
TOOL_TICK_MM = 16.0  # bender marks: dashed ticks below the strip
JOIN_TICK_MM = 10.0  # where a folded strip's row ends and the next begins
TURN_TICK_MM = 5.0  # a helical bend: one full turn of stock
END_TICK_MM = 3.0  # a folded strip's first row starts at the stock's end A
LABEL_GAP_MM = 7.5  # least distance between neighbouring mark labels
END_RUN_MM = 8.0  # the centre line runs on past each end of the strip
ROLL_WRAP_MM = 250.0  # longest line of a note on a roll page
LABEL_PT = 7.0  # strip labels
NOTE_PT = 8.0


@dataclass
class Item:
    """One thing drawn in the layout (mm, y up).

    `why` names what the item shows ("" for a plain stretch of bar or straight
    line that a straightedge could complete); `owner` the piece it belongs to.
    Items of one label share a `group` (-1: none); `nudge` is what moving the
    label costs per mm along x and along y. A leader (`kind` "poly" in a
    group) keeps its first point when its label moves. `tw` is a text's
    advance width (mm).
    """

    kind: str  # "line", "arc", "poly", "circle", "text", "rect"
    data: tuple[Any, ...]
    width: float = 0.5  # stroke width, pt
    dash: tuple[float, ...] = ()
    grey: float = 0.0
    size: float = 7.0  # text size, pt
    angle: float = 0.0  # text rotation, degrees
    anchor: str = "start"
    bold: bool = False
    why: str = ""
    owner: str = ""
    group: int = -1
    nudge: tuple[float, float] = (1.0, 1.0)
    tw: float = 0.0


def text(x: float, y: float, words: str, size: float, *, angle: float = 0.0,
         anchor: str = "start", bold: bool = False, why: str = "",
         group: int = -1, nudge: tuple[float, float] = (1.0, 1.0)) -> Item:
    """A text item with its width measured in the template's font."""
    return Item("text", (x, y, words), size=size, angle=angle, anchor=anchor, bold=bold,
                why=why, group=group, nudge=nudge, tw=text_width_mm(words, size, bold))


def text_box(it: Item) -> tuple[float, float, float, float]:
    """The box a text item covers on the paper (mm): its advance width by the
    font's reach above and below the baseline, turned by its angle."""
    x, y, _ = it.data
    s = it.size / PT_PER_MM
    u0 = {"start": 0.0, "end": -it.tw, "middle": -it.tw / 2}[it.anchor]
    v0 = -0.35 * s if it.anchor == "middle" else 0.0
    corners = ((u0, v0 - DESCENT * s), (u0 + it.tw, v0 - DESCENT * s),
               (u0, v0 + ASCENT * s), (u0 + it.tw, v0 + ASCENT * s))
    ca, sa = math.cos(math.radians(it.angle)), math.sin(math.radians(it.angle))
    xs = [x + u * ca - v * sa for u, v in corners]
    ys = [y + u * sa + v * ca for u, v in corners]
    return (min(xs), min(ys), max(xs), max(ys))


def _arc_box(cx: float, cy: float, r: float, start: float,
             extent: float) -> tuple[float, float, float, float]:
    a0, a1 = (start, start + extent) if extent >= 0 else (start + extent, start)
    angles = [a0, a1] + [90.0 * k for k in range(math.ceil(a0 / 90), math.floor(a1 / 90) + 1)]
    xs = [cx + r * math.cos(math.radians(a)) for a in angles]
    ys = [cy + r * math.sin(math.radians(a)) for a in angles]
    return (min(xs), min(ys), max(xs), max(ys))


def item_box(it: Item) -> tuple[float, float, float, float]:
    """The box (x0, y0, x1, y1) an item covers (mm)."""
    d = it.data
    if it.kind == "line":
        return (min(d[0][0], d[1][0]), min(d[0][1], d[1][1]), max(d[0][0], d[1][0]),
                max(d[0][1], d[1][1]))
    if it.kind == "arc":
        (cx, cy), r, start, extent = d
        return _arc_box(cx, cy, r, start, extent)
    if it.kind == "circle":
        return (d[0] - d[2], d[1] - d[2], d[0] + d[2], d[1] + d[2])
    if it.kind == "poly":
        return bbox(d[0])
    if it.kind == "rect":
        return (d[0], d[1], d[0] + d[2], d[1] + d[3])
    return text_box(it)


def shift(items: list[Item], dx: float, dy: float) -> None:
    """Move items by (dx, dy) mm, in place."""
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


@dataclass
class Block:
    """Items in their own frame (mm) and the box they take. A `keep` block (a
    strip row, a heading) is kept clear of the seams between tile rows."""

    items: list[Item]
    box: tuple[float, float, float, float]
    keep: bool = False


@dataclass
class Layout:
    """Everything drawn at 1:1 (mm), with the origin at the layout's lower left."""

    items: list[Item]
    width: float
    height: float


class _Groups:
    """Numbers for label groups, unique in one layout."""

    def __init__(self) -> None:
        self.n = 0

    def new(self) -> int:
        self.n += 1
        return self.n


def wrap_text(words: str, size: float, width_mm: float, bold: bool = False) -> list[str]:
    """`words` broken into lines no wider than `width_mm` in the template's font
    (a single word wider than that stands alone)."""
    lines: list[str] = []
    cur = ""
    for w in words.split(" "):
        trial = f"{cur} {w}" if cur else w
        if cur and text_width_mm(trial, size, bold) > width_mm:
            lines.append(cur)
            cur = w
        else:
            cur = trial
    if cur:
        lines.append(cur)
    return lines


def _hard_wrap(line: str, size: float, width_mm: float, bold: bool = False) -> list[str]:
    """A line no wider than `width_mm`, cutting inside a word if it must."""
    out: list[str] = []
    cur = ""
    for ch in line:
        if cur and text_width_mm(cur + ch, size, bold) > width_mm:
            out.append(cur)
            cur = ch
        else:
            cur += ch
    return [*out, cur] if cur else out


def _paragraph(x: float, y_top: float, words: str, size: float, width_mm: float, why: str,
               groups: _Groups, bold: bool = False) -> list[Item]:
    """Lines of `words` from `y_top` down, left-aligned at x, as one label."""
    g = groups.new()
    lead = size * 1.25 / PT_PER_MM
    lines = [piece for line in wrap_text(words, size, width_mm, bold)
             for piece in _hard_wrap(line, size, width_mm, bold)]
    return [text(x, y_top - ASCENT * size / PT_PER_MM - i * lead, line, size, bold=bold,
                 why=why, group=g, nudge=(1.0, 4.0)) for i, line in enumerate(lines)]


def _extent(items: list[Item]) -> tuple[float, float, float, float]:
    boxes = [item_box(it) for it in items]
    return (min(b[0] for b in boxes), min(b[1] for b in boxes), max(b[2] for b in boxes),
            max(b[3] for b in boxes))


# -- the marking strip ---------------------------------------------------------------------
@dataclass(frozen=True)
class _Tick:
    """A tick across the strip at `x` (mm from the stock's centre) and its label."""

    x: float
    reach: float  # beyond each side of the stock
    width: float
    lines: tuple[str, str]
    why: str
    bold: bool = False


def turn_marks(e: PiecePlan) -> list[tuple[int, int, float]]:
    """(bend index, turns done, mm from the stock's centre) at each full turn of
    every helical bend, on the neutral axis. The stock of one turn is the
    bend's own share of the stock (the Plan's arc length, which the bend path
    measures on the neutral axis) over its turns: a helix is uniform, and the
    bend path maps its stock onto the arc in proportion to the angle."""
    out = []
    for b in e.bends:
        if b.pitch_mm <= 0 or b.angle_deg <= 360.0:
            continue
        per_turn = b.arc_length_mm * 360.0 / b.angle_deg
        k = 1
        while k * 360.0 < b.angle_deg - 0.5:  # the last turn ends at the bend's end mark
            out.append((b.index, k, b.start_from_centre_mm + k * per_turn))
            k += 1
    return out


def _strip_row(e: PiecePlan, den: int, unit: LengthUnit, row: int, rows: int, s0: float,
               s1: float, groups: _Groups) -> tuple[list[Item], float, float]:
    """One row of the marking strip: the stock from `s0` to `s1` (mm from its
    centre), drawn from x = 0. Returns its items and the top and bottom of its
    labels."""
    half = e.conductor_diameter_mm / 2
    last = row == rows - 1
    left = -END_RUN_MM if row == 0 else 0.0
    right = s1 - s0 + (END_RUN_MM if last else 0.0)
    items = [Item("rect", (0.0, -half, s1 - s0, 2 * half), width=0.6),
             Item("line", ((left, 0.0), (right, 0.0)), width=0.3, dash=(6, 2, 1, 2))]
    if rows > 1 and row == 0:  # a folded strip is laid from end A: its end is a mark
        items.append(Item("line", ((0.0, -half - END_TICK_MM), (0.0, half + END_TICK_MM)),
                          width=0.8, why="end A"))

    def inside(x: float) -> bool:
        return s0 - 1e-9 <= x < s1 - 1e-9 or (last and abs(x - s1) < 1e-9)

    ticks: list[_Tick] = []
    for mid, m in zip(mark_ids(e), e.marks):
        if inside(m.from_centre_mm):
            centre = m.kind == "centre"
            ticks.append(_Tick(m.from_centre_mm, CENTRE_TICK_MM if centre else STRIP_TICK_MM,
                               0.8 if centre else 0.5,
                               (f"{mid}  {m.label}", side_text(m.from_centre_mm, den, unit)),
                               mid, centre))
    for index, k, x in turn_marks(e):
        if inside(x):
            ticks.append(_Tick(x, TURN_TICK_MM, 0.5,
                               (f"bend {index}: {k} turn{'s' if k > 1 else ''} done",
                                side_text(x, den, unit)), f"turn {k}"))
    if row > 0:
        ticks.append(_Tick(s0, JOIN_TICK_MM, 0.8, (f"J{row}  from row {row}: lay J{row} here",
                                                   side_text(s0, den, unit)), f"J{row}", True))
    if not last:
        ticks.append(_Tick(s1, JOIN_TICK_MM, 0.8, (f"J{row + 1}  mark it, go on in row "
                                                   f"{row + 2}", side_text(s1, den, unit)),
                           f"J{row + 1}", True))
    ticks.sort(key=lambda t: t.x)
    base = half + CENTRE_TICK_MM + 5  # labels start here, joined to their ticks by leaders
    top = base
    line2 = LABEL_PT * 0.75 / PT_PER_MM  # second line of a label, beside the first
    for t, lx in zip(ticks, _spread([t.x - s0 for t in ticks], LABEL_GAP_MM)):
        x = t.x - s0
        g = groups.new()
        items.append(Item("line", ((x, -half - t.reach), (x, half + t.reach)), width=t.width,
                          why=t.why))
        items.append(Item("poly", (((x, half + t.reach), (lx, base - 2.5), (lx, base - 0.8)),),
                          width=0.25, grey=0.35, why=t.why, group=g))
        # two lines reading upwards, one each side of the leader
        for n, words in enumerate(t.lines):
            it = text(lx - 0.5 if n == 0 else lx + 0.6 + line2, base, words, LABEL_PT,
                      angle=90, bold=t.bold, why=t.why, group=g, nudge=(1.0, 20.0))
            items.append(it)
            top = max(top, base + it.tw)
    bottom = -half - STRIP_TICK_MM
    tools = tuple(m for m in (e.forming.tool_marks if e.forming is not None else ())
                  if inside(m.from_centre_mm))
    for tm, lx in zip(tools, _spread([m.from_centre_mm - s0 for m in tools], LABEL_GAP_MM)):
        # where the pencil mark goes for a hand bender: below the strip, reading up
        x = tm.from_centre_mm - s0
        g = groups.new()
        items.append(Item("line", ((x, -half), (x, -half - TOOL_TICK_MM)), width=0.8,
                          dash=(1.5, 0.8), why=f"T{tm.step}"))
        items.append(Item("poly", (((x, -half - TOOL_TICK_MM), (lx, -half - TOOL_TICK_MM - 2),
                                    (lx, -half - TOOL_TICK_MM - 3)),), width=0.25, grey=0.35,
                          why=f"T{tm.step}", group=g))
        lines = (f"T{tm.step}  bend {tm.bend_index} to {tm.bend_to_deg:.1f} deg",
                 f"at the tool's {tm.tool_reference} mark")
        for n, words in enumerate(lines):
            it = text(lx - 0.5 if n == 0 else lx + 0.6 + line2, -half - TOOL_TICK_MM - 3.5,
                      words, LABEL_PT, angle=90, anchor="end", why=f"T{tm.step}", group=g,
                      nudge=(1.0, 20.0))
            items.append(it)
            bottom = min(bottom, -half - TOOL_TICK_MM - 3.5 - it.tw)
    return items, top, bottom


def _strip_note(e: PiecePlan, den: int, unit: LengthUnit, rows: int) -> str:
    d = e.conductor_diameter_mm
    across = (f"{format_inches(d, den)} ({format_mm(d, 2)})" if unit == "in"
              else f"{format_mm(d, 2)} ({format_inches(d, den)})")
    cut = f"Cut length {format_length(e.cut_length_mm, unit, den)}; stock {across} across."
    if rows == 1:
        note = (f"Marking strip: lay the straight stock on the grey bar, centre on "
                f"M{_centre_index(e)}, and mark at each tick. {cut}")
    else:
        note = (f"Marking strip in {rows} rows, end A at the left of row 1: lay the stock "
                f"on row 1 with its end on the bar's end and mark at each tick and at J1; "
                f"then lay that J1 mark on the J1 tick of row 2 and go on, row by row. "
                f"{cut}")
    if e.forming is not None and e.forming.tool_marks:
        note += " Dashed ticks T1, T2, ... below: bender marks, in bending order."
    if turn_marks(e):
        note += " Short ticks: each full turn of a helical bend."
    return note


JOIN_CLEAR_MM = 12.0  # a join keeps this far from any tick, so that its label has room


def _joins(e: PiecePlan, a: float, length: float, rows: int, row_mm: float) -> list[float]:
    """Where a strip folded into `rows` rows (each at most `row_mm`) breaks (mm
    from the stock's centre): evenly, each break moved by the least that keeps
    it JOIN_CLEAR_MM from every mark, turn and bender tick."""
    ticks = [m.from_centre_mm for m in e.marks] + [x for _, _, x in turn_marks(e)]
    if e.forming is not None:
        ticks += [t.from_centre_mm for t in e.forming.tool_marks]
    out: list[float] = []
    for k in range(1, rows):
        base = a + length * k / rows
        prev = out[-1] if out else a
        nxt = a + length * (k + 1) / rows
        best = base
        for step in range(0, int(row_mm / 2)):
            trial = [base + step, base - step] if step else [base]
            ok = [p for p in trial if p - prev <= row_mm and nxt - p <= row_mm
                  and all(abs(p - t) >= JOIN_CLEAR_MM for t in ticks)]
            if ok:
                best = ok[0]
                break
        out.append(best)
    return out


def _strip_blocks(e: PiecePlan, den: int, unit: LengthUnit, row_mm: float | None,
                  wrap_mm: float, groups: _Groups) -> list[Block]:
    """The marking strip: the straight stock at true length with a tick at every
    mark, in one row, or folded into rows of at most `row_mm` (top row first)."""
    length = e.cut_length_mm
    rows = 1 if row_mm is None or length <= row_mm else math.ceil(length / row_mm - 1e-9)
    a = -length / 2
    ends = [a] + _joins(e, a, length, rows, row_mm or length) + [-a]
    blocks = []
    for r in range(rows):
        s0, s1 = ends[r], ends[r + 1]
        items, top, bottom = _strip_row(e, den, unit, r, rows, s0, s1, groups)
        if r == rows - 1:
            note = _paragraph(0.0, bottom - 3.2, _strip_note(e, den, unit, rows), NOTE_PT,
                              wrap_mm, "notes", groups)
            items += note
            bottom = min(item_box(it)[1] for it in note) - 1.5
        x0, _, x1, _ = _extent(items)
        blocks.append(Block(items, (min(x0, -END_RUN_MM), bottom - 0.5,
                                    max(x1, s1 - s0 + END_RUN_MM), top), keep=True))
    # rows line up on their left ends
    left = min(b.box[0] for b in blocks)
    for b in blocks:
        b.box = (left, *b.box[1:])
    return blocks


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


# -- the bent drawing ------------------------------------------------------------------------
def _bend_numbers(geo: PieceDrawing) -> dict[tuple[float, float], int]:
    """Each arc's centre (rounded) -> the number of its bend, counted from end A."""
    out: dict[tuple[float, float], int] = {}
    for prim in geo.centreline:
        if prim[0] == "A":
            key = (round(prim[1][0], 3), round(prim[1][1], 3))
            out.setdefault(key, len(out) + 1)
    return out


def _bent(e: PiecePlan, geo: PieceDrawing, den: int, unit: LengthUnit,
          groups: _Groups) -> Block:
    """The bent element at 1:1 with its marks and the jig's formers."""
    items: list[Item] = []
    pts: list[tuple[float, float]] = []
    bends = _bend_numbers(geo)

    def bend_of(prim: tuple[Any, ...]) -> str:
        n = bends.get((round(prim[1][0], 3), round(prim[1][1], 3)))
        return f"bend {n}" if n else "bends"

    for prim in geo.centreline:
        if prim[0] == "L":
            items.append(Item("line", (prim[1], prim[2]), width=0.3, dash=(6, 2, 1, 2)))
        elif prim[0] == "A":
            items.append(Item("arc", prim[1:], width=0.3, dash=(6, 2, 1, 2), why=bend_of(prim)))
        else:
            items.append(Item("poly", (prim[1],), width=0.4, why="drawing"))
        pts += prim_points(prim)
    for prim in geo.outline:
        if prim[0] == "L":
            items.append(Item("line", (prim[1], prim[2]), width=0.7))
        else:
            items.append(Item("arc", prim[1:], width=0.7, why=bend_of(prim)))
        pts += prim_points(prim)
    half = e.conductor_diameter_mm / 2
    if geo.planar:
        mx, my = (geo.bbox[0] + geo.bbox[2]) / 2, (geo.bbox[1] + geo.bbox[3]) / 2
        labels = []
        for mid, _m, (px, py), (tx, ty) in geo.marks:
            ext = half + 4
            items.append(Item("line", ((px - ty * ext, py + tx * ext),
                                       (px + ty * ext, py - tx * ext)), width=0.5, why=mid))
            nx, ny = -ty, tx  # label on the outside of the element
            if (px - mx) * nx + (py - my) * ny < 0:
                nx, ny = -nx, -ny
            anchor = "start" if nx > 0.7 else ("end" if nx < -0.7 else "middle")
            labels.append((mid, px + nx * (ext + 2.5), py + ny * (ext + 2.5), anchor))
            pts.append((px + nx * (ext + 5), py + ny * (ext + 5)))
        for words, x, y, anchor in merge_labels(labels, 4.0):
            items.append(text(x, y - (0 if anchor == "middle" else 0.8), words, 6.5,
                              anchor=anchor, why=words, group=groups.new()))
    forming = e.forming
    if forming is not None:
        for f in forming.formers:
            cx, cy = f.centre_mm
            # the disc's outline is for looking at: it is placed by its centre cross
            items.append(Item("circle", (cx, cy, f.radius_mm), width=0.6, dash=(3, 2)))
            items.append(Item("line", ((cx - 3, cy), (cx + 3, cy)), width=0.3, why=f.label))
            items.append(Item("line", ((cx, cy - 3), (cx, cy + 3)), width=0.3, why=f.label))
            g = groups.new()
            items.append(text(cx, cy + 4.5, f"former {f.label}", 6, anchor="middle",
                              why=f.label, group=g))
            items.append(text(cx, cy - 4.5, f"{format_length(2 * f.radius_mm, unit, den)} dia",
                              6, anchor="middle", why=f.label, group=g))
            pts += [(cx - f.radius_mm, cy - f.radius_mm), (cx + f.radius_mm, cy + f.radius_mm)]
        for (f1, f2), gap in zip(zip(forming.formers, forming.formers[1:]),
                                 forming.former_spacing_mm):
            (x1, y1), (x2, y2) = f1.centre_mm, f2.centre_mm
            items.append(Item("line", ((x1, y1), (x2, y2)), width=0.3, dash=(1, 1.5)))
            words = f"{f1.label}-{f2.label} centres {format_length(gap, unit, den)}"
            # the figure sits on its dotted line near the first former (inside its
            # disc when there is room), so that the long middle of a side carries
            # nothing but plain lines
            tw = text_width_mm(words, 6)
            length = math.hypot(x2 - x1, y2 - y1) or 1.0
            ux, uy = (x2 - x1) / length, (y2 - y1) / length
            upright = abs(ux) >= abs(uy)
            reach = tw / 2 if upright else 3.0  # the label's half-length along the line
            inside = 8.0 + reach  # clear of the former's own labels at its centre
            along = inside if inside + reach + 1 <= f1.radius_mm else f1.radius_mm + 3 + reach
            along = min(along, length / 2)
            items.append(text(x1 + ux * along + (0 if upright else 1.5),
                              y1 + uy * along + (1.5 if upright else 0),
                              words, 6, anchor="middle" if upright else "start",
                              why=f"{f1.label}-{f2.label}", group=groups.new()))
    box = bbox(pts) if pts else (0.0, 0.0, 1.0, 1.0)
    title = ("Bent element at 1:1 (centreline dash-dot, outline solid, formers dashed)"
             if geo.planar else "Bent element, top view (projection; not for marking)")
    head = text(box[0], box[3] + 5, title, 8, why="title", group=groups.new(), nudge=(1.0, 4.0))
    items.append(head)
    x0, y0, x1, y1 = _extent(items)
    return Block(items, (min(x0, box[0]), min(y0, box[1]), max(x1, box[0] + 120), y1 + 0.5))


def _heading(name: str, wrap_mm: float, groups: _Groups) -> Block:
    items = _paragraph(0.0, 0.0, name, 11, wrap_mm, "title", groups, bold=True)
    x0, y0, x1, _ = _extent(items)
    return Block(items, (0.0, y0 - 0.5, x1, 0.0), keep=True)


# -- the pieces, stacked ---------------------------------------------------------------------
@dataclass
class PieceBlocks:
    """One piece's blocks for a given strip row length and note width."""

    name: str
    heading: Block
    strip: list[Block]
    bent: Block

    def bottom_up(self) -> Iterator[Block]:
        yield self.bent
        yield from reversed(self.strip)
        yield self.heading


@dataclass(frozen=True)
class Piece:
    """A piece of stock to lay out: its Plan, its name, its heading and its
    flat drawing (made once, whatever the strip's folding)."""

    plan: PiecePlan
    name: str
    heading: str
    geo: PieceDrawing


def pieces_of(plan: Plan) -> list[Piece]:
    return [Piece(p, e.piece_name(p), f"{e.piece_name(p)}  (x {e.quantity})",
                  piece_drawing(p)) for e in plan.elements for p in e.pieces]


class Source:
    """A plan's pieces ready to lay out: each piece's flat drawing and bent block
    made once, whatever the strip's folding; label groups numbered across
    every block made from it."""

    def __init__(self, plan: Plan) -> None:
        self.den = plan.design.shop.fraction
        self.unit = plan.design.shop.units
        self.groups = _Groups()
        self.pieces = pieces_of(plan)
        self.strips: dict[tuple[int, float, float | None], list[Block]] = {}
        self.headings: dict[tuple[int, float], Block] = {}
        self.bent: list[Block] = []
        for pc in self.pieces:
            bent = _bent(pc.plan, pc.geo, self.den, self.unit, self.groups)
            for it in bent.items:
                it.owner = pc.name
            self.bent.append(bent)


def piece_blocks(source: Plan | Source, row_mm: float | None,
                 wrap_mm: float) -> list[PieceBlocks]:
    """Every piece's blocks, first piece first: its strip folded into rows of at
    most `row_mm` (None: one row), notes no wider than `wrap_mm`. The bent
    blocks are the source's own (copy them before moving their items)."""
    src = source if isinstance(source, Source) else Source(source)
    den, unit, groups = src.den, src.unit, src.groups
    out = []
    for i, (pc, bent) in enumerate(zip(src.pieces, src.bent)):
        folds = row_mm is not None and pc.plan.cut_length_mm > row_mm
        key = (i, wrap_mm, row_mm if folds else None)
        if key not in src.strips:  # a strip that fits the row is the same unfolded
            src.strips[key] = _strip_blocks(pc.plan, den, unit, row_mm if folds else None,
                                            wrap_mm, groups)
        strip = src.strips[key]
        if (i, wrap_mm) not in src.headings:
            src.headings[(i, wrap_mm)] = _heading(pc.heading, wrap_mm, groups)
        heading = src.headings[(i, wrap_mm)]
        for b in (*strip, heading):
            for it in b.items:
                it.owner = pc.name
        out.append(PieceBlocks(pc.name, heading, strip, bent))
    return out


Placement = tuple[Block, float, float]  # a block and where its frame goes (dx, dy), mm


def stack(blocks: list[PieceBlocks], seam_step_mm: float | None = None,
          seam_margin_mm: float = 0.6,
          start_mm: float = GUTTER_MM) -> tuple[list[Placement], float, float]:
    """Where each block goes when the pieces are stacked, the first piece at the
    top, each block's left edge at the gutter; and the width and height (mm).
    With `seam_step_mm`, a keep block that would straddle a seam between tile
    rows (every `seam_step_mm` up from y = 0) moves up to start just above it."""
    out: list[Placement] = []
    y = start_mm
    width = 0.0
    for pb in reversed(blocks):
        for b in pb.bottom_up():
            x0, y0, x1, y1 = b.box
            h = y1 - y0
            if b.keep and seam_step_mm:
                k = math.floor((y + h + seam_margin_mm) / seam_step_mm)
                if k >= 1 and k * seam_step_mm > y - seam_margin_mm:
                    y = k * seam_step_mm + seam_margin_mm
            out.append((b, GUTTER_MM - x0, y - y0))
            y += h + GUTTER_MM
            width = max(width, x1 - x0 + 2 * GUTTER_MM)
    return out, width, y


def materialize(placements: list[Placement], dx: float = 0.0, dy: float = 0.0) -> list[Item]:
    """Copies of the blocks' items where the placements put them, moved by (dx, dy)."""
    items: list[Item] = []
    for b, bx, by in placements:
        its = [replace(it) for it in b.items]
        shift(its, bx + dx, by + dy)
        items += its
    return items


def build_layout(plan: Plan, wrap_mm: float = ROLL_WRAP_MM) -> Layout:
    """Every piece's marking strip (one row) and bent drawing, stacked, at 1:1 (mm)."""
    placements, width, height = stack(piece_blocks(plan, None, wrap_mm))
    return Layout(materialize(placements), width, height)
