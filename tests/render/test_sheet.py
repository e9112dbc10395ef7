"""The PDF build sheet, read back with an independent PDF reader (pdfplumber)."""

from __future__ import annotations

import io
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


def _pages(data: bytes) -> list[str]:
    with pdfplumber.open(io.BytesIO(data)) as pdf:
        return [page.extract_text() for page in pdf.pages]


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
