"""The forming stage: how each piece of stock is bent, and whether it can be.

For every piece: the springback of each bend (former radius and overbend, or
in a bender the radius it comes out at and the angle to bend to), the
feasibility figures and findings, the jig's former discs and marks, the bend
order and, for a bender, the pencil marks. (Square ends for a bender that
cannot make round ones are chosen before the core stage, in `ends`.)

Pure: no files, no printing. mm, degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

import numpy as np

from ..design.forming import FormingSettings
from ..design.model import StockSpec
from ..errors import Finding
from ..geometry.shapes.base import ParallelEnds
from ..lengths.records import PieceCore
from .formers import end_shift, formers, jig_marks, spacing
from .limits import bend_limits, bend_list, limit_findings
from .records import BendForming, ElementForming
from .sequence import BendSite, bend_order, tool_marks
from .springback import (
    BendState,
    SectionModel,
    calibrate_scale,
    final_for_held,
    law_for,
    section_model,
)

__all__ = ["StockModel", "stock_model", "form_piece", "same_radius"]


# a finished radius within this of the shape's counts as the same (mm, fraction)
_RADIUS_TOL_MM = 0.5
_RADIUS_TOL_FRAC = 0.02


@dataclass(frozen=True)
class StockModel:
    """The springback model of one stock: the section model, the flow-stress
    factor from the test bend (1 without one) and whether it was calibrated."""

    model: SectionModel
    scale: float
    calibrated: bool


def stock_model(stock: StockSpec, settings: FormingSettings) -> StockModel:
    """The springback model of a stock. A test bend in [forming.calibration]
    scales its flow stresses."""
    law = law_for(stock.material, settings.model)
    scale, calibrated = 1.0, False
    cal = settings.calibration
    if cal is not None:
        scale = calibrate_scale(stock.profile, law, cal.former_radius_mm, cal.angle_held_deg,
                                cal.angle_released_deg, stock.k_factor)
        law, calibrated = law.scaled(scale), True
    return StockModel(section_model(stock.profile, law), scale, calibrated)


def same_radius(a: float, b: float) -> bool:
    """Whether two centreline radii (mm) count as the same for the builder."""
    return abs(a - b) <= max(_RADIUS_TOL_MM, _RADIUS_TOL_FRAC * b)


def _held_states(model: SectionModel, radii: list[float], angles: list[float],
                 depth: float, k: float) -> list[BendState]:
    """Former method: hold radius and angle for each finished bend (all at once)."""
    held = model.held_curvatures(1.0 / np.asarray(radii, dtype=float))
    dn = depth * (k - 0.5)
    out = []
    for r, a, kh in zip(radii, angles, held):
        rh = 1.0 / float(kh)
        out.append(BendState(rh, a * (r + dn) / (rh + dn), r, a, model.c / rh))
    return out


def form_piece(e: PieceCore, name: str, sm: StockModel, settings: FormingSettings,
               parallel: ParallelEnds | None = None, ends_reported: bool = False
               ) -> tuple[ElementForming, list[Finding]]:
    """The forming figures of one piece of stock and the findings about them.

    `name` names the piece in findings; `parallel`: the shape's parallel sides,
    when it has them (for the splay figure); `ends_reported`: the ends' radius
    was already the subject of a finding."""
    stock = e.stock.spec
    profile, material = stock.profile, stock.material
    depth, k = profile.depth_mm, stock.k_factor
    model, scale, calibrated = sm.model, sm.scale, sm.calibrated
    findings: list[Finding] = []
    rows = e.bends
    radii = [b.centreline_radius_mm for b in rows]
    angles = [b.angle_deg for b in rows]
    tool = settings.bender if settings.method == "bender" else None
    rho_e = model.elastic_limit_radius
    method: Literal["former", "bender", "rolled"]
    notes: list[str] = []
    if e.rolled:  # a ring: rolled to the held radius in passes, whatever [forming] says
        tool = None
    if tool is None:
        states = _held_states(model, radii, angles, depth, k) if rows else []
        method = "rolled" if e.rolled else "former"
        if e.rolled:
            notes += [_ring_note(e, s) for s in states[:1]]
        big = [b.index for b in rows if b.centreline_radius_mm > rho_e]
        if big:
            findings.append(Finding(
                "radius-above-elastic-limit", "warning",
                f"{bend_list(big)}: the finished radius is larger than the "
                f"{rho_e:.0f} mm from which this stock springs straight back; it has to be "
                "formed much tighter and the result is very sensitive to the metal's yield; "
                "calibrate with a test bend ([forming.calibration])", name))
    else:
        method = "bender"
        # every bend is held at the tool's radius: one release, scaled per angle
        one = final_for_held(model, tool.radius_mm, 1.0, depth, k)
        states = [BendState(one.held_radius_mm, a * one.held_angle_deg, one.final_radius_mm,
                            a, one.outer_strain) for a in angles]
        if tool.radius_mm >= rho_e:
            findings.append(Finding(
                "former-above-elastic-limit", "error",
                f"the bender's {tool.radius_mm:.1f} mm centreline radius is over the "
                f"{rho_e:.0f} mm above which this stock springs straight back: it leaves no "
                "permanent bend; use a tighter tool", name))
        off = [b.index for b, s in zip(rows, states)
               if not math.isinf(s.final_radius_mm)
               and not same_radius(s.final_radius_mm, b.centreline_radius_mm)
               and not b.pitch_mm]
        if off and not ends_reported and not math.isinf(states[0].final_radius_mm):
            findings.append(Finding(
                "radius-not-tool-radius", "warning",
                f"{bend_list(off)}: the shape asks for other radii than the "
                f"{states[0].final_radius_mm:.1f} mm the bender makes after springback (tool "
                f"{tool.radius_mm:.1f} mm); set the shape's radius to "
                f"{states[0].final_radius_mm:.1f} mm or bend these round a former", name))
    bends = tuple(BendForming(
        b.index, method, s.held_radius_mm - depth / 2, s.held_radius_mm, s.held_angle_deg,
        s.held_angle_deg - b.angle_deg, s.final_radius_mm, b.angle_deg, s.outer_strain,
        b.centreline_radius_mm) for b, s in zip(rows, states))
    over = [b.index for b, r in zip(bends, rows)
            if not r.pitch_mm and not e.rolled and math.isfinite(b.overbend_deg)
            and b.final_angle_deg <= 360 < b.overbend_deg]
    if over:
        findings.append(Finding(
            "wrap-past-full-turn", "info",
            f"{bend_list(over)}: to allow for springback the stock wraps more "
            "than a full turn while held: let the end pass beside the start on the former (as "
            "one turn of a coil); it springs open to the drawn shape", name))

    no_disc = [b.index for b in bends if b.former_radius_mm <= 0]
    if no_disc:
        findings.append(Finding(
            "former-too-small", "error",
            f"{bend_list(no_disc)}: allowing for springback the inside of the bend would need a "
            f"former of no radius at all: the bend is tighter than the {depth:.2f} mm stock "
            "allows; use a larger bend radius", name))

    limits = [bend_limits(b.index, s.held_radius_mm, material, profile)
              for b, s in zip(rows, states)]
    def finished_for(held_mm: float) -> float:
        """The finished centreline radius of a bend held at `held_mm`."""
        kr = model.released_one(1.0 / held_mm)
        return 1.0 / kr if kr > 0 else math.inf

    findings += limit_findings(limits, material, profile, name, finished_for,
                               {b.index: b.centreline_radius_mm for b in rows})

    centre = e.developed_length_mm / 2  # along the neutral axis from end A, no trim
    sites = [BendSite(b.index, b.start_from_end_mm, b.end_from_end_mm, b.angle_deg,
                      b.centreline_radius_mm, b.neutral_radius_mm, s.held_angle_deg)
             for b, s in zip(rows, states)]
    discs, gaps, marks, tmarks, splay = [], [], [], [], None
    if tool is None:
        order = [s.index for s in sorted(sites, key=lambda s: (
            round(abs((s.start_mm + s.end_mm) / 2 - e.trim_mm - centre), 3), s.index))]
        if e.rolled:
            pass  # no discs, no jig marks: the ring is rolled
        elif e.planar and rows:
            discs = formers(e.path, rows, [s.held_radius_mm for s in states],
                            [s.held_angle_deg for s in states], depth)
            gaps = spacing(discs)
            marks = jig_marks(e.path, rows, depth, k, centre)
            if parallel is not None:
                released: list[tuple[float, float] | None] = []
                for b in rows:
                    kr = model.released_one(1.0 / b.centreline_radius_mm)
                    if kr <= 0:
                        released.append(None)
                        continue
                    dn = depth * (k - 0.5)
                    rr = 1.0 / kr
                    released.append((rr, b.angle_deg * (b.centreline_radius_mm + dn) / (rr + dn)))
                splay = end_shift(e.path, released, depth, k, centre)
        elif rows:
            notes.append("the element is not flat: no flat jig; form the bends on a mandrel of "
                         "the former radius")
    else:
        order, grips = bend_order(sites, e.cut_length_mm, tool.grip_mm)
        tmarks = tool_marks(sites, order, grips, e.cut_length_mm, e.trim_mm + centre,
                            tool.radius_mm, tool.reference, tool.stock_direction)
        short = [t for t in tmarks if t.grip_mm < tool.grip_mm - 1e-9]
        if short:
            worst = min(short, key=lambda t: t.grip_mm)
            findings.append(Finding(
                "grip-too-short", "error",
                f"{bend_list(t.bend_index for t in short)}: in the best order "
                f"({', '.join(map(str, order))}) bend {worst.bend_index} has only "
                f"{worst.grip_mm:.1f} mm of straight stock beside it and the bender needs "
                f"{tool.grip_mm:.1f} mm to grip; leave more trim at the ends ([shop] trim or "
                "the element's trim), lengthen the straights, or make that bend round a former",
                name))
    if not calibrated:
        notes.append("springback is a first estimate from the material's typical properties; "
                     "a test bend in [forming.calibration] makes it this stock's")
    return ElementForming(bends, tuple(discs), tuple(gaps), tuple(marks), tuple(tmarks),
                          tuple(order), splay, rho_e, tuple(notes), tuple(limits), method,
                          settings.model, model.law.yield_mpa, calibrated, scale), findings


def _ring_note(e: PieceCore, state: BendState) -> str:
    """How to roll a ring: the arc length, the rolling (held) radius from the
    moment-curvature model, and what it springs back to."""
    held, final = state.held_radius_mm, state.final_radius_mm
    return (f"rolled ring: roll the whole {e.developed_length_mm:.0f} mm arc (mm, on the "
            f"neutral axis) to a centreline radius of {held:.1f} mm (diameter {2 * held:.0f} "
            f"mm) while it is in the rolls, in as many passes as your roller needs; released "
            f"it springs open to {final:.1f} mm. Check each pass against a template of the "
            "finished radius; stop short and take the last passes gently (springback of a "
            "large radius is sensitive to the metal's yield: a test bend calibrates it)")
