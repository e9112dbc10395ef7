"""A piece of stock drawn flat: its centreline, outline and where each mark falls.

Shared by the full-scale template and the build sheet's drawings. Lines are
("L", (x0, y0), (x1, y1)), arcs ("A", (cx, cy), r, start_deg, extent_deg), a
non-planar piece's projection ("P", points); every figure comes from the
piece's bend path (fabplan.geometry). Millimetres.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from ...geometry.planar import Arc, Segment, conductor_outline, planar_centreline
from ...lengths.records import PieceCore
from ...units import LengthUnit, format_length

__all__ = ["PieceDrawing", "piece_drawing", "mark_ids", "merge_labels", "prim_points", "bbox",
           "side_text"]

Prim = tuple[Any, ...]


def side_text(from_centre_mm: float, den: int, primary: LengthUnit = "in") -> str:
    """`A 7 23/32" (195.9 mm)`: which half of the stock and how far from the
    centre, in the shop's unit (`primary`) first."""
    if abs(from_centre_mm) < 1e-9:
        return "centre"
    side = "A" if from_centre_mm < 0 else "B"
    return f"{side} {format_length(abs(from_centre_mm), primary, den)}"


@dataclass(frozen=True)
class PieceDrawing:
    """A piece in its drawing plane (mm).

    `centreline` and `outline` hold ("L", (x0, y0), (x1, y1)) lines and
    ("A", (cx, cy), r, start_deg, extent_deg) arcs; for a non-planar piece
    `centreline` is a ("P", points) projection and `outline` is empty.
    `marks` holds (mark id, Mark, point, unit tangent) on the centreline.
    """

    planar: bool
    centreline: tuple[Prim, ...]
    outline: tuple[Prim, ...]
    marks: tuple[Prim, ...]
    bbox: tuple[float, float, float, float]


def _arc_points(cx: float, cy: float, r: float, start: float, extent: float,
                n: int = 24) -> list[tuple[float, float]]:
    return [(cx + r * math.cos(math.radians(start + extent * i / n)),
             cy + r * math.sin(math.radians(start + extent * i / n))) for i in range(n + 1)]


def prim_points(prim: Prim, n: int = 24) -> list[tuple[float, float]]:
    """Points along one 2D primitive (for bounding boxes and scaled drawings)."""
    if prim[0] == "L":
        return [prim[1], prim[2]]
    if prim[0] == "A":
        (cx, cy), r, start, extent = prim[1:5]
        return _arc_points(cx, cy, r, start, extent, n)
    return list(prim[1])


def bbox(points: Any) -> tuple[float, float, float, float]:
    xs = [p[0] for p in points]
    ys = [p[1] for p in points]
    return (min(xs), min(ys), max(xs), max(ys))


def mark_ids(e: PieceCore) -> list[str]:
    """"M1", "M2", ... for the element's marks, in order from end A."""
    return [f"M{i + 1}" for i in range(len(e.marks))]


def _prim(seg: Segment) -> Prim:
    if isinstance(seg, Arc):
        return ("A", seg.centre, seg.radius, seg.start_deg, seg.sweep_deg)
    return ("L", seg.start, seg.end)


def piece_drawing(e: PieceCore) -> PieceDrawing:
    """The flat drawing of one piece of stock: centreline, outline and mark points."""
    depth = e.stock.spec.profile.depth_mm
    k = e.stock.spec.k_factor
    marks = []
    for mid, m in zip(mark_ids(e), e.marks):
        p, t = e.path.point_at(m.from_end_mm - e.trim_mm, depth, k)
        n = math.hypot(float(t[0]), float(t[1])) or 1.0
        marks.append((mid, m, (float(p[0]), float(p[1])), (float(t[0]) / n, float(t[1]) / n)))
    if not e.planar:
        sampled, _ = e.path.sample(max(e.path.centreline_length() / 600, 0.5))
        poly = tuple((float(p[0]), float(p[1])) for p in sampled)
        return PieceDrawing(False, (("P", poly),), (), tuple(marks), bbox(poly))
    segs = planar_centreline(e.path)
    centre = [_prim(s) for s in segs]
    outline = [_prim(s) for s in conductor_outline(segs, e.conductor_diameter_mm)]
    pts = [p for prim in outline or centre for p in prim_points(prim)]
    return PieceDrawing(True, tuple(centre), tuple(outline), tuple(marks), bbox(pts))


def merge_labels(labels: list[Prim], min_dist: float) -> list[Prim]:
    """Join labels (text, x, y, *extra) closer than `min_dist` to an earlier one
    into one "M3, M4" label at the earlier place, keeping its extras (same units
    as the positions)."""
    out: list[list[Any]] = []
    for text, x, y, *extra in labels:
        for g in out:
            if math.hypot(g[1] - x, g[2] - y) < min_dist:
                g[0] += f", {text}"
                break
        else:
            out.append([text, x, y, *extra])
    return [tuple(g) for g in out]
