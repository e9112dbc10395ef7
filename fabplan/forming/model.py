"""What the forming stage adds to the Plan (the interface the jig drawings,
the build sheet and the electrical check read).

Coordinates (x, y) are in the element's drawing plane: the same millimetre
coordinates as the element's BendPath primitives (z = 0 for planar elements).
Radii are millimetres, angles degrees.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

__all__ = ["BendForming", "Former", "JigMark", "ToolMark", "ElementForming", "BendLimits"]


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
    limits: tuple[BendLimits, ...] = ()
    extra: dict[str, Any] = field(default_factory=dict, compare=False)

    def bend(self, index: int) -> BendForming:
        for b in self.bends:
            if b.index == index:
                return b
        raise KeyError(index)

    # The forming stage's additions to the report (read by render/report.py).
    def extend_json(self, d: dict) -> None:
        """Merge per-bend figures into d["bends"] (by index) and add d["forming"]."""
        by_index = {b.index: b for b in self.bends}
        for row in d.get("bends", []):
            b = by_index.get(row.get("index"))
            if b is None:
                continue
            row.update({
                "former_radius_mm": _r(b.former_radius_mm),
                "former_centreline_radius_mm": _r(b.former_centreline_radius_mm),
                "overbend_deg": _r(b.overbend_deg),
                "springback_deg": _r(b.springback_deg),
                "final_radius_mm": _r(b.final_radius_mm),
                "final_angle_deg": _r(b.final_angle_deg),
                "outer_strain": _r(b.outer_strain, 6),
                "forming_method": b.method,
            })
        d["forming"] = {
            "method": self.extra.get("method", self.bends[0].method if self.bends else None),
            "model": self.extra.get("model"),
            "effective_yield_mpa": _r(self.extra["effective_yield_mpa"])
            if "effective_yield_mpa" in self.extra else None,
            "calibrated": bool(self.extra.get("calibrated", False)),
            "elastic_limit_radius_mm": _r(self.elastic_limit_radius_mm),
            "formers": [{"label": f.label, "bends": list(f.bend_indices),
                         "centre_mm": [_r(c) for c in f.centre_mm],
                         "radius_mm": _r(f.radius_mm), "diameter_mm": _r(2 * f.radius_mm),
                         "wrap_deg": _r(f.wrap_deg)} for f in self.formers],
            "former_spacing_mm": [_r(x) for x in self.former_spacing_mm],
            "jig_marks": [{"label": m.label, "kind": m.kind,
                           "point_mm": [_r(c) for c in m.point_mm],
                           "direction": [_r(c, 6) for c in m.direction]}
                          for m in self.jig_marks],
            "tool_marks": [{"step": t.step, "bend": t.bend_index,
                            "from_centre_mm": _r(t.from_centre_mm),
                            "from_end_mm": _r(t.from_end_mm),
                            "from_end_b_mm": _r(t.from_end_b_mm),
                            "tool_reference": t.tool_reference,
                            "bend_to_deg": _r(t.bend_to_deg),
                            "setback_mm": _r(t.setback_mm), "gain_mm": _r(t.gain_mm),
                            "grip_mm": _r(t.grip_mm)} for t in self.tool_marks],
            "bend_order": list(self.bend_order),
            "splay_if_ignored_mm": _r(self.splay_if_ignored_mm),
            "limits": [{"bend": x.index, "d_of_bend": _r(x.d_of_bend),
                        "wall_factor": _r(x.wall_factor), "outer_strain": _r(x.outer_strain, 6),
                        "elongation": _r(x.elongation), "wall_outside_mm": _r(x.wall_outside_mm),
                        "wall_inside_mm": _r(x.wall_inside_mm),
                        "min_radius_mm": _r(x.min_radius_mm),
                        "min_radius_basis": x.min_radius_basis} for x in self.limits],
            "notes": list(self.notes),
        }

    def text(self, unit: str, den: int) -> str:
        """A readable block for `fabplan plan` (lengths in the shop's units)."""
        from ..units import format_length

        def L(mm: float) -> str:
            return format_length(mm, unit, den)  # type: ignore[arg-type]

        method = self.extra.get("method", "former")
        out = ["Forming (springback from the section and the stress-strain law"
               + (", calibrated from the test bend" if self.extra.get("calibrated") else "")
               + ")"]
        if "effective_yield_mpa" in self.extra:
            out.append(f"  effective yield {self.extra['effective_yield_mpa']:.0f} MPa; "
                       "the stock springs straight back from any radius over "
                       + (L(self.elastic_limit_radius_mm)
                          if self.elastic_limit_radius_mm is not None else "-"))
        rows = []
        for b in self.bends:
            final = "straight" if b.final_radius_mm == float("inf") else L(b.final_radius_mm)
            rows.append([str(b.index), L(b.former_radius_mm), L(2 * b.former_radius_mm),
                         f"{b.overbend_deg:.1f}", f"{b.springback_deg:.1f}", final,
                         f"{100 * b.outer_strain:.1f}"])
        head = ["bend", "former radius" if method == "former" else "die radius",
                "diameter", "bend to deg", "springback deg", "final radius", "strain %"]
        out.append(_table(head, rows))
        if self.formers:
            out.append("Jig formers (disc centres in the drawing plane)")
            rows = [[f.label, ", ".join(map(str, f.bend_indices)),
                     f"{f.centre_mm[0]:.1f}, {f.centre_mm[1]:.1f} mm", L(2 * f.radius_mm),
                     f"{f.wrap_deg:.1f}"] for f in self.formers]
            out.append(_table(["former", "bends", "centre x, y", "diameter", "wrap deg"], rows))
            if self.former_spacing_mm:
                out.append("  centre to centre: " + "; ".join(L(x) for x in
                                                              self.former_spacing_mm))
        if self.splay_if_ignored_mm is not None:
            out.append(f"  if springback were ignored the legs would splay by "
                       f"{L(self.splay_if_ignored_mm)} at their ends")
        if self.tool_marks:
            out.append("Bender marks, in bend order (line the pencil mark up with the tool's "
                       f"{self.tool_marks[0].tool_reference} mark)")
            rows = [[str(t.step), str(t.bend_index), _signed(t.from_centre_mm, L),
                     L(t.from_end_mm), f"{t.bend_to_deg:.1f}",
                     "-" if t.setback_mm is None else L(t.setback_mm),
                     "-" if t.gain_mm is None else L(t.gain_mm)] for t in self.tool_marks]
            out.append(_table(["step", "bend", "from centre", "from end A", "bend to deg",
                               "setback", "gain"], rows))
        elif self.bend_order:
            out.append("Bend order: " + ", ".join(map(str, self.bend_order)))
        out += [f"  note: {n}" for n in self.notes]
        return "\n".join(out)


def _r(x: float | None, places: int = 4) -> float | None:
    """Rounded for JSON; None for a missing or infinite figure."""
    if x is None or x != x or x in (float("inf"), float("-inf")):
        return None
    v = round(float(x), places)
    return 0.0 if v == 0 else v


def _signed(mm: float, L) -> str:
    if abs(mm) < 1e-9:
        return "0 (centre)"
    return f"{'A' if mm < 0 else 'B'} {L(abs(mm))}"


def _table(headers: list[str], rows: list[list[str]]) -> str:
    from ..render.report import table

    return table(headers, rows, "l" + "r" * (len(headers) - 1))
