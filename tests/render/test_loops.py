"""The loop and helix examples built from the command line: plan.json read back with the
json module, the build sheet read back with pdfplumber, measured against the Plan."""

from __future__ import annotations

import json

import pytest

from fabplan.render.json import plan_to_dict
from fabplan.render.loops import RATING_MARGIN, capacitor_to_buy
from fabplan.render.text import plan_to_text
from fabplan.units import format_capacitance, format_voltage

_TEXT: dict[str, str] = {}  # each sheet's text, read once (reading is slow)


def sheet_text(folder) -> str:
    import pdfplumber

    if str(folder) not in _TEXT:
        with pdfplumber.open(folder / "build-sheet.pdf") as pdf:
            _TEXT[str(folder)] = "\n".join(page.extract_text() or "" for page in pdf.pages)
    return _TEXT[str(folder)]


def test_examples_build(example_builds):
    for name, (proc, folder) in example_builds.items():
        assert proc.returncode == 0, (name, proc.stderr)
        for f in ("plan.json", "build-sheet.pdf", "template-1to1.pdf", "sweep.csv"):
            assert (folder / f).is_file(), (name, f)


def test_loop_json(example_builds, loop_example_plan):
    _, folder = example_builds["loop"]
    data = json.loads((folder / "plan.json").read_text())
    el = data["electrical"]
    (st,) = loop_example_plan.electrical.structures
    lf = st.loop
    assert lf is not None
    assert el["capacitance_f"] == pytest.approx(lf.capacitance_f, rel=1e-5)
    assert el["capacitance_range_f"] == pytest.approx(list(lf.capacitance_range_f), rel=1e-5)
    assert el["capacitor_voltage_v_rms"] == pytest.approx(lf.capacitor_v_rms, abs=1e-3)
    assert el["q_loaded"] == pytest.approx(lf.q_loaded, abs=1e-3)
    assert el["bandwidth_hz"] == pytest.approx(lf.bandwidth_hz, abs=0.1)
    assert el["efficiency"] == pytest.approx(lf.efficiency, abs=1e-5)
    loop = el["loop"]
    assert loop["element"] == "main loop" and loop["coupling"] == ["coupling loop"]
    assert len(loop["band"]) == 5 and loop["joints"] == 18  # 2 + 2 per elbow
    assert loop["coupling_loop"]["swr"] == pytest.approx(lf.feed_swr, abs=1e-4)
    # the same dictionary as the in-process plan gives (same input, same figures)
    assert plan_to_dict(loop_example_plan)["electrical"]["loop"] == loop


def test_helix_json(example_builds, qfh_example_plan):
    _, folder = example_builds["qfh"]
    data = json.loads((folder / "plan.json").read_text())
    (e,) = data["elements"]
    assert [p["label"] for p in e["pieces"]] == ["large loop", "small loop"]
    plan_e = qfh_example_plan.elements[0]
    for piece, plan_piece in zip(e["pieces"], plan_e.pieces):
        assert piece["developed_length_mm"] == pytest.approx(plan_piece.developed_length_mm,
                                                             abs=1e-4)
    ff = qfh_example_plan.electrical.structures[0].far_field
    assert data["electrical"]["axial_ratio_db"] == pytest.approx(ff.axial_ratio_db, abs=1e-3)
    assert data["electrical"]["gain_zenith_dbi"] == pytest.approx(ff.gain_zenith_dbi, abs=1e-3)
    assert data["electrical"]["polarisation_zenith"] == "right"
    assert data["electrical"]["helix"]["loops"] == ["large loop", "small loop"]
    (mast,) = data["drilling"]
    assert [h["label"] for h in mast["holes"]] == [h.label for h in qfh_example_plan.drilling[0]
                                                   .holes]


def test_loop_sheet_says_what_capacitor_to_buy(example_builds, loop_example_plan):
    _, folder = example_builds["loop"]
    text = sheet_text(folder)
    lf = loop_example_plan.electrical.structures[0].loop
    assert "the capacitor to buy" in text
    lo, hi = lf.capacitance_range_f
    assert f"{format_capacitance(lo)} to {format_capacitance(hi)}" in text
    assert f"at least {format_voltage(RATING_MARGIN * lf.capacitor_v_peak_max)}" in text
    assert "RF high voltage" in text
    assert "Across the band" in text and "Coupling loop" in text
    assert capacitor_to_buy(lf) in plan_to_text(loop_example_plan)


def test_helix_sheet_says_where_to_drill(example_builds, qfh_example_plan):
    _, folder = example_builds["qfh"]
    text = sheet_text(folder)
    assert "Where to drill the mast" in text
    assert "Left-hand winding" in text
    for hole in qfh_example_plan.drilling[0].holes:
        row = f"{hole.label} {hole.from_datum_mm:.1f} mm"
        assert row in text, row


def test_mast_wrap_template_measured(example_builds, qfh_example_plan):
    # source: pdfplumber reads the wrap-around template back in points (1 pt = 25.4/72 mm):
    # every hole a solid circle of its drill diameter; the large loop's on the alignment
    # line (0 deg), the small loop's a quarter of the circumference round from it
    # (pi D x 90 / 360); the two top holes at one distance from the datum, the two bottom
    # holes their loops' heights apart; within 0.1 mm
    import math

    import pdfplumber

    pt = 72 / 25.4
    _, folder = example_builds["qfh"]
    (mast,) = qfh_example_plan.drilling
    found = []
    with pdfplumber.open(folder / "drilling-1to1.pdf") as doc:
        for page in doc.pages:
            align = [ln for ln in page.lines if abs(ln["y0"] - ln["y1"]) < 1e-6
                     and abs(ln["linewidth"] - 0.5) < 1e-6 and ln["x1"] - ln["x0"] > 100 * pt]
            solid = [c for c in page.curves if not c["dash"] or not c["dash"][0]]
            for c in solid:
                d = (c["x1"] - c["x0"]) / pt
                if abs(d - mast.holes[0].diameter_mm) < 0.1:
                    y = (c["top"] + c["bottom"]) / 2
                    found.append((page.page_number, (c["x0"] + c["x1"]) / 2 / pt,
                                  (align[0]["top"] - y) / pt))
    assert len(found) == 4
    quarter = math.pi * mast.outside_mm / 4
    offsets = sorted(round(off, 1) for _, _, off in found)
    assert offsets == pytest.approx([0.0, 0.0, quarter, quarter], abs=0.1)
    by_page: dict[int, list[float]] = {}
    for page, x, _ in found:
        by_page.setdefault(page, []).append(x)
    first, last = min(by_page), max(by_page)
    assert abs(by_page[first][0] - by_page[first][1]) < 0.1  # both top holes at 64 mm
    bottoms = sorted(h.from_datum_mm for h in mast.holes if h.label.endswith("bottom"))
    assert abs(by_page[last][0] - by_page[last][1]) == pytest.approx(bottoms[1] - bottoms[0],
                                                                     abs=0.1)
