"""Helix: `turns` turns of centreline `diameter` at `pitch` per turn, with
straight lead-in and lead-out tangent to the coil (helical antennas, coils).

Give `pitch`, or `coil_length` (axial length of the wound part).

Its dimensions are given for a side view, looking square to the coil's axis
from the side of the coil's first point (so that the straight leads lie on
the near side): the axis runs across the view and the up direction is square
to both; `side_view(path)` gives that frame.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from typing import Literal

import numpy as np

from ...errors import Finding
from ...section import Section
from ..path import Arc3, Bend, BendPath, Piece, Straight
from .base import Dimension, ShapeSpec, TunedValue, pick_one

NAME = "helix"
SUMMARY = "turns of a given diameter and pitch with straight leads (helical antennas, coils)"


@dataclass(frozen=True)
class Params:
    turns: float
    diameter_mm: float
    pitch_mm: float
    lead_in_mm: float = 0.0
    lead_out_mm: float = 0.0
    pitch_kind: Literal["pitch", "coil_length"] = "pitch"  # which the design gave


def read(sec: Section) -> Params:
    turns = sec.number("turns", low=0.0, low_open=True, high=1000.0)
    diameter = sec.length("diameter")
    kind, value = pick_one(sec, ("pitch", "coil_length"))
    pitch = value if kind == "pitch" else value / turns
    lead_in = sec.length("lead_in", 0.0, allow_zero=True)
    lead_out = sec.length("lead_out", 0.0, allow_zero=True)
    return Params(turns, diameter, pitch, lead_in, lead_out, kind)  # type: ignore[arg-type]


def build(p: Params, d: float) -> BendPath:
    pieces: list[Piece] = []
    if p.lead_in_mm > 0:
        pieces.append(Straight(p.lead_in_mm))
    pieces.append(Bend(p.diameter_mm / 2, 360.0 * p.turns, 0.0, p.pitch_mm))
    if p.lead_out_mm > 0:
        pieces.append(Straight(p.lead_out_mm))
    return BendPath(tuple(pieces))


def problems(p: Params, d: float) -> list[Finding]:
    out = []
    if p.turns > 1 and p.pitch_mm <= d:
        out.append(Finding("conductors-touch", "error",
                           f"pitch {p.pitch_mm:.2f} mm is not more than the conductor diameter "
                           f"{d:.2f} mm: neighbouring turns touch; increase the pitch"))
    if p.diameter_mm <= d:
        out.append(Finding("bend-radius-below-stock", "error",
                           f"coil diameter {p.diameter_mm:.1f} mm is not more than the conductor "
                           f"diameter {d:.2f} mm"))
    return out


def governing(p: Params) -> tuple[str, float]:
    return "turns", p.turns


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, turns=value)


KEYS = ("turns", "diameter", "pitch", "coil_length", "lead_in", "lead_out")

def tuned_keys(p: Params) -> dict[str, TunedValue]:
    return {"turns": ("number", p.turns), "coil_length": ("length", p.turns * p.pitch_mm)}


def side_view(path: BendPath) -> tuple[np.ndarray, np.ndarray, np.ndarray] | None:
    """The side view of a helical path: (a point on the axis at the coil's
    start, the unit axis, the unit up direction), or None without a coil. The
    viewer looks from the coil's first point towards the axis (along -u of
    the coil's arc), so up = u x axis, the opposite of its start direction v."""
    arc = next((x for x in path.primitives() if isinstance(x, Arc3) and x.pitch), None)
    if arc is None:
        return None
    axis = np.asarray(arc.axis)
    return np.asarray(arc.centre), axis, np.cross(np.asarray(arc.u), axis)


def dimensions(p: Params, d: float) -> tuple[Dimension, ...]:
    """In the side view: the pitch between the first two turns and the coil
    length above the coil, the diameter before its start."""
    view = side_view(build(p, d))
    if view is None:
        return ()
    centre, axis, up = view
    r = p.diameter_mm / 2

    def pt(along: float, height: float) -> tuple[float, float, float]:
        v = centre + along * axis + height * up
        return (float(v[0]), float(v[1]), float(v[2]))

    above = (float(up[0]), float(up[1]), float(up[2]))
    before = (float(-axis[0]), float(-axis[1]), float(-axis[2]))
    top = 0.75 * p.pitch_mm  # the wire first crosses the top three quarters of a turn in
    coil = p.turns * p.pitch_mm
    out = [Dimension("diameter", p.diameter_mm, pt(0.0, -r), pt(0.0, r), before)]
    if p.turns >= 1.75:
        out.append(Dimension("pitch", p.pitch_mm, pt(top, r), pt(top + p.pitch_mm, r), above))
    out.append(Dimension("coil_length", coil, pt(0.0, r), pt(coil, r), above))
    return tuple(out)


SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, dimensions=dimensions)
