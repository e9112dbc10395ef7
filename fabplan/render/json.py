"""The Plan as JSON: every figure in millimetres, kilograms, degrees, hertz, ohms.

`plan_to_dict` reads the Plan and nothing else; each stage's section is one
function here. Numbers are rounded for reading (`num`), never for computing.

The document starts with `"format": "fabplan-plan"` and `"format_version"`;
docs/plan-json.md lists every key, its unit and when it is present (a test
keeps the two in step). The version goes up when a key is removed or renamed
or changes its unit or meaning; new keys do not change it, so a script should
ignore keys it does not know.
"""

from __future__ import annotations

import json
import math
from typing import Any

from ..boom.records import BoomPlan, ElementMount
from ..em.records import (
    ElementElectrical,
    HelixFigures,
    LoopFigures,
    PatternCut,
    PlanElectrical,
    StructureElectrical,
    SweepResult,
)
from ..estimate.records import ElementEstimate, Order
from ..forming.records import ElementForming
from ..lengths.records import PieceCore
from ..plan import ElementPlan, Plan
from ..stock.profiles import Profile, Round, Tube

__all__ = ["plan_to_dict", "plan_to_json", "num", "profile_dict", "order_dict", "sweep_dict",
           "PLAN_FORMAT", "PLAN_FORMAT_VERSION"]

PLAN_FORMAT = "fabplan-plan"
PLAN_FORMAT_VERSION = 1


def num(x: float | None, places: int = 4, *, sig: int | None = None) -> float | None:
    """A JSON-safe figure: rounded to `places` decimals (or to `sig` significant
    digits), never "-0.0"; None for a missing or infinite figure."""
    if x is None or not math.isfinite(x):
        return None
    v = float(f"{float(x):.{sig}g}") if sig is not None else round(float(x), places)
    return 0.0 if v == 0 else v


def _vec(v: tuple[float, ...]) -> list[float | None]:
    return [num(c) for c in v]


def profile_dict(profile: Profile) -> dict[str, Any]:
    if isinstance(profile, Round):
        return {"profile": "round", "diameter_mm": num(profile.diameter_mm)}
    if isinstance(profile, Tube):
        return {"profile": "tube", "od_mm": num(profile.od_mm), "wall_mm": num(profile.wall_mm)}
    return {"profile": "strip", "width_mm": num(profile.width_mm),
            "thickness_mm": num(profile.thickness_mm)}


def _piece_core(p: PieceCore, gap_mm: float | None) -> dict[str, Any]:
    return {
        "centreline_length_mm": num(p.centreline_length_mm),
        "developed_length_mm": num(p.developed_length_mm),
        "trim_per_end_mm": num(p.trim_mm),
        "cut_length_mm": num(p.cut_length_mm),
        "feed_gap_mm": num(gap_mm),
        "tail_straight_mm": num(p.tail_straight_mm),
        "planar": p.planar,
        "mass_kg": num(p.mass_kg, 5),
        "bends": [{
            "index": b.index,
            "straight_before_mm": num(b.straight_before_mm),
            "rotation_deg": num(b.rotation_deg),
            "angle_deg": num(b.angle_deg),
            "centreline_radius_mm": num(b.centreline_radius_mm),
            "neutral_radius_mm": num(b.neutral_radius_mm),
            "pitch_mm": num(b.pitch_mm),
            "arc_length_mm": num(b.arc_length_mm),
            "start_from_centre_mm": num(b.start_from_centre_mm),
            "end_from_centre_mm": num(b.end_from_centre_mm),
            "start_from_end_mm": num(b.start_from_end_mm),
            "end_from_end_mm": num(b.end_from_end_mm),
            "start_point_mm": _vec(b.start_point),
            "end_point_mm": _vec(b.end_point),
        } for b in p.bends],
        "marks": [{"label": m.label, "kind": m.kind, "from_centre_mm": num(m.from_centre_mm),
                   "from_end_mm": num(m.from_end_mm)} for m in p.marks],
    }


def forming_dict(f: ElementForming, d: dict[str, Any]) -> None:
    """Merge the per-bend forming figures into d["bends"] (by index) and add d["forming"]."""
    by_index = {b.index: b for b in f.bends}
    for row in d.get("bends", []):
        b = by_index.get(row.get("index"))
        if b is None:
            continue
        row.update({
            "former_radius_mm": num(b.former_radius_mm),
            "former_centreline_radius_mm": num(b.former_centreline_radius_mm),
            "overbend_deg": num(b.overbend_deg),
            "springback_deg": num(b.springback_deg),
            "final_radius_mm": num(b.final_radius_mm),
            "final_angle_deg": num(b.final_angle_deg),
            "outer_strain": num(b.outer_strain, 6),
            "forming_method": b.method,
        })
    d["forming"] = {
        "method": f.method,
        "model": f.model,
        "effective_yield_mpa": num(f.effective_yield_mpa),
        "calibrated": f.calibrated,
        "elastic_limit_radius_mm": num(f.elastic_limit_radius_mm),
        "formers": [{"label": fm.label, "bends": list(fm.bend_indices),
                     "centre_mm": [num(c) for c in fm.centre_mm],
                     "radius_mm": num(fm.radius_mm), "diameter_mm": num(2 * fm.radius_mm),
                     "wrap_deg": num(fm.wrap_deg)} for fm in f.formers],
        "former_spacing_mm": [num(x) for x in f.former_spacing_mm],
        "jig_marks": [{"label": m.label, "kind": m.kind,
                       "point_mm": [num(c) for c in m.point_mm],
                       "direction": [num(c, 6) for c in m.direction]}
                      for m in f.jig_marks],
        "tool_marks": [{"step": t.step, "bend": t.bend_index,
                        "from_centre_mm": num(t.from_centre_mm),
                        "from_end_mm": num(t.from_end_mm),
                        "from_end_b_mm": num(t.from_end_b_mm),
                        "tool_reference": t.tool_reference,
                        "bend_to_deg": num(t.bend_to_deg),
                        "setback_mm": num(t.setback_mm), "gain_mm": num(t.gain_mm),
                        "grip_mm": num(t.grip_mm)} for t in f.tool_marks],
        "bend_order": list(f.bend_order),
        "splay_if_ignored_mm": num(f.splay_if_ignored_mm),
        "limits": [{"bend": x.index, "d_of_bend": num(x.d_of_bend),
                    "wall_factor": num(x.wall_factor), "outer_strain": num(x.outer_strain, 6),
                    "elongation": num(x.elongation), "wall_outside_mm": num(x.wall_outside_mm),
                    "wall_inside_mm": num(x.wall_inside_mm),
                    "min_radius_mm": num(x.min_radius_mm),
                    "min_radius_basis": x.min_radius_basis} for x in f.limits],
        "notes": list(f.notes),
    }


def _estimate(e: ElementEstimate, d: dict[str, Any]) -> None:
    d["weight_kg"] = num(e.weight_kg, 5)
    d["cost"] = num(e.cost, 2)
    d["estimate"] = {
        "spares": e.spares,
        "pieces_to_cut": e.quantity + e.spares,
        "batch_weight_kg": num(e.batch_weight_kg, 5),
        "batch_cost": num(e.batch_cost, 2),
        "currency": None if e.currency is None else e.currency.label,
    }


def sweep_dict(s: SweepResult) -> dict[str, Any]:
    return {
        "reference_ohm": num(s.reference_ohm, 6),
        "system_ohm": num(s.system_ohm, 6),
        "matching": s.matching,
        "min_swr": num(s.min_swr, 4),
        "min_swr_hz": num(s.min_swr_hz, 1),
        "resonance_hz": num(s.resonance_hz, 1),
        "bandwidth_hz": {k: num(v, 1) for k, v in s.bandwidth_hz.items()},
        "efficiency": num(s.efficiency, 5),
        "uncertainty_frac": s.uncertainty_frac,
        "points": [{"f_hz": num(f, 1), "r_ohm": num(z.real, 4), "x_ohm": num(z.imag, 4),
                    "swr_terminals": num(st, 4), "swr_system": num(ss, 4)}
                   for f, z, st, ss in zip(s.freq_hz, s.z_ohm, s.swr_terminals,
                                           s.swr_system)],
    }


def _electrical(el: ElementElectrical, d: dict[str, Any]) -> None:
    out: dict[str, Any] = {"target_hz": num(el.target_hz, 1), "unknowns": el.unknowns}
    out.update(sweep_dict(el.sweep))
    out.update({
        "bandwidth_edges_hz": {
            f"{b.level:g}": (None if not b.reached else
                             [None if b.lower is None else num(b.lower.frequency_hz, 1),
                              None if b.upper is None else num(b.upper.frequency_hz, 1)])
            for b in el.sweep.bands},
        "bandwidth_beyond_sweep": {
            f"{b.level:g}": [side for side, beyond in (("lower", b.lower_beyond_sweep),
                                                        ("upper", b.upper_beyond_sweep)) if beyond]
            for b in el.sweep.bands},
        "least_swr_at_sweep_end": el.least_swr_at_sweep_end,
        "geometry": el.geometry,
        "released_radii": el.released_radii,
        "conductor_radius_mm": num(el.conductor_radius_mm, 6),
        "tube_wall_mm": num(el.tube_wall_mm, 6),
        "resistivity_ohm_m": num(el.resistivity_ohm_m, sig=6),
        "ground": el.ground,
        "ground_height_mm": num(el.ground_height_mm, 6),
        "structure": el.structure,
        "notes": list(el.notes),
    })
    d["electrical"] = out


def _cut(c: PatternCut) -> dict[str, Any]:
    return {"plane": c.plane, "fixed_deg": num(c.fixed_deg, 3),
            "angle_deg": [num(a, 3) for a in c.angle_deg],
            "gain_dbi": [num(g, 3) for g in c.gain_dbi]}


def structure_dict(st: StructureElectrical) -> dict[str, Any]:
    """One structure's figures (the elements modelled together)."""
    ff = st.far_field
    out: dict[str, Any] = {
        "elements": list(st.elements),
        "fed": list(st.fed),
        "unknowns": st.unknowns,
        "solves": st.solves,
        "f_hz": num(st.f_hz, 1),
        "gain_dbi": None if ff is None else num(ff.gain_dbi, 3),
        "directivity_dbi": None if ff is None else num(ff.directivity_dbi, 3),
        "efficiency": num(st.efficiency, 5),
        "front_to_back_db": None if ff is None else num(ff.front_to_back_db, 3),
        "front_to_rear_db": None if ff is None else num(ff.front_to_rear_db, 3),
        "beamwidth_h_deg": None if ff is None else num(ff.beamwidth_h_deg, 2),
        "beamwidth_v_deg": None if ff is None else num(ff.beamwidth_v_deg, 2),
        "max_theta_deg": None if ff is None else num(ff.max_theta_deg, 3),
        "max_phi_deg": None if ff is None else num(ff.max_phi_deg, 3),
        "axial_ratio_db": None if ff is None else num(ff.axial_ratio_db, 3),
        "polarisation": None if ff is None else ff.polarisation,
        "power_balance_error": None if ff is None else num(ff.power_balance_error, sig=3),
        "pattern": None if ff is None else {"azimuth": _cut(ff.azimuth),
                                            "elevation": _cut(ff.elevation)},
        "band": None if st.band is None else {
            "f_hz": [num(f, 1) for f in st.band.freq_hz],
            "gain_dbi": [num(g, 3) for g in st.band.gain_dbi],
            "front_to_back_db": [num(g, 3) for g in st.band.front_to_back_db],
            "beamwidth_h_deg": [num(g, 2) for g in st.band.beamwidth_h_deg],
            "beamwidth_v_deg": [num(g, 2) for g in st.band.beamwidth_v_deg]},
        "power_w": num(st.power_w, 6),
        "power_stated": st.power_stated,
        "max_current_a_rms": num(st.max_current_a_rms, 5),
        "loads": [{"name": ld.name, "element": ld.element,
                   "capacitance_f": num(ld.capacitance_f, sig=6), "solved": ld.solved,
                   "current_a": num(ld.current_a_rms, 5), "voltage_v": num(ld.voltage_v_rms, 3),
                   "voltage_v_peak": num(ld.voltage_v_peak, 3), "power_w": num(ld.power_w, 5),
                   "rating_v": num(ld.rating_v, 3)} for ld in st.loads],
    }
    if ff is not None and ff.gain_zenith_dbi is not None:
        out.update({"gain_zenith_dbi": num(ff.gain_zenith_dbi, 3),
                    "gain_low_elevation_dbi": num(ff.gain_low_dbi, 3),
                    "low_elevation_deg": num(ff.low_elevation_deg, 3),
                    "axial_ratio_zenith_db": num(ff.axial_ratio_zenith_db, 3),
                    "polarisation_zenith": ff.polarisation_zenith})
    if st.loop is not None:
        out.update(_loop_summary(st.loop))
        out["loop"] = loop_dict(st.loop)
    if st.helix is not None:
        out["helix"] = helix_dict(st.helix)
    return out


def _loop_summary(lf: LoopFigures) -> dict[str, Any]:
    """The tuned loop's headline figures, at the structure's level for scripts."""
    return {
        "capacitance_f": num(lf.capacitance_f, sig=6),
        "capacitance_range_f": (None if lf.capacitance_range_f is None else
                                [num(c, sig=6) for c in lf.capacitance_range_f]),
        "capacitor_voltage_v_rms": num(lf.capacitor_v_rms, 3),
        "capacitor_voltage_v_peak": num(lf.capacitor_v_peak, 3),
        "q_loaded": num(lf.q_loaded, 3),
        "bandwidth_hz": num(lf.bandwidth_hz, 1),
    }


def loop_dict(lf: LoopFigures) -> dict[str, Any]:
    """Every figure of a capacitor-tuned loop (ohm, H, F, V, A, Hz, mm)."""
    return {
        "element": lf.element, "coupling": list(lf.coupling), "f_hz": num(lf.f_hz, 1),
        "power_w": num(lf.power_w, 6), "circumference_wl": num(lf.circumference_wl, 5),
        "inductance_h": {"model": num(lf.inductance_model_h, sig=6),
                         "formula": num(lf.inductance_formula_h, sig=6)},
        "radiation_resistance_ohm": {"model": num(lf.radiation_resistance_model_ohm, sig=6),
                                     "formula": num(lf.radiation_resistance_formula_ohm, sig=6)},
        "conductor_loss_ohm": {"model": num(lf.conductor_loss_model_ohm, sig=6),
                               "formula": num(lf.conductor_loss_formula_ohm, sig=6)},
        "joint_loss_ohm": num(lf.joint_loss_ohm, sig=6), "joints": lf.joints,
        "capacitor_loss_ohm": num(lf.capacitor_loss_ohm, sig=6),
        "total_resistance_ohm": num(lf.total_resistance_ohm, sig=6),
        "efficiency": num(lf.efficiency, 5), "efficiency_formula": num(lf.efficiency_formula, 5),
        "reactance_ohm": num(lf.reactance_ohm, 4),
        "q_unloaded": num(lf.q_unloaded, 3), "q_loaded": num(lf.q_loaded, 3),
        "bandwidth_hz": num(lf.bandwidth_hz, 1), "bandwidth_swr2_hz": num(lf.bandwidth_swr2_hz, 1),
        "capacitance_f": num(lf.capacitance_f, sig=6), "solved": lf.solved,
        "capacitance_formula_f": num(lf.capacitance_formula_f, sig=6),
        "capacitance_range_f": (None if lf.capacitance_range_f is None else
                                [num(c, sig=6) for c in lf.capacitance_range_f]),
        "band": [{"f_hz": num(p.f_hz, 1), "capacitance_f": num(p.capacitance_f, sig=6),
                  "capacitor_voltage_v_rms": num(p.capacitor_v_rms, 3),
                  "capacitor_voltage_v_peak": num(p.capacitor_v_peak, 3),
                  "current_a_rms": num(p.current_a_rms, 4), "efficiency": num(p.efficiency, 5),
                  "r_ohm": num(p.feed_z_ohm.real, 4), "x_ohm": num(p.feed_z_ohm.imag, 4),
                  "swr": num(p.swr, 4)} for p in lf.band],
        "capacitor_voltage_v_rms": num(lf.capacitor_v_rms, 3),
        "capacitor_voltage_v_peak": num(lf.capacitor_v_peak, 3),
        "current_a_rms": num(lf.current_a_rms, 4),
        "capacitor_voltage_v_peak_max": num(lf.capacitor_v_peak_max, 3),
        "capacitor_voltage_v_peak_max_hz": num(lf.capacitor_v_peak_max_hz, 1),
        "rating_v": num(lf.rating_v, 3),
        "coupling_loop": {"rule_diameter_mm": num(lf.coupling_rule_diameter_mm),
                          "rule_basis": lf.coupling_rule_basis,
                          "drawn_diameter_mm": num(lf.coupling_diameter_mm),
                          "r_ohm": num(lf.feed_z_ohm.real, 4), "x_ohm": num(lf.feed_z_ohm.imag, 4),
                          "swr": num(lf.feed_swr, 4)},
        "notes": list(lf.notes),
    }


def helix_dict(h: HelixFigures) -> dict[str, Any]:
    """Two loops fed in parallel: each loop's current and their phase (deg)."""
    return {"element": h.element, "loops": list(h.loops),
            "current_a_rms": [num(i, 5) for i in h.current_a_rms],
            "phase_deg": num(h.phase_deg, 3)}


def _plan_electrical(pe: PlanElectrical) -> dict[str, Any]:
    figures: dict[str, Any] = {}
    if len(pe.structures) == 1:  # the antenna's own figures, at the top for scripts
        figures = {k: v for k, v in structure_dict(pe.structures[0]).items()
                   if k not in ("elements", "fed")}
    return {
        "matching": pe.matching,
        "ground": pe.ground,
        "real_ground_modelled": pe.real_ground_modelled,
        "balun_loop_cut_length_mm": num(pe.balun_loop_cut_length_mm, 3),
        "balun_cable": pe.balun_cable,
        "feed_line_loss_db": num(pe.feed_line_loss_db, 4),
        "power_w": num(pe.power_w, 6),
        "uncertainty_frac": pe.uncertainty_frac,
        "cautions": list(pe.cautions),
        **figures,
        "structures": [structure_dict(st) for st in pe.structures],
    }


def element_dict(e: ElementPlan) -> dict[str, Any]:
    d: dict[str, Any] = {"name": e.name, "shape": e.spec.shape, "quantity": e.quantity}
    if len(e.pieces) == 1:
        piece = e.pieces[0]
        d.update(_piece_core(piece, e.feed_gap_mm))
        if piece.forming is not None:
            forming_dict(piece.forming, d)
    else:
        d.update({"developed_length_mm": num(e.developed_length_mm),
                  "cut_length_mm": num(e.cut_length_mm), "feed_gap_mm": num(e.feed_gap_mm),
                  "mass_kg": num(e.mass_kg, 5)})
        pieces = []
        for piece in e.pieces:
            pd: dict[str, Any] = {"label": piece.label, **_piece_core(piece, piece.gap_mm)}
            if piece.forming is not None:
                forming_dict(piece.forming, pd)
            pieces.append(pd)
        d["pieces"] = pieces
    if e.estimate is not None:
        _estimate(e.estimate, d)
    if e.electrical is not None:
        _electrical(e.electrical, d)
    if e.spec.part_of is not None:
        d["part_of"] = e.spec.part_of
    uniform = getattr(e.spec.params, "uniform", None)
    if uniform is not None:
        d["telescoping"] = {"uniform_length_mm": num(uniform.length_mm),
                            "uniform_diameter_mm": num(uniform.diameter_mm),
                            "tip_to_tip_mm": num(e.spec.params.length_mm),
                            "taper_correction_mm": num(uniform.correction_mm),
                            "frequency_hz": num(uniform.frequency_hz, 1),
                            "basis": "stepped-element method (fabplan.antennas.taper)"}
    if e.spec.match is not None:
        m = e.spec.match
        d["match"] = {"kind": m.kind, "part": m.part, "element": m.element,
                      "length_mm": num(m.length_mm), "spacing_mm": num(m.spacing_mm),
                      "direction": m.direction,
                      "capacitance_f": num(m.capacitance_f, sig=6)}
    if e.boom is not None:
        _mount(e.boom, d)
    return d


def _mount(m: ElementMount, d: dict[str, Any]) -> None:
    """An element's place on the boom and the boom correction in its cut."""
    d["position_mm"] = num(m.position_mm)
    d["boom_correction_mm"] = num(m.correction_mm)
    d["mount"] = {
        "mounting": m.mounting, "x_mm": num(m.x_mm), "height_mm": num(m.height_mm),
        "boom_correction_mm": num(m.correction_mm),
        "published_correction_mm": num(m.published_mm),
        "upper_bound_mm": num(m.upper_bound_mm), "fraction_of_boom": num(m.fraction_of_boom, 6),
        "applied": m.applied, "basis": m.basis, "hole_mm": num(m.hole_mm),
        "crossing_diameter_mm": num(m.crossing_mm),
        "pieces": [{"label": p.label, "shape_cut_mm": num(p.shape_cut_mm),
                    "added_mm": num(p.added_mm), "cut_length_mm": num(p.cut_length_mm)}
                   for p in m.pieces]}


def boom_dict(b: BoomPlan) -> dict[str, Any]:
    """The boom: its stock, datum, mounting, holes (from the datum), hardware, balance."""
    return {
        "description": b.description, "section": b.section, "outside_mm": num(b.outside_mm),
        "wall_mm": num(b.wall_mm), "length_mm": num(b.length_mm), "material": b.material,
        "conductor": b.conductor, "mass_kg": num(b.mass_kg, 5), "quantity": b.quantity,
        "datum": b.datum, "mounting": b.mounting, "modelled_as_conductor": b.modelled,
        "correction_frequency_hz": num(b.frequency_hz, 1),
        "circumference_mm": num(b.drilling.circumference_mm),
        "holes": [{"label": h.label, "from_datum_mm": num(h.from_datum_mm),
                   "diameter_mm": num(h.diameter_mm), "angle_deg": num(h.angle_deg, 3),
                   "through": h.through, "purpose": h.purpose} for h in b.drilling.holes],
        "elements": [{"element": m.element, "position_mm": num(m.position_mm),
                      "mounting": m.mounting, "boom_correction_mm": num(m.correction_mm)}
                     for m in b.mounts],
        "bill": [{"item": x.item, "quantity": x.quantity, "size": x.size, "note": x.note}
                 for x in b.bill],
        "balance_from_datum_mm": num(b.balance_mm),
        "notes": list(b.notes),
    }


def order_dict(o: Order) -> dict[str, Any]:
    return {
        "currency": None if o.currency is None else o.currency.label,
        "kerf_mm": num(o.kerf_mm),
        "offers": [{"name": f.name, "stock": f.stock, "length_mm": num(f.length_mm),
                    "ends_mm": num(f.ends_mm),
                    "usable_mm": num(f.usable_mm), "price": f.price, "per": f.per,
                    "piece_cost": num(c, 2), "source": f.source}
                   for f, c in zip(o.offers, o.offer_costs)],
        "buy": [{"offer": b.offer, "stock": b.stock or None, "length_mm": num(b.length_mm),
                 "count": b.count,
                 "piece_cost": num(b.piece_cost, 2), "cost": num(b.cost, 2),
                 "weight_kg": num(b.weight_kg, 5)} for b in o.buy],
        "pieces_to_buy": o.pieces_to_buy,
        "stock_pieces": [{
            "index": p.index, "offer": p.offer, "stock": p.stock or None,
            "length_mm": num(p.length_mm),
            "ends_mm": num(p.ends_mm), "cost": num(p.cost, 2),
            "cuts": [{"element": c.element, "length_mm": num(c.length_mm),
                      "start_mm": num(c.start_mm), "spare": c.spare} for c in p.cuts],
            "used_mm": num(p.used_mm), "remnant_mm": num(p.remnant_mm),
            "utilisation": num(p.utilisation),
        } for p in o.pieces],
        "offcuts_mm": [num(p.remnant_mm) for p in o.pieces if p.remnant_mm > 0],
        "not_offered": [{"stock": u.stock, "cuts": u.cuts, "length_mm": num(u.length_mm)}
                        for u in o.unoffered],
        "cuts": o.cut_count,
        "cut_length_mm": num(o.cut_length_mm),
        "stock_length_mm": num(o.stock_length_mm),
        "utilisation": num(o.utilisation),
        "lower_bound_pieces": o.lower_bound_pieces,
        "lower_bound_cost": num(o.lower_bound_cost, 2),
        "proven_optimal": o.proven_optimal,
        "method": o.method,
        "items": [{"name": i.name, "quantity": i.quantity,
                   "weight_each_kg": num(i.weight_each_kg, 5), "price_each": i.price_each,
                   "weight_kg": num(i.weight_kg, 5), "cost": num(i.cost, 2), "source": i.source}
                  for i in o.items],
        "weight_kg": {"elements": num(o.elements_weight_kg, 5), "stock": num(o.stock_weight_kg, 5),
                      "boom": num(o.supports_weight_kg, 5),
                      "items": num(o.items_weight_kg, 5), "built": num(o.total_weight_kg, 5),
                      "shipping": num(o.shipping_weight_kg, 5)},
        "cost": {"stock": num(o.stock_cost, 2), "items": num(o.items_cost, 2),
                 "total": num(o.total_cost, 2)},
        "total_weight_kg": num(o.total_weight_kg, 5),
        "total_cost": num(o.total_cost, 2),
    }


def plan_to_dict(plan: Plan) -> dict[str, Any]:
    s = plan.stock
    design = plan.design
    out: dict[str, Any] = {
        "format": PLAN_FORMAT,
        "format_version": PLAN_FORMAT_VERSION,
        "project": design.project,
        "source": design.source,
        "units": {"lengths": "mm", "mass": "kg", "angles": "deg"},
        "shop": {"display_units": design.shop.units, "fraction": design.shop.fraction,
                 "kerf_mm": num(design.shop.kerf_mm), "trim_per_end_mm": num(design.shop.trim_mm)},
        "stock": {
            "description": s.description,
            **profile_dict(s.profile),
            "material": s.material_key,
            "material_name": s.material_name,
            "material_source": s.material_source,
            "dimension_source": s.source,
            "k_factor": s.k_factor,
            "mass_per_m_kg": num(s.mass_per_m_kg, 6),
        },
        "elements": [element_dict(e) for e in plan.elements],
        "findings": [f.to_dict() for f in plan.findings],
    }
    if plan.order is not None:
        out["order"] = order_dict(plan.order)
    if plan.electrical is not None:
        out["electrical"] = _plan_electrical(plan.electrical)
    if plan.boom is not None:
        out["boom"] = boom_dict(plan.boom)
    if plan.drilling:
        out["drilling"] = [{
            "name": d.name, "section": d.section, "outside_mm": num(d.outside_mm),
            "length_mm": num(d.length_mm), "circumference_mm": num(d.circumference_mm),
            "datum": d.datum,
            "holes": [{"label": h.label, "from_datum_mm": num(h.from_datum_mm),
                       "angle_deg": num(h.angle_deg, 3), "diameter_mm": num(h.diameter_mm),
                       "through": h.through, "purpose": h.purpose} for h in d.holes]}
            for d in plan.drilling]
    return out


def plan_to_json(plan: Plan) -> str:
    return json.dumps(plan_to_dict(plan), indent=2, sort_keys=False, allow_nan=False) + "\n"
