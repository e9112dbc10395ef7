"""The wrap-around drilling template, measured with an independent PDF reader."""

from __future__ import annotations

import io
import math

import pdfplumber
import pytest

from fabplan.drilling.records import DrillPattern, Hole
from fabplan.render.wrap import drilling_pdf, wrap_pdf

PT = 72 / 25.4  # points per mm (1 in = 72 pt = 25.4 mm)


def _mast() -> DrillPattern:
    return DrillPattern("mast", "round", 40.0, 150.0, "the mast's top",
                        (Hole("upper loop", 20.0, 0.0, 6.0, True, "loop wire"),
                         Hole("lower loop", 120.0, 90.0, 4.0, False, "loop wire")))


def test_round_strip_and_holes_at_one_to_one():
    # source: pdfplumber reads the drawn geometry back in points (1 pt = 25.4/72 mm); a
    # wrap-around strip is as wide as the circumference pi D, holes at their distance from
    # the datum and pi D theta / 360 round from the alignment line; within 0.1 mm
    pattern = _mast()
    with pdfplumber.open(io.BytesIO(wrap_pdf([pattern], "test", "a4"))) as doc:
        assert len(doc.pages) == 1
        page = doc.pages[0]
        edges = sorted({round(ln["top"], 3) for ln in page.lines
                        if abs(ln["y0"] - ln["y1"]) < 1e-6 and abs(ln["linewidth"] - 0.6) < 1e-6
                        and ln["x1"] - ln["x0"] > 100 * PT})
        assert len(edges) == 2
        assert (edges[1] - edges[0]) / PT == pytest.approx(math.pi * 40.0, abs=0.1)
        align = [ln for ln in page.lines if abs(ln["y0"] - ln["y1"]) < 1e-6
                 and abs(ln["linewidth"] - 0.5) < 1e-6 and ln["x1"] - ln["x0"] > 100 * PT]
        assert len(align) == 1
        y_align = align[0]["top"]
        assert y_align == pytest.approx((edges[0] + edges[1]) / 2, abs=0.1 * PT)
        solid = [c for c in page.curves if not c["dash"] or not c["dash"][0]]
        centres = sorted(((c["x0"] + c["x1"]) / 2, (c["top"] + c["bottom"]) / 2,
                          (c["x1"] - c["x0"]) / PT) for c in solid)
        assert len(centres) == 2
        (xa, ya, da), (xb, yb, db) = centres
        assert (xb - xa) / PT == pytest.approx(100.0, abs=0.1)
        assert da == pytest.approx(6.0, abs=0.1) and db == pytest.approx(4.0, abs=0.1)
        assert ya == pytest.approx(y_align, abs=0.1 * PT)  # 0 deg: on the alignment line
        # 90 deg: a quarter of the way round, on the side away from... above the line
        assert (y_align - yb) / PT == pytest.approx(math.pi * 40.0 / 4, abs=0.1)
        # the through hole's exit: half way round, on the seam (both long edges)
        dashed = [c for c in page.curves if c["dash"] and c["dash"][0]]
        assert sorted(round((c["top"] + c["bottom"]) / 2, 1) for c in dashed) == \
            pytest.approx(edges, abs=0.1 * PT)
        # the calibration bars: filled bars of exactly 100 mm and 4 in
        widths = sorted(r["width"] / PT for r in page.rects if r["fill"])
        assert any(abs(w - 100.0) < 0.1 for w in widths)
        assert any(abs(w - 101.6) < 0.1 for w in widths)


def test_the_beam_template_is_tiled_with_a_datum_and_bars(beam_plan):
    # source: pdfplumber; the same checks on every tile; same input, same bytes
    pdf = drilling_pdf(beam_plan, "a4")
    assert pdf == drilling_pdf(beam_plan, "a4")
    with pdfplumber.open(io.BytesIO(pdf)) as doc:
        assert len(doc.pages) >= 2
        assert "from datum" in (doc.pages[0].extract_text() or "")
        for page in doc.pages:
            widths = [r["width"] / PT for r in page.rects if r["fill"]]
            assert any(abs(w - 100.0) < 0.1 for w in widths)
        # every hole of the boom on some tile: a solid circle of its diameter
        got = [(c["x1"] - c["x0"]) / PT for page in doc.pages
               for c in page.curves if not c["dash"] or not c["dash"][0]]
        for h in beam_plan.boom.drilling.holes:
            assert any(abs(g - h.diameter_mm) < 0.1 for g in got)


def test_no_holes_no_template():
    from fabplan.errors import DesignError

    with pytest.raises(DesignError, match="no holes"):
        wrap_pdf([], "nothing", "a4")
