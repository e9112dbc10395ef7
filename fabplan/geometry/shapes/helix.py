"""Helix: `turns` turns of centreline `diameter` at `pitch` per turn, with
straight lead-in and lead-out tangent to the coil (helical antennas, coils).

Give `pitch`, or `coil_length` (axial length of the wound part).
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

from ...errors import Finding
from ...section import Section
from ..path import Bend, BendPath, Piece, Straight
from .base import ShapeSpec, TunedValue, pick_one

NAME = "helix"
SUMMARY = "turns of a given diameter and pitch with straight leads (helical antennas, coils)"


@dataclass(frozen=True)
class Params:
    turns: float
    diameter_mm: float
    pitch_mm: float
    lead_in_mm: float = 0.0
    lead_out_mm: float = 0.0


def read(sec: Section) -> Params:
    turns = sec.number("turns", low=0.0, low_open=True, high=1000.0)
    diameter = sec.length("diameter")
    kind, value = pick_one(sec, ("pitch", "coil_length"))
    pitch = value if kind == "pitch" else value / turns
    lead_in = sec.length("lead_in", 0.0, allow_zero=True)
    lead_out = sec.length("lead_out", 0.0, allow_zero=True)
    return Params(turns, diameter, pitch, lead_in, lead_out)


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


SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys)
