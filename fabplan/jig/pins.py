"""Hold-down pins beside a flat piece's straight runs, placed in linear time.

Stations at the pin pitch along each straight run (centred on it), a pin on
both sides, tangent to the conductor. A candidate is dropped where another
part of the conductor passes closer than its own run (inside a bend, across a
narrow spacing), where it would touch a former disc, where it would hide an
engraved mark, or where it would sit within 2 mm of a pin already placed.

Distances to the centreline and to the marks are exact point-to-line and
point-to-arc distances (numpy, every candidate against every segment: the
segments are few); the disc test uses the same shapely polygons as the plate;
neighbouring pins are found through a grid of cells one spacing wide, so each
candidate is compared with the pins in its own and the eight cells around it.
Lengths in mm.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any

from .shapes import Arc, Line, P, Segment

__all__ = ["pin_stations", "place_pins", "distance_to_segments"]


def pin_stations(segs: Sequence[Segment], pin_diameter_mm: float,
                 pin_pitch_mm: float) -> list[tuple[Line, int]]:
    """Each straight run long enough for a pin, with its number of stations."""
    clear = pin_diameter_mm / 2 + 2.0
    out = []
    for seg in segs:
        if not isinstance(seg, Line) or seg.length < pin_diameter_mm:
            continue
        usable = seg.length - 2 * clear
        out.append((seg, 1 if usable <= 0 else int(usable // pin_pitch_mm) + 1))
    return out


def distance_to_segments(xy: Any, segs: Sequence[Segment]) -> Any:
    """The least distance (mm) from each point of `xy` (N x 2) to the lines and
    arcs of `segs`; +inf when there are none."""
    import numpy as np

    pts = np.asarray(xy, dtype=float).reshape(-1, 2)
    best = np.full(len(pts), np.inf)
    for seg in segs:
        if isinstance(seg, Line):
            a = np.asarray(seg.start)
            d = np.asarray(seg.end) - a
            n2 = float(d @ d)
            rel = pts - a
            t = np.clip(rel @ d / n2, 0.0, 1.0) if n2 > 0 else np.zeros(len(pts))
            dist = np.hypot(rel[:, 0] - t * d[0], rel[:, 1] - t * d[1])
        else:
            dist = _arc_distance(pts, seg)
        best = np.minimum(best, dist)
    return best


def _arc_distance(pts: Any, arc: Arc) -> Any:
    import numpy as np

    cx, cy = arc.centre
    rel_x, rel_y = pts[:, 0] - cx, pts[:, 1] - cy
    ang = np.degrees(np.arctan2(rel_y, rel_x))
    sweep = abs(arc.sweep_deg)
    # how far round the arc, in its own direction, the point's angle lies
    turned = ((ang - arc.start_deg) * (1.0 if arc.sweep_deg >= 0 else -1.0)) % 360.0
    radial = np.abs(np.hypot(rel_x, rel_y) - arc.radius)
    s, e = arc.start, arc.end
    ends = np.minimum(np.hypot(pts[:, 0] - s[0], pts[:, 1] - s[1]),
                      np.hypot(pts[:, 0] - e[0], pts[:, 1] - e[1]))
    return np.where((turned <= sweep) | (sweep >= 360.0), radial, ends)


def place_pins(segs: Sequence[Segment], conductor_mm: float, pin_diameter_mm: float,
               pin_pitch_mm: float, discs: Sequence[Any], ticks: Sequence[Line]) -> list[P]:
    """Pin centres (mm) both sides of each straight run, in station order.

    `discs` are shapely polygons (the former discs); `ticks` are the engraved
    marks across the conductor."""
    import numpy as np
    import shapely

    pin_r = pin_diameter_mm / 2
    off = conductor_mm / 2 + pin_r
    cand: list[P] = []
    for seg, count in pin_stations(segs, pin_diameter_mm, pin_pitch_mm):
        t = seg.tangent_in()
        nx, ny = -t[1], t[0]
        for j in range(count):
            along = seg.length / 2 + (j - (count - 1) / 2) * pin_pitch_mm
            base = (seg.start[0] + along * t[0], seg.start[1] + along * t[1])
            for side in (1, -1):
                cand.append((base[0] + side * off * nx, base[1] + side * off * ny))
    if not cand:
        return []
    xy = np.asarray(cand)
    ok = distance_to_segments(xy, segs) >= off - 0.01  # no other run passes closer
    if discs:
        # the same polygons as shapely's Point.buffer (16 segments a quarter)
        rings = shapely.buffer(shapely.points(xy), pin_r + 1.0, quad_segs=16)
        for disc in discs:
            ok &= ~shapely.intersects(rings, disc)
    if ticks:
        ok &= distance_to_segments(xy, ticks) >= pin_r + 1.5  # a pin would hide a mark
    spacing = 2 * pin_r + 2.0
    cells: dict[tuple[int, int], list[P]] = {}
    pins: list[P] = []
    for (x, y), good in zip(cand, ok.tolist()):
        if not good:
            continue
        i, j = math.floor(x / spacing), math.floor(y / spacing)
        near = (q for di in (-1, 0, 1) for dj in (-1, 0, 1)
                for q in cells.get((i + di, j + dj), ()))
        if any(math.hypot(x - q[0], y - q[1]) < spacing for q in near):
            continue
        pins.append((x, y))
        cells.setdefault((i, j), []).append((x, y))
    return pins
