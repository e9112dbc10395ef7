"""The build sheet's drawing of each piece of stock, to a stated scale.

A flat piece is drawn in its plane: outline, centreline, marks, the jig's
formers, each bend's angle and radius, and the dimensions the user gave (as
the shape declares them: `ElementGeometry.dimensions`), every label placed
clear of the lines and of the other labels. A helix gets a side view square
to its axis, with a tick for each turn, and an end view along the axis. Any
other piece that is not flat is drawn projected onto its x-y plane. Arcs are
drawn as true arcs; figures come from the Plan and are formatted here. An
element of several pieces of stock is drawn once more assembled (its pieces in
the element's frame, with the element's dimensions); each piece's own drawing
then labels its straight runs.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from ...geometry.path import Arc3, Line3
from ...geometry.shapes.base import Dimension
from ...geometry.shapes.helix import side_view
from ...plan import ElementPlan, PiecePlan
from ...units import format_angle
from ..fullscale.geometry import merge_labels, piece_drawing
from ..fullscale.papers import PT_PER_MM
from .context import Context
from .sketch import Label, Sketch, square_to, text_width

__all__ = ["drawing", "assembly", "DRAWING_SCALES"]

# preferred drawing scales (1:n), smallest reduction first
DRAWING_SCALES = (1, 2, 2.5, 4, 5, 10, 20, 25, 50, 100)

GREY = (0.45, 0.45, 0.45)
RED = (0.75, 0.1, 0.1)
BLUE = (0.1, 0.3, 0.8)
DASH_DOT = (5.0, 2.0, 1.0, 2.0)
PAD_MM = 16.0  # paper kept round a drawing for its labels and dimensions (mm)
ROOM_H_MM = 95.0  # the tallest a drawing's subject is drawn (mm of paper)

Pt = tuple[float, float]


def _scale_for(width_mm: float, height_mm: float, room_w: float, room_h: float) -> float:
    for s in DRAWING_SCALES:
        if width_mm / s <= room_w and height_mm / s <= room_h:
            return s
    return DRAWING_SCALES[-1]


def _dim_text(ctx: Context, dim: Dimension, drawn_mm: float) -> str:
    text = f"{dim.key.replace('_', ' ')} {ctx.L(dim.value_mm)}"
    if abs(drawn_mm - dim.value_mm) > 0.05:  # a circumference drawn as its diameter
        text += f", {ctx.L(drawn_mm)} across"
    return text


def _rotate(v: Pt, deg: float) -> Pt:
    c, s = math.cos(math.radians(deg)), math.sin(math.radians(deg))
    return (v[0] * c - v[1] * s, v[0] * s + v[1] * c)


def _fan(v: Pt) -> list[Pt]:
    """`v`, then directions turned further and further from it."""
    return [v] + [_rotate(v, a) for a in (30, -30, 60, -60, 90, -90)]


def _dimensions(ctx: Context, sk: Sketch, dims: list[tuple[Dimension, Pt, Pt, Pt | None]],
                k: float) -> None:
    """Draw the dimensions (points already on the paper, `k` pt per mm): each
    beyond the strokes drawn so far on its side, a dimension further out on a side
    that has one already (with room for that one's value between); then queue
    their values' labels."""
    sides: list[Pt] = []
    labels: list[Label] = []
    for dim, a, b, away in dims:
        text = _dim_text(ctx, dim, math.hypot(b[0] - a[0], b[1] - a[1]) / k)
        along = (b[0] - a[0], b[1] - a[1])
        n = square_to(away, _unit(along)) if away is not None else (0.0, 0.0)
        if n == (0.0, 0.0):
            labels.append(sk.dimension(a, b, None, text))
            continue
        reach = max(sk.extent(a, n), 0.0)
        if any(m[0] * n[0] + m[1] * n[1] > 0.99 for m in sides):
            reach += 5.0  # past the earlier dimension's extension lines and its value
        sides.append(n)
        labels.append(sk.dimension(a, b, n, text, reach + 14.0))
    for lab in labels:
        sk.place(lab)


def _unit(v: Pt) -> Pt:
    n = math.hypot(v[0], v[1])
    return (v[0] / n, v[1] / n) if n > 0 else (0.0, 0.0)


def _flat(ctx: Context, e: ElementPlan, p: PiecePlan) -> tuple[Sketch, float]:
    """The sketch of a flat piece and its scale (1:n)."""
    geo = piece_drawing(p)
    x0, y0, x1, y1 = geo.bbox
    f = p.forming
    formers = list(f.formers) if f is not None else []
    for fm in formers:
        cx, cy = fm.centre_mm
        x0, y0 = min(x0, cx - fm.radius_mm), min(y0, cy - fm.radius_mm)
        x1, y1 = max(x1, cx + fm.radius_mm), max(y1, cy + fm.radius_mm)
    s = _scale_for(x1 - x0, y1 - y0, ctx.frame_w / PT_PER_MM - 2 * PAD_MM, ROOM_H_MM)
    k = PT_PER_MM / s
    w = ctx.frame_w
    ox, oy = (w - (x1 - x0) * k) / 2 - x0 * k, -y0 * k

    def P(x: float, y: float) -> Pt:
        return (ox + x * k, oy + y * k)

    sk = Sketch(w)
    for prim in geo.centreline:
        _prim(sk, prim, P, k, 0.4, GREY, DASH_DOT)
    for prim in geo.outline:
        _prim(sk, prim, P, k, 0.8, (0.0, 0.0, 0.0), None)
    cxm, cym = P((x0 + x1) / 2, (y0 + y1) / 2)
    half = p.conductor_diameter_mm / 2 * k
    mark_labels = []
    for mid, _m, (mx, my), (tx, ty) in geo.marks:
        ext = half + 4
        px, py = P(mx, my)
        sk.line([(px - ty * ext, py + tx * ext), (px + ty * ext, py - tx * ext)], 0.6, RED)
        nx, ny = -ty, tx  # the label on the side away from the middle of the drawing
        if (px - cxm) * nx + (py - cym) * ny < 0:
            nx, ny = -nx, -ny
        mark_labels.append((mid, px + nx * ext, py + ny * ext, (nx, ny), (tx, ty), ext))
    for fm in formers:
        sk.circle(P(*fm.centre_mm), fm.radius_mm * k, 0.5, BLUE, (2.0, 1.5))
    dims = e.geometry.dimensions if len(e.pieces) == 1 else ()
    _dimensions(ctx, sk, [(d, P(d.a[0], d.a[1]), P(d.b[0], d.b[1]),
                           (d.away[0], d.away[1]) if any(d.away) else None) for d in dims], k)
    # each bend's angle and radius, outside the bend
    arcs = iter(p.bends)
    for prim in geo.centreline:
        if prim[0] != "A":
            continue
        b = next(arcs)
        (cx, cy), r, start, extent = prim[1:5]
        mid = math.radians(start + extent / 2)
        out = (math.cos(mid), math.sin(mid))
        lab = Label([f"bend {b.index}: {format_angle(b.angle_deg)} deg",
                     f"R {ctx.L(b.centreline_radius_mm)}"],
                    P(cx + r * math.cos(mid), cy + r * math.sin(mid)))
        lab.around(_fan(out), (half + 3, half + 12, half + 24))
        sk.place(lab)
    if not dims:  # nothing the user gave to dimension: label the straight runs
        for prim in geo.centreline:
            if prim[0] != "L":
                continue
            (ax, ay), (bx, by) = prim[1], prim[2]
            length = math.hypot(bx - ax, by - ay)
            if length * k < 30:
                continue
            nx, ny = -(by - ay) / length, (bx - ax) / length
            mx, my = P((ax + bx) / 2, (ay + by) / 2)
            if (mx - cxm) * nx + (my - cym) * ny < 0:
                nx, ny = -nx, -ny
            lab = Label([ctx.L(length)], (mx, my))
            lab.around([(nx, ny)], (half + 4, half + 12))
            sk.place(lab)
    for text, x, y, (nx, ny), (tx, ty), ext in merge_labels(mark_labels, 14.0):
        lab = Label([text], (x, y), size=6.0, colour=RED)
        lab.around([(nx, ny), (nx + tx, ny + ty), (nx - tx, ny - ty)], (1.5, 5.0))
        lab.around([(-nx, -ny)], (2 * ext + 1.5,))
        sk.place(lab)
    for fm in formers:
        centre = P(*fm.centre_mm)
        lab = Label([fm.label], centre, size=6.5, colour=BLUE)
        lab.candidates.append(centre)
        lab.around([_rotate((1.0, 0.0), a) for a in range(0, 360, 45)],
                   (fm.radius_mm * k + 2,))
        sk.place(lab)
    return sk, s


def assembly(ctx: Context, e: ElementPlan) -> list[Any]:
    """An element of several flat pieces drawn assembled, with the dimensions the
    user gave for the whole element, as flowables (none for one piece)."""
    if len(e.pieces) < 2 or not all(p.planar for p in e.pieces):
        return []
    geos = [piece_drawing(p) for p in e.pieces]
    x0 = min(g.bbox[0] for g in geos)
    y0 = min(g.bbox[1] for g in geos)
    x1 = max(g.bbox[2] for g in geos)
    y1 = max(g.bbox[3] for g in geos)
    s = _scale_for(x1 - x0, y1 - y0, ctx.frame_w / PT_PER_MM - 2 * PAD_MM, ROOM_H_MM)
    k = PT_PER_MM / s
    ox, oy = (ctx.frame_w - (x1 - x0) * k) / 2 - x0 * k, -y0 * k

    def P(x: float, y: float) -> Pt:
        return (ox + x * k, oy + y * k)

    sk = Sketch(ctx.frame_w)
    for g in geos:
        for prim in g.centreline:
            _prim(sk, prim, P, k, 0.4, GREY, DASH_DOT)
        for prim in g.outline:
            _prim(sk, prim, P, k, 0.8, (0.0, 0.0, 0.0), None)
    _dimensions(ctx, sk, [(d, P(d.a[0], d.a[1]), P(d.b[0], d.b[1]),
                           (d.away[0], d.away[1]) if any(d.away) else None)
                          for d in e.geometry.dimensions], k)
    for p, g in zip(e.pieces, geos):
        gx0, gy0, gx1, gy1 = g.bbox
        lab = Label([p.label], P((gx0 + gx1) / 2, gy0), size=6.5)
        lab.around([(0.0, -1.0), (0.3, -1.0), (-0.3, -1.0)], (2.0, 6.0))
        sk.place(lab)
    sk.layout()
    _scale_bar(ctx, sk, s)
    return _together(ctx, "Drawing to scale: the element assembled",
                     "Every piece of stock in its place, outline solid and centreline dash-dot; "
                     "dimensions with arrows are those the design gives for the whole element.",
                     sk)


def _prim(sk: Sketch, prim: tuple[Any, ...], P: Any, k: float, width: float,
          colour: tuple[float, float, float], dash: tuple[float, ...] | None) -> None:
    if prim[0] == "L":
        sk.line([P(*prim[1]), P(*prim[2])], width, colour, dash)
    elif prim[0] == "A":
        (cx, cy), r, start, extent = prim[1:5]
        sk.arc(P(cx, cy), r * k, start, extent, width, colour, dash)
    else:
        sk.line([P(*q) for q in prim[1]], width, colour, dash)


def _projected(ctx: Context, p: PiecePlan) -> tuple[Sketch, float]:
    """A piece that is not flat, seen square to its x-y plane."""
    geo = piece_drawing(p)
    x0, y0, x1, y1 = geo.bbox
    s = _scale_for(x1 - x0, y1 - y0, ctx.frame_w / PT_PER_MM - 2 * PAD_MM, ROOM_H_MM)
    k = PT_PER_MM / s
    ox = (ctx.frame_w - (x1 - x0) * k) / 2 - x0 * k
    sk = Sketch(ctx.frame_w)
    for prim in geo.centreline:
        _prim(sk, prim, lambda x, y: (ox + x * k, (y - y0) * k), k, 0.7, (0.0, 0.0, 0.0), None)
    return sk, s


def _helix(ctx: Context, e: ElementPlan, p: PiecePlan) -> tuple[Sketch, float] | None:
    """A helix: a side view square to its axis with a tick at each turn, and an
    end view along the axis, side by side to one scale."""
    view = side_view(p.path)
    if view is None:
        return None
    c0, axis, up = view
    u = np.cross(axis, up)  # from the axis towards the coil's first point: the viewer
    coil = next(x for x in p.path.primitives() if isinstance(x, Arc3) and x.pitch)
    r, pitch = coil.radius, coil.pitch
    turns = coil.angle / (2 * math.pi)
    d = p.conductor_diameter_mm
    pts, _ = p.path.sample(max(p.path.centreline_length() / 2000, 0.2))
    rel = pts - c0
    h, v, depth = rel @ axis, rel @ up, rel @ u
    # the end view: the coil seen along its axis, and the leads
    ex, ey = rel @ u, rel @ up
    side_w, side_h = float(h.max() - h.min()) + d, float(v.max() - v.min()) + d
    end_w = float(ex.max() - ex.min()) + d
    end_h = float(ey.max() - ey.min()) + d
    gap_mm = 24.0  # paper between the two views
    room_w = ctx.frame_w / PT_PER_MM - 2 * PAD_MM
    s: float = DRAWING_SCALES[-1]
    for cand in DRAWING_SCALES:
        if ((side_w + end_w) / cand + gap_mm <= room_w
                and max(side_h, end_h) / cand <= ROOM_H_MM):
            s = cand
            break
    k = PT_PER_MM / s
    total = (side_w + end_w) * k + gap_mm * PT_PER_MM
    left = (ctx.frame_w - total) / 2
    sx = left - (float(h.min()) - d / 2) * k  # paper x of the side view's h = 0

    def S(hh: float, vv: float) -> Pt:
        return (sx + hh * k, vv * k)

    sk = Sketch(ctx.frame_w)
    # the wire: near side solid, far side dashed and grey
    front = depth >= 0
    start = 0
    for i in range(1, len(h) + 1):
        if i == len(h) or front[i] != front[start]:
            j = min(i + 1, len(h))
            seg = [S(float(h[n]), float(v[n])) for n in range(start, j)]
            if len(seg) > 1:
                if front[start]:
                    sk.line(seg, 0.8)
                else:
                    sk.line(seg, 0.4, GREY, (2.0, 1.5))
            start = i
    sk.line([S(-2.0, 0.0), S(turns * pitch + 2.0, 0.0)], 0.3, GREY, DASH_DOT)  # the axis
    top = (r + d / 2) * k
    n_ticks = math.floor(turns - 0.75 + 1e-9) + 1
    for i in range(n_ticks):  # where the wire crosses the top, once a turn
        x, _ = S(pitch * (i + 0.75), 0.0)
        sk.line([(x, top + 2.0), (x, top + 7.0)], 0.6, RED)
    # the end view
    exo = left + side_w * k + gap_mm * PT_PER_MM - (float(ex.min()) - d / 2) * k

    def E(x: float, y: float) -> Pt:
        return (exo + x * k, y * k)

    sk.circle(E(0.0, 0.0), (r + d / 2) * k, 0.8)
    sk.circle(E(0.0, 0.0), (r - d / 2) * k, 0.8)
    sk.circle(E(0.0, 0.0), r * k, 0.4, GREY, DASH_DOT)
    for prim in p.path.primitives():
        if isinstance(prim, Line3):
            a, b = np.subtract(prim.start, c0), np.subtract(prim.end, c0)
            sk.line([E(float(a @ u), float(a @ up)), E(float(b @ u), float(b @ up))], 0.8)
    dims = e.geometry.dimensions if len(e.pieces) == 1 else ()

    def on_side(q: tuple[float, float, float]) -> Pt:
        rq = np.subtract(q, c0)
        return S(float(rq @ axis), float(rq @ up))

    _dimensions(ctx, sk, [(dm, on_side(dm.a), on_side(dm.b),
                           (float(np.dot(dm.away, axis)), float(np.dot(dm.away, up))))
                          for dm in dims], k)
    # the views' names, under each
    low = min(q[1] for st in sk.strokes for q in st.sampled())
    for text, x in (("side view", sx + (float(h.min()) + float(h.max())) / 2 * k),
                    ("end view, along the axis", E(0.0, 0.0)[0])):
        lab = Label([text], (x, low), size=6.5)
        lab.around([(0.0, -1.0)], (3.0, 10.0))
        sk.place(lab)
    lab = Label([f"{format_angle(turns)} turns; ticks: one a turn"], (sx, top + 7.0), size=6.0,
                colour=RED)
    lab.around([(-1.0, 0.3), (-1.0, 0.0), (0.0, 1.0)], (2.0, 8.0))
    sk.place(lab)
    return sk, s


def drawing(ctx: Context, e: ElementPlan, p: PiecePlan) -> list[Any]:
    """The drawing of one piece with its heading and caption, as flowables."""
    helix = any(b.pitch_mm for b in p.bends)
    made = _helix(ctx, e, p) if helix and not p.planar else None
    if made is not None:
        sk, s = made
        head = "Drawing to scale: side and end views"
        caption = ("The coil seen from the side, square to its axis (wire on the far side "
                   "dashed, the axis dash-dot), and along its axis. Red ticks: where the wire "
                   "crosses the top of the coil, one a turn, a pitch apart. The stock's marks "
                   "are in the marks table; the full-scale template has the marking strip.")
    elif p.planar:
        sk, s = _flat(ctx, e, p)
        f = p.forming
        head = "Drawing to scale"
        caption = ("Outline solid, centreline dash-dot; red ticks are the marks (ids as in "
                   "the marks table)" + ("; blue dashed circles are the jig's formers"
                                         if f is not None and f.formers else "")
                   + ("; dimensions with arrows are those the design gives."
                      if len(e.pieces) == 1 and e.geometry.dimensions else
                      "; the straight runs are labelled with their lengths."))
    else:
        sk, s = _projected(ctx, p)
        head = "Drawing to scale (projected)"
        caption = ("The centreline seen square to the drawing's x-y plane. The element is "
                   "not flat, so lengths along the stock are not true here: mark from the "
                   "marks table or the full-scale template's marking strip.")
    sk.layout()
    _scale_bar(ctx, sk, s)
    return _together(ctx, head, caption, sk)


def _together(ctx: Context, head: str, caption: str, sk: Sketch) -> list[Any]:
    """Heading, caption and drawing kept on one page."""
    from reportlab.platypus import KeepTogether

    return [KeepTogether([ctx.p(head, ctx.h3), ctx.p(caption, ctx.small), sk.drawing()])]


def _scale_bar(ctx: Context, sk: Sketch, s: float) -> None:
    """A bar of a round length in the shop's unit and the scale, under the drawing."""
    k = PT_PER_MM / s
    bar_mm = (100.0 if s >= 2 else 50.0) if ctx.unit == "mm" else (4 if s >= 2 else 2) * 25.4
    _, low, _, _ = sk.bounds()
    y = low - 12.0
    sk.line([(4.0, y), (4.0 + bar_mm * k, y)], 1.5)
    sk.text(f"{ctx.L(bar_mm)} at this scale", 8.0 + bar_mm * k, y - 2.5, 6.5)
    scale_txt = "1:1" if s == 1 else f"1:{s:g}"
    paper = ctx.paper.upper() if ctx.paper == "a4" else ctx.paper.title()
    text = f"Scale {scale_txt} when printed at 100 % on {paper}"
    sk.text(text, ctx.frame_w - text_width(text, 7.0), y - 2.5, 7.0)
