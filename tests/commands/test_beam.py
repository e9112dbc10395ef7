"""The 2 m beam example end to end: `fabplan build` writes everything, the JSON carries
the beam's figures, the sheet the boom, and `tune -o` writes the match back."""

from __future__ import annotations

import json

import pdfplumber
import pytest

from fabplan.commands.output import BUILD_NAMES
from fabplan.design.read import load_design
from fabplan.render.text import plan_to_text


def test_build_writes_the_beam_and_its_drilling_template(cli, beam_example_path, tmp_path):
    cli("build", beam_example_path, "-o", tmp_path / "out", check_exit=0)
    out = tmp_path / "out"
    for key in ("plan", "sheet", "template", "drilling", "sweep"):
        assert (out / BUILD_NAMES[key]).stat().st_size > 0, key
    plan = json.loads((out / BUILD_NAMES["plan"]).read_text())
    by_name = {e["name"]: e for e in plan["elements"]}
    # the keys the issue names, each as the Plan has them
    assert by_name["reflector"]["position_mm"] == 40.0
    assert by_name["reflector"]["boom_correction_mm"] > 0
    assert by_name["driven"]["boom_correction_mm"] == 0.0  # above the boom on a block
    assert [p["cut_length_mm"] for p in by_name["driven"]["pieces"]] == [
        pytest.approx(by_name["driven"]["cut_length_mm"] / 2)] * 2
    assert by_name["driven hairpin"]["part_of"] == "driven"
    holes = plan["boom"]["holes"]
    assert [h["from_datum_mm"] for h in holes] == [40.0, 454.0, 867.0]
    assert all({"from_datum_mm", "diameter_mm", "angle_deg"} <= set(h) for h in holes)
    e = plan["electrical"]
    assert e["gain_dbi"] > 7.5 and e["front_to_back_db"] > 10
    driven = by_name["driven"]["electrical"]
    assert driven["min_swr"] < 1.2  # the tuned hairpin
    assert abs(driven["min_swr_hz"] / 145e6 - 1) < 0.01
    # purchases per stock: the elements' rod, the hairpin's copper wire and the boom's
    # square tube each bought; the boom cut from its tube and weighed with the elements
    buy = {b["stock"] for b in plan["order"]["buy"]}
    assert buy == {None, "awg-6", "al-sq-1x1/16"}
    booms = [c for p in plan["order"]["stock_pieces"] for c in p["cuts"]
             if c["element"] == "boom"]
    assert [c["length_mm"] for c in booms] == [920.0]
    w = plan["order"]["weight_kg"]
    # source: 6063 aluminium 2700 kg/m^3 (ASTM B221 / handbook, from memory); 1 x 1/16 in
    # square tube: (25.4^2 - 22.225^2) mm^2 = 151.2 mm^2, so 0.408 kg/m, 0.375 kg for 920 mm
    assert w["boom"] == pytest.approx(0.375, rel=0.01)
    assert w["built"] == pytest.approx(w["elements"] + w["boom"] + w["items"], abs=1e-5)
    with pdfplumber.open(out / BUILD_NAMES["sheet"]) as pdf:
        text = "\n".join(page.extract_text() or "" for page in pdf.pages)
    for words in ("Boom and assembly", "Drilling plan", "Hardware", "insulating shoulder",
                  "Element: driven hairpin (hairpin)"):
        assert words in text, words


def test_tune_writes_the_hairpin_back(cli, beam_example_path, tmp_path):
    src = tmp_path / "beam.toml"
    text = beam_example_path.read_text().replace('length = "54.9 mm"', 'length = "70 mm"')
    src.write_text(text)
    proc = cli("tune", src, "-o", tmp_path / "tuned.toml", check_exit=0)
    assert "match.length" in proc.stdout
    tuned = (tmp_path / "tuned.toml").read_text()
    # the comments survive, and the match comes back to the example's tuned legs
    assert "# the legs, feed terminals to the bend" in tuned
    d = load_design(tmp_path / "tuned.toml")
    legs = next(e for e in d.elements if e.name == "driven").match.length_mm
    assert legs == pytest.approx(54.9, abs=1.5)


def test_plan_text_shows_the_boom(beam_plan):
    text = plan_to_text(beam_plan)
    assert "Drilling (from the datum" in text
    assert "insulated" in text and "balances" in text
