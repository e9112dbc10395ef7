"""The measuring library on the bundled example's predicted sweep (examples/
club-uhf-folded-dipoles.toml): the electrical stage's own figures, refined on the model
by scipy.optimize (Brent's method), are the reference for the sampled-sweep analysis.
"""

from __future__ import annotations

import numpy as np
import pytest

from fabplan.feed import CoaxBalun
from fabplan.measure import (
    analyse,
    analyse_sweep,
    deembed,
    embed,
    feed_line,
    from_matching,
    predicted_touchstone,
    read_touchstone,
)


def _driven(example_plan):
    return next(e.electrical for e in example_plan.elements if e.electrical is not None)


def test_issue_15_band_partly_inside_the_sweep(example_plan):
    # fabplan issue 15: on the example SWR stays under 2 from below the sweep's start to about
    # 475 MHz; the electrical stage (which reads its sweep with the same bands) says so
    el = _driven(example_plan)
    s = el.sweep
    a = analyse_sweep(np.array(s.freq_hz), swr=np.array(s.swr_system), z_ohm=np.array(s.z_ohm),
                      z0_ohm=s.system_ohm)
    band = a.band(2.0)
    assert band.reached and band.lower_beyond_sweep and band.lower is None
    assert band.upper is not None and 470e6 < band.upper.frequency_hz < 480e6
    assert "not reached" not in band.describe()
    stage_band = s.bands[1]
    assert stage_band.level == 2.0 and stage_band.lower_beyond_sweep
    assert stage_band.upper.frequency_hz == pytest.approx(band.upper.frequency_hz, rel=1e-6)
    # the 1.5 band lies inside the sweep: its edges agree with the stage's
    lo, hi = s.bands[0].lower.frequency_hz, s.bands[0].upper.frequency_hz
    b15 = a.band(1.5)
    assert b15.lower.frequency_hz == pytest.approx(lo, abs=b15.lower.unc_hz + 1.0)
    assert b15.upper.frequency_hz == pytest.approx(hi, abs=b15.upper.unc_hz + 1.0)
    # the model's Brent-refined resonance and least SWR lie within the stated step bounds
    assert a.resonance.frequency_hz == pytest.approx(s.resonance_hz,
                                                     abs=a.resonance.frequency_unc_hz)
    assert a.least_swr.frequency_hz == pytest.approx(s.min_swr_hz,
                                                     abs=a.least_swr.frequency_unc_hz)
    assert a.least_swr.swr == pytest.approx(s.min_swr, abs=a.least_swr.swr_unc + 1e-9)


def test_a_sweep_taken_through_coax_and_the_balun_is_brought_back_to_the_element(example_plan):
    # issue 14: the first article measured through 3 m of coax and the example's balun;
    # the analyser's file is written, read, de-embedded and analysed: the element's figures
    s = _driven(example_plan).sweep
    f, z = np.array(s.freq_hz), np.array(s.z_ohm)
    balun = from_matching(CoaxBalun(50.0, 0.66, 440e6))
    coax = feed_line(50.0, 0.66, 3000.0, 0.15, 100e6)
    assert balun is not None
    text = predicted_touchstone(f, embed(f, z, [coax, balun]), 50.0, data_format="DB",
                                version="2.0", comments=["synthetic first article"])
    measured = read_touchstone(text, "article.s1p").to_sweep()
    at_element = deembed(measured, [coax, balun], z0_ohm=s.reference_ohm).sweep
    np.testing.assert_allclose(at_element.z_ohm, z, rtol=1e-9)
    got = analyse(at_element)
    want = analyse_sweep(f, z_ohm=z, z0_ohm=s.reference_ohm)
    assert got.resonance.frequency_hz == pytest.approx(want.resonance.frequency_hz, rel=1e-9)
    assert got.resonance.r_ohm == pytest.approx(want.resonance.r_ohm, rel=1e-9)
    assert got.resonance.frequency_hz == pytest.approx(s.resonance_hz,
                                                       abs=got.resonance.frequency_unc_hz)
