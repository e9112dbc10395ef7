"""Hairpin (U): two parallel legs joined by one 180-degree bend, or by two
90-degree bends with a straight between (`end_style = "square"`).

The stock's ends are the free ends of the legs; its centre is in the middle
of the bend (or of the straight between the two bends). The bend is at x = 0 and
the legs run back along -x; a hairpin made as a matching device
(fabplan.design.match) has its frame at the legs' ends instead (`anchor = "ends"`,
not a design key), so that a new leg length keeps its ends on the feed terminals.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from typing import Literal

from ...errors import Finding
from ...section import Section
from ..path import Bend, BendPath, Piece, Straight
from .base import Dimension, ParallelEnds, ShapeSpec, TunedValue, centre_to_centre, spacing_centre

NAME = "hairpin"
SUMMARY = "two parallel legs joined by a 180-degree bend (or two 90-degree bends)"


@dataclass(frozen=True)
class Params:
    leg_mm: float
    spacing_kind: Literal["spacing", "centre_spacing"]
    spacing_mm: float
    end_style: Literal["round", "square"] = "round"
    bend_radius_mm: float | None = None
    anchor: Literal["bend", "ends"] = "bend"  # where the frame's origin is (see above)

    def centre_spacing(self, d: float) -> float:
        return centre_to_centre(self.spacing_kind, self.spacing_mm, d)

    def radius(self, d: float) -> float:
        if self.end_style == "square":
            return self.bend_radius_mm if self.bend_radius_mm is not None else d
        return self.centre_spacing(d) / 2


def read(sec: Section) -> Params:
    leg = sec.length("leg")
    kind, spacing = spacing_centre(sec)
    style = sec.string("end_style", "round", choices=("round", "square"))
    radius = sec.length("bend_radius", None)
    return Params(leg, kind, spacing, style, radius)  # type: ignore[arg-type]


def build(p: Params, d: float) -> BendPath:
    r = p.radius(d)
    c = p.centre_spacing(d)
    if p.end_style == "round":
        middle: list[Piece] = [Bend(r, 180.0)]
        straight_leg = p.leg_mm
    else:
        link = c - 2 * r
        middle = [Bend(r, 90.0)] + ([Straight(link)] if link > 1e-9 else []) + [Bend(r, 90.0)]
        straight_leg = p.leg_mm
    x0 = 0.0 if p.anchor == "ends" else -straight_leg
    return BendPath((Straight(straight_leg), *middle, Straight(straight_leg)),
                    origin=(x0, -c / 2, 0.0))


def problems(p: Params, d: float) -> list[Finding]:
    out = []
    if p.centre_spacing(d) <= d:
        out.append(Finding("conductors-touch", "error",
                           f"centre spacing {p.centre_spacing(d):.1f} mm is not more than the "
                           f"conductor diameter {d:.2f} mm: the legs touch; widen the spacing"))
    if p.end_style == "square" and p.centre_spacing(d) < 2 * p.radius(d) - 1e-9:
        out.append(Finding("end-radius-too-large", "error",
                           f"two {p.radius(d):.1f} mm bends need a centre spacing of at least "
                           f"{2 * p.radius(d):.1f} mm; use a smaller bend radius"))
    return out


def governing(p: Params) -> tuple[str, float]:
    return "leg", p.leg_mm


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, leg_mm=value)


KEYS = ("leg", "spacing", "centre_spacing", "end_style", "bend_radius")

def tuned_keys(p: Params) -> dict[str, TunedValue]:
    return {"leg": ("length", p.leg_mm)}


def dimensions(p: Params, d: float) -> tuple[Dimension, ...]:
    """The leg (above the upper leg) and the spacing (between the legs)."""
    c = p.centre_spacing(d)
    inner = d / 2 if p.spacing_kind == "spacing" else 0.0
    return (Dimension("leg", p.leg_mm, (-p.leg_mm, c / 2, 0.0), (0.0, c / 2, 0.0),
                      (0.0, 1.0, 0.0)),
            Dimension(p.spacing_kind, p.spacing_mm, (-p.leg_mm / 2, -c / 2 + inner, 0.0),
                      (-p.leg_mm / 2, c / 2 - inner, 0.0)))


PARALLEL_ENDS = ParallelEnds(
    centre_spacing=lambda p, d: p.centre_spacing(d),
    is_round=lambda p: p.end_style == "round",
    squared=lambda p, r: dataclasses.replace(p, end_style="square", bend_radius_mm=r))

SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, PARALLEL_ENDS, dimensions=dimensions)
