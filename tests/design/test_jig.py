"""The [jig] table and the jig command's option strings."""

from __future__ import annotations

import pytest

from fabplan.design.jig import JigSettings, parse_bed, read_jig, with_options
from fabplan.design.read import parse_design
from fabplan.errors import DesignError
from fabplan.section import Section


def test_defaults_when_the_table_is_absent(folded_dipole_toml):
    design = parse_design(folded_dipole_toml())
    assert design.jig == JigSettings()


def test_the_table_is_read_in_millimetres(folded_dipole_toml):
    text = folded_dipole_toml() + '\n[jig]\nbed = "24 x 18 in"\nkerf = "0.2 mm"\nunits = "in"\n' \
        'pin_pitch = "4 in"\nsplit = "end-plates"\n'
    s = parse_design(text).jig
    # source: 1 in = 25.4 mm exactly (NIST SP 811, appendix B)
    assert s.bed_mm == pytest.approx((609.6, 457.2))
    assert s.pin_pitch_mm == pytest.approx(101.6)
    assert (s.kerf_mm, s.units, s.split) == (pytest.approx(0.2), "in", "end-plates")


def test_unknown_key_names_the_field_and_a_near_miss():
    with pytest.raises(DesignError, match=r"jig\.kerff.*did you mean 'kerf'"):
        read_jig(Section({"jig": {"kerff": "1 mm"}}, ""))


@pytest.mark.parametrize("text, expected", [
    ("600x400mm", (600.0, 400.0)),
    ("600 x 400 mm", (600.0, 400.0)),
    ("24x18in", (609.6, 457.2)),  # source: 1 in = 25.4 mm (NIST SP 811)
    ("1.2 m x 60 cm", (1200.0, 600.0)),
])
def test_bed_strings(text, expected):
    assert parse_bed(text) == pytest.approx(expected)


@pytest.mark.parametrize("text", ["600x400", "600", "axb mm", "600x400x3mm", ""])
def test_bad_bed_strings_are_refused(text):
    with pytest.raises(DesignError, match="WIDTHxHEIGHT"):
        parse_bed(text, "--bed")


def test_options_override_and_are_checked():
    s = with_options(JigSettings(), bed="300x200mm", kerf="0.3 mm", units="in")
    assert (s.bed_mm, s.kerf_mm, s.units) == ((300.0, 200.0), pytest.approx(0.3), "in")
    with pytest.raises(DesignError, match="--units"):
        with_options(JigSettings(), units="cm")
    with pytest.raises(DesignError, match="kerf"):
        with_options(JigSettings(), kerf="6 mm")


def test_the_templates_commented_jig_table_parses_when_uncommented():
    from importlib import resources

    text = resources.files("fabplan").joinpath("templates", "folded-dipole.toml").read_text(
        "utf-8")
    lines = text.splitlines()
    start = lines.index("# [jig]")
    block = []
    for line in lines[start:]:
        if not line.startswith("# "):
            break
        block.append(line[2:])
    head = "\n".join(ln for ln in lines if not ln.startswith("#"))
    design = parse_design(head + "\n" + "\n".join(block) + "\n")
    s = design.jig
    assert s.bed_mm == (600.0, 400.0) and s.kerf_mm == pytest.approx(0.2)
    assert s.tool_radius_mm == pytest.approx(3.175) and s.split == "sections"


# -- issue 15: every [jig] size within a stated physical range ---------------------------
@pytest.mark.parametrize("key, value", [
    ("pin_pitch", "1e-300 mm"),  # never ended before (issue 15)
    ("pin_pitch", "0.001 mm"),  # 22 s before
    ("pin_pitch", "7 mm"),  # under the 6 mm pin plus 2 mm
    ("pin_pitch", "3 m"),
    ("bed", "50 x 400 mm"),
    ("bed", "600 x 9000 mm"),
    ("kerf", "5 mm"),
    ("margin", "2 mm"),
    ("margin", "1 m"),
    ("bolt_hole", "0.5 mm"),
    ("pin_diameter", "40 mm"),
    ("tool_radius", "20 mm"),
    ("mounting_hole", "60 mm"),
    ("part_gap", "200 mm"),
    ("text_height", "0.5 mm"),
    ("text_height", "1 m"),
    ("notch_clearance", "6 mm"),
    ("corner_radius", "30 mm"),  # over the 25 mm margin
])
def test_every_jig_size_out_of_range_is_one_line_naming_field_value_and_rule(key, value):
    with pytest.raises(DesignError) as err:
        read_jig(Section({"jig": {key: value}}, ""))
    line = str(err.value)
    assert "\n" not in line
    assert f"jig.{key}" in line and repr(value) in line and "must be" in line


@pytest.mark.parametrize("key, value, attr, mm", [
    ("pin_pitch", "8 mm", "pin_pitch_mm", 8.0),
    ("bed", "4 m x 100 mm", "bed_mm", (4000.0, 100.0)),
    ("kerf", "4.9 mm", "kerf_mm", 4.9),
    ("tool_radius", "0 mm", "tool_radius_mm", 0.0),
    ("text_height", "1 mm", "text_height_mm", 1.0),
    ("notch_clearance", "0 mm", "notch_clearance_mm", 0.0),
    ("notch_clearance", "1/32 in", "notch_clearance_mm", 0.79375),  # source: NIST SP 811
])
def test_sizes_at_the_ends_of_their_ranges_are_read(key, value, attr, mm):
    s = read_jig(Section({"jig": {key: value}}, ""))
    assert getattr(s, attr) == pytest.approx(mm)


def test_options_out_of_range_name_the_option():
    with pytest.raises(DesignError, match=r"--bed = '10x10mm'.*from 100 mm to 4 m"):
        with_options(JigSettings(), bed="10x10mm")
    with pytest.raises(DesignError, match=r"--kerf = '5 mm'"):
        with_options(JigSettings(), kerf="5 mm")


def test_the_default_notch_clearance_is_half_a_millimetre():
    # common practice, no source: a sliding fit for a wire in a cut slot
    assert JigSettings().notch_clearance_mm == 0.5
