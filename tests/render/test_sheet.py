"""The PDF build sheet, read back with an independent PDF reader (pdfplumber)."""

from __future__ import annotations

import io
import math
import re
from pathlib import Path

import pdfplumber
import pytest

from fabplan.design.read import load_design
from fabplan.errors import DesignError
from fabplan.plan import make_plan
from fabplan.render.sheet import SAFETY, sheet_pdf
from fabplan.units import format_frequency, format_inches, format_mm

EXAMPLE = Path(__file__).resolve().parents[2] / "examples" / "club-uhf-folded-dipoles.toml"


@pytest.fixture(scope="module")
def a4(example_plan):
    return sheet_pdf(example_plan, "a4")


_TEXT: dict[bytes, list[str]] = {}  # the pages' text of each PDF read (reading is slow)


def _pages(data: bytes) -> list[str]:
    if data not in _TEXT:
        with pdfplumber.open(io.BytesIO(data)) as pdf:
            _TEXT[data] = [page.extract_text() for page in pdf.pages]
    return _TEXT[data]


def _flat(data: bytes) -> str:
    return re.sub(r"\s+", " ", " ".join(_pages(data)))


def test_page_sizes(example_plan, a4, paper_pt):
    for data, size in ((a4, paper_pt["a4"]), (sheet_pdf(example_plan, "letter"),
                                             paper_pt["letter"])):
        with pdfplumber.open(io.BytesIO(data)) as pdf:
            for page in pdf.pages:
                assert (page.width, page.height) == pytest.approx(size, abs=0.01)


def test_cut_length_and_marks_as_the_plan_gives_them(example_plan, a4):
    text = _flat(a4)
    den = example_plan.design.shop.fraction
    for e in example_plan.elements:
        assert f"Cut length {format_inches(e.cut_length_mm, den)} " \
               f"({format_mm(e.cut_length_mm)})" in text
        for m in e.piece.marks:
            d = abs(m.from_centre_mm)
            # the marks table row: label, side, inches and mm from the centre
            side = "-" if d < 1e-9 else ("A" if m.from_centre_mm < 0 else "B")
            assert f"{m.label} {side} {format_inches(d, den)} {format_mm(d)}" in text


def test_bend_table_and_steps(example_plan, a4):
    text = _flat(a4)
    e = example_plan.elements[0]
    for b in e.piece.bends:
        assert f"bend {b.index}" in text
    assert "Bending steps" in text and "M2 to M3" in text  # bend 1 lies between its marks


def test_every_page_numbered(a4):
    pages = _pages(a4)
    assert len(pages) >= 2
    for i, text in enumerate(pages, 1):
        assert f"page {i} of {len(pages)}" in text


def test_project_stock_scale_and_safety(example_plan, a4):
    text = _flat(a4)
    assert example_plan.design.project in text
    # where the material's properties come from
    assert example_plan.stock.material_source.split(":")[0] in text
    assert re.search(r"Scale 1:\d+(\.\d+)? when printed at 100 %", text)
    for head, _ in SAFETY:
        assert head in text
    assert "Local codes and licensed practice come first" in text


def test_no_dates_and_same_bytes(example_plan, a4):
    assert sheet_pdf(example_plan, "a4") == a4
    # invariant mode: no creation date of the run (reportlab writes a fixed one)
    assert b"/CreationDate (D:20000101000000" in a4


def test_findings_in_plain_words(write_design):
    # a 1/2 in centre spacing on 1/4 in tube: the end bends' centreline radius is
    # 1 x the stock diameter, under 1.5: the plan warns that K matters
    text = EXAMPLE.read_text().replace('centre_spacing = "1 1/4 in"', 'centre_spacing = "1/2 in"')
    p = make_plan(load_design(write_design(text)))
    codes = {f.code for f in p.findings}
    assert "k-factor-matters" in codes
    flat = _flat(sheet_pdf(p, "letter"))
    assert "k-factor-matters" in flat
    assert "Check" in flat


def test_unknown_paper_is_bad_input(example_plan):
    with pytest.raises(DesignError, match="a4 or letter"):
        sheet_pdf(example_plan, "roll-914mm")
    with pytest.raises(DesignError, match="unknown paper"):
        sheet_pdf(example_plan, "a3")


def test_later_stages_sections(example_plan, a4):
    """Forming (formers and spacing), estimate (bill of material) as the Plan gives them."""
    text = _flat(a4)
    den = example_plan.design.shop.fraction
    e = example_plan.elements[0]
    if e.piece.forming is not None and e.piece.forming.formers:
        assert "Jig: formers" in text
        for gap in e.piece.forming.former_spacing_mm:
            assert f"{format_inches(gap, den)} ({format_mm(gap)})" in text
        for b in e.piece.forming.bends:
            assert f"bend to {b.overbend_deg:.1f} deg while held" in text
    else:
        assert "Jig: formers" not in text
    if example_plan.order is not None:
        assert "Bill of material" in text and "Cutting plan" in text
        for line in example_plan.order.buy:
            assert line.offer in text
        if example_plan.order.total_cost is not None:
            assert example_plan.order.currency.format(example_plan.order.total_cost) in text
    else:
        assert "Bill of material" not in text


def test_electrical_summary_and_swr_plot(write_design, swept_folded_dipole_toml):
    p = make_plan(load_design(write_design(swept_folded_dipole_toml)))
    sw = p.elements[0].electrical.sweep
    data = sheet_pdf(p, "a4")
    flat = _flat(data)
    assert "Electrical check" in flat
    assert f"{sw.min_swr:.2f} at {format_frequency(sw.min_swr_hz)}" in flat
    assert "frequency, MHz" in flat  # the SWR plot's axis
    with pdfplumber.open(io.BytesIO(data)) as pdf:
        page = next(pg for pg in pdf.pages if "frequency, MHz" in pg.extract_text())
        # the plotted SWR curve: one polyline with a vertex per frequency
        assert any(len(c["pts"]) == len(sw.freq_hz) for c in page.curves + page.lines)


def test_mm_shop_gets_millimetres_first(write_design):
    text = EXAMPLE.read_text().replace('units = "in"', 'units = "mm"')
    p = make_plan(load_design(write_design(text)))
    assert p.design.shop.units == "mm"
    flat = _flat(sheet_pdf(p, "a4"))
    e = p.elements[0]
    den = p.design.shop.fraction
    assert f"Cut length {format_mm(e.cut_length_mm)} ({format_inches(e.cut_length_mm, den)})" \
        in flat
    for m in e.piece.marks:
        d = abs(m.from_centre_mm)
        side = "-" if d < 1e-9 else ("A" if m.from_centre_mm < 0 else "B")
        assert f"{m.label} {side} {format_mm(d)} {format_inches(d, den)}" in flat


def test_error_findings_get_a_banner_on_page_one(write_design):
    # 6 mm centre to centre on 6.35 mm tube: the two sides touch (an error finding)
    text = EXAMPLE.read_text().replace('centre_spacing = "1 1/4 in"', 'centre_spacing = "6 mm"')
    p = make_plan(load_design(write_design(text)))
    errors = sum(f.severity == "error" for f in p.findings)
    assert errors
    first = re.sub(r"\s+", " ", _pages(sheet_pdf(p, "a4"))[0])
    assert f"NOT BUILDABLE AS IT STANDS: {errors} error finding(s)" in first


def test_no_banner_when_buildable(example_plan, a4):
    assert not example_plan.has_errors
    assert "NOT BUILDABLE" not in _flat(a4)


# -- the drawings, measured (issue 15) -----------------------------------------------------

SHAPES = ("folded-dipole", "hairpin", "rect-loop", "delta-loop", "circle-loop", "helix",
          "custom", "straight")
# the design-file keys that hold a dimension the user gives (each shape's template
# comments say what it is)
DIMENSION_KEYS = ("side", "inside_length", "overall_length", "spacing", "centre_spacing",
                  "width", "height", "diameter", "circumference", "leg", "pitch",
                  "coil_length", "base", "legs", "tail", "length")


def _template_plan(cli, tmp_path, shape):
    """A template's plan without its electrical check (these tests read the drawings and
    steps, not the electrical pages; the model's solves would only cost time)."""
    import dataclasses

    path = tmp_path / f"{shape}.toml"
    cli("new", shape, "-o", path, check_exit=0)
    return path, make_plan(dataclasses.replace(load_design(path), electrical=None))


def _bezier(p0, p1, p2, p3, n=12):
    """Points on a cubic Bezier segment (de Casteljau's formula in Bernstein form)."""
    out = []
    for i in range(1, n + 1):
        t = i / n
        a, b, c, d = (1 - t) ** 3, 3 * t * (1 - t) ** 2, 3 * t * t * (1 - t), t ** 3
        out.append((a * p0[0] + b * p1[0] + c * p2[0] + d * p3[0],
                    a * p0[1] + b * p1[1] + c * p2[1] + d * p3[1]))
    return out


def _flatten(obj, n=12):
    """The subpaths of a pdfplumber line or curve as point lists (top-down page
    coordinates), straight pieces sampled `n` times, Bezier pieces evaluated."""
    path = obj.get("path")
    if not path:
        return [list(obj["pts"])]
    subs, cur = [], []
    for op, *pts in path:
        if op == "m":
            if len(cur) > 1:
                subs.append(cur)
            cur = [pts[0]]
        elif op == "l":
            a, b = cur[-1], pts[0]
            cur += [(a[0] + (b[0] - a[0]) * i / n, a[1] + (b[1] - a[1]) * i / n)
                    for i in range(1, n + 1)]
        elif op == "c":
            cur += _bezier(cur[-1], *pts, n=n)
        elif op == "h" and cur:
            cur.append(cur[0])
    if len(cur) > 1:
        subs.append(cur)
    return subs


def _drawing_areas(pdf):
    """(page, top, bottom) of each drawing: from its heading to its scale line."""
    out = []
    for page in pdf.pages:
        words = page.extract_words()
        for i, w in enumerate(words):
            if w["text"] == "Drawing" and words[i + 1]["text"] == "to" \
                    and words[i + 2]["text"].startswith("scale"):
                bottom = next(x["bottom"] for x in words[i:]
                              if x["text"] == "Scale" and x["top"] > w["top"])
                out.append((page, w["top"], bottom))
    return out


def _clashes(page, top, bottom):
    """Text boxes on the drawing that overlap a drawn line or another text box
    (shapely: word boxes from pdfplumber, its lines and curves as drawn)."""
    from shapely.geometry import LineString, Polygon, box

    words = [w for w in page.extract_words() if top - 1 <= w["top"] and w["bottom"] <= bottom + 1]
    boxes = [(w["text"], box(w["x0"], w["top"], w["x1"], w["bottom"])) for w in words]
    drawn = []
    for obj in page.lines + page.curves + page.rects:
        if obj["bottom"] < top or obj["top"] > bottom:
            continue
        for pts in _flatten(obj):
            if obj.get("fill") and not obj.get("stroke"):
                drawn.append(Polygon(pts) if len(pts) > 2 else LineString(pts))
            else:
                drawn.append(LineString(pts))
    out = []
    for i, (text, b) in enumerate(boxes):
        inner = b.buffer(-0.2, join_style="mitre")  # touching at the edge is not an overlap
        out += [f"{text!r} crosses a line" for g in drawn if g.intersects(inner)][:1]
        out += [f"{text!r} overlaps {other!r}" for other, c in boxes[i + 1:]
                if b.intersection(c).area > 0.01]
    return out


def _words_in(page, top, bottom):
    return " ".join(w["text"] for w in page.extract_words()
                    if top - 1 <= w["top"] and w["bottom"] <= bottom + 1)


def _user_dimensions(path, units, den):
    """The dimensions a design file gives, as the shop reads them: `side 10 7/8" (...)`."""
    import tomllib

    from fabplan.units import format_length, parse_length

    out = []
    for el in tomllib.loads(Path(path).read_text())["element"]:
        out += [(k, format_length(parse_length(el[k], k), units, den)) for k in DIMENSION_KEYS
                if k in el]
        out += [("straight", format_length(parse_length(row["straight"], "straight"), units,
                                           den))
                for row in el.get("bends", []) if "straight" in row]
    return out


@pytest.mark.parametrize("shape", ["example", *SHAPES])
def test_drawing_labels_clear_of_lines_and_each_other(cli, tmp_path, shape):
    """Issue 15: dimension text was printed across the conductor and over marks; no
    drawing showed the dimensions the user typed."""
    if shape == "example":
        path, plan = EXAMPLE, make_plan(load_design(EXAMPLE))
    else:
        path, plan = _template_plan(cli, tmp_path, shape)
    shop = plan.design.shop
    with pdfplumber.open(io.BytesIO(sheet_pdf(plan))) as pdf:
        areas = _drawing_areas(pdf)
        # a drawing of each piece, and of each element of several pieces assembled
        assert len(areas) == sum(len(e.pieces) + (len(e.pieces) > 1) for e in plan.elements)
        for page, top, bottom in areas:
            assert _clashes(page, top, bottom) == []
        text = re.sub(r"\s+", " ", " ".join(_words_in(*a) for a in areas))
    for key, value in _user_dimensions(path, shop.units, shop.fraction):
        # each as its key and value (a custom table's straights numbered by row)
        label = f"{key.replace('_', ' ')} {value}"
        assert label in text or (key == "straight" and value in text), label


def test_the_overlap_check_sees_an_overlap(example_plan):
    """The check above finds text laid over the conductor (as the old sheet did)."""
    from fabplan.render.sheet import sketch

    original = sketch.Sketch.layout

    def careless(self):  # every label at its anchor, as if nothing were drawn
        for lab in self.labels:
            lab.x, lab.y, lab.placed = lab.anchor[0], lab.anchor[1], True

    sketch.Sketch.layout = careless
    try:
        data = sheet_pdf(example_plan)
    finally:
        sketch.Sketch.layout = original
    with pdfplumber.open(io.BytesIO(data)) as pdf:
        assert any(_clashes(*a) for a in _drawing_areas(pdf))


def _circle_fit(pts):
    """Least-squares circle through points (algebraic fit: Kasa, IEEE Trans. Instrum.
    Meas. 25, 1976): centre, radius and the largest radial residual."""
    import numpy as np

    p = np.asarray(pts, dtype=float)
    a = np.column_stack([2 * p[:, 0], 2 * p[:, 1], np.ones(len(p))])
    b = (p ** 2).sum(axis=1)
    (cx, cy, c), *_ = np.linalg.lstsq(a, b, rcond=None)
    r = math.sqrt(c + cx * cx + cy * cy)
    resid = np.abs(np.hypot(p[:, 0] - cx, p[:, 1] - cy) - r)
    return (cx, cy), r, float(resid.max())


def test_circle_loop_drawn_round_and_its_angle_rounded(cli, tmp_path):
    """Issue 15: the circle loop was a visible polygon labelled "355.415 deg"."""
    _, plan = _template_plan(cli, tmp_path, "circle-loop")
    b = plan.elements[0].piece.bends[0]
    full = f"{b.angle_deg:.3f}"
    short = f"{b.angle_deg:.1f}"
    assert full != short.rstrip("0") and not full.endswith("00")  # the case to round
    with pdfplumber.open(io.BytesIO(sheet_pdf(plan))) as pdf:
        (page, top, bottom), = _drawing_areas(pdf)
        text = _words_in(page, top, bottom)
        flat = _flat_pdf(pdf)
        big = [o for o in page.curves + page.lines
               if o["top"] >= top and o["bottom"] <= bottom and o["width"] > 100
               and o["height"] > 100]
        assert len(big) >= 3  # the outline's two edges and the centreline at least
        for o in big:
            for pts in _flatten(o, 24):
                # every point along the drawn line, not only its vertices, lies on a
                # circle to 0.05 pt (a 36-gon of this size misses by 0.2 pt)
                assert _circle_fit(pts)[2] < 0.05
    # one decimal at most, none when whole (common practice, no source)
    assert f"{short} deg" in text and full not in flat
    assert f"bend 1: {short} deg" in text


def _flat_pdf(pdf):
    return re.sub(r"\s+", " ", " ".join(p.extract_text() for p in pdf.pages))


def test_helix_side_view_to_scale_with_a_tick_each_turn(cli, tmp_path):
    """Issue 15: the helix was drawn almost end-on as overlapping circles."""
    _, plan = _template_plan(cli, tmp_path, "helix")
    p = plan.design.elements[0].params
    with pdfplumber.open(io.BytesIO(sheet_pdf(plan))) as pdf:
        (page, top, bottom), = _drawing_areas(pdf)
        text = _words_in(page, top, bottom)
        scale = float(re.search(r"Scale 1:(\d+(?:\.\d+)?)", text).group(1))
        k = 72 / 25.4 / scale  # pt per mm of the helix
        assert "side view" in text and "end view" in text
        ticks = sorted((o["x0"] + o["x1"]) / 2 for o in page.lines
                       if top <= o["top"] and o["bottom"] <= bottom
                       and o["stroking_color"] == (0.75, 0.1, 0.1) and o["width"] < 0.5)
        # a tick where the wire crosses the top of the coil, once a turn, a pitch apart
        assert len(ticks) == math.floor(p.turns - 0.75) + 1
        for a, b in zip(ticks, ticks[1:]):
            assert b - a == pytest.approx(p.pitch_mm * k, abs=0.05)
        # the near-side wire of the side view, between its first and last tick (past
        # the leads), spans the coil's centreline diameter
        ys = [y for o in page.curves + page.lines if top <= o["top"] and o["bottom"] <= bottom
              and o["linewidth"] == pytest.approx(0.8) and not (o.get("dash") or [[]])[0]
              for sub in _flatten(o) for x, y in sub if ticks[0] + 1 < x < ticks[-1]]
        assert max(ys) - min(ys) == pytest.approx(p.diameter_mm * k, abs=0.1)
    for words in ("diameter", "pitch", "coil length"):
        assert words in text


def test_helix_steps_say_to_follow_the_turns(cli, tmp_path):
    """Issue 15: the steps said "bend to 3260.8 deg while held" beside a mandrel
    guide showing turns; now they say to wind turns on the mandrel by the guide."""
    from fabplan.units import format_angle, format_length

    _, plan = _template_plan(cli, tmp_path, "helix")
    piece = plan.elements[0].piece
    bf = piece.forming.bends[0]
    row = piece.bends[0]
    shop = plan.design.shop
    (step,) = _steps_rows(sheet_pdf(plan))
    assert "while held (+" not in step["how far"]
    mandrel = format_length(2 * bf.former_radius_mm, shop.units, shop.fraction)
    assert f"winding mandrel {mandrel} diameter, with the pitch guide" in step["former or tool"]
    assert "pitch guide" in step["which way"]
    assert (f"about {format_angle(bf.overbend_deg / 360)} turns while held on the mandrel"
            in step["how far"])
    assert f"opens to {format_angle(row.angle_deg / 360)} turns" in step["how far"]
    assert step["how far"].endswith("is for reference only")


def _steps_rows(data: bytes) -> list[dict[str, str]]:
    """The bending steps table(s), one dict per row, read with pdfplumber's table finder."""
    rows = []
    with pdfplumber.open(io.BytesIO(data)) as pdf:
        for page in pdf.pages:
            for t in page.extract_tables():
                if t and t[0] and t[0][0] == "step":
                    head = [re.sub(r"\s+", " ", h) for h in t[0]]
                    rows += [{h: re.sub(r"\s+", " ", c or "") for h, c in zip(head, r)}
                             for r in t[1:]]
    return rows


def _which(row: dict[str, str]) -> list[tuple[int, int]]:
    return [(int(b), int(s)) for b, s in re.findall(r"bend (\d+) \(step (\d+)\)",
                                                    row["which way"])]


def test_steps_refer_only_to_bends_already_made(cli, tmp_path):
    """Issue 15: step 1 (bend 2) said "same way as bend 1" while bend 1 was step 3."""
    _, plan = _template_plan(cli, tmp_path, "rect-loop")
    order = plan.elements[0].piece.forming.bend_order
    assert list(order) != sorted(order)  # the loop is bent from its middle out
    rows = _steps_rows(sheet_pdf(plan))
    assert [int(r["bend"].split()[1]) for r in rows] == list(order)
    assert _which(rows[0]) == [] and "first bend made" in rows[0]["which way"]
    for n, row in enumerate(rows[1:], 2):
        # each step names the bend made in the step before, and no other
        assert _which(row) == [(order[n - 2], n - 1)]
        assert "same plane, same way as" in row["which way"]  # a flat loop turns one way


CUSTOM_TWISTED = """
[project]
name = "twisted"
[stock]
gauge = "AWG 10"
material = "cu-c11000-annealed"
[shop]
units = "mm"
[[element]]
name = "bent"
shape = "custom"
bends = [
  { straight = "100 mm", angle = 90, radius = "10 mm" },
  { straight = "30 mm", angle = 90, radius = "10 mm", rotation = 90 },
  { straight = "30 mm", angle = 90, radius = "10 mm", rotation = 90 },
]
tail = "100 mm"
"""


def test_steps_give_rotations_against_the_bend_made_before(plan_of):
    """Made out of trade order (2, 1, 3), each step's turn is counted from the bend
    made in the step before. Worked by hand from the bend table's convention (each
    rotation turns the bend plane about the stock's axis from the previous bend's;
    turns about one axis add): bend 1 against bend 2 is -90 deg; bend 3 against
    bend 1 is 90 + 90 = 180 deg, the same plane the other way."""
    plan = plan_of(CUSTOM_TWISTED)
    assert list(plan.elements[0].piece.forming.bend_order) == [2, 1, 3]
    rows = _steps_rows(sheet_pdf(plan))
    assert ("turn the stock 90 deg anticlockwise (looking from end A towards end B) from "
            "the plane of bend 2 (step 1)") in rows[1]["which way"]
    assert rows[2]["which way"] == "same plane, the opposite way to bend 1 (step 2)"


def _tables(data: bytes, first_header: str) -> list[list[str]]:
    rows = []
    with pdfplumber.open(io.BytesIO(data)) as pdf:
        for page in pdf.pages:
            for t in page.extract_tables():
                if t and t[0] and t[0][0] == first_header:
                    rows += [[re.sub(r"\s+", " ", c or "") for c in r] for r in t[1:]]
    return rows


def _example_text(units: str) -> str:
    """The example in a shop of `units`, without its electrical check (quicker; the
    electrical section is the lead's)."""
    text = EXAMPLE.read_text().replace('units = "in"', f'units = "{units}"')
    return text[:text.index("[electrical]")] + text[text.index("# Buying the stock"):]


@pytest.mark.parametrize("units", ["in", "mm"])
def test_every_caption_and_cut_in_the_shops_unit_first(write_design, units):
    """Issue 15: a millimetre shop read "Lengths in inches ... and millimetres", cut
    lengths inches first and start positions in mm only."""
    from fabplan.units import format_length

    plan = make_plan(load_design(write_design(_example_text(units))))
    data = sheet_pdf(plan, "a4")
    flat = _flat(data)
    first, second = ("inches", "millimetres") if units == "in" else ("millimetres", "inches")
    assert f"Lengths in {first}" in flat
    assert f"Lengths in {second}" not in flat
    assert "Lengths in inches and millimetres" not in flat
    den = plan.design.shop.fraction
    cuts = [c for p in plan.order.pieces for c in p.cuts]
    rows = [r for r in _tables(data, "piece") if len(r) == 7]
    assert len(rows) == len(cuts)
    for row, cut in zip(rows, cuts):
        assert row[3] == format_length(cut.length_mm, units, den)
        assert row[4] == format_length(cut.start_mm, units, den)


def test_default_paper_follows_the_shops_units(write_design, paper_pt, cli, tmp_path):
    """Issue 15: the default paper was A4 even for a shop in inches. Letter and A4:
    ANSI/ASME Y14.1 and ISO 216 (the sizes in conftest)."""
    inch = make_plan(load_design(write_design(_example_text("in"), "in.toml")))
    mm = make_plan(load_design(write_design(_example_text("mm"), "mm.toml")))
    for plan, paper in ((inch, "letter"), (mm, "a4")):
        data = sheet_pdf(plan)
        with pdfplumber.open(io.BytesIO(data)) as pdf:
            page = pdf.pages[0]
            assert (page.width, page.height) == pytest.approx(paper_pt[paper], abs=0.01)
        shop = "inches" if plan.design.shop.units == "in" else "millimetres"
        assert f"the default for a shop in {shop}" in _flat(data)
    assert "as chosen (--paper)" in _flat(sheet_pdf(inch, "a4"))
    out = tmp_path / "s.pdf"
    cli("sheet", write_design(_example_text("in"), "cli.toml"), "-o", out, check_exit=0)
    with pdfplumber.open(out) as pdf:
        assert (pdf.pages[0].width, pdf.pages[0].height) == pytest.approx(paper_pt["letter"])
    helptext = re.sub(r"\s+", " ", cli("sheet", "--help", check_exit=0).stdout)
    assert "letter for a shop in inches, a4 for millimetres" in helptext


@pytest.mark.parametrize("name", [("driven element of the club " * 8)[:200], "X" * 200])
def test_a_long_element_name_wraps_or_is_shortened(write_design, name):
    """Issue 15: a 200-character element name raised reportlab's LayoutError (a
    cutting-plan cell taller than a page); with and without spaces it now fits."""
    text = _example_text("in").replace('name = "70 cm driven element"', f'name = "{name}"')
    text = text.replace("quantity = 7", "quantity = 20")
    plan = make_plan(load_design(write_design(text)))
    data = sheet_pdf(plan, "a4")
    with pdfplumber.open(io.BytesIO(data)) as pdf:
        for page in pdf.pages:
            for ch in page.chars:  # nothing runs off the paper
                assert 0 <= ch["x0"] and ch["x1"] <= page.width
                assert 0 <= ch["top"] and ch["bottom"] <= page.height
        flat = _flat_pdf(pdf).replace(" ", "")
    assert name.replace(" ", "") in flat  # whole in the element's heading
