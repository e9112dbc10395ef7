"""Tiling a 1:1 layout over office paper (mm).

The grid. Tiles of the drawable area (cw x ch) overlap by `overlap`, so tile
(r, c) (row 0 at the top) covers x from c*sx to c*sx + cw and y from j*sy to
j*sy + ch, j = rows - 1 - r, with sx = cw - overlap, sy = ch - overlap; the
origin is the grid's lower left. Numbered alignment crosses sit in the middle
of every overlap band.

How the tiles are stacked, and where a label may go. The builder lays each
tile over its left and lower neighbours, so where tiles overlap the one
furthest right, then highest, is on top. A label therefore must not cross
the left or bottom edge of a tile (a "seam": x = c*sx, y = j*sy): it would be
cut on the tile above and hidden under it on the tile below. `place_labels`
moves every label that would cross a seam (or leave the grid) by the least
distance, along the axis its label allows, onto one tile and clear of the
other labels; a label is then drawn whole on every tile that holds all of
it, and left off every tile that holds only part of it. Text is never
clipped.

Which tiles are printed (`keep_tiles`). A tile is printed when it carries
something to mark or align from: a tick or label of a mark, a bend's arc, a
former's centre, a turn or join tick, a note or title (an item with a `why`).
Where tiles overlap, an item counts for the tile on top (the tiles' "own"
parts share out the grid), so a tile is not printed for what its neighbour
already shows. A tile that carries nothing, or only a plain stretch of the
strip's grey bar, of a straight line or of a former's dashed outline, is left
out. A tile that holds where a plain straight line ends is printed when it
lies next to a printed tile (so the line's end shows, at the cost of that one
page; an end farther out is given by the figures, the strip's cut length and
marks; the strip's bar needs no ends, its ticks say where to mark). The
printed tiles must still join one another through shared alignment crosses
(so every distance on the assembled template stays true): where they would
not, the fewest left-out tiles that join them are printed again, and the map
says which crosses they carry to join their neighbours.
"""

from __future__ import annotations

import math
from collections import deque
from dataclasses import dataclass
from functools import cached_property

from .layout import Item, item_box, text_box

__all__ = ["MARGIN_MM", "FOOTER_MM", "OVERLAP_MM", "CROSS_MM", "SEAM_MARGIN_MM", "Grid",
           "Tile", "Reason", "content_area", "tile_count", "crosses", "row_name", "joining",
           "place_labels", "keep_tiles", "touches", "buckets"]

MARGIN_MM = 10.0  # unprintable edge most office printers leave, and some
FOOTER_MM = 26.0  # band for the tile label, the calibration bars and the instruction
OVERLAP_MM = 15.0  # tiles overlap by this much; alignment crosses sit in the overlap
CROSS_MM = 10.0  # arm length of an alignment cross
SEAM_MARGIN_MM = 0.6  # a label keeps this far from a seam and from the grid's edge
INSET_MM = 0.25  # a text counts as on a tile when it lies this far inside its edges

Box = tuple[float, float, float, float]
Tile = tuple[int, int]  # (row from the top, column from the left)


def content_area(paper_w: float, paper_h: float) -> tuple[float, float]:
    """The drawable width and height (mm) of a tile page, inside the margins and footer."""
    return paper_w - 2 * MARGIN_MM, paper_h - 2 * MARGIN_MM - FOOTER_MM


def tile_count(length_mm: float, room_mm: float, overlap_mm: float = OVERLAP_MM) -> int:
    """How many tiles of `room_mm` overlapping by `overlap_mm` cover `length_mm`."""
    if length_mm <= room_mm:
        return 1
    return math.ceil((length_mm - overlap_mm) / (room_mm - overlap_mm) - 1e-9)


@dataclass(frozen=True)
class Grid:
    """Tiles of one page size over a layout (mm; origin at the grid's lower left)."""

    page_w: float
    page_h: float
    cols: int
    rows: int
    overlap: float = OVERLAP_MM

    @cached_property
    def cw(self) -> float:
        return content_area(self.page_w, self.page_h)[0]

    @cached_property
    def ch(self) -> float:
        return content_area(self.page_w, self.page_h)[1]

    @cached_property
    def sx(self) -> float:
        return self.cw - self.overlap

    @cached_property
    def sy(self) -> float:
        return self.ch - self.overlap

    @cached_property
    def width(self) -> float:
        return self.cw + (self.cols - 1) * self.sx

    @cached_property
    def height(self) -> float:
        return self.ch + (self.rows - 1) * self.sy

    def box(self, r: int, c: int) -> Box:
        x0, y0 = c * self.sx, (self.rows - 1 - r) * self.sy
        return (x0, y0, x0 + self.cw, y0 + self.ch)

    def name(self, r: int, c: int) -> str:
        return f"{row_name(r)}{c + 1}"

    def tiles(self) -> list[Tile]:
        return [(r, c) for r in range(self.rows) for c in range(self.cols)]

    def tiles_over(self, box: Box) -> list[Tile]:
        """The tiles whose area meets `box`, row by row from the top."""
        x0, y0, x1, y1 = box
        c0 = max(0, math.ceil((x0 - self.cw) / self.sx - 1e-9))
        c1 = min(self.cols - 1, math.floor(x1 / self.sx + 1e-9))
        j0 = max(0, math.ceil((y0 - self.ch) / self.sy - 1e-9))
        j1 = min(self.rows - 1, math.floor(y1 / self.sy + 1e-9))
        return [(self.rows - 1 - j, c) for j in range(j1, j0 - 1, -1) for c in range(c0, c1 + 1)]

    def own_box(self, r: int, c: int) -> Box:
        """The part of a tile no printed neighbour covers: its area without the
        bands under its right and upper neighbours (the grid's last column and
        top row keep theirs). The tiles' own parts share out the grid."""
        x0, y0, x1, y1 = self.box(r, c)
        return (x0, y0, x1 if c == self.cols - 1 else x0 + self.sx,
                y1 if r == 0 else y0 + self.sy)

    def owners(self, box: Box) -> list[Tile]:
        """The tiles whose own part meets `box`, row by row from the top."""
        x0, y0, x1, y1 = box
        c0 = min(self.cols - 1, max(0, math.floor(x0 / self.sx)))
        c1 = min(self.cols - 1, max(0, math.floor(x1 / self.sx)))
        j0 = min(self.rows - 1, max(0, math.floor(y0 / self.sy)))
        j1 = min(self.rows - 1, max(0, math.floor(y1 / self.sy)))
        return [(self.rows - 1 - j, c) for j in range(j1, j0 - 1, -1) for c in range(c0, c1 + 1)]

    def holds(self, tile: Tile, box: Box, inset: float = INSET_MM) -> bool:
        """Whether `box` lies wholly on the tile's drawable area."""
        t = self.box(*tile)
        return (box[0] >= t[0] + inset and box[1] >= t[1] + inset and box[2] <= t[2] - inset
                and box[3] <= t[3] - inset)

    def seam_free(self, box: Box, margin: float = SEAM_MARGIN_MM) -> bool:
        """Whether `box` keeps `margin` from every seam and inside the grid."""
        x0, y0, x1, y1 = box
        if x0 < margin or y0 < margin or x1 > self.width - margin or y1 > self.height - margin:
            return False
        return (_free(x0, x1, self.sx, self.cols, margin)
                and _free(y0, y1, self.sy, self.rows, margin))

    def seams(self, lo: float, hi: float, axis: int) -> list[float]:
        """Seams (x = c*sx or y = j*sy) between `lo` and `hi` along `axis` (0: x)."""
        step, n = (self.sx, self.cols) if axis == 0 else (self.sy, self.rows)
        k0 = max(1, math.floor(lo / step))
        k1 = min(n - 1, math.ceil(hi / step))
        return [k * step for k in range(k0, k1 + 1)]


def _free(lo: float, hi: float, step: float, n: int, margin: float) -> bool:
    """No seam k*step (k = 1 .. n-1) lies within `margin` of lo..hi."""
    k = max(1, math.floor((lo - margin) / step) + 1)
    return not (k <= n - 1 and k * step < hi + margin)


def crosses(cols: int, rows: int, cw: float, ch: float,
            overlap: float) -> list[tuple[int, float, float]]:
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


def row_name(r: int) -> str:
    name = ""
    r += 1
    while r:
        r, rem = divmod(r - 1, 26)
        name = chr(65 + rem) + name
    return name


def _neighbours(t: Tile) -> list[Tile]:
    r, c = t
    return [(r + dr, c + dc) for dr in (-1, 0, 1) for dc in (-1, 0, 1) if dr or dc]


def _components(tiles: set[Tile]) -> list[set[Tile]]:
    left = set(tiles)
    out = []
    for start in sorted(tiles):
        if start not in left:
            continue
        comp = {start}
        left.discard(start)
        todo = [start]
        while todo:
            for t in _neighbours(todo.pop()):
                if t in left:
                    left.discard(t)
                    comp.add(t)
                    todo.append(t)
        out.append(comp)
    return out


# -- labels off the seams ----------------------------------------------------------------
def _union(boxes: list[Box]) -> Box:
    return (min(b[0] for b in boxes), min(b[1] for b in boxes), max(b[2] for b in boxes),
            max(b[3] for b in boxes))


def _meet(a: Box, b: Box, gap: float = 0.0) -> bool:
    return a[0] < b[2] + gap and b[0] < a[2] + gap and a[1] < b[3] + gap and b[1] < a[3] + gap


def _moved(box: Box, dx: float, dy: float) -> Box:
    return (box[0] + dx, box[1] + dy, box[2] + dx, box[3] + dy)


def _shift_label(items: list[Item], dx: float, dy: float) -> None:
    for it in items:
        d = it.data
        if it.kind == "text":
            it.data = (d[0] + dx, d[1] + dy, d[2])
        elif it.kind == "poly":  # a leader: its first point stays on the tick
            pts = d[0]
            it.data = ((pts[0], *((x + dx, y + dy) for x, y in pts[1:])),)


class _Cells:
    """Boxes filed by the square cells (`size` mm) they cover, to find neighbours fast."""

    def __init__(self, size: float) -> None:
        self.size = size
        self.cells: dict[tuple[int, int], set[int]] = {}

    def _keys(self, box: Box) -> list[tuple[int, int]]:
        s = self.size
        return [(i, j) for i in range(math.floor(box[0] / s), math.floor(box[2] / s) + 1)
                for j in range(math.floor(box[1] / s), math.floor(box[3] / s) + 1)]

    def add(self, key: int, box: Box) -> None:
        for c in self._keys(box):
            self.cells.setdefault(c, set()).add(key)

    def remove(self, key: int, box: Box) -> None:
        for c in self._keys(box):
            self.cells.get(c, set()).discard(key)

    def near(self, box: Box) -> set[int]:
        out: set[int] = set()
        for c in self._keys(box):
            out |= self.cells.get(c, set())
        return out


def place_labels(grid: Grid, items: list[Item], fixed: list[Box] | None = None,
                 margin: float = SEAM_MARGIN_MM, gap: float = 0.4) -> int:
    """Move every label that crosses a seam, leaves the grid or lies on a
    `fixed` box (an alignment cross) onto one tile, in place, by the least
    costly move that clears the seams, the fixed boxes and the other labels
    (any move clear of the seams if none is clear of everything). A label that
    a moved label would land on is not moved for it. Returns how many labels
    moved."""
    members: dict[int, list[Item]] = {}
    for i, it in enumerate(items):
        if it.kind == "text":
            members.setdefault(it.group if it.group >= 0 else -1 - i, []).append(it)
    for it in items:
        if it.kind == "poly" and it.group >= 0 and it.group in members:
            members[it.group].append(it)
    boxes = {g: _union([text_box(it) for it in its if it.kind == "text"])
             for g, its in members.items()}
    every = _Cells(25.0)  # every label and fixed box
    settled = _Cells(25.0)  # the fixed boxes and the labels moved so far
    for g, b in boxes.items():
        every.add(g, b)
    pinned = -1 - len(items)  # fixed boxes: keys below every label's
    for n, b in enumerate(fixed or ()):
        boxes[pinned - n] = b
        every.add(pinned - n, b)
        settled.add(pinned - n, b)
    moved = 0
    for g in sorted(members, key=lambda k: (boxes[k][0], boxes[k][1], k)):
        b = boxes[g]
        if grid.seam_free(b, margin) and not any(
                _meet(b, boxes[o], gap) for o in settled.near(b) if o != g):
            continue
        wx, wy = next(it.nudge for it in members[g] if it.kind == "text")
        reach = max(30.0, b[2] - b[0], b[3] - b[1])
        region = (b[0] - reach, b[1] - reach, b[2] + reach, b[3] + reach)
        near = [boxes[o] for o in sorted(every.near(region)) if o != g
                and _meet(boxes[o], region)]
        xs = {0.0, margin - b[0], grid.width - margin - b[2]}
        for e in grid.seams(region[0], region[2], 0):
            xs |= {e + margin - b[0], e - margin - b[2]}
        ys = {0.0, margin - b[1], grid.height - margin - b[3]}
        for e in grid.seams(region[1], region[3], 1):
            ys |= {e + margin - b[1], e - margin - b[3]}
        for o in near:
            xs |= {o[2] + gap - b[0], o[0] - gap - b[2]}
            ys |= {o[3] + gap - b[1], o[1] - gap - b[3]}
        xs = {dx for dx in xs if abs(dx) <= reach}
        ys = {dy for dy in ys if abs(dy) <= reach}
        options = sorted((wx * abs(dx) + wy * abs(dy), dx, dy) for dx in xs for dy in ys)
        choice = None
        for _, dx, dy in options:
            nb = _moved(b, dx, dy)
            if not grid.seam_free(nb, margin):
                continue
            if not any(_meet(nb, o, gap) for o in near):
                choice = (dx, dy)
                break
            if choice is None:
                choice = (dx, dy)  # clear of the seams, if not of every label
        if choice is None:
            continue
        dx, dy = choice
        if (dx, dy) != (0.0, 0.0):
            _shift_label(members[g], dx, dy)
            every.remove(g, b)
            boxes[g] = _moved(b, dx, dy)
            every.add(g, boxes[g])
            moved += 1
        settled.add(g, boxes[g])
    return moved


# -- which tiles to print ----------------------------------------------------------------
def _clip_segment(p: tuple[float, float], q: tuple[float, float], box: Box) -> bool:
    """Whether the segment pq meets the box (Liang-Barsky)."""
    t0, t1 = 0.0, 1.0
    dx, dy = q[0] - p[0], q[1] - p[1]
    for num, den in ((p[0] - box[0], -dx), (box[2] - p[0], dx), (p[1] - box[1], -dy),
                     (box[3] - p[1], dy)):
        if den == 0:
            if num < 0:
                return False
            continue
        t = num / den
        if den < 0:
            t0 = max(t0, t)
        else:
            t1 = min(t1, t)
        if t0 > t1:
            return False
    return True


def _arc_points(cx: float, cy: float, r: float, start: float,
                extent: float) -> list[tuple[float, float]]:
    n = max(2, math.ceil(abs(extent) / 3.0))
    return [(cx + r * math.cos(math.radians(start + extent * i / n)),
             cy + r * math.sin(math.radians(start + extent * i / n))) for i in range(n + 1)]


def touches(it: Item, box: Box) -> bool:
    """Whether an item's ink meets `box` (arcs followed to within 0.14 % of
    their radius; a text by its box)."""
    d = it.data
    if it.kind == "line":
        return _clip_segment(d[0], d[1], box)
    if it.kind in ("arc", "circle"):
        if it.kind == "arc":
            (cx, cy), r, start, extent = d
        else:
            cx, cy, r, start, extent = d[0], d[1], d[2], 0.0, 360.0
        pts = _arc_points(cx, cy, r, start, extent)
        return any(_clip_segment(p, q, box) for p, q in zip(pts, pts[1:]))
    if it.kind == "poly":
        pts = list(d[0])
        return len(pts) == 1 and _meet(item_box(it), box) or any(
            _clip_segment(p, q, box) for p, q in zip(pts, pts[1:]))
    return _meet(item_box(it), box)




Reason = tuple[str, str]  # (owner, why)


def keep_tiles(grid: Grid, items: list[Item]) -> dict[Tile, list[Reason]]:
    """The tiles to print and what each carries (see the module's note); tiles
    printed only to join others carry ("", "join"). An item counts on the
    tiles whose own part (`Grid.own_box`) its ink meets: where tiles overlap,
    that is the tile on top."""
    kept: dict[Tile, list[Reason]] = {}
    plain: list[Item] = []
    for it in items:
        if not it.why:
            if it.kind == "line" and not it.dash:
                plain.append(it)
            continue
        box = item_box(it)
        for t in grid.owners(box):
            if it.kind == "text" or touches(it, grid.own_box(*t)):
                kept.setdefault(t, []).append((it.owner, it.why))
    if not kept:
        return {t: [] for t in grid.tiles()}
    ends: dict[Tile, list[Reason]] = {}
    for it in plain:
        for x, y in it.data:  # a straightedge needs both ends of a line
            t = grid.owners((x, y, x, y))[0]
            if t not in kept and any(n in kept for n in _neighbours(t)):
                ends.setdefault(t, [(it.owner, "line end")])
    kept.update(ends)
    for t in joining(grid, set(kept)):
        kept[t] = [("", "join")]
    return kept


def joining(grid: Grid, kept: set[Tile]) -> list[Tile]:
    """The fewest further tiles (found one path at a time) that join `kept`
    into one group through shared crosses."""
    kept = set(kept)
    added: list[Tile] = []
    comps = _components(kept)
    while len(comps) > 1:
        home = comps[0]
        best: dict[Tile, int] = {t: 0 for t in home}
        prev: dict[Tile, Tile] = {}
        todo = deque(sorted(home))
        reached = None
        while todo:
            t = todo.popleft()
            if t in kept and t not in home:
                reached = t
                break
            for n in _neighbours(t):
                if not (0 <= n[0] < grid.rows and 0 <= n[1] < grid.cols):
                    continue
                cost = best[t] + (0 if n in kept else 1)
                if n not in best or cost < best[n]:
                    best[n] = cost
                    prev[n] = t
                    if n in kept:
                        todo.appendleft(n)
                    else:
                        todo.append(n)
        if reached is None:
            break
        t = reached
        while t in prev:
            t = prev[t]
            if t not in kept:
                kept.add(t)
                added.append(t)
        comps = _components(kept)
    return added


def buckets(grid: Grid, items: list[Item], tiles: list[Tile]) -> dict[Tile, list[int]]:
    """For each tile, the items to draw on it, in drawing order: every item whose
    box meets the tile, texts only where the tile holds all of them."""
    out: dict[Tile, list[int]] = {t: [] for t in tiles}
    for i, it in enumerate(items):
        box = item_box(it)
        for t in grid.tiles_over(box):
            if t in out and (it.kind != "text" or grid.holds(t, box)):
                out[t].append(i)
    return out
