"""Design -> Plan: the one record of every figure fabplan reports.

`make_plan` computes each element's bend path, developed and cut lengths,
bend table and marks, and collects findings; later stages listed in `STEPS`
(forming, estimate, electrical) each take the Plan and return it with their
figures added. Renderers read the Plan and nothing else.
"""

from __future__ import annotations

import dataclasses
import importlib
import math
from dataclasses import dataclass
from typing import Any

from .design import Design, ElementSpec
from .errors import Finding
from .geometry.path import BendPath, BendSpan
from .geometry.shapes import SHAPES

__all__ = ["Plan", "ElementPlan", "BendRow", "Mark", "StockSummary", "make_plan",
           "element_path", "STEPS", "plan_element"]

Vec = tuple[float, float, float]


@dataclass(frozen=True)
class BendRow:
    """One bend, in trade order from end A. Positions are along the stock's
    neutral axis in mm, from the stock's centre (negative towards end A) and
    from the cut end A (trim included)."""

    index: int
    angle_deg: float
    centreline_radius_mm: float
    rotation_deg: float
    pitch_mm: float
    straight_before_mm: float
    neutral_radius_mm: float
    arc_length_mm: float
    start_from_centre_mm: float
    end_from_centre_mm: float
    start_from_end_mm: float
    end_from_end_mm: float
    start_point: Vec
    end_point: Vec


@dataclass(frozen=True)
class Mark:
    """A pencil mark on the straight stock."""

    label: str
    kind: str  # "centre", "bend-start", "bend-end", "gap", "end"
    from_centre_mm: float
    from_end_mm: float


@dataclass(frozen=True)
class StockSummary:
    description: str
    material_key: str
    material_name: str
    material_source: str
    profile: Any
    mass_per_m_kg: float
    source: str
    k_factor: float


@dataclass(frozen=True)
class ElementPlan:
    spec: ElementSpec
    path: BendPath
    conductor_diameter_mm: float
    centreline_length_mm: float
    developed_length_mm: float
    trim_mm: float  # per end
    cut_length_mm: float
    gap_mm: float | None
    bends: tuple[BendRow, ...]
    marks: tuple[Mark, ...]
    tail_straight_mm: float
    planar: bool
    mass_kg: float  # one element, cut length of stock
    forming: Any = None  # forming.ElementForming
    estimate: Any = None
    electrical: Any = None

    @property
    def name(self) -> str:
        return self.spec.name

    @property
    def quantity(self) -> int:
        return self.spec.quantity


@dataclass(frozen=True)
class Plan:
    design: Design
    stock: StockSummary
    elements: tuple[ElementPlan, ...]
    findings: tuple[Finding, ...]
    order: Any = None  # estimate.Order
    electrical: Any = None

    @property
    def has_errors(self) -> bool:
        return any(f.severity == "error" for f in self.findings)

    def element(self, name: str) -> ElementPlan:
        for e in self.elements:
            if e.name == name:
                return e
        raise KeyError(name)


# later stages, each "module:function" taking a Plan and returning a Plan
STEPS: list[str] = [
    "fabplan.forming.planning:apply",
    "fabplan.estimate.planning:apply",
    "fabplan.em.planning:apply",
]


def element_path(spec: ElementSpec, diameter_mm: float) -> BendPath:
    return SHAPES[spec.shape].build(spec.params, diameter_mm)


def plan_element(design: Design, spec: ElementSpec) -> tuple[ElementPlan, list[Finding]]:
    """The core figures of one element and the findings about its geometry."""
    stock = design.stock
    d = stock.profile.outer_diameter_mm
    depth = stock.profile.depth_mm
    k = stock.k_factor
    shape = SHAPES[spec.shape]
    findings = [dataclasses.replace(f, element=spec.name) for f in shape.problems(spec.params, d)]
    path = shape.build(spec.params, d)
    developed = path.developed_length(depth, k)
    centre = developed / 2
    trim = design.shop.trim_mm if spec.trim_mm is None else spec.trim_mm
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
    findings += _geometry_findings(spec, path, d, stock.k_factor_given)
    mass = stock.profile.mass_per_m_kg(stock.material.density_kg_m3) * cut / 1000
    plan = ElementPlan(spec, path, d, path.centreline_length(), developed, trim, cut,
                       path.gap_mm, tuple(rows), tuple(marks), path.tail_straight(),
                       path.is_planar(), mass)
    return plan, findings


def _row(span: BendSpan, centre: float, trim: float) -> BendRow:
    b = span.bend
    return BendRow(span.index, b.angle_deg, b.radius_mm, b.rotation_deg, b.pitch_mm,
                   span.straight_before_mm, span.neutral_radius_mm, span.end_mm - span.start_mm,
                   span.start_mm - centre, span.end_mm - centre, trim + span.start_mm,
                   trim + span.end_mm, span.start_point, span.end_point)


def _geometry_findings(spec: ElementSpec, path: BendPath, d: float,
                       k_given: bool) -> list[Finding]:
    out = []
    for s1, s2, dist in path.touching(d):
        out.append(Finding("conductors-touch", "error",
                           f"the conductor comes within {dist:.2f} mm centre to centre of itself "
                           f"({s1:.0f} mm and {s2:.0f} mm along the stock), less than its "
                           f"{d:.2f} mm diameter: the surfaces touch or cross; change the "
                           "dimensions", spec.name))
    if path.gap_mm is not None and path.closure_error() > max(0.5, 0.1 * d):
        out.append(Finding("ends-do-not-meet", "error",
                           f"the stock's ends miss the {path.gap_mm:.1f} mm feed gap by "
                           f"{path.closure_error():.1f} mm", spec.name))
    tight = [b for b in path.bends if b.radius_mm / d < 1.5]
    if tight and not k_given:
        worst = min(b.radius_mm / d for b in tight)
        out.append(Finding("k-factor-matters", "warning",
                           f"a bend's centreline radius is only {worst:.2f} x the stock "
                           "diameter: the neutral axis moves inward in bends this tight, so the "
                           "default K = 0.5 makes the stock a little long; set stock.k_factor "
                           "(about 0.35-0.45) or calibrate from a test bend", spec.name))
    if any(b.radius_mm < d / 2 for b in path.bends):
        out.append(Finding("bend-radius-below-stock", "error",
                           f"a bend's centreline radius is less than half the {d:.2f} mm stock: "
                           "it cannot be bent; use a larger radius", spec.name))
    return out


def make_plan(design: Design) -> Plan:
    """Every figure for every element, then the later stages in order."""
    elements = []
    findings: list[Finding] = []
    for spec in design.elements:
        element, found = plan_element(design, spec)
        elements.append(element)
        findings.extend(found)
    stock = design.stock
    summary = StockSummary(stock.description, stock.material.key, stock.material.name,
                           stock.material.source, stock.profile,
                           stock.profile.mass_per_m_kg(stock.material.density_kg_m3),
                           stock.source, stock.k_factor)
    plan = Plan(design, summary, tuple(elements), tuple(findings))
    for where in STEPS:
        module, func = where.split(":")
        plan = getattr(importlib.import_module(module), func)(plan)
    return plan


