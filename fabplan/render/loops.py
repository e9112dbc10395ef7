"""Text for a capacitor-tuned loop and a quadrifilar helix: what to buy, what to drill.

Reads the Plan only (the electrical stage's `LoopFigures` and `HelixFigures`, the
element's spec and the mast's drilling pattern); every number is formatted by
fabplan.units.
"""

from __future__ import annotations

from collections.abc import Callable

from ..drilling.records import DrillPattern
from ..em.records import FarFieldFigures, HelixFigures, LoopFigures
from ..geometry.shapes.quadrifilar import Params as QfhParams
from ..plan import ElementPlan, Plan
from ..units import format_capacitance, format_frequency, format_impedance, format_voltage

__all__ = ["loop_lines", "helix_lines", "circular_lines", "mast_of", "qfh_lines",
           "capacitor_to_buy", "RATING_MARGIN"]

RATING_MARGIN = 1.5  # buy a capacitor rated this much over the worst peak voltage [P]


def _pair(model: float, formula: float | None, fmt: Callable[[float], str]) -> str:
    return fmt(model) + ("" if formula is None else f" (formula {fmt(formula)})")


def capacitor_to_buy(lf: LoopFigures) -> str:
    """One line: the capacitor's range and rating to buy."""
    c = (f"{format_capacitance(lf.capacitance_range_f[0])} to "
         f"{format_capacitance(lf.capacitance_range_f[1])}"
         if lf.capacitance_range_f is not None else format_capacitance(lf.capacitance_f))
    return (f"{c}, rated at least {format_voltage(RATING_MARGIN * lf.capacitor_v_peak_max)} "
            f"peak ({RATING_MARGIN:g} x the worst {format_voltage(lf.capacitor_v_peak_max)} at "
            f"{lf.power_w:g} W; common practice margin), carrying {lf.current_a_rms:.1f} A RMS")


def loop_lines(lf: LoopFigures) -> list[str]:
    """The tuned loop: formulas beside the model, losses, Q, the band, the coupling loop."""
    def ohm(x: float) -> str:
        return f"{x * 1000:.1f} mohm" if x < 1 else f"{x:.3g} ohm"

    def uh(x: float) -> str:
        return f"{x * 1e6:.3f} uH"

    rows = [
        ("capacitor to buy", capacitor_to_buy(lf)),
        ("at", f"{format_frequency(lf.f_hz)}, {lf.power_w:g} W; circumference "
               f"{lf.circumference_wl:.3f} wavelength"),
        ("capacitance", format_capacitance(lf.capacitance_f)
         + (" (solved)" if lf.solved else " (the design's)")
         + ("" if lf.capacitance_formula_f is None else
            f"; formula 1/(omega^2 L) {format_capacitance(lf.capacitance_formula_f)}")),
        ("inductance", _pair(lf.inductance_model_h, lf.inductance_formula_h, uh)),
        ("radiation resistance", _pair(lf.radiation_resistance_model_ohm,
                                       lf.radiation_resistance_formula_ohm, ohm)),
        ("conductor loss", _pair(lf.conductor_loss_model_ohm, lf.conductor_loss_formula_ohm,
                                 ohm)),
        ("joints", f"{lf.joints} x, {ohm(lf.joint_loss_ohm)} in all"),
        ("capacitor loss", ohm(lf.capacitor_loss_ohm)),
        ("total (model)", ohm(lf.total_resistance_ohm)),
        ("efficiency", f"{100 * lf.efficiency:.1f} %" + (
            "" if lf.efficiency_formula is None else
            f" (formula {100 * lf.efficiency_formula:.1f} %)")),
        ("Q", f"unloaded {lf.q_unloaded:.0f}, loaded {lf.q_loaded:.0f} (matched)"),
        ("bandwidth", f"{lf.bandwidth_hz / 1e3:.1f} kHz half power, "
                      f"{lf.bandwidth_swr2_hz / 1e3:.1f} kHz SWR < 2 (matched)"),
        ("capacitor voltage", f"{format_voltage(lf.capacitor_v_rms)} RMS, "
                              f"{format_voltage(lf.capacitor_v_peak)} peak; loop current "
                              f"{lf.current_a_rms:.1f} A RMS"),
        ("coupling loop", f"rule of thumb {lf.coupling_rule_diameter_mm:.0f} mm diameter [P]"
         + ("" if lf.coupling_diameter_mm is None else
            f", drawn {lf.coupling_diameter_mm:.0f} mm")
         + f"; the model: {format_impedance(lf.feed_z_ohm)} ohm, SWR "
           f"{lf.feed_swr:.2f}"),
    ]
    width = max(len(r[0]) for r in rows)
    out = [f"Tuned loop {lf.element!r} (formulas: Balanis, Grover; the model beside them)"]
    out += [f"  {name.ljust(width)}  {value}" for name, value in rows]
    if lf.band:
        out.append("  across the band, the capacitor retuned at each frequency:")
        out.append("         MHz        pF   kV peak   A RMS   eff %     SWR")
        out += [f"  {p.f_hz / 1e6:10.4f}  {p.capacitance_f * 1e12:8.2f}  "
                f"{p.capacitor_v_peak / 1e3:8.2f}  {p.current_a_rms:6.1f}  "
                f"{100 * p.efficiency:6.1f}  {p.swr:6.2f}" for p in lf.band]
    out += [f"  note: {n}" for n in lf.notes]
    return out


def circular_lines(ff: FarFieldFigures) -> list[str]:
    """Zenith and low-elevation figures of a circularly polarised antenna."""
    if ff.gain_zenith_dbi is None:
        return []
    low = "-" if ff.gain_low_dbi is None else f"{ff.gain_low_dbi:.2f} dBi"
    ar = "-" if ff.axial_ratio_zenith_db is None else f"{ff.axial_ratio_zenith_db:.1f} dB"
    return [f"  towards the zenith: {ff.gain_zenith_dbi:.2f} dBi, axial ratio {ar}, "
            f"{ff.polarisation_zenith}-hand circular (IEEE sense)",
            f"  at {ff.low_elevation_deg or 0:g} deg elevation: {low} (mean over the azimuth)"]


def helix_lines(h: HelixFigures) -> list[str]:
    return [f"  {h.loops[1]}'s current leads the {h.loops[0]}'s by {h.phase_deg:.0f} deg "
            f"(self-phasing wants 90); {h.current_a_rms[0]:.2f} and {h.current_a_rms[1]:.2f} A "
            "RMS at the design power"]


def mast_of(plan: Plan, e: ElementPlan) -> DrillPattern | None:
    """The drilling pattern of a quadrifilar helix's mast, if the plan has one."""
    return next((d for d in plan.drilling if d.name == f"{e.name}: mast"), None)


def qfh_lines(plan: Plan, e: ElementPlan, L: Callable[[float], str]) -> list[str]:
    """A quadrifilar helix: the loops, the winding, the feed and the mast's holes."""
    p = e.spec.params
    if not isinstance(p, QfhParams):
        return []
    sense = "counter-clockwise" if p.handedness == "right" else "clockwise"
    out = [f"Quadrifilar helix: {p.handedness}-hand winding (each arm rises {sense} seen from "
           f"above), {p.turns:g} turn per arm (twist {360 * p.turns:g} deg from top to bottom "
           "radial)",
           f"  sizes: {p.basis}"]
    for label, dia, h, piece in (("large loop", p.large_diameter_mm, p.large_height_mm,
                                  e.pieces[0]),
                                 ("small loop", p.small_diameter_mm, p.small_height_mm,
                                  e.pieces[1])):
        out.append(f"  {label}: diameter {L(dia)}, height {L(h)} (radial centrelines); "
                   f"developed {L(piece.developed_length_mm)}, cut {L(piece.cut_length_mm)}")
    out.append("  feed: both loops in parallel at the top; each loop's end A (the half-radial "
               "it starts from) to the same side of the feed line, its end B to the other")
    mast = mast_of(plan, e)
    if mast is not None:
        out.append(f"  mast {L(mast.outside_mm)} outside, {L(mast.length_mm)} long; holes from "
                   f"the datum ({mast.datum}):")
        for hole in mast.holes:
            arc = hole.angle_deg / 360.0 * mast.circumference_mm
            out.append(f"    {hole.label}: {L(hole.from_datum_mm)} down, {hole.angle_deg:g} deg "
                       f"({L(arc)} round from the line), drill {hole.diameter_mm:.1f} mm "
                       + ("through" if hole.through else "one wall"))
    return out
