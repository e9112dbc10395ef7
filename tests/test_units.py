"""Length parsing and tape-measure formatting."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.errors import DesignError
from fabplan.units import format_inches, format_length, format_mm, parse_frequency, parse_length

# 1 in = 25.4 mm exactly (source: international yard and pound agreement, 1959)
# 35 1/4 in = 895.35 mm; 0.8946 m = 894.6 mm


@pytest.mark.parametrize("text, mm", [
    ("35 1/4 in", 895.35),
    ("35.25in", 895.35),
    ("2 ft 11 1/4 in", 895.35),
    ("2'-11 1/4\"", 895.35),
    ("1/4\"", 6.35),
    ("894.6 mm", 894.6),
    ("89.46 cm", 894.6),
    ("0.8946 m", 894.6),
    ("3 ft", 914.4),
    ("  12 mm ", 12.0),
])
def test_parse_length(text, mm):
    assert parse_length(text, "f") == pytest.approx(mm, abs=1e-9)


@pytest.mark.parametrize("value, match", [
    ("35", "bare number has no unit"),
    (35, "bare number has no unit"),
    ("35 furlongs", "unknown unit 'furlongs'"),
    ("nan mm", "finite"),
    ("inf in", "finite"),
    ("0 mm", "greater than zero"),
    ("-3 mm", "must not be negative"),
    ("three in", "not a length"),
    ("", "not a length"),
    (None, "expected a length"),
])
def test_parse_length_errors_name_the_field(value, match):
    with pytest.raises(DesignError, match=match) as info:
        parse_length(value, "element.side")
    assert "element.side" in str(info.value)


def test_zero_allowed_where_it_makes_sense():
    assert parse_length("0 mm", "shop.kerf", allow_zero=True) == 0.0


@pytest.mark.parametrize("mm, den, text", [
    (895.35, 32, '35 1/4"'),
    (27.78125, 32, '1 3/32"'),   # 1 3/32 in = 27.78125 mm
    (25.4, 32, '1"'),
    (3.175, 32, '1/8"'),
    (-15.875, 32, '-5/8"'),
    (10.0, 8, '3/8"'),           # 0.3937 in -> nearest 1/8 is 3/8
    (10.0, 64, '25/64"'),        # 0.3937 in -> 25.2/64 -> 25/64
])
def test_format_inches_reads_like_a_tape(mm, den, text):
    assert format_inches(mm, den) == text


def test_format_length_primary_unit():
    assert format_length(895.35, "in") == '35 1/4" (895.4 mm)'
    assert format_length(895.35, "mm") == '895.4 mm (35 1/4")'
    assert format_mm(146.05) == format_mm(-146.05).lstrip("-")


@settings(max_examples=200, deadline=None)
@given(st.integers(min_value=1, max_value=4000), st.sampled_from([8, 16, 32, 64]))
def test_fraction_round_trip(ticks, den):
    """A length on the tape's grid formats and parses back exactly."""
    mm = ticks * 25.4 / den
    text = format_inches(mm, den)
    assert parse_length(text.replace('"', " in"), "x") == pytest.approx(mm, abs=1e-9)


@settings(max_examples=200, deadline=None)
@given(st.floats(min_value=0.01, max_value=1e5, allow_nan=False))
def test_mm_round_trip(mm):
    assert parse_length(f"{mm!r} mm", "x") == pytest.approx(mm, rel=1e-12)
    assert parse_length(f"{mm / 1000!r} m", "x") == pytest.approx(mm, rel=1e-12)


def test_frequency():
    assert parse_frequency("146 MHz", "f") == 146e6
    assert parse_frequency("7.15MHz", "f") == pytest.approx(7.15e6)
    with pytest.raises(DesignError, match="unknown frequency unit"):
        parse_frequency("146 MHZZ", "f")
    with pytest.raises(DesignError, match="with its unit"):
        parse_frequency("146", "electrical.target")
    assert math.isfinite(parse_frequency("1 GHz", "f"))


# -- lengths as the trade writes them ------------------------------------------------
# 1 in = 25.4 mm and 1 ft = 12 in exactly (source: international yard and pound
# agreement, 1959; NIST SP 811 appendix B); 10 3/4 in = 273.05 mm, 2 ft 11 1/4 in =
# 895.35 mm. The marks: U+2033 double prime (inch), U+2032 prime (foot), and the curly
# quotation marks U+201D and U+2019 that word processors put in their place.
@pytest.mark.parametrize("text, mm", [
    ("10-3/4 in", 273.05),
    ("10 3/4\"", 273.05),
    ("10 - 3/4 in", 273.05),
    ("10 3/4\u2033", 273.05),
    ("10 3/4\u201d", 273.05),
    ("2 ft 11-1/4 in", 895.35),
    ("2\u2032 11 1/4\u2033", 895.35),
    ("2\u2019-11 1/4\u201d", 895.35),
    ("2'-11-1/4\"", 895.35),
    ("1 m 20 cm", 1200.0),
    ("10\u00a03/4 in", 273.05),  # a non-breaking space, as pasted
])
def test_parse_length_as_the_trade_writes_it(text, mm):
    assert parse_length(text, "f") == pytest.approx(mm, abs=1e-9)


@pytest.mark.parametrize("text, match", [
    ("10 in 3 in", "the unit 'in' repeats: give each unit once, the larger first"),
    ("3 in 2 ft", "the unit 'ft' comes after a smaller unit"),
    ("20 cm 1 m", "the unit 'm' comes after a smaller unit"),
    ("1 ft 3 cm", "do not mix metric and inch units"),
    ("10-3/4", "bare number has no unit"),
])
def test_parse_length_refuses_repeated_ascending_or_mixed_units(text, match):
    with pytest.raises(DesignError, match=match) as info:
        parse_length(text, "element.side")
    assert str(info.value).startswith(f"element.side = {text!r}: ")


@pytest.mark.parametrize("text, match", [
    ("1e15 mm", "must be at most 100 m"),
    ("1e30 mm", "must be at most 100 m"),
    ("1e300 mm", "must be at most 100 m"),
    ("10000 m", "must be at most 100 m"),
    ("1e400 mm", "finite"),
    ("0.001 mm", "at least 0.01 mm"),
    ("1" + "0" * 400 + "/3 in", "at most 100 characters"),
    ("1" + "0" * 90 + "/3 in", "must be at most 100 m"),  # no OverflowError on the way
])
def test_parse_length_bounds(text, match):
    with pytest.raises(DesignError, match=match):
        parse_length(text, "element.side")


def test_parse_length_bound_can_be_tighter_and_says_why():
    assert parse_length("500 mm", "shop.trim", max_mm=500.0) == 500.0
    with pytest.raises(DesignError, match=r"at most 500 mm \(a grip\)"):
        parse_length("501 mm", "shop.trim", max_mm=500.0, bound="a grip")


@pytest.mark.parametrize("text", ["1e-300 Hz", "1 Hz", "999 Hz", "100.1 GHz", "1e30 Hz"])
def test_frequency_outside_the_stated_range(text):
    with pytest.raises(DesignError, match="must lie between 1 kHz and 100 GHz") as info:
        parse_frequency(text, "electrical.target")
    assert str(info.value).startswith(f"electrical.target = {text!r}: ")


def test_frequency_range_ends_are_allowed():
    assert parse_frequency("1 kHz", "f") == 1e3
    assert parse_frequency("100 GHz", "f") == 100e9


def test_mass_and_power_are_bounded():
    from fabplan.units import parse_mass, parse_power

    assert parse_mass("1000 kg", "purchase.item[1].weight") == 1000.0
    with pytest.raises(DesignError, match="at most 1000 kg"):
        parse_mass("1e300 kg", "purchase.item[1].weight")
    assert parse_power("1.5 kW", "electrical.power") == 1500.0
    with pytest.raises(DesignError, match="at most 1 MW"):
        parse_power("1e30 kW", "electrical.power")


def test_capacitance_and_voltage_for_people():
    from fabplan.units import format_capacitance, format_voltage

    assert format_capacitance(47.5e-12) == "47.5 pF"
    assert format_capacitance(1.2e-9) == "1.20 nF"
    assert format_capacitance(2.2e-6) == "2.20 uF"
    assert format_voltage(850.0) == "850 V"
    assert format_voltage(6128.8) == "6.13 kV"


def test_impedance_format_never_shows_a_negative_zero():
    from fabplan.units import format_impedance

    assert format_impedance(complex(40.0976, -1e-12)) == "40.1 +0.0j"
    assert format_impedance(complex(40.0976, 1e-12)) == "40.1 +0.0j"
    assert format_impedance(complex(12.04, -3.26)) == "12.0 -3.3j"
    assert format_impedance(complex(-0.01, 7.0), 2) == "-0.01 +7.00j"
