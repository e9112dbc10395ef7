"""The electrical stage: the antenna as it will be bent and assembled, swept.

Every element with a placement is modelled together as one structure (the
assembled antenna); every other element alone. A structure with a feed is
modelled by the method of moments (fabplan.em.solver) as bent (the released,
after-springback bend radii), swept over the design's band by a rational fit
through a handful of full solves (fabplan.em.fitting), and read through the
matching chain: least SWR, resonance, bandwidths. At the design frequency (the
target, or the sweep's centre) the far field gives the gain, directivity,
front-to-back and -rear ratios, beamwidths, polarisation and the pattern's
principal cuts; the near field gives every load's current and voltage at the
design's power, and a tuned capacitor's value.

Pure: no files, no printing. Hz, ohm, mm, W.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable, Mapping, Sequence
from typing import Any

import numpy as np

from ..design.electrical import ElectricalSettings
from ..errors import FabplanError, Finding
from ..feed import CoaxBalun
from .build import ElectricalInput, build_structure, conductor, gap_points, groups, released_paths
from .devices import Through, line_match
from .loop import helix_figures, loop_cautions, loop_figures
from .records import (
    UNCERTAINTY_FRAC,
    BandFigures,
    ElementElectrical,
    FarFieldFigures,
    LoadFigures,
    PatternCut,
    PlanElectrical,
    StructureElectrical,
    SweepResult,
    WirePicture,
)
from .sweep import Progress, analyse

__all__ = ["ModelFactory", "electrical", "check_structure", "structure_model_of",
           "plan_electrical", "design_frequency", "DEFAULT_POWER_W", "CUT_STEP_DEG"]

# a minimum of SWR is "broad" when it rises by less than BROAD_SWR within +-BROAD_FRAC
BROAD_FRAC = 0.01
BROAD_SWR = 0.02
DEFAULT_POWER_W = 100.0  # the near-field figures' power when the design gives none
CUT_STEP_DEG = 2.0  # the pattern cuts' step
FIT_RTOL = 1e-7  # the rational fit reproduces fresh solves to this (relative)
POWER_BALANCE_TOL = 1e-2  # a larger gap between input and loss + radiated is a finding
ELLIPTICAL_AR_DB = 6.0  # a larger axial ratio is reported as elliptical
CIRCULAR_AR_DB = 10.0  # at most this: circularly polarised (zenith and low-angle gains given)
LOW_ELEVATION_DEG = 10.0  # the low-elevation gain of a circularly polarised antenna

# (the group's elements, settings, top frequency, other params by element name) -> model
ModelFactory = Callable[[Sequence[ElectricalInput], ElectricalSettings, float,
                         Mapping[str, Any]], Any]


def structure_model_of(elements: Sequence[ElectricalInput], settings: ElectricalSettings,
                       f_max_hz: float, overrides: Mapping[str, Any]) -> Any:
    """The method-of-moments model (`WireModel`) of the elements modelled together."""
    from .solver import structure_model

    structure, _ = build_structure(elements, settings, overrides)
    return structure_model(structure, f_max_hz=f_max_hz)


class _Fitted:
    """The sweep as a rational fit: impedance, efficiency and the gains forward and
    back at any frequency in the band, from the fit (the `Model` a sweep reads)."""

    def __init__(self, fit: Any, unknowns: int) -> None:
        self.fit = fit
        self.unknowns = unknowns

    def sweep(self, f_hz: np.ndarray) -> np.ndarray:
        return np.asarray(self.fit.values(np.asarray(f_hz, dtype=float), 0), dtype=complex)

    def impedance(self, f_hz: float) -> complex:
        return complex(self.sweep(np.array([f_hz]))[0])

    def solve(self, f_hz: float) -> Any:
        eff = float(self.fit.values(np.array([f_hz]), 1)[0].real)

        class _Efficiency:
            efficiency = eff

        return _Efficiency()


def _group_names(elements: Sequence[ElectricalInput]) -> str:
    return ", ".join(e.name for e in elements)


def design_frequency(settings: ElectricalSettings) -> float:
    """The frequency (Hz) the check solves the structure at for its far field and a
    gamma or T match's open capacitor: the target, or the sweep's middle."""
    if settings.target_hz is not None:
        return float(settings.target_hz)
    freqs = settings.frequencies()
    return 0.5 * (float(freqs[0]) + float(freqs[-1]))


def check_structure(elements: Sequence[ElectricalInput], settings: ElectricalSettings, *,
                    progress: Progress | None = None,
                    factory: ModelFactory = structure_model_of
                    ) -> tuple[StructureElectrical, SweepResult, bool, list[Finding]]:
    """Model the elements together; sweep the feed through the matching; the far
    field and the near field at the design frequency. Returns the structure's
    figures, the feed's sweep, whether least SWR lies at an end of the sweep, and
    the findings (each naming the element it is about)."""
    from .farfield import far_field
    from .fitting import fit_sweep

    freqs = settings.frequencies()
    f_lo, f_hi = float(freqs[0]), float(freqs[-1])
    f0 = design_frequency(settings)
    band_top = settings.band_hz[1] if settings.band_hz is not None else f0
    model = factory(elements, settings, max(f_hi, f0, band_top), {})
    fed = [e.name for e in elements if e.fed]
    first = fed[0] if fed else elements[0].name
    findings = [_name(f, first) for f in getattr(model, "findings", ())]
    # the design frequency: far field, forward and back directions, near field
    sol0 = model.solve(f0)
    ff = far_field(sol0, model)
    beam = ff.beam()
    fwd = (math.radians(beam.forward_theta_deg), math.radians(beam.forward_phi_deg))
    back = (None if beam.back_theta_deg is None or beam.back_phi_deg is None else
            (math.radians(beam.back_theta_deg), math.radians(beam.back_phi_deg)))
    solves = [0]
    widths: dict[float, tuple[float, float]] = {}

    def solve(f_hz: float) -> np.ndarray:
        sol = model.solve(f_hz)
        solves[0] += 1
        if progress is not None:
            progress(1)
        field = far_field(sol, model)
        b = field.beam((beam.forward_theta_deg, beam.forward_phi_deg))
        widths[f_hz] = (math.nan if b.beamwidth_h_deg is None else b.beamwidth_h_deg,
                        math.nan if b.beamwidth_v_deg is None else b.beamwidth_v_deg)
        g_f = float(field.gain(np.array(fwd[0]), np.array(fwd[1])))
        g_b = (float(field.gain(np.array(back[0]), np.array(back[1]))) if back is not None
               else 0.0)
        return np.array([sol.z_in, sol.efficiency, g_f, g_b], dtype=complex)

    # the sweep has 3 points at least; where to solve next is chosen by the impedance,
    # and every fresh solve checks the efficiency and gains too
    fit = fit_sweep(solve, f_lo, f_hi, rtol=FIT_RTOL, guide=1)
    fitted: Any = _Fitted(fit, int(model.unknowns))
    # a gamma or T match: the sweep is read at the device's input (fabplan.em.devices)
    device = line_match(elements)
    if device is not None:
        device = device.solved_for(fitted.impedance(f0), f0)
        fitted = Through(fitted, device)
    result, at_edge = analyse(fitted, settings.chain, freqs, near_hz=settings.target_hz)
    if device is not None:
        result = dataclasses.replace(result, matching=f"{device.describe()}, then "
                                                      f"{result.matching}")
    g_f, g_b = fit.values(freqs, 2).real, fit.values(freqs, 3).real
    band = BandFigures(tuple(float(f) for f in freqs), tuple(_db(x) for x in g_f),
                       tuple(None if back is None or not (a > 0 and b > 0) else
                             10 * math.log10(a / b) for a, b in zip(g_f, g_b)),
                       *_widths_at(widths, freqs))
    far = _far_field_figures(ff, beam, f0, findings, first)
    power, stated = ((settings.power_w, True) if settings.power_w is not None
                     else (DEFAULT_POWER_W, False))
    loads = _loads(sol0, model, power, elements)
    if device is not None:
        loads += tuple(device.loads(complex(sol0.z_in), f0, power))
    findings += _load_findings(loads, power)
    loop, found = loop_figures(elements, settings, model, sol0, f0, power, loads)
    helix, found_helix = helix_figures(elements, sol0, power)
    findings += found + found_helix
    structure, owners = build_structure(elements, settings)
    feeds, load_pts = gap_points(structure)
    figures = StructureElectrical(
        tuple(e.name for e in elements), tuple(fed), int(model.unknowns), f0, power, stated,
        far, band, loads, sol0.at_power(power).i_max_rms_a if sol0.p_in_w > 0 else 0.0,
        far.efficiency if far is not None else float(sol0.efficiency),
        _pictures(structure, owners), tuple(feeds), tuple(load_pts),
        settings.ground_z_mm(), solves[0] + 1, loop, helix)
    return figures, result, at_edge, findings


def _widths_at(widths: Mapping[float, tuple[float, float]], freqs: np.ndarray
               ) -> tuple[tuple[float | None, ...], tuple[float | None, ...]]:
    """The beamwidths at each frequency, interpolated linearly between the solved ones
    (None where a neighbouring solve found no half-power edge)."""
    fs = np.array(sorted(widths))
    out: list[tuple[float | None, ...]] = []
    for k in range(2):
        w = np.array([widths[f][k] for f in fs])
        vals = np.interp(freqs, fs, w)
        out.append(tuple(float(v) if math.isfinite(v) else None for v in vals))
    return out[0], out[1]


def _name(f: Finding, element: str) -> Finding:
    return f if f.element else Finding(f.code, f.severity, f.message, element)


def _db(x: float) -> float | None:
    return 10 * math.log10(x) if x > 0 and math.isfinite(x) else None


def _cut(c: Any) -> PatternCut:
    return PatternCut(c.plane, float(c.fixed_deg), tuple(float(a) for a in c.angle_deg),
                      tuple(float(v) if math.isfinite(v) else None for v in c.value_db))


def _far_field_figures(ff: Any, beam: Any, f0: float, findings: list[Finding],
                       element: str) -> FarFieldFigures | None:
    balance = ff.power_balance()
    if abs(balance.error) > POWER_BALANCE_TOL:
        findings.append(Finding(
            "em-power-balance", "warning",
            f"the power into the model and the power radiated plus lost differ by "
            f"{100 * balance.error:.1f} %: the mesh is too coarse for this structure; the gain "
            "and efficiency are uncertain", element))
    cuts = ff.cuts(step_deg=CUT_STEP_DEG)
    pol = ff.polarisation(beam.forward_theta_deg, beam.forward_phi_deg)
    directivity = float(ff.directivity_dbi(np.array(math.radians(beam.forward_theta_deg)),
                                           np.array(math.radians(beam.forward_phi_deg))))
    axial = pol.axial_ratio_db if math.isfinite(pol.axial_ratio_db) else None
    sense = _sense(pol.sense, axial)
    return FarFieldFigures(f0, float(beam.forward_dbi), directivity, float(balance.efficiency),
                           float(beam.forward_theta_deg), float(beam.forward_phi_deg),
                           beam.front_to_back_db, beam.front_to_rear_db, beam.beamwidth_h_deg,
                           beam.beamwidth_v_deg, axial, sense, float(balance.error),
                           _cut(cuts.azimuth), _cut(cuts.elevation),
                           *_circular(ff, axial))


def _sense(sense: str, axial: float | None) -> str:
    out = sense if sense in ("right", "left", "linear") else "linear"
    if out in ("right", "left") and axial is not None and axial > ELLIPTICAL_AR_DB:
        out = f"elliptical, {out}-hand"
    return out


def _circular(ff: Any, axial: float | None) -> tuple[float | None, float | None, float | None,
                                                      float | None, str | None]:
    """For a circularly polarised antenna (axial ratio at most CIRCULAR_AR_DB towards the
    maximum or the zenith): gain towards the zenith, gain at LOW_ELEVATION_DEG averaged
    over the azimuth (dBi, from the mean power gain), and the zenith's axial ratio and
    sense."""
    up = ff.polarisation(0.0, 0.0)
    ar_up = up.axial_ratio_db if math.isfinite(up.axial_ratio_db) else None
    if not any(a is not None and a <= CIRCULAR_AR_DB for a in (axial, ar_up)):
        return None, None, None, None, None
    theta = math.radians(90.0 - LOW_ELEVATION_DEG)
    phi = np.radians(np.arange(0.0, 360.0, CUT_STEP_DEG))
    low = float(np.mean(ff.gain(np.full(phi.shape, theta), phi)))
    return (_db(float(ff.gain(np.array(0.0), np.array(0.0)))), _db(low), LOW_ELEVATION_DEG,
            ar_up, _sense(up.sense, ar_up))


def _loads(sol: Any, model: Any, power_w: float,
           elements: Sequence[ElectricalInput]) -> tuple[LoadFigures, ...]:
    if not len(sol.load_names) or not sol.p_in_w > 0:
        return ()
    at = sol.at_power(power_w)
    by_name = {f"{e.name} capacitor": e for e in elements}
    out = []
    for name, z in zip(sol.load_names, sol.load_impedances):
        if complex(z) == 0:  # a short (a fitting's joint): nothing to rate
            continue
        g = at.gap(name)
        e = by_name.get(name)
        cap = e.spec.capacitor if e is not None else None
        solved = cap is not None and cap.capacitance_f is None
        c_f = (sol.capacitance_f if solved else (cap.capacitance_f if cap is not None else None))
        v_rms = g.voltage_rms_v
        out.append(LoadFigures(name, e.name if e is not None else "", c_f, solved, complex(z),
                               g.current_rms_a, v_rms, v_rms * math.sqrt(2),
                               float((g.current_rms_a ** 2) * complex(z).real),
                               cap.rating_v if cap is not None else None))
    return tuple(out)


def _load_findings(loads: Sequence[LoadFigures], power_w: float) -> list[Finding]:
    out = []
    for ld in loads:
        if ld.rating_v is not None and ld.voltage_v_peak > ld.rating_v:
            out.append(Finding(
                "em-capacitor-overvoltage", "error",
                f"at {power_w:g} W the capacitor sees {ld.voltage_v_peak:.0f} V peak "
                f"({ld.voltage_v_rms:.0f} V RMS), more than its {ld.rating_v:.0f} V rating: use "
                "a capacitor rated higher (vacuum variable, or wider plate spacing) or less "
                "power", ld.element))
    return out


def _pictures(structure: Any, owners: Sequence[str]) -> tuple[WirePicture, ...]:
    out = []
    for w, owner in zip(structure.wires, owners):
        pts, _ = w.path.sample(max(w.path.centreline_length() / 200, 0.5))
        world = w.placement.apply(pts)
        out.append(WirePicture(owner, tuple((float(p[0]), float(p[1]), float(p[2]))
                                            for p in world)))
    return tuple(out)


def _element_result(e: ElectricalInput, settings: ElectricalSettings, result: SweepResult,
                    at_edge: bool, unknowns: int, index: int) -> ElementElectrical:
    _, _, released = released_paths(e)
    c = conductor(e.stock, settings)
    rho = c.resistivity_ohm_m
    geometry = ("as bent, with the released (after-springback) bend radii" if released else
                "as designed (no forming figures: the design's bend radii)")
    geometry += (f"; conductor radius {c.radius_mm:.3f} mm"
                 + (f", tube wall {c.tube_wall_mm:.3f} mm" if c.tube_wall_mm else "")
                 + ("; perfect conductor" if rho is None else f"; resistivity {rho:.3g} ohm m")
                 + f"; {settings.ground_text()}")
    notes = ("measured SWR depends on the surroundings (mast, boom, nearby metal, height) and "
             "on the feed line and its routing; the prediction is for the antenna as modelled",)
    return ElementElectrical(settings.target_hz, result, unknowns, notes, at_edge, geometry,
                             released, c.radius_mm, c.tube_wall_mm, rho, settings.ground,
                             settings.ground_height_mm, index)


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
               progress: Progress | None = None, factory: ModelFactory = structure_model_of,
               strict: bool = False
               ) -> tuple[tuple[ElementElectrical | None, ...], PlanElectrical,
                          tuple[Finding, ...]]:
    """The electrical check of every structure (the placed elements together, each
    other element alone): each fed element's sweep (None for an element not fed or
    not modelled), the design-wide figures with every structure's, and the findings.

    A structure the model cannot take (too thick, too many unknowns, over the memory
    bound) becomes a finding, or, with `strict` (a command that asked for the
    electrical check), the error itself."""
    import dataclasses

    out: list[ElementElectrical | None] = [None] * len(elements)
    findings: list[Finding] = []
    structures: list[StructureElectrical] = []
    for group in groups(elements):
        members = [e for e in (elements[i] for i in group) if e is not None]
        if not any(e.fed for e in members):
            for e in members:
                if e.spec.capacitor is not None:
                    findings.append(Finding(
                        "em-not-fed", "warning",
                        "its capacitor's loop has no feed modelled with it: place the coupling "
                        "loop (or the feed) with the loop so the pair is modelled together",
                        e.name))
                else:
                    findings.append(Finding(
                        "em-not-fed", "info",
                        "no feed gap: the electrical check models fed elements and the elements "
                        "placed with them; give this element a placement with the fed one to "
                        "include it", e.name))
            continue
        try:
            figures, result, at_edge, found = check_structure(members, settings,
                                                              progress=progress,
                                                              factory=factory)
        except FabplanError as exc:
            if strict:
                raise
            for e in members:
                if e.fed:
                    findings.append(Finding("em-model-limits", "warning",
                                            f"no electrical check: {exc}", e.name))
            continue
        findings += found
        index = len(structures)
        structures.append(figures)
        for i in group:
            member = elements[i]
            if member is not None and member.fed:
                out[i] = _element_result(member, settings, result, at_edge, figures.unknowns,
                                         index)
                findings += _findings(member.name, settings, result, at_edge)
    plan = plan_electrical(settings)
    extra = tuple(c for st in structures if st.loop is not None for c in loop_cautions(st.loop))
    plan = dataclasses.replace(plan, structures=tuple(structures),
                               cautions=plan.cautions + extra)
    return tuple(out), plan, tuple(findings)
