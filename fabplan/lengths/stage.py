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
from ..errors import DesignError, Finding
from ..geometry.path import BendPath, BendSpan
from ..geometry.shapes import SHAPES
from ..geometry.shapes.base import ElementGeometry, PieceGeometry, PieceStock
from ..stock.catalogue import get_stock_item
from ..stock.materials import get_material
from ..stock.profiles import Tube
from .records import BendRow, Mark, PieceCore, StockSummary

__all__ = ["element_geometry", "plan_pieces", "stock_summary", "piece_stock", "piece_core"]


def stock_summary(stock: StockSpec) -> StockSummary:
    return StockSummary(stock, stock.profile.mass_per_m_kg(stock.material.density_kg_m3))


def element_geometry(design: Design, spec: ElementSpec) -> ElementGeometry:
    """The pieces and gaps of one element, for its own stock's diameter."""
    d = design.stock_of(spec).profile.outer_diameter_mm
    return SHAPES[spec.shape].element_geometry(spec.params, d)


def piece_stock(element_stock: StockSpec, ref: PieceStock | None) -> StockSpec:
    """The stock of one piece: its own (a catalogue item, or a tube's size in the
    element's material), or the element's when it names none."""
    if ref is None:
        return element_stock
    if ref.catalogue is not None:
        item = get_stock_item(ref.catalogue, ref.field or "catalogue")
        return StockSpec(get_material(item.material), item.profile, item.description,
                         item.source, item.key, element_stock.k_factor,
                         element_stock.k_factor_given)
    if ref.od_mm is None or ref.wall_mm is None:
        raise DesignError("a piece's stock needs a catalogue key, or od and wall",
                          field=ref.field or "stock")
    profile = Tube(ref.od_mm, ref.wall_mm)
    return StockSpec(element_stock.material, profile, profile.describe(),
                     "dimensions from the design", None, element_stock.k_factor,
                     element_stock.k_factor_given)


def plan_pieces(design: Design, spec: ElementSpec,
                geometry: ElementGeometry) -> tuple[tuple[PieceCore, ...], list[Finding]]:
    """The core figures of every piece of one element, and the findings about
    its geometry (each naming the element)."""
    stock = design.stock_of(spec)
    d = stock.profile.outer_diameter_mm
    shape = SHAPES[spec.shape]
    findings = [dataclasses.replace(f, element=spec.name) for f in shape.problems(spec.params, d)]
    trim = design.shop.trim_mm if spec.trim_mm is None else spec.trim_mm
    pieces = []
    for piece in geometry.pieces:
        own = piece_stock(stock, piece.stock)
        core = piece_core(piece, stock_summary(own), trim)
        pieces.append(core)
        where = spec.name if not piece.label else f"{spec.name}, {piece.label}"
        findings += _geometry_findings(where, piece.path, own.profile.outer_diameter_mm,
                                       own.k_factor_given)
    findings += _fit_findings(spec.name, geometry, pieces)
    return tuple(pieces), findings


def piece_core(piece: PieceGeometry, stock: StockSummary, trim: float) -> PieceCore:
    """The core figures of one piece of stock (its own extra marks included)."""
    core = _piece(piece.label, piece.path, stock, trim, piece.rolled)
    if not piece.marks:
        return core
    centre = core.developed_length_mm / 2
    extra = [Mark(label, "fit", s - centre, trim + s) for label, s in piece.marks]
    marks = tuple(sorted(core.marks + tuple(extra), key=lambda m: m.from_centre_mm))
    return dataclasses.replace(core, marks=marks)


def _fit_findings(name: str, geometry: ElementGeometry,
                  pieces: list[PieceCore]) -> list[Finding]:
    """Telescoping tubes: each must slide into the tube it is declared to sit in."""
    out = []
    for i, piece in enumerate(geometry.pieces):
        host = piece.inside
        if host is None or not 0 <= host < len(pieces):
            continue
        inner, outer = pieces[host].stock.profile, pieces[i].stock.profile
        od = outer.outer_diameter_mm
        bore = getattr(inner, "id_mm", None)
        if bore is None:
            out.append(Finding("tube-does-not-fit", "error",
                               f"{pieces[i].label} slides into {pieces[host].label}, which is "
                               "solid: the inner sections of a telescoping element must be tube",
                               name))
        elif od > bore + 1e-9:
            out.append(Finding("tube-does-not-fit", "error",
                               f"{pieces[i].label} ({od:.2f} mm outside) does not slide into "
                               f"{pieces[host].label} ({bore:.2f} mm bore): choose the next "
                               "size down", name))
        elif bore - od > 1.0:
            out.append(Finding("tube-loose-fit", "warning",
                               f"{pieces[i].label} ({od:.2f} mm) is {bore - od:.2f} mm smaller "
                               f"than the bore of {pieces[host].label} ({bore:.2f} mm): shim it "
                               "or choose a closer size (tubes telescope in 1/8 in steps with "
                               "0.058 in walls; common practice, no source)", name))
    return out


def _piece(label: str, path: BendPath, stock: StockSummary, trim: float,
           rolled: bool = False) -> PieceCore:
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
                     path.is_planar(), mass, rolled)


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
