"""Meshing a bend path's centreline into straight segments for the wire model.

Rules: an arc becomes a polygon whose total length equals the arc's length (the
interior nodes are pushed radially outward until the chords add up to the arc;
the arc's end nodes stay on the tangent points so the straights still meet
them), with at least `min_seg_per_180` segments per 180 degrees and never fewer
than two; no segment is longer than `h_max_mm`; neighbouring segments stay
within 2:1 (straights are graded, arcs refined); the feed gap is one segment of
its real width closing the path from end B to end A, its neighbours about 3/4 of
its width (two wire radii at least) whatever the top frequency, growing from there.

Units: millimetres.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..errors import FabplanError
from ..geometry.path import Arc3, BendPath, Line3

__all__ = ["Mesh", "mesh_path", "arc_polygon", "graded_straight"]

_GROWTH = 0.5  # growth rate of graded straights (ratio about 1.65 per segment)
_FIRST = 1.3  # the first graded segment comes out up to this factor above the sizing


@dataclass(frozen=True)
class Mesh:
    """Nodes (N, 3) in mm from end A to end B; the loop closes from the last node
    back to the first through the gap segment `source_segments[0]`."""

    nodes: np.ndarray
    source_segments: tuple[int, ...]
    lengths: np.ndarray  # every segment's length, the closing gap last (mm)
    coarse_bends: int = 0  # arcs meshed with fewer segments than the rule (too tight)


def arc_polygon(arc: Arc3, n: int) -> np.ndarray:
    """(n+1, 3) nodes on `arc` whose polygon length equals the arc length (mm).

    The end nodes are the arc's ends; the interior nodes sit at the equal-angle
    positions, pushed radially (perpendicular to the axis) to a common radius.
    """
    from scipy.optimize import brentq

    if n < 2 or arc.angle / n > math.pi / 2 + 1e-12:
        raise FabplanError("an arc needs at least two segments and at most 90 degrees per "
                           "segment", field="segments", value=n)
    phi = np.linspace(0.0, arc.angle, n + 1)
    centre = np.asarray(arc.centre)
    u, v, ax = np.asarray(arc.u), np.asarray(arc.v), np.asarray(arc.axis)
    radial = np.cos(phi)[:, None] * u + np.sin(phi)[:, None] * v
    along = (arc.pitch * phi / (2 * math.pi))[:, None] * ax

    def nodes(r: float) -> np.ndarray:
        rad = np.full(n + 1, r)
        rad[0] = rad[-1] = arc.radius
        return centre + rad[:, None] * radial + along

    def excess(r: float) -> float:
        p = nodes(r)
        return float(np.linalg.norm(np.diff(p, axis=0), axis=1).sum()) - arc.length

    lo, hi = arc.radius, arc.radius * 2.0
    if excess(lo) >= 0:
        return nodes(lo)
    while excess(hi) < 0:  # a steep helix needs more push
        hi *= 2.0
    r = brentq(excess, lo, hi, xtol=1e-13 * arc.radius, rtol=1e-14)
    return nodes(r)


def graded_straight(length: float, e1: float, e2: float, h: float) -> np.ndarray:
    """Segment lengths (mm) for a straight of `length`: about `e1` at the start and
    `e2` at the end (neither exceeded), growing by at most ~1.65 per segment
    towards `h` (never exceeded) in the middle."""
    e1 = min(e1, h)
    e2 = min(e2, h)
    if length <= min(e1, e2):
        return np.array([length])
    x = np.linspace(0.0, length, 4001)
    size = np.minimum.reduce([np.full_like(x, h), e1 / _FIRST + _GROWTH * x,
                              e2 / _FIRST + _GROWTH * (length - x)])
    inv = 1.0 / size
    cum = np.concatenate([[0.0], np.cumsum((inv[1:] + inv[:-1]) / 2 * np.diff(x))])
    n = max(1, math.ceil(cum[-1] - 1e-9))
    nodes = np.interp(np.linspace(0.0, cum[-1], n + 1), cum, x)
    nodes[0], nodes[-1] = 0.0, length
    return np.diff(nodes)


@dataclass
class _Piece:
    prim: Line3 | Arc3 | None  # None: the gap
    length: float
    n_min: int = 1
    first: float = 0.0  # current end segment lengths
    last: float = 0.0
    sizes: np.ndarray | None = None


def mesh_path(path: BendPath, h_max_mm: float, min_seg_per_180: int = 8,
              min_len_mm: float = 0.0, gap_neighbour: float = 0.75) -> Mesh:
    """Mesh `path` (which must have a feed gap) with segments <= `h_max_mm` (mm).

    `min_len_mm`: the shortest segment the solver accepts (about a wire radius). A bend
    too tight for `min_seg_per_180` segments of that length gets fewer (at least two;
    counted in `coarse_bends`); a straight shorter than it is merged into a neighbour.
    `gap_neighbour`: length of the segments beside the gap, as a fraction of the gap.
    """
    if path.gap_mm is None:
        raise FabplanError("the electrical model needs a feed gap on the path", field="gap",
                           value=None)
    if not h_max_mm > 0:
        raise FabplanError("the longest segment must be positive", field="h_max_mm",
                           value=h_max_mm)
    pieces: list[_Piece] = []
    coarse = 0
    for prim in path.primitives():
        if prim.length <= 1e-9:
            continue
        if isinstance(prim, Arc3):
            n_min = max(2, math.ceil(min_seg_per_180 * prim.angle / math.pi - 1e-9))
            if min_len_mm > 0 and prim.length / n_min < min_len_mm:
                n_min = max(2, math.floor(prim.length / min_len_mm))
                coarse += 1
            pieces.append(_Piece(prim, prim.length, n_min))
        else:
            pieces.append(_Piece(prim, prim.length))
    b_end, a_end = path.gap_ends()
    gap_len = float(np.linalg.norm(a_end - b_end))
    if gap_len <= 0:
        raise FabplanError("the ends meet: the feed gap has no width", field="gap",
                           value=path.gap_mm)
    # the gap's neighbours: 3/4 of the gap (and twice min_len), whatever the top
    # frequency, so that refining the mesh far away leaves the feed region alone; the
    # solution converges only slowly with the size of these segments
    near_gap = max(2 * min_len_mm, gap_neighbour * gap_len)
    gap = _Piece(None, gap_len, 1, near_gap / 2, near_gap / 2, np.array([gap_len]))
    ring = pieces + [gap]
    m = len(ring)
    for p in pieces:
        p.first = p.last = min(h_max_mm, p.length / p.n_min)
    for _ in range(200):
        changed = False
        for idx, p in enumerate(ring):
            if p.prim is None:
                continue
            before = ring[idx - 1].last
            after = ring[(idx + 1) % m].first
            if isinstance(p.prim, Arc3):
                cap = max(min(h_max_mm, 2 * before, 2 * after), min_len_mm)
                n = max(p.n_min, math.ceil(p.length / cap - 1e-9))
                sizes = np.full(n, p.length / n)
            else:
                sizes = graded_straight(p.length, 2 * before, 2 * after, h_max_mm)
            if p.sizes is None or len(sizes) != len(p.sizes) or not np.allclose(sizes, p.sizes):
                changed = True
            p.sizes = sizes
            p.first, p.last = float(sizes[0]), float(sizes[-1])
        if not changed:
            break
    nodes = [np.asarray(path.origin, dtype=float)[None, :]]
    for p in pieces:
        if isinstance(p.prim, Arc3):
            pts = arc_polygon(p.prim, len(p.sizes))
        else:
            line = p.prim
            s = np.concatenate([[0.0], np.cumsum(p.sizes)]) / p.length
            pts = np.asarray(line.start) * (1 - s[:, None]) + np.asarray(line.end) * s[:, None]
        nodes.append(pts[1:])
    all_nodes = _merge_short(np.vstack(nodes), min_len_mm)
    lengths = np.concatenate([np.linalg.norm(np.diff(all_nodes, axis=0), axis=1), [gap_len]])
    return Mesh(all_nodes, (len(all_nodes) - 1,), lengths, coarse)


def _merge_short(nodes: np.ndarray, min_len: float) -> np.ndarray:
    """Drop interior nodes until no segment is shorter than `min_len` (the shorter
    neighbour absorbs it); the end nodes (the gap's faces) stay."""
    if min_len <= 0:
        return nodes
    pts = [p for p in nodes]
    while len(pts) > 3:
        seg = np.linalg.norm(np.diff(np.asarray(pts), axis=0), axis=1)
        k = int(np.argmin(seg))
        if seg[k] >= min_len * (1 - 1e-9):
            break
        # remove the node shared with the shorter neighbour, never an end node
        left = seg[k - 1] if k > 0 else math.inf
        right = seg[k + 1] if k + 1 < len(seg) else math.inf
        drop = k if left <= right else k + 1
        drop = min(max(drop, 1), len(pts) - 2)
        del pts[drop]
    return np.asarray(pts)
