"""A capacitor-tuned small transmitting loop, and two loops fed in parallel (a
quadrifilar helix): the figures the electrical stage adds for them.

For a structure with a capacitor in an element's gap (the main loop) and a fed
element beside it (the coupling loop), at the design frequency and power:

- the published small-loop formulas (fabplan.antennas.small_loop: Balanis's
  radiation resistance, Grover's ring or polygon inductance, the skin-effect
  loss) beside the method-of-moments model of the loop alone, its gap driven
  (inductance X / omega, radiation and conductor resistance 2 P / |I|^2);
- the assembled antenna from the model: everything the input power goes to,
  referred to the capacitor's current, R = 2 P_in / |I_C|^2 (radiation, conductor,
  joints, the capacitor's ESR and the coupling loop's share); the unloaded Q =
  X_C / R (X_C the capacitor's reactance, equal to the loop's at resonance),
  loaded Q = Q / 2 when the feed is matched, the half-power bandwidth f / Q_L and
  the SWR 2 bandwidth f (s - 1) / (Q sqrt(s)) (Yaghjian & Best, "Impedance,
  bandwidth, and Q of antennas", IEEE Trans. Antennas Propag. 53(4), 2005 [M]);
- the capacitor retuned at frequencies across `[electrical] band` (the model
  solves the capacitance for X = 0 at the feed at each): its range, its voltage
  and current at the design power (the worst voltage is at the low end);
- the coupling loop: the rule of thumb (a fifth of the main loop's diameter,
  common practice, no source [P]) and the SWR the model gives with the coupling
  loop as drawn, with a finding when it is far off.

Pure: no files, no printing. Hz, ohm, H, F, V, A, W, mm.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Sequence
from typing import Any

import numpy as np

from ..antennas.small_loop import (
    SMALL_LOOP_MAX_WL,
    coupling_loop,
    loop_inductance_h,
    radiation_resistance_ohm,
    small_loop_findings,
)
from ..antennas.small_loop import conductor_loss_ohm as skin_loss_ohm
from ..design.electrical import ElectricalSettings
from ..errors import FabplanError, Finding
from ..geometry.shapes import SHAPES
from ..units import format_impedance
from .build import ElectricalInput, conductor, joint_count, joint_resistance_ohm
from .records import HelixFigures, LoadFigures, LoopBandPoint, LoopFigures

__all__ = ["loop_figures", "loop_cautions", "helix_figures", "BAND_POINTS", "COUPLING_SWR",
           "QUADRATURE_TOL_DEG", "capacitor_voltage_v"]

BAND_POINTS = 5  # frequencies across [electrical] band where the capacitor is retuned
COUPLING_SWR = 2.0  # the coupling loop's SWR at resonance above this is "far off"
QUADRATURE_TOL_DEG = 20.0  # two loops' currents further than this from 90 deg apart
REACH_FRAC = 0.01  # a tuned feed whose |X| exceeds this share of |Z| missed X = 0
_C0_MM_S = 299_792_458_000.0


def capacitor_voltage_v(power_w: float, resistance_ohm: float, reactance_ohm: float) -> float:
    """RMS voltage (V) across the capacitor of a matched series-resonant loop taking
    `power_w`: I = sqrt(P / R), V = I X (the series resonant circuit)."""
    return reactance_ohm * math.sqrt(power_w / resistance_ohm)


def _capacitor_element(elements: Sequence[ElectricalInput]) -> ElectricalInput | None:
    for e in elements:
        if e.spec.capacitor is not None and any(g.role != "joint" for g in e.geometry.gaps):
            return e
    return None


def _small_loop(e: ElectricalInput) -> Any:
    make = SHAPES[e.spec.shape].small_loop
    if make is None:
        return None
    try:
        return make(e.spec.params, e.stock.profile.outer_diameter_mm)
    except FabplanError:  # too thick for the formulas: the model alone speaks
        return None


def _perimeter_mm(e: ElectricalInput) -> float:
    return (sum(p.path.centreline_length() for p in e.geometry.pieces)
            + sum(g.width_mm for g in e.geometry.gaps))


def _alone(e: ElectricalInput, settings: ElectricalSettings, f_hz: float
           ) -> tuple[float, float, float]:
    """The loop alone, its gap driven: (inductance H, radiation and conductor
    resistance ohm, per the gap's current)."""
    from .stage import structure_model_of

    spec = dataclasses.replace(e.spec, capacitor=None, placement=None)
    model = structure_model_of([dataclasses.replace(e, spec=spec)], settings, f_hz, {})
    sol = model.solve(f_hz)
    i2 = abs(complex(sol.port_currents[0])) ** 2
    omega = 2 * math.pi * f_hz
    return (sol.z_in.imag / omega, 2 * (sol.p_in_w - sol.p_loss_w) / i2,
            2 * sol.p_conductor_w / i2)


def loop_figures(elements: Sequence[ElectricalInput], settings: ElectricalSettings, model: Any,
                 sol: Any, f_hz: float, power_w: float, loads: Sequence[LoadFigures]
                 ) -> tuple[LoopFigures | None, list[Finding]]:
    """The loop's figures and findings (None when no element of the structure holds a
    capacitor with a fed element beside it)."""
    e = _capacitor_element(elements)
    fed = tuple(x.name for x in elements if x.fed)
    cap_name = f"{e.name} capacitor" if e is not None else ""
    load = next((ld for ld in loads if ld.name == cap_name), None)
    if e is None or not fed or load is None or e.spec.capacitor is None:
        return None, []
    cap = e.spec.capacitor
    findings: list[Finding] = []
    notes: list[str] = []
    omega = 2 * math.pi * f_hz
    lam = _C0_MM_S / f_hz
    c = conductor(e.stock, settings)
    d = e.stock.profile.outer_diameter_mm
    geom = _small_loop(e)
    perimeter = geom.perimeter_mm if geom is not None else _perimeter_mm(e)
    c_wl = perimeter / lam
    # the published formulas, where the loop is small enough for them
    l_f = r_rad_f = r_cond_f = None
    if geom is not None and c_wl <= SMALL_LOOP_MAX_WL:
        l_f = loop_inductance_h(geom)
        r_rad_f = radiation_resistance_ohm(geom.area_mm2, f_hz)
        rho = c.resistivity_ohm_m
        r_cond_f = 0.0 if rho is None else skin_loss_ohm(perimeter, d, f_hz, rho)
        top = settings.band_hz[1] if settings.band_hz is not None else f_hz
        if rho is not None:
            try:
                findings += small_loop_findings(geom, max(top, f_hz), rho, c.tube_wall_mm,
                                                e.name)
            except FabplanError:
                pass
    else:
        notes.append(f"the circumference is {c_wl:.3f} wavelength: the small-loop formulas "
                     f"(below {SMALL_LOOP_MAX_WL} wavelength) do not apply; the model's figures "
                     "stand alone")
    l_m, r_rad_m, r_cond_m = _alone(e, settings, f_hz)
    # the assembled antenna: everything per the capacitor's current
    i_cap = abs(complex(sol.load_currents[list(sol.load_names).index(cap_name)]))
    r_total = 2 * sol.p_in_w / i_cap ** 2 if i_cap > 0 else math.inf
    c_f = load.capacitance_f if load.capacitance_f is not None else (cap.capacitance_f or 0.0)
    x_c = 1.0 / (omega * c_f) if c_f > 0 else math.nan
    r_cap = (x_c / cap.q if cap.q else (cap.esr_ohm or 0.0))
    r_joint = joint_resistance_ohm(e)
    q_u = x_c / r_total
    swr_level = 2.0
    eff = float(sol.efficiency)
    eff_f = None
    if r_rad_f is not None and l_f is not None and r_cond_f is not None:
        x_f = omega * l_f
        r_cap_f = x_f / cap.q if cap.q else (cap.esr_ohm or 0.0)
        eff_f = r_rad_f / (r_rad_f + r_cond_f + r_joint + r_cap_f)
    # across the band: the capacitor retuned at each frequency
    band: list[LoopBandPoint] = []
    solved = load.solved
    if settings.band_hz is not None and solved and hasattr(model, "solve_tuned"):
        for fb in np.linspace(settings.band_hz[0], settings.band_hz[1], BAND_POINTS):
            try:
                s = model.solve_tuned(float(fb))
            except FabplanError as exc:
                notes.append(f"no capacitance tunes the loop at {fb / 1e6:.4f} MHz: {exc}")
                continue
            at = s.at_power(power_w).gap(cap_name)
            z = complex(s.z_in)
            band.append(LoopBandPoint(float(fb), float(s.capacitance_f), at.voltage_rms_v,
                                      at.voltage_rms_v * math.sqrt(2), at.current_rms_a,
                                      float(s.efficiency), z,
                                      float(settings.chain.swr_system(z, float(fb)))))
    elif settings.band_hz is not None and not solved:
        notes.append("the capacitor's value is fixed in the design: the loop is tuned at one "
                     "frequency only; omit its capacitance to have the range across the band "
                     "solved")
    c_range = ((min(p.capacitance_f for p in band), max(p.capacitance_f for p in band))
               if band else None)
    worst = max([(load.voltage_v_peak, f_hz)] + [(p.capacitor_v_peak, p.f_hz) for p in band])
    # the coupling loop: the rule of thumb, then the model's SWR as drawn
    rule = coupling_loop(perimeter / math.pi)
    drawn = None
    coupler = next(x for x in elements if x.fed)
    cg = _small_loop(coupler)
    if cg is not None:
        drawn = cg.perimeter_mm / math.pi
    z0 = complex(sol.z_in)
    swr0 = float(settings.chain.swr_system(z0, f_hz))
    if solved and abs(z0.imag) > REACH_FRAC * abs(z0):
        notes.append(f"no capacitance puts the feed at X = 0 (the coupling loop is coupled too "
                     f"weakly for that); the capacitor is set nearest resonance, where the feed "
                     f"sees {format_impedance(z0)} ohm")
    if swr0 > COUPLING_SWR:
        findings.append(Finding(
            "loop-coupling-mismatch", "warning",
            f"with the coupling loop as drawn the feed sees {z0.real:.1f} ohm at resonance "
            f"(SWR {swr0:.2f} into {settings.chain.system_ohm:g} ohm). The rule of thumb (a "
            f"fifth of the main loop's diameter, {rule.diameter_mm:.0f} mm; common practice) "
            "is only a start: at resonance the feed sees about the loop's resistance times "
            "(L/M)^2, L the coupling loop's inductance and M its mutual inductance with the "
            "main loop; to raise the resistance make the coupling loop smaller or move it "
            "away from the main loop's conductor, to lower it the opposite; check again",
            coupler.name))
    if cap.rating_v is not None and worst[0] > cap.rating_v and worst[1] != f_hz:
        findings.append(Finding(
            "loop-capacitor-overvoltage-band", "error",
            f"retuned to {worst[1] / 1e6:.4f} MHz (the band's worst) the capacitor sees "
            f"{worst[0]:.0f} V peak at {power_w:g} W, more than its {cap.rating_v:.0f} V "
            "rating: use a capacitor rated higher or less power at that end of the band",
            e.name))
    return LoopFigures(
        element=e.name, coupling=fed, f_hz=f_hz, power_w=power_w, circumference_wl=c_wl,
        inductance_model_h=l_m, inductance_formula_h=l_f,
        radiation_resistance_model_ohm=r_rad_m, radiation_resistance_formula_ohm=r_rad_f,
        conductor_loss_model_ohm=r_cond_m, conductor_loss_formula_ohm=r_cond_f,
        joint_loss_ohm=r_joint, joints=joint_count(e), capacitor_loss_ohm=r_cap,
        total_resistance_ohm=r_total, efficiency=eff, efficiency_formula=eff_f,
        reactance_ohm=x_c, q_unloaded=q_u, q_loaded=q_u / 2, bandwidth_hz=f_hz / (q_u / 2),
        bandwidth_swr2_hz=f_hz * (swr_level - 1) / (q_u * math.sqrt(swr_level)),
        capacitance_f=c_f, solved=solved,
        capacitance_formula_f=None if l_f is None else 1.0 / (omega * omega * l_f),
        capacitance_range_f=c_range, band=tuple(band), capacitor_v_rms=load.voltage_v_rms,
        capacitor_v_peak=load.voltage_v_peak, current_a_rms=load.current_a_rms,
        capacitor_v_peak_max=worst[0], capacitor_v_peak_max_hz=worst[1],
        rating_v=cap.rating_v, coupling_rule_diameter_mm=rule.diameter_mm,
        coupling_rule_basis=rule.basis, coupling_diameter_mm=drawn, feed_z_ohm=z0,
        feed_swr=swr0, notes=tuple(notes)), findings


def loop_cautions(lf: LoopFigures) -> tuple[str, ...]:
    """The safety cautions for a capacitor-tuned loop, with its own figures."""
    kv = lf.capacitor_v_peak_max / 1000
    return (
        f"RF high voltage: at {lf.power_w:g} W the tuning capacitor of {lf.element!r} carries "
        f"up to {kv:.1f} kV peak (at {lf.capacitor_v_peak_max_hz / 1e6:.3f} MHz) and the loop "
        f"{lf.current_a_rms:.0f} A RMS. Touching the capacitor, its leads or the loop near it "
        "while transmitting burns deeply: house the capacitor in an insulating box, tune it "
        "through an insulated shaft or a motor, and transmit only when nobody can reach the "
        "loop.",
        f"A small transmitting loop's near field is strong within a few loop diameters: "
        f"evaluate the exposure distance at {lf.power_w:g} W against the limits (e.g. 47 CFR "
        "1.1310, ICNIRP 2020) and mount the loop where people cannot come closer (above head "
        "height or behind a barrier), away from power lines.",
    )


def helix_figures(elements: Sequence[ElectricalInput], sol: Any, power_w: float
                  ) -> tuple[HelixFigures | None, list[Finding]]:
    """The two loops of an element fed at two gaps in parallel (a quadrifilar helix):
    each loop's current and the phase by which the second's leads the first's; a
    finding when they are far from quadrature."""
    e = next((x for x in elements if x.fed
              and sum(g.role == "feed" for g in x.geometry.gaps) == 2), None)
    if e is None or not sol.p_in_w > 0:
        return None, []
    names = list(sol.port_names)
    first, second = e.name, f"{e.name} 2"
    if first not in names or second not in names:
        return None, []
    k = math.sqrt(power_w / sol.p_in_w)
    i1 = complex(sol.port_currents[names.index(first)]) * k
    i2 = complex(sol.port_currents[names.index(second)]) * k
    phase = (math.degrees(np.angle(i2 / i1)) + 180.0) % 360.0 - 180.0 if i1 != 0 else math.nan
    labels = tuple(p.label or f"loop {i + 1}" for i, p in enumerate(e.geometry.pieces[:2]))
    fig = HelixFigures(e.name, (labels[0], labels[1]), (abs(i1) / math.sqrt(2),
                                                          abs(i2) / math.sqrt(2)), phase)
    findings = []
    if not abs(phase - 90.0) <= QUADRATURE_TOL_DEG:
        findings.append(Finding(
            "qfh-not-in-quadrature", "warning",
            f"the {labels[1]}'s current leads the {labels[0]}'s by {phase:.0f} degrees at the "
            f"design frequency, not about 90: the loops are not self-phased there (their sizes "
            f"differ too little or too much, or both are off tune); the polarisation is "
            "elliptical: run `fabplan tune`, or change the loops' size ratio", e.name))
    return fig, findings
