"""Custom: a bend table given directly, in trade order from end A.

Each row of `bends` is the straight before the bend, the bend angle, its
centreline radius and the rotation of its plane relative to the previous bend;
`tail` is the straight after the last bend. With `feed_gap`, the stock's ends
must meet across a gap of that width (a loop); fabplan checks that they do.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from ...errors import DesignError, Finding
from ...section import Section
from ..path import Bend, BendPath, Line3, Piece, Straight
from .base import Dimension, ShapeSpec, TunedValue

NAME = "custom"
SUMMARY = "a bend table given directly (straight, angle, radius, rotation per bend)"


@dataclass(frozen=True)
class Row:
    straight_mm: float
    angle_deg: float
    radius_mm: float
    rotation_deg: float = 0.0


@dataclass(frozen=True)
class Params:
    rows: tuple[Row, ...]
    tail_mm: float
    feed_gap_mm: float | None = None


MAX_ROWS = 200  # bends in one bend table (each gets a row, marks and a jig former)


def read(sec: Section) -> Params:
    rows = []
    for row in sec.tables("bends", required=True, max_count=MAX_ROWS):
        angle = row.angle("angle")
        if not 0 < angle <= 360:
            raise DesignError("a bend angle must be more than 0 and at most 360 degrees",
                              field=row.field("angle"), value=angle)
        rotation = row.angle("rotation", 0.0)
        if not -360 <= rotation <= 360:
            raise DesignError("a rotation lies between -360 and 360 degrees",
                              field=row.field("rotation"), value=rotation)
        rows.append(Row(row.length("straight", 0.0, allow_zero=True), angle,
                        row.length("radius"), rotation))
        row.finish()
    if not rows:
        raise DesignError("give at least one bend", field=sec.field("bends"))
    tail = sec.length("tail", 0.0, allow_zero=True)
    gap = sec.length("feed_gap", None)
    return Params(tuple(rows), tail, gap)


def build(p: Params, d: float) -> BendPath:
    pieces: list[Piece] = []
    for row in p.rows:
        if row.straight_mm > 0:
            pieces.append(Straight(row.straight_mm))
        pieces.append(Bend(row.radius_mm, row.angle_deg, row.rotation_deg))
    if p.tail_mm > 0:
        pieces.append(Straight(p.tail_mm))
    return BendPath(tuple(pieces), gap_mm=p.feed_gap_mm)


def problems(p: Params, d: float) -> list[Finding]:
    if p.feed_gap_mm is None:
        return []
    path = build(p, d)
    miss = float(np.linalg.norm(path.end_point() - np.asarray(path.origin)))
    if abs(miss - p.feed_gap_mm) > max(0.5, 0.1 * d):
        return [Finding("ends-do-not-meet", "error",
                        f"the bend table's ends are {miss:.1f} mm apart, not the "
                        f"{p.feed_gap_mm:.1f} mm feed gap: check the straights and angles")]
    return []


def governing(p: Params) -> tuple[str, float]:
    return "tail", p.tail_mm


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, tail_mm=value)


KEYS = ("bends", "tail", "feed_gap")

def tuned_keys(p: Params) -> dict[str, TunedValue]:
    return {"tail": ("length", p.tail_mm)}


def dimensions(p: Params, d: float) -> tuple[Dimension, ...]:
    """Each straight the table gives (and the tail), beside its run on the side
    away from the middle of the element; none for an element that is not flat."""
    path = build(p, d)
    if not path.is_planar():
        return ()
    keys = [f"straight {i}" for i, row in enumerate(p.rows, 1) if row.straight_mm > 0]
    if p.tail_mm > 0:
        keys.append("tail")
    lines = [x for x in path.primitives() if isinstance(x, Line3)]
    pts, _ = path.sample(max(path.centreline_length() / 200, 0.1))
    mx, my = float(np.mean(pts[:, 0])), float(np.mean(pts[:, 1]))
    out = []
    for key, line in zip(keys, lines):
        (ax, ay, _), (bx, by, _) = line.start, line.end
        length = line.length
        nx, ny = -(by - ay) / length, (bx - ax) / length
        if ((ax + bx) / 2 - mx) * nx + ((ay + by) / 2 - my) * ny < 0:
            nx, ny = -nx, -ny
        out.append(Dimension(key, length, line.start, line.end, (nx, ny, 0.0)))
    return tuple(out)


SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, dimensions=dimensions)
