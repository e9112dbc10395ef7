"""What the forming stage adds to the Plan, for each piece of stock (the
interface the jig, the build sheet and the electrical check read).

Coordinates (x, y) are in the element's drawing plane: the same millimetre
coordinates as the element's BendPath primitives (z = 0 for planar elements).
Radii are millimetres, angles degrees.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

__all__ = ["BendForming", "Former", "JigMark", "ToolMark", "ElementForming", "BendLimits"]


@dataclass(frozen=True)
class BendForming:
    """How one bend (1-based `index`, as in the Plan's bend table) is formed."""

    index: int
    # round a disc on a jig, in a hand/ratchet bender, or rolled in passes (a ring)
    method: Literal["former", "bender", "rolled"]
    former_radius_mm: float  # radius of the disc or tool die the bend's inside lies on
    former_centreline_radius_mm: float  # centreline radius while held on the former
    overbend_deg: float  # angle to bend to, while held (>= the design angle)
    springback_deg: float  # overbend_deg minus the design angle
    final_radius_mm: float  # centreline radius after release (the design's, when achievable)
    final_angle_deg: float  # angle after release
    outer_strain: float  # outer-fibre strain while held (fraction)
    design_radius_mm: float | None = None  # the shape's centreline radius (None: same as final)


@dataclass(frozen=True)
class BendLimits:
    """Feasibility figures of one bend, at the radius it is formed on (held)."""

    index: int
    d_of_bend: float  # held centreline radius / outside diameter (or depth)
    wall_factor: float | None  # outside diameter / wall (tube only)
    outer_strain: float  # depth / (2 x held centreline radius)
    elongation: float  # the material's elongation at break (fraction)
    wall_outside_mm: float | None  # t 2R/(2R + D), upper bound of thinning (tube)
    wall_inside_mm: float | None  # t 2R/(2R - D), upper bound of thickening (tube)
    min_radius_mm: float  # smallest centreline radius the rule allows
    min_radius_basis: str  # where the rule comes from


@dataclass(frozen=True)
class Former:
    """A disc of the bending jig; one or more bends are made around it."""

    label: str
    bend_indices: tuple[int, ...]
    centre_mm: tuple[float, float]  # disc centre in the drawing plane
    radius_mm: float  # disc radius (springback-compensated)
    wrap_deg: float  # how far the stock wraps round it while held (overbend)


@dataclass(frozen=True)
class JigMark:
    """A mark engraved on the jig: stock centre, feed-gap ends, bend start/end."""

    label: str
    kind: str  # "centre", "gap", "bend-start", "bend-end"
    point_mm: tuple[float, float]  # on the conductor centreline, drawing plane
    direction: tuple[float, float]  # unit tangent of the stock there


@dataclass(frozen=True)
class ToolMark:
    """Where to put the pencil mark for one bend in a hand bender, in bend order."""

    step: int
    bend_index: int
    from_centre_mm: float
    from_end_mm: float
    tool_reference: str  # which mark on the tool it lines up with
    bend_to_deg: float
    from_end_b_mm: float = 0.0  # the same mark from cut end B
    setback_mm: float | None = None  # R tan(angle/2) of the finished bend (None at 180 deg)
    gain_mm: float | None = None  # 2 x setback - arc on the neutral axis
    grip_mm: float = 0.0  # longest straight beside the bend when it is made


@dataclass(frozen=True)
class ElementForming:
    """The forming figures of one piece of stock."""

    bends: tuple[BendForming, ...]
    formers: tuple[Former, ...] = ()
    former_spacing_mm: tuple[float, ...] = ()  # centre-to-centre of consecutive formers
    jig_marks: tuple[JigMark, ...] = ()
    tool_marks: tuple[ToolMark, ...] = ()
    bend_order: tuple[int, ...] = ()
    splay_if_ignored_mm: float | None = None  # how far legs splay if springback is ignored
    elastic_limit_radius_mm: float | None = None  # above this radius the stock springs straight
    notes: tuple[str, ...] = ()
    limits: tuple[BendLimits, ...] = ()
    method: Literal["former", "bender", "rolled"] = "former"
    model: str = "hardening"  # the stress-strain law
    effective_yield_mpa: float | None = None  # after calibration
    calibrated: bool = False
    flow_stress_factor: float = 1.0  # from the test bend (1: none)

    def bend(self, index: int) -> BendForming:
        for b in self.bends:
            if b.index == index:
                return b
        raise KeyError(index)
