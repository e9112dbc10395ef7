"""The DXF and SVG files read back with independent readers (ezdxf's reader,
xml.etree) and measured against the Plan's figures."""

from __future__ import annotations

import math
import xml.etree.ElementTree as ET

import numpy as np
import pytest
from shapely.geometry import Point, Polygon, box

from fabplan.design.jig import JigSettings
from fabplan.plan import jig_for as layout_jig
from fabplan.render.dxf import LAYERS, bed_to_dxf
from fabplan.render.svg import INKSCAPE_NS, bed_to_svg

TOL = 0.01  # mm: the brief's tolerance for figures read back from a drawing
SVG = "{http://www.w3.org/2000/svg}"


def _plate_bed(layout):
    for bed in layout.beds:
        if any(pl.part.kind == "plate" for pl in bed.parts):
            return bed
    raise AssertionError("no bed with a whole plate")


@pytest.fixture(scope="module")
def mm_doc(example_plan, read_dxf):
    layout = layout_jig(example_plan, JigSettings(kerf_mm=0.0))
    bed = _plate_bed(layout)
    doc = read_dxf(bed_to_dxf(layout, bed))
    return layout, doc


def test_dxf_version_units_layers_and_audit(mm_doc):
    _, doc = mm_doc
    assert doc.dxfversion >= "AC1027"  # R2013 or newer
    assert doc.header["$INSUNITS"] == 4  # source: DXF reference, $INSUNITS 4 = millimetres
    auditor = doc.audit()
    assert not auditor.has_errors, [str(e) for e in auditor.errors]
    colours = {doc.layers.get(name).color for name, _ in LAYERS.values()}
    assert len(colours) == len(LAYERS)
    used = {e.dxf.layer for e in doc.modelspace()}
    assert {name for name, _ in LAYERS.values()} <= used


def test_former_discs_radii_and_spacing_read_back(mm_doc, example_plan, datum_transform, to_bed):
    _, doc = mm_doc
    msp = doc.modelspace()
    f = example_plan.elements[0].piece.forming
    cut = sorted(c.dxf.radius for c in msp.query(f"CIRCLE[layer=='{LAYERS['cut'][0]}']"))
    assert cut == pytest.approx(sorted(fm.radius_mm for fm in f.formers), abs=TOL)
    # the plate's bolt holes, found at the Plan's centres through the datum
    frame = datum_transform(msp)
    drills = [(np.array([c.dxf.center.x, c.dxf.center.y]), c.dxf.radius)
              for c in msp.query(f"CIRCLE[layer=='{LAYERS['drill'][0]}']")]
    found = []
    for fm in f.formers:
        want = to_bed(frame, fm.centre_mm)
        near = [p for p, r in drills if np.linalg.norm(p - want) < TOL]
        assert len(near) == 1
        found.append(near[0])
    for (a, b), spacing in zip(zip(found, found[1:]), f.former_spacing_mm):
        assert float(np.linalg.norm(b - a)) == pytest.approx(spacing, abs=TOL)


def test_every_mark_position_reads_back(mm_doc, example_plan, datum_transform, to_bed):
    _, doc = mm_doc
    msp = doc.modelspace()
    frame = datum_transform(msp)
    mids = [np.array([(ln.dxf.start.x + ln.dxf.end.x) / 2, (ln.dxf.start.y + ln.dxf.end.y) / 2])
            for ln in msp.query(f"LINE[layer=='{LAYERS['engrave'][0]}']")]
    marks = example_plan.elements[0].piece.forming.jig_marks
    assert marks
    for m in marks:
        want = to_bed(frame, m.point_mm)
        assert min(float(np.linalg.norm(p - want)) for p in mids) < TOL, m.label


def test_arcs_are_true_arcs_and_contours_closed(mm_doc):
    _, doc = mm_doc
    msp = doc.modelspace()
    assert len(msp.query("ARC")) >= 6  # centreline and outline of the two ends
    polys = msp.query("LWPOLYLINE")
    assert polys and all(p.closed for p in polys)
    cut = [p for p in polys if p.dxf.layer == LAYERS["cut"][0]]
    # rounded corners as bulges (DXF reference, LWPOLYLINE: bulge = tan(sweep / 4)); the
    # corners of a convex outline turn through 360 degrees in all
    for p in cut:
        sweeps = [4 * math.atan(b) for (b,) in p.get_points("b") if b]
        assert sweeps and all(sw > 0 for sw in sweeps)
        assert sum(sweeps) == pytest.approx(2 * math.pi)


def _cut_shapes(doc):
    """Cut outlines as shapely polygons, via ezdxf's own path flattening."""
    from ezdxf import path

    out = []
    for e in doc.modelspace().query(f"*[layer=='{LAYERS['cut'][0]}']"):
        if e.dxftype() == "CIRCLE":
            out.append(Point(e.dxf.center.x, e.dxf.center.y).buffer(e.dxf.radius, quad_segs=64))
        else:
            pts = [(v.x, v.y) for v in path.make_path(e).flattening(0.01)]
            if math.dist(pts[0], pts[-1]) < 1e-6:
                pts = pts[:-1]  # the flattened closing point, equal to the first to ~1e-14
            out.append(Polygon(pts))
    return out


@pytest.mark.parametrize("bed", ["600x400mm", "250x300mm"])
def test_no_two_cut_parts_overlap_in_the_file(long_plan, example_plan, bed, read_dxf):
    from fabplan.design.jig import with_options

    s = with_options(JigSettings(kerf_mm=0.2), bed=bed)
    for plan in (example_plan, long_plan):
        layout = layout_jig(plan, s)
        for b in layout.beds:
            shapes = _cut_shapes(read_dxf(bed_to_dxf(layout, b)))
            if not shapes:  # a bed of calibration squares or the assembly key: nothing to cut
                assert {pl.part.kind for pl in b.parts} <= {"key", "calibration"}
                continue
            for i in range(len(shapes)):
                assert shapes[i].is_valid
                assert 0 <= shapes[i].bounds[0] and shapes[i].bounds[2] <= b.width_mm
                for j in range(i + 1, len(shapes)):
                    assert not shapes[i].intersects(shapes[j])
            # the file's outlines are the layout's, placed and turned: same total area
            placed = [pl.outline() for pl in b.parts
                      if pl.part.kind not in ("calibration", "mandrel", "key")]
            assert sum(x.area for x in shapes) == pytest.approx(sum(x.area for x in placed),
                                                                rel=1e-3)
            assert Polygon().union(shapes[0]).symmetric_difference(
                min(placed, key=lambda x: x.centroid.distance(shapes[0].centroid))).area \
                < 1e-3 * shapes[0].area


def test_inch_drawing_scales_every_figure(example_plan, read_dxf, datum_transform, to_bed):
    layout = layout_jig(example_plan, JigSettings(units="in"))
    bed = _plate_bed(layout)
    doc = read_dxf(bed_to_dxf(layout, bed))
    assert doc.header["$INSUNITS"] == 1  # source: DXF reference, $INSUNITS 1 = inches
    assert not doc.audit().has_errors
    msp = doc.modelspace()
    f = example_plan.elements[0].piece.forming
    cut = sorted(c.dxf.radius for c in msp.query(f"CIRCLE[layer=='{LAYERS['cut'][0]}']"))
    # source: 1 in = 25.4 mm exactly (NIST SP 811)
    assert [r * 25.4 for r in cut] == pytest.approx(sorted(fm.radius_mm for fm in f.formers),
                                                    abs=TOL)
    frame = datum_transform(msp)
    mids = [np.array([(ln.dxf.start.x + ln.dxf.end.x) / 2, (ln.dxf.start.y + ln.dxf.end.y) / 2])
            for ln in msp.query(f"LINE[layer=='{LAYERS['engrave'][0]}']")]
    for m in f.jig_marks:
        want = to_bed(frame, m.point_mm, 1 / 25.4)
        assert min(float(np.linalg.norm(p - want)) for p in mids) * 25.4 < TOL


def test_same_layout_same_bytes(example_plan):
    a = layout_jig(example_plan, JigSettings(kerf_mm=0.15))
    b = layout_jig(example_plan, JigSettings(kerf_mm=0.15))
    for x, y in zip(a.beds, b.beds):
        assert bed_to_dxf(a, x) == bed_to_dxf(b, y)
        assert bed_to_svg(a, x) == bed_to_svg(b, y)


def test_svg_size_in_mm_and_a_measured_spacing(example_plan):
    s = JigSettings()
    layout = layout_jig(example_plan, s)
    bed = _plate_bed(layout)
    root = ET.fromstring(bed_to_svg(layout, bed))
    assert root.get("width") == f"{s.bed_mm[0]:g}mm" and root.get("height") == f"{s.bed_mm[1]:g}mm"
    assert [float(v) for v in root.get("viewBox").split()] == [0, 0, *s.bed_mm]
    f = example_plan.elements[0].piece.forming
    centres = {}
    for c in root.iter(f"{SVG}circle"):
        role = c.get("data-role", "")
        if role.startswith("bolt-hole "):
            centres[role.split()[1]] = (float(c.get("cx")), float(c.get("cy")))
    measured = math.dist(centres[f.formers[0].label], centres[f.formers[1].label])
    assert measured == pytest.approx(f.former_spacing_mm[0], abs=TOL)
    # each operation is one group with its own colour
    groups = {g.get("id"): g for g in root.iter(f"{SVG}g")}
    assert {"JIG_CUT", "JIG_DRILL", "JIG_ENGRAVE"} <= set(groups)
    assert len({g.get("stroke") for g in groups.values()}) == len(groups)
    # the former discs' cut circles have the Plan's radii
    radii = sorted(float(c.get("r")) for c in groups["JIG_CUT"].iter(f"{SVG}circle"))
    assert radii == pytest.approx(sorted(fm.radius_mm for fm in f.formers), abs=TOL)


def test_jig_files_are_written_all_or_nothing(long_plan, tmp_path):
    import dataclasses

    from fabplan.errors import FabplanError
    from fabplan.render.files import write_set
    from fabplan.render.jig import jig_files

    s = JigSettings(bed_mm=(600.0, 400.0))
    plan = dataclasses.replace(long_plan, jig=layout_jig(long_plan, s))
    paths = write_set(tmp_path / "out", jig_files(plan, ("dxf", "svg")), False)
    names = sorted(p.name for p in paths)
    beds = len(plan.jig.beds)
    assert beds >= 2 and len(names) == 2 * beds
    assert names[0] == "design-jig-1.dxf"  # a design read from text has no file name
    # one existing target blocks the whole run; nothing else is touched
    keep = {p: p.read_bytes() for p in paths}
    paths[-1].write_bytes(b"mine")
    paths[0].unlink()
    with pytest.raises(FabplanError, match="already exists"):
        write_set(tmp_path / "out", jig_files(plan, ("dxf", "svg")), False)
    assert not paths[0].exists() and paths[-1].read_bytes() == b"mine"
    assert not [p for p in (tmp_path).iterdir() if p.name.startswith(".")]  # no leftovers
    write_set(tmp_path / "out", jig_files(plan), True)
    assert {p: p.read_bytes() for p in paths} == keep

def _svg_arc_centre(p0, p1, r, large, sweep):
    """Centre of an SVG elliptical arc with rx = ry = r and no rotation, by the
    endpoint-to-centre conversion of the SVG 1.1 specification (appendix F.6.5)."""
    x1p, y1p = (p0[0] - p1[0]) / 2, (p0[1] - p1[1]) / 2
    k = math.sqrt(max(r * r - x1p * x1p - y1p * y1p, 0.0) / (x1p * x1p + y1p * y1p))
    if large == sweep:
        k = -k
    cxp, cyp = k * y1p, -k * x1p
    return cxp + (p0[0] + p1[0]) / 2, cyp + (p0[1] + p1[1]) / 2


def test_svg_plate_corners_bulge_outward(example_plan):
    import re

    layout = layout_jig(example_plan, JigSettings(kerf_mm=0.2))
    bed = _plate_bed(layout)
    root = ET.fromstring(bed_to_svg(layout, bed))
    plate = next(pl for pl in bed.parts if pl.part.kind == "plate")
    path = next(p for p in root.iter(f"{SVG}path") if p.get("data-role") == "outline")
    tokens = re.findall(r"[MLAZ]|-?[\d.]+", path.get("d"))
    x0, y0, x1, y1 = plate.outline().bounds
    inside = (x0, bed.height_mm - y1, x1, bed.height_mm - y0)  # SVG y runs down
    pos, i, arcs = None, 0, 0
    while i < len(tokens):
        t = tokens[i]
        if t in "ML":
            pos = (float(tokens[i + 1]), float(tokens[i + 2]))
            i += 3
        elif t == "A":
            r = float(tokens[i + 1])
            large, sweep = int(tokens[i + 4]), int(tokens[i + 5])
            end = (float(tokens[i + 6]), float(tokens[i + 7]))
            cx, cy = _svg_arc_centre(pos, end, r, large, sweep)
            # a convex corner's centre lies inside the plate, one radius from both ends
            assert inside[0] < cx < inside[2] and inside[1] < cy < inside[3]
            assert math.dist((cx, cy), end) == pytest.approx(r, abs=1e-3)
            pos, i, arcs = end, i + 8, arcs + 1
        else:
            i += 1
    assert arcs >= 3


# -- issue 15: notes inside the bed; one colour per operation in both formats -------------
@pytest.mark.parametrize("plan_name, bed, split, units", [
    ("example_plan", "600x400mm", "sections", "mm"),
    ("example_plan", "600x400mm", "sections", "in"),
    ("long_plan", "250x300mm", "sections", "mm"),
    ("long_plan", "600x400mm", "end-plates", "mm"),
    ("helix_plan", "250x300mm", "sections", "mm"),
    ("square_loop_plan", "600x400mm", "sections", "mm"),
    ("square_loop_plan", "600x400mm", "end-plates", "in"),
])
def test_every_dxf_entity_lies_within_its_bed(request, plan_name, bed, split, units, read_dxf):
    from ezdxf import bbox

    from fabplan.design.jig import with_options

    s = with_options(JigSettings(split=split, kerf_mm=0.2), bed=bed, units=units)
    layout = layout_jig(request.getfixturevalue(plan_name), s)
    k = 25.4 if units == "in" else 1.0  # source: NIST SP 811, 1 in = 25.4 mm
    for b in layout.beds:
        status = "NOT BUILDABLE AS IT STANDS: the plan has 12 error finding(s)"
        doc = read_dxf(bed_to_dxf(layout, b, status))
        msp = doc.modelspace()
        notes = []
        bed_texts = {t.text for t in b.notes}
        for e in msp:
            # ezdxf's own extents, text measured with its font metrics
            ext = bbox.extents([e])
            x0, y0, x1, y1 = (ext.extmin.x * k, ext.extmin.y * k, ext.extmax.x * k,
                              ext.extmax.y * k)
            assert -TOL <= x0 and x1 <= b.width_mm + TOL, (e.dxftype(), e.dxf.layer)
            assert -TOL <= y0 and y1 <= b.height_mm + TOL, (e.dxftype(), e.dxf.layer)
            if e.dxftype() == "TEXT" and (e.dxf.text in bed_texts
                                          or status.startswith(e.dxf.text)):
                notes.append(box(x0, y0, x1, y1))
        assert any(status.startswith(e.dxf.text) for e in msp.query("TEXT"))
        assert len(notes) >= len(b.notes) + 1
        # and the notes clear of every part
        for pl in b.parts:
            assert not any(n.intersects(pl.outline()) for n in notes), pl.part.name


def test_svg_and_dxf_give_each_operation_the_same_colour(square_loop_plan, example_plan,
                                                           read_dxf):
    from ezdxf.colors import aci2rgb

    for plan in (example_plan, square_loop_plan):
        layout = layout_jig(plan, JigSettings())
        for b in layout.beds:
            doc = read_dxf(bed_to_dxf(layout, b))
            svg = bed_to_svg(layout, b, "NOT BUILDABLE: a <test> & \"quote\"")
            root = ET.fromstring(svg)  # well-formed XML (xml.etree's parser)
            layers = [g for g in root if g.tag == f"{SVG}g"]
            assert layers
            for g in layers:
                # a top-level group per operation that vector editors list as a layer
                assert g.get(f"{{{INKSCAPE_NS}}}groupmode") == "layer"
                name = g.get("id")
                assert g.get(f"{{{INKSCAPE_NS}}}label").startswith(name)
                # source: the ACI palette as ezdxf's aci2rgb gives it
                r, gg, bb = aci2rgb(doc.layers.get(name).color)
                assert g.get("stroke") == f"#{r:02x}{gg:02x}{bb:02x}", name
                for el in g:
                    if el.tag == f"{SVG}text":
                        assert el.get("fill") == g.get("stroke")
                    else:  # a hairline that stays visible: non-scaling stroke
                        assert el.get("vector-effect") == "non-scaling-stroke"
            ids = [g.get("id") for g in layers]
            assert len(ids) == len(set(ids))
            used = {e.dxf.layer for e in doc.modelspace()}
            assert set(ids) <= used


def test_the_operation_table_covers_every_operation():
    from fabplan.jig.shapes import OPERATIONS as OPS
    from fabplan.render.operations import OPERATIONS

    assert tuple(OPERATIONS) == OPS
    assert len({o.aci for o in OPERATIONS.values()}) == len(OPS)
