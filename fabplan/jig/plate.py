"""The base plate of a flat piece's bending jig.

Everything the builder works against is engraved at true size: the
conductor's centreline and outline, the former outlines with their bolt
holes, the marks (stock centre, feed-gap ends, bend starts and ends) with
their labels, hold-down pin holes both sides of each straight run, a label
block and the datum of the element's coordinates. Every figure comes from the
Plan; the plate only places pins and labels clear of everything else.

Plate outline: the convex outline of everything on the plate grown by the
margin (or the bounding rectangle when that costs under 15 % more area), with
rounded corners and mounting holes. A plate larger than the bed is split
(see split.py). A plate that would need more pin holes than `MAX_PIN_HOLES`,
or more bed-sized sections than split.py cuts, is refused with an error
finding before any work.
"""

from __future__ import annotations

import math
from typing import Any

from ..design.jig import JigSettings
from ..errors import Finding
from ..geometry.planar import bounds, conductor_caps, conductor_edges, planar_centreline
from ..units import format_drawing_length, wrap_words
from .parts import RECTANGLE_PREFERENCE, Board, fits, former_parts, hole, plate, text_box
from .pins import pin_stations, place_pins
from .records import JigPiece, Part
from .shapes import (
    Arc,
    Circle,
    Contour,
    Item,
    Line,
    P,
    RefPoint,
    Text,
    contour_to_polygon,
    offset_contour,
)
from .split import MAX_SECTIONS, split_plate

__all__ = ["plate_parts", "MAX_PIN_HOLES", "MAX_SECTIONS"]

# work bound: a plate needing more is refused with a finding before any work
MAX_PIN_HOLES = 4000  # hold-down pin holes on one piece's plate


def _normal(t: P) -> P:
    return (-t[1], t[0])


def _conductor_items(segs: list[Line | Arc], d: float) -> list[Item]:
    """Engraved centreline and outline (both sides and the end faces)."""
    items: list[Item] = []
    for seg in segs:
        items.append(Item("engrave", seg, "centreline"))
        items += [Item("engrave", edge, "outline") for edge in conductor_edges(seg, d)]
    items += [Item("engrave", cap, "outline") for cap in conductor_caps(segs, d)]
    return items


def plate_parts(e: JigPiece, project: str, s: JigSettings,
                room: tuple[float, float]) -> tuple[list[Part], list[Finding]]:
    """The base plate (whole, or split to fit `room`, the usable width and
    height of the bed in mm) and the former discs of a flat piece."""
    import shapely
    from shapely.geometry import LineString, Point, box

    f = e.forming
    d = e.conductor_diameter_mm
    g = s.kerf_mm / 2
    findings: list[Finding] = []
    segs = planar_centreline(e.path)
    too_big = _beyond_limits(e, s, segs, room)
    if too_big is not None:
        return former_parts(e, s), [too_big]
    # the footprint for clearances: a coarser polyline, widened by its chord error
    step = max(1.0, d)
    coarse, _ = e.path.sample(step)
    sag = min((step * step / (8 * b.radius_mm) for b in e.path.bends), default=0.0)
    conductor = LineString([(p[0], p[1]) for p in coarse]).buffer(d / 2 + sag,
                                                                   cap_style="flat",
                                                                   quad_segs=4)
    items: list[Item] = _conductor_items(segs, d)
    discs = []
    for fm in f.formers:
        c = (fm.centre_mm[0], fm.centre_mm[1])
        items.append(Item("engrave", Circle(c, fm.radius_mm), f"former-outline {fm.label}"))
        items.append(hole(c, s.bolt_hole_mm, g, f"bolt-hole {fm.label}"))
        discs.append(Point(c).buffer(fm.radius_mm))
    keep_out = [conductor, *discs]
    # hold-down pins: both sides of each straight run, tangent to the conductor
    pin_r = s.pin_diameter_mm / 2
    reach = d / 2 + 2.0  # half-length of an engraved mark across the conductor
    ticks = []
    for m in f.jig_marks:
        nx, ny = _normal(m.direction)
        p = m.point_mm
        ticks.append(Line((p[0] - reach * nx, p[1] - reach * ny),
                          (p[0] + reach * nx, p[1] + reach * ny)))
    pins = place_pins(segs, d, s.pin_diameter_mm, s.pin_pitch_mm, discs, ticks)
    for c in pins:
        items.append(hole(c, s.pin_diameter_mm, g, "pin-hole"))
    if pins:
        keep_out.extend(shapely.buffer(shapely.points(pins), pin_r, quad_segs=16).tolist())
    # engraved marks across the conductor, labelled beside it
    th = max(2.0, 0.7 * s.text_height_mm)
    texts: list[Any] = []
    # what a mark's label must keep clear of, and the datum cross, in a spatial
    # index (a label intersects their union exactly when it meets one of them)
    blocked = shapely.STRtree([*keep_out, box(-6.0, -6.0, 11.0, 6.0)])
    for m in f.jig_marks:
        p = (m.point_mm[0], m.point_mm[1])
        nx, ny = _normal(m.direction)
        items.append(Item("engrave", Line((p[0] - reach * nx, p[1] - reach * ny),
                                          (p[0] + reach * nx, p[1] + reach * ny)),
                          f"mark {m.kind}: {m.label}"))
        for extra, side in ((0.0, 1), (0.0, -1), (1.5 * th, 1), (1.5 * th, -1), (3 * th, 1),
                            (3 * th, -1)):
            txt = Text((0.0, 0.0), m.label, th)
            extent = (th / 2 if abs(ny) > 0.5 else txt.width / 2) + 1.0
            dist = d / 2 + s.pin_diameter_mm + 1.0 + extent + extra
            cx, cy = p[0] + side * dist * nx, p[1] + side * dist * ny
            txt = Text((cx - txt.width / 2, cy - th / 2), m.label, th)
            boxed = text_box(txt)
            if len(blocked.query(boxed, predicate="intersects")) or \
                    any(boxed.intersects(b) for b in texts):
                continue
            items.append(Item("engrave", txt, "mark-label"))
            texts.append(boxed)
            break
    # the label block under everything
    x0, y0, x1, y1 = (float(v) for v in shapely.total_bounds([*keep_out, *texts]))
    h = s.text_height_mm
    label_room = min(x1 - x0, max(s.bed_mm) - 2 * (s.part_gap_mm + s.margin_mm) - 20.0)
    lines = _label_lines(project, e, s, max(30, int(label_room / (0.62 * h))))
    label_at = (x0, y0 - 4.0 - h)
    first_label = len(texts)
    y = y0 - 4.0 - h
    for text in lines:
        txt = Text((x0, y), text, h)
        items.append(Item("engrave", txt, "label"))
        texts.append(text_box(txt))
        y -= 1.6 * h
    # datum: the origin of the element's coordinates, and a point 10 mm along +x
    items.append(Item("reference", RefPoint((0.0, 0.0), "datum"), "datum"))
    items.append(Item("reference", RefPoint((10.0, 0.0), "datum +x"), "datum +x"))
    items.append(Item("reference", Line((-5.0, 0.0), (10.0, 0.0)), "datum"))
    items.append(Item("reference", Line((0.0, -5.0), (0.0, 5.0)), "datum"))
    everything = [*keep_out, *texts, Point(0, 0).buffer(10)]
    bx0, by0, bx1, by1 = (float(v) for v in shapely.total_bounds(everything))
    margin = s.margin_mm
    parts: list[Part] = []
    # the convex outline of everything on the plate grown by the margin, when it
    # saves material over the simpler rectangle
    hull = _hull_plate(e, s, everything, items)
    rect = (bx0 - margin, by0 - margin, bx1 + margin, by1 + margin)
    rect_area = (rect[2] - rect[0]) * (rect[3] - rect[1])
    if hull is not None and fits(hull, room) and \
            hull.outline.area * RECTANGLE_PREFERENCE < rect_area:
        parts.append(hull)
    else:
        # a rectangle, cut into pieces that fit the bed
        inset = margin / 2
        for cx, cy in ((rect[0] + inset, rect[1] + inset), (rect[2] - inset, rect[1] + inset),
                       (rect[2] - inset, rect[3] - inset), (rect[0] + inset, rect[3] - inset)):
            items.append(hole((cx, cy), s.mounting_hole_mm, g, "mounting-hole"))
        mounting = [Point(it.shape.centre).buffer(s.mounting_hole_mm / 2) for it in items
                    if it.role == "mounting-hole" and isinstance(it.shape, Circle)]
        board = Board(items, keep_out + mounting + [box(*t.bounds) for t in texts]
                      + [box(-6.0, -6.0, 11.0, 6.0)], texts,  # and the datum cross
                      label_at, tuple(texts[first_label:]))
        plate_ = plate(e.name, "plate", f"{e.name}: base plate", items, rect, s,
                       (s.corner_radius_mm,) * 4)
        if fits(plate_, room):
            parts.append(plate_)
        else:
            split, found = split_plate(e, s, board, rect, room)
            parts.extend(split)
            findings.extend(found)
    parts.extend(former_parts(e, s))
    return parts, findings


def _beyond_limits(e: JigPiece, s: JigSettings, segs: list[Line | Arc],
                   room: tuple[float, float]) -> Finding | None:
    """An error finding, before any work, when the plate would need more pin
    holes or more bed-sized sections than the stage lays out."""
    holes = 2 * sum(count for _, count in pin_stations(segs, s.pin_diameter_mm,
                                                       s.pin_pitch_mm))
    if holes > MAX_PIN_HOLES:
        return Finding("jig-too-many-pins", "error",
                       f"the base plate would need {holes} hold-down pin holes, more than the "
                       f"{MAX_PIN_HOLES} the jig stage lays out for one piece; set a larger "
                       f"[jig] pin_pitch (now {s.pin_pitch_mm:g} mm) or bend this piece "
                       "without a full plate (split = \"end-plates\")", e.name)
    if s.split != "sections" or not segs:
        return None
    x0, y0, x1, y1 = bounds(segs)
    grow = 2 * (e.conductor_diameter_mm / 2 + s.pin_diameter_mm + s.margin_mm)
    w, h = x1 - x0 + grow, y1 - y0 + grow
    cells = min(math.ceil(w / room[0]) * math.ceil(h / room[1]),
                math.ceil(w / room[1]) * math.ceil(h / room[0]))
    if cells > MAX_SECTIONS:
        return Finding("jig-too-big", "error",
                       f"the base plate would be at least {w:.0f} x {h:.0f} mm, about {cells} "
                       f"sections of the {s.bed_mm[0]:.0f} x {s.bed_mm[1]:.0f} mm bed (the jig "
                       f"stage cuts at most {MAX_SECTIONS}); use split = \"end-plates\" (only "
                       "the plate's ends with the formers are cut) or a larger bed", e.name)
    return None


def _hull_plate(e: JigPiece, s: JigSettings, everything: list[Any],
                items: list[Item]) -> Part | None:
    """The plate as the convex outline of everything on it (shapely
    geometries), grown by the margin: straight edges and true arcs of the
    corner radius. Mounting holes go in the margin at the sharpest corners.
    None when the outline degenerates."""
    import shapely
    from shapely.geometry import GeometryCollection, Point
    from shapely.geometry.polygon import orient

    tol = 0.5  # mm: simplifying the hull may cut inside it by this much
    hull = orient(GeometryCollection(everything).convex_hull.simplify(tol), 1.0)
    index = shapely.STRtree(everything)
    if hull.geom_type != "Polygon" or len(hull.exterior.coords) < 4:
        return None
    pts = [(float(x), float(y)) for x, y in hull.exterior.coords[:-1]]
    n = len(pts)
    r = min(s.corner_radius_mm, s.margin_mm)
    normals = []
    for i in range(n):
        (ax, ay), (bx, by) = pts[i], pts[(i + 1) % n]
        ln = math.hypot(bx - ax, by - ay)
        normals.append(((by - ay) / ln, -(bx - ax) / ln))  # outward, counter-clockwise
    # mitred offset by (margin - r + tol), then round corners of radius r
    dist = s.margin_mm - r + tol
    corners = []
    for i in range(n):
        n1, n2 = normals[i - 1], normals[i]
        k = dist / (1.0 + n1[0] * n2[0] + n1[1] * n2[1])
        corners.append((pts[i][0] + k * (n1[0] + n2[0]), pts[i][1] + k * (n1[1] + n2[1])))
    nominal = Contour(tuple(Line(corners[i], corners[(i + 1) % n]) for i in range(n)))
    outline = offset_contour(nominal, r + s.kerf_mm / 2)
    # mounting holes: half the margin in from both edges at the sharpest corners
    turns = sorted(range(n), key=lambda i: -math.acos(max(-1.0, min(1.0, normals[i - 1][0]
                   * normals[i][0] + normals[i - 1][1] * normals[i][1]))))
    holes: list[P] = []
    for i in turns:
        n1, n2 = normals[i - 1], normals[i]
        k = (s.margin_mm / 2) / (1.0 + n1[0] * n2[0] + n1[1] * n2[1])
        c = (pts[i][0] + k * (n1[0] + n2[0]), pts[i][1] + k * (n1[1] + n2[1]))
        if all(math.dist(c, h) > 6 * s.mounting_hole_mm for h in holes) and \
                not len(index.query(Point(c).buffer(s.mounting_hole_mm),
                                    predicate="intersects")):
            holes.append(c)
        if len(holes) == 4:
            break
    g = s.kerf_mm / 2
    plate_items = [Item("cut", outline, "outline"), *items,
                   *(hole(c, s.mounting_hole_mm, g, "mounting-hole") for c in holes)]
    return Part(f"{e.name}: base plate", "plate", e.name, tuple(plate_items),
                contour_to_polygon(outline))


def _label_lines(project: str, e: JigPiece, s: JigSettings, width: int) -> list[str]:
    f = e.forming
    units = s.units
    lines = [f"{e.name} - bending jig, full size ({project})",
             f"stock: {e.stock_description}"]
    for fm in f.formers:
        bends = ", ".join(str(i) for i in fm.bend_indices)
        lines.append(f"former {fm.label}: dia {format_drawing_length(2 * fm.radius_mm, units)}, "
                     f"bend(s) {bends}, "
                     f"wrap {fm.wrap_deg:.1f} deg")
    for b in f.bends:
        lines.append(f"bend {b.index}: bend to {b.overbend_deg:.1f} deg "
                     f"(springback {b.springback_deg:.1f} deg), former radius "
                     f"{format_drawing_length(b.former_radius_mm, units)}")
    for (fa, fb), sp in zip(zip(f.formers, f.formers[1:]), f.former_spacing_mm):
        lines.append(f"former spacing {fa.label}-{fb.label}: {format_drawing_length(sp, units)} "
                     "centre to centre")
    lines.append("check the 100 mm and 4 in squares before use")
    out: list[str] = []
    for line in lines:
        out.extend(wrap_words(line, width))
    return out
