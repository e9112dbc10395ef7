"""What the forming stage adds to the Plan (the interface the jig drawings,
the build sheet and the electrical check read).

Coordinates (x, y) are in the element's drawing plane: the same millimetre
coordinates as the element's BendPath primitives (z = 0 for planar elements).
Radii are millimetres, angles degrees.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

__all__ = ["BendForming", "Former", "JigMark", "ToolMark", "ElementForming"]


@dataclass(frozen=True)
class BendForming:
    """How one bend (1-based `index`, as in the Plan's bend table) is formed."""

    index: int
    method: str  # "former" (around a disc on a jig) or "bender" (a hand/ratchet tube bender)
    former_radius_mm: float  # radius of the disc or tool die the bend's inside lies on
    former_centreline_radius_mm: float  # centreline radius while held on the former
    overbend_deg: float  # angle to bend to, while held (>= the design angle)
    springback_deg: float  # overbend_deg minus the design angle
    final_radius_mm: float  # centreline radius after release (the design's, when achievable)
    final_angle_deg: float  # angle after release
    outer_strain: float  # outer-fibre strain while held (fraction)


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


@dataclass(frozen=True)
class ElementForming:
    """The forming figures of one element."""

    bends: tuple[BendForming, ...]
    formers: tuple[Former, ...] = ()
    former_spacing_mm: tuple[float, ...] = ()  # centre-to-centre of consecutive formers
    jig_marks: tuple[JigMark, ...] = ()
    tool_marks: tuple[ToolMark, ...] = ()
    bend_order: tuple[int, ...] = ()
    splay_if_ignored_mm: float | None = None  # how far legs splay if springback is ignored
    elastic_limit_radius_mm: float | None = None  # above this radius the stock springs straight
    notes: tuple[str, ...] = ()
    extra: dict[str, Any] = field(default_factory=dict, compare=False)

    def bend(self, index: int) -> BendForming:
        for b in self.bends:
            if b.index == index:
                return b
        raise KeyError(index)

    # The forming stage fills these in: JSON fields merged into the element's
    # dict (per-bend fields into each bend), and a text block for `fabplan plan`.
    def extend_json(self, d: dict) -> None:  # pragma: no cover - replaced by forming
        raise NotImplementedError

    def text(self, unit: str, den: int) -> str:  # pragma: no cover - replaced by forming
        raise NotImplementedError
