"""The jig layout against the Plan's figures, with shapely as the reference
for clearances and overlaps."""

from __future__ import annotations

import dataclasses
import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from shapely.geometry import LineString, Point, box
from shapely.ops import unary_union

from fabplan.design.jig import JigSettings
from fabplan.jig.shapes import Circle, Contour, Text
from fabplan.plan import jig_for as layout_jig


def _items(layout, role_prefix: str, kind: str | None = None):
    out = []
    for bed in layout.beds:
        for pl in bed.parts:
            if kind is not None and pl.part.kind != kind:
                continue
            out.extend((bed.index, pl, it) for it in pl.part.items
                       if it.role.startswith(role_prefix))
    return out


def _check_beds(layout):
    """Every part inside its bed and no two parts overlapping (shapely)."""
    for bed in layout.beds:
        frame = box(0, 0, bed.width_mm, bed.height_mm)
        shapes = [pl.outline() for pl in bed.parts]
        for s in shapes:
            assert frame.contains(s)
        for i in range(len(shapes)):
            for j in range(i + 1, len(shapes)):
                assert not shapes[i].intersects(shapes[j])
    assert not [f for f in layout.findings if f.code == "jig-overlap"]


def test_pins_are_tangent_to_the_conductor(example_plan):
    e = example_plan.elements[0]
    s = JigSettings()
    layout = layout_jig(example_plan, s)
    pts, _ = e.piece.path.sample(0.05)
    centreline = LineString([(p[0], p[1]) for p in pts])
    pins = [it.shape for _, _, it in _items(layout, "pin-hole", "plate")]
    assert len(pins) >= 8
    for c in pins:
        # centre offset by half the conductor plus the pin radius (the brief's rule)
        expected = e.piece.conductor_diameter_mm / 2 + s.pin_diameter_mm / 2
        assert centreline.distance(Point(c.centre)) == pytest.approx(expected, abs=1e-3)
        assert c.radius == pytest.approx(s.pin_diameter_mm / 2)
    # pins along one straight side sit at whole pitches from each other (a station
    # is left out where a pin would hide an engraved mark)
    top = sorted(c.centre[0] for c in pins if c.centre[1] > 15.875 + 1)
    gaps = [(b - a) / s.pin_pitch_mm for a, b in zip(top, top[1:])]
    assert gaps and all(g == pytest.approx(round(g)) and round(g) >= 1 for g in gaps)
    # and none of them covers a mark
    for m in e.piece.forming.jig_marks:
        assert all(math.dist(c.centre, m.point_mm) > c.radius + e.piece.conductor_diameter_mm / 2
                   for c in pins)


def test_pins_clear_the_former_discs(example_plan):
    layout = layout_jig(example_plan, JigSettings())
    f = example_plan.elements[0].piece.forming
    for _, _, it in _items(layout, "pin-hole", "plate"):
        for fm in f.formers:
            gap = math.dist(it.shape.centre, fm.centre_mm) - fm.radius_mm - it.shape.radius
            assert gap > 0


def test_formers_and_bolt_holes_come_from_the_plan(example_plan):
    layout = layout_jig(example_plan, JigSettings())
    f = example_plan.elements[0].piece.forming
    discs = [pl.part for bed in layout.beds for pl in bed.parts if pl.part.kind == "former"]
    assert sorted(p.name for p in discs) == sorted(f"70 cm driven element: former {fm.label}"
                                                   for fm in f.formers)
    for fm in f.formers:
        hole = [it.shape for _, _, it in _items(layout, f"bolt-hole {fm.label}", "plate")]
        assert len(hole) == 1 and hole[0].centre == pytest.approx(fm.centre_mm)


@pytest.mark.parametrize("bed", [(600.0, 400.0), (450.0, 200.0), (250.0, 300.0)])
@pytest.mark.parametrize("split", ["sections", "end-plates"])
def test_parts_fit_their_beds_without_overlap(example_plan, long_plan, bed, split):
    for plan in (example_plan, long_plan):
        layout = layout_jig(plan, JigSettings(bed_mm=bed, split=split))
        _check_beds(layout)
        assert layout.beds


def test_a_long_plate_is_cut_into_sections_with_matching_alignment_holes(long_plan):
    s = JigSettings(bed_mm=(600.0, 400.0))
    layout = layout_jig(long_plan, s)
    _check_beds(layout)
    sections = [pl.part for bed in layout.beds for pl in bed.parts if pl.part.kind == "section"]
    assert len(sections) == 2
    assert "jig-plate-split" in {f.code for f in layout.findings}
    # the sections butt together: one's right edge is the other's left edge
    (a0, _, a1, _), (b0, _, b1, _) = sorted(p.bounds() for p in sections)
    assert a1 == pytest.approx(b0)
    assert max(a1 - a0, b1 - b0) <= 600.0 - 2 * s.part_gap_mm
    # alignment holes pair across the joint at the same heights, one splice plate holds them
    holes = {p.bounds()[0]: sorted(it.shape.centre for it in p.items if it.role == "align 1")
             for p in sections}
    left, right = holes[a0], holes[b0]
    assert len(left) == len(right) == 2
    for (xl, yl), (xr, yr) in zip(left, right):
        assert yl == pytest.approx(yr) and xl < a1 < xr
    splice = [pl.part for bed in layout.beds for pl in bed.parts if pl.part.kind == "splice"]
    spl = sorted(it.shape.centre for it in splice[0].items if it.role == "align 1")
    assert math.dist(spl[0], spl[2]) == pytest.approx(right[0][0] - left[0][0])
    # nothing of the formers' bolt holes is lost in the cut
    bolts = [it for p in sections for it in p.items if it.role.startswith("bolt-hole")]
    assert len(bolts) == len(long_plan.elements[0].piece.forming.formers)


def test_end_plates_carry_the_plan_spacing(long_plan):
    layout = layout_jig(long_plan, JigSettings(bed_mm=(1000.0, 400.0), split="end-plates"))
    f = long_plan.elements[0].piece.forming
    kinds = [pl.part.kind for bed in layout.beds for pl in bed.parts]
    assert kinds.count("end-plate") == 2 and kinds.count("spacing-bar") == 1
    bar = next(pl.part for bed in layout.beds for pl in bed.parts
               if pl.part.kind == "spacing-bar")
    c = [it.shape.centre for it in bar.items if it.role.startswith("bolt-hole")]
    assert math.dist(*c) == pytest.approx(f.former_spacing_mm[0], abs=1e-9)
    _check_beds(layout)


@pytest.mark.parametrize("kerf", [0.0, 0.2, 0.5])
def test_kerf_grows_outlines_and_shrinks_holes(example_plan, kerf):
    s = JigSettings(kerf_mm=kerf)
    layout = layout_jig(example_plan, s)
    f = example_plan.elements[0].piece.forming
    for fm in f.formers:
        disc = next(pl.part for bed in layout.beds for pl in bed.parts
                    if pl.part.name.endswith(f"former {fm.label}"))
        cut = [it.shape for it in disc.items if it.op == "cut"][0]
        assert isinstance(cut, Contour) and cut.segments[0].radius == pytest.approx(
            fm.radius_mm + kerf / 2)
        hole = [it.shape for it in disc.items if it.op == "drill"][0]
        assert hole.radius == pytest.approx(s.bolt_hole_mm / 2 - kerf / 2)
    plate = next(pl.part for bed in layout.beds for pl in bed.parts if pl.part.kind == "plate")
    base = layout_jig(example_plan, JigSettings()).beds[0]
    plate0 = next(pl.part for pl in base.parts if pl.part.kind == "plate")
    grow = plate.outline.area - plate0.outline.area
    outline0 = [it.shape for it in plate0.items if it.op == "cut"][0]
    # Steiner: perimeter * k/2 + pi (k/2)^2 for a convex outline (shapely areas measured)
    assert grow == pytest.approx(outline0.length * kerf / 2 + math.pi * (kerf / 2) ** 2,
                                 rel=1e-3, abs=1e-6)


def test_labels_name_element_stock_former_and_overbend(example_plan):
    layout = layout_jig(example_plan, JigSettings())
    e = example_plan.elements[0]
    text = " ".join(it.shape.text for _, _, it in _items(layout, "label", "plate"))
    assert e.name in text and example_plan.stock.description in text
    for fm in e.piece.forming.formers:
        assert f"dia {2 * fm.radius_mm:.2f} mm" in text
    for b in e.piece.forming.bends:
        assert f"bend to {b.overbend_deg:.1f} deg" in text


def test_every_jig_mark_is_engraved_across_the_conductor(example_plan):
    layout = layout_jig(example_plan, JigSettings())
    e = example_plan.elements[0]
    lines = [it.shape for _, _, it in _items(layout, "mark ", "plate")]
    assert len(lines) == len(e.piece.forming.jig_marks)
    for m, line in zip(e.piece.forming.jig_marks, lines):
        assert line.midpoint() == pytest.approx(m.point_mm, abs=1e-9)
        # perpendicular to the stock, longer than the conductor is wide
        d = (line.end[0] - line.start[0], line.end[1] - line.start[1])
        assert abs(d[0] * m.direction[0] + d[1] * m.direction[1]) < 1e-9
        assert line.length > e.piece.conductor_diameter_mm


def test_calibration_squares_are_100_mm_and_4_in(example_plan):
    layout = layout_jig(example_plan, JigSettings())
    squares = [it.shape for _, _, it in _items(layout, "calibration", "calibration")]
    sides = sorted(contour.segments[0].length for contour in squares)
    # source: 1 in = 25.4 mm exactly (NIST SP 811)
    assert sides == pytest.approx([100.0, 101.6])


def test_helix_gets_a_mandrel_and_a_pitch_guide(helix_plan):
    s = JigSettings()
    layout = layout_jig(helix_plan, s)
    e = helix_plan.elements[0]
    parts = {pl.part.kind: pl.part for bed in layout.beds for pl in bed.parts}
    assert {"mandrel", "pitch-guide"} <= set(parts)
    assert "plate" not in parts
    mandrel = [it.shape for it in parts["mandrel"].items if it.role == "mandrel"][0]
    ys = [p[1] for p in mandrel.points()]
    assert max(ys) - min(ys) == pytest.approx(2 * e.piece.forming.bends[0].former_radius_mm)
    # one line per turn (its front half), every one on the mandrel's body
    turns = [it.shape for it in parts["mandrel"].items if it.role == "turn"]
    assert len(turns) == round(e.piece.bends[0].angle_deg / 360)
    xs = [p[0] for p in mandrel.points()]
    for line in turns:
        for x, _ in (line.start, line.end):
            assert min(xs) - 1e-9 <= x <= max(xs) + 1e-9
    notes = " ".join(it.shape.text for it in parts["mandrel"].items
                     if isinstance(it.shape, Text))
    assert f"{e.piece.bends[0].pitch_mm:.2f} mm" in notes
    # the guide's notches are the conductor's radius, one pitch apart; a router bit
    # wider than them is flagged
    guide = [it.shape for it in parts["pitch-guide"].items if it.op == "cut"][0]
    notches = sorted(sg.centre[0] for sg in guide.segments
                     if getattr(sg, "sweep_deg", 0) < 0)
    assert len(notches) == 6
    pitch = e.piece.bends[0].pitch_mm
    assert all(b - a == pytest.approx(pitch) for a, b in zip(notches, notches[1:]))
    assert "jig-inside-corner" in {f.code for f in layout.findings}
    laser = layout_jig(helix_plan, dataclasses.replace(s, tool_radius_mm=0.0))
    assert "jig-inside-corner" not in {f.code for f in laser.findings}


def test_holes_smaller_than_the_router_bit_are_flagged_once(example_plan):
    found = [f for f in layout_jig(example_plan, JigSettings(tool_radius_mm=3.175)).findings
             if f.code == "jig-hole-below-tool"]
    # 6 mm pins and 5 mm mounting holes under a 1/4 in bit: one finding names both
    # and says what to do once
    assert len(found) == 1
    assert "pin (6.00 mm)" in found[0].message and "mounting (5.00 mm)" in found[0].message
    assert found[0].message.count("drill") == 1
    codes = {f.code for f in layout_jig(example_plan, JigSettings(tool_radius_mm=1.0)).findings}
    assert "jig-hole-below-tool" not in codes


def test_a_bed_too_small_for_any_plate_is_a_finding(example_plan):
    layout = layout_jig(example_plan, JigSettings(bed_mm=(150.0, 120.0)))
    assert "jig-too-big" in {f.code for f in layout.findings}
    _check_beds(layout)


def test_drill_items_are_circles(example_plan):
    layout = layout_jig(example_plan, JigSettings())
    for bed in layout.beds:
        for pl in bed.parts:
            assert all(isinstance(it.shape, Circle) for it in pl.part.items if it.op == "drill")


def test_end_plate_labels_stay_on_their_plates(long_plan):
    layout = layout_jig(long_plan, JigSettings(bed_mm=(1000.0, 400.0), split="end-plates"))
    for bed in layout.beds:
        for pl in bed.parts:
            if pl.part.kind != "end-plate":
                continue
            x0, y0, x1, y1 = pl.part.bounds()
            for it in pl.part.items:
                if isinstance(it.shape, Text):
                    t = it.shape
                    assert x0 <= t.at[0] and t.at[0] + t.width <= x1
                    assert y0 <= t.at[1] <= y1


@settings(max_examples=15, deadline=None, derandomize=True)
@given(w=st.floats(150.0, 1300.0), h=st.floats(150.0, 900.0),
       split=st.sampled_from(["sections", "end-plates"]), kerf=st.floats(0.0, 1.0))
def test_any_bed_gets_parts_inside_it_and_apart(long_plan, w, h, split, kerf):
    layout = layout_jig(long_plan, JigSettings(bed_mm=(w, h), split=split, kerf_mm=kerf))
    _check_beds(layout)
    kinds = [pl.part.kind for bed in layout.beds for pl in bed.parts]
    # either the plate made it (whole or in pieces) or a finding says why not
    assert {"plate", "section", "end-plate"} & set(kinds) or \
        "jig-too-big" in {f.code for f in layout.findings}


@pytest.mark.parametrize("shape", ["delta-loop", "rect-loop", "hairpin", "folded-dipole"])
def test_the_plate_keeps_its_margin_round_everything(shape):
    from importlib import resources

    from fabplan.design.read import parse_design
    from fabplan.plan import make_plan

    text = resources.files("fabplan").joinpath("templates", f"{shape}.toml").read_text("utf-8")
    plan = make_plan(parse_design(text))
    s = JigSettings(bed_mm=(1200.0, 900.0))
    layout = layout_jig(plan, s)
    plate = next(pl.part for bed in layout.beds for pl in bed.parts if pl.part.kind == "plate")
    outline = plate.outline
    inner = []
    for it in plate.items:
        sh = it.shape
        if it.role == "mounting-hole":
            # a mounting hole lies inside the plate and clear of everything engraved
            assert outline.contains(Point(sh.centre).buffer(sh.radius + 2.0))
            continue
        if isinstance(sh, Circle):
            inner.append(Point(sh.centre).buffer(sh.radius))
        elif isinstance(sh, Text):
            inner.append(box(sh.at[0], sh.at[1], sh.at[0] + sh.width, sh.at[1] + sh.height))
    # shapely: everything on the plate stays a margin inside its edge
    for g in inner:
        assert outline.exterior.distance(g) >= s.margin_mm - 0.6
    holes = [it.shape for it in plate.items if it.role == "mounting-hole"]
    assert len(holes) >= 3
    if shape == "delta-loop":  # a triangle's plate is not a rectangle
        x0, y0, x1, y1 = outline.bounds
        assert outline.area < 0.87 * (x1 - x0) * (y1 - y0)


# -- issue 15: a plate larger than the bed both ways ----------------------------------------
def _parts(layout, kind):
    return [pl.part for bed in layout.beds for pl in bed.parts if pl.part.kind == kind]


def _text_boxes_inside(part):
    """Every text of a part lies inside its outline (shapely), measured with a
    width of 0.8 x height per character (wider than the text's own estimate)."""
    for it in part.items:
        t = it.shape
        if isinstance(t, Text) and not t.rotation_deg:
            boxed = box(t.at[0], t.at[1] - 0.3 * t.height, t.at[0] + 0.8 * t.height * len(t.text),
                        t.at[1] + t.height)
            assert part.outline.buffer(1e-6).contains(boxed), (part.name, t.text)


def test_a_square_loop_too_big_both_ways_is_cut_into_a_grid(square_loop_plan):
    s = JigSettings()  # the default 600 x 400 mm bed, no kerf
    layout = layout_jig(square_loop_plan, s)
    codes = {f.code: f for f in layout.findings}
    assert not [f for f in layout.findings if f.severity == "error"]
    _check_beds(layout)
    sections = sorted(_parts(layout, "section"), key=lambda p: p.name)
    assert len(sections) == 4  # 2 rows of 2: the plate is over 600 mm both ways
    outlines = [p.outline for p in sections]
    whole = unary_union(outlines)
    # shapely: the sections tile the plate, a rounded rectangle, without overlaps
    assert whole.geom_type == "Polygon" and not list(whole.interiors)
    assert sum(o.area for o in outlines) == pytest.approx(whole.area, rel=1e-9)
    for i in range(4):
        for j in range(i + 1, 4):
            assert outlines[i].intersection(outlines[j]).area < 1e-6
    x0, y0, x1, y1 = whole.bounds
    r = s.corner_radius_mm
    plate = box(x0 + r, y0 + r, x1 - r, y1 - r).buffer(r, quad_segs=45)
    assert whole.symmetric_difference(plate).area < 1e-3 * plate.area
    assert min(x1 - x0, y1 - y0) > 600.0  # it did not fit either way
    # every conductor line and hole of the uncut plate is on exactly one section
    f = square_loop_plan.elements[0].piece.forming
    bolts = [it for p in sections for it in p.items if it.role.startswith("bolt-hole")]
    assert sorted(it.role for it in bolts) == sorted(f"bolt-hole {fm.label}" for fm in f.formers)
    for p in sections:
        _text_boxes_inside(p)
    # the finding and the assembly key say which section goes next to which
    msg = codes["jig-plate-split"].message
    assert "2 row(s) of 2" in msg
    for n, (a, b) in enumerate([(1, 2), (3, 4), (1, 3), (2, 4)], 1):
        assert f"splice {n} joins sections {a} and {b}" in msg
    key = _parts(layout, "key")
    assert len(key) == 1 and all(it.op == "notes" for it in key[0].items)
    assert "splice 4 joins sections 2 and 4" in " ".join(
        it.shape.text for it in key[0].items if isinstance(it.shape, Text))


def test_alignment_holes_line_up_across_every_seam(square_loop_plan):
    s = JigSettings()
    layout = layout_jig(square_loop_plan, s)
    sections = {int(p.name.rsplit(" ", 1)[1]): p for p in _parts(layout, "section")}
    splices = {int(p.name.rsplit(" ", 1)[1]): p for p in _parts(layout, "splice")}
    assert sorted(splices) == [1, 2, 3, 4]
    for n, (a, b) in enumerate([(1, 2), (3, 4), (1, 3), (2, 4)], 1):
        role = f"align {n}"
        ha = sorted(it.shape.centre for it in sections[a].items if it.role == role)
        hb = sorted(it.shape.centre for it in sections[b].items if it.role == role)
        assert len(ha) == len(hb) >= 1
        # shapely: the seam is the edge the two sections share
        seam = sections[a].outline.intersection(sections[b].outline)
        assert seam.length > 100.0
        across = (1, 0) if seam.bounds[0] == pytest.approx(seam.bounds[2]) else (0, 1)
        for pa, pb in zip(ha, hb):
            # each pair faces across the seam, the same distance either side
            step = (pb[0] - pa[0], pb[1] - pa[1])
            assert step[1 - across.index(1)] == pytest.approx(0.0, abs=1e-9)
            assert step[across.index(1)] > 0
            assert seam.distance(Point(pa)) == pytest.approx(seam.distance(Point(pb)), abs=1e-9)
            assert Point(pa).within(sections[a].outline) and Point(pb).within(sections[b].outline)
        # the splice plate is drilled to the same pattern (distances between its holes)
        hs = [it.shape.centre for it in splices[n].items if it.role == role]
        mine = sorted(round(math.dist(p, q), 6) for p in ha + hb for q in ha + hb)
        assert sorted(round(math.dist(p, q), 6) for p in hs for q in hs) == mine
        assert all(it.shape.radius == pytest.approx(s.bolt_hole_mm / 2)
                   for it in splices[n].items if it.role == role)


def test_a_square_loop_gets_end_plates_fixed_by_enough_bars(square_loop_plan):
    import numpy as np

    s = JigSettings(split="end-plates")
    layout = layout_jig(square_loop_plan, s)
    assert not [f for f in layout.findings if f.severity == "error"]
    _check_beds(layout)
    plates = _parts(layout, "end-plate")
    bars = _parts(layout, "spacing-bar")
    f = square_loop_plan.elements[0].piece.forming
    assert len(plates) == len(f.formers) == 4  # one corner each
    for p in plates:
        _text_boxes_inside(p)
    # every former's bolt hole is on one plate
    held = {it.role.split()[1]: p.name for p in plates for it in p.items
            if it.role.startswith("bolt-hole")}
    assert sorted(held) == sorted(fm.label for fm in f.formers)
    assert len(set(held.values())) == 4
    # each bar is drilled at its formers' centre distance
    centre = {fm.label: fm.centre_mm for fm in f.formers}
    joints = []
    for bar in bars:
        holes = [it for it in bar.items if it.role.startswith("bolt-hole")]
        la, lb = (it.role.split()[1] for it in holes)
        assert math.dist(holes[0].shape.centre, holes[1].shape.centre) == pytest.approx(
            math.dist(centre[la], centre[lb]), abs=1e-6)
        joints.append((la, lb))
    # the bars fix the plates' places: a framework of n joints in the plane is rigid
    # with 2n - 3 independent bars, i.e. its rigidity matrix has rank 2n - 3
    # (source: Asimow and Roth, "The rigidity of graphs", Trans. AMS 245, 1978; from memory)
    labels = sorted(centre)
    rows = []
    for la, lb in joints:
        row = np.zeros(2 * len(labels))
        d = np.subtract(centre[la], centre[lb])
        row[2 * labels.index(la):2 * labels.index(la) + 2] = d
        row[2 * labels.index(lb):2 * labels.index(lb) + 2] = -d
        rows.append(row)
    assert len(bars) == 2 * 4 - 3
    assert np.linalg.matrix_rank(np.array(rows)) == 2 * 4 - 3
    msg = next(x.message for x in layout.findings if x.code == "jig-end-plates")
    assert msg.count("joins end plates") == len(bars)


def test_a_plate_beyond_every_bed_is_an_error_saying_what_to_change(hairpin):
    from fabplan.design.read import parse_design
    from fabplan.plan import make_plan

    plan = make_plan(parse_design(hairpin(leg="3000 mm")))
    layout = layout_jig(plan, JigSettings(bed_mm=(100.0, 100.0)))
    big = [f for f in layout.findings if f.code == "jig-too-big"]
    assert big and big[0].severity == "error"
    assert "end-plates" in big[0].message and "larger bed" in big[0].message
    assert not _parts(layout, "section")


def test_the_pin_count_is_capped_before_any_work(long_plan):
    # a pin every 0.001 mm would be 3.6 million pin holes (issue 15: it never ended)
    layout = layout_jig(long_plan, JigSettings(pin_pitch_mm=0.001))
    pins = [f for f in layout.findings if f.code == "jig-too-many-pins"]
    assert pins and pins[0].severity == "error" and "pin_pitch" in pins[0].message
    assert not _parts(layout, "plate") and not _parts(layout, "section")


def test_the_bed_count_is_capped_before_packing():
    from fabplan.jig.beds import MAX_BEDS, pack
    from fabplan.jig.parts import calibration_parts

    parts = calibration_parts() * 60  # 120 squares, one to a 120 mm bed
    beds, found = pack(parts, JigSettings(bed_mm=(120.0, 120.0)))
    assert not beds and [f.code for f in found] == ["jig-too-many-beds"]
    beds, found = pack(parts[:MAX_BEDS - 2], JigSettings(bed_mm=(120.0, 120.0)))
    assert len(beds) == MAX_BEDS - 2 and not found


def test_the_helix_guide_notches_leave_the_stated_clearance(helix_plan):
    # common practice, no source: a notch a little wider than the wire (0.5 mm by
    # default) so that the wire drops in and the guide slides off the coil
    d = helix_plan.elements[0].piece.conductor_diameter_mm
    for clearance in (0.5, 1.0):
        s = JigSettings(notch_clearance_mm=clearance)
        guide = _parts(layout_jig(helix_plan, s), "pitch-guide")[0]
        cut = next(it.shape for it in guide.items if it.op == "cut")
        notches = [sg for sg in cut.segments if getattr(sg, "sweep_deg", 0) < 0]
        assert notches and all(2 * sg.radius == pytest.approx(d + clearance) for sg in notches)
        label = " ".join(it.shape.text for it in guide.items if isinstance(it.shape, Text))
        assert f"+ {clearance:.2f} mm clearance" in label
        assert f"{d + clearance:.2f} mm" in label
        _text_boxes_inside(guide)


def test_every_part_label_lies_on_its_part(example_plan, long_plan, helix_plan):
    for plan in (example_plan, long_plan, helix_plan):
        for split in ("sections", "end-plates"):
            layout = layout_jig(plan, JigSettings(split=split))
            for bed in layout.beds:
                for pl in bed.parts:
                    if pl.part.kind in ("plate", "section", "end-plate", "pitch-guide",
                                        "splice"):
                        for it in pl.part.items:
                            t = it.shape
                            if isinstance(t, Text) and it.role != "mark-label":
                                assert pl.part.outline.contains(Point(t.at)), t.text
