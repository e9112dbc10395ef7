"""Design -> Plan: the one record of every figure fabplan reports.

`make_plan` calls the stages explicitly, in this order, each a pure function
of typed inputs returning a typed record; no stage rewrites another's output:

    ends        a bender's square ends, chosen before any length (forming.ends)
    geometry    every element's pieces of stock and gaps (lengths.stage)
    core        developed and cut lengths, bend table, marks (lengths.stage)
    boom        elements on a boom: positions, the boom correction added to the
                cuts, drilling, hardware; matching devices' fittings (boom.stage)
    forming     springback, formers, tool marks, limits, bend order (forming.stage)
    estimate    weight, cost, purchase plan (estimate.stage)
    jig         bending jigs laid out on machine beds (jig.stage)
    electrical  impedance, SWR, resonance of each fed element (em.stage)

Renderers read the Plan and nothing else.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from dataclasses import dataclass

from .boom.records import BoomPlan, ElementMount
from .boom.stage import boom_stage
from .design.beam import boom_modelled
from .design.forming import FormingSettings
from .design.jig import JigSettings
from .design.model import Design, ElementSpec, StockSpec
from .drilling.mast import qfh_mast
from .drilling.records import DrillPattern
from .em.build import ElectricalInput
from .em.records import ElementElectrical, PlanElectrical
from .em.stage import electrical
from .errors import Finding
from .estimate.records import ElementEstimate, Order
from .estimate.stage import Support, estimate
from .forming.ends import resolve_ends
from .forming.records import ElementForming
from .forming.stage import StockModel, form_piece, stock_model
from .geometry.placement import Placement
from .geometry.shapes import SHAPES, quadrifilar, straight
from .geometry.shapes.base import ElementGeometry
from .jig.records import JigLayout, JigPiece
from .jig.stage import layout_jig
from .lengths.records import PieceCore, StockSummary
from .lengths.stage import element_geometry, plan_pieces, stock_summary

__all__ = ["Plan", "ElementPlan", "PiecePlan", "make_plan", "core_element", "electrical_input",
           "jig_pieces", "jig_for", "boom_input"]


@dataclass(frozen=True)
class PiecePlan(PieceCore):
    """One piece of stock: its core figures and how it is formed."""

    forming: ElementForming | None = None


@dataclass(frozen=True)
class ElementPlan:
    """One element: its spec as it will be made, where it sits, the pieces of
    stock it is made of (as cut: a boom correction included) and the gaps between
    their ends (the shape's geometry), its weight, cost and electrical check, and its
    place on the boom."""

    spec: ElementSpec
    geometry: ElementGeometry
    pieces: tuple[PiecePlan, ...]
    estimate: ElementEstimate | None = None
    electrical: ElementElectrical | None = None
    # errors in the element's shape (it cannot be made as given): no jig is laid
    # out for it and no electrical model is made of it
    shape_errors: tuple[Finding, ...] = ()
    boom: ElementMount | None = None

    @property
    def name(self) -> str:
        return self.spec.name

    @property
    def quantity(self) -> int:
        return self.spec.quantity

    @property
    def placement(self) -> Placement | None:
        return self.spec.placement

    @property
    def piece(self) -> PiecePlan:
        """The element's one piece of stock (an error for an element of several)."""
        if len(self.pieces) != 1:
            raise ValueError(f"{self.name!r} is made of {len(self.pieces)} pieces of stock")
        return self.pieces[0]

    @property
    def feed_gap_mm(self) -> float | None:
        feed = self.geometry.feed
        return None if feed is None else feed.width_mm

    def piece_name(self, piece: PieceCore) -> str:
        """How a piece is named on the sheet and in findings."""
        return _piece_name(self.spec, piece)

    @property
    def developed_length_mm(self) -> float:
        """All the element's stock, end to end (mm)."""
        return sum(p.developed_length_mm for p in self.pieces)

    @property
    def cut_length_mm(self) -> float:
        """All the element's cut pieces, trim included (mm)."""
        return sum(p.cut_length_mm for p in self.pieces)

    @property
    def mass_kg(self) -> float:
        return sum(p.mass_kg for p in self.pieces)


@dataclass(frozen=True)
class Plan:
    """Every figure fabplan reports about one design."""

    design: Design
    stock: StockSummary
    elements: tuple[ElementPlan, ...]
    findings: tuple[Finding, ...]
    order: Order | None = None
    jig: JigLayout | None = None
    electrical: PlanElectrical | None = None
    drilling: tuple[DrillPattern, ...] = ()  # boom, mast: holes from one datum
    boom: BoomPlan | None = None

    @property
    def has_errors(self) -> bool:
        return any(f.severity == "error" for f in self.findings)

    def element(self, name: str) -> ElementPlan:
        for e in self.elements:
            if e.name == name:
                return e
        raise KeyError(name)


def core_element(design: Design, spec: ElementSpec) -> tuple[ElementGeometry,
                                                              tuple[PieceCore, ...],
                                                              list[Finding]]:
    """The geometry and core figures of one element as specified (no ends step):
    for a tuner that changes one dimension and wants the new lengths."""
    geometry = element_geometry(design, spec)
    pieces, found = plan_pieces(design, spec, geometry)
    return geometry, pieces, found


def make_plan(design: Design) -> Plan:
    """Every figure for every element, the stages called in their order."""
    findings: list[Finding] = []
    forming_settings = design.forming or FormingSettings()
    models: dict[StockSpec, StockModel] = {}

    def model_of(spec: ElementSpec) -> StockModel:
        stock = design.stock_of(spec)
        if stock not in models:
            models[stock] = stock_model(stock, forming_settings)
        return models[stock]

    # ends: what a bender makes, decided before any length
    specs: list[ElementSpec] = []
    ends_found: list[list[Finding]] = []
    for spec in design.elements:
        made, found = resolve_ends(design, spec, forming_settings, model_of(spec))
        specs.append(made)
        ends_found.append(found)
    # geometry and core
    geometries = [element_geometry(design, spec) for spec in specs]
    cores: list[tuple[PieceCore, ...]] = []
    shape_errors: list[tuple[Finding, ...]] = []
    for spec, geometry, ends in zip(specs, geometries, ends_found):
        pieces, found = plan_pieces(design, spec, geometry)
        cores.append(pieces)
        findings += found
        shape_errors.append(tuple(f for f in [*ends, *found] if f.severity == "error"))
    # boom: the pieces as cut (a boom correction added at the tips), drilling, hardware
    beam = boom_stage(design, specs, geometries, cores)
    cores = list(beam.pieces)
    findings += beam.findings
    # forming
    formed: list[tuple[PiecePlan, ...]] = []
    for spec, pieces, ends in zip(specs, cores, ends_found):
        findings += ends
        parallel = SHAPES[spec.shape].parallel_ends
        out = []
        for piece in pieces:
            forming, found = form_piece(piece, _piece_name(spec, piece), model_of(spec),
                                        forming_settings, parallel, bool(ends))
            findings += found
            out.append(PiecePlan(**{f.name: getattr(piece, f.name)
                                    for f in dataclasses.fields(PieceCore)}, forming=forming))
        formed.append(tuple(out))
    # estimate
    est = estimate(design, list(zip(specs, cores)), _supports(design))
    findings += est.findings
    # jig
    jig = layout_jig(design.project, [JigPiece(_piece_name(spec, p), p, p.forming)
                                      for spec, pieces, bad in zip(specs, formed, shape_errors)
                                      for p in pieces
                                      if p.forming is not None and p.bends and not bad],
                     design.jig or JigSettings())
    findings += jig.findings
    # electrical: a model of a shape that cannot be made means nothing
    checked: tuple[ElementElectrical | None, ...] = (None,) * len(specs)
    plan_electrical = None
    if design.electrical is not None and any(shape_errors):
        findings.append(electrical_not_run(specs, shape_errors))
    elif design.electrical is not None:
        inputs = [electrical_input(design, spec, geometry, pieces)
                  for spec, geometry, pieces in zip(specs, geometries, formed)]
        boom_wire = boom_input(design, specs)
        checked, plan_electrical, em_found = electrical(
            inputs + ([boom_wire] if boom_wire is not None else []), design.electrical)
        checked = checked[:len(inputs)]
        findings += em_found
    elements = tuple(ElementPlan(spec, geometry, pieces, e_est, e_em, bad, mount)
                     for spec, geometry, pieces, e_est, e_em, bad, mount in zip(
                         specs, geometries, formed, est.elements, checked, shape_errors,
                         beam.mounts))
    drilling = (beam.boom.drilling,) if beam.boom is not None and beam.boom.drilling.holes else ()
    return Plan(design, stock_summary(design.stock), elements, tuple(findings), est.order, jig,
                plan_electrical, drilling + _masts(design, specs, shape_errors), beam.boom)


def _masts(design: Design, specs: list[ElementSpec],
           shape_errors: Sequence[tuple[Finding, ...]]) -> tuple[DrillPattern, ...]:
    """The drilling pattern of each quadrifilar helix's mast (given a mast diameter); none
    for a helix that cannot be made (its error findings say why)."""
    out = []
    for spec, errors in zip(specs, shape_errors):
        if isinstance(spec.params, quadrifilar.Params) and not errors:
            m = quadrifilar.mast_inputs(spec.params,
                                        design.stock_of(spec).profile.outer_diameter_mm)
            if m is not None:
                out.append(qfh_mast(spec.name, m.design, m.mast_diameter_mm,
                                    conductor_diameter_mm=m.conductor_diameter_mm,
                                    small_azimuth_deg=m.small_azimuth_deg,
                                    small_top_offset_mm=m.small_top_offset_mm,
                                    length_mm=m.mast_length_mm))
    return tuple(out)


def electrical_not_run(specs: Sequence[ElementSpec],
                       shape_errors: Sequence[tuple[Finding, ...]]) -> Finding:
    """The finding that says why the electrical check was not run."""
    bad = [spec.name for spec, errs in zip(specs, shape_errors) if errs]
    return Finding("em-not-run", "info",
                   "electrical check not run: the shape of " + ", ".join(bad)
                   + " cannot be made as given (see the errors); fix it first")


def _piece_name(spec: ElementSpec, piece: PieceCore) -> str:
    return spec.name if not piece.label else f"{spec.name}, {piece.label}"


def electrical_input(design: Design, spec: ElementSpec, geometry: ElementGeometry,
                     pieces: tuple[PiecePlan, ...]) -> ElectricalInput:
    """What the electrical stage models of an element: its spec and stock, its pieces
    of stock with their forming figures, and the gaps between their ends."""
    return ElectricalInput(spec, design.stock_of(spec), tuple(pieces),
                           tuple(p.forming for p in pieces), geometry)


def boom_input(design: Design, specs: tuple[ElementSpec, ...] | list[ElementSpec] | None = None
               ) -> ElectricalInput | None:
    """The metal boom as a conductor of the electrical model, when it is modelled
    (fabplan.design.beam.boom_modelled): a straight along x from the rear end, with
    the boom's equivalent radius; None otherwise."""
    boom = design.boom
    if boom is None or not boom_modelled(boom, list(specs or design.elements)):
        return None
    material = boom.stock.material
    if material is None:
        return None
    profile = boom.stock.model_profile()
    stock = StockSpec(material, profile, f"the boom as modelled ({boom.stock.description})",
                      boom.stock.source)
    spec = ElementSpec("boom", "straight", straight.Params(boom.length_mm), stock=stock,
                       placement=Placement((boom.length_mm / 2, 0.0, 0.0)))
    geometry, pieces, _ = core_element(design, spec)
    return ElectricalInput(spec, stock, pieces, (None,) * len(pieces), geometry)


def jig_pieces(plan: Plan) -> list[JigPiece]:
    """Every piece of the plan that gets a jig (it has bends and forming figures)."""
    return [JigPiece(e.piece_name(p), p, p.forming) for e in plan.elements for p in e.pieces
            if p.forming is not None and p.bends and not e.shape_errors]


def jig_for(plan: Plan, settings: JigSettings) -> JigLayout:
    """The plan's jigs laid out again with other `[jig]` settings (nothing else
    changes: the jig stage reads only the pieces and their forming figures)."""
    return layout_jig(plan.design.project, jig_pieces(plan), settings)


def _supports(design: Design) -> tuple[Support, ...]:
    """What the elements mount on, cut from stock of its own: the boom."""
    b = design.boom
    if b is None:
        return ()
    return (Support("boom", b.stock.catalogue, b.stock.description,
                    b.stock.mass_per_m_kg, b.length_mm, b.quantity),)
