"""The bending jig as parts to cut, drill and engrave, laid out on machine beds.

`layout_jig(plan, settings)` reads the Plan (the element's bend path and the
forming stage's formers and jig marks) and returns a `JigLayout`: beds, each
with parts placed without overlap, each part a set of `Item`s (cut contours,
drill holes, engraved lines, arcs and text, reference points). Every length
is millimetres; arcs stay true arcs; shapely is used for clearances and the
overlap check. Nothing here decides an engineering length: former radii,
centres, spacing and mark positions come from the Plan as they are; the
layout only places parts and chooses where pins, labels and cuts go.

Plate outline: the convex outline of everything on the plate grown by the
margin (or the bounding rectangle when that costs under 15 % more area), with
rounded corners. A plate larger than the bed is cut into sections with
alignment holes and splice plates, or (split = "end-plates") reduced to two end
plates and a spacing bar drilled at the formers' centre distance.

Kerf: cut outlines grow by half the kerf and holes shrink by half of it, so
the finished parts come out at the drawn size.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from ..errors import DesignError, Finding
from ..units import IN
from .settings import JigSettings
from .shapes import (Arc, Circle, Contour, Item, Line, P, RefPoint, Text, clip_arc_x,
                     clip_line_x, contour_to_polygon, inside_corners, offset_contour,
                     rounded_rect, transform_shape)

__all__ = ["Part", "Placed", "Bed", "JigLayout", "layout_jig", "element_parts",
           "calibration_parts", "all_shapes"]


@dataclass(frozen=True)
class Part:
    """One piece to make (or a drawing to keep), in its own frame (mm)."""

    name: str
    kind: str  # plate, section, end-plate, former, splice, spacing-bar, pitch-guide, mandrel,
    #            calibration
    element: str
    items: tuple[Item, ...]
    outline: Any = field(compare=False, repr=False)  # shapely Polygon: extent incl. kerf

    def bounds(self) -> tuple[float, float, float, float]:
        return tuple(self.outline.bounds)  # type: ignore[return-value]


@dataclass(frozen=True)
class Placed:
    """A part on a bed: turned 90 degrees counter-clockwise when `rotated`,
    then moved by (dx, dy) mm."""

    part: Part
    dx: float
    dy: float
    rotated: bool = False

    def items(self) -> list[Item]:
        return [Item(i.op, transform_shape(i.shape, self.rotated, self.dx, self.dy), i.role)
                for i in self.part.items]

    def outline(self):
        from shapely import affinity

        g = self.part.outline
        if self.rotated:
            g = affinity.rotate(g, 90.0, origin=(0.0, 0.0))
        return affinity.translate(g, self.dx, self.dy)


@dataclass(frozen=True)
class Bed:
    index: int  # 1-based
    width_mm: float
    height_mm: float
    parts: tuple[Placed, ...]
    notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class JigLayout:
    title: str
    settings: JigSettings
    beds: tuple[Bed, ...]
    findings: tuple[Finding, ...]
    notes: tuple[str, ...] = ()


# a rectangular plate is simpler to cut and clamp: it is chosen unless the convex
# outline saves more than this factor of area (common practice, no source)
RECTANGLE_PREFERENCE = 1.15


# -- text helpers -------------------------------------------------------------
def _len(mm: float, units: str) -> str:
    """A drawing length in the drawing's unit first, then the other."""
    if units == "in":
        return f"{mm / IN:.3f} in ({mm:.2f} mm)"
    return f"{mm:.2f} mm ({mm / IN:.3f} in)"


def _wrap(text: str, width: int) -> list[str]:
    words = text.split(" ")
    lines: list[str] = []
    cur = ""
    for w in words:
        if cur and len(cur) + 1 + len(w) > width:
            lines.append(cur)
            cur = w
        else:
            cur = f"{cur} {w}" if cur else w
    if cur:
        lines.append(cur)
    return lines


# -- the element's centreline in its drawing plane ----------------------------
def _centreline(path) -> list[Line | Arc]:
    from ..geometry.path import Line3

    out: list[Line | Arc] = []
    for prim in path.primitives():
        if isinstance(prim, Line3):
            if prim.length > 1e-9:
                out.append(Line((prim.start[0], prim.start[1]), (prim.end[0], prim.end[1])))
            continue
        u, v = prim.u, prim.v
        ccw = u[0] * v[1] - u[1] * v[0] > 0
        start = math.degrees(math.atan2(u[1], u[0]))
        sweep = math.degrees(prim.angle)
        out.append(Arc((prim.centre[0], prim.centre[1]), prim.radius, start,
                       sweep if ccw else -sweep))
    return out


def _normal(t: P) -> P:
    return (-t[1], t[0])


def _conductor_items(segs: list[Line | Arc], d: float) -> list[Item]:
    """Engraved centreline and outline (both sides and the end faces)."""
    h = d / 2
    items: list[Item] = []
    for s in segs:
        items.append(Item("engrave", s, "centreline"))
        if isinstance(s, Line):
            nx, ny = _normal(s.tangent_in())
            for side in (1, -1):
                items.append(Item("engrave", Line(
                    (s.start[0] + side * h * nx, s.start[1] + side * h * ny),
                    (s.end[0] + side * h * nx, s.end[1] + side * h * ny)), "outline"))
        else:
            for r in (s.radius + h, s.radius - h):
                if r > 1e-6:
                    items.append(Item("engrave", Arc(s.centre, r, s.start_deg, s.sweep_deg),
                                      "outline"))
    for p, t in ((segs[0].start, segs[0].tangent_in()), (segs[-1].end, segs[-1].tangent_out())):
        nx, ny = _normal(t)
        items.append(Item("engrave", Line((p[0] + h * nx, p[1] + h * ny),
                                          (p[0] - h * nx, p[1] - h * ny)), "outline"))
    return items


# -- one planar element -------------------------------------------------------
@dataclass
class _Board:
    """A plate being built: its items and the shapely obstacles already on it."""

    items: list[Item]
    keep_out: list  # shapely geometries that a cut line, pin or label must avoid
    texts: list  # shapely boxes of labels
    label_at: P = (0.0, 0.0)  # left end of the label block's first baseline
    label_boxes: tuple = ()  # shapely boxes of the label block's lines
    cache: dict = field(default_factory=dict)


def _text_box(t: Text):
    from shapely.geometry import box

    return box(t.at[0], t.at[1] - 0.25 * t.height, t.at[0] + t.width, t.at[1] + 1.1 * t.height)


def _hole(centre: P, diameter: float, grow: float, role: str) -> Item:
    return Item("drill", Circle(centre, diameter / 2 - grow), role)


def element_parts(plan, e, s: JigSettings) -> tuple[list[Part], list[Finding]]:
    """The parts of one element's jig, and findings about them."""
    if e.forming is None:
        raise DesignError("has no forming figures: the jig is drawn from the forming stage's "
                          "former radii and marks", field=f"element {e.name!r}")
    if any(b.pitch_mm for b in e.path.bends):
        return _helix_parts(plan, e, s)
    if not e.planar:
        return [], [Finding("jig-not-planar", "warning",
                            "the element is not flat, so no flat bending plate is drawn for it; "
                            "bend it with a hand bender from the tool marks", e.name)]
    return _plate_parts(plan, e, s)


def _plate_parts(plan, e, s: JigSettings) -> tuple[list[Part], list[Finding]]:
    from shapely.geometry import LineString, Point, box
    from shapely.ops import unary_union

    f = e.forming
    d = e.conductor_diameter_mm
    g = s.kerf_mm / 2
    findings: list[Finding] = []
    segs = _centreline(e.path)
    pts, _ = e.path.sample(0.5)
    centreline = LineString([(p[0], p[1]) for p in pts])
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
        items.append(_hole(c, s.bolt_hole_mm, g, f"bolt-hole {fm.label}"))
        discs.append(Point(c).buffer(fm.radius_mm))
    keep_out = [conductor, *discs]
    # hold-down pins: both sides of each straight run, tangent to the conductor
    pin_r = s.pin_diameter_mm / 2
    off = d / 2 + pin_r
    pins: list = []
    reach = d / 2 + 2.0  # half-length of an engraved mark across the conductor
    ticks = []
    for m in f.jig_marks:
        nx, ny = _normal(m.direction)
        p = m.point_mm
        ticks.append(LineString([(p[0] - reach * nx, p[1] - reach * ny),
                                 (p[0] + reach * nx, p[1] + reach * ny)]))
    for seg in segs:
        if not isinstance(seg, Line) or seg.length < s.pin_diameter_mm:
            continue
        t = seg.tangent_in()
        nx, ny = _normal(t)
        clear = pin_r + 2.0
        usable = seg.length - 2 * clear
        count = 1 if usable <= 0 else int(usable // s.pin_pitch_mm) + 1
        for j in range(count):
            along = seg.length / 2 + (j - (count - 1) / 2) * s.pin_pitch_mm
            base = (seg.start[0] + along * t[0], seg.start[1] + along * t[1])
            for side in (1, -1):
                c = (base[0] + side * off * nx, base[1] + side * off * ny)
                disc = Point(c).buffer(pin_r + 1.0)
                if centreline.distance(Point(c)) < off - 0.01:
                    continue
                if any(disc.intersects(x) for x in discs):
                    continue
                if any(Point(c).distance(Point(q)) < 2 * pin_r + 2.0 for q in pins):
                    continue
                if any(t.distance(Point(c)) < pin_r + 1.5 for t in ticks):
                    continue  # a pin would hide a mark
                pins.append(c)
    for c in pins:
        items.append(_hole(c, s.pin_diameter_mm, g, "pin-hole"))
        keep_out.append(Point(c).buffer(pin_r))
    # engraved marks across the conductor, labelled beside it
    th = max(2.0, 0.7 * s.text_height_mm)
    texts = []
    blocked = unary_union([*keep_out, box(-6.0, -6.0, 11.0, 6.0)])  # and the datum cross
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
            boxed = _text_box(txt)
            if boxed.intersects(blocked) or any(boxed.intersects(b) for b in texts):
                continue
            items.append(Item("engrave", txt, "mark-label"))
            texts.append(boxed)
            break
    # the label block under everything
    body = unary_union([*keep_out, *texts])
    x0, y0, x1, y1 = body.bounds
    h = s.text_height_mm
    room = min(x1 - x0, max(s.bed_mm) - 2 * (s.part_gap_mm + s.margin_mm) - 20.0)
    lines = _label_lines(plan, e, s, max(30, int(room / (0.62 * h))))
    label_at = (x0, y0 - 4.0 - h)
    first_label = len(texts)
    y = y0 - 4.0 - h
    for text in lines:
        txt = Text((x0, y), text, h)
        items.append(Item("engrave", txt, "label"))
        texts.append(_text_box(txt))
        y -= 1.6 * h
    # datum: the origin of the element's coordinates, and a point 10 mm along +x
    items.append(Item("reference", RefPoint((0.0, 0.0), "datum"), "datum"))
    items.append(Item("reference", RefPoint((10.0, 0.0), "datum +x"), "datum +x"))
    items.append(Item("reference", Line((-5.0, 0.0), (10.0, 0.0)), "datum"))
    items.append(Item("reference", Line((0.0, -5.0), (0.0, 5.0)), "datum"))
    everything = unary_union([body, *texts, Point(0, 0).buffer(10)])
    bx0, by0, bx1, by1 = everything.bounds
    m = s.margin_mm
    usable = (s.bed_mm[0] - 2 * s.part_gap_mm, s.bed_mm[1] - 2 * s.part_gap_mm)
    parts: list[Part] = []
    # the convex outline of everything on the plate grown by the margin, when it
    # saves material over the simpler rectangle
    hull = _hull_plate(e, s, everything, items)
    rect = (bx0 - m, by0 - m, bx1 + m, by1 + m)
    rect_area = (rect[2] - rect[0]) * (rect[3] - rect[1])
    if hull is not None and _fits(hull, usable) and \
            hull.outline.area * RECTANGLE_PREFERENCE < rect_area:
        parts.append(hull)
    else:
        # a rectangle, cut into pieces that fit the bed
        inset = m / 2
        for cx, cy in ((rect[0] + inset, rect[1] + inset), (rect[2] - inset, rect[1] + inset),
                       (rect[2] - inset, rect[3] - inset), (rect[0] + inset, rect[3] - inset)):
            items.append(_hole((cx, cy), s.mounting_hole_mm, g, "mounting-hole"))
        mounting = [Point(it.shape.centre).buffer(s.mounting_hole_mm / 2) for it in items
                    if it.role == "mounting-hole"]
        board = _Board(items, keep_out + mounting + [box(*t.bounds) for t in texts], texts,
                       label_at, tuple(texts[first_label:]))
        plate = _plate(e.name, "plate", f"{e.name}: base plate", items, rect, s,
                       (s.corner_radius_mm,) * 4)
        if _fits(plate, usable):
            parts.append(plate)
        else:
            split, found = _split_plate(e, s, board, rect, usable)
            parts.extend(split)
            findings.extend(found)
    parts.extend(_former_parts(e, s))
    return parts, findings


def _hull_plate(e, s: JigSettings, everything, items: list[Item]) -> Part | None:
    """The plate as the convex outline of everything on it, grown by the margin:
    straight edges and true arcs of the corner radius. Mounting holes go in the
    margin at the sharpest corners. None when the outline degenerates."""
    from shapely.geometry import Point
    from shapely.geometry.polygon import orient

    tol = 0.5  # mm: simplifying the hull may cut inside it by this much
    hull = orient(everything.convex_hull.simplify(tol), 1.0)
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
                not everything.intersects(Point(c).buffer(s.mounting_hole_mm)):
            holes.append(c)
        if len(holes) == 4:
            break
    g = s.kerf_mm / 2
    plate_items = [Item("cut", outline, "outline"), *items,
                   *(_hole(c, s.mounting_hole_mm, g, "mounting-hole") for c in holes)]
    return Part(f"{e.name}: base plate", "plate", e.name, tuple(plate_items),
                contour_to_polygon(outline))


def _label_lines(plan, e, s: JigSettings, width: int) -> list[str]:
    f = e.forming
    units = s.units
    lines = [f"{e.name} - bending jig, full size ({plan.design.project})",
             f"stock: {plan.stock.description}"]
    for fm in f.formers:
        bends = ", ".join(str(i) for i in fm.bend_indices)
        lines.append(f"former {fm.label}: dia {_len(2 * fm.radius_mm, units)}, bend(s) {bends}, "
                     f"wrap {fm.wrap_deg:.1f} deg")
    for b in f.bends:
        lines.append(f"bend {b.index}: bend to {b.overbend_deg:.1f} deg "
                     f"(springback {b.springback_deg:.1f} deg), former radius "
                     f"{_len(b.former_radius_mm, units)}")
    for (a, b), sp in zip(zip(f.formers, f.formers[1:]), f.former_spacing_mm):
        lines.append(f"former spacing {a.label}-{b.label}: {_len(sp, units)} centre to centre")
    lines.append("check the 100 mm and 4 in squares before use")
    out: list[str] = []
    for line in lines:
        out.extend(_wrap(line, width))
    return out


def _plate(element: str, kind: str, name: str, items: list[Item],
           rect: tuple[float, float, float, float], s: JigSettings,
           radii: tuple[float, float, float, float]) -> Part:
    g = s.kerf_mm / 2
    contour = offset_contour(rounded_rect(*rect, radii), g)
    return Part(name, kind, element, (Item("cut", contour, "outline"), *items),
                contour_to_polygon(contour))


def _fits(part: Part, usable: tuple[float, float]) -> bool:
    x0, y0, x1, y1 = part.bounds()
    w, h = x1 - x0, y1 - y0
    return (w <= usable[0] and h <= usable[1]) or (h <= usable[0] and w <= usable[1])


def _former_parts(e, s: JigSettings) -> list[Part]:
    g = s.kerf_mm / 2
    out = []
    for fm in e.forming.formers:
        r = fm.radius_mm
        outline = offset_contour(Contour((Arc((0.0, 0.0), r, 0.0, 360.0),)), g)
        items = [Item("cut", outline, f"former {fm.label}"),
                 _hole((0.0, 0.0), s.bolt_hole_mm, g, "bolt-hole")]
        th = min(s.text_height_mm, r / 4)
        label = f"{fm.label} dia {2 * r:.2f}"
        y = s.bolt_hole_mm / 2 + 1.5
        if 0.62 * th * len(label) < 2 * math.sqrt(max(r * r - (y + th) ** 2, 0.0)):
            items.append(Item("engrave", Text((-0.31 * th * len(label), y), label, th), "label"))
        out.append(Part(f"{e.name}: former {fm.label}", "former", e.name, tuple(items),
                        contour_to_polygon(outline)))
    return out


# -- splitting a plate that does not fit the bed --------------------------------
def _split_plate(e, s: JigSettings, board: _Board, rect, usable) -> tuple[list[Part],
                                                                              list[Finding]]:
    from shapely.ops import unary_union

    g = s.kerf_mm / 2
    x0, y0, x1, y1 = rect
    h = y1 - y0 + 2 * g
    longest = max((u for u, other in ((usable[0], usable[1]), (usable[1], usable[0]))
                   if h <= other), default=None)
    if longest is None:
        return [], [Finding("jig-too-big", "error",
                            f"the base plate is {h:.0f} mm wide across the element, more than "
                            f"the {s.bed_mm[0]:.0f} x {s.bed_mm[1]:.0f} mm bed takes; use a larger "
                            "bed or a smaller margin", e.name)]
    holes = [i.shape for i in board.items if isinstance(i.shape, Circle)]
    bad = [(c.centre[0] - c.radius - 3, c.centre[0] + c.radius + 3) for c in holes]
    blocked = unary_union(board.keep_out)
    maxlen = longest - 2 * g
    if s.split == "end-plates":
        bad += [(b.bounds[0] - 2, b.bounds[2] + 2) for b in board.texts
                if not any(b is lb for lb in board.label_boxes)]
        return _end_plates(e, s, board, rect, bad, maxlen)
    bad += [(b.bounds[0] - 2, b.bounds[2] + 2) for b in board.texts]
    cuts = _choose_cuts(x0, x1, bad, maxlen)
    if cuts is None:
        return [], [Finding("jig-too-big", "error", "found no place to cut the base plate "
                            "into sections that fit the bed; use a larger bed", e.name)]
    parts: list[Part] = []
    findings = [Finding("jig-plate-split", "info",
                        f"the base plate is {x1 - x0:.0f} mm long: cut in {len(cuts) + 1} "
                        "sections joined with splice plates on the alignment holes", e.name)]
    edges = [x0, *cuts, x1]
    joint_items: dict[int, list[Item]] = {i: [] for i in range(len(edges) - 1)}
    a = max(12.0, 2 * s.bolt_hole_mm)
    for j, xc in enumerate(cuts, 1):
        ys = _alignment_ys(xc, a, s.bolt_hole_mm / 2 + 3.0, rect, blocked, board)
        if not ys:
            findings.append(Finding("jig-alignment-holes", "warning",
                                    f"no room for alignment holes at the joint x = {xc:.0f} mm",
                                    e.name))
            continue
        for y in ys:
            joint_items[j - 1].append(_hole((xc - a, y), s.bolt_hole_mm, g, f"align {j}"))
            joint_items[j].append(_hole((xc + a, y), s.bolt_hole_mm, g, f"align {j}"))
        parts.append(_splice(e, s, j, a, ys))
    r = s.corner_radius_mm
    for i, (xa, xb) in enumerate(zip(edges, edges[1:])):
        radii = (r if i == 0 else 0.0, r if i == len(edges) - 2 else 0.0,
                 r if i == len(edges) - 2 else 0.0, r if i == 0 else 0.0)
        items = _clip_items(board.items, xa, xb) + joint_items[i]
        items.append(Item("engrave", Text((xa + 6.0 if i else xa + s.margin_mm, y1 - 8.0),
                                          f"section {i + 1} of {len(edges) - 1}",
                                          s.text_height_mm), "label"))
        parts.append(_plate(e.name, "section", f"{e.name}: plate section {i + 1}", items,
                            (xa, y0, xb, y1), s, radii))
    return parts, findings


def _choose_cuts(x0: float, x1: float, bad: list[tuple[float, float]],
                 maxlen: float) -> list[float] | None:
    """Cut positions between x0 and x1, clear of the `bad` intervals, leaving
    no section longer than `maxlen` (mm); as even as the obstacles allow."""
    length = x1 - x0
    merged: list[list[float]] = []
    for lo, hi in sorted(bad):
        if merged and lo <= merged[-1][1]:
            merged[-1][1] = max(merged[-1][1], hi)
        else:
            merged.append([lo, hi])

    def allowed(x: float) -> bool:
        return all(not (lo < x < hi) for lo, hi in merged)

    n0 = max(2, math.ceil(length / maxlen))
    for n in range(n0, n0 + 20):
        cuts: list[float] = []
        prev = x0
        ok = True
        for i in range(1, n):
            target = x0 + i * length / n
            options = [target] if allowed(target) else []
            for lo, hi in merged:
                if lo < target < hi:
                    options = [lo, hi]
            options = [x for x in options if prev + 1.0 < x <= prev + maxlen and x < x1 - 1.0]
            if not options:
                ok = False
                break
            x = min(options, key=lambda v: abs(v - target))
            cuts.append(x)
            prev = x
        if ok and x1 - prev <= maxlen:
            return cuts
    return None


def _alignment_ys(xc: float, a: float, rr: float, rect, blocked, board) -> list[float]:
    """Heights (1 mm steps) where a hole of radius `rr` fits on both sides of
    the joint at `xc`, clear of everything on the plate; the lowest and highest."""
    import numpy as np
    import shapely
    from shapely.ops import unary_union

    x0, y0, x1, y1 = rect
    taken = board.cache.get("taken")
    if taken is None:
        taken = board.cache["taken"] = unary_union([blocked, *board.texts])
        shapely.prepare(taken)
    ys = np.arange(y0 + rr + 3.0, y1 - rr - 3.0 + 1e-9, 1.0)
    hit = np.zeros(len(ys), dtype=bool)
    for x in (xc - a, xc + a):
        discs = shapely.buffer(shapely.points(np.full(len(ys), x), ys), rr, quad_segs=8)
        hit |= shapely.intersects(discs, taken)
    free = [float(y) for y in ys[~hit]]
    if not free:
        return []
    return [free[0], free[-1]] if free[-1] - free[0] > 4 * rr else [free[0]]


def _splice(e, s: JigSettings, j: int, a: float, ys: list[float]) -> Part:
    g = s.kerf_mm / 2
    pad = s.bolt_hole_mm / 2 + 8.0
    rect = (-a - pad, min(ys) - pad, a + pad, max(ys) + pad)
    items = [_hole((sx, y), s.bolt_hole_mm, g, f"align {j}") for y in ys for sx in (-a, a)]
    items.append(Item("engrave", Text((-a + pad / 2 - 4, (min(ys) + max(ys)) / 2 - 1.5),
                                      f"splice {j}", 3.0), "label"))
    return _plate(e.name, "splice", f"{e.name}: splice plate {j}", items, rect, s,
                  (min(4.0, pad / 2),) * 4)


def _clip_items(items: list[Item], xa: float, xb: float) -> list[Item]:
    out: list[Item] = []
    for it in items:
        sh = it.shape
        if isinstance(sh, Line):
            c = clip_line_x(sh, xa, xb)
            if c is not None:
                out.append(Item(it.op, c, it.role))
        elif isinstance(sh, Arc):
            out.extend(Item(it.op, a, it.role) for a in clip_arc_x(sh, xa, xb))
        elif isinstance(sh, Circle):
            if xa <= sh.centre[0] < xb:
                out.append(it)
            elif it.role.startswith("former-outline"):
                out.extend(Item(it.op, a, it.role) for a in
                           clip_arc_x(Arc(sh.centre, sh.radius, 0.0, 360.0), xa, xb))
        elif isinstance(sh, (Text, RefPoint)):
            if xa <= sh.at[0] < xb:
                out.append(it)
    return out


def _end_plates(e, s: JigSettings, board: _Board, rect, bad, maxlen) -> tuple[list[Part],
                                                                             list[Finding]]:
    formers = sorted(e.forming.formers, key=lambda fm: fm.centre_mm[0])
    x0, y0, x1, y1 = rect
    if len(formers) < 2:
        return [], [Finding("jig-too-big", "error", "the plate does not fit the bed and has "
                            "fewer than two formers to make end plates from", e.name)]
    gaps = [b.centre_mm[0] - a.centre_mm[0] for a, b in zip(formers, formers[1:])]
    k = max(range(len(gaps)), key=lambda i: gaps[i])
    left, right = formers[:k + 1], formers[k + 1:]
    reach = s.margin_mm + s.pin_diameter_mm
    cut_a = max(fm.centre_mm[0] + fm.radius_mm for fm in left) + reach
    cut_b = min(fm.centre_mm[0] - fm.radius_mm for fm in right) - reach
    for lo, hi in sorted(bad):
        if lo < cut_a < hi:
            cut_a = hi
    for lo, hi in sorted(bad, reverse=True):
        if lo < cut_b < hi:
            cut_b = lo
    if cut_a - x0 > maxlen or x1 - cut_b > maxlen or cut_a >= cut_b:
        return [], [Finding("jig-too-big", "error", "the end plates do not fit the bed either; "
                            "use split = \"sections\" or a larger bed", e.name)]
    fa, fb = left[-1], right[0]
    idx = {fm.label: i for i, fm in enumerate(e.forming.formers)}
    ia, ib = sorted((idx[fa.label], idx[fb.label]))
    if ib == ia + 1 and ia < len(e.forming.former_spacing_mm):
        dist = e.forming.former_spacing_mm[ia]
    else:
        dist = math.dist(fa.centre_mm, fb.centre_mm)
    r = s.corner_radius_mm
    parts = []
    note = (f"set the end plates with formers {fa.label} and {fb.label} "
            f"{_len(dist, s.units)} apart, centre to centre")
    h = s.text_height_mm
    for i, (xa, xb, radii, group) in enumerate(((x0, cut_a, (r, 0.0, 0.0, r), left),
                                                (cut_b, x1, (0.0, r, r, 0.0), right)), 1):
        items = [it for it in _clip_items(board.items, xa, xb) if it.role != "label"]
        bends = {b for fm in group for b in fm.bend_indices}
        lines = [f"{e.name}: end plate {i} of 2", note]
        lines += [f"former {fm.label}: dia {_len(2 * fm.radius_mm, s.units)}" for fm in group]
        lines += [f"bend {b.index}: bend to {b.overbend_deg:.1f} deg" for b in e.forming.bends
                  if b.index in bends]
        width = max(12, int((xb - xa - 2 * s.margin_mm) / (0.62 * h)))
        y = board.label_at[1]
        for text in (w for line in lines for w in _wrap(line, width)):
            if y < y0 + s.margin_mm * 0.75:
                break  # the rest is in the notes
            items.append(Item("engrave", Text((xa + s.margin_mm, y), text, h), "label"))
            y -= 1.6 * h
        parts.append(_plate(e.name, "end-plate", f"{e.name}: end plate {i}", items,
                            (xa, y0, xb, y1), s, radii))
    findings = [Finding("jig-end-plates", "info", note + " (the spacing bar sets it)", e.name)]
    g = s.kerf_mm / 2
    pad = s.bolt_hole_mm / 2 + 10.0
    bar_rect = (-pad, -pad, dist + pad, pad)
    items = [_hole((0.0, 0.0), s.bolt_hole_mm, g, f"bolt-hole {fa.label}"),
             _hole((dist, 0.0), s.bolt_hole_mm, g, f"bolt-hole {fb.label}"),
             Item("engrave", Text((pad, -1.5), f"spacing bar {fa.label}-{fb.label} "
                                  f"{_len(dist, s.units)}", 3.0), "label")]
    bar = _plate(e.name, "spacing-bar", f"{e.name}: spacing bar", items, bar_rect, s,
                 (min(5.0, pad),) * 4)
    if bar.bounds()[2] - bar.bounds()[0] > max(s.bed_mm) - 2 * s.part_gap_mm:
        findings.append(Finding("jig-bar-too-long", "warning",
                                f"the spacing bar is longer than the bed: drill two holes "
                                f"{_len(dist, s.units)} apart in a straight batten instead",
                                e.name))
    else:
        parts.append(bar)
    return parts, findings


# -- a helix: a winding mandrel and a pitch guide ------------------------------
def _helix_parts(plan, e, s: JigSettings) -> tuple[list[Part], list[Finding]]:
    from shapely.geometry import box

    f = e.forming
    row = next(b for b in e.bends if b.pitch_mm)
    bf = f.bend(row.index)
    d = e.conductor_diameter_mm
    g = s.kerf_mm / 2
    turns = row.angle_deg / 360.0
    pitch = row.pitch_mm
    mandrel_d = 2 * bf.former_radius_mm
    coil = turns * pitch
    units = s.units
    # the pitch guide: a strip with a notch for each turn, laid along the mandrel
    n = math.floor(turns + 1e-9) + 1
    nr = d / 2
    end = max(10.0, nr + 6.0)
    length = (n - 1) * pitch + 2 * end
    height = max(20.0, 3 * d)
    segs: list[Line | Arc] = [Line((0.0, 0.0), (length, 0.0)), Line((length, 0.0),
                                                                 (length, height))]
    x = length
    for i in reversed(range(n)):
        cx = end + i * pitch
        segs.append(Line((x, height), (cx + nr, height)))
        segs.append(Arc((cx, height), nr, 0.0, -180.0))
        x = cx - nr
    segs.append(Line((x, height), (0.0, height)))
    segs.append(Line((0.0, height), (0.0, 0.0)))
    outline = offset_contour(Contour(tuple(segs)), g)
    th = min(s.text_height_mm, height / 4)
    items = [Item("cut", outline, "outline"),
             Item("engrave", Text((end, height / 4), f"{e.name}: pitch guide, pitch "
                                  f"{_len(pitch, units)}", th), "label")]
    guide = Part(f"{e.name}: pitch guide", "pitch-guide", e.name, tuple(items),
                 contour_to_polygon(outline))
    # the mandrel, drawn to size as a reference (turned or cut from round bar)
    w = coil
    mitems: list[Item] = [Item("reference", rounded_rect(0.0, 0.0, w, mandrel_d),
                               "mandrel")]
    for i in range(n):
        xi = i * pitch
        if xi + pitch / 2 > coil + 1e-9:  # the front half of a turn lies on the mandrel
            break
        mitems.append(Item("reference", Line((xi, 0.0), (xi + pitch / 2, mandrel_d)), "turn"))
    lines = [f"{e.name}: winding mandrel (not to cut from plate)",
             f"mandrel dia {_len(mandrel_d, units)} (springback-compensated)",
             f"{turns:g} turns at pitch {_len(pitch, units)}, coil length {_len(coil, units)}",
             f"stock: {plan.stock.description}"]
    yt = -4.0 - s.text_height_mm
    for text in lines:
        mitems.append(Item("notes", Text((0.0, yt), text, s.text_height_mm), "label"))
        yt -= 1.6 * s.text_height_mm
    wide = max(w, max(0.62 * s.text_height_mm * len(t) for t in lines))
    mandrel = Part(f"{e.name}: winding mandrel", "mandrel", e.name, tuple(mitems),
                   box(-1.0, yt, wide + 1.0, mandrel_d + 1.0))
    parts = [guide, mandrel]
    findings = []
    if bf.former_radius_mm <= 0:
        findings.append(Finding("jig-mandrel", "error", "the mandrel radius is not positive",
                                e.name))
    return parts, findings


# -- calibration --------------------------------------------------------------
def calibration_parts() -> list[Part]:
    """Engraved squares of 100 mm and 4 in to check the machine's scale."""
    from shapely.geometry import box

    out = []
    for size, label in ((100.0, "100 mm square"), (4 * IN, "4 in square")):
        items = (Item("engrave", rounded_rect(0.0, 0.0, size, size), f"calibration {label}"),
                 Item("engrave", Text((5.0, size / 2), label, 5.0), "label"))
        out.append(Part(f"calibration {label}", "calibration", "", items,
                        box(-1.0, -1.0, size + 1.0, size + 1.0)))
    return out


# -- beds -----------------------------------------------------------------------
def _pack(parts: list[Part], s: JigSettings) -> tuple[list[Bed], list[Finding]]:
    """First-fit shelf packing: largest parts first; each goes on the first
    shelf of the first bed with room, else on a new shelf, else on a new bed.
    A part turns 90 degrees when only that way fits, or to lie along a shelf."""
    W, H = s.bed_mm
    gap = s.part_gap_mm
    findings: list[Finding] = []
    beds: list[list[Placed]] = []
    shelves: list[list[list[float]]] = []  # per bed: [y, height, next x]

    def size(p: Part, rot: bool) -> tuple[float, float]:
        x0, y0, x1, y1 = p.bounds()
        return (y1 - y0, x1 - x0) if rot else (x1 - x0, y1 - y0)

    def key(p: Part) -> tuple:
        w, h = size(p, False)
        return (-min(w, h), -max(w, h), p.name)

    def spot(w: float, h: float) -> tuple[int, list[float]] | None:
        for b, bed_shelves in enumerate(shelves):
            for sh in bed_shelves:
                if h <= sh[1] + 1e-9 and sh[2] + w <= W - gap + 1e-9:
                    return b, sh
            top = bed_shelves[-1][0] + bed_shelves[-1][1] + gap if bed_shelves else gap
            if top + h <= H - gap + 1e-9 and gap + w <= W - gap + 1e-9:
                sh = [top, h, gap]
                bed_shelves.append(sh)
                return b, sh
        return None

    for p in sorted(parts, key=key):
        options = [rot for rot in (False, True)
                   if size(p, rot)[0] <= W - 2 * gap + 1e-9 and size(p, rot)[1] <= H - 2 * gap
                   + 1e-9]
        if not options:
            w, h = size(p, False)
            findings.append(Finding("jig-too-big", "error",
                                    f"{p.name} ({w:.0f} x {h:.0f} mm) does not fit the "
                                    f"{W:.0f} x {H:.0f} mm bed", p.element))
            continue
        # prefer lying flat along the shelf (the shorter side up)
        options.sort(key=lambda rot: size(p, rot)[1])
        found = None
        for rot in options:
            found = spot(*size(p, rot))
            if found is not None:
                break
        if found is None:
            beds.append([])
            shelves.append([])
            rot = options[0]
            found = spot(*size(p, rot))
        if found is None:  # cannot happen: the part fits an empty bed
            continue
        b, sh = found
        w, h = size(p, rot)
        x0, y0, x1, y1 = p.bounds()
        x, y = sh[2], sh[0]
        # rotated bounds run from (-y1, x0) to (-y0, x1)
        dx, dy = (x + y1, y - x0) if rot else (x - x0, y - y0)
        beds[b].append(Placed(p, dx, dy, rot))
        sh[2] = x + w + gap
    out = [Bed(i, W, H, tuple(b)) for i, b in enumerate(beds, 1) if b]
    for bed in out:
        shapes = [pl.outline() for pl in bed.parts]
        for i in range(len(shapes)):
            for j in range(i + 1, len(shapes)):
                if shapes[i].intersects(shapes[j]):
                    findings.append(Finding("jig-overlap", "error",
                                            f"bed {bed.index}: {bed.parts[i].part.name} overlaps "
                                            f"{bed.parts[j].part.name}"))
    return out, findings


def _router_findings(parts: list[Part], s: JigSettings) -> list[Finding]:
    if s.tool_radius_mm <= 0:
        return []
    out = []
    small: dict[str, float] = {}
    for p in parts:
        for it in p.items:
            if it.op == "cut" and isinstance(it.shape, Contour):
                tight = inside_corners(it.shape, s.tool_radius_mm)
                if tight:
                    where, r = min(tight, key=lambda wr: wr[1])
                    out.append(Finding("jig-inside-corner", "warning",
                                       f"{p.name}: {len(tight)} inside corner(s) tighter than "
                                       f"the {s.tool_radius_mm:.2f} mm router bit radius "
                                       f"(smallest {r:.2f} mm, at {where[0]:.1f}, "
                                       f"{where[1]:.1f} in the part): they come out rounded to "
                                       "the bit; use a smaller bit, a laser, or finish by hand",
                                       p.element))
            if it.op == "drill" and isinstance(it.shape, Circle) and \
                    it.shape.radius < s.tool_radius_mm:
                small[it.role.split(" ")[0]] = 2 * it.shape.radius
    for role, dia in sorted(small.items()):
        out.append(Finding("jig-hole-below-tool", "info",
                           f"{role} holes ({dia:.2f} mm as drawn) are smaller than the "
                           f"{2 * s.tool_radius_mm:.2f} mm router bit: drill them"))
    return out


def layout_jig(plan, settings: JigSettings) -> JigLayout:
    """The jig of every element of the plan, laid out on beds."""
    parts: list[Part] = []
    findings: list[Finding] = []
    for e in plan.elements:
        got, found = element_parts(plan, e, settings)
        parts.extend(got)
        findings.extend(found)
    if parts:
        parts.extend(calibration_parts())
    findings.extend(_router_findings(parts, settings))
    beds, found = _pack(parts, settings)
    findings.extend(found)
    notes = (f"{plan.design.project}: bending jig, full size",
             f"drawing unit {settings.units}; kerf {settings.kerf_mm:.2f} mm "
             "(outlines grown, holes shrunk by half of it)",
             "layers: CUT outlines, DRILL holes, ENGRAVE lines and text, REFERENCE (do not "
             "machine), NOTES",
             "check the 100 mm and 4 in squares before cutting")
    beds = [Bed(b.index, b.width_mm, b.height_mm, b.parts,
                (f"bed {b.index} of {len(beds)}: {b.width_mm:.0f} x {b.height_mm:.0f} mm",))
            for b in beds]
    return JigLayout(plan.design.project, settings, tuple(beds), tuple(findings), notes)


def all_shapes(layout: JigLayout) -> list[tuple[int, Item]]:
    """Every placed item with its bed index (for renderers and tests)."""
    out: list[tuple[int, Item]] = []
    for bed in layout.beds:
        for pl in bed.parts:
            out.extend((bed.index, it) for it in pl.items())
    return out

