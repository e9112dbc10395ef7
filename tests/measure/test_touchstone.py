"""Touchstone one-port reader and writer.

source: Touchstone(R) File Format Specification, Version 2.0 (IBIS Open Forum, ratified
24 April 2009): general syntax rules, option line, data lines, keywords. The hand-made
files and the scikit-rf files are described in tests/measure/data/README.md.
"""

from __future__ import annotations

import importlib.util
import math
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.errors import DesignError
from fabplan.measure import (
    MAX_POINTS,
    predicted_touchstone,
    read_touchstone,
    write_touchstone,
)
from fabplan.measure.sweep import MAX_LINES, MAX_TEXT_CHARS

DATA = Path(__file__).resolve().parent / "data"

# the three points every spec_* file holds (tests/measure/data/README.md)
SPEC_F_HZ = np.array([430e6, 440e6, 450e6])
SPEC_S11 = np.array([0.5 * np.exp(-0.5j * np.pi), 0.1, 0.25 * np.exp(0.25j * np.pi)])
SPEC_FILES = sorted(p.name for p in DATA.glob("spec_*") if p.suffix in (".s1p", ".ts"))


def _read(name: str):
    return read_touchstone((DATA / name).read_text(encoding="ascii"), name)


def _make_reference():
    spec = importlib.util.spec_from_file_location("make_reference", DATA / "make_reference.py")
    assert spec is not None and spec.loader is not None
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


def test_the_fixtures_are_all_there():
    assert len(SPEC_FILES) == 9
    assert len(list(DATA.glob("skrf_*"))) == len(_make_reference().CASES) == 10


@pytest.mark.parametrize("name", SPEC_FILES)
def test_hand_made_files_read_to_the_same_values(name):
    # source: Touchstone spec 2.0, option line (units Hz/kHz/MHz/GHz; formats RI, MA, DB:
    # DB is 20 log10 |S|, angles in degrees; defaults GHz S MA R 50) and the 2.0 keywords
    t = _read(name)
    np.testing.assert_allclose(t.freq_hz, SPEC_F_HZ, rtol=1e-15)
    np.testing.assert_allclose(t.s11, SPEC_S11, rtol=0, atol=1e-15)
    assert t.z0_ohm == (75.0 if name == "spec_v1_ma_mhz_r75.s1p" else 50.0)
    assert t.version == ("2.0" if name.endswith(".ts") else "1.x")


def test_hand_made_option_lines_are_understood():
    # source: Touchstone spec 2.0, option line: missing fields take GHz, S, MA, R 50
    t = _read("spec_v1_defaults.s1p")
    assert (t.frequency_unit, t.parameter, t.data_format, t.z0_ohm) == ("GHz", "S", "MA", 50.0)
    t = _read("spec_v1_ri_ghz.s1p")  # lower case: the file is case-insensitive (rule 1)
    assert (t.frequency_unit, t.data_format) == ("GHz", "RI")
    t = _read("spec_v2_db_ghz.ts")  # [Reference] 50 overrides R 75
    assert t.z0_ohm == 50.0
    assert t.comments[0].startswith("Hand-made")


@pytest.mark.parametrize("case", _make_reference().CASES, ids=lambda c: c[0])
def test_files_written_by_scikit_rf_read_to_the_values_it_was_given(case):
    # source: scikit-rf 2.2.0 Network.write_touchstone (tests/measure/data/make_reference.py)
    stem, z0, unit, form, version, parameter = case
    path = next(DATA.glob(stem + ".*"))
    t = read_touchstone(path.read_text(encoding="ascii"), path.name)
    f, z = _make_reference().reference_points()
    np.testing.assert_allclose(t.freq_hz, f, rtol=1e-14)
    np.testing.assert_allclose(t.s11, (z - z0) / (z + z0), rtol=0, atol=1e-12)
    assert t.z0_ohm == z0
    assert t.version == ("2.0" if version == "2.0" else "1.x")
    assert (t.parameter, t.data_format, t.frequency_unit.lower()) == (parameter, form.upper(),
                                                                       unit)
    np.testing.assert_allclose(t.to_sweep().z_ohm, z, rtol=1e-11)


@pytest.mark.parametrize("fmt", ["RI", "MA", "DB"])
@pytest.mark.parametrize("unit", ["Hz", "kHz", "MHz", "GHz"])
@pytest.mark.parametrize("version", ["1.1", "2.0"])
def test_write_then_read_round_trip(fmt, unit, version):
    f = np.linspace(420e6, 460e6, 9)
    s = 0.6 * np.exp(1j * np.linspace(-3.0, 3.0, 9)) * np.linspace(0.1, 1.0, 9)
    text = write_touchstone(f, s, 75.0, data_format=fmt, frequency_unit=unit, version=version,
                            comments=["fabplan test"])
    t = read_touchstone(text, "round.s1p")
    np.testing.assert_allclose(t.freq_hz, f, rtol=1e-15)
    np.testing.assert_allclose(t.s11, s, rtol=0, atol=1e-14)
    assert t.z0_ohm == 75.0 and t.data_format == fmt and t.frequency_unit == unit
    assert t.version == ("2.0" if version == "2.0" else "1.x")
    assert write_touchstone(f, s, 75.0, data_format=fmt, frequency_unit=unit, version=version,
                            comments=["fabplan test"]) == text  # same input, same bytes


def test_writer_output_is_the_specification_layout():
    # source: Touchstone spec 2.0: option line "# MHz S RI R 50"; 2.0 keywords in order
    text = write_touchstone([1e6, 2e6], [0.5, -0.25j], version="2.0", comments=["a"])
    assert text.splitlines() == [
        "! a", "[Version] 2.0", "# MHz S RI R 50", "[Number of Ports] 1",
        "[Number of Frequencies] 2", "[Network Data]",
        "! frequency (MHz), S11 real, S11 imaginary", "1 0.5 0", "2 0 -0.25", "[End]"]
    v1 = write_touchstone([1e6, 2e6], [0.5, -0.25j], data_format="DB", frequency_unit="kHz")
    assert v1.splitlines()[0] == "# kHz S DB R 50"
    assert v1.splitlines()[2].split()[:2] == ["1000", repr(20 * math.log10(0.5))]


def test_predicted_sweep_is_written_as_s11_of_the_impedance():
    # source: Pozar, Microwave Engineering 4th ed., sec. 2.3: Gamma = (Z - Z0)/(Z + Z0)
    f = np.array([430e6, 440e6, 450e6])
    z = np.array([30 - 40j, 50 + 0j, 100 + 25j])
    t = read_touchstone(predicted_touchstone(f, z, 50.0), "p.s1p")
    np.testing.assert_allclose(t.s11, (z - 50) / (z + 50), atol=1e-15)
    np.testing.assert_allclose(t.to_sweep().z_ohm, z, rtol=1e-13)


@settings(max_examples=40, derandomize=True, deadline=None)
@given(st.lists(st.tuples(st.floats(0.0, 1.0), st.floats(-180.0, 180.0)), min_size=1,
                max_size=20),
       st.sampled_from(["RI", "MA", "DB"]), st.sampled_from(["1.1", "2.0"]))
def test_round_trip_property(points, fmt, version):
    f = 1e6 * (1 + np.arange(len(points)))
    s = np.array([m * np.exp(1j * np.deg2rad(a)) for m, a in points])
    t = read_touchstone(write_touchstone(f, s, data_format=fmt, version=version))
    tol = 1e-13 + (1e-20 if fmt == "DB" else 0)  # DB writes |S| = 0 as -400 dB (1e-20)
    np.testing.assert_allclose(t.s11, s, rtol=0, atol=tol)


# -- refusals: one line naming the file, the line, the value and the rule ----------------
BAD = [
    ("# MHz S RI R 50\n440 0.1 0 0.2 0.3 0.4 0.5 0.6 0.7\n", "line 2", "two or more ports"),
    ("# MHz S RI R 50\n440 0.1\n", "line 2", "3 numbers"),
    ("# MHz S XY R 50\n440 0.1 0\n", "line 1", "not an option"),
    ("# MHz H RI R 50\n440 0.1 0\n", "line 1", "two-ports"),
    ("# MHz S RI R 50 75\n440 0.1 0\n", "line 1", "one reference resistance"),
    ("# MHz S RI R -50\n440 0.1 0\n", "line 1", "positive number"),
    ("# MHz S RI R50\n440 0.1 0\n", "line 1", "R 50"),
    ("# MHz S RI MA R 50\n440 0.1 0\n", "line 1", "format twice"),
    ("440 0.1 0\n# MHz S RI R 50\n", "line 1", "option line"),
    ("# MHz S RI R 50\n440 0.1 0\n430 0.1 0\n", "line 3", "increase"),
    ("# MHz S RI R 50\n440 0.1 0\n440 0.1 0\n", "line 3", "increase"),
    ("# MHz S RI R 50\n440 0.1 nan\n", "line 2", "expected a number"),
    ("# MHz S RI R 50\n440 0.1 1e999\n", "line 2", "expected a number"),
    ("# MHz S RI R 50\n440 0,1 0\n", "line 2", "expected a number"),
    ("# MHz S RI R 50\n440 0.1 0 \u00b0\n", "line 2", "printable ASCII"),
    ("! just a comment\n", "line 2", "no option line"),
    ("# MHz S RI R 50\n", "line 2", "no data"),
    ("# MHz S RI R 50\n[Number of Ports] 1\n", "line 2", "version 2 files"),
    ("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 2\n", "line 3", "2-port"),
    ("[Version] 3.0\n", "line 1", "2.0 and 2.1"),
    ("# MHz S RI R 50\n[Version] 2.0\n", "line 2", "first line"),
    ("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Two-Port Data Order] 12_21\n",
     "line 4", "two or more ports"),
    (("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 2\n"
     "[Network Data]\n440 0.1 0\n[End]\n"), "line 4", "says 2, the data holds 1"),
    (("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
     "[Network Data]\n440 0.1 0\n"), "line 7", "[End]"),
    (("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
     "[Network Data]\n440 0.1 0\n[End]\n450 0 0\n"), "line 8", "follow [End]"),
    (("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
     "[Reference] 50 75\n"), "line 5", "one reference impedance"),
    (("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
     "[Reference]\n[Network Data]\n"), "line 5", "one reference impedance"),
    (("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
     "[Network Data]\n440 0.1 0 0.2 0.3\n[End]\n"), "line 6", "2 pairs"),
    (("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
     "[Network Data]\n0.1 0\n[End]\n"), "line 6", "begins with a frequency"),
    (("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
     "[Bogus]\n"), "line 5", "not a Touchstone 2.0 keyword"),
    ("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 9999999\n",
     "line 4", "at most"),
    ("[Version] 2.0\n[Number of Ports] 1\n", "line 2", "option line"),
]


@pytest.mark.parametrize(("text", "where", "rule"), BAD, ids=[b[2] for b in BAD])
def test_bad_files_are_refused_in_one_line(text, where, rule):
    with pytest.raises(DesignError) as info:
        read_touchstone(text, "first.s1p")
    msg = str(info.value)
    assert msg.startswith(f"first.s1p: {where}") and rule in msg and "\n" not in msg


def test_a_two_port_file_name_is_refused_before_reading():
    with pytest.raises(DesignError, match=r"^amp\.s2p: file name = 'amp\.s2p': .*2 ports"):
        read_touchstone("# GHz S RI R 50\n", "amp.s2p")


def test_information_block_is_skipped():
    # source: Touchstone spec 2.0 keyword list, [Begin Information]/[End Information] (memory)
    text = ("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
            "[Begin Information]\nanything\n[End Information]\n[Network Data]\n440 0.1 0.2\n"
            "[End]\n")
    assert complex(read_touchstone(text).s11[0]) == 0.1 + 0.2j


def test_bounds_are_refused_before_work(monkeypatch):
    with pytest.raises(DesignError, match="at most 32 MiB"):
        read_touchstone(" " * (MAX_TEXT_CHARS + 1), "huge.s1p")
    with pytest.raises(DesignError, match="at most 1000000 lines"):
        read_touchstone("\n" * MAX_LINES, "blank.s1p")
    assert MAX_POINTS == 200_000
    monkeypatch.setattr("fabplan.measure.touchstone.MAX_POINTS", 5)  # the same rule, smaller
    lines = ["# Hz S RI R 50"] + [f"{k + 1} 0 0" for k in range(6)]
    with pytest.raises(DesignError, match=r"many\.s1p: line 7 = '6': a sweep holds at most 5"):
        read_touchstone("\n".join(lines), "many.s1p")
