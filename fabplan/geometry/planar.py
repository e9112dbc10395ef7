"""Flat geometry, kept exact: lines, true arcs, circles and closed contours.

Every coordinate is millimetres; angles are degrees, counter-clockwise from +x.
Contours run counter-clockwise round the material (holes are circles).
`offset_contour` grows a contour outward by a distance, keeping arcs as arcs
(the kerf compensation of a cutting tool). A planar bend path's centreline and
the conductor's outline are given here as such lines and arcs, for the jig and
every drawing. shapely is imported only inside the functions that build shapely
geometry.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:  # pragma: no cover
    from .path import BendPath

__all__ = ["P", "Line", "Arc", "Circle", "Contour", "Segment", "offset_contour",
           "rounded_rect", "contour_to_polygon", "clip_line_x", "clip_arc_x",
           "inside_corners", "planar_centreline", "conductor_edges", "conductor_caps",
           "conductor_outline", "bounds",
           "segment_points"]

P = tuple[float, float]


@dataclass(frozen=True)
class Line:
    """A straight segment from `start` to `end` (mm)."""

    start: P
    end: P

    @property
    def length(self) -> float:
        return math.hypot(self.end[0] - self.start[0], self.end[1] - self.start[1])

    def tangent_in(self) -> P:
        n = self.length
        return ((self.end[0] - self.start[0]) / n, (self.end[1] - self.start[1]) / n)

    tangent_out = tangent_in

    def midpoint(self) -> P:
        return ((self.start[0] + self.end[0]) / 2, (self.start[1] + self.end[1]) / 2)


@dataclass(frozen=True)
class Arc:
    """A circular arc: `centre` and `radius` (mm), starting at `start_deg` and
    turning `sweep_deg` (positive counter-clockwise, negative clockwise)."""

    centre: P
    radius: float
    start_deg: float
    sweep_deg: float

    def point(self, deg: float) -> P:
        a = math.radians(deg)
        return (self.centre[0] + self.radius * math.cos(a),
                self.centre[1] + self.radius * math.sin(a))

    @property
    def start(self) -> P:
        return self.point(self.start_deg)

    @property
    def end(self) -> P:
        return self.point(self.start_deg + self.sweep_deg)

    @property
    def length(self) -> float:
        return abs(math.radians(self.sweep_deg)) * self.radius

    def _tangent(self, deg: float) -> P:
        a = math.radians(deg)
        s = 1.0 if self.sweep_deg >= 0 else -1.0
        return (-s * math.sin(a), s * math.cos(a))

    def tangent_in(self) -> P:
        return self._tangent(self.start_deg)

    def tangent_out(self) -> P:
        return self._tangent(self.start_deg + self.sweep_deg)

    def ccw_angles(self) -> tuple[float, float]:
        """(start, end) degrees for a counter-clockwise arc entity."""
        if self.sweep_deg >= 0:
            return self.start_deg, self.start_deg + self.sweep_deg
        return self.start_deg + self.sweep_deg, self.start_deg


@dataclass(frozen=True)
class Circle:
    centre: P
    radius: float


Segment = Line | Arc


@dataclass(frozen=True)
class Contour:
    """A closed outline: segments joined end to start, counter-clockwise."""

    segments: tuple[Segment, ...]

    def points(self, max_step_deg: float = 2.0) -> list[P]:
        """Vertices with arcs sampled every `max_step_deg` at most."""
        pts: list[P] = []
        for seg in self.segments:
            if isinstance(seg, Line):
                pts.append(seg.start)
                continue
            n = max(2, math.ceil(abs(seg.sweep_deg) / max_step_deg))
            for i in range(n):
                pts.append(seg.point(seg.start_deg + seg.sweep_deg * i / n))
        return pts

    @property
    def length(self) -> float:
        return sum(s.length for s in self.segments)


def _angle(v: P) -> float:
    return math.degrees(math.atan2(v[1], v[0]))


def _cross(a: P, b: P) -> float:
    return a[0] * b[1] - a[1] * b[0]


def _turn_deg(t_in: P, t_out: P) -> float:
    """Signed turn from one tangent to the next (degrees, left positive)."""
    return math.degrees(math.atan2(_cross(t_in, t_out), t_in[0] * t_out[0] + t_in[1] * t_out[1]))


def _outward(t: P) -> P:
    """Outward normal of a counter-clockwise contour: the right of travel."""
    return (t[1], -t[0])


def offset_contour(contour: Contour, dist: float) -> Contour:
    """The contour grown outward by `dist` mm (shrunk when negative).

    Lines move along their outward normal, convex arcs grow and concave arcs
    shrink by `dist`, and each convex sharp corner gains an arc of radius
    `dist` about the corner (the exact outline a round tool of that radius
    sweeps). A concave sharp corner between two lines becomes the lines'
    intersection. Arcs stay arcs.
    """
    if dist == 0:
        return contour
    segs = contour.segments
    moved: list[Segment] = []
    for s in segs:
        if isinstance(s, Line):
            nx, ny = _outward(s.tangent_in())
            moved.append(Line((s.start[0] + dist * nx, s.start[1] + dist * ny),
                              (s.end[0] + dist * nx, s.end[1] + dist * ny)))
        else:
            r = s.radius + dist if s.sweep_deg > 0 else s.radius - dist
            if r <= 0:
                raise ValueError("offset larger than a concave arc's radius")
            moved.append(Arc(s.centre, r, s.start_deg, s.sweep_deg))
    out: list[Segment] = []
    n = len(segs)
    for i in range(n):
        cur = moved[i]
        nxt_orig = segs[(i + 1) % n]
        out.append(cur)
        turn = _turn_deg(segs[i].tangent_out(), nxt_orig.tangent_in())
        if abs(turn) < 1e-7:
            continue
        corner = segs[i].end
        if (turn > 0) == (dist > 0):
            start = _angle(_outward(segs[i].tangent_out()))
            if dist < 0:
                start += 180.0
            out.append(Arc(corner, abs(dist), start, turn))
        else:
            if not (isinstance(cur, Line) and isinstance(moved[(i + 1) % n], Line)):
                raise ValueError("offset of a concave corner next to an arc is not supported")
            p = _intersect(cur, moved[(i + 1) % n])  # type: ignore[arg-type]
            out[-1] = Line(cur.start, p)
            moved[(i + 1) % n] = Line(p, moved[(i + 1) % n].end)
            if i + 1 == n:
                out[0] = moved[0]
    return Contour(tuple(out))


def _intersect(a: Line, b: Line) -> P:
    d1 = (a.end[0] - a.start[0], a.end[1] - a.start[1])
    d2 = (b.end[0] - b.start[0], b.end[1] - b.start[1])
    den = _cross(d1, d2)
    t = _cross((b.start[0] - a.start[0], b.start[1] - a.start[1]), d2) / den
    return (a.start[0] + t * d1[0], a.start[1] + t * d1[1])


def rounded_rect(x0: float, y0: float, x1: float, y1: float,
                 radii: tuple[float, float, float, float] | float = 0.0) -> Contour:
    """A rectangle, counter-clockwise from the bottom-left, with corner radii
    (bottom-left, bottom-right, top-right, top-left) in mm; 0 for a sharp corner."""
    rb, rr, rt, rl = (radii,) * 4 if isinstance(radii, (int, float)) else radii
    segs: list[Segment] = []

    def corner(cx: float, cy: float, r: float, start: float) -> None:
        if r > 0:
            segs.append(Arc((cx, cy), r, start, 90.0))

    segs.append(Line((x0 + rb, y0), (x1 - rr, y0)))
    corner(x1 - rr, y0 + rr, rr, -90.0)
    segs.append(Line((x1, y0 + rr), (x1, y1 - rt)))
    corner(x1 - rt, y1 - rt, rt, 0.0)
    segs.append(Line((x1 - rt, y1), (x0 + rl, y1)))
    corner(x0 + rl, y1 - rl, rl, 90.0)
    segs.append(Line((x0, y1 - rl), (x0, y0 + rb)))
    corner(x0 + rb, y0 + rb, rb, 180.0)
    return Contour(tuple(sg for sg in segs if not (isinstance(sg, Line) and sg.length < 1e-9)))


def contour_to_polygon(contour: Contour, max_step_deg: float = 2.0) -> Any:
    """A shapely Polygon of the contour, arcs sampled every `max_step_deg`."""
    from shapely.geometry import Polygon

    return Polygon(contour.points(max_step_deg))


def clip_line_x(line: Line, xa: float, xb: float) -> Line | None:
    """The part of `line` with xa <= x <= xb, or None."""
    (x0, y0), (x1, y1) = line.start, line.end
    if x0 == x1:
        return line if xa <= x0 <= xb else None
    ta, tb = (xa - x0) / (x1 - x0), (xb - x0) / (x1 - x0)
    lo, hi = max(0.0, min(ta, tb)), min(1.0, max(ta, tb))
    if hi - lo <= 1e-12:
        return None
    return Line((x0 + lo * (x1 - x0), y0 + lo * (y1 - y0)),
                (x0 + hi * (x1 - x0), y0 + hi * (y1 - y0)))


def clip_arc_x(arc: Arc, xa: float, xb: float) -> list[Arc]:
    """The pieces of `arc` with xa <= x <= xb."""
    cuts = [0.0, 1.0]
    a0, sw = arc.start_deg, arc.sweep_deg
    for xc in (xa, xb):
        c = (xc - arc.centre[0]) / arc.radius
        if -1 < c < 1:
            base = math.degrees(math.acos(c))
            for ang in (base, -base):
                # parameter t in (0, 1) where the arc passes this angle
                k = (ang - a0) / sw
                period = 360.0 / abs(sw)
                t = k % period
                if 0 < t < 1:
                    cuts.append(t)
    cuts.sort()
    out = []
    for t0, t1 in zip(cuts, cuts[1:]):
        if t1 - t0 < 1e-12:
            continue
        mid = arc.point(a0 + sw * (t0 + t1) / 2)
        if xa - 1e-9 <= mid[0] <= xb + 1e-9:
            out.append(Arc(arc.centre, arc.radius, a0 + sw * t0, sw * (t1 - t0)))
    return out


def inside_corners(contour: Contour, tool_radius: float) -> list[tuple[P, float]]:
    """Inside (concave) corners a round tool of `tool_radius` mm cannot reach:
    sharp concave corners (radius 0) and concave arcs of smaller radius.
    Returns (where, corner radius) pairs."""
    out: list[tuple[P, float]] = []
    segs = contour.segments
    for i, s in enumerate(segs):
        if isinstance(s, Arc) and s.sweep_deg < 0 and s.radius < tool_radius - 1e-9:
            out.append((s.point(s.start_deg + s.sweep_deg / 2), s.radius))
        nxt = segs[(i + 1) % len(segs)]
        if _turn_deg(s.tangent_out(), nxt.tangent_in()) < -1e-6:
            out.append((s.end, 0.0))
    return out


# -- bend paths in their plane -------------------------------------------------------
def planar_centreline(path: BendPath) -> list[Segment]:
    """The centreline of a planar bend path as lines and true arcs in its z = 0
    plane (mm), from end A; pieces of no length are left out."""
    from .path import Line3

    out: list[Segment] = []
    for prim in path.primitives():
        if isinstance(prim, Line3):
            if prim.length > 1e-9:
                out.append(Line((prim.start[0], prim.start[1]), (prim.end[0], prim.end[1])))
            continue
        u, v = prim.u, prim.v
        ccw = u[0] * v[1] - u[1] * v[0] > 0
        start = math.degrees(math.atan2(u[1], u[0]))
        sweep = math.degrees(prim.angle)
        out.append(Arc((prim.centre[0], prim.centre[1]), prim.radius, start,
                       sweep if ccw else -sweep))
    return out


def conductor_edges(seg: Segment, diameter_mm: float) -> list[Segment]:
    """The two edges of a conductor of `diameter_mm` along one centreline segment:
    a line moved half the diameter to its left and to its right, an arc at its
    radius minus and plus half the diameter (an edge of no radius is left out)."""
    half = diameter_mm / 2
    if isinstance(seg, Arc):
        return [Arc(seg.centre, r, seg.start_deg, seg.sweep_deg)
                for r in (seg.radius - half, seg.radius + half) if r > 1e-9]
    tx, ty = seg.tangent_in()
    nx, ny = -ty * half, tx * half
    (x0, y0), (x1, y1) = seg.start, seg.end
    return [Line((x0 + nx, y0 + ny), (x1 + nx, y1 + ny)),
            Line((x0 - nx, y0 - ny), (x1 - nx, y1 - ny))]


def conductor_caps(centreline: Sequence[Segment], diameter_mm: float) -> list[Line]:
    """A square cap across each end of a conductor of `diameter_mm` (end A, then end B)."""
    if not centreline:
        return []
    half = diameter_mm / 2
    return [Line((px - ty * half, py + tx * half), (px + ty * half, py - tx * half))
            for (px, py), (tx, ty) in ((centreline[0].start, centreline[0].tangent_in()),
                                       (centreline[-1].end, centreline[-1].tangent_out()))]


def conductor_outline(centreline: Sequence[Segment], diameter_mm: float) -> list[Segment]:
    """The outline of a conductor of `diameter_mm` along a planar centreline: both
    edges of each segment in turn, then a square cap across each end."""
    out: list[Segment] = []
    for seg in centreline:
        out += conductor_edges(seg, diameter_mm)
    return out + conductor_caps(centreline, diameter_mm)


def segment_points(seg: Segment | Circle, max_step_deg: float = 5.0) -> list[P]:
    """Points along a line, arc or circle (arcs sampled every `max_step_deg`)."""
    if isinstance(seg, Line):
        return [seg.start, seg.end]
    if isinstance(seg, Circle):
        seg = Arc(seg.centre, seg.radius, 0.0, 360.0)
    n = max(2, math.ceil(abs(seg.sweep_deg) / max_step_deg))
    return [seg.point(seg.start_deg + seg.sweep_deg * i / n) for i in range(n + 1)]


def bounds(segments: Sequence[Segment | Circle]) -> tuple[float, float, float, float]:
    """(x0, y0, x1, y1) of the segments (arcs by their extreme points)."""
    xs: list[float] = []
    ys: list[float] = []
    for seg in segments:
        if isinstance(seg, Line):
            pts = [seg.start, seg.end]
        else:
            arc = seg if isinstance(seg, Arc) else Arc(seg.centre, seg.radius, 0.0, 360.0)
            pts = [arc.start, arc.end]
            a0, a1 = sorted((arc.start_deg, arc.start_deg + arc.sweep_deg))
            k = math.ceil(a0 / 90.0)
            while k * 90.0 <= a1 + 1e-12:
                pts.append(arc.point(k * 90.0))
                k += 1
        xs += [p[0] for p in pts]
        ys += [p[1] for p in pts]
    return (min(xs), min(ys), max(xs), max(ys))
