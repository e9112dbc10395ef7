"""A drawing decided before it is drawn: strokes, dimensions and labels in points.

`Sketch` collects the strokes of a drawing (lines, true circular arcs, circles,
filled arrowheads) and the labels to place. Labels are placed after every
stroke is known, in the order they were asked for, each at the first of its
candidate places whose text box keeps clear of every stroke, every label
already placed and every leader line; a label with no free candidate goes to
the nearest free place round its anchor, joined to it by a thin leader. Then
`drawing()` hands reportlab the result. Points (1/72 in), y up, text in
Helvetica (boxes as PDF readers measure them: from the font's descent to one
font size above it).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Any

__all__ = ["Sketch", "Stroke", "Label", "text_width", "square_to", "LABEL_CLEARANCE_PT"]

Pt = tuple[float, float]
RGB = tuple[float, float, float]

BLACK: RGB = (0.0, 0.0, 0.0)
FONT = "Helvetica"
DESCENT = 0.207  # Helvetica's descent, in font sizes (its AFM: -207/1000)
LEADING = 1.2  # line spacing of a label of several lines, in font sizes
LABEL_CLEARANCE_PT = 1.2  # free space kept round every label's text box


def text_width(text: str, size: float) -> float:
    """Width of `text` in Helvetica at `size` points."""
    from reportlab.pdfbase.pdfmetrics import stringWidth

    return float(stringWidth(text, FONT, size))


@dataclass
class Stroke:
    """One thing drawn: "line" (a polyline through `points`), "arc" (`points[0]`
    the centre, `radius`, `start_deg`, `sweep_deg`), "circle" (`points[0]`, `radius`)
    or "fill" (a filled polygon through `points`)."""

    kind: str
    points: list[Pt]
    width: float = 0.5
    colour: RGB = BLACK
    dash: tuple[float, ...] | None = None
    radius: float = 0.0
    start_deg: float = 0.0
    sweep_deg: float = 0.0

    def sampled(self) -> list[Pt]:
        """Points along the stroke, close enough for clearance checks (arcs every 2 deg)."""
        if self.kind in ("line", "fill"):
            return list(self.points)
        (cx, cy), r = self.points[0], self.radius
        start, sweep = (self.start_deg, self.sweep_deg) if self.kind == "arc" else (0.0, 360.0)
        n = max(2, math.ceil(abs(sweep) / 2.0))
        return [(cx + r * math.cos(math.radians(start + sweep * i / n)),
                 cy + r * math.sin(math.radians(start + sweep * i / n))) for i in range(n + 1)]


@dataclass
class Label:
    """Text to place: `lines` (one or more) at `size` points; `anchor` is the
    point it belongs to (leaders start there); `candidates` are the centres its
    text box may take, best first (see `beside`). Once placed, `x`, `y` is the
    first line's baseline start."""

    lines: list[str]
    anchor: Pt
    candidates: list[Pt] = field(default_factory=list)
    size: float = 7.0
    colour: RGB = BLACK
    leader: bool = True  # when no candidate is free, place it further off with a leader
    x: float = 0.0
    y: float = 0.0
    placed: bool = False

    @property
    def width(self) -> float:
        return max(text_width(t, self.size) for t in self.lines)

    @property
    def height(self) -> float:
        return self.size * (1 + LEADING * (len(self.lines) - 1))

    def beside(self, point: Pt, direction: Pt, gap: float) -> Pt:
        """The box centre that puts the box `gap` beyond `point` along `direction`
        (its nearest edge or corner that far off); (0, 0) centres it on `point`."""
        ux, uy = _unit(direction)
        if ux == 0 and uy == 0:
            return point
        reach = min(self.width / 2 / abs(ux) if ux else math.inf,
                    self.height / 2 / abs(uy) if uy else math.inf)
        return (point[0] + ux * (gap + reach), point[1] + uy * (gap + reach))

    def around(self, directions: Sequence[Pt], gaps: Sequence[float]) -> None:
        """Add candidates beside the anchor: each gap in turn, each direction."""
        for g in gaps:
            for d in directions:
                self.candidates.append(self.beside(self.anchor, d, g))

    def box_at(self, cx: float, cy: float) -> tuple[float, float, float, float]:
        """The text box (x0, y0, x1, y1) with its centre at (cx, cy)."""
        w, h = self.width, self.height
        return (cx - w / 2, cy - h / 2, cx + w / 2, cy + h / 2)

    def box(self) -> tuple[float, float, float, float]:
        top = self.y + (1 - DESCENT) * self.size
        return (self.x, top - self.height, self.x + self.width, top)


@dataclass
class Sketch:
    """Strokes and labels of one drawing; `width` bounds the labels across (pt)."""

    width: float
    strokes: list[Stroke] = field(default_factory=list)
    labels: list[Label] = field(default_factory=list)
    leaders: list[Stroke] = field(default_factory=list)
    texts: list[tuple[str, float, float, float, RGB]] = field(default_factory=list)

    # -- strokes ----------------------------------------------------------------
    def line(self, points: Sequence[Pt], width: float = 0.5, colour: RGB = BLACK,
             dash: tuple[float, ...] | None = None) -> None:
        self.strokes.append(Stroke("line", list(points), width, colour, dash))

    def arc(self, centre: Pt, radius: float, start_deg: float, sweep_deg: float,
            width: float = 0.5, colour: RGB = BLACK,
            dash: tuple[float, ...] | None = None) -> None:
        self.strokes.append(Stroke("arc", [centre], width, colour, dash, radius, start_deg,
                                   sweep_deg))

    def circle(self, centre: Pt, radius: float, width: float = 0.5, colour: RGB = BLACK,
               dash: tuple[float, ...] | None = None) -> None:
        self.strokes.append(Stroke("circle", [centre], width, colour, dash, radius))

    def arrow(self, tip: Pt, direction: Pt, length: float = 5.0, half_width: float = 1.4,
              colour: RGB = BLACK) -> None:
        """A filled arrowhead with its point at `tip`, pointing along `direction`."""
        dx, dy = _unit(direction)
        bx, by = tip[0] - dx * length, tip[1] - dy * length
        self.strokes.append(Stroke("fill", [tip, (bx - dy * half_width, by + dx * half_width),
                                            (bx + dy * half_width, by - dx * half_width)],
                                   0.0, colour))

    def extent(self, origin: Pt, direction: Pt) -> float:
        """How far the strokes reach beyond `origin` along unit `direction` (pt)."""
        dx, dy = direction
        return max((p[0] - origin[0]) * dx + (p[1] - origin[1]) * dy
                   for s in self.strokes for p in s.sampled())

    def dimension(self, a: Pt, b: Pt, away: Pt | None, text: str, offset: float = 14.0,
                  colour: RGB = (0.15, 0.15, 0.15)) -> Label:
        """A dimension from `a` to `b`: with `away`, a dimension line `offset`
        beyond `a` on that side (made square to the measured direction) and
        extension lines back to `a` and `b`; without, the dimension line from
        `a` to `b` itself. Returns its value's label (to queue with `place`)."""
        along = _unit((b[0] - a[0], b[1] - a[1]))
        if away is not None and square_to(away, along) == (0.0, 0.0):
            away = None  # no side to stand off to: draw it between the points
        if away is not None:
            n = square_to(away, along)
            a2 = (a[0] + n[0] * offset, a[1] + n[1] * offset)
            b2 = (b[0] + n[0] * offset, b[1] + n[1] * offset)
            for p, q in ((a, a2), (b, b2)):
                self.line([(p[0] + n[0] * 1.5, p[1] + n[1] * 1.5),
                           (q[0] + n[0] * 3.0, q[1] + n[1] * 3.0)], 0.3, colour)
        else:
            n = (-along[1], along[0])
            a2, b2 = a, b
        span = math.hypot(b2[0] - a2[0], b2[1] - a2[1])
        if span >= 14.0:
            self.line([a2, b2], 0.35, colour)
            self.arrow(a2, (-along[0], -along[1]), colour=colour)
            self.arrow(b2, along, colour=colour)
        else:  # too short for arrows inside: point at it from outside
            self.line([(a2[0] - along[0] * 9, a2[1] - along[1] * 9),
                       (b2[0] + along[0] * 9, b2[1] + along[1] * 9)], 0.35, colour)
            self.arrow(a2, along, colour=colour)
            self.arrow(b2, (-along[0], -along[1]), colour=colour)
        mid = ((a2[0] + b2[0]) / 2, (a2[1] + b2[1]) / 2)
        label = Label([text], mid)
        sides = [n] if away is not None else [n, (-n[0], -n[1])]
        far = max(span / 2 - 8.0, 0.0)
        # beside the line, sliding along it; then clear of the extension lines'
        # overshoot (a value wider than the dimension)
        for gap in (2.0, 4.5):
            for shift in (0.0, 0.3, -0.3, 0.6, -0.6, 1.0, -1.0):
                p = (mid[0] + along[0] * shift * far, mid[1] + along[1] * shift * far)
                for side in sides:
                    label.candidates.append(label.beside(p, side, gap))
        return label

    # -- labels -----------------------------------------------------------------
    def place(self, label: Label) -> Label:
        """Queue `label`; labels are placed in order by `layout`."""
        self.labels.append(label)
        return label

    def layout(self) -> None:
        """Place every queued label clear of the strokes and of each other."""
        from shapely.geometry import LineString, Point, Polygon, box
        from shapely.prepared import prep
        from shapely.strtree import STRtree

        geoms: list[Any] = []
        for s in self.strokes:
            pts = s.sampled()
            if s.kind == "fill":
                geoms.append(Polygon(pts))
            elif len(pts) > 1:
                geoms.append(LineString(pts))
            else:
                geoms.append(Point(pts[0]))
        tree = STRtree(geoms)
        taken: list[Any] = []  # placed text boxes and leader lines
        m = LABEL_CLEARANCE_PT

        def free(b: tuple[float, float, float, float]) -> bool:
            if b[0] < 1.0 or b[2] > self.width - 1.0:
                return False
            g = box(b[0] - m, b[1] - m, b[2] + m, b[3] + m)
            if any(geoms[i].intersects(g) for i in tree.query(g)):
                return False
            return not any(t.intersects(g) for t in taken)

        for lab in self.labels:
            spot = next((c for c in lab.candidates if free(lab.box_at(*c))), None)
            leader = None
            if spot is None:
                spot, leader = self._search(lab, free, taken)
            cx, cy = spot
            x0, y0, x1, y1 = lab.box_at(cx, cy)
            lab.x = x0
            lab.y = y1 - (1 - DESCENT) * lab.size
            lab.placed = True
            taken.append(prep(box(x0, y0, x1, y1)))
            if leader is not None:
                self.leaders.append(Stroke("line", leader, 0.3, (0.4, 0.4, 0.4)))
                taken.append(prep(LineString(leader)))

    def _search(self, lab: Label, free: Any, taken: list[Any]) -> tuple[Pt, list[Pt] | None]:
        """The nearest free place round the anchor, and the leader to it."""
        from shapely.geometry import LineString, box

        ax, ay = lab.anchor
        for radius in range(8, 400, 4):
            for k in range(32):
                t = 2 * math.pi * k / 32
                c = lab.beside(lab.anchor, (math.cos(t), math.sin(t)), radius)
                b = lab.box_at(*c)
                if not free(b):
                    continue
                if not lab.leader:
                    return c, None
                # the leader: from near the anchor to the box's nearest edge
                end = (min(max(ax, b[0]), b[2]), min(max(ay, b[1]), b[3]))
                ex, ey = end[0] - ax, end[1] - ay
                length = math.hypot(ex, ey)
                if length < 1e-9:
                    return c, None
                start = (ax + ex / length * 1.0, ay + ey / length * 1.0)
                stop = (end[0] - ex / length * 1.5, end[1] - ey / length * 1.5)
                seg = LineString([start, stop])
                if any(t.intersects(seg) for t in taken):
                    continue
                near = box(b[0], b[1], b[2], b[3])
                if seg.distance(near) > 2.0:
                    continue
                return c, [start, stop]
        # nowhere free within reach: under everything drawn so far
        low = min(p[1] for s in self.strokes for p in s.sampled()) if self.strokes else 0.0
        low = min([low] + [lb.box()[1] for lb in self.labels if lb.placed])
        return (min(max(ax, lab.width / 2 + 2), self.width - lab.width / 2 - 2),
                low - lab.height / 2 - 4), None

    def text(self, text: str, x: float, y: float, size: float = 7.0,
             colour: RGB = BLACK) -> None:
        """Text at a fixed place (baseline start), for the scale bar and captions."""
        self.texts.append((text, x, y, size, colour))

    # -- output -----------------------------------------------------------------
    def bounds(self) -> tuple[float, float, float, float]:
        pts = [p for s in self.strokes + self.leaders for p in s.sampled()]
        boxes = [lab.box() for lab in self.labels if lab.placed]
        boxes += [(x, y - DESCENT * sz, x + text_width(t, sz), y + (1 - DESCENT) * sz)
                  for t, x, y, sz, _ in self.texts]
        xs = [p[0] for p in pts] + [b[0] for b in boxes] + [b[2] for b in boxes]
        ys = [p[1] for p in pts] + [b[1] for b in boxes] + [b[3] for b in boxes]
        return (min(xs), min(ys), max(xs), max(ys))

    def drawing(self, margin: float = 4.0) -> Any:
        """A reportlab Drawing of the sketch, `self.width` wide and as tall as
        its content plus `margin` above and below."""
        from reportlab.graphics.shapes import Drawing, Path, Polygon, PolyLine, String
        from reportlab.lib.colors import Color

        _, y0, _, y1 = self.bounds()
        dy = margin - y0
        d = Drawing(self.width, y1 - y0 + 2 * margin)
        for s in self.strokes + self.leaders:
            colour = Color(*s.colour)
            dash = list(s.dash) if s.dash else None
            if s.kind == "line":
                d.add(PolyLine([c for x, y in s.points for c in (x, y + dy)],
                               strokeWidth=s.width, strokeColor=colour, strokeDashArray=dash))
            elif s.kind == "fill":
                d.add(Polygon([c for x, y in s.points for c in (x, y + dy)], strokeWidth=0,
                              strokeColor=None, fillColor=colour))
            else:
                (cx, cy), r = s.points[0], s.radius
                start, sweep = (s.start_deg, s.sweep_deg) if s.kind == "arc" else (0.0, 360.0)
                path = Path(strokeWidth=s.width, strokeColor=colour, fillColor=None,
                            strokeDashArray=dash)
                _bezier_arc(path, cx, cy + dy, r, start, sweep)
                d.add(path)
        for lab in self.labels:
            for i, t in enumerate(lab.lines):
                d.add(String(lab.x, lab.y + dy - i * LEADING * lab.size, t, fontName=FONT,
                             fontSize=lab.size, fillColor=Color(*lab.colour)))
        for t, x, y, size, colour in self.texts:
            d.add(String(x, y + dy, t, fontName=FONT, fontSize=size, fillColor=Color(*colour)))
        return d


def square_to(v: Pt, along: Pt) -> Pt:
    """The unit part of `v` square to unit `along`."""
    dot = v[0] * along[0] + v[1] * along[1]
    return _unit((v[0] - dot * along[0], v[1] - dot * along[1]))


def _unit(v: Pt) -> Pt:
    n = math.hypot(v[0], v[1])
    return (v[0] / n, v[1] / n) if n > 0 else (0.0, 0.0)


def _bezier_arc(path: Any, cx: float, cy: float, r: float, start_deg: float,
                sweep_deg: float) -> None:
    """A true circular arc as cubic Bezier pieces of at most 45 degrees each
    (radial error under 5e-6 of the radius)."""
    n = max(1, math.ceil(abs(sweep_deg) / 45.0))
    step = math.radians(sweep_deg) / n
    k = 4.0 / 3.0 * math.tan(step / 4)
    a = math.radians(start_deg)
    path.moveTo(cx + r * math.cos(a), cy + r * math.sin(a))
    for _ in range(n):
        b = a + step
        c1 = (cx + r * (math.cos(a) - k * math.sin(a)), cy + r * (math.sin(a) + k * math.cos(a)))
        c2 = (cx + r * (math.cos(b) + k * math.sin(b)), cy + r * (math.sin(b) - k * math.cos(b)))
        path.curveTo(c1[0], c1[1], c2[0], c2[1], cx + r * math.cos(b), cy + r * math.sin(b))
        a = b
