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

from fabplan.design.read import load_design
from fabplan.errors import DesignError
from fabplan.plan import make_plan
from fabplan.render.fullscale import template_pdf
from fabplan.render.fullscale.layout import CENTRE_TICK_MM, STRIP_TICK_MM
from fabplan.render.fullscale.tiling import CROSS_MM, OVERLAP_MM, tile_count

EXAMPLE = Path(__file__).resolve().parents[2] / "examples" / "club-uhf-folded-dipoles.toml"
PT = 72 / 25.4  # pt per mm: 1 in = 25.4 mm = 72 pt (source: ISO 32000-1, 8.3.2.3 user space)


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


def _check_strip(e, data: bytes) -> int:
    """Assemble the tiles, measure the strip's ticks from the centre tick and
    compare with the Plan's marks; returns the page count."""
    tick = (e.piece.conductor_diameter_mm + 2 * STRIP_TICK_MM) * PT
    centre = (e.piece.conductor_diameter_mm + 2 * CENTRE_TICK_MM) * PT
    with _open(data) as pdf:
        pages = len(pdf.pages)
        offset = _assemble(pdf)
        ticks = _global_lines(pdf, offset, lambda ln: _vertical(ln, tick))
        mid = _global_lines(pdf, offset, lambda ln: _vertical(ln, centre))
    assert len(mid) == 1
    x0 = mid[0][0]
    drawn = sorted((t[0] - x0) / PT for t in ticks)
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
    p = make_plan(load_design(write_design(text)))
    data = template_pdf(p, "a4")
    with _open(data) as pdf:
        head = re.sub(r"\s+", " ", pdf.pages[0].extract_text())
    m = re.search(r"(\d+) tile\(s\) to print, in a grid of (\d+) row\(s\) x (\d+) column", head)
    printed, rows, cols = map(int, m.groups())
    assert printed < rows * cols and f"{rows * cols - printed} blank tile(s)" in head
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
    assert OVERLAP_MM == 15.0  # the overlap stated on the map page
    assert "overlap by 15 mm" in head


def test_same_plan_same_bytes(example_plan, pdfs):
    assert template_pdf(example_plan, "a4") == pdfs["a4"]


def test_non_planar_element_gets_a_strip(write_design):
    text = (Path(__file__).resolve().parents[2] / "fabplan" / "templates"
            / "helix.toml").read_text()
    p = make_plan(load_design(write_design(text)))
    with _open(template_pdf(p, "letter")) as pdf:
        assert len(pdf.pages) >= 2
        assert "not for marking" in "".join(pg.extract_text() for pg in pdf.pages)


def test_too_big_for_the_roll_is_bad_input(write_design):
    text = (Path(__file__).resolve().parents[2] / "fabplan" / "templates"
            / "rect-loop.toml").read_text()
    # a 30 x 30 in loop: about 770 mm each way, wider than a 610 mm roll both ways
    text = text.replace('width = "9 in"', 'width = "30 in"').replace('height = "6 in"',
                                                                   'height = "30 in"')
    p = make_plan(load_design(write_design(text)))
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
    p = make_plan(load_design(write_design(text)))
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
