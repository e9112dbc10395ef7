"""The core stage: from an element's geometry to each piece's lengths and marks.

For every piece of stock: the developed length (the neutral axis, K-factor),
the cut length (trim at both ends), the bend table in trade order from end A
and the pencil marks measured from the stock's centre and from cut end A; and
the findings about the geometry itself (conductors that touch, ends that miss
the gap, bends too tight for the stock).

Pure: no files, no printing. mm, kg.
"""

from __future__ import annotations

import dataclasses

from ..design.model import Design, ElementSpec, StockSpec
from ..errors import Finding
from ..geometry.path import BendPath, BendSpan
from ..geometry.shapes import SHAPES
from ..geometry.shapes.base import ElementGeometry
from .records import BendRow, Mark, PieceCore, StockSummary

__all__ = ["element_geometry", "plan_pieces", "stock_summary"]


def stock_summary(stock: StockSpec) -> StockSummary:
    return StockSummary(stock, stock.profile.mass_per_m_kg(stock.material.density_kg_m3))


def element_geometry(design: Design, spec: ElementSpec) -> ElementGeometry:
    """The pieces and gaps of one element, for its own stock's diameter."""
    d = design.stock_of(spec).profile.outer_diameter_mm
    return SHAPES[spec.shape].element_geometry(spec.params, d)


def plan_pieces(design: Design, spec: ElementSpec,
                geometry: ElementGeometry) -> tuple[tuple[PieceCore, ...], list[Finding]]:
    """The core figures of every piece of one element, and the findings about
    its geometry (each naming the element)."""
    stock = design.stock_of(spec)
    summary = stock_summary(stock)
    d = stock.profile.outer_diameter_mm
    shape = SHAPES[spec.shape]
    findings = [dataclasses.replace(f, element=spec.name) for f in shape.problems(spec.params, d)]
    trim = design.shop.trim_mm if spec.trim_mm is None else spec.trim_mm
    pieces = []
    for piece in geometry.pieces:
        core = _piece(piece.label, piece.path, summary, trim)
        pieces.append(core)
        where = spec.name if not piece.label else f"{spec.name}, {piece.label}"
        findings += _geometry_findings(where, piece.path, d, stock.k_factor_given)
    return tuple(pieces), findings


def _piece(label: str, path: BendPath, stock: StockSummary, trim: float) -> PieceCore:
    profile = stock.spec.profile
    d = profile.outer_diameter_mm
    depth = profile.depth_mm
    k = stock.spec.k_factor
    developed = path.developed_length(depth, k)
    centre = developed / 2
    rows = []
    marks = [Mark("centre of stock", "centre", 0.0, trim + centre)]
    for span in path.spans(depth, k):
        rows.append(_row(span, centre, trim))
        marks.append(Mark(f"bend {span.index} start", "bend-start", span.start_mm - centre,
                          trim + span.start_mm))
        marks.append(Mark(f"bend {span.index} end", "bend-end", span.end_mm - centre,
                          trim + span.end_mm))
    if trim > 0:
        marks.append(Mark("end A (trim line)", "end", -centre, trim))
        marks.append(Mark("end B (trim line)", "end", centre, trim + developed))
    marks.sort(key=lambda m: m.from_centre_mm)
    cut = developed + 2 * trim
    mass = stock.mass_per_m_kg * cut / 1000
    return PieceCore(label, stock, path, d, path.centreline_length(), developed, trim, cut,
                     path.gap_mm, tuple(rows), tuple(marks), path.tail_straight(),
                     path.is_planar(), mass)


def _row(span: BendSpan, centre: float, trim: float) -> BendRow:
    b = span.bend
    return BendRow(span.index, b.angle_deg, b.radius_mm, b.rotation_deg, b.pitch_mm,
                   span.straight_before_mm, span.neutral_radius_mm, span.end_mm - span.start_mm,
                   span.start_mm - centre, span.end_mm - centre, trim + span.start_mm,
                   trim + span.end_mm, span.start_point, span.end_point)


def _geometry_findings(where: str, path: BendPath, d: float, k_given: bool) -> list[Finding]:
    out = []
    for s1, s2, dist in path.touching(d):
        out.append(Finding("conductors-touch", "error",
                           f"the conductor comes within {dist:.2f} mm centre to centre of itself "
                           f"({s1:.0f} mm and {s2:.0f} mm along the stock), less than its "
                           f"{d:.2f} mm diameter: the surfaces touch or cross; change the "
                           "dimensions", where))
    if path.gap_mm is not None and path.closure_error() > max(0.5, 0.1 * d):
        out.append(Finding("ends-do-not-meet", "error",
                           f"the stock's ends miss the {path.gap_mm:.1f} mm feed gap by "
                           f"{path.closure_error():.1f} mm", where))
    tight = [b for b in path.bends if b.radius_mm / d < 1.5]
    if tight and not k_given:
        worst = min(b.radius_mm / d for b in tight)
        out.append(Finding("k-factor-matters", "warning",
                           f"a bend's centreline radius is only {worst:.2f} x the stock "
                           "diameter: the neutral axis moves inward in bends this tight, so the "
                           "default K = 0.5 makes the stock a little long; set stock.k_factor "
                           "(about 0.35-0.45) or calibrate from a test bend", where))
    if any(b.radius_mm < d / 2 for b in path.bends):
        out.append(Finding("bend-radius-below-stock", "error",
                           f"a bend's centreline radius is less than half the {d:.2f} mm stock: "
                           "it cannot be bent; use a larger radius", where))
    return out
