"""Jig figures: former discs, marks on the jig, and the splay of parallel legs.

Coordinates are the element's drawing plane (the BendPath's x, y in mm).
Each bend is made round a disc whose radius is the inside of the bend while
held (springback-compensated). The disc is placed so that the stock on the
side of the bend nearer the stock's centre lies where the drawing has it:
its centre is on the normal at that tangent point, one held centreline radius
from the centreline (a bend that contains the stock's centre is anchored at
its middle). The stock beyond wraps further (the overbend) and springs back
to the drawn shape.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from ..geometry.path import Arc3, Bend, BendPath, Piece, Straight, neutral_radius
from ..lengths.records import BendRow
from .records import Former, JigMark

__all__ = ["formers", "jig_marks", "spacing", "end_shift"]


def _xy(v: np.ndarray) -> tuple[float, float]:
    return (float(v[0]), float(v[1]))


def _arcs(path: BendPath) -> list[Arc3]:
    return [p for p in path.primitives() if isinstance(p, Arc3)]


def formers(path: BendPath, rows: Sequence[BendRow], held_radii: Sequence[float],
            wraps: Sequence[float], depth_mm: float) -> list[Former]:
    """One disc per flat bend (pitch 0), in order from end A.

    `rows` are the Plan's bend rows (positions from the stock's centre),
    `held_radii` the centreline radii held on the discs (mm), `wraps` the held
    angles (deg)."""
    out: list[Former] = []
    for row, arc, r_held, wrap in zip(rows, _arcs(path), held_radii, wraps):
        if row.pitch_mm:
            continue
        centre = np.asarray(arc.centre)
        if row.start_from_centre_mm <= 0 <= row.end_from_centre_mm:
            anchor = arc.point(arc.angle / 2)
        elif row.end_from_centre_mm < 0:
            anchor = np.asarray(arc.end)
        else:
            anchor = np.asarray(arc.start)
        normal = (centre - anchor) / arc.radius
        disc = anchor + normal * r_held
        out.append(Former(f"F{len(out) + 1}", (row.index,), _xy(disc),
                          r_held - depth_mm / 2, wrap))
    return out


def spacing(discs: Sequence[Former]) -> list[float]:
    """Centre-to-centre distance of consecutive discs (mm)."""
    return [math.dist(a.centre_mm, b.centre_mm) for a, b in zip(discs, discs[1:])]


def jig_marks(path: BendPath, rows: Sequence[BendRow], depth_mm: float, k_factor: float,
              centre_mm: float) -> list[JigMark]:
    """Stock centre, feed-gap ends and bend start/end marks (drawing plane).

    `centre_mm`: the stock's centre along the neutral axis from end A (no trim)."""
    marks = []
    p, t = path.point_at(centre_mm, depth_mm, k_factor)
    marks.append(JigMark("centre of stock", "centre", _xy(p), _xy(t)))
    if path.gap_mm is not None:
        marks.append(JigMark("feed gap, end A", "gap", _xy(np.asarray(path.origin)),
                             _xy(np.asarray(path.heading) / np.linalg.norm(path.heading))))
        marks.append(JigMark("feed gap, end B", "gap", _xy(path.end_point()),
                             _xy(path.end_tangent())))
    for row, arc in zip(rows, _arcs(path)):
        marks.append(JigMark(f"bend {row.index} start", "bend-start",
                             _xy(np.asarray(row.start_point)), _xy(arc.tangent(0.0))))
        marks.append(JigMark(f"bend {row.index} end", "bend-end",
                             _xy(np.asarray(row.end_point)), _xy(arc.tangent(arc.angle))))
    return marks


def end_shift(path: BendPath, released: Sequence[tuple[float, float] | None],
              depth_mm: float, k_factor: float, centre_mm: float) -> float:
    """How far the stock's ends move (mm) when each bend comes out at
    `released[i]` = (centreline radius mm, angle deg) instead of the drawing's
    (None: springs straight), with the stock's centre held in place."""
    pieces: list[Piece] = []
    i = 0
    for piece in path.pieces:
        if isinstance(piece, Bend):
            rel = released[i]
            i += 1
            if rel is None:
                rn = neutral_radius(piece.radius_mm, depth_mm, k_factor)
                pieces.append(Straight(math.radians(piece.angle_deg) * rn))
            else:
                pieces.append(Bend(rel[0], rel[1], piece.rotation_deg, piece.pitch_mm))
        else:
            pieces.append(piece)
    other = BendPath(tuple(pieces), path.origin, path.heading, path.normal, path.gap_mm)
    p0, t0 = path.point_at(centre_mm, depth_mm, k_factor)
    p1, t1 = other.point_at(centre_mm, depth_mm, k_factor)
    # planar rigid motion taking the other path's centre point and tangent onto the drawing's
    rot = math.atan2(t0[1], t0[0]) - math.atan2(t1[1], t1[0])
    c, s = math.cos(rot), math.sin(rot)
    m = np.array([[c, -s], [s, c]])

    def moved(q: np.ndarray) -> np.ndarray:
        out: np.ndarray = m @ (np.asarray(q)[:2] - p1[:2]) + p0[:2]
        return out

    ends0 = [np.asarray(path.origin)[:2], path.end_point()[:2]]
    ends1 = [moved(np.asarray(other.origin)), moved(other.end_point())]
    return max(float(np.linalg.norm(a - b)) for a, b in zip(ends0, ends1))
