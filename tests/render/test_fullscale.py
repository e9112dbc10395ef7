"""The full-scale template, measured with an independent PDF reader (pdfplumber).

The tiles are put back together the way a builder does it, by laying the
numbered alignment crosses of neighbouring tiles on top of each other; then
the drawn distances are compared with the Plan's figures.
"""

from __future__ import annotations

import dataclasses
import io
import math
import re
from pathlib import Path

import pdfplumber
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.design.read import load_design, parse_design
from fabplan.errors import DesignError
from fabplan.plan import make_plan
from fabplan.render.fullscale import template_pdf
from fabplan.render.fullscale.geometry import mark_ids
from fabplan.render.fullscale.layout import (
    CENTRE_TICK_MM,
    JOIN_TICK_MM,
    STRIP_TICK_MM,
    TURN_TICK_MM,
)
from fabplan.render.fullscale.tiling import (
    CROSS_MM,
    FOOTER_MM,
    MARGIN_MM,
    OVERLAP_MM,
    Grid,
    tile_count,
)
from fabplan.units import format_length

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"
PT = 72 / 25.4  # pt per mm: 1 in = 25.4 mm = 72 pt (source: ISO 32000-1, 8.3.2.3 user space)

# issue 15's case: a 520 mm square loop of 1/2 in aluminium tube, in a millimetre shop
SQUARE_LOOP = """
[project]
name = "520 mm square loop"

[stock]
catalogue = "al-1/2x0.058"

[shop]
units = "mm"
trim = "10 mm"

[[element]]
name = "loop"
shape = "rect-loop"
side = "520 mm"
corner_radius = "60 mm"
feed_gap = "20 mm"
"""


def _plan(design):
    """The plan without its electrical check: a template draws no electrical figure,
    and the model's solves would only cost time."""
    import dataclasses

    return make_plan(dataclasses.replace(design, electrical=None))


def _template(name: str) -> str:
    return (ROOT / "fabplan" / "templates" / f"{name}.toml").read_text()


@pytest.fixture(scope="module")
def plans(example_plan):
    """Plans to draw: the example, issue 15's square loop, and shape templates."""
    out = {"example": example_plan, "square-loop": _plan(parse_design(SQUARE_LOOP))}
    for name in ("helix", "circle-loop", "custom", "delta-loop"):
        out[name] = _plan(parse_design(_template(name)))
    return out


@pytest.fixture(scope="module")
def drawn(plans):
    """Template PDF bytes by (plan name, paper), each drawn once."""
    cache: dict[tuple[str, str], bytes] = {}

    def get(name: str, paper: str) -> bytes:
        if (name, paper) not in cache:
            cache[(name, paper)] = template_pdf(plans[name], paper)
        return cache[(name, paper)]

    return get


@pytest.fixture(scope="module")
def pdfs(example_plan):
    return {paper: template_pdf(example_plan, paper) for paper in ("a4", "letter", "roll-610mm")}


def _open(data: bytes):
    return pdfplumber.open(io.BytesIO(data))


def _vertical(line, length_pt: float, tol: float = 0.05) -> bool:
    return abs(line["x1"] - line["x0"]) < 1e-3 and abs(abs(line["y1"] - line["y0"])
                                                        - length_pt) < tol


def _horizontal(line, length_pt: float, tol: float = 0.05) -> bool:
    return abs(line["y1"] - line["y0"]) < 1e-3 and abs(abs(line["x1"] - line["x0"])
                                                        - length_pt) < tol


def _crosses(page) -> dict[str, tuple[float, float]]:
    """Numbered alignment crosses on a page: number -> centre (x, y up), pt."""
    arm = CROSS_MM * PT
    hs = [ln for ln in page.lines if _horizontal(ln, arm)]
    vs = [ln for ln in page.lines if _vertical(ln, arm)]
    words = page.extract_words()
    out = {}
    for h in hs:
        cx, cy = (h["x0"] + h["x1"]) / 2, h["y0"]
        if not any(abs(v["x0"] - cx) < 1e-3 and abs((v["y0"] + v["y1"]) / 2 - cy) < 1e-3
                   for v in vs):
            continue
        # its number sits just above and to the right of the centre
        near = [w for w in words if w["text"].isdigit() and 0 < w["x0"] - cx < 3 * PT
                and 0 < (page.height - w["bottom"]) - cy < 3 * PT]
        if near:
            out[near[0]["text"]] = (cx, cy)
    return out


def _assemble(pdf) -> dict[int, tuple[float, float]]:
    """Offset of each tile page (index) in a common frame, from shared crosses."""
    tiles = list(range(1, len(pdf.pages)))  # page 0 is the assembly map
    crosses = {i: _crosses(pdf.pages[i]) for i in tiles}
    offset = {tiles[0]: (0.0, 0.0)}
    changed = True
    while changed:
        changed = False
        for i in tiles:
            if i in offset:
                continue
            for j in list(offset):
                shared = set(crosses[i]) & set(crosses[j])
                if shared:
                    n = sorted(shared)[0]
                    (xi, yi), (xj, yj) = crosses[i][n], crosses[j][n]
                    offset[i] = (offset[j][0] + xj - xi, offset[j][1] + yj - yi)
                    changed = True
                    break
    assert set(offset) == set(tiles), "some tiles share no alignment cross with the rest"
    return offset


def _global_lines(pdf, offset, keep) -> list[tuple[float, float, float, float]]:
    """Lines chosen by `keep`, in the assembled frame (pt, y up), inside the
    printed area of their tile, duplicates from the overlaps merged."""
    out: list[tuple[float, float, float, float]] = []
    for i, (dx, dy) in offset.items():
        page = pdf.pages[i]
        frame = max(page.rects, key=lambda r: r["width"] * r["height"] * (not r["fill"]))
        for ln in page.lines:
            mx, my = (ln["x0"] + ln["x1"]) / 2, (ln["y0"] + ln["y1"]) / 2
            if not keep(ln) or not (frame["x0"] < mx < frame["x1"]
                                    and frame["y0"] < my < frame["y1"]):
                continue
            g = (ln["x0"] + dx, ln["y0"] + dy, ln["x1"] + dx, ln["y1"] + dy)
            if not any(max(abs(a - b) for a, b in zip(g, o)) < 0.01 for o in out):
                out.append(g)
    return out


def test_page_sizes_are_exact(pdfs, paper_pt):
    for paper, size in paper_pt.items():
        with _open(pdfs[paper]) as pdf:
            for page in pdf.pages:
                assert sorted((page.width, page.height)) == pytest.approx(sorted(size),
                                                                          abs=0.01)
    with _open(pdfs["roll-610mm"]) as pdf:
        assert len(pdf.pages) == 1
        assert pdf.pages[0].width == pytest.approx(610 * PT, abs=0.01)  # roll width


@pytest.mark.parametrize("paper", ["a4", "letter", "roll-610mm"])
def test_every_page_has_true_calibration_bars(pdfs, paper):
    with _open(pdfs[paper]) as pdf:
        for page in pdf.pages:
            bars = [r for r in page.rects if r["fill"] and abs(r["height"] - 1.2 * PT) < 0.01]
            words = page.extract_words()
            found = {}
            for bar in bars:
                left = [w for w in words if w["x1"] <= bar["x0"]
                        and abs(w["bottom"] - bar["bottom"]) < 4]
                unit = max(left, key=lambda w: w["x1"])["text"]
                found[unit] = bar["width"]
            # source: 100 mm = 283.465 pt and 4 in = 288 pt (1 in = 25.4 mm = 72 pt)
            assert found["mm"] == pytest.approx(283.465, abs=0.05)
            assert found["in"] == pytest.approx(288.0, abs=0.05)
            text = page.extract_text()
            assert "PRINT AT ACTUAL SIZE (100 %)" in text


def _strip_ticks(pdf, diameter_mm: float) -> dict[str, list[float]]:
    """The marking strip's ticks, put back together the way a builder uses them:
    {kind: [mm from the centre tick]}. Each tick is centred on its row's bar, so
    ticks at one height form a row; a folded strip's rows (top row first) are
    chained at their join ticks, the end join of one row standing for the same
    place on the stock as the start join of the next."""
    offset = _assemble(pdf)
    reach = {"mark": STRIP_TICK_MM, "centre": CENTRE_TICK_MM, "join": JOIN_TICK_MM,
             "turn": TURN_TICK_MM}
    ticks = []
    for kind, r in reach.items():
        for g in _global_lines(pdf, offset,
                               lambda ln, n=(diameter_mm + 2 * r) * PT: _vertical(ln, n)):
            ticks.append((kind, g[0], (g[1] + g[3]) / 2))
    rows: list[list[tuple[str, float, float]]] = []
    for t in sorted(ticks, key=lambda t: -t[2]):
        if rows and abs(rows[-1][0][2] - t[2]) < 0.5:
            rows[-1].append(t)
        else:
            rows.append([t])
    along: dict[str, list[float]] = {k: [] for k in reach}
    base = 0.0
    for i, row in enumerate(rows):
        joins = sorted(x for kind, x, _ in row if kind == "join")
        left = (joins[-1] if joins else 0.0) if i == 0 else joins[0]
        for kind, x, _ in row:
            along[kind].append(base + (x - left) / PT)
        if i < len(rows) - 1:
            base += (joins[-1] - left) / PT
    assert len(along["centre"]) == 1
    c = along["centre"][0]
    return {k: sorted(v - c for v in vs) for k, vs in along.items()}


def _check_strip(e, data: bytes) -> int:
    """Assemble the tiles, measure the strip's ticks from the centre tick and
    compare with the Plan's marks; returns the page count."""
    with _open(data) as pdf:
        pages = len(pdf.pages)
        drawn = _strip_ticks(pdf, e.piece.conductor_diameter_mm)["mark"]
    planned: list[float] = []
    for x in sorted(m.from_centre_mm for m in e.piece.marks if m.kind != "centre"):
        if not planned or x - planned[-1] > 0.01:  # marks at one place share a tick
            planned.append(x)
    assert len(drawn) == len(planned)
    for d, p in zip(drawn, planned):
        assert d == pytest.approx(p, abs=0.1)  # within 0.1 mm on the paper
    return pages


def test_marks_on_the_assembled_strip_match_the_plan(example_plan, pdfs):
    for paper in ("a4", "letter"):
        assert _check_strip(example_plan.elements[0], pdfs[paper]) > 2  # several tiles


def test_blank_tiles_left_out_and_the_rest_still_join(write_design):
    """A loop leaves tiles of the grid with nothing on them: those are not
    printed, and the printed ones still assemble to true marks."""
    text = (Path(__file__).resolve().parents[2] / "fabplan" / "templates"
            / "circle-loop.toml").read_text()
    p = _plan(load_design(write_design(text)))
    data = template_pdf(p, "a4")
    with _open(data) as pdf:
        head = re.sub(r"\s+", " ", pdf.pages[0].extract_text())
    m = re.search(r"(\d+) tile\(s\) to print, in a grid of (\d+) row\(s\) x (\d+) column", head)
    printed, rows, cols = map(int, m.groups())
    assert printed < rows * cols and f"{rows * cols - printed} tile(s) of the grid left out" in head
    assert _check_strip(p.elements[0], data) == printed + 1


def test_feed_gap_on_the_bent_drawing_matches_the_plan(example_plan, pdfs):
    e = example_plan.elements[0]
    tick = (e.piece.conductor_diameter_mm + 8) * PT  # mark ticks across the bent conductor
    with _open(pdfs["a4"]) as pdf:
        ticks = _global_lines(pdf, _assemble(pdf), lambda ln: _vertical(ln, tick))
    # the ends A and B face each other across the feed gap, on one side's line
    pairs = [abs(a[0] - b[0]) / PT for i, a in enumerate(ticks) for b in ticks[i + 1:]
             if abs(a[1] - b[1]) < 0.01 and abs(a[0] - b[0]) > 0.01]
    assert min(pairs) == pytest.approx(e.piece.gap_mm, abs=0.1)


def test_former_spacing_drawn_true(example_plan):
    """Former circles at 1:1: centres as far apart as the Plan's spacing."""
    from fabplan.forming.records import BendForming, ElementForming, Former

    e = example_plan.elements[0]
    forming = e.piece.forming
    if forming is None or not forming.formers:
        # no forming stage in this Plan: give it one former per bend at the
        # bend's own centre, so the drawing of formers is still measured
        formers, bends = [], []
        for i, prim in enumerate(p for p in e.piece.path.primitives() if hasattr(p, "radius")):
            formers.append(Former(f"F{i + 1}", (i + 1,), (prim.centre[0], prim.centre[1]),
                                  prim.radius - e.piece.conductor_diameter_mm / 2, 185.0))
            bends.append(BendForming(i + 1, "former", formers[-1].radius_mm, prim.radius,
                                     185.0, 5.0, prim.radius, 180.0, 0.1))
        spacing = tuple(math.dist(a.centre_mm, b.centre_mm) for a, b in zip(formers,
                                                                           formers[1:]))
        forming = ElementForming(tuple(bends), tuple(formers), spacing)
    e2 = dataclasses.replace(e, pieces=(dataclasses.replace(e.piece, forming=forming),))
    p2 = dataclasses.replace(example_plan, elements=(e2,))
    with _open(template_pdf(p2, "a4")) as pdf:
        offset = _assemble(pdf)
        arm = 6 * PT  # the cross at each former's centre
        cs = _global_lines(pdf, offset, lambda ln: _horizontal(ln, arm))
    centres = sorted(((a[0] + a[2]) / 2 / PT, a[1] / PT) for a in cs)
    assert len(centres) == len(forming.formers)
    for (a, b), gap in zip(zip(centres, centres[1:]), forming.former_spacing_mm):
        assert math.dist(a, b) == pytest.approx(gap, abs=0.1)


def test_tile_count_by_hand():
    # 1000 mm on 190 mm of room, 15 mm overlap: 5 tiles reach 190 + 4 x 175 = 890 mm,
    # 6 tiles reach 1065 mm: 6 tiles (arithmetic by hand)
    assert tile_count(1000, 190, 15) == 6
    assert tile_count(190, 190, 15) == 1
    assert tile_count(190.5, 190, 15) == 2


@settings(max_examples=200, derandomize=True, deadline=None)
@given(length=st.floats(1, 5000), room=st.floats(50, 900), overlap=st.floats(0, 40))
def test_tiles_cover_the_length_and_no_fewer_would(length, room, overlap):
    n = tile_count(length, room, overlap)
    reach = room + (n - 1) * (room - overlap)
    assert reach >= length - 1e-6
    if n > 1:
        assert room + (n - 2) * (room - overlap) < length


def test_tile_labels_form_the_grid(pdfs):
    with _open(pdfs["a4"]) as pdf:
        labels = []
        for page in pdf.pages[1:]:
            text = page.extract_text()
            labels.append(re.search(r"tile ([A-Z]+\d+): row", text).group(1))
        head = re.sub(r"\s+", " ", pdf.pages[0].extract_text())
    n = len(labels)
    m = re.search(r"(\d+) tile\(s\) to print, in a grid of (\d+) row\(s\) x (\d+) column", head)
    printed, rows, cols = map(int, m.groups())
    assert printed == n == rows * cols  # nothing blank in the example's grid
    assert sorted(labels) == sorted(f"{chr(65 + r)}{c + 1}" for r in range(rows)
                                    for c in range(cols))
    assert OVERLAP_MM == 15.0  # the overlap stated on the map page, in the shop's unit first
    assert f"overlap by {format_length(15.0, 'in', 32)}" in head


def test_same_plan_same_bytes(example_plan, pdfs):
    assert template_pdf(example_plan, "a4") == pdfs["a4"]


def test_non_planar_element_gets_a_strip(write_design):
    text = (Path(__file__).resolve().parents[2] / "fabplan" / "templates"
            / "helix.toml").read_text()
    p = _plan(load_design(write_design(text)))
    with _open(template_pdf(p, "letter")) as pdf:
        assert len(pdf.pages) >= 2
        assert "not for marking" in "".join(pg.extract_text() for pg in pdf.pages)


def test_too_big_for_the_roll_is_bad_input(write_design):
    text = (Path(__file__).resolve().parents[2] / "fabplan" / "templates"
            / "rect-loop.toml").read_text()
    # a 30 x 30 in loop: about 770 mm each way, wider than a 610 mm roll both ways
    text = text.replace('width = "9 in"', 'width = "30 in"').replace('height = "6 in"',
                                                                   'height = "30 in"')
    p = _plan(load_design(write_design(text)))
    with pytest.raises(DesignError, match="does not fit"):
        template_pdf(p, "roll-610mm")


def test_bender_marks_drawn_where_the_plan_puts_them(write_design):
    """With a hand bender the forming stage gives pencil marks for the tool;
    the template draws them (dashed, below the strip) at their distance from
    the centre tick."""
    from fabplan.render.fullscale.layout import TOOL_TICK_MM

    text = EXAMPLE.read_text()
    cut = text.find("\n[electrical]")
    text = (text[:cut] if cut > 0 else text) + (
        '\n[forming]\nmethod = "bender"\nsquare_ends = true\n'
        '[forming.bender]\nradius = "9/16 in"\nreference = "bend-start"\n')
    p = _plan(load_design(write_design(text)))
    e = p.elements[0]
    assert e.piece.forming is not None and e.piece.forming.tool_marks
    centre = (e.piece.conductor_diameter_mm + 2 * CENTRE_TICK_MM) * PT
    with _open(template_pdf(p, "letter")) as pdf:
        offset = _assemble(pdf)
        tools = _global_lines(pdf, offset, lambda ln: _vertical(ln, TOOL_TICK_MM * PT))
        mid = _global_lines(pdf, offset, lambda ln: _vertical(ln, centre))
    assert len(mid) == 1
    drawn = sorted((t[0] - mid[0][0]) / PT for t in tools)
    planned = sorted(t.from_centre_mm for t in e.piece.forming.tool_marks)
    assert drawn == pytest.approx(planned, abs=0.1)  # within 0.1 mm on the paper


@settings(max_examples=200, derandomize=True, deadline=None)
@given(xs=st.lists(st.floats(-1000, 1000), min_size=1, max_size=30), gap=st.floats(1, 20))
def test_mark_labels_never_crowd(xs, gap):
    """Labels keep at least `gap` apart, keep the marks' order, and each crowd
    stays centred on its marks (so the mean position is kept)."""
    from fabplan.render.fullscale.layout import _spread

    out = _spread(xs, gap)
    order = sorted(range(len(xs)), key=lambda i: xs[i])
    placed = [out[i] for i in order]
    assert all(b - a >= gap - 1e-6 for a, b in zip(placed, placed[1:]))
    assert sum(out) / len(out) == pytest.approx(sum(xs) / len(xs), abs=1e-6)


# -- issue 15: labels whole on one tile --------------------------------------------------
def _frame(page) -> tuple[float, float, float, float]:
    """The tile page's drawable area (x0, top, x1, bottom), pt, top-down."""
    m, f = MARGIN_MM * PT, (MARGIN_MM + FOOTER_MM) * PT
    return (m, m, page.width - m, page.height - f)


def _strings(page) -> list[list[dict]]:
    """The page's characters in the runs each string was drawn in: consecutive
    characters of one size and direction, each starting where the last ended."""
    out: list[list[dict]] = []
    for ch in page.chars:
        a, b, c, d, e, f = ch["matrix"]
        if out:
            pa, pb, pc, pd, pe, pf = out[-1][-1]["matrix"]
            step = math.hypot(e - pe, f - pf)
            if (max(abs(u - v) for u, v in zip((a, b, c, d), (pa, pb, pc, pd))) < 1e-6
                    and step < 2.0 * max(out[-1][-1]["size"], 1.0)):
                out[-1].append(ch)
                continue
        out.append([ch])
    return out


def _inside(ch, box, tol: float = 0.01) -> bool:
    return (ch["x0"] >= box[0] - tol and ch["top"] >= box[1] - tol and ch["x1"] <= box[2] + tol
            and ch["bottom"] <= box[3] + tol)


def _outside(ch, box) -> bool:
    return (ch["x1"] <= box[0] or ch["x0"] >= box[2] or ch["bottom"] <= box[1]
            or ch["top"] >= box[3])


CASES = [("example", "a4"), ("example", "letter"), ("square-loop", "a4"),
         ("square-loop", "letter"), ("helix", "a4"), ("circle-loop", "a4"), ("custom", "a4"),
         ("delta-loop", "letter")]


@pytest.mark.parametrize(("name", "paper"), CASES)
def test_every_string_on_a_tile_is_whole_or_absent(drawn, name, paper):
    """No text is cut at a tile's edge: every string drawn on a tile page lies
    wholly inside its drawable area, or wholly in the footer below it."""
    with _open(drawn(name, paper)) as pdf:
        for page in pdf.pages[1:]:
            if "assembly map" in (page.extract_text() or ""):
                continue  # a continued assembly map
            frame = _frame(page)
            for run in _strings(page):
                words = "".join(ch["text"] for ch in run)
                if all(_inside(ch, frame) for ch in run):
                    continue
                assert all(_outside(ch, frame) and ch["top"] >= frame[3] for ch in run), (
                    f"page {page.page_number}: {words!r} is cut at the tile's edge")


@pytest.mark.parametrize(("name", "paper"), CASES)
def test_every_mark_id_appears_whole_on_a_tile(plans, drawn, name, paper):
    ids: set[str] = set()
    with _open(drawn(name, paper)) as pdf:
        for page in pdf.pages[1:]:
            frame = _frame(page)
            for run in _strings(page):
                if all(_inside(ch, frame) for ch in run):
                    ids |= set(re.findall(r"\bM\d+\b", "".join(ch["text"] for ch in run)))
    for e in plans[name].elements:
        for piece in e.pieces:
            assert set(mark_ids(piece)) <= ids


# -- issue 15: the assembly map's labels -------------------------------------------------
def _ink(page):
    """What is drawn on a page, as shapely geometry (pt, top-down): lines and
    curves as lines, unfilled boxes by their edges, filled ones whole."""
    from shapely.geometry import LineString, Point, box

    out = []
    for obj in page.lines + page.curves:
        pts = obj["pts"]
        out.append(LineString(pts) if len(pts) > 1 else Point(pts[0]))
    for r in page.rects:
        b = box(r["x0"], r["top"], r["x1"], r["bottom"])
        out.append(b if r["fill"] else b.exterior)
    return out


@pytest.mark.parametrize(("name", "paper"), [("square-loop", "a4"), ("example", "a4"),
                                             ("helix", "letter")])
def test_map_labels_clear_of_each_other_and_of_the_drawing(drawn, name, paper):
    """Nothing written on the assembly map touches the drawing, the tiles drawn
    over it or another label (word boxes from pdfplumber, geometry by shapely)."""
    from shapely.geometry import box

    with _open(drawn(name, paper)) as pdf:
        page = pdf.pages[0]
        ink = _ink(page)
        words = [box(w["x0"] + 0.2, w["top"] + 0.2, w["x1"] - 0.2, w["bottom"] - 0.2)
                 for w in page.extract_words()]
    assert len(words) > 20
    for i, w in enumerate(words):
        assert not any(w.intersects(g) for g in ink), f"word {i} crosses the drawing"
        assert not any(w.intersects(o) for o in words[i + 1:]), f"word {i} overlaps a word"


# -- issue 15: tiles worth printing --------------------------------------------------------
def _cross_graph(pdf) -> dict[int, set[str]]:
    return {i: set(_crosses(pdf.pages[i])) for i in range(1, len(pdf.pages))
            if re.search(r"tile [A-Z]+\d+:", pdf.pages[i].extract_text() or "")}


def _joined(tiles: dict[int, set[str]]) -> bool:
    left = set(tiles)
    if not left:
        return True
    todo = [left.pop()]
    while todo:
        i = todo.pop()
        for j in sorted(left):
            if tiles[i] & tiles[j]:
                left.discard(j)
                todo.append(j)
    return not left


def _has_content(page) -> bool:
    """Whether a tile page carries something to mark or align from: a string
    other than a cross's number or the overlap note, a solid curve (a bend), or
    a line, bar or tick that stops inside the page (not a cross's arm)."""
    x0, top, x1, bottom = _frame(page)

    def within(x: float, y: float) -> bool:
        return x0 + 0.5 < x < x1 - 0.5 and top + 0.5 < y < bottom - 0.5

    for run in _strings(page):
        words = "".join(ch["text"] for ch in run)
        if (all(_inside(ch, _frame(page)) for ch in run) and not words.isdigit()
                and not words.startswith("overlap:")):
            return True
    def dashed(obj) -> bool:
        return bool(obj["dash"] and obj["dash"][0])  # (dash array, phase)

    for cv in page.curves:
        if not dashed(cv) and any(within(x, y) for x, y in cv["pts"]):
            return True
    for ln in page.lines:
        if _vertical(ln, CROSS_MM * PT, 0.01) or _horizontal(ln, CROSS_MM * PT, 0.01):
            continue  # an alignment cross
        if dashed(ln):
            continue
        if any(within(x, y) for x, y in ln["pts"]):
            return True
    for r in page.rects:
        if r["fill"] and any(within(x, y) for x in (r["x0"], r["x1"])
                             for y in (r["top"], r["bottom"])):
            return True
    return False


def test_square_loop_prints_only_tiles_worth_printing(plans, drawn):
    """Issue 15's 520 mm loop: each printed tile carries something to mark or
    align from, or is needed to join the others through shared crosses; the
    map says why each is kept; the printed tiles assemble to a true strip."""
    data = drawn("square-loop", "a4")
    with _open(data) as pdf:
        pages = len(pdf.pages)
        head = re.sub(r"\s+", " ", pdf.pages[0].extract_text())
        graph = _cross_graph(pdf)
        for i in graph:
            page = pdf.pages[i]
            footer = re.sub(r"\s+", " ", page.extract_text())
            name = re.search(r"tile ([A-Z]+\d+):", footer).group(1)
            assert re.search(rf"{name} \(page {i + 1}\): \S", head), name  # why it is kept
            assert "carries: " in footer
            if not _has_content(page):
                assert "joins its neighbours" in head.split(f"{name} (page {i + 1}):")[1][:80]
                rest = {j: v for j, v in graph.items() if j != i}
                assert not _joined(rest), f"tile {name} carries nothing and joins nothing"
    assert _joined(graph)
    # measured on this branch's parent: one page per grid tile with anything on
    # it made 21 pages, most of the strip's tiles carrying only a grey bar
    assert pages < 21
    assert "left out" in head
    _check_strip(plans["square-loop"].elements[0], data)


# -- issue 15: the helix's turns on the strip ----------------------------------------------
def test_helix_strip_has_a_tick_at_every_turn(plans, drawn):
    """One tick per full turn along the helical bend, each one turn of stock
    after the last, measured on the assembled strip."""
    p = plans["helix"]
    piece = p.elements[0].piece
    params = p.elements[0].spec.params
    d = piece.conductor_diameter_mm
    k = piece.stock.k_factor
    radius = params.diameter_mm / 2 - d / 2 + k * d  # neutral axis: inside radius + K x depth
    # source: arc length of the circular helix (a cos t, a sin t, p t / 2 pi) over one
    # turn, sqrt((2 pi a)^2 + p^2) (any calculus text; from memory), as in the trade
    # notes' helix length N sqrt((pi D)^2 + p^2)
    per_turn = math.hypot(2 * math.pi * radius, params.pitch_mm)
    with _open(drawn("helix", "a4")) as pdf:
        ticks = _strip_ticks(pdf, d)
    start = min(ticks["mark"], key=lambda x: abs(x - piece.bends[0].start_from_centre_mm))
    turns = ticks["turn"]
    assert len(turns) == params.turns - 1  # the last turn ends at the bend's end mark
    for n, x in enumerate(turns, 1):
        assert x - start == pytest.approx(n * per_turn, abs=0.1)  # 0.1 mm on the paper


# -- issue 15: the shop's unit first ------------------------------------------------------
INCH_FIRST = re.compile(r'\d+(?: \d+/\d+)?"\s*\(\d+\.\d+ mm\)|\b\d+/\d+"\s*\(\d+\.\d+ mm\)')
MM_FIRST = re.compile(r'\d+\.\d+ mm\s*\((?:\d+ )?\d+(?:/\d+)?"\)')


def _all_strings(data: bytes) -> list[str]:
    with _open(data) as pdf:
        return ["".join(ch["text"] for ch in run) for page in pdf.pages
                for run in _strings(page)]


@pytest.mark.parametrize(("name", "first", "other"), [("helix", MM_FIRST, INCH_FIRST),
                                                      ("square-loop", MM_FIRST, INCH_FIRST),
                                                      ("example", INCH_FIRST, MM_FIRST)],
                         ids=["helix-mm-shop", "square-loop-mm-shop", "example-inch-shop"])
def test_lengths_read_in_the_shop_unit_first(drawn, name, first, other):
    strings = _all_strings(drawn(name, "a4"))
    assert sum(bool(first.search(s)) for s in strings) >= 5
    assert not [s for s in strings if other.search(s)]


# -- issue 15: printing at actual size, embedded fonts -------------------------------------
@pytest.mark.parametrize("paper", ["a4", "roll-610mm"])
def test_viewers_asked_not_to_scale_and_fonts_embedded(example_plan, paper):
    from pdfminer.pdftypes import resolve1

    data = template_pdf(example_plan, paper)
    with _open(data) as pdf:
        prefs = resolve1(pdf.doc.catalog["ViewerPreferences"])
        # source: ISO 32000-1, 12.2 table 150: PrintScaling /None asks the print
        # dialog not to scale the page
        assert resolve1(prefs["PrintScaling"]).name == "None"
        fonts = {}
        for page in pdf.pages:
            for ref in resolve1(page.page_obj.resources["Font"]).values():
                font = resolve1(ref)
                desc = resolve1(font["FontDescriptor"]) if "FontDescriptor" in font else {}
                fonts[resolve1(font["BaseFont"]).name] = "FontFile2" in desc
            assert {ch["fontname"] for ch in page.chars} <= set(fonts)
    assert fonts and all(fonts.values()), fonts  # every font a TrueType program in the file
    assert b"/PrintScaling /None" in data


def test_same_bytes_whatever_was_drawn_before(example_plan, plans, pdfs):
    template_pdf(plans["helix"], "letter")  # other text through the same font subsets
    assert template_pdf(example_plan, "a4") == pdfs["a4"]


# -- the grid's arithmetic -----------------------------------------------------------------
@settings(max_examples=150, derandomize=True, deadline=None)
@given(cols=st.integers(1, 6), rows=st.integers(1, 6),
       box=st.tuples(st.floats(-50, 1200), st.floats(-50, 1200), st.floats(0, 400),
                     st.floats(0, 400)))
def test_tiles_over_a_box_are_the_tiles_it_meets(cols, rows, box):
    """Bucketing by box gives exactly the tiles a brute-force test over every
    tile finds; each point lies in the own part of exactly one tile."""
    g = Grid(210.0, 297.0, cols, rows)
    x, y, w, h = box
    b = (x, y, x + w, y + h)
    brute = [(r, c) for r in range(rows) for c in range(cols)
             if (t := g.box(r, c))[0] <= b[2] and b[0] <= t[2] and t[1] <= b[3] and b[1] <= t[3]]
    assert sorted(g.tiles_over(b)) == sorted(brute)
    if 0 <= x < g.width and 0 <= y < g.height:
        own = [(r, c) for r in range(rows) for c in range(cols)
               if (t := g.own_box(r, c))[0] <= x < t[2] and t[1] <= y < t[3]]
        assert g.owners((x, y, x, y)) == own and len(own) == 1
