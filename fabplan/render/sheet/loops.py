"""The build sheet's pages for a capacitor-tuned loop and a quadrifilar helix: the
capacitor to buy (range, voltage, current), the loop's figures beside the published
formulas, the band, the coupling loop's check; the helix's loops, winding and feed,
and where to drill its mast.

Every figure comes from the Plan; this module only lays out text and tables.
"""

from __future__ import annotations

from typing import Any

from ...em.records import LoopFigures, StructureElectrical
from ...geometry.shapes.quadrifilar import Params as QfhParams
from ...units import (
    format_capacitance,
    format_frequency,
    format_impedance,
    format_number,
    format_voltage,
)
from ..loops import RATING_MARGIN, mast_of
from .context import Context

__all__ = ["loops"]


def loops(ctx: Context) -> list[Any]:
    """The tuned loops' and the quadrifilar helices' sections (empty when none)."""
    out: list[Any] = []
    pe = ctx.plan.electrical
    for st in (pe.structures if pe is not None else ()):
        if st.loop is not None:
            out += _loop(ctx, st.loop)
    for e in ctx.plan.elements:
        if isinstance(e.spec.params, QfhParams):
            out += _helix(ctx, e, _structure_of(ctx, e.name))
    return out


def _structure_of(ctx: Context, name: str) -> StructureElectrical | None:
    pe = ctx.plan.electrical
    return next((st for st in (pe.structures if pe is not None else ())
                 if name in st.elements), None)


def _ohm(x: float | None) -> str:
    if x is None:
        return "-"
    return f"{x * 1000:.1f} milliohm" if x < 1 else f"{x:.3g} ohm"


def _loop(ctx: Context, lf: LoopFigures) -> list[Any]:
    out = [ctx.p(f"Tuned loop {lf.element!r}: the capacitor to buy", ctx.h2)]
    rng = (f"{format_capacitance(lf.capacitance_range_f[0])} to "
           f"{format_capacitance(lf.capacitance_range_f[1])} (across the band)"
           if lf.capacitance_range_f is not None else
           f"{format_capacitance(lf.capacitance_f)} (at {format_frequency(lf.f_hz)}; give "
           "[electrical] band for the range)")
    worst = (f"{format_voltage(lf.capacitor_v_peak_max)} peak at "
             f"{format_frequency(lf.capacitor_v_peak_max_hz)}")
    rows = [["capacitance", rng],
            ["voltage rating", f"at least {format_voltage(RATING_MARGIN * lf.capacitor_v_peak_max)}"
                               f" peak: {RATING_MARGIN:g} x the worst, {worst}, at "
                               f"{lf.power_w:g} W (the margin is common practice)"],
            ["current it carries", f"{lf.current_a_rms:.1f} A RMS (the loop's current)"],
            ["rated", "-" if lf.rating_v is None else
             f"{format_voltage(lf.rating_v)} peak (the design's capacitor)"],
            ["its loss assumed", _ohm(lf.capacitor_loss_ohm) + " in series (from its Q or "
                                                            "ESR in the design)"]]
    out += ctx.table(["what", "value"], rows, [0.22, 0.78], "ll",
                     caption="Buy a vacuum or wide-spaced air variable that covers the whole "
                             "range with its voltage rating to spare; its current rating "
                             "matters as much.")
    f = lf.f_hz
    rows2 = [["capacitance", format_capacitance(lf.capacitance_f)
              + (" (solved)" if lf.solved else " (the design's)"),
              "-" if lf.capacitance_formula_f is None else
              format_capacitance(lf.capacitance_formula_f), "C = 1/(omega^2 L)"],
             ["inductance", f"{lf.inductance_model_h * 1e6:.3f} uH",
              "-" if lf.inductance_formula_h is None else
              f"{lf.inductance_formula_h * 1e6:.3f} uH", "Grover (ring or polygon)"],
             ["radiation resistance", _ohm(lf.radiation_resistance_model_ohm),
              _ohm(lf.radiation_resistance_formula_ohm), "Balanis, 320 pi^4 (A/lambda^2)^2"],
             ["conductor loss", _ohm(lf.conductor_loss_model_ohm),
              _ohm(lf.conductor_loss_formula_ohm), "skin effect, R_s l / (pi d)"],
             ["joints", _ohm(lf.joint_loss_ohm), f"{lf.joints} joints", "the design's"],
             ["capacitor loss", _ohm(lf.capacitor_loss_ohm), "", "X / Q, or its ESR"],
             ["everything (input power)", _ohm(lf.total_resistance_ohm), "",
              "2 P / I^2 at the capacitor"],
             ["efficiency", f"{100 * lf.efficiency:.1f} %",
              "-" if lf.efficiency_formula is None else f"{100 * lf.efficiency_formula:.1f} %",
              "radiated / input"],
             ["Q unloaded / loaded", f"{lf.q_unloaded:.0f} / {lf.q_loaded:.0f}", "",
              "X / R; half when matched"],
             ["bandwidth", f"{lf.bandwidth_hz / 1e3:.1f} kHz half power, "
                           f"{lf.bandwidth_swr2_hz / 1e3:.1f} kHz SWR < 2", "",
              "f / Q_L; Yaghjian & Best"],
             ["capacitor voltage", f"{format_voltage(lf.capacitor_v_rms)} RMS, "
                                   f"{format_voltage(lf.capacitor_v_peak)} peak", "",
              f"at {lf.power_w:g} W"]]
    out.append(ctx.p(f"The loop at {format_frequency(f)} (circumference "
                     f"{lf.circumference_wl:.3f} wavelength)", ctx.h3))
    out += ctx.table(["figure", "model", "formula", "basis"], rows2,
                     [0.24, 0.25, 0.2, 0.31], "llll",
                     caption="Resistances are in series with the loop, referred to its "
                             "current. The model is the method of moments (the loop alone, "
                             "its gap driven, for L and the resistances; the assembled "
                             "antenna for the rest); the formulas hold for a small loop "
                             "(circumference under 0.1 wavelength).")
    if lf.band:
        brows = [[f"{p.f_hz / 1e6:.4f}", f"{p.capacitance_f * 1e12:.2f}",
                  f"{p.capacitor_v_rms / 1e3:.2f}", f"{p.capacitor_v_peak / 1e3:.2f}",
                  f"{p.current_a_rms:.1f}", f"{100 * p.efficiency:.1f}",
                  f"{p.feed_z_ohm.real:.1f}", f"{p.swr:.2f}"] for p in lf.band]
        out.append(ctx.p("Across the band (the capacitor retuned at each frequency)", ctx.h3))
        out += ctx.table(["MHz", "pF", "kV RMS", "kV peak", "A RMS", "eff. %", "R feed ohm",
                          "SWR"], brows, None, "rrrrrrrr",
                         caption=f"At {lf.power_w:g} W; the feed's resistance and SWR with "
                                 "the coupling loop as drawn.")
    drawn = ("-" if lf.coupling_diameter_mm is None else ctx.L(lf.coupling_diameter_mm))
    crows = [["rule of thumb", f"{ctx.L(lf.coupling_rule_diameter_mm)} diameter: "
                               f"{lf.coupling_rule_basis}"],
             ["as drawn", drawn],
             ["the model", f"{format_impedance(lf.feed_z_ohm)} ohm at "
                           f"resonance, SWR {lf.feed_swr:.2f}"]]
    out.append(ctx.p(f"Coupling loop ({', '.join(lf.coupling)})", ctx.h3))
    out += ctx.table(["", "value"], crows, [0.22, 0.78], "ll")
    for n in lf.notes:
        out.append(ctx.p(n, ctx.small))
    return out


def _helix(ctx: Context, e: Any, st: StructureElectrical | None) -> list[Any]:
    p: QfhParams = e.spec.params
    sense = "counter-clockwise" if p.handedness == "right" else "clockwise"
    out = [ctx.p(f"Quadrifilar helix {e.name!r}: loops, winding and mast", ctx.h2),
           ctx.p(f"{p.handedness.capitalize()}-hand winding: each arm rises {sense} seen from "
                 f"above; {p.turns:g} turn per arm, so each bottom radial is turned "
                 f"{360 * p.turns:g} degrees from its top radial. Sizes: {p.basis}.")]
    rows = []
    for label, dia, height, piece in (("large loop", p.large_diameter_mm, p.large_height_mm,
                                       e.pieces[0]),
                                      ("small loop", p.small_diameter_mm, p.small_height_mm,
                                       e.pieces[1])):
        rows.append([label, ctx.L2(dia), ctx.L2(height), ctx.L2(piece.developed_length_mm),
                     ctx.L2(piece.cut_length_mm), str(len(piece.bends))])
    out += ctx.table(["loop", "diameter", "height", "developed", "cut", "bends"], rows,
                     [0.16, 0.17, 0.17, 0.17, 0.17, 0.16], "lrrrrr",
                     caption="Diameter across the helix between the arms' centrelines (the "
                             "radial's length, sharp corners); height between the top and "
                             "bottom radials' centrelines. Each loop's bend table and marks "
                             "are with its piece above.")
    out.append(ctx.p("Feed: the two loops in parallel at the top. Join each loop's end A (the "
                     "half-radial its stock starts from, as marked) to the same side of the "
                     "feed line, its end B to the other: reversing one loop reverses the beam.",
                     ctx.body))
    if st is not None and st.far_field is not None and st.far_field.gain_zenith_dbi is not None:
        ff = st.far_field
        h = st.helix
        text = (f"The model at {format_frequency(ff.f_hz)}: towards the zenith "
                f"{ff.gain_zenith_dbi:.1f} dBi, {ff.polarisation_zenith}-hand circular "
                f"(axial ratio {ff.axial_ratio_zenith_db or 0:.1f} dB); at "
                f"{ff.low_elevation_deg or 0:g} degrees elevation "
                f"{format_number(ff.gain_low_dbi or 0.0, 1)} dBi")
        if h is not None:
            text += (f"; the {h.loops[1]}'s current leads the {h.loops[0]}'s by "
                     f"{h.phase_deg:.0f} degrees (90 wanted)")
        out.append(ctx.p(text + ".", ctx.body))
    mast = mast_of(ctx.plan, e)
    if mast is not None:
        hrows = [[hole.label, ctx.L2(hole.from_datum_mm), f"{hole.angle_deg:g}",
                  ctx.L2(hole.angle_deg / 360.0 * mast.circumference_mm),
                  f"{hole.diameter_mm:.1f}", "through" if hole.through else "one wall"]
                 for hole in mast.holes]
        out.append(ctx.p(f"Where to drill the mast ({ctx.L(mast.outside_mm)} outside, cut "
                         f"{ctx.L(mast.length_mm)} long)", ctx.h3))
        out += ctx.table(["hole", "down from the top", "angle deg", "round from the line",
                          "drill mm", ""], hrows, [0.2, 0.2, 0.12, 0.2, 0.12, 0.16], "lrrrrl",
                         caption=f"Datum: {mast.datum}. A through hole's exit lies 180 "
                                 "degrees round; drill both walls square to the axis (a V-block "
                                 "and a drill press). The wrap-around template, printed at "
                                 "full size, carries the same holes.")
    return out
