"""Where a hole falls on a strip of paper wrapped round its support.

The strip is laid along the support with its datum edge at the datum end, its
middle line (the alignment line) on the support's line at 0 degrees, and wrapped
round. A point at angle theta round the support (counter-clockwise seen from the
datum end, looking along the support) lies `around_mm` from the alignment line,
measured round the outside surface: positive to the left of the alignment line
as the strip is read with its datum edge on the left. A round support of
diameter D: pi D theta / 360. A square one of side a (its alignment line down the
middle of one face, 0 degrees at that face's centre): the distance along the
faces to where the ray from the axis at theta meets the outside. Results lie in
(-C/2, C/2], C the circumference. mm and degrees.
"""

from __future__ import annotations

import math

from .records import DrillPattern

__all__ = ["around_mm", "exit_angle_deg", "face_edges_mm"]


def _wrap(s: float, c: float) -> float:
    s = math.fmod(s, c)
    if s > c / 2 + 1e-9:
        s -= c
    elif s <= -c / 2 + 1e-9:
        s += c
    return s


def around_mm(section: str, outside_mm: float, angle_deg: float) -> float:
    """The distance round the surface from the alignment line to angle `angle_deg`."""
    if section == "round":
        c = math.pi * outside_mm
        return _wrap(c * angle_deg / 360.0, c)
    h = outside_mm / 2
    t = math.radians(angle_deg)
    y, z = math.sin(t), math.cos(t)
    k = h / max(abs(y), abs(z))
    y, z = k * y, k * z
    if abs(z - h) < 1e-9 and y >= -1e-12:
        s = y
    elif abs(y - h) < 1e-9:
        s = h + (h - z)
    elif abs(z + h) < 1e-9:
        s = 3 * h + (h - y)
    elif abs(y + h) < 1e-9:
        s = 5 * h + (z + h)
    else:
        s = 7 * h + (y + h)
    return _wrap(s, 8 * h)


def exit_angle_deg(angle_deg: float) -> float:
    """Where a through hole comes out: half a turn round (deg, in [0, 360))."""
    return (angle_deg + 180.0) % 360.0


def face_edges_mm(pattern: DrillPattern) -> tuple[float, ...]:
    """The corners of a square support as distances round from the alignment line
    (mm); none for a round one."""
    if pattern.section == "round":
        return ()
    h = pattern.outside_mm / 2
    return (-3 * h, -h, h, 3 * h)
