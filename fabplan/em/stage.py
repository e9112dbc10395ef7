"""The electrical stage: each fed element, as it will be bent, swept through the matching.

For every element that has a feed gap: a method-of-moments model of the
element as bent (the released, after-springback bend radii where the forming
stage has them; the stock's equivalent radius, tube wall and resistivity, its
RF resistivity for clad wire), swept over the design's band; the frequency of
least SWR, the resonance and the bandwidths; and the design-wide figures (the
balun loop's cut length, the feed line's loss, the cautions).

Pure: no files, no printing. Hz, ohm, mm.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..design.electrical import ElectricalSettings
from ..design.model import ElementSpec, StockSpec
from ..errors import FabplanError, Finding
from ..feed import CoaxBalun
from ..forming.records import ElementForming
from ..geometry.path import Bend, BendPath
from ..geometry.shapes import SHAPES
from ..lengths.records import PieceCore
from .records import UNCERTAINTY_FRAC, ElementElectrical, PlanElectrical, SweepResult
from .sweep import Model, Progress, analyse

__all__ = ["ElectricalInput", "Conductor", "ModelFactory", "electrical", "check_element",
           "element_model", "element_path", "conductor", "plan_electrical"]

# a minimum of SWR is "broad" when it rises by less than BROAD_SWR within +-BROAD_FRAC
BROAD_FRAC = 0.01
BROAD_SWR = 0.02


@dataclass(frozen=True)
class ElectricalInput:
    """What the electrical stage models of one element: its spec (shape and
    dimensions, to rebuild it when tuning), its stock, and its piece of stock
    with the forming figures (for the released bend radii)."""

    spec: ElementSpec
    stock: StockSpec
    piece: PieceCore
    forming: ElementForming | None

    @property
    def name(self) -> str:
        return self.spec.name

    @property
    def gap_mm(self) -> float | None:
        return self.piece.gap_mm


@dataclass(frozen=True)
class Conductor:
    """The conductor the model uses: radius and tube wall (mm), resistivity (ohm m,
    None for a perfect conductor)."""

    radius_mm: float
    tube_wall_mm: float | None
    resistivity_ohm_m: float | None


ModelFactory = Callable[[ElectricalInput, ElectricalSettings, float, Any], Model]


# -- the model of one element ------------------------------------------------
def conductor(stock: StockSpec, settings: ElectricalSettings) -> Conductor:
    """Radius, tube wall and resistivity of the stock as the model sees them."""
    profile = stock.profile
    material = stock.material
    rho: float | None
    if settings.perfect_conductor:
        rho = None
    elif settings.resistivity_ohm_m is not None:
        rho = settings.resistivity_ohm_m
    else:
        rho = material.rf_resistivity_ohm_m or material.resistivity_ohm_m
    wall = profile.wall_mm if profile.kind == "tube" else None
    return Conductor(profile.equivalent_radius_mm, wall, rho)


def element_path(element: ElectricalInput, params: Any = None) -> tuple[BendPath, bool]:
    """The element's bend path as it will be after release.

    `params` (the shape's params, e.g. with a new governing length) rebuilds
    the path; None uses the element's own. Where the forming stage has set the
    released radii, each bend takes its final radius (for rebuilt params, its
    own radius scaled by the element's final/design ratio for that bend, so a
    loop whose radius is the tuned length keeps its springback figure).
    Returns (path, released).
    """
    if params is None:
        path = element.piece.path
    else:
        path = SHAPES[element.spec.shape].build(params, element.stock.profile.outer_diameter_mm)
    forming = element.forming
    design_radii = [b.radius_mm for b in element.piece.path.bends]
    if forming is None or len(path.bends) != len(design_radii):
        return path, False
    # a bend that springs straight (infinite final radius) is already an error
    # finding; the model keeps its design radius rather than an unbendable one
    ratios = {b.index: b.final_radius_mm / design_radii[b.index - 1] for b in forming.bends
              if 1 <= b.index <= len(design_radii) and math.isfinite(b.final_radius_mm)}
    pieces = []
    index = 0
    for piece in path.pieces:
        if isinstance(piece, Bend):
            index += 1
            radius = piece.radius_mm * ratios.get(index, 1.0)
            piece = dataclasses.replace(piece, radius_mm=radius)
        pieces.append(piece)
    return dataclasses.replace(path, pieces=tuple(pieces), _cache={}), True


def element_model(element: ElectricalInput, settings: ElectricalSettings, f_max_hz: float,
                  params: Any = None) -> Model:
    """The method-of-moments model (`WireModel`) of one element as bent."""
    from .solver import path_model

    path, _ = element_path(element, params)
    c = conductor(element.stock, settings)
    return path_model(path, c.radius_mm, f_max_hz=f_max_hz,
                      resistivity_ohm_m=c.resistivity_ohm_m, tube_wall_mm=c.tube_wall_mm,
                      ground_z_mm=settings.ground_z_mm())


# -- the stage -----------------------------------------------------------------
def check_element(element: ElectricalInput, settings: ElectricalSettings, *,
                  progress: Progress | None = None,
                  factory: ModelFactory = element_model) -> tuple[ElementElectrical,
                                                                  list[Finding]]:
    """Sweep one element through the matching; its findings beside it."""
    freqs = settings.frequencies()
    model = factory(element, settings, float(freqs[-1]), None)
    chain = settings.chain
    result, at_edge = analyse(model, chain, freqs, progress=progress,
                              near_hz=settings.target_hz)
    _, released = element_path(element)
    c = conductor(element.stock, settings)
    rho = c.resistivity_ohm_m
    geometry = ("as bent, with the released (after-springback) bend radii" if released else
                "as designed (no forming figures: the design's bend radii)")
    geometry += (f"; conductor radius {c.radius_mm:.3f} mm"
                 + (f", tube wall {c.tube_wall_mm:.3f} mm" if c.tube_wall_mm else "")
                 + ("; perfect conductor" if rho is None else f"; resistivity {rho:.3g} ohm m")
                 + f"; {settings.ground_text()}")
    findings = [dataclasses.replace(f, element=element.name)
                for f in getattr(model, "findings", ())]
    findings += _findings(element.name, settings, result, at_edge)
    notes = ("measured SWR depends on the surroundings (mast, boom, nearby metal, height) and "
             "on the feed line and its routing; the prediction is for the element alone",)
    return ElementElectrical(settings.target_hz, result, int(model.unknowns), notes,
                             at_edge, geometry, released, c.radius_mm, c.tube_wall_mm, rho,
                             settings.ground, settings.ground_height_mm), findings


def _findings(name: str, settings: ElectricalSettings, r: SweepResult,
              at_edge: bool) -> list[Finding]:
    out = []
    if at_edge:
        out.append(Finding("em-least-swr-at-sweep-end", "warning",
                           f"the SWR is least at the end of the sweep ({r.min_swr_hz / 1e6:.3f} "
                           "MHz): the true minimum lies outside it; widen [electrical] sweep",
                           name))
    t = settings.target_hz
    by_resonance = getattr(settings, "tune_for", "least-swr") == "resonance"
    f_hz = r.resonance_hz if by_resonance else r.min_swr_hz
    what = "resonance" if by_resonance else "least SWR"
    if t is not None and f_hz is None:  # no resonance found
        out.append(Finding("em-off-target", "warning",
                           "no resonance (reactance zero) in the sweep: the element is far from "
                           "the target or the sweep too narrow; widen [electrical] sweep", name))
    elif t is not None and f_hz is not None:
        off = f_hz / t - 1
        if abs(off) > UNCERTAINTY_FRAC:
            out.append(Finding("em-off-target", "warning",
                               f"{what} falls at {f_hz / 1e6:.3f} MHz, {100 * off:+.2f} "
                               f"% from the {t / 1e6:.3f} MHz target (more than the "
                               f"+-{100 * UNCERTAINTY_FRAC:.1f} % uncertainty): run `fabplan tune` "
                               "for the length that puts it on target", name))
    f, sw = np.asarray(r.freq_hz), np.asarray(r.swr_system)
    near = [r.min_swr_hz * (1 - BROAD_FRAC), r.min_swr_hz * (1 + BROAD_FRAC)]
    if (f[0] <= near[0] and near[1] <= f[-1]
            and np.all(np.interp(near, f, sw) - r.min_swr < BROAD_SWR)):
        out.append(Finding("em-broad-swr-minimum", "info",
                           f"the SWR through the matching stays within {BROAD_SWR:g} of its "
                           f"least value ({r.min_swr:.2f}) from {near[0] / 1e6:.1f} to "
                           f"{near[1] / 1e6:.1f} MHz: the frequency of least SWR is poorly "
                           "defined and hard to measure; tune for resonance (tune_for = "
                           "\"resonance\") or judge by the middle of the SWR 1.5 band", name))
    if r.min_swr > 2:
        out.append(Finding("em-high-swr", "warning",
                           f"the least SWR through the matching is {r.min_swr:.2f}: the matching "
                           f"({r.matching}) does not suit this element's "
                           "impedance; check [electrical.matching]", name))
    return out


def plan_electrical(settings: ElectricalSettings) -> PlanElectrical:
    """The design-wide figures: the balun loop's cut length, cautions."""
    chain = settings.chain
    m = chain.matching
    centre = settings.target_hz or 0.5 * (settings.sweep_from_hz + settings.sweep_to_hz)
    loop = m.loop_length_mm if isinstance(m, CoaxBalun) else None
    cable = (f"{m.z0_ohm:g} ohm coaxial cable (velocity factor {m.velocity_factor:g})"
             if isinstance(m, CoaxBalun) else None)
    loss = (float(chain.feed_line.matched_loss_db(centre)) if chain.feed_line is not None
            else None)
    power = (f"at {settings.power_w:g} W" if settings.power_w is not None
             else "at the planned transmitter power")
    cautions = (
        f"RF exposure: {power} the field close to the element can exceed the exposure limits; "
        "evaluate against the national limits (e.g. 47 CFR 1.1310 in the US, ICNIRP 2020 "
        "guidelines) and keep people away from the element while transmitting.",
        "Measured SWR depends on the surroundings and on the feed line (its length, routing and "
        "any current on its outside): check the first article in its final position before "
        "building the rest.",
    )
    return PlanElectrical(chain.describe(), settings.ground_text(),
                          False, loop, cable, loss, settings.power_w, cautions)


def electrical(elements: Sequence[ElectricalInput | None], settings: ElectricalSettings, *,
               progress: Progress | None = None, factory: ModelFactory = element_model
               ) -> tuple[tuple[ElementElectrical | None, ...], PlanElectrical,
                          tuple[Finding, ...]]:
    """The electrical check of every element (None for one not modelled: a
    `None` input, or an element without a feed gap), the design-wide figures
    and the findings."""
    out: list[ElementElectrical | None] = []
    findings: list[Finding] = []
    for e in elements:
        if e is None:
            out.append(None)
            continue
        if e.gap_mm is None:
            findings.append(Finding("em-not-fed", "info",
                                    "no feed gap: the electrical check covers fed elements only "
                                    "(a parasitic element's effect on the fed one is not "
                                    "modelled)", e.name))
            out.append(None)
            continue
        try:
            ee, found = check_element(e, settings, progress=progress, factory=factory)
        except FabplanError as exc:
            findings.append(Finding("em-model-limits", "warning",
                                    f"no electrical check: {exc}", e.name))
            out.append(None)
            continue
        findings.extend(found)
        out.append(ee)
    return tuple(out), plan_electrical(settings), tuple(findings)
