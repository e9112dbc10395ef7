"""The boom stage: from the elements' core figures to the beam as it is cut and drilled.

Runs after the core stage (lengths), before forming. For every element with a
position on the design's `[boom]`:

- where it sits: its distance from the boom's datum (each from that one datum, never
  from the element before) and its height above the boom's axis;
- the boom correction for its mounting (fabplan.antennas.boom: GM3SEK's fit for
  elements bonded through, half of it insulated through (I0JXX's table), zero above),
  for its diameter where it crosses the boom and the boom's size in wavelengths at the
  design frequency. Where the correction enters: the design's lengths are electrical
  lengths (the element in free space, as the electrical model sees it: fabplan.em
  models the shape's geometry); the correction is stock the boom "eats", so it is added
  to the cut, half at each tip, and only there: `ElementPlan.pieces` are the pieces as
  cut (their cut length, marks and mass include it), `ElementPlan.geometry` stays the
  shape's, and `ElementMount` records the shape's cut, the correction and the cut.
  When the boom is modelled as a conductor (fabplan.design.beam) the model has the
  boom's effect and nothing is added; the published figure is still shown;
- its holes (a `DrillPattern` of the boom: through holes across the boom at 90 degrees
  round from the alignment line on top, sized for the element or its insulating
  bushing; a vertical bolt hole for a clamp block when mounted above);
- its hardware;
- findings: an element off the boom's end, holes too close together or to an end, an
  element too thick for the boom, a split element bonded through a metal boom, a
  correction outside the published fit's range, a hairpin that runs into the boom.

Matching devices made as parts get their fitting marks on their element (the gamma
strap's place) and their hardware (straps, capacitors), boom or no boom.

Pure: no files, no printing. mm, kg, Hz.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ..antennas.boom import BOOM_LIMIT_WL, boom_correction
from ..antennas.common import wavelength_mm
from ..design.beam import beam_frequency_hz, boom_modelled, mounting_of
from ..design.boom import BoomSpec, boom_x_mm
from ..design.model import Design, ElementSpec
from ..drilling.records import DrillPattern, Hole
from ..errors import FabplanError, Finding
from ..geometry.path import BendPath, Straight
from ..geometry.shapes.base import ElementGeometry, PieceGeometry
from ..lengths.records import PieceCore
from ..lengths.stage import piece_core
from ..units import format_capacitance, format_mm
from .records import BillLine, BoomPlan, CutPiece, ElementMount

__all__ = ["BoomResult", "boom_stage", "design_frequency_hz", "HOLE_SPACING_DIAMETERS",
           "END_DISTANCE_DIAMETERS", "HOLE_ANGLE_DEG"]

HOLE_ANGLE_DEG = 90.0  # through holes enter on the boom's left side (looking forward)
HOLE_SPACING_DIAMETERS = 1.0  # [P] leave at least a hole's diameter of metal between holes
END_DISTANCE_DIAMETERS = 1.5  # [P] a hole's centre at least 1.5 diameters from the boom's end


@dataclass(frozen=True)
class BoomResult:
    """The boom's record (None without a boom), each element's pieces as cut (in the
    design's order), each element's mount (None when not on the boom), the findings."""

    boom: BoomPlan | None
    pieces: tuple[tuple[PieceCore, ...], ...]
    mounts: tuple[ElementMount | None, ...]
    findings: tuple[Finding, ...]


def design_frequency_hz(design: Design) -> float | None:
    """The frequency of the boom correction: [boom] frequency, the electrical target, or
    the middle of the electrical sweep (Hz)."""
    return beam_frequency_hz(design.boom, design.electrical)


def _crossings(spec: ElementSpec) -> list[tuple[str, tuple[float, float, float], int]]:
    """Where an element crosses the boom: (label, point in its own frame (mm), index of
    the piece whose diameter counts there)."""
    if spec.shape == "tip-coupled-pair":
        depth = spec.params.depth_mm
        return [("driven side", (0.0, 0.0, 0.0), 0), ("reflector", (0.0, depth, 0.0), 2)]
    return [("", (0.0, 0.0, 0.0), 0)]


def _extend(path: BendPath, add_a: float, add_b: float) -> BendPath:
    """The path with `add_a` more stock before end A and `add_b` after end B (mm), each
    along the path's end direction."""
    pieces = list(path.pieces)
    origin = np.asarray(path.origin, float)
    if add_a > 0:
        heading = np.asarray(path.heading, float)
        heading = heading / float(np.linalg.norm(heading))
        origin = origin - add_a * heading
        if isinstance(pieces[0], Straight):
            pieces[0] = Straight(pieces[0].length_mm + add_a)
        else:
            pieces.insert(0, Straight(add_a))
    if add_b > 0:
        if isinstance(pieces[-1], Straight):
            pieces[-1] = Straight(pieces[-1].length_mm + add_b)
        else:
            pieces.append(Straight(add_b))
    o = (float(origin[0]), float(origin[1]), float(origin[2]))
    return dataclasses.replace(path, pieces=tuple(pieces), origin=o, _cache={})


def _as_cut(design: Design, spec: ElementSpec, geometry: ElementGeometry,
            core: tuple[PieceCore, ...], correction_mm: float,
            extra_marks: dict[int, tuple[tuple[str, float], ...]]
            ) -> tuple[tuple[PieceCore, ...], tuple[CutPiece, ...]]:
    """Each piece with half the correction added at each of the element's tips, and
    any extra fitting marks (label, mm from the shape's end A)."""
    trim = design.shop.trim_mm if spec.trim_mm is None else spec.trim_mm
    out: list[PieceCore] = []
    cuts: list[CutPiece] = []
    for i, (geo, piece) in enumerate(zip(geometry.pieces, core)):
        add_a = correction_mm / 2 if "A" in geo.tips else 0.0
        add_b = correction_mm / 2 if "B" in geo.tips else 0.0
        marks = extra_marks.get(i, ())
        if add_a or add_b or marks:
            moved = PieceGeometry(geo.label, _extend(geo.path, add_a, add_b), geo.stock,
                                  geo.tips, tuple((lbl, s + add_a) for lbl, s in
                                                  geo.marks + marks), geo.inside)
            new = piece_core(moved, piece.stock, trim)
        else:
            new = piece
        out.append(new)
        cuts.append(CutPiece(piece.label, piece.cut_length_mm, add_a + add_b,
                             new.cut_length_mm))
    return tuple(out), tuple(cuts)


def _match_marks(spec: ElementSpec,
                 geometry: ElementGeometry) -> dict[int, tuple[tuple[str, float], ...]]:
    """Where a gamma's strap, or a T's two straps, clamp to the element (piece index ->
    (label, mm from its end A))."""
    m = spec.match
    if m is None or not m.line_modelled or spec.part_of is not None:
        return {}
    half = spec.params.length_mm / 2
    if m.kind == "gamma":
        return {0: (("gamma strap (centre)", half + m.length_mm),)}
    return {0: (("T strap A (centre)", half - m.length_mm / 2),
                ("T strap B (centre)", half + m.length_mm / 2))}


def boom_stage(design: Design, specs: Sequence[ElementSpec],
               geometries: Sequence[ElementGeometry],
               cores: Sequence[tuple[PieceCore, ...]]) -> BoomResult:
    """The beam as cut and drilled (see the module docstring)."""
    boom = design.boom
    findings: list[Finding] = []
    f_hz = design_frequency_hz(design)
    modelled = boom_modelled(boom, specs)
    pieces: list[tuple[PieceCore, ...]] = []
    mounts: list[ElementMount | None] = []
    holes: list[Hole] = []
    bill: list[BillLine] = []
    for spec, geometry, core in zip(specs, geometries, cores):
        marks = _match_marks(spec, geometry)
        bill += _match_bill(spec, design)
        mounting = mounting_of(spec, boom)
        if boom is None or spec.boom is None or mounting is None:
            cut, _ = _as_cut(design, spec, geometry, core, 0.0, marks)
            pieces.append(cut)
            mounts.append(None)
            continue
        mount, found = _mount(design, boom, spec, geometry, core, mounting, f_hz, modelled,
                              marks)
        findings += found
        pieces.append(mount[1])
        mounts.append(mount[0])
        h, b, hf = _holes_and_hardware(boom, spec, mount[0], mounting)
        holes += h
        bill += b
        findings += hf
    if boom is None:
        return BoomResult(None, tuple(pieces), tuple(mounts), tuple(findings))
    holes.sort(key=lambda h: (h.from_datum_mm, h.angle_deg, h.label))
    findings += _hole_findings(boom, holes)
    findings += _hairpin_findings(boom, specs, geometries)
    bill = _boom_bill(boom) + bill
    plan = BoomPlan(
        description=boom.stock.description, section=boom.stock.section,
        outside_mm=boom.stock.outside_mm, wall_mm=boom.stock.wall_mm, length_mm=boom.length_mm,
        material=boom.stock.material_name, conductor=boom.stock.conductor,
        mass_kg=boom.stock.mass_per_m_kg * boom.length_mm / 1000, quantity=boom.quantity,
        datum=boom.datum, mounting=boom.mounting, modelled=modelled, frequency_hz=f_hz,
        mounts=tuple(m for m in mounts if m is not None),
        drilling=DrillPattern("boom", boom.stock.section, boom.stock.outside_mm, boom.length_mm,
                              f"the boom's {boom.datum} end", tuple(holes)),
        bill=tuple(_merge(bill)), balance_mm=_balance(boom, specs, pieces, mounts),
        notes=_notes(boom, modelled))
    return BoomResult(plan, tuple(pieces), tuple(mounts), tuple(findings))


def _mount(design: Design, boom: BoomSpec, spec: ElementSpec, geometry: ElementGeometry,
           core: tuple[PieceCore, ...], mounting: str, f_hz: float | None, modelled: bool,
           marks: dict[int, tuple[tuple[str, float], ...]]
           ) -> tuple[tuple[ElementMount, tuple[PieceCore, ...]], list[Finding]]:
    found: list[Finding] = []
    name = spec.name
    position = spec.boom.position_mm if spec.boom is not None else 0.0
    x = boom_x_mm(boom, position)
    d = core[0].conductor_diameter_mm
    boom_d = boom.stock.outside_mm
    height = 0.0 if mounting != "above" else boom_d / 2 + (boom.height_mm or 0.0)
    correction = 0.0
    published = upper = fraction = None
    basis = ""
    if not boom.stock.conductor:
        applied = f"none: the boom is {boom.stock.material_name}, not a conductor"
    elif spec.shape != "straight":
        applied = "not applied: the published correction is for straight elements"
        found.append(Finding("boom-correction-not-applied", "info",
                             f"the boom correction is published for straight elements, not a "
                             f"{spec.shape}; check this element with the electrical model",
                             name))
    elif f_hz is None:
        applied = "not applied: no design frequency"
        found.append(Finding("boom-correction-needs-frequency", "warning",
                             "the boom correction depends on the boom's size in wavelengths: "
                             "give [boom] frequency or an [electrical] target", name))
    else:
        lam = wavelength_mm(f_hz)
        try:
            bc = boom_correction(boom_d, d, lam, mounting)  # type: ignore[arg-type]
        except FabplanError as exc:
            bc = None
            if boom_d / lam > BOOM_LIMIT_WL:
                found.append(Finding("boom-correction-out-of-range", "warning",
                                     f"the boom is {boom_d / lam:.3f} wavelength across, beyond "
                                     f"the published fit ({BOOM_LIMIT_WL} wavelength): no "
                                     "correction applied; check with the electrical model",
                                     name))
            else:
                found.append(Finding("element-too-thick-for-boom", "error",
                                     f"a {d:.1f} mm element through a {boom_d:.1f} mm boom: "
                                     f"{exc.rule}; use a larger boom or mount it above", name))
            applied = "not applied: outside the published fit"
        if bc is not None:
            published, upper, fraction, basis = (bc.correction_mm, bc.upper_bound_mm,
                                                 bc.fraction_of_boom, bc.basis)
            if modelled and mounting == "bonded-through":
                applied = ("in the electrical model: the metal boom is modelled as a conductor "
                           "joined to the element")
            else:
                correction = bc.correction_mm
                applied = ("added to the cut length, half at each tip" if correction > 0 else
                           "zero for this mounting")
    if (mounting == "bonded-through" and boom.stock.conductor
            and geometry.feed is not None):
        found.append(Finding("split-element-bonded", "error",
                             "a split (fed) element bonded through a metal boom has its halves "
                             'shorted together: mount it "insulated" or "above" (the '
                             "element's own `mounting`)", name))
    if mounting == "above" and d > 0 and spec.shape == "straight" and boom.stock.conductor \
            and (boom.height_mm or 0.0) < d:
        found.append(Finding("element-touches-boom", "warning",
                             f"the element's axis is only {boom.height_mm or 0.0:.1f} mm above "
                             f"the boom's top: it sits on the metal; raise [boom] height", name))
    hole = None
    if mounting == "bonded-through":
        hole = d + boom.clearance_mm
    elif mounting == "insulated":
        hole = d + 2 * boom.bushing_wall_mm + boom.clearance_mm
    cut, pieces = _as_cut(design, spec, geometry, core, correction, marks)
    mount = ElementMount(name, position, x, height, mounting, correction, published, upper,
                         fraction, applied, basis, hole, d, pieces)
    return (mount, cut), found


def _holes_and_hardware(boom: BoomSpec, spec: ElementSpec, mount: ElementMount,
                        mounting: str) -> tuple[list[Hole], list[BillLine], list[Finding]]:
    holes: list[Hole] = []
    bill: list[BillLine] = []
    found: list[Finding] = []
    placement = spec.placement
    q = spec.quantity
    for label, point, _ in _crossings(spec):
        world = (placement.apply(np.asarray(point, float)) if placement is not None
                 else np.asarray(point, float))
        x = float(world[0])
        from_datum = x if boom.datum == "rear" else boom.length_mm - x
        what = spec.name if not label else f"{spec.name}, {label}"
        if not -1e-6 <= x <= boom.length_mm + 1e-6:
            found.append(Finding("element-off-boom", "error",
                                 f"it sits {format_mm(from_datum)} from the {boom.datum} end, off "
                                 f"the {format_mm(boom.length_mm)} boom: check its position or "
                                 "lengthen the boom", spec.name))
            continue
        if mounting == "above":
            holes.append(Hole(what, from_datum, 0.0, boom.bolt_hole_mm, True,
                              "clamp block bolt (vertical, through the top and bottom)"))
            bill.append(BillLine("insulating clamp block", q, f"for a {mount.crossing_mm:.1f} mm "
                                 f"element, {format_mm(boom.height_mm or 0.0)} above the boom",
                                 "common practice, no source"))
            bill.append(BillLine("bolt, nut and washers", q,
                                 f"for a {boom.bolt_hole_mm:.1f} mm hole",
                                 "stainless; common practice"))
            continue
        hole_d = mount.hole_mm or 0.0
        purpose = ("element, bonded (snug fit)" if mounting == "bonded-through"
                   else "insulating bushing")
        holes.append(Hole(what, from_datum, HOLE_ANGLE_DEG, hole_d, True, purpose))
        if mounting == "insulated":
            bill.append(BillLine("insulating shoulder bushing", 2 * q,
                                 f"bore {mount.crossing_mm:.1f} mm, outside {hole_d:.1f} mm",
                                 "a pair per element: nylon or acetal; common practice"))
            bill.append(BillLine("retaining clip or pin", q, f"for a {mount.crossing_mm:.1f} mm "
                                 "element", "keeps the element centred; common practice"))
        else:
            bill.append(BillLine("stainless self-tapping screw", q, "No. 8 (4 mm)",
                                 "locks and bonds the element to the boom; common practice"))
    if getattr(spec.params, "feed_gap_mm", None) is not None:
        bill.append(BillLine("centre insulator", q, f"joins the halves of {spec.name}",
                             "an insulating rod or block across the feed gap; common practice"))
    return holes, bill, found


def _match_bill(spec: ElementSpec, design: Design) -> list[BillLine]:
    m = spec.match
    if m is None or spec.part_of is not None:
        return []
    q = spec.quantity
    cap = ("value from the electrical check" if m.capacitance_f is None
           else format_capacitance(m.capacitance_f))
    if m.kind == "gamma":
        return [BillLine("gamma strap (shorting clamp)", q,
                         f"rod to element {format_mm(m.spacing_mm or 0.0)} centre to centre",
                         "slides along the rod to adjust; common practice"),
                BillLine("gamma series capacitor", q, cap, "rated for the transmitter's power "
                         "(see the electrical check)"),
                BillLine("coaxial connector and mounting bracket", q, "", "at the element's "
                         "centre: shield to the element, centre to the capacitor")]
    if m.kind == "t-match":
        return [BillLine("T-match strap (shorting clamp)", 2 * q,
                         f"rod to element {format_mm(m.spacing_mm or 0.0)} centre to centre",
                         "one each side; common practice"),
                BillLine("T-match series capacitor", 2 * q, cap, "one in each leg"),
                BillLine("4:1 balun", q, "", "balanced T to the coaxial feed line")]
    return [BillLine("hairpin terminal clamp", 2 * q, "", "joins each hairpin leg to an inner "
                     "end of the driven element and to the feed line; common practice")]


def _boom_bill(boom: BoomSpec) -> list[BillLine]:
    return [BillLine("boom", boom.quantity, f"{boom.stock.description}, "
                     f"{format_mm(boom.length_mm)} long ({boom.stock.material_name})",
                     boom.stock.source),
            BillLine("boom end cap", 2 * boom.quantity, f"to fit {format_mm(boom.stock.outside_mm)}"
                     f" {boom.stock.section}", "keeps water and birds out; common practice"),
            BillLine("boom-to-mast clamp plate with U-bolts", boom.quantity, "",
                     "at the balance point; common practice")]


def _merge(lines: list[BillLine]) -> list[BillLine]:
    """Lines of the same item, size and note added together, in first-seen order."""
    out: dict[tuple[str, str, str], int] = {}
    for b in lines:
        key = (b.item, b.size, b.note)
        out[key] = out.get(key, 0) + b.quantity
    return [BillLine(k[0], q, k[1], k[2]) for k, q in out.items()]


def _hole_findings(boom: BoomSpec, holes: Sequence[Hole]) -> list[Finding]:
    out = []
    for h in holes:
        end = min(h.from_datum_mm, boom.length_mm - h.from_datum_mm)
        if -1e-6 <= end < END_DISTANCE_DIAMETERS * h.diameter_mm:
            out.append(Finding("hole-near-boom-end", "warning",
                               f"the hole for {h.label} is {format_mm(end)} from the boom's end, "
                               f"under {END_DISTANCE_DIAMETERS:g} hole diameters: the end may "
                               "split; lengthen the boom or move the element", h.label))
    for a, b in zip(holes, holes[1:]):
        web = b.from_datum_mm - a.from_datum_mm - (a.diameter_mm + b.diameter_mm) / 2
        if web < HOLE_SPACING_DIAMETERS * max(a.diameter_mm, b.diameter_mm):
            out.append(Finding("holes-too-close", "warning",
                               f"the holes for {a.label} and {b.label} leave "
                               f"{format_mm(max(web, 0.0))} of metal between them, under one "
                               "hole diameter: the boom is weakened there; move one element or "
                               "mount one above", b.label))
    return out


def _hairpin_findings(boom: BoomSpec, specs: Sequence[ElementSpec],
                      geometries: Sequence[ElementGeometry]) -> list[Finding]:
    """A hairpin whose rod passes through the boom's section."""
    out = []
    half = boom.stock.outside_mm / 2
    for spec, geometry in zip(specs, geometries):
        if spec.part_of is None or spec.match is None or spec.match.line_modelled:
            continue
        place = spec.placement
        for piece in geometry.pieces:
            pts, _ = piece.path.sample(2.0)
            world = place.apply(pts) if place is not None else pts
            inside = ((world[:, 0] >= 0) & (world[:, 0] <= boom.length_mm)
                      & (np.abs(world[:, 1]) < half) & (np.abs(world[:, 2]) < half))
            if bool(np.any(inside)):
                out.append(Finding("match-hits-boom", "warning",
                                   "the hairpin runs through the boom: mount the driven element "
                                   'above the boom, or run the hairpin another way '
                                   '([element.match] direction)', spec.name))
                break
    return out


def _balance(boom: BoomSpec, specs: Sequence[ElementSpec],
             pieces: Sequence[tuple[PieceCore, ...]],
             mounts: Sequence[ElementMount | None]) -> float | None:
    """The boom's balance point from the datum (mm): boom and elements (their parts
    at their element's position) by mass."""
    mass = boom.stock.mass_per_m_kg * boom.length_mm / 1000
    moment = mass * boom.length_mm / 2
    x_of = {m.element: m.x_mm for m in mounts if m is not None}
    for spec, ps in zip(specs, pieces):
        x = x_of.get(spec.name if spec.part_of is None else spec.part_of)
        if x is None:
            continue
        w = sum(p.mass_kg for p in ps) * spec.quantity / max(boom.quantity, 1)
        mass += w
        moment += w * x
    if mass <= 0:
        return None
    xb = moment / mass
    return xb if boom.datum == "rear" else boom.length_mm - xb


def _notes(boom: BoomSpec, modelled: bool) -> tuple[str, ...]:
    notes = [f"Every position is measured from the boom's {boom.datum} end, never from the "
             "element before: errors do not add up.",
             "Holes go straight across the boom: mark both sides from the wrap-around template "
             "(drilling-1to1.pdf) and drill from each side towards the middle, or use a "
             "drill guide."]
    if modelled:
        notes.append("The metal boom is modelled as a conductor joined to the bonded elements: "
                     "the boom correction is in the model, not added to the cut.")
    elif boom.stock.conductor:
        notes.append("The boom is not in the electrical model; its effect is the boom "
                     "correction added to each element's cut (GM3SEK fit; I0JXX table).")
    return tuple(notes)
