"""The electrical stage of the Plan: each fed element, as it will be bent,
swept through the matching.

`apply(plan)` (listed in `fabplan.plan.STEPS`) builds a method-of-moments
model of every element that has a feed gap, sweeps it, finds the frequency
of least SWR, the resonance and the bandwidths, and adds an
`ElementElectrical` to the element and a `PlanElectrical` to the plan. The
model uses the element's bend path with the released (after-springback) radii
when the forming stage has set them, the stock's equivalent radius, the tube
wall and the material's resistivity (its RF resistivity for clad wire).

Pure: no files, no printing. Hz, ohm, mm.
"""

from __future__ import annotations

import dataclasses
import math
from typing import Any, Callable

import numpy as np

from ..errors import FabplanError, Finding
from ..geometry.path import Bend, BendPath
from ..geometry.shapes import SHAPES
from .config import ElectricalSettings
from .matching import CoaxBalun, MatchChain
from .model import UNCERTAINTY_FRAC, ElementElectrical, PlanElectrical, SweepResult

__all__ = ["apply", "check_element", "element_model", "element_path", "analyse", "least_swr",
           "resonance", "conductor", "ModelFactory", "SWR_LEVELS"]

Progress = Callable[[int], None]
ModelFactory = Callable[..., Any]
SWR_LEVELS = ("1.5", "2")
CHUNK = 8  # frequencies per solver call between progress reports
# a minimum of SWR is "broad" when it rises by less than BROAD_SWR within +-BROAD_FRAC
BROAD_FRAC = 0.01
BROAD_SWR = 0.02


# -- the model of one element ------------------------------------------------
def conductor(plan, settings: ElectricalSettings) -> dict[str, Any]:
    """Radius (mm), tube wall (mm) and resistivity (ohm m, None: perfect) of the stock."""
    profile = plan.stock.profile
    material = plan.design.stock.material
    if settings.perfect_conductor:
        rho = None
    elif settings.resistivity_ohm_m is not None:
        rho = settings.resistivity_ohm_m
    else:
        rho = material.rf_resistivity_ohm_m or material.resistivity_ohm_m
    wall = profile.wall_mm if profile.kind == "tube" else None
    return {"radius_mm": profile.equivalent_radius_mm, "tube_wall_mm": wall,
            "resistivity_ohm_m": rho}


def element_path(plan, element, params: Any = None) -> tuple[BendPath, bool]:
    """The element's bend path as it will be after release.

    `params` (the shape's params, e.g. with a new governing length) rebuilds
    the path; None uses the element's own. Where the forming stage has set the
    released radii, each bend takes its final radius (for rebuilt params, its
    own radius scaled by the element's final/design ratio for that bend, so a
    loop whose radius is the tuned length keeps its springback figure).
    Returns (path, released).
    """
    if params is None:
        path = element.path
    else:
        path = SHAPES[element.spec.shape].build(params, plan.stock.profile.outer_diameter_mm)
    forming = element.forming
    design_radii = [b.radius_mm for b in element.path.bends]
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


def element_model(plan, element, settings: ElectricalSettings, f_max_hz: float,
                  params: Any = None):
    """The method-of-moments model (`WireModel`) of one element as bent."""
    from .solver import path_model

    path, _ = element_path(plan, element, params)
    c = conductor(plan, settings)
    return path_model(path, c["radius_mm"], f_max_hz=f_max_hz,
                      resistivity_ohm_m=c["resistivity_ohm_m"], tube_wall_mm=c["tube_wall_mm"],
                      ground_z_mm=settings.ground_z_mm())


# -- reading a sweep -----------------------------------------------------------
def _sweep(model, freqs: np.ndarray, progress: Progress | None) -> np.ndarray:
    if progress is None:
        return np.asarray(model.sweep(freqs), dtype=complex)
    out = []
    for i in range(0, len(freqs), CHUNK):
        part = freqs[i:i + CHUNK]
        out.append(np.asarray(model.sweep(part), dtype=complex))
        progress(len(part))
    return np.concatenate(out)


def _gamma_sys(model, chain: MatchChain, f: float) -> float:
    z = complex(chain.at_radio(model.impedance(f), f))
    return abs((z - chain.system_ohm) / (z + chain.system_ohm))


def least_swr(model, chain: MatchChain, freqs: np.ndarray, swr_sys: np.ndarray,
              rel_tol: float = 2e-6) -> tuple[float, float, bool]:
    """Frequency (Hz) and value of least SWR through the matching, refined
    between the sweep's neighbours of its lowest point by bounded Brent search.
    Returns (f, swr, at_edge); at_edge when the lowest point is a sweep end."""
    from scipy.optimize import minimize_scalar

    i = int(np.argmin(swr_sys))
    if i == 0 or i == len(freqs) - 1:
        return float(freqs[i]), float(swr_sys[i]), True
    lo, hi = float(freqs[i - 1]), float(freqs[i + 1])
    res = minimize_scalar(lambda f: _gamma_sys(model, chain, f), bounds=(lo, hi),
                          method="bounded", options={"xatol": rel_tol * freqs[i]})
    g = float(res.fun)
    s = (1 + g) / (1 - g) if g < 1 else math.inf
    if s > swr_sys[i]:  # the grid point itself is better (a kink): keep it
        return float(freqs[i]), float(swr_sys[i]), False
    return float(res.x), s, False


def resonance(model, freqs: np.ndarray, z: np.ndarray, near_hz: float,
              rel_tol: float = 1e-7) -> float | None:
    """The reactance zero crossing nearest `near_hz` (Hz), refined by Brent's
    method; crossings from capacitive to inductive (series resonance) first."""
    from scipy.optimize import brentq

    x = z.imag
    idx = np.nonzero(np.sign(x[:-1]) * np.sign(x[1:]) <= 0)[0]
    if len(idx) == 0:
        return None
    rising = [i for i in idx if x[i] < x[i + 1]]
    pool = rising or list(idx)
    i = min(pool, key=lambda k: abs(0.5 * (freqs[k] + freqs[k + 1]) - near_hz))
    if x[i] == 0:
        return float(freqs[i])
    if x[i + 1] == 0:
        return float(freqs[i + 1])
    return float(brentq(lambda f: model.impedance(f).imag, float(freqs[i]),
                        float(freqs[i + 1]), xtol=rel_tol * float(freqs[i])))


def _crossing(f: np.ndarray, s: np.ndarray, level: float, i: int, step: int) -> float | None:
    """Walk from index i by `step` until s exceeds `level`; interpolate the crossing."""
    j = i
    while 0 <= j + step < len(f):
        k = j + step
        if s[k] > level:
            if not math.isfinite(s[k]):
                return float(f[k])
            t = (level - s[j]) / (s[k] - s[j])
            return float(f[j] + t * (f[k] - f[j]))
        j = k
    return None


def bandwidths(freqs: np.ndarray, swr_sys: np.ndarray) -> dict[str, tuple[float, float] | None]:
    """Edges (Hz) of the band around least SWR where SWR stays below each level."""
    i = int(np.argmin(swr_sys))
    out: dict[str, tuple[float, float] | None] = {}
    for key in SWR_LEVELS:
        level = float(key)
        if swr_sys[i] >= level:
            out[key] = None
            continue
        lo, hi = _crossing(freqs, swr_sys, level, i, -1), _crossing(freqs, swr_sys, level, i, 1)
        out[key] = None if lo is None or hi is None else (lo, hi)
    return out


def analyse(model, chain: MatchChain, freqs: np.ndarray, *, progress: Progress | None = None,
            near_hz: float | None = None, efficiency: bool = True
            ) -> tuple[SweepResult, dict[str, Any]]:
    """Sweep `model` over `freqs` (Hz) and read the sweep through `chain`.

    Returns the SweepResult and extras (band edges, whether least SWR lies at
    an end of the sweep).
    """
    freqs = np.asarray(freqs, dtype=float)
    z = _sweep(model, freqs, progress)
    s_term = np.atleast_1d(chain.swr_terminals(z))
    s_sys = np.atleast_1d(chain.swr_system(z, freqs))
    f_min, s_min, at_edge = least_swr(model, chain, freqs, s_sys)
    f_res = resonance(model, freqs, z, near_hz if near_hz is not None else f_min)
    edges = bandwidths(freqs, s_sys)
    eff = model.solve(f_min).efficiency if efficiency else None
    result = SweepResult(
        tuple(float(f) for f in freqs), tuple(complex(v) for v in z),
        tuple(float(v) for v in s_term), tuple(float(v) for v in s_sys),
        chain.reference_ohm, chain.system_ohm, chain.describe(), s_min, f_min, f_res,
        {k: (None if e is None else e[1] - e[0]) for k, e in edges.items()},
        None if eff is None else float(eff), UNCERTAINTY_FRAC)
    extra = {"bandwidth_edges_hz": {k: (None if e is None else [e[0], e[1]])
                                    for k, e in edges.items()},
             "least_swr_at_sweep_end": at_edge}
    return result, extra


# -- the stage -----------------------------------------------------------------
def check_element(plan, element, settings: ElectricalSettings, *,
                  progress: Progress | None = None,
                  factory: ModelFactory = element_model) -> tuple[ElementElectrical, list[Finding]]:
    """Sweep one element through the matching; its findings beside it."""
    freqs = settings.frequencies()
    model = factory(plan, element, settings, float(freqs[-1]))
    result, extra = analyse(model, settings.chain, freqs, progress=progress,
                            near_hz=settings.target_hz)
    _, released = element_path(plan, element)
    c = conductor(plan, settings)
    rho = c["resistivity_ohm_m"]
    geometry = ("as bent, with the released (after-springback) bend radii" if released else
                "as designed (no forming figures: the design's bend radii)")
    geometry += (f"; conductor radius {c['radius_mm']:.3f} mm"
                 + (f", tube wall {c['tube_wall_mm']:.3f} mm" if c["tube_wall_mm"] else "")
                 + ("; perfect conductor" if rho is None else f"; resistivity {rho:.3g} ohm m")
                 + f"; {settings.ground_text()}")
    extra.update({"geometry": geometry, "released_radii": released,
                  "conductor_radius_mm": c["radius_mm"], "tube_wall_mm": c["tube_wall_mm"],
                  "resistivity_ohm_m": rho, "ground": settings.ground,
                  "ground_height_mm": settings.ground_height_mm})
    findings = [dataclasses.replace(f, element=element.name)
                for f in getattr(model, "findings", ())]
    findings += _findings(element.name, settings, result, extra)
    notes = ("measured SWR depends on the surroundings (mast, boom, nearby metal, height) and "
             "on the feed line and its routing; the prediction is for the element alone",)
    return ElementElectrical(settings.target_hz, result, int(model.unknowns), notes,
                             extra), findings


def _findings(name: str, settings: ElectricalSettings, r: SweepResult,
              extra: dict[str, Any]) -> list[Finding]:
    out = []
    if extra["least_swr_at_sweep_end"]:
        out.append(Finding("em-least-swr-at-sweep-end", "warning",
                           f"the SWR is least at the end of the sweep ({r.min_swr_hz / 1e6:.3f} "
                           "MHz): the true minimum lies outside it; widen [electrical] sweep",
                           name))
    t = settings.target_hz
    by_resonance = getattr(settings, "tune_for", "least-swr") == "resonance"
    f_hz = r.resonance_hz if by_resonance else r.min_swr_hz
    what = "resonance" if by_resonance else "least SWR"
    if t is not None and f_hz is None:
        out.append(Finding("em-off-target", "warning",
                           "no resonance (reactance zero) in the sweep: the element is far from "
                           "the target or the sweep too narrow; widen [electrical] sweep", name))
    elif t is not None:
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


def apply(plan, *, settings: ElectricalSettings | None = None,
          progress: Progress | None = None, factory: ModelFactory = element_model):
    """The Plan with each fed element's electrical check (unchanged when the
    design has no [electrical] table and no `settings` are given)."""
    settings = settings if settings is not None else plan.design.electrical
    if settings is None:
        return plan
    elements = []
    findings = list(plan.findings)
    for e in plan.elements:
        if e.gap_mm is None:
            findings.append(Finding("em-not-fed", "info",
                                    "no feed gap: the electrical check covers fed elements only "
                                    "(a parasitic element's effect on the fed one is not "
                                    "modelled)", e.name))
            elements.append(e)
            continue
        try:
            ee, found = check_element(plan, e, settings, progress=progress, factory=factory)
        except FabplanError as exc:
            findings.append(Finding("em-model-limits", "warning",
                                    f"no electrical check: {exc}", e.name))
            elements.append(e)
            continue
        findings.extend(found)
        elements.append(dataclasses.replace(e, electrical=ee))
    return dataclasses.replace(plan, elements=tuple(elements), findings=tuple(findings),
                               electrical=plan_electrical(settings))
