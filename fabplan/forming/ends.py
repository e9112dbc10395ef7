"""Before the core stage: the ends a hand bender can make.

A shape with parallel sides joined by round ends (a folded dipole, a hairpin)
needs ends of half the centre spacing. A bender makes one radius only (its
own, opened a little by springback). When that radius is smaller than the
ends need and the design allows it, each round end becomes two 90-degree bends
of the bender's radius joined by a straight; when it is larger, or square ends
are refused, a finding says what to change. This runs before the core stage,
so that every length is computed once, for the shape as it will be made.

Pure: no files, no printing. mm, degrees.
"""

from __future__ import annotations

import dataclasses
import math

from ..design.forming import FormingSettings
from ..design.model import Design, ElementSpec
from ..errors import Finding
from ..geometry.shapes import SHAPES
from .springback import final_for_held
from .stage import StockModel, same_radius

__all__ = ["resolve_ends"]


def resolve_ends(design: Design, spec: ElementSpec, settings: FormingSettings,
                 sm: StockModel) -> tuple[ElementSpec, list[Finding]]:
    """The element as it will be made in the design's bender (its spec, with
    square ends where they replace round ones), and the findings about its ends."""
    tool = settings.bender
    ends = SHAPES[spec.shape].parallel_ends
    p = spec.params
    if settings.method != "bender" or tool is None or ends is None or not ends.is_round(p):
        return spec, []
    stock = design.stock_of(spec)
    d = stock.profile.outer_diameter_mm
    depth = stock.profile.depth_mm
    c = ends.centre_spacing(p, d)
    comes_out = final_for_held(sm.model, tool.radius_mm, 90.0, depth, stock.k_factor)
    r_out = comes_out.final_radius_mm
    if math.isinf(r_out) or same_radius(r_out, c / 2):
        return spec, []
    name = spec.name
    if c / 2 > r_out and settings.square_ends:
        squared = dataclasses.replace(spec, params=ends.squared(p, r_out))
        return squared, [Finding(
            "square-ends-substituted", "warning",
            f"the {c:.1f} mm centre spacing needs round ends of {c / 2:.1f} mm centreline "
            f"radius but the {tool.radius_mm:.1f} mm bender makes {r_out:.1f} mm after "
            f"springback: each round end is planned as two 90-degree bends of {r_out:.1f} mm "
            f"joined by a {c - 2 * r_out:.1f} mm straight, and every length is recomputed; set "
            "[forming] square_ends = false to refuse this, or bend round a former", name)]
    if c / 2 > r_out:
        return spec, [Finding(
            "end-radius-not-tool-radius", "error",
            f"the round ends need a {c / 2:.1f} mm centreline radius and the bender makes "
            f"{r_out:.1f} mm: allow square ends ([forming] square_ends = true), bend round a "
            "former ([forming] method = \"former\"), or use a tool of that radius", name)]
    hints = [f"widen the centre spacing to at least {2 * r_out:.1f} mm",
             f"use a bender whose finished radius is at most {c / 2:.1f} mm (centreline radius "
             f"about {c / 2 * tool.radius_mm / r_out:.1f} mm)"]
    if tool.radius_mm <= c / 2:
        hints.append("use a softer temper (it springs back less, so the tool's "
                     f"{tool.radius_mm:.1f} mm radius holds closer)")
    hints.append("or bend the ends round a former disc ([forming] method = \"former\")")
    return spec, [Finding(
        "spacing-too-narrow-for-tool", "error",
        f"the {c:.1f} mm centre spacing needs ends of {c / 2:.1f} mm centreline radius, "
        f"tighter than the {r_out:.1f} mm this bender ({tool.radius_mm:.1f} mm) makes after "
        f"springback, so the ends cannot be made in it: " + "; ".join(hints), name)]
