"""CSV sweeps: columns named by the user, delimiter sniffing, one-line errors.

source for the conversions checked: Pozar, Microwave Engineering 4th ed., sec. 2.3
(Gamma = (Z - Z0)/(Z + Z0); SWR = (1 + |Gamma|)/(1 - |Gamma|); RL = -20 log10 |Gamma| dB).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from fabplan.errors import DesignError
from fabplan.measure import read_csv_sweep

F_MHZ = [430.0, 440.0, 450.0]
Z = [30 - 40j, 50 + 0j, 100 + 25j]


def _gamma(z: complex, z0: float = 50.0) -> complex:
    return (z - z0) / (z + z0)


def _rows(fmt, sep=",", header=None) -> str:
    lines = [header] if header else []
    for f, z in zip(F_MHZ, Z, strict=True):
        lines.append(sep.join(fmt(f, z)))
    return "\n".join(lines) + "\n"


def test_r_and_x_by_header_name():
    text = _rows(lambda f, z: [f"{f}", f"{z.real}", f"{z.imag}"],
                 header="Frequency (MHz),R (ohm),X (ohm)")
    s = read_csv_sweep(text, {"frequency": "frequency (mhz)", "r_ohm": "R (ohm)",
                              "x_ohm": " X (ohm) "}, frequency_unit="MHz", source="rx.csv")
    np.testing.assert_allclose(s.freq_hz, np.array(F_MHZ) * 1e6)
    np.testing.assert_allclose(s.z_ohm, Z, rtol=1e-13)
    assert s.has_phase and s.source == "rx.csv"


def test_swr_only_semicolon_with_decimal_commas():
    # SWR of a real load R on 50 ohm is R/50 or 50/R (Pozar sec. 2.3)
    text = "Freq;SWR\n430,0;2,5\n440,0;1\n450,0;1,25\n"
    s = read_csv_sweep(text, {"frequency": 1, "swr": 2}, frequency_unit="MHz")
    np.testing.assert_allclose(s.swr, [2.5, 1.0, 1.25])
    assert not s.has_phase and s.z_ohm is None and "phase" in s.phase_note


def test_return_loss_tab_separated_without_header():
    rl = [-20 * math.log10(abs(_gamma(z))) if z != 50 else 60.0 for z in Z]
    text = "".join(f"{f * 1e3}\t{r}\n" for f, r in zip(F_MHZ, rl, strict=True))
    s = read_csv_sweep(text, {"frequency": 1, "return_loss_db": 2}, frequency_unit="kHz")
    np.testing.assert_allclose(s.gamma_mag[[0, 2]], [abs(_gamma(Z[0])), abs(_gamma(Z[2]))])
    assert s.gamma_mag[1] == pytest.approx(1e-3)


@pytest.mark.parametrize(("roles", "cells"), [
    ({"s11_re": 2, "s11_im": 3}, lambda g: [g.real, g.imag]),
    ({"s11_mag": 2, "s11_angle_deg": 3}, lambda g: [abs(g), math.degrees(np.angle(g))]),
    ({"s11_db": 2, "s11_angle_deg": 3},
     lambda g: [20 * math.log10(max(abs(g), 1e-12)), math.degrees(np.angle(g))]),
    ({"return_loss_db": 2, "s11_angle_deg": 3},
     lambda g: [-20 * math.log10(max(abs(g), 1e-12)), math.degrees(np.angle(g))]),
])
def test_s11_in_each_form_reads_to_the_same_impedance(roles, cells):
    text = _rows(lambda f, z: [f"{f / 1e3}"] + [repr(float(c)) for c in cells(_gamma(z))],
                 header="f,a,b")
    s = read_csv_sweep(text, {"frequency": 1, **roles}, frequency_unit="GHz")
    np.testing.assert_allclose(s.z_ohm, Z, rtol=1e-9, atol=1e-9)


def test_magnitude_only_forms():
    s = read_csv_sweep("f,db\n1,-20\n2,-6\n3,0\n", {"frequency": "f", "s11_db": "db"},
                       frequency_unit="MHz")
    np.testing.assert_allclose(s.gamma_mag, [0.1, 10 ** (-6 / 20), 1.0])
    assert math.isinf(s.swr[2])
    s = read_csv_sweep("1,0.5\n2,0.2\n3,0\n", {"frequency": 1, "s11_mag": 2},
                       frequency_unit="MHz")
    np.testing.assert_allclose(s.swr, [3.0, 1.5, 1.0])


def test_comments_blank_lines_quotes_and_a_byte_order_mark():
    text = ('\ufeff# analyser export\n\n"Frequency","SWR"\n! note\n"430","2.0"\n\n440,1.5\n'
            "450,1.2\n")
    s = read_csv_sweep(text, {"frequency": "frequency", "swr": "swr"}, frequency_unit="MHz")
    np.testing.assert_allclose(s.swr, [2.0, 1.5, 1.2])


BAD = [
    ("f,swr\n1,1.5\nx,1.2\n", {"frequency": "f", "swr": "swr"},
     "line 3, column 1 (f) = 'x'", "expected a number for frequency"),
    ("f,swr\n1,1.5\n2,0.9\n3,1\n", {"frequency": "f", "swr": "swr"},
     "line 3, column 2 (swr) = 0.9", "at least 1"),
    ("f,swr\n2,1.5\n1,1.2\n3,1\n", {"frequency": "f", "swr": "swr"},
     "line 3, column 1 (f) = 1.0", "increase"),
    ("f,rl\n1,10\n2,-3\n3,1\n", {"frequency": "f", "return_loss_db": "rl"},
     "line 3, column 2 (rl) = -3.0", "s11_db"),
    ("f,swr\n1,1.5\n2\n3,1\n", {"frequency": "f", "swr": "swr"},
     "line 3 = '2'", "missing"),
    ("f,swr\n1,1.5\n", {"frequency": "f", "swr": "vswr"},
     "columns.swr = 'vswr'", "did you mean 'swr'"),
    ("f,swr\n1,1.5\n", {"frequency": "f", "sw": "swr"},
     "columns = 'sw'", "did you mean 'swr'"),
    ("f,swr\n1,1.5\n", {"frequency": "f", "swr": "swr", "r_ohm": 3},
     "columns = 'r_ohm, swr'", "one set"),
    ("f,swr\n1,1.5\n", {"swr": "swr"}, "columns = 'swr'", "frequency column"),
    ("f swr\n1 1.5\n", {"frequency": 1, "swr": 2}, "line 1", "delimiter"),
    ("f,swr\n1,1.5\n", {"frequency": 0, "swr": 2}, "columns.frequency = 0", "from 1"),
    ("f,swr\n", {"frequency": 1, "swr": 2}, "file", "no rows"),
]


@pytest.mark.parametrize(("text", "cols", "where", "rule"), BAD, ids=[b[3] for b in BAD])
def test_bad_csv_is_refused_in_one_line(text, cols, where, rule):
    with pytest.raises(DesignError) as info:
        read_csv_sweep(text, cols, frequency_unit="MHz", source="sweep.csv")
    msg = str(info.value)
    assert msg.startswith(f"sweep.csv: {where}") and rule in msg and "\n" not in msg


def test_bad_unit_and_delimiter():
    with pytest.raises(DesignError, match="frequency_unit = 'THz'"):
        read_csv_sweep("1,2\n", {"frequency": 1, "swr": 2}, frequency_unit="THz")
    with pytest.raises(DesignError, match="delimiter = '|'"):
        read_csv_sweep("1|2\n", {"frequency": 1, "swr": 2}, frequency_unit="Hz", delimiter="|")


def test_bounds(monkeypatch):
    with pytest.raises(DesignError, match="at most 1000000 lines"):
        read_csv_sweep("\r\n" * 1_000_000, {"frequency": 1, "swr": 2}, frequency_unit="Hz")
    monkeypatch.setattr("fabplan.measure.csvsweep.MAX_POINTS", 5)  # the same rule, smaller
    rows = "".join(f"{k + 1},1.5\n" for k in range(6))
    with pytest.raises(DesignError, match="rows = 6: a sweep holds at most 5"):
        read_csv_sweep(rows, {"frequency": 1, "swr": 2}, frequency_unit="Hz")
