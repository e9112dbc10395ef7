"""The sweep record and the reflection conversions.

source: Pozar, Microwave Engineering 4th ed., sec. 2.3 (terminated lossless line):
Gamma = (ZL - Z0)/(ZL + Z0), SWR = (1 + |Gamma|)/(1 - |Gamma|), RL = -20 log10 |Gamma| dB.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fabplan.errors import DesignError
from fabplan.feed import swr as em_swr
from fabplan.measure import (
    decode_sweep_bytes,
    gamma_from_z,
    gamma_mag_from_return_loss_db,
    gamma_mag_from_swr,
    return_loss_db_from_gamma_mag,
    return_loss_db_from_swr,
    sweep_from_impedance,
    sweep_from_s11,
    sweep_from_swr,
    swr_from_gamma_mag,
    swr_from_return_loss_db,
    z_from_gamma,
)


def test_textbook_values():
    # source: Pozar sec. 2.3: a real load gives SWR = ZL/Z0 (ZL > Z0); a match gives
    # Gamma = 0 (RL infinite); a short Gamma = -1
    assert complex(gamma_from_z(100.0, 50.0)) == pytest.approx(1 / 3)
    assert float(swr_from_gamma_mag(1 / 3)) == pytest.approx(2.0)
    assert complex(gamma_from_z(0.0, 50.0)) == -1
    assert math.isinf(float(swr_from_gamma_mag(1.0)))
    assert float(return_loss_db_from_gamma_mag(0.1)) == pytest.approx(20.0)
    assert float(gamma_mag_from_return_loss_db(20.0)) == pytest.approx(0.1)
    # common practice, no source: SWR 2 is a return loss of 9.54 dB, SWR 1.5 of 13.98 dB
    assert float(return_loss_db_from_swr(2.0)) == pytest.approx(9.5424, abs=1e-4)
    assert float(return_loss_db_from_swr(1.5)) == pytest.approx(13.9794, abs=1e-4)
    assert float(swr_from_return_loss_db(9.542425094393248)) == pytest.approx(2.0)
    assert float(gamma_mag_from_swr(np.inf)) == 1.0


@settings(max_examples=60, derandomize=True, deadline=None)
@given(st.floats(0.1, 5000), st.floats(-5000, 5000), st.floats(1.0, 600.0))
def test_conversions_invert_each_other_and_agree_with_the_em_package(r, x, z0):
    z = complex(r, x)
    g = complex(gamma_from_z(z, z0))
    assert complex(z_from_gamma(g, z0)) == pytest.approx(z, rel=1e-9, abs=1e-9)
    s = float(swr_from_gamma_mag(abs(g)))
    # (1 + m)/(1 - m) loses digits as m -> 1: relative error about 1e-16 * SWR
    assert s == pytest.approx(em_swr(z, z0), rel=1e-12 * max(s, 1e3))
    assert float(gamma_mag_from_swr(s)) == pytest.approx(abs(g), rel=1e-9, abs=1e-12)


def test_record_keeps_s11_and_gives_impedance_swr_return_loss():
    f = [430e6, 440e6, 450e6]
    z = np.array([30 - 40j, 50 + 0j, 100 + 25j])
    s = sweep_from_impedance(f, z, 50.0, source="x.s1p")
    np.testing.assert_allclose(s.z_ohm, z, rtol=1e-13)
    np.testing.assert_allclose(s.swr, [em_swr(v, 50.0) for v in z], rtol=1e-12)
    assert s.return_loss_db[1] == np.inf and s.n_points == 3 and s.has_phase
    with pytest.raises(ValueError):
        s.freq_hz[0] = 1.0  # read-only arrays
    s75 = s.with_reference(75.0)
    np.testing.assert_allclose(s75.z_ohm, z, rtol=1e-13)
    assert s75.z0_ohm == 75.0 and s75.swr[1] == pytest.approx(1.5)


def test_swr_only_says_it_has_no_phase():
    s = sweep_from_swr([1e6, 2e6, 3e6], [2.0, 1.2, 3.0], 50.0, source="a.csv")
    assert not s.has_phase and s.z_ohm is None
    assert "phase" in s.phase_note and "resonance" in s.phase_note
    with pytest.raises(DesignError, match="needs the phase"):
        s.with_reference(75.0)


@pytest.mark.parametrize(("kwargs", "match"), [
    ({"freq_hz": [1, 2], "s11": [0, 0]}, "at least 3"),
    ({"freq_hz": [1, 3, 2], "s11": [0, 0, 0]}, r"freq_hz\[2\] = 2.0: .*increase"),
    ({"freq_hz": [-1, 2, 3], "s11": [0, 0, 0]}, "not negative"),
    ({"freq_hz": [1, 2, 3], "s11": [0, np.nan, 0]}, "finite"),
    ({"freq_hz": [1, 2, 3], "s11": [0, 0, 0], "z0_ohm": 0.0}, "positive number of ohms"),
])
def test_bad_sweeps_are_refused(kwargs, match):
    args = {"z0_ohm": 50.0, **kwargs}
    with pytest.raises(DesignError, match=match):
        sweep_from_s11(args["freq_hz"], args["s11"], args["z0_ohm"], source="s.s1p")


def test_swr_below_one_is_refused():
    with pytest.raises(DesignError, match=r"swr\[1\] = 0.5: an SWR is at least 1"):
        sweep_from_swr([1, 2, 3], [1, 0.5, 2], 50.0)


def test_bytes_are_decoded_with_a_bom_and_latin_1_fallback():
    assert decode_sweep_bytes(b"\xef\xbb\xbf# MHz\n", "a.s1p") == "# MHz\n"
    assert decode_sweep_bytes("! 50 \u03a9\n".encode(), "a.s1p") == "! 50 \u03a9\n"
    assert decode_sweep_bytes(b"! 90\xb0\n", "a.s1p") == "! 90\u00b0\n"
