"""Bend paths: one piece of stock as straight runs and bends.

A `BendPath` runs from the stock's end A to its end B. Each piece is a
`Straight` (a length) or a `Bend` (centreline radius, angle, rotation of the
bend plane about the stock's axis before the bend, and an optional pitch so
that a helix is one bend of several turns). The path starts at `origin`
heading along `heading`, with the first bend turning towards `normal`.

The path computes its centreline, its developed length on the neutral axis
(K-factor), where each bend starts and ends along the stock, and its 3D
geometry as lines and arcs for drawings and the electrical model. A feed gap,
when the path has one, lies between end B and end A: the developed length
excludes it.

Units: millimetres and degrees at the interface; radians inside.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import cast

import numpy as np

from ..numeric import pairs_within

__all__ = ["Straight", "Bend", "Piece", "BendPath", "Line3", "Arc3", "Primitive", "BendSpan",
           "neutral_radius", "TOUCH_CHUNKS"]

TOUCH_CHUNKS = 40_000  # straight chunks `BendPath.touching` cuts a path into, at most about

Vec = tuple[float, float, float]


@dataclass(frozen=True)
class Straight:
    """A straight run of `length_mm` along the centreline."""

    length_mm: float


@dataclass(frozen=True)
class Bend:
    """A bend of `angle_deg` about a centreline radius `radius_mm`.

    `rotation_deg` turns the bend plane about the stock axis, relative to the
    previous bend's plane, before bending (0: same plane, same side; 180: same
    plane, other side). `pitch_mm` is the axial advance per full turn (a helix).
    """

    radius_mm: float
    angle_deg: float
    rotation_deg: float = 0.0
    pitch_mm: float = 0.0


Piece = Straight | Bend


def neutral_radius(centreline_radius_mm: float, depth_mm: float, k_factor: float) -> float:
    """Radius of the neutral axis: inside radius + K x depth (mm)."""
    return centreline_radius_mm - depth_mm / 2 + k_factor * depth_mm


@dataclass(frozen=True)
class Line3:
    """A straight piece of centreline from `start` to `end` (mm)."""

    start: Vec
    end: Vec
    s_start: float  # centreline distance from end A at the start (mm)

    @property
    def length(self) -> float:
        return float(np.linalg.norm(np.subtract(self.end, self.start)))

    def points(self, n: int) -> np.ndarray:
        u = np.linspace(0.0, 1.0, n + 1)[:, None]
        return np.asarray(self.start) * (1 - u) + np.asarray(self.end) * u


@dataclass(frozen=True)
class Arc3:
    """A circular arc (or helical turn when `pitch` > 0) of the centreline.

    Points: P(phi) = centre + radius*(cos(phi)*u + sin(phi)*v) + pitch*phi/(2 pi)*axis,
    phi from 0 to `angle` (radians). `u` points from the centre to the start.
    """

    centre: Vec
    radius: float
    u: Vec
    v: Vec
    axis: Vec
    angle: float
    pitch: float
    s_start: float

    @property
    def length(self) -> float:
        return self.angle * math.hypot(self.radius, self.pitch / (2 * math.pi))

    def point(self, phi: float) -> np.ndarray:
        return (np.asarray(self.centre) + self.radius * (math.cos(phi) * np.asarray(self.u)
                + math.sin(phi) * np.asarray(self.v))
                + self.pitch * phi / (2 * math.pi) * np.asarray(self.axis))

    def points(self, n: int) -> np.ndarray:
        phi = np.linspace(0.0, self.angle, n + 1)[:, None]
        radial = np.cos(phi) * np.asarray(self.u) + np.sin(phi) * np.asarray(self.v)
        pts: np.ndarray = (np.asarray(self.centre) + self.radius * radial
                           + self.pitch * phi / (2 * math.pi) * np.asarray(self.axis))
        return pts

    def tangent(self, phi: float) -> np.ndarray:
        """The unit tangent at angle `phi` (rad) along the arc."""
        u, v = np.asarray(self.u), np.asarray(self.v)
        d = (self.radius * (-math.sin(phi) * u + math.cos(phi) * v)
             + self.pitch / (2 * math.pi) * np.asarray(self.axis))
        return d / float(np.linalg.norm(d))

    @property
    def start(self) -> np.ndarray:
        return self.point(0.0)

    @property
    def end(self) -> np.ndarray:
        return self.point(self.angle)


Primitive = Line3 | Arc3


@dataclass(frozen=True)
class BendSpan:
    """Where one bend lies along the stock (neutral-axis positions, mm from end A)."""

    index: int  # 1-based, in order from end A
    bend: Bend
    straight_before_mm: float  # straight run between the previous bend (or end A) and this one
    start_mm: float
    end_mm: float
    neutral_radius_mm: float
    start_point: Vec  # tangent point where the bend starts (centreline, mm)
    end_point: Vec


def _rotate(vec: np.ndarray, axis: np.ndarray, angle: float) -> np.ndarray:
    """Rodrigues rotation of `vec` about unit `axis` by `angle` radians."""
    c, s = math.cos(angle), math.sin(angle)
    return vec * c + np.cross(axis, vec) * s + axis * float(np.dot(axis, vec)) * (1 - c)


@dataclass(frozen=True)
class BendPath:
    """One piece of stock from end A to end B.

    `gap_mm` is the width of the feed gap between end B and end A when the
    ends form the feed (a loop or folded dipole); None for an open path.
    """

    pieces: tuple[Piece, ...]
    origin: Vec = (0.0, 0.0, 0.0)
    heading: Vec = (1.0, 0.0, 0.0)
    normal: Vec = (0.0, 1.0, 0.0)
    gap_mm: float | None = None
    _cache: dict[str, object] = field(default_factory=dict, compare=False, repr=False,
                                      hash=False)

    # -- lengths ------------------------------------------------------------
    @property
    def bends(self) -> tuple[Bend, ...]:
        return tuple(p for p in self.pieces if isinstance(p, Bend))

    @staticmethod
    def piece_length(piece: Piece, radius_of_bend: float | None = None) -> float:
        if isinstance(piece, Straight):
            return piece.length_mm
        r = piece.radius_mm if radius_of_bend is None else radius_of_bend
        return math.radians(piece.angle_deg) * math.hypot(r, piece.pitch_mm / (2 * math.pi))

    def centreline_length(self) -> float:
        """Length of the centreline (mm), without the gap."""
        return sum(self.piece_length(p) for p in self.pieces)

    def developed_length(self, depth_mm: float, k_factor: float = 0.5) -> float:
        """Length of straight stock needed: the neutral axis length (mm)."""
        total = 0.0
        for p in self.pieces:
            if isinstance(p, Bend):
                total += self.piece_length(p, neutral_radius(p.radius_mm, depth_mm, k_factor))
            else:
                total += p.length_mm
        return total

    def spans(self, depth_mm: float, k_factor: float = 0.5) -> list[BendSpan]:
        """Each bend's start and end along the stock (neutral axis, from end A)."""
        prims = self.primitives()
        out: list[BendSpan] = []
        s = 0.0
        straight = 0.0
        for piece, prim in zip(self.pieces, prims):
            if isinstance(piece, Straight):
                s += piece.length_mm
                straight += piece.length_mm
                continue
            rn = neutral_radius(piece.radius_mm, depth_mm, k_factor)
            length = self.piece_length(piece, rn)
            out.append(BendSpan(len(out) + 1, piece, straight, s, s + length, rn,
                                _vec(prim.start), _vec(prim.end)))
            s += length
            straight = 0.0
        return out

    def tail_straight(self) -> float:
        """Straight run after the last bend to end B (mm)."""
        total = 0.0
        for p in reversed(self.pieces):
            if isinstance(p, Bend):
                break
            total += p.length_mm
        return total

    # -- geometry -----------------------------------------------------------
    def primitives(self) -> list[Primitive]:
        """The centreline as 3D lines and arcs, from end A."""
        if "prims" in self._cache:
            return cast(list[Primitive], self._cache["prims"])
        pos = np.asarray(self.origin, dtype=float)
        t = _unit(np.asarray(self.heading, dtype=float))
        n = np.asarray(self.normal, dtype=float)
        n = _unit(n - t * float(np.dot(n, t)))
        prims: list[Primitive] = []
        s = 0.0
        for piece in self.pieces:
            if isinstance(piece, Straight):
                end = pos + t * piece.length_mm
                prims.append(Line3(_vec(pos), _vec(end), s))
                pos = end
                s += piece.length_mm
                continue
            if piece.rotation_deg:
                n = _rotate(n, t, math.radians(piece.rotation_deg))
            b = np.cross(t, n)
            r = piece.radius_mm
            theta = math.radians(piece.angle_deg)
            alpha = math.atan2(piece.pitch_mm, 2 * math.pi * r)
            axis = math.sin(alpha) * t + math.cos(alpha) * b
            c0 = math.cos(alpha) * t - math.sin(alpha) * b
            centre = pos + r * n
            # P(phi) = centre + r(-cos phi n + sin phi c0) + pitch phi/2pi axis
            arc = Arc3(_vec(centre), r, _vec(-n), _vec(c0), _vec(axis), theta, piece.pitch_mm, s)
            prims.append(arc)
            end = arc.point(theta)
            tangent = r * (math.sin(theta) * n + math.cos(theta) * c0) \
                + piece.pitch_mm / (2 * math.pi) * axis
            t_new = _unit(tangent)
            n_new = math.cos(theta) * n - math.sin(theta) * c0
            n = _unit(n_new - t_new * float(np.dot(n_new, t_new)))
            t = t_new
            pos = end
            s += arc.length
        self._cache["prims"] = prims
        self._cache["frame"] = (pos, t, n)
        return prims

    def end_frame(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """The centreline point, unit tangent and unit normal at end B: the frame the
        next piece would start from (a bend turns towards the normal, after its
        `rotation_deg` about the tangent)."""
        self.primitives()
        pos, t, n = cast(tuple[np.ndarray, np.ndarray, np.ndarray], self._cache["frame"])
        return pos.copy(), t.copy(), n.copy()

    def end_point(self) -> np.ndarray:
        prims = self.primitives()
        return np.asarray(prims[-1].end, dtype=float) if prims else np.asarray(self.origin)

    def end_tangent(self) -> np.ndarray:
        prims = self.primitives()
        last = prims[-1]
        if isinstance(last, Line3):
            return _unit(np.subtract(last.end, last.start))
        return last.tangent(last.angle)

    def point_at(self, s_mm: float, depth_mm: float = 0.0,
                 k_factor: float = 0.5) -> tuple[np.ndarray, np.ndarray]:
        """The centreline point and unit tangent (3D) at `s_mm` along the stock's
        neutral axis from end A (for a section `depth_mm` deep bent with
        `k_factor`; the defaults measure along the centreline). A bend's share
        of the stock maps onto its arc in proportion to the angle; `s_mm`
        outside the stock is held at its ends."""
        s = 0.0
        prims = self.primitives()
        for piece, prim in zip(self.pieces, prims):
            last = prim is prims[-1]
            if isinstance(piece, Straight):
                length = piece.length_mm
                if s_mm <= s + length + 1e-9 or last:
                    t = np.subtract(prim.end, prim.start) / max(prim.length, 1e-12)
                    u = min(max(s_mm - s, 0.0), length)
                    return np.asarray(prim.start) + t * u, t
            else:
                arc = cast(Arc3, prim)  # a bend's primitive is its arc
                rn = neutral_radius(piece.radius_mm, depth_mm, k_factor)
                length = self.piece_length(piece, rn)
                if s_mm <= s + length + 1e-9 or last:
                    phi = arc.angle * (min(max((s_mm - s) / length, 0.0), 1.0)
                                       if length > 0 else 0.0)
                    return arc.point(phi), arc.tangent(phi)
            s += length
        return np.asarray(self.origin, dtype=float), _unit(np.asarray(self.heading, dtype=float))

    def sample(self, step_mm: float) -> tuple[np.ndarray, np.ndarray]:
        """Points on the centreline no further apart than `step_mm`, and their
        centreline distance from end A. Returns (points (N, 3), s (N,))."""
        pts: list[np.ndarray] = []
        ss: list[np.ndarray] = []
        for prim in self.primitives():
            n = max(1, math.ceil(prim.length / step_mm))
            p = prim.points(n)
            s = prim.s_start + np.linspace(0.0, prim.length, n + 1)
            if pts:
                p, s = p[1:], s[1:]
            pts.append(p)
            ss.append(s)
        if not pts:
            return np.zeros((0, 3)), np.zeros(0)
        return np.vstack(pts), np.concatenate(ss)

    def is_planar(self, tol_mm: float = 1e-6) -> bool:
        """True when the whole centreline lies in the plane z = 0 (within `tol_mm`):
        checked on each line's ends and each arc's centre, plane and rise, so the
        answer costs the same for a path of any length."""
        for prim in self.primitives():
            if isinstance(prim, Line3):
                reach = max(abs(prim.start[2]), abs(prim.end[2]))
            else:
                reach = (abs(prim.centre[2]) + prim.radius * (abs(prim.u[2]) + abs(prim.v[2]))
                         + abs(prim.pitch * prim.angle / (2 * math.pi) * prim.axis[2]))
            if reach > tol_mm:
                return False
        return True

    def gap_ends(self) -> tuple[np.ndarray, np.ndarray]:
        """The centre points of end B and end A (the two faces of the feed gap)."""
        return self.end_point(), np.asarray(self.origin, dtype=float)

    def closure_error(self) -> float:
        """For a gapped path: how far the ends' distance misses the gap width (mm)."""
        if self.gap_mm is None:
            return 0.0
        apart = float(np.linalg.norm(self.end_point() - np.asarray(self.origin, dtype=float)))
        return abs(apart - self.gap_mm)

    def touching(self, diameter_mm: float) -> list[tuple[float, float, float]]:
        """Places where the conductor surface touches or crosses itself.

        Returns (s1, s2, centre distance) for each touching pair (mm), merging
        neighbours. The intended feed gap is not a touch.

        The centreline is cut into straight chunks (each arc into chords whose
        sagitta is at most 1/20 of the diameter), at most TOUCH_CHUNKS of them
        however long the path; the exact least distance between every pair of
        chunks that may come within one diameter (their midpoints found close by
        fabplan.numeric.pairs_within) decides. The work grows with the number of chunks, not
        with the length over the diameter.
        """
        d = diameter_mm
        starts, ends, s0, s1 = self._chunks(d)
        if len(starts) < 2:
            return []
        mids = (starts + ends) / 2
        reach = float(np.max(np.linalg.norm(ends - starts, axis=1))) + d
        pairs = pairs_within(mids, reach)
        if len(pairs) == 0:
            return []
        i, j = pairs[:, 0], pairs[:, 1]
        ti, tj, dist = _segment_distances(starts[i], ends[i], starts[j], ends[j])
        a = s0[i] + ti * (s1[i] - s0[i])
        b = s0[j] + tj * (s1[j] - s0[j])
        centreline = self.centreline_length()
        ds = np.abs(a - b)
        if self.gap_mm is not None:
            ds = np.minimum(ds, centreline + self.gap_mm - ds)
        # along one smooth bend of radius >= d/2, points more than (pi/2) d apart
        # along the stock are at least d apart: closer than that is a touch
        bad = (dist < d * (1 - 1e-6)) & (ds > (math.pi / 2) * d + d / 2)
        if self.gap_mm is not None:
            # pairs across the gap near the ends are the gap itself
            lo, hi = np.minimum(a, b), np.maximum(a, b)
            bad &= ~((lo < 2 * d) & (hi > centreline - 2 * d))
        found = sorted(zip(np.minimum(a, b)[bad].tolist(), np.maximum(a, b)[bad].tolist(),
                           dist[bad].tolist()))
        out: list[tuple[float, float, float]] = []
        for lo_s, hi_s, gap in found:
            if out and abs(out[-1][0] - lo_s) < 2 * d:
                if gap < out[-1][2]:
                    out[-1] = (lo_s, hi_s, gap)
                continue
            out.append((lo_s, hi_s, gap))
        return out

    def _chunks(self, diameter_mm: float) -> tuple[np.ndarray, np.ndarray, np.ndarray,
                                                   np.ndarray]:
        """The centreline as straight chunks: (starts (N, 3), ends (N, 3), s at
        start (N,), s at end (N,)), mm. Arcs become chords of sagitta at most
        diameter/20; no chunk is longer than max(diameter, length/TOUCH_CHUNKS),
        and the chords are coarsened (never below 16 per turn) so that there are
        about TOUCH_CHUNKS at most."""
        d = diameter_mm
        total = self.centreline_length()
        longest = max(d, total / TOUCH_CHUNKS)
        prims = self.primitives()
        # chords per radian of each arc: sagitta r(1 - cos(dphi/2)) <= d/20
        per_rad = []
        for prim in prims:
            if isinstance(prim, Arc3) and prim.radius > 0:
                half = math.acos(max(-1.0, 1 - min(2.0, d / 20 / prim.radius)))
                per_rad.append(1 / (2 * half))
            else:
                per_rad.append(0.0)
        chords = sum(p.angle * k for p, k in zip(prims, per_rad) if isinstance(p, Arc3))
        coarsen = max(1.0, chords / TOUCH_CHUNKS)
        starts, ends, s_a, s_b = [], [], [], []
        for prim, k in zip(prims, per_rad):
            if prim.length <= 0:
                continue
            if isinstance(prim, Line3):
                n = max(1, math.ceil(prim.length / longest))
            else:
                n = max(1, math.ceil(prim.angle * max(k / coarsen, 16 / (2 * math.pi))),
                        math.ceil(prim.length / longest))
            pts = prim.points(n)
            s = prim.s_start + np.linspace(0.0, prim.length, n + 1)
            starts.append(pts[:-1])
            ends.append(pts[1:])
            s_a.append(s[:-1])
            s_b.append(s[1:])
        if not starts:
            empty = np.zeros((0, 3))
            return empty, empty, np.zeros(0), np.zeros(0)
        return (np.vstack(starts), np.vstack(ends), np.concatenate(s_a), np.concatenate(s_b))

    def scaled(self, factor: float) -> BendPath:
        """Every length times `factor` (angles kept)."""
        pieces = tuple(Straight(p.length_mm * factor) if isinstance(p, Straight)
                       else Bend(p.radius_mm * factor, p.angle_deg, p.rotation_deg,
                                 p.pitch_mm * factor) for p in self.pieces)
        o = self.origin
        return BendPath(pieces, (o[0] * factor, o[1] * factor, o[2] * factor), self.heading,
                        self.normal, None if self.gap_mm is None else self.gap_mm * factor)


def _segment_distances(p0: np.ndarray, p1: np.ndarray, q0: np.ndarray,
                       q1: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The closest points of segment pairs p0-p1 and q0-q1 (arrays (N, 3), mm):
    their parameters t_p, t_q in [0, 1] and the distance between them.
    source: Ericson, Real-Time Collision Detection (2005), sec. 5.1.9 (closest
    points of two segments), vectorised."""
    d1, d2, r = p1 - p0, q1 - q0, p0 - q0
    a = np.einsum("ij,ij->i", d1, d1)
    e = np.einsum("ij,ij->i", d2, d2)
    f = np.einsum("ij,ij->i", d2, r)
    c = np.einsum("ij,ij->i", d1, r)
    b = np.einsum("ij,ij->i", d1, d2)
    tiny = 1e-12 * np.maximum(np.maximum(a, e), 1e-300)
    denom = a * e - b * b
    with np.errstate(divide="ignore", invalid="ignore"):
        s = np.where(denom > tiny * np.maximum(a, e), np.clip((b * f - c * e) / denom, 0, 1),
                     0.0)
        s = np.where(a > tiny, s, 0.0)
        t = np.where(e > tiny, (b * s + f) / e, 0.0)
        low, high = t < 0, t > 1
        t = np.clip(t, 0.0, 1.0)
        s = np.where(low & (a > tiny), np.clip(-c / a, 0, 1), s)
        s = np.where(high & (a > tiny), np.clip((b - c) / a, 0, 1), s)
        s = np.where(a > tiny, s, 0.0)
        t = np.where((e <= tiny) & (a > tiny), 0.0, t)
        s = np.where((e <= tiny) & (a > tiny), np.clip(-c / a, 0, 1), s)
    gap = (p0 + s[:, None] * d1) - (q0 + t[:, None] * d2)
    return s, t, np.linalg.norm(gap, axis=1)


def _unit(v: np.ndarray) -> np.ndarray:
    return v / float(np.linalg.norm(v))


def _vec(v: np.ndarray | tuple[float, ...]) -> Vec:
    a = [float(x) for x in v]
    return (a[0], a[1], a[2])
