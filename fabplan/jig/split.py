"""Splitting a base plate that does not fit the machine's bed.

"sections": the plate is cut by straight lines right across it, along its
length, across it or both (a grid), into sections that each fit the bed, at
places clear of holes and labels. Sections are numbered row by row from the
bottom left; every seam gets alignment holes on both sides and a splice plate
drilled to match, numbered seam by seam (first the seams between side-by-side
sections, row by row, then those between sections one above the other,
column by column). Each section is engraved with its number and its
neighbours, each splice with the sections it joins, and an assembly key on the
notes layer draws the grid; the `jig-plate-split` finding says the same in
words.

"end-plates": only the parts of the plate that carry the formers are kept. The
plate is cut at the widest gap between its formers (across its longer
direction first) until every piece fits the bed; the end plates are set apart
by spacing bars drilled at the formers' centre distances, enough of them to
fix the plates' places (each plate after the first is tied to the nearest one
before it, and from the third on to the two nearest: 2n - 3 bars for n plates).

Lengths in mm, in the plate's frame.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Literal

from ..design.jig import JigSettings
from ..errors import Finding
from ..forming.records import Former
from ..units import format_drawing_length, wrap_words
from .parts import Board, hole, plate
from .records import JigPiece, Part
from .shapes import (
    SAFE_CHAR_WIDTH,
    Arc,
    Circle,
    Item,
    Line,
    P,
    RefPoint,
    Text,
    clip_arc_x,
    clip_line_x,
    rounded_rect,
)

__all__ = ["split_plate", "choose_cuts", "clip_items", "MAX_SECTIONS"]

Axis = Literal["x", "y"]
Rect = tuple[float, float, float, float]  # x0, y0, x1, y1

MAX_SECTIONS = 48  # bed-sized sections of one split plate (see plate.py)
KEY_TEXT_MM = 3.0  # text height on the assembly key and the splice plates


def split_plate(e: JigPiece, s: JigSettings, board: Board, rect: Rect,
                usable: tuple[float, float]) -> tuple[list[Part], list[Finding]]:
    """The pieces of a plate (`rect`, before the kerf) that does not fit
    `usable` (the width and height a part may take on the bed)."""
    if s.split == "end-plates":
        return _end_plates(e, s, board, rect, usable)
    return _sections(e, s, board, rect, usable)


def _fits(w: float, h: float, usable: tuple[float, float]) -> bool:
    return (w <= usable[0] + 1e-9 and h <= usable[1] + 1e-9) or \
        (h <= usable[0] + 1e-9 and w <= usable[1] + 1e-9)


def _text_boxes(board: Board, labels: bool = True) -> list[tuple[float, float, float, float]]:
    """(x0, y0, x1, y1) of every text on the plate at its safe width (the label
    block's lines left out unless `labels`)."""
    out = []
    for it in board.items:
        t = it.shape
        if isinstance(t, Text) and (labels or it.role != "label"):
            out.append((t.at[0], t.at[1] - 0.3 * t.height, t.at[0] + t.safe_width,
                        t.at[1] + 1.1 * t.height))
    return out


def _bad(board: Board, axis: Axis, other: tuple[float, float] | None = None,
         labels: bool = True) -> list[tuple[float, float]]:
    """Intervals along `axis` where a cut would run through a hole or a text
    (of those that reach into the `other` range across it, when given)."""
    k = 0 if axis == "x" else 1
    out = []
    for it in board.items:
        c = it.shape
        if isinstance(c, Circle):
            if other is None or (c.centre[1 - k] + c.radius > other[0]
                                 and c.centre[1 - k] - c.radius < other[1]):
                out.append((c.centre[k] - c.radius - 3, c.centre[k] + c.radius + 3))
    for b in _text_boxes(board, labels):
        if other is None or (b[3 - k] > other[0] and b[1 - k] < other[1]):
            out.append((b[k] - 2, b[k + 2] + 2))
    return out


def choose_cuts(x0: float, x1: float, bad: list[tuple[float, float]],
                maxlen: float) -> list[float] | None:
    """Cut positions between x0 and x1, clear of the `bad` intervals, leaving
    no piece longer than `maxlen` (mm); as even as the obstacles allow."""
    length = x1 - x0
    merged: list[list[float]] = []
    for lo, hi in sorted(bad):
        if merged and lo <= merged[-1][1]:
            merged[-1][1] = max(merged[-1][1], hi)
        else:
            merged.append([lo, hi])

    def allowed(x: float) -> bool:
        return all(not (lo < x < hi) for lo, hi in merged)

    n0 = max(2, math.ceil(length / maxlen))
    if n0 > MAX_SECTIONS:
        return None
    for n in range(n0, min(n0 + 20, MAX_SECTIONS + 1)):
        cuts: list[float] = []
        prev = x0
        ok = True
        for i in range(1, n):
            target = x0 + i * length / n
            options = [target] if allowed(target) else []
            for lo, hi in merged:
                if lo < target < hi:
                    options = [lo, hi]
            options = [x for x in options if prev + 1.0 < x <= prev + maxlen and x < x1 - 1.0]
            if not options:
                ok = False
                break
            x = min(options, key=lambda v: abs(v - target))
            cuts.append(x)
            prev = x
        if ok and x1 - prev <= maxlen:
            return cuts
    return None


# -- clipping a plate's items to one piece ---------------------------------------------
def _swap(p: P) -> P:
    return (p[1], p[0])


def _clip_line(line: Line, r: Rect) -> Line | None:
    c = clip_line_x(line, r[0], r[2])
    if c is None:
        return None
    if all(r[1] <= y <= r[3] for y in (c.start[1], c.end[1])):
        return c
    m = clip_line_x(Line(_swap(c.start), _swap(c.end)), r[1], r[3])
    return None if m is None else Line(_swap(m.start), _swap(m.end))


def _clip_arc(arc: Arc, r: Rect) -> list[Arc]:
    out = []
    for a in clip_arc_x(arc, r[0], r[2]):
        # the same clip across y: mirror in the line y = x, clip in x, mirror back
        mirrored = Arc(_swap(a.centre), a.radius, 90.0 - a.start_deg, -a.sweep_deg)
        pieces = clip_arc_x(mirrored, r[1], r[3])
        if pieces == [mirrored]:
            out.append(a)
            continue
        out.extend(Arc(_swap(m.centre), m.radius, 90.0 - m.start_deg, -m.sweep_deg)
                   for m in pieces)
    return out


def clip_items(items: list[Item], r: Rect) -> list[Item]:
    """The items of a plate that lie on the piece `r` (x0, y0, x1, y1): lines and
    arcs clipped to it; holes, text and points by their centre (a piece owns
    its low edges, its neighbour the high ones); an engraved former outline
    crossing the edge as the arcs inside."""
    out: list[Item] = []

    def owns(p: P) -> bool:
        return r[0] <= p[0] < r[2] and r[1] <= p[1] < r[3]

    for it in items:
        sh = it.shape
        if isinstance(sh, Line):
            c = _clip_line(sh, r)
            if c is not None:
                out.append(Item(it.op, c, it.role))
        elif isinstance(sh, Arc):
            out.extend(Item(it.op, a, it.role) for a in _clip_arc(sh, r))
        elif isinstance(sh, Circle):
            cx, cy = sh.centre
            inside = r[0] <= cx - sh.radius and cx + sh.radius <= r[2] and \
                r[1] <= cy - sh.radius and cy + sh.radius <= r[3]
            if it.role.startswith("former-outline") and not inside:
                out.extend(Item(it.op, a, it.role)
                           for a in _clip_arc(Arc(sh.centre, sh.radius, 0.0, 360.0), r))
            elif owns(sh.centre):
                out.append(it)
        elif isinstance(sh, (Text, RefPoint)):
            if owns(sh.at):
                out.append(it)
    return out


# -- free room for a label -------------------------------------------------------------
def place_block(lines: list[str], height: float, r: Rect, taken: Any,
                inset: float = 3.0) -> list[Text] | None:
    """Lines of text (`height` mm) set as a block inside `r`, clear of `taken`
    (a prepared shapely geometry): the spot nearest the top left, on a 2 mm
    grid, first in bands 40 mm deep along the top and the bottom edge, then
    anywhere (a few rows at a time, so a free margin is found at once). None
    when no spot is free."""
    import numpy as np
    import shapely

    pitch = 1.6 * height
    w = max(Text((0.0, 0.0), ln, height).safe_width for ln in lines)
    h = (len(lines) - 1) * pitch + 1.35 * height  # first ascent to last descent
    xs = np.arange(r[0] + inset, r[2] - inset - w + 1e-9, 2.0)
    tops = np.arange(r[3] - inset, r[1] + inset + h - 1e-9, -2.0)
    if not len(xs) or not len(tops):
        return None
    band = 40.0
    edges = tops[(tops > r[3] - band) | (tops < r[1] + h + band)]
    order = np.concatenate([edges, tops[~np.isin(tops, edges)]])
    for start in range(0, len(order), 8):
        rows = order[start:start + 8]
        gx, gy = np.meshgrid(xs, rows)  # row by row in order, left to right
        gx, gy = gx.ravel(), gy.ravel()
        free = ~shapely.intersects(shapely.box(gx, gy - h, gx + w, gy), taken)
        if free.any():
            k = int(np.argmax(free))
            x, top = float(gx[k]), float(gy[k])
            first = top - 1.1 * height
            return [Text((x, first - i * pitch), ln, height) for i, ln in enumerate(lines)]
    return None


def _taken(board: Board, extra: list[Any], r: Rect) -> Any:
    """Everything on the plate (and `extra`) that text or a hole must keep
    clear of, cut down to the piece `r` grown by 20 mm, prepared for many
    queries. Only the things near the piece are gathered (a spatial index), so
    the work per piece does not grow with the plate."""
    import shapely

    tree = board.cache.get("tree")
    if tree is None:
        texts = [shapely.box(*b) for b in _text_boxes(board)]
        tree = board.cache["tree"] = shapely.STRtree([*board.keep_out, *texts])
    grown = (r[0] - 20.0, r[1] - 20.0, max(r[2], r[0]) + 20.0, max(r[3], r[1]) + 20.0)
    near = sorted(int(i) for i in tree.query(shapely.box(*grown)))
    clipped = [shapely.clip_by_rect(tree.geometries[i], *grown) for i in near]
    geom = shapely.union_all([*clipped, *extra])
    shapely.prepare(geom)
    return geom


def _label(lines: list[str], height: float, r: Rect, board: Board, extra: list[Any],
           role: str = "label") -> list[Item]:
    """A block of labels in `r`, clear of everything on the plate and `extra`;
    as many of the lines as find room (wrapped to the piece's width first)."""
    width = max(12, int((r[2] - r[0] - 6.0) / (SAFE_CHAR_WIDTH * height)))
    wrapped = [w for ln in lines for w in wrap_words(ln, width)]
    taken = _taken(board, extra, r)
    while wrapped:
        got = place_block(wrapped, height, r, taken)
        if got is not None:
            return [Item("engrave", t, role) for t in got]
        wrapped = wrapped[:-1]
    return []


# -- sections ----------------------------------------------------------------------------
@dataclass(frozen=True)
class _Seam:
    number: int
    axis: Axis  # "x": a cut at x = at (sections side by side), "y": at y = at
    at: float
    span: tuple[float, float]  # along the cut
    low: int  # section on the low side (left or below), 0-based
    high: int


def _spots(axis: Axis, at: float, a: float, rr: float, span: tuple[float, float],
           taken: Any) -> list[float]:
    """Places (1 mm steps) along a seam where a hole of radius `rr` fits at `a`
    on both sides of it, clear of `taken`; the first and the last."""
    import numpy as np
    import shapely

    ts = np.arange(span[0], span[1] + 1e-9, 1.0)
    if not len(ts):
        return []
    hit = np.zeros(len(ts), dtype=bool)
    for off in (at - a, at + a):
        across = np.full(len(ts), off)
        pts = shapely.points(across, ts) if axis == "x" else shapely.points(ts, across)
        hit |= shapely.intersects(shapely.buffer(pts, rr, quad_segs=8), taken)
    free = [float(t) for t in ts[~hit]]
    if not free:
        return []
    return [free[0], free[-1]] if free[-1] - free[0] > 4 * rr else [free[0]]


def _sections(e: JigPiece, s: JigSettings, board: Board, rect: Rect,
              usable: tuple[float, float]) -> tuple[list[Part], list[Finding]]:
    g = s.kerf_mm / 2
    x0, y0, x1, y1 = rect
    bad_x, bad_y = _bad(board, "x"), _bad(board, "y")
    options = []
    for ux, uy in dict.fromkeys(((usable[0], usable[1]), (usable[1], usable[0]))):
        mx, my = ux - 2 * g, uy - 2 * g
        xc = [] if x1 - x0 <= mx else choose_cuts(x0, x1, bad_x, mx)
        yc = [] if y1 - y0 <= my else choose_cuts(y0, y1, bad_y, my)
        if xc is not None and yc is not None and \
                (len(xc) + 1) * (len(yc) + 1) <= MAX_SECTIONS:
            options.append(((len(xc) + 1) * (len(yc) + 1), len(yc), xc, yc))
    size = f"{x1 - x0 + 2 * g:.0f} x {y1 - y0 + 2 * g:.0f} mm"
    if not options:
        return [], [Finding("jig-too-big", "error",
                            f"the base plate is {size} and no cuts clear of its holes and "
                            f"labels give sections of at most {usable[0]:.0f} x "
                            f"{usable[1]:.0f} mm (the bed inside the part gap and below the "
                            f"notes) in {MAX_SECTIONS} pieces or fewer; use a larger bed, a "
                            "smaller margin or text height, or split = \"end-plates\"", e.name)]
    _, _, xcuts, ycuts = min(options, key=lambda o: (o[0], o[1]))
    xs, ys = [x0, *xcuts, x1], [y0, *ycuts, y1]
    nx, ny = len(xs) - 1, len(ys) - 1

    def cell(i: int, j: int) -> Rect:
        return (xs[i], ys[j], xs[i + 1], ys[j + 1])

    def number(i: int, j: int) -> int:
        return j * nx + i

    seams: list[_Seam] = []
    for j in range(ny):
        for i in range(nx - 1):
            seams.append(_Seam(len(seams) + 1, "x", xs[i + 1], (ys[j], ys[j + 1]),
                               number(i, j), number(i + 1, j)))
    for i in range(nx):
        for j in range(ny - 1):
            seams.append(_Seam(len(seams) + 1, "y", ys[j + 1], (xs[i], xs[i + 1]),
                               number(i, j), number(i, j + 1)))
    findings = [Finding("jig-plate-split", "info", _split_message(size, nx, ny, seams),
                        e.name)]
    parts: list[Part] = []
    extra: dict[int, list[Item]] = {k: [] for k in range(nx * ny)}
    a = max(12.0, 2 * s.bolt_hole_mm)
    rr = s.bolt_hole_mm / 2 + 3.0
    pad = s.bolt_hole_mm / 2 + 8.0
    inner = a + 2 * pad + 1.0  # from a crossing seam: its splice plate stays clear
    for sm in seams:
        lo_edge, hi_edge = (y0, y1) if sm.axis == "x" else (x0, x1)
        lo = sm.span[0] + (rr + 3.0 if sm.span[0] == lo_edge else inner)
        hi = sm.span[1] - (rr + 3.0 if sm.span[1] == hi_edge else inner)
        near = (sm.at - a - rr, lo - rr, sm.at + a + rr, hi + rr) if sm.axis == "x" else \
            (lo - rr, sm.at - a - rr, hi + rr, sm.at + a + rr)
        ts = _spots(sm.axis, sm.at, a, rr, (lo, hi), _taken(board, [], near)) if lo <= hi \
            else []
        if not ts:
            where = f"{sm.axis} = {sm.at:.0f} mm"
            findings.append(Finding("jig-alignment-holes", "warning",
                                    f"no room for alignment holes at the seam {where} "
                                    f"(splice {sm.number}, sections {sm.low + 1} and "
                                    f"{sm.high + 1}): align those sections by the engraved "
                                    "lines", e.name))
            continue
        for t in ts:
            for side, owner in ((-a, sm.low), (a, sm.high)):
                c = (sm.at + side, t) if sm.axis == "x" else (t, sm.at + side)
                extra[owner].append(hole(c, s.bolt_hole_mm, g, f"align {sm.number}"))
        parts.append(_splice(e, s, sm, a, ts))
    r = s.corner_radius_mm
    total = nx * ny
    for j in range(ny):
        for i in range(nx):
            k = number(i, j)
            box_ = cell(i, j)
            radii = (r if i == 0 and j == 0 else 0.0, r if i == nx - 1 and j == 0 else 0.0,
                     r if i == nx - 1 and j == ny - 1 else 0.0, r if i == 0 and j == ny - 1
                     else 0.0)
            items = clip_items(board.items, box_) + extra[k]
            holes = [_disc(it.shape) for it in extra[k] if isinstance(it.shape, Circle)]
            items += _label([_section_label(k, total, seams)], s.text_height_mm, box_, board,
                            holes)
            parts.append(plate(e.name, "section", f"{e.name}: plate section {k + 1}", items,
                               box_, s, radii))
    parts.append(_key(e, f"{e.name}: base plate in {total} sections (numbered from the "
                         "bottom left), joined by splices on the seams",
                      [(cell(i, j), f"{number(i, j) + 1}") for j in range(ny) for i in range(nx)],
                      [(_seam_mid(sm), f"s{sm.number}") for sm in seams],
                      [_splice_words(sm) for sm in seams], rect, usable))
    return parts, findings


def _disc(c: Circle) -> Any:
    from shapely.geometry import Point

    return Point(c.centre).buffer(c.radius + 1.0)


def _seam_mid(sm: _Seam) -> P:
    mid = (sm.span[0] + sm.span[1]) / 2
    return (sm.at, mid) if sm.axis == "x" else (mid, sm.at)


def _splice_words(sm: _Seam) -> str:
    how = "side by side" if sm.axis == "x" else "one above the other"
    return f"splice {sm.number} joins sections {sm.low + 1} and {sm.high + 1} ({how})"


def _split_message(size: str, nx: int, ny: int, seams: list[_Seam]) -> str:
    grid = f"{ny} row(s) of {nx}, numbered row by row from the bottom left"
    return (f"the base plate is {size}: cut in {nx * ny} sections ({grid}) joined by splice "
            "plates bolted through the alignment holes on each seam: "
            + "; ".join(_splice_words(sm) for sm in seams))


def _section_label(k: int, total: int, seams: list[_Seam]) -> str:
    near = []
    for sm in seams:
        if sm.low == k:
            near.append(f"{sm.high + 1} {'right' if sm.axis == 'x' else 'above'} "
                        f"(splice {sm.number})")
        elif sm.high == k:
            near.append(f"{sm.low + 1} {'left' if sm.axis == 'x' else 'below'} "
                        f"(splice {sm.number})")
    return f"section {k + 1} of {total}: " + ", ".join(near)


def _splice(e: JigPiece, s: JigSettings, sm: _Seam, a: float, ts: list[float]) -> Part:
    """The splice plate of a seam, in its own frame: the seam along y at x = 0,
    its holes at x = -a and +a (the low and the high section) at the heights
    `ts` along the seam, its label below them."""
    g = s.kerf_mm / 2
    pad = s.bolt_hole_mm / 2 + 8.0
    th = KEY_TEXT_MM
    label = f"splice {sm.number}: {sm.low + 1}-{sm.high + 1}"
    below = 1.6 * th + 1.0
    rect = (-a - pad, min(ts) - pad - below, a + pad, max(ts) + pad)
    items = [hole((sx, t), s.bolt_hole_mm, g, f"align {sm.number}") for t in ts
             for sx in (-a, a)]
    items.append(Item("engrave", Text((-a - pad + 2.0, min(ts) - pad - below + 1.5), label, th),
                      "label"))
    return plate(e.name, "splice", f"{e.name}: splice plate {sm.number}", items, rect, s,
                 (min(4.0, pad / 2),) * 4)


def _key(e: JigPiece, title: str, pieces: list[tuple[Rect, str]],
         links: list[tuple[P, str]], words: list[str], rect: Rect,
         usable: tuple[float, float], bars: tuple[tuple[P, P], ...] = ()) -> Part:
    """An assembly key on the notes layer (not to cut): the pieces drawn to a
    small scale with their numbers, the joints' numbers, and the words."""
    from shapely.geometry import box

    th = KEY_TEXT_MM
    width = min(120.0, 0.9 * min(usable))
    x0, y0, x1, y1 = rect
    scale = min(width / (x1 - x0), 0.6 * width / (y1 - y0))
    chars = int(width / (SAFE_CHAR_WIDTH * th))
    lines = wrap_words(title, chars)
    for w in words:
        lines += wrap_words(w, chars)
    items: list[Item] = []
    yt = -1.6 * th
    for ln in lines:
        items.append(Item("notes", Text((0.0, yt), ln, th), "key"))
        yt -= 1.6 * th
    base = 2.0  # the drawing above the words

    def at(p: P) -> P:
        return ((p[0] - x0) * scale, base + (p[1] - y0) * scale)

    for (ra, rb, rc, rd), label in pieces:
        a, b = at((ra, rb)), at((rc, rd))
        items.append(Item("notes", rounded_rect(a[0], a[1], b[0], b[1]), "key"))
        t = Text(((a[0] + b[0]) / 2, (a[1] + b[1]) / 2 - th / 2), label, th)
        items.append(Item("notes", Text((t.at[0] - t.safe_width / 2, t.at[1]), label, th),
                          "key"))
    for p, q in bars:
        items.append(Item("notes", Line(at(p), at(q)), "key"))
    for p, label in links:
        t = Text(at(p), label, 0.8 * th)
        items.append(Item("notes", Text((t.at[0] - t.safe_width / 2, t.at[1] - 0.4 * th),
                                        label, 0.8 * th), "key"))
    boxes = [box(t.at[0], t.at[1] - 0.3 * t.height, t.at[0] + t.safe_width, t.at[1] + t.height)
             for t in (it.shape for it in items) if isinstance(t, Text)]
    right = max([width, *(b.bounds[2] for b in boxes)])
    top = max([base + (y1 - y0) * scale, *(b.bounds[3] for b in boxes)])
    bottom = min([0.0, *(b.bounds[1] for b in boxes)])
    return Part(f"{e.name}: assembly key", "key", e.name, tuple(items),
                box(-1.0, bottom - 1.0, right + 1.0, top + 1.0))


# -- end plates --------------------------------------------------------------------------
@dataclass(frozen=True)
class _Piece:
    rect: Rect
    formers: tuple[Former, ...]


def _cut_between(piece: _Piece, board: Board, reach: float) -> tuple[_Piece, _Piece] | None:
    """The piece cut at the widest gap between its formers, across its longer
    direction first; the cut moved clear of holes and labels. None when no gap
    is left."""
    x0, y0, x1, y1 = piece.rect
    axes: list[Axis] = ["x", "y"] if x1 - x0 >= y1 - y0 else ["y", "x"]
    for axis in axes:
        k = 0 if axis == "x" else 1
        lo_r, hi_r = piece.rect[k], piece.rect[k + 2]
        other = (piece.rect[1 - k], piece.rect[3 - k])
        spans = sorted(((fm.centre_mm[k] - fm.radius_mm - reach,
                         fm.centre_mm[k] + fm.radius_mm + reach, fm) for fm in piece.formers),
                       key=lambda t: (t[0], t[1]))
        clusters: list[list[Any]] = []
        for lo, hi, fm in spans:
            if clusters and lo <= clusters[-1][1]:
                clusters[-1][1] = max(clusters[-1][1], hi)
                clusters[-1][2].append(fm)
            else:
                clusters.append([lo, hi, [fm]])
        gaps = sorted(range(len(clusters) - 1),
                      key=lambda i: -(clusters[i + 1][0] - clusters[i][1]))
        bad = _bad(board, axis, other, labels=False)
        for i in gaps:
            cut_a, cut_b = clusters[i][1], clusters[i + 1][0]
            for lo, hi in sorted(bad):
                if lo < cut_a < hi:
                    cut_a = hi
            for lo, hi in sorted(bad, reverse=True):
                if lo < cut_b < hi:
                    cut_b = lo
            if not lo_r < cut_a < cut_b < hi_r:
                continue
            low = tuple(fm for c in clusters[:i + 1] for fm in c[2])
            high = tuple(fm for c in clusters[i + 1:] for fm in c[2])
            if axis == "x":
                return _Piece((x0, y0, cut_a, y1), low), _Piece((cut_b, y0, x1, y1), high)
            return _Piece((x0, y0, x1, cut_a), low), _Piece((x0, cut_b, x1, y1), high)
    return None


def _spacing(e: JigPiece, fa: Former, fb: Former) -> float:
    idx = {fm.label: i for i, fm in enumerate(e.forming.formers)}
    ia, ib = sorted((idx[fa.label], idx[fb.label]))
    if ib == ia + 1 and ia < len(e.forming.former_spacing_mm):
        return e.forming.former_spacing_mm[ia]
    return math.dist(fa.centre_mm, fb.centre_mm)


def _end_plates(e: JigPiece, s: JigSettings, board: Board, rect: Rect,
                usable: tuple[float, float]) -> tuple[list[Part], list[Finding]]:
    g = s.kerf_mm / 2
    x0, y0, x1, y1 = rect
    if len(e.forming.formers) < 2:
        return [], [Finding("jig-too-big", "error", "the plate does not fit the bed and has "
                            "fewer than two formers to make end plates from; use split = "
                            "\"sections\" or a larger bed", e.name)]
    reach = s.margin_mm + s.pin_diameter_mm
    todo = [_Piece(rect, tuple(e.forming.formers))]
    done: list[_Piece] = []
    while todo:
        piece = todo.pop(0)
        px0, py0, px1, py1 = piece.rect
        if _fits(px1 - px0 + 2 * g, py1 - py0 + 2 * g, usable):
            done.append(piece)
            continue
        cut = _cut_between(piece, board, reach) if len(done) + len(todo) < MAX_SECTIONS \
            else None
        if cut is None:
            labels = ", ".join(fm.label for fm in piece.formers)
            return [], [Finding("jig-too-big", "error",
                                f"the end plate with former(s) {labels} would be "
                                f"{px1 - px0 + 2 * g:.0f} x {py1 - py0 + 2 * g:.0f} mm, more "
                                f"than the bed takes ({usable[0]:.0f} x {usable[1]:.0f} mm "
                                "inside the part gap and below the notes), and no gap between "
                                "formers is left to cut it at; use split = \"sections\" or a "
                                "larger bed", e.name)]
        todo[0:0] = list(cut)
    done.sort(key=lambda p: (p.rect[1], p.rect[0]))
    # the bars: each plate tied to the nearest before it, from the third on to two
    bars: list[tuple[int, int, Former, Former, float]] = []
    for k in range(1, len(done)):
        near = []
        for m in range(k):
            fa, fb = min(((fa, fb) for fa in done[m].formers for fb in done[k].formers),
                         key=lambda ab: math.dist(ab[0].centre_mm, ab[1].centre_mm))
            near.append((math.dist(fa.centre_mm, fb.centre_mm), m, fa, fb))
        for _, m, fa, fb in sorted(near, key=lambda t: (t[0], t[1]))[:1 if k == 1 else 2]:
            bars.append((m, k, fa, fb, _spacing(e, fa, fb)))
    bars.sort(key=lambda b: (b[0], b[1]))
    units = s.units
    n = len(done)
    if n == 2:
        _, _, fa, fb, dist = bars[0]
        note = (f"set the end plates with formers {fa.label} and {fb.label} "
                f"{format_drawing_length(dist, units)} apart, centre to centre")
        finding = note + " (the spacing bar sets it)"
    else:
        note = ""
        finding = (f"the base plate is cut to {n} end plates (numbered row by row from the "
                   "bottom left); set them apart with the spacing bars, bolted through the "
                   "formers' bolt holes: " + "; ".join(
                       f"bar {fa.label}-{fb.label} {format_drawing_length(dist, units)} centre "
                       f"to centre joins end plates {m + 1} and {k + 1}"
                       for m, k, fa, fb, dist in bars)
                   + "; turn each plate on its bolts until its engraved conductor lines up "
                   "with its neighbours'")
    r = s.corner_radius_mm
    parts = []
    h = s.text_height_mm
    for i, piece in enumerate(done, 1):
        xa, ya, xb, yb = piece.rect
        radii = (r if (xa, ya) == (x0, y0) else 0.0, r if (xb, ya) == (x1, y0) else 0.0,
                 r if (xb, yb) == (x1, y1) else 0.0, r if (xa, yb) == (x0, y1) else 0.0)
        items = [it for it in clip_items(board.items, piece.rect) if it.role != "label"]
        bends = {b for fm in piece.formers for b in fm.bend_indices}
        lines = [f"{e.name}: end plate {i} of {n}"]
        if note:
            lines.append(note)
        else:
            lines += [f"bar {fa.label}-{fb.label} to end plate {(k if m == i - 1 else m) + 1}: "
                      f"{format_drawing_length(dist, units)}"
                      for m, k, fa, fb, dist in bars if i - 1 in (m, k)]
        lines += [f"former {fm.label}: dia {format_drawing_length(2 * fm.radius_mm, units)}"
                  for fm in piece.formers]
        lines += [f"bend {b.index}: bend to {b.overbend_deg:.1f} deg" for b in e.forming.bends
                  if b.index in bends]
        ly = board.label_at[1]
        if ya == y0 and ya + s.margin_mm * 0.75 <= ly < yb:
            # under everything, where the whole plate's label block was
            width = max(12, int((xb - xa - 2 * s.margin_mm) / (0.62 * h)))
            y = ly
            for text in (w for line in lines for w in wrap_words(line, width)):
                if y < y0 + s.margin_mm * 0.75:
                    break  # the rest is in the notes
                items.append(Item("engrave", Text((xa + s.margin_mm, y), text, h), "label"))
                y -= 1.6 * h
        else:
            items += _label(lines, h, piece.rect, board, [])
        parts.append(plate(e.name, "end-plate", f"{e.name}: end plate {i}", items,
                           piece.rect, s, radii))
    findings = [Finding("jig-end-plates", "info", finding, e.name)]
    pad = s.bolt_hole_mm / 2 + 10.0
    for _, _, fa, fb, dist in bars:
        bar_rect = (-pad, -pad, dist + pad, pad)
        items = [hole((0.0, 0.0), s.bolt_hole_mm, g, f"bolt-hole {fa.label}"),
                 hole((dist, 0.0), s.bolt_hole_mm, g, f"bolt-hole {fb.label}"),
                 Item("engrave", Text((pad, -1.5), f"spacing bar {fa.label}-{fb.label} "
                                      f"{format_drawing_length(dist, units)}", 3.0), "label")]
        bar = plate(e.name, "spacing-bar", f"{e.name}: spacing bar {fa.label}-{fb.label}",
                    items, bar_rect, s, (min(5.0, pad),) * 4)
        if bar.bounds()[2] - bar.bounds()[0] > max(usable):
            findings.append(Finding("jig-bar-too-long", "warning",
                                    f"the spacing bar {fa.label}-{fb.label} is longer than the "
                                    f"bed: drill two holes {format_drawing_length(dist, units)} "
                                    "apart in a straight batten instead", e.name))
        else:
            parts.append(bar)
    if n > 2:
        parts.append(_key(e, f"{e.name}: {n} end plates (numbered from the bottom left) and "
                             "their spacing bars",
                          [(p.rect, f"{i}") for i, p in enumerate(done, 1)],
                          [(((fa.centre_mm[0] + fb.centre_mm[0]) / 2,
                             (fa.centre_mm[1] + fb.centre_mm[1]) / 2), f"{fa.label}-{fb.label}")
                           for _, _, fa, fb, _ in bars], [], rect, usable,
                          tuple(((fa.centre_mm[0], fa.centre_mm[1]),
                                 (fb.centre_mm[0], fb.centre_mm[1]))
                                for _, _, fa, fb, _ in bars)))
    return parts, findings
