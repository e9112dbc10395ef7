"""SWR, transmission lines, the ideal transformer and the coaxial 4:1 balun."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.feed import (
    C0_M_S,
    CoaxBalun,
    Direct,
    Line,
    MatchChain,
    Transformer,
    db_per_m,
    reflection,
    swr,
)


def test_300_ohm_through_4_to_1_is_swr_1_5_in_50_ohm():
    # common practice, no source: 300 ohm through 4:1 is 75 ohm, SWR 75/50 = 1.5
    chain = MatchChain(300.0, 50.0, Transformer(4.0))
    assert complex(chain.at_radio(300.0, 146e6)) == pytest.approx(75.0)
    assert chain.swr_system(300.0, 146e6) == pytest.approx(1.5, rel=1e-12)
    assert chain.swr_terminals(300.0) == pytest.approx(1.0)


def test_swr_definition():
    # source: Pozar, Microwave Engineering, sec. 2.3: Gamma = (ZL - Z0)/(ZL + Z0),
    # SWR = (1 + |Gamma|)/(1 - |Gamma|); a real load gives SWR = ZL/Z0 or Z0/ZL
    assert swr(100.0, 50.0) == pytest.approx(2.0)
    assert swr(25.0, 50.0) == pytest.approx(2.0)
    assert swr(50.0, 50.0) == pytest.approx(1.0)
    assert swr(50j, 50.0) == math.inf  # pure reactance reflects everything
    z = 30 + 40j
    g = abs((z - 50) / (z + 50))
    assert swr(z, 50.0) == pytest.approx((1 + g) / (1 - g))
    assert abs(complex(reflection(z, 50.0))) == pytest.approx(g)


def _pozar_zin(zl, z0, gamma, ell):
    # source: Pozar, Microwave Engineering, eq. 2.91 (lossy line):
    # Zin = Z0 (ZL + Z0 tanh(gamma l)) / (Z0 + ZL tanh(gamma l))
    t = np.tanh(gamma * ell)
    return z0 * (zl + z0 * t) / (z0 + zl * t)


@pytest.mark.parametrize("zl", [10 + 0j, 75 - 30j, 300 + 120j, 1e-3 + 0j, 1e5 + 0j])
@pytest.mark.parametrize("loss", [0.0, 5.0])
def test_line_input_impedance_matches_textbook(zl, loss):
    line = Line(z0_ohm=50.0, velocity_factor=0.66, length_mm=1234.0, loss_db_per_m=loss / 100,
                loss_ref_hz=100e6)
    for f in (3.5e6, 146e6, 440e6):
        alpha = loss / 100 / (20 / math.log(10)) * math.sqrt(f / 100e6)
        beta = 2 * math.pi * f / (C0_M_S * 0.66)
        expect = _pozar_zin(zl, 50.0, alpha + 1j * beta, 1.234)
        assert complex(line.input_impedance(zl, f)) == pytest.approx(expect, rel=1e-9)


def test_quarter_wave_transformer():
    # source: Pozar, Microwave Engineering, sec. 2.5: a lossless quarter-wave line
    # gives Zin = Z0^2 / ZL
    f = 146e6
    quarter_mm = C0_M_S / f / 4 * 0.8 * 1000
    line = Line(z0_ohm=75.0, velocity_factor=0.8, length_mm=quarter_mm)
    for zl in (50.0, 112.5, 300.0):
        assert complex(line.input_impedance(zl, f)) == pytest.approx(75.0 ** 2 / zl, rel=1e-9)


def test_half_wave_line_repeats_the_load():
    # source: Pozar, Microwave Engineering, sec. 2.3: a lossless half-wave line has Zin = ZL
    f = 440e6
    line = Line(50.0, 0.66, C0_M_S / f / 2 * 0.66 * 1000)
    assert complex(line.input_impedance(33 - 12j, f)) == pytest.approx(33 - 12j, rel=1e-9)


def test_feed_line_loss_scales_with_sqrt_frequency():
    # common practice, no source: coaxial cable loss in dB rises about as sqrt(f)
    # (conductor loss, skin effect) at VHF/UHF
    line = Line(50.0, 0.66, 30_480.0, db_per_m(4.0, "100ft"), 100e6)  # 100 ft, 4 dB/100 ft
    assert line.matched_loss_db(100e6) == pytest.approx(4.0)
    assert line.matched_loss_db(400e6) == pytest.approx(8.0)
    assert line.matched_loss_db(25e6) == pytest.approx(2.0)
    assert db_per_m(13.0, "100m") == pytest.approx(0.13)


def test_feed_line_loss_appears_in_the_input_impedance():
    # source: Pozar, Microwave Engineering, sec. 2.7: on a lossy line the reflection
    # coefficient at the input is Gamma_L exp(-2 alpha l): a short at the far end
    # shows |Gamma_in| = 10^(-2 x loss_dB / 20)
    line = Line(50.0, 0.66, 30_480.0, db_per_m(4.0, "100ft"), 100e6)
    for f, loss in ((100e6, 4.0), (400e6, 8.0)):
        g_in = abs(complex(reflection(line.input_impedance(0.0, f), 50.0)))
        assert 20 * math.log10(g_in) == pytest.approx(-2 * loss, rel=1e-9)


def test_coax_balun_is_exactly_4_to_1_at_its_half_wave():
    # source: the half-wave balun's action follows from a half-wave line inverting the
    # voltage (Pozar, Microwave Engineering, sec. 2.3); lossless, at the loop's
    # half-wave frequency the input is Z/4 for any load
    balun = CoaxBalun(z0_ohm=50.0, velocity_factor=0.66, half_wave_hz=440e6)
    for z in (300.0, 200.0, 180 - 60j, 50 + 500j):
        assert complex(balun.transform(z, 440e6)) == pytest.approx(z / 4, rel=1e-12)


def test_coax_balun_departs_from_4_to_1_away_from_its_half_wave():
    balun = CoaxBalun(z0_ohm=50.0, velocity_factor=0.66, half_wave_hz=440e6)
    z = 200.0
    dev = [abs(complex(balun.transform(z, f)) / (z / 4) - 1) for f in (440e6, 420e6, 400e6)]
    assert dev[0] < 1e-12 < 1e-2 < dev[1] < dev[2]
    chain = MatchChain(200.0, 50.0, balun)
    s = chain.swr_system(z, np.array([400e6, 420e6, 440e6, 460e6, 480e6]))
    assert s[2] == pytest.approx(1.0)
    assert s[1] > 1.05 and s[3] > 1.05 and s[0] > s[1] and s[4] > s[3]


def _balun_by_nodal_analysis(z, balun, f):
    # an independent route: two nodes A (driven at 1 V) and B, the loop as a two-port
    # by its Y parameters (Pozar, Microwave Engineering, sec. 4.3 / 4.4 for a line:
    # Y11 = Y22 = coth(gamma l)/Z0, Y12 = Y21 = -1/(Z0 sinh(gamma l))), the load
    # between A and B; solve KCL at B, then the current drawn from the feed at A
    line = balun.line
    gl = line.gamma_l(f)
    y11 = 1 / (np.tanh(gl) * line.z0_ohm)
    y12 = -1 / (line.z0_ohm * np.sinh(gl))
    # KCL at B: y12*1 + y11*vb + (vb - 1)/z = 0
    vb = (1 / z - y12) / (y11 + 1 / z)
    i_feed = y11 * 1 + y12 * vb + (1 - vb) / z
    return 1 / i_feed


@settings(max_examples=60, deadline=None, derandomize=True)
@given(r=st.floats(5, 2000), x=st.floats(-1000, 1000), frac=st.floats(0.5, 1.5),
       loss=st.floats(0, 20))
def test_coax_balun_agrees_with_nodal_analysis(r, x, frac, loss):
    if abs(frac - 1) < 1e-3:
        frac = 1.01  # the nodal form divides by sinh(gamma l), zero at the half wave
    balun = CoaxBalun(75.0, 0.82, 146e6, db_per_m(loss, "100m"), 146e6)
    f = 146e6 * frac
    z = complex(r, x)
    assert complex(balun.transform(z, f)) == pytest.approx(
        complex(_balun_by_nodal_analysis(z, balun, f)), rel=1e-8)


def test_coax_balun_loop_cut_length():
    # common practice, no source: the loop is half an electrical wavelength times the
    # cable's velocity factor; 146 MHz, VF 0.66: 0.5 x 2053.4 mm x 0.66 = 677.6 mm
    balun = CoaxBalun(50.0, 0.66, 146e6)
    assert balun.loop_length_mm == pytest.approx(299_792.458 / 146 / 2 * 0.66, rel=1e-12)
    assert balun.loop_length_mm == pytest.approx(677.6, abs=0.1)


def test_direct_connection_and_chain_through_a_feed_line():
    line = Line(50.0, 0.66, 5000.0)
    chain = MatchChain(50.0, 50.0, Direct(), line)
    # lossless line: SWR is the same at both ends (Pozar, Microwave Engineering, sec. 2.3)
    for z in (100.0, 20 + 30j):
        assert chain.swr_system(z, 146e6) == pytest.approx(swr(z, 50.0), rel=1e-9)
    lossy = MatchChain(50.0, 50.0, Direct(), Line(50.0, 0.66, 30_480.0, db_per_m(4, "100ft")))
    # a lossy line makes the SWR at the radio lower than at the load
    assert lossy.swr_system(100.0, 146e6) < swr(100.0, 50.0)
    assert "feed line" in lossy.describe()


@settings(max_examples=80, deadline=None, derandomize=True)
@given(r=st.floats(1, 5000), x=st.floats(-5000, 5000), length=st.floats(1, 50_000),
       vf=st.floats(0.5, 1.0))
def test_lossless_line_keeps_the_swr(r, x, length, vf):
    # source: Pozar, Microwave Engineering, sec. 2.3: on a lossless line |Gamma| and so
    # the SWR are the same at every point; only the phase turns
    line = Line(50.0, vf, length)
    z = complex(r, x)
    assert swr(line.input_impedance(z, 146e6), 50.0) == pytest.approx(swr(z, 50.0), rel=1e-6)
