"""Meshing wires into straight segments for the wire model.

Rules: an arc becomes a polygon whose total length equals the arc's length (the
interior nodes are pushed radially outward until the chords add up to the arc; the
arc's end nodes stay on the tangent points so the straights still meet them), with at
least `min_seg_per_180` segments per 180 degrees and never fewer than two (an arc of more
than a quarter turn, a helix, is meshed quarter turn by quarter turn); no segment is
longer than `h_max_mm`; neighbouring segments stay within 2:1, across bends, junctions
and gaps too; every gap is one segment of its real width, its neighbours about its
width (`GAP_NEIGHBOUR` of it, and never under about two wire radii) whatever the top
frequency; a free end's last segments are graded down to `END_FRACTION` of the longest
(no end-cap correction is applied: the current is zero at the end node, the wire's end
face carries nothing; a thick tube's open end so resonates a little low in frequency); a
node falls on every junction, radius step and gap face.

How: along each wire a size field h(s) = max(floor, min(h_max, v_k + G d_k(s))) is the
least of cones of slope G = `GROWTH` from seeds (value v_k at a point or over a stretch:
gap faces, junctions, free ends, and every piece (arc, or straight between nodes) held
to at most its length / n_min); the arcs' and the junctions' values are lowered until
they agree with the field around them (a fixed point, reached from above). A straight
piece gets n = ceil(integral of ds / h) segments spaced evenly in that integral, an arc
n = ceil(length / its value) equal ones. Every piece so has at least two segments
(unless shorter than two minimum segments) and each segment fills 2/3 to 1 of its
share, which keeps neighbours within 2:1 (slope 0.3: at most 1.93) where pieces meet;
where a piece is shorter than two of its neighbours' segments (a gap a few millimetres
from a free end) the ratio can exceed 2. Each seed and so every count only grows as
`h_max_mm` falls: a finer mesh never has fewer segments.

Units: millimetres.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from itertools import pairwise

import numpy as np

from ..errors import FabplanError
from ..geometry.path import Arc3, BendPath, Line3
from ..numeric import brentq
from .structure import (
    Centreline,
    Gap,
    GapElement,
    Port,
    Structure,
    Topology,
    Wire,
    WireEnd,
    resolve,
    sub_arc,
)

__all__ = ["Mesh", "StructureMesh", "MeshFeed", "mesh_path", "mesh_structure", "arc_polygon",
           "graded_straight", "GROWTH", "END_FRACTION", "GAP_NEIGHBOUR"]

GROWTH = 0.3  # slope of the size field (segment to segment growth about 1.35)
END_FRACTION = 0.1  # a free end's segments, as a fraction of the longest segment
GAP_NEIGHBOUR = 0.85  # size field at a gap face, as a fraction of the gap's width
ARC_ALLOWANCE = 1.2  # an arc's value may exceed the field of its neighbours' by this
FLOOR_FACTOR = 1 / 0.6  # the size field never falls under this many shortest segments
_GRID = 400  # points per piece for the size-field integral


@dataclass(frozen=True)
class Mesh:
    """A single gapped path: nodes (N, 3) in mm from end A to end B; the loop closes from
    the last node back to the first through the gap segment `source_segments[0]`."""

    nodes: np.ndarray
    source_segments: tuple[int, ...]
    lengths: np.ndarray  # every segment's length, the closing gap last (mm)
    coarse_bends: int = 0  # arcs meshed with fewer segments than the rule (too tight)


@dataclass(frozen=True)
class MeshFeed:
    """A gap of the structure in the mesh: its segment(s), what it holds, and where it was
    declared (`gaps[i]` or `wire_gaps[i]`)."""

    segments: tuple[int, ...]
    element: GapElement
    where: str


@dataclass(frozen=True)
class StructureMesh:
    """Segments of a whole structure. Nodes (M, 3) in mm; segment k runs from node
    `seg_start[k]` to `seg_end[k]`, radius `radius[k]` (mm), on wire `wire[k]` (-1: a gap
    between wire ends) from arc length `s0[k]` to `s1[k]` (mm). Wire segments come wire by
    wire from end A to end B (a closed wire's closing segment last), then one segment per
    gap. `lossless[k]`: a gap (no conductor). `on_ground[m]`: node m lies on the ground."""

    nodes: np.ndarray
    seg_start: np.ndarray
    seg_end: np.ndarray
    radius: np.ndarray
    wire: np.ndarray
    s0: np.ndarray
    s1: np.ndarray
    lossless: np.ndarray
    feeds: tuple[MeshFeed, ...]
    on_ground: np.ndarray
    topology: Topology | None = None
    coarse_bends: int = 0
    junction_nodes: tuple[int, ...] = field(default_factory=tuple)

    @property
    def lengths(self) -> np.ndarray:
        return np.asarray(np.linalg.norm(self.nodes[self.seg_end] - self.nodes[self.seg_start],
                                         axis=1))

    @property
    def count(self) -> int:
        return len(self.seg_start)


# -- pieces ----------------------------------------------------------------------------------
def arc_polygon(arc: Arc3, n: int, fractions: np.ndarray | None = None) -> np.ndarray:
    """(n+1, 3) nodes on `arc` whose polygon length equals the arc length (mm).

    The end nodes are the arc's ends; the interior nodes sit at the equal-angle
    positions (or at `fractions` of the arc's angle, increasing from 0 to 1, for a
    graded helix), pushed radially (perpendicular to the axis) to a common radius.
    """
    phi = (np.linspace(0.0, arc.angle, n + 1) if fractions is None
           else arc.angle * np.asarray(fractions, float))
    if n < 2 or len(phi) != n + 1 or float(np.max(np.diff(phi))) > math.pi / 2 + 1e-12:
        raise FabplanError("an arc needs at least two segments and at most 90 degrees per "
                           "segment", field="segments", value=n)
    centre = np.asarray(arc.centre)
    u, v, ax = np.asarray(arc.u), np.asarray(arc.v), np.asarray(arc.axis)
    radial = np.cos(phi)[:, None] * u + np.sin(phi)[:, None] * v
    along = (arc.pitch * phi / (2 * math.pi))[:, None] * ax

    def nodes(r: float) -> np.ndarray:
        rad = np.full(n + 1, r)
        rad[0] = rad[-1] = arc.radius
        return np.asarray(centre + rad[:, None] * radial + along)

    def excess(r: float) -> float:
        p = nodes(r)
        return float(np.linalg.norm(np.diff(p, axis=0), axis=1).sum()) - arc.length

    lo, hi = arc.radius, arc.radius * 2.0
    if excess(lo) >= 0:
        return nodes(lo)
    while excess(hi) < 0:  # a steep helix needs more push
        hi *= 2.0
    r = float(brentq(excess, lo, hi, xtol=1e-13 * arc.radius, rtol=1e-14))
    return nodes(r)


def graded_straight(length: float, e1: float, e2: float, h: float) -> np.ndarray:
    """Segment lengths (mm) for a straight of `length` alone: about `e1` at the start and
    `e2` at the end (neither exceeded), growing towards `h` (never exceeded) in the
    middle, neighbours within 2:1. (The structure mesher sizes straights from one field
    over the whole wire; this is the same rule for one straight.)"""
    e1 = min(e1, h)
    e2 = min(e2, h)
    if length <= min(e1, e2):
        return np.array([length])
    seeds = np.array([[0.0, 0.0, e1 / 1.17], [length, length, e2 / 1.17]])
    s = np.linspace(0.0, length, 4001)
    size = _field(s, seeds, h, 0.0, None)
    return np.diff(_spread(s, size, 1))


def _field(s: np.ndarray, seeds: np.ndarray, h: float, floor: float,
           ring: float | None) -> np.ndarray:
    """The size field at arc lengths `s`: seeds (K, 3) rows (a, b, value) over [a, b]."""
    if len(seeds) == 0:
        return np.full(s.shape, max(h, floor))
    a, b, v = seeds[:, 0], seeds[:, 1], seeds[:, 2]
    d = np.maximum(np.maximum(a[None, :] - s[:, None], s[:, None] - b[None, :]), 0.0)
    if ring is not None:
        for shift in (ring, -ring):
            d = np.minimum(d, np.maximum(np.maximum(a[None, :] - (s[:, None] + shift),
                                                    (s[:, None] + shift) - b[None, :]), 0.0))
    f = np.minimum(h, np.min(v[None, :] + GROWTH * d, axis=1))
    return np.asarray(np.maximum(f, floor))


def _spread(s: np.ndarray, size: np.ndarray, n_min: int) -> np.ndarray:
    """Node positions over the grid `s`: n = max(n_min, ceil(int ds/size)) segments evenly
    spaced in that integral."""
    inv = 1.0 / size
    cum = np.concatenate([[0.0], np.cumsum((inv[1:] + inv[:-1]) / 2 * np.diff(s))])
    n = max(n_min, math.ceil(cum[-1] - 1e-9))
    nodes = np.interp(np.linspace(0.0, cum[-1], n + 1), cum, s)
    nodes[0], nodes[-1] = s[0], s[-1]
    return np.asarray(nodes)


@dataclass
class _Piece:
    s0: float
    s1: float
    prim: Line3 | Arc3 | None  # None: a gap cut into the wire
    n_min: int = 1
    plateau: float = math.inf  # the field's ceiling over the piece
    tiny: bool = False
    grid: np.ndarray = field(default_factory=lambda: np.zeros(0))
    graded: bool = False  # a helix's quarter turn: its segments follow the field

    @property
    def length(self) -> float:
        return self.s1 - self.s0


@dataclass
class _WirePlan:
    index: int
    line: Centreline
    wire: Wire
    pieces: list[_Piece]
    required: dict[float, str]  # arc length -> why a node is needed there
    floor: float
    min_len: float
    end_seeds: list[tuple[float, float]]  # (s, value) fixed seeds (gap faces, free ends)
    junction_seeds: list[tuple[float, int]]  # (s, junction id)
    moved: dict[float, float]  # required arc length -> where its node went (snapped)
    coarse: int = 0


def _split_primitive(prim: Line3 | Arc3, s0: float, a: float, b: float) -> Line3 | Arc3:
    """The part of `prim` (starting at arc length s0 on the wire) between a and b."""
    length = prim.length
    t0, t1 = (a - s0) / length, (b - s0) / length
    if isinstance(prim, Line3):
        p, q = np.asarray(prim.start), np.asarray(prim.end)
        x, y = p + (q - p) * t0, p + (q - p) * t1
        return Line3((float(x[0]), float(x[1]), float(x[2])),
                     (float(y[0]), float(y[1]), float(y[2])), a)
    return sub_arc(prim, t0 * prim.angle, t1 * prim.angle)


def _arc_piece(prim: Arc3, a: float, b: float, min_len: float, min_seg_per_180: int
               ) -> _Piece:
    p = _Piece(a, b, prim)
    if p.length < 2 * min_len:
        p.tiny = p.length < min_len
        p.plateau = p.length
    else:
        p.plateau = prim.length / _arc_count(prim, min_seg_per_180)
    return p


def _arc_count(arc: Arc3, min_seg_per_180: int) -> int:
    """The rule's least segment count for an arc: `min_seg_per_180` per 180 degrees, and
    never fewer than two."""
    return max(2, math.ceil(min_seg_per_180 * arc.angle / math.pi - 1e-9))


def _plan_wire(index: int, topo: Topology, h: float, min_seg_per_180: int,
               min_len_radii: float, gap_neighbour: float) -> _WirePlan:
    wire = topo.structure.wires[index]
    line = topo.centrelines[index]
    min_len = min_len_radii * max(wire.radii())
    floor = FLOOR_FACTOR * min_len
    total = line.length
    tol = 1e-9 * max(total, 1.0)
    required: dict[float, str] = {}
    for s in topo.marks(index):
        required[float(s)] = "node"
    for at, _ in wire.steps:
        required[float(at)] = "step"
    gaps = [(s0, s1) for w, s0, s1, _, _ in topo.wire_gaps if w == index]
    for s0, s1 in gaps:
        required[s0] = "gap"
        required[s1] = "gap"
    if not line.closed:
        required[0.0] = "end"
        required[total] = "end"
    # snap junctions on a wire's interior lying within a segment of a bend's end onto it (a
    # radius step stays where it is: the bend's end node gives way to it instead)
    bounds = [float(s) for s in line.starts[1:]]
    snapped: dict[float, str] = {}
    moved: dict[float, float] = {}
    for s, why in required.items():
        t = s
        if why == "node":
            near = [b for b in bounds if abs(b - s) < min_len]
            if near:
                t = min(near, key=lambda b: abs(b - s))
        moved[s] = t
        snapped[t] = why if t not in snapped else snapped[t]
    required = snapped
    cuts = sorted(set(required) | set(bounds) | ({0.0, total} if not line.closed else {0.0}))
    merged: list[float] = []
    for c in cuts:
        if merged and c - merged[-1] <= tol:
            continue
        merged.append(c)
    if line.closed:
        merged.append(total)
    pieces: list[_Piece] = []
    for a, b in pairwise(merged):
        mid = 0.5 * (a + b)
        if any(g0 - tol <= a and b <= g1 + tol for g0, g1 in gaps):
            pieces.append(_Piece(a, b, None, 1, b - a))
            continue
        k, _ = line.locate(mid)
        prim = _split_primitive(line.prims[k], float(line.starts[k]), a, b)
        if isinstance(prim, Arc3) and prim.angle > math.pi / 2 + 1e-9:
            # a long arc (a helix) in quarter turns, so that its size follows the field
            parts = math.ceil(prim.angle / (math.pi / 2) - 1e-9)
            edges = np.linspace(a, b, parts + 1)
            for lo, hi in pairwise(edges):
                part = _split_primitive(line.prims[k], float(line.starts[k]), float(lo),
                                        float(hi))
                if isinstance(part, Arc3):
                    piece = _arc_piece(part, float(lo), float(hi), min_len, min_seg_per_180)
                    if part.pitch and not piece.tiny:  # graded like a straight
                        piece.graded = True
                        piece.n_min = _arc_count(part, min_seg_per_180)
                    pieces.append(piece)
            continue
        if isinstance(prim, Arc3):
            pieces.append(_arc_piece(prim, a, b, min_len, min_seg_per_180))
            continue
        p = _Piece(a, b, prim)
        if p.length < 2 * min_len:
            p.tiny = p.length < min_len
            p.plateau = p.length
        else:
            p.plateau = p.length / 2
        pieces.append(p)
    end_seeds: list[tuple[float, float]] = []
    junction_seeds: list[tuple[float, int]] = []
    gap_width: dict[int, float] = {}
    for a, b, _, _ in topo.gaps:
        g = float(np.linalg.norm(topo.nodes[a].point - topo.nodes[b].point))
        gap_width[a] = min(gap_width.get(a, math.inf), g)
        gap_width[b] = min(gap_width.get(b, math.inf), g)
    for s0, s1 in gaps:
        end_seeds.append((s0, gap_neighbour * (s1 - s0)))
        end_seeds.append((s1, gap_neighbour * (s1 - s0)))
    for n, node in enumerate(topo.nodes):
        for w, s in node.members:
            if w != index:
                continue
            if n in gap_width:
                end_seeds.append((s, gap_neighbour * gap_width[n]))
            if len(node.members) > 1:
                junction_seeds.append((s, n))
            elif n not in gap_width and not node.on_ground:
                end_seeds.append((s, -1.0))  # a free end: END_FRACTION of h, set later
    return _WirePlan(index, line, wire, pieces, required, floor, min_len, end_seeds,
                     junction_seeds, moved)


def _seeds(plan: _WirePlan, h: float, junction: dict[int, float], skip: int = -1,
           allowance: float = 1.0) -> np.ndarray:
    """Seed rows (a, b, value): points (gap faces, free ends, junctions), then every piece's
    ceiling over its stretch, times `allowance`, leaving out piece `skip`."""
    rows = []
    for s, v in plan.end_seeds:
        rows.append((s, s, END_FRACTION * h if v < 0 else v))
    for s, n in plan.junction_seeds:
        rows.append((s, s, junction[n]))
    for k, p in enumerate(plan.pieces):
        if k != skip and not p.tiny and math.isfinite(p.plateau):
            rows.append((p.s0, p.s1, allowance * p.plateau))
    return np.asarray(rows, dtype=float).reshape(-1, 3)


def _size_wires(plans: list[_WirePlan], h: float) -> dict[int, float]:
    """Lower the arcs' and junctions' seeds until they agree with the field (a fixed point,
    reached from above). An arc is meshed evenly, so its value is the least of the field
    over it, where the other pieces' ceilings count `ARC_ALLOWANCE` times (so neighbouring
    arcs may differ; their segments still stay within 2:1)."""
    junction: dict[int, float] = {}
    for plan in plans:
        for _, n in plan.junction_seeds:
            junction[n] = h
        for p in plan.pieces:
            p.grid = np.linspace(p.s0, p.s1, _GRID + 1)
            if isinstance(p.prim, Arc3) and not p.tiny and not p.graded:
                p.plateau = max(plan.floor, min(h, p.plateau))
    for _ in range(500):
        changed = False
        for plan in plans:
            ring = plan.line.length if plan.line.closed else None
            for k, p in enumerate(plan.pieces):
                if isinstance(p.prim, Arc3) and not p.tiny and not p.graded:
                    others = _seeds(plan, h, junction, k, ARC_ALLOWANCE)
                    low = float(_field(p.grid, others, h, plan.floor, ring).min())
                    if low < p.plateau * (1 - 1e-12):
                        p.plateau = low
                        changed = True
            seeds = _seeds(plan, h, junction)
            for s, n in plan.junction_seeds:
                v = float(_field(np.array([s]), seeds, h, plan.floor, ring)[0])
                if v < junction[n] * (1 - 1e-12):
                    junction[n] = v
                    changed = True
        if not changed:
            break
    return junction


def _wire_nodes(plan: _WirePlan, h: float, min_seg_per_180: int, junction: dict[int, float]
                ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Node points (n+1, 3), their arc lengths and whether each may be dropped."""
    seeds = _seeds(plan, h, junction)
    ring = plan.line.length if plan.line.closed else None
    pts: list[np.ndarray] = []
    ss: list[np.ndarray] = []
    for k, p in enumerate(plan.pieces):
        if p.prim is None or p.tiny:
            s = np.array([p.s0, p.s1])
        elif isinstance(p.prim, Arc3) and p.graded:
            s = _spread(p.grid, _field(p.grid, seeds, h, plan.floor, ring), p.n_min)
        elif isinstance(p.prim, Arc3):
            n = max(1, math.ceil(p.length / p.plateau - 1e-9))
            want = _arc_count(p.prim, min_seg_per_180)
            if n < want:
                plan.coarse += 1
            if p.prim.angle / max(n, 1) > math.pi / 2:
                n = max(n, math.ceil(p.prim.angle / (math.pi / 2)))
            s = np.linspace(p.s0, p.s1, n + 1)
        else:
            s = _spread(p.grid, _field(p.grid, seeds, h, plan.floor, ring), p.n_min)
        if isinstance(p.prim, Arc3) and len(s) > 2:
            q = arc_polygon(p.prim, len(s) - 1, (s - p.s0) / p.length if p.graded else None)
        elif isinstance(p.prim, Line3):
            a, b = np.asarray(p.prim.start), np.asarray(p.prim.end)
            q = a + (b - a) * ((s - p.s0) / p.length)[:, None]
        else:
            q = np.array([plan.line.point(p.s0), plan.line.point(p.s1)])
        if k:
            q, s = q[1:], s[1:]
        pts.append(q)
        ss.append(s)
    nodes = np.vstack(pts)
    s_all = np.concatenate(ss)
    droppable = np.array([not any(abs(x - r) <= 1e-9 * max(plan.line.length, 1.0)
                                  for r in plan.required) for x in s_all])
    if plan.line.closed:  # the last node is the first again
        nodes, s_all, droppable = nodes[:-1], s_all[:-1], droppable[:-1]
        droppable[0] = False
    return _merge_short(nodes, s_all, droppable, plan.min_len, plan.line.closed, plan.index)


def _merge_short(nodes: np.ndarray, s: np.ndarray, droppable: np.ndarray, min_len: float,
                 closed: bool, wire: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Drop droppable nodes until no segment is shorter than `min_len` (the shorter
    neighbour absorbs it)."""
    if min_len <= 0:
        return nodes, s, droppable
    pts, ss, dr = list(nodes), list(s), list(droppable)
    while True:
        arr = np.asarray(pts)
        seg = np.linalg.norm((np.roll(arr, -1, axis=0) - arr) if closed
                             else np.diff(arr, axis=0), axis=1)
        k = int(np.argmin(seg))
        if seg[k] >= min_len * (1 - 1e-9):
            break
        n = len(pts)
        a, b = k, (k + 1) % n
        left = seg[k - 1] if (k > 0 or closed) else math.inf
        right = seg[(k + 1) % len(seg)] if (k + 1 < len(seg) or closed) else math.inf
        options = [(left, a), (right, b)]
        options = [(x, i) for x, i in sorted(options) if dr[i]]
        if not options:
            raise FabplanError(f"two nodes of wire {wire} that must stay (junctions, radius steps, "
                               f"gap faces or ends) are only {seg[k]:.3g} mm apart, under the "
                               f"shortest segment ({min_len:.3g} mm): move them apart",
                               field=f"wires[{wire}]", value=round(float(ss[a]), 4))
        drop = options[0][1]
        del pts[drop], ss[drop], dr[drop]
    return np.asarray(pts), np.asarray(ss), np.asarray(dr)


def mesh_structure(topo: Topology, h_max_mm: float, min_seg_per_180: int = 8,
                   min_len_radii: float = 1.0, gap_neighbour: float = GAP_NEIGHBOUR
                   ) -> StructureMesh:
    """Mesh a resolved structure (see `structure.resolve`) with segments <= `h_max_mm`.

    `min_len_radii`: the shortest segment the solver accepts, in wire radii. A bend too
    tight for `min_seg_per_180` segments of that length gets fewer (counted in
    `coarse_bends`); a straight shorter than it is merged into a neighbour.
    """
    if not h_max_mm > 0:
        raise FabplanError("the longest segment must be positive", field="h_max_mm",
                           value=h_max_mm)
    n_wires = len(topo.centrelines)
    plans = [_plan_wire(i, topo, h_max_mm, min_seg_per_180, min_len_radii, gap_neighbour)
             for i in range(n_wires)]
    junction = _size_wires(plans, h_max_mm)
    node_pts: list[np.ndarray] = [node.point for node in topo.nodes]
    seg_a: list[np.ndarray] = []
    seg_b: list[np.ndarray] = []
    radius: list[np.ndarray] = []
    wire_of: list[np.ndarray] = []
    s0_l: list[np.ndarray] = []
    s1_l: list[np.ndarray] = []
    lossless: list[np.ndarray] = []
    feeds: list[MeshFeed] = []
    seg_count = 0
    coarse = 0
    tol_s = {i: 1e-9 * max(topo.centrelines[i].length, 1.0) for i in range(n_wires)}
    for plan in plans:
        i = plan.index
        pts, s, _ = _wire_nodes(plan, h_max_mm, min_seg_per_180, junction)
        coarse += plan.coarse
        ids = np.empty(len(s), dtype=np.int64)
        marks = [(plan.moved.get(m, m), n) for n, node in enumerate(topo.nodes)
                 for w, m in node.members if w == i]
        m_s = np.array([m for m, _ in marks])
        m_n = np.array([n for _, n in marks], dtype=np.int64)
        for k, x in enumerate(s):
            d = np.abs(m_s - x) if len(m_s) else np.zeros(0)
            if len(d) and float(d.min()) <= tol_s[i]:
                j = int(np.argmin(d))
                ids[k] = m_n[j]
                if plan.moved and any(abs(t - x) <= tol_s[i] and abs(o - t) > tol_s[i]
                                      for o, t in plan.moved.items()):
                    # a T point that snapped onto a bend's end: the node moves with it
                    node_pts[int(m_n[j])] = pts[k]
            else:
                ids[k] = len(node_pts)
                node_pts.append(pts[k])
        closed = plan.line.closed
        a = ids if closed else ids[:-1]
        b = np.roll(ids, -1) if closed else ids[1:]
        sa = s if closed else s[:-1]
        sb = np.append(s[1:], plan.line.length) if closed else s[1:]
        mid = 0.5 * (sa + sb)
        seg_a.append(a)
        seg_b.append(b)
        radius.append(plan.wire.radius_at(mid))
        wire_of.append(np.full(len(a), i))
        s0_l.append(sa)
        s1_l.append(sb)
        gap_here = np.zeros(len(a), bool)
        for w, g0, g1, element, where in topo.wire_gaps:
            if w != i:
                continue
            hit_k = np.nonzero((np.abs(sa - g0) <= 1e-6 * max(g1 - g0, 1e-9))
                               & (np.abs(sb - g1) <= 1e-6 * max(g1 - g0, 1e-9)))[0]
            if len(hit_k) != 1:
                raise FabplanError("the mesh lost a gap cut into the wire (it touches a bend "
                                   "end or another node): move it", field=where, value=g0)
            gap_here[hit_k[0]] = True
            feeds.append(MeshFeed((seg_count + int(hit_k[0]),), element, where))
        lossless.append(gap_here)
        seg_count += len(a)
    for a_node, b_node, element, where in topo.gaps:
        seg_a.append(np.array([a_node]))
        seg_b.append(np.array([b_node]))
        ra = min(_node_radius(topo, a_node), _node_radius(topo, b_node))
        radius.append(np.array([ra]))
        wire_of.append(np.array([-1]))
        g = float(np.linalg.norm(node_pts[b_node] - node_pts[a_node]))
        s0_l.append(np.array([0.0]))
        s1_l.append(np.array([g]))
        lossless.append(np.array([True]))
        feeds.append(MeshFeed((seg_count,), element, where))
        seg_count += 1
    order = {f.where: k for k, f in enumerate(feeds)}
    feeds.sort(key=lambda f: (0 if f.where.startswith("gaps") else 1,
                              int(f.where.split("[")[1].rstrip("]")), order[f.where]))
    nodes = np.asarray(node_pts, dtype=float)
    ground = topo.structure.ground_z_mm
    on_ground = np.zeros(len(nodes), bool)
    if ground is not None:
        for n, node in enumerate(topo.nodes):
            on_ground[n] = node.on_ground
    junctions = tuple(n for n, node in enumerate(topo.nodes) if len(node.members) > 1)
    return StructureMesh(nodes, np.concatenate(seg_a), np.concatenate(seg_b),
                         np.concatenate(radius), np.concatenate(wire_of), np.concatenate(s0_l),
                         np.concatenate(s1_l), np.concatenate(lossless), tuple(feeds),
                         on_ground, topo, coarse, junctions)


def _node_radius(topo: Topology, node: int) -> float:
    out = math.inf
    for w, s in topo.nodes[node].members:
        out = min(out, float(topo.structure.wires[w].radius_at(np.array([s]))[0]))
    return out


def mesh_path(path: BendPath, h_max_mm: float, min_seg_per_180: int = 8,
              min_len_mm: float = 0.0, gap_neighbour: float = GAP_NEIGHBOUR) -> Mesh:
    """Mesh `path` (which must have a feed gap) with segments <= `h_max_mm` (mm).

    `min_len_mm`: the shortest segment the solver accepts (about a wire radius). A bend
    too tight for `min_seg_per_180` segments of that length gets fewer (at least two;
    counted in `coarse_bends`); a straight shorter than it is merged into a neighbour.
    `gap_neighbour`: the size field at the gap's faces, as a fraction of the gap.
    """
    if path.gap_mm is None:
        raise FabplanError("the electrical model needs a feed gap on the path", field="gap",
                           value=None)
    b_end, a_end = path.gap_ends()
    if float(np.linalg.norm(a_end - b_end)) <= 0:
        raise FabplanError("the ends meet: the feed gap has no width", field="gap",
                           value=path.gap_mm)
    radius = max(min_len_mm, 1e-6)
    structure = Structure((Wire(path, radius),), (Gap(WireEnd(0, "B"), WireEnd(0, "A"),
                                                       Port()),), detect_junctions=False)
    topo = resolve_path(structure)
    mesh = mesh_structure(topo, h_max_mm, min_seg_per_180, 1.0 if min_len_mm > 0 else 0.0,
                          gap_neighbour)
    n_wire = int(np.sum(mesh.wire == 0))
    nodes = mesh.nodes[np.append(mesh.seg_start[:n_wire], mesh.seg_end[n_wire - 1])]
    lengths = mesh.lengths
    return Mesh(nodes, (n_wire,), np.concatenate([lengths[:n_wire], lengths[n_wire:]]),
                mesh.coarse_bends)


def resolve_path(structure: Structure) -> Topology:
    """`resolve` for a single gapped path, without the close-approach check (the model
    makes its own on the segments)."""
    return resolve(structure)
