"""Resonance, least SWR, SWR bands and their uncertainties.

The reference element is a series R-L-C, whose figures are known in closed form
(source: Pozar, Microwave Engineering 4th ed., sec. 6.1, series resonant circuit:
X = omega L - 1/(omega C), resonance at omega0 = 1/sqrt(LC)). With Z = R + jX,
|Gamma|^2 = ((R - Z0)^2 + X^2)/((R + Z0)^2 + X^2) (Pozar sec. 2.3) is least where X = 0,
SWR there is Z0/R (R < Z0), and |Gamma| = g at X^2 = (g^2 (R + Z0)^2 - (R - Z0)^2)/(1 - g^2),
so each band edge solves omega L - 1/(omega C) = +-X.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from fabplan.errors import DesignError
from fabplan.measure import (
    analyse,
    analyse_sweep,
    predicted_touchstone,
    read_touchstone,
    sweep_from_impedance,
    sweep_from_s11,
    sweep_from_swr,
)

R, L, F0, Z0 = 35.0, 120e-9, 440e6, 50.0
C = 1.0 / ((2 * math.pi * F0) ** 2 * L)


def rlc(f):
    w = 2 * np.pi * np.asarray(f, dtype=float)
    return R + 1j * (w * L - 1 / (w * C))


def edges_hz(level):
    g = (level - 1) / (level + 1)
    x = math.sqrt((g * g * (R + Z0) ** 2 - (R - Z0) ** 2) / (1 - g * g))
    return tuple((s * x + math.sqrt(x * x + 4 * L / C)) / (4 * math.pi * L) for s in (-1, 1))


@pytest.mark.parametrize("n", [9, 21, 81, 401])
def test_noise_free_figures_lie_within_their_stated_uncertainty(n):
    f = np.linspace(400e6, 480e6, n)
    a = analyse(sweep_from_impedance(f, rlc(f), Z0))
    res, least = a.resonance, a.least_swr
    assert res is not None and res.rising and a.resonance_note == ""
    assert abs(res.frequency_hz - F0) <= res.frequency_unc_hz + 1e-6
    assert abs(res.r_ohm - R) <= res.r_unc_ohm + 1e-9
    assert abs(least.frequency_hz - F0) <= least.frequency_unc_hz
    assert abs(least.swr - Z0 / R) <= least.swr_unc + 1e-12
    for level in (1.5, 2.0):
        band = a.band(level)
        lo, hi = edges_hz(level)
        assert band.reached and not band.lower_beyond_sweep and not band.upper_beyond_sweep
        assert abs(band.lower.frequency_hz - lo) <= band.lower.unc_hz
        assert abs(band.upper.frequency_hz - hi) <= band.upper.unc_hz
        assert band.width_hz == pytest.approx(hi - lo, abs=band.lower.unc_hz + band.upper.unc_hz)


def test_uncertainty_shrinks_as_the_step_does():
    out = []
    for n in (21, 81):
        f = np.linspace(400e6, 480e6, n)
        a = analyse(sweep_from_impedance(f, rlc(f), Z0))
        out.append((a.least_swr.frequency_unc_hz, a.band(2).upper.step_unc_hz))
    # interpolation error bounds go as the step squared: 4x finer, about 16x smaller
    assert out[1][0] < out[0][0] / 8 and out[1][1] < out[0][1] / 8


def test_a_band_partly_inside_the_sweep_is_reported_with_its_inside_edge():
    # fabplan issue 15: SWR < 2 from below the sweep's start to an edge inside it must not be
    # "not reached"
    f = np.linspace(430e6, 480e6, 51)
    a = analyse(sweep_from_impedance(f, rlc(f), Z0))
    band = a.band(2)
    lo, hi = edges_hz(2)
    assert lo < 430e6 and band.reached
    assert band.lower is None and band.lower_beyond_sweep and not band.upper_beyond_sweep
    assert band.upper.frequency_hz == pytest.approx(hi, abs=band.upper.unc_hz)
    assert band.width_hz is None
    assert band.width_at_least_hz == pytest.approx(band.upper.frequency_hz - 430e6)
    text = band.describe()
    assert "not reached" not in text and "beyond the sweep's start" in text
    assert text.endswith(f"to {band.upper.frequency_hz / 1e6:.3f} MHz")


def test_both_edges_beyond_and_a_level_not_reached():
    f = np.linspace(436e6, 444e6, 17)
    a = analyse_sweep(f, z_ohm=rlc(f), levels=(1.2, 2.0))
    assert not a.band(1.2).reached and "not reached" in a.band(1.2).describe()
    b = a.band(2.0)
    assert b.reached and b.lower_beyond_sweep and b.upper_beyond_sweep
    assert b.width_at_least_hz == pytest.approx(8e6)


def test_swr_only_finds_least_swr_but_says_resonance_cannot_be_found():
    f = np.linspace(400e6, 480e6, 41)
    full = analyse(sweep_from_impedance(f, rlc(f), Z0))
    a = analyse(sweep_from_swr(f, sweep_from_impedance(f, rlc(f), Z0).swr, Z0))
    assert a.resonance is None and a.crossings == ()
    assert "phase" in a.resonance_note and "cannot be found" in a.resonance_note
    assert a.least_swr.frequency_hz == pytest.approx(full.least_swr.frequency_hz, rel=1e-12)
    assert a.band(2).upper.frequency_hz == pytest.approx(full.band(2).upper.frequency_hz)


@pytest.mark.parametrize(("span", "side"), [((300e6, 350e6), "above"), ((520e6, 560e6), "below")])
def test_no_crossing_says_on_which_side_the_resonance_lies(span, side):
    f = np.linspace(*span, 21)
    a = analyse_sweep(f, z_ohm=rlc(f))
    assert a.resonance is None and f"lies {side} it" in a.resonance_note
    assert a.least_swr.at_sweep_end  # the minimum is at the end nearest the resonance
    assert a.least_swr.frequency_hz == (span[1] if side == "above" else span[0])


def test_a_parallel_resonance_is_reported_as_such():
    # parallel R-L-C: X goes from inductive to capacitive through zero at 1/sqrt(LC)
    f = np.linspace(400e6, 480e6, 41)
    w = 2 * np.pi * f
    z = 1 / (1 / 2000.0 + 1j * (w * C - 1 / (w * L)))
    a = analyse_sweep(f, z_ohm=z)
    assert a.resonance is not None and not a.resonance.rising
    assert a.resonance.frequency_hz == pytest.approx(F0, rel=1e-6)
    assert a.resonance.r_ohm == pytest.approx(2000.0, rel=1e-3)
    assert "parallel resonance" in a.resonance_note


def test_resonance_at_the_terminals_and_swr_through_the_matching_are_kept_apart():
    # a predicted sweep: the impedance at the element, the SWR through a 4:1 device into 50 ohm
    f = np.linspace(400e6, 480e6, 41)
    z = 4 * rlc(f)
    swr_sys = sweep_from_impedance(f, z / 4, Z0).swr
    a = analyse_sweep(f, swr=swr_sys, z_ohm=z)
    assert a.resonance.r_ohm == pytest.approx(4 * R, abs=a.resonance.r_unc_ohm)
    assert a.least_swr.swr == pytest.approx(Z0 / R, abs=a.least_swr.swr_unc + 1e-9)


def test_the_nearest_crossing_is_chosen():
    # the series R-L-C in series with a high-Q parallel tank resonant at 880 MHz: X rises
    # through zero below 440 MHz, falls through zero near 880 MHz, rises again above it
    f = np.linspace(100e6, 2000e6, 1901)
    w = 2 * np.pi * f
    z = rlc(f) + 1 / (1 / 50e3 + 1j * (w * C / 2 - 2 / (w * L)))
    rising = [c.frequency_hz for c in analyse_sweep(f, z_ohm=z).crossings if c.rising]
    assert len(rising) == 2 and len(analyse_sweep(f, z_ohm=z).crossings) == 3
    assert analyse_sweep(f, z_ohm=z, near_hz=1500e6).resonance.frequency_hz == rising[1]
    assert analyse_sweep(f, z_ohm=z, near_hz=300e6).resonance.frequency_hz == rising[0]


def test_noise_estimate_agrees_with_monte_carlo():
    # source: JCGM 101:2008 (GUM Supplement 1), propagation of distributions by a Monte
    # Carlo method: the spread of the figures over many noisy sweeps is the reference
    # for the propagated standard uncertainty (from memory of the document's method)
    f = np.linspace(400e6, 480e6, 41)
    clean = sweep_from_impedance(f, rlc(f), Z0).s11
    rng = np.random.default_rng(2024)
    picks: list[list[float]] = [[], [], [], []]
    est: list[list[float]] = [[], [], [], []]
    for _ in range(200):
        noise = 0.003 * (rng.standard_normal(len(f)) + 1j * rng.standard_normal(len(f)))
        a = analyse(sweep_from_s11(f, clean + noise, Z0))
        for k, (v, u) in enumerate([
                (a.resonance.frequency_hz, a.resonance.frequency_noise_unc_hz),
                (a.resonance.r_ohm, a.resonance.r_noise_unc_ohm),
                (a.least_swr.frequency_hz, a.least_swr.frequency_noise_unc_hz),
                (a.band(2).upper.frequency_hz, a.band(2).upper.noise_unc_hz)]):
            picks[k].append(v)
            est[k].append(u)
    for k in range(4):
        ratio = float(np.median(est[k])) / float(np.std(picks[k]))
        assert 0.5 < ratio < 2.0, (k, ratio)


def test_round_trip_through_a_touchstone_file_finds_the_same_figures():
    # issue 14: write a sweep as .s1p, read it back, find the same resonance and bandwidths
    f = np.linspace(400e6, 480e6, 81)
    before = analyse_sweep(f, z_ohm=rlc(f))
    after = analyse(read_touchstone(predicted_touchstone(f, rlc(f), Z0, data_format="MA",
                                                         version="2.0"), "p.s1p").to_sweep())
    assert after.resonance.frequency_hz == pytest.approx(before.resonance.frequency_hz,
                                                         rel=1e-9)
    assert after.least_swr.frequency_hz == pytest.approx(before.least_swr.frequency_hz,
                                                         rel=1e-9)
    for level in (1.5, 2.0):
        assert after.band(level).width_hz == pytest.approx(before.band(level).width_hz,
                                                           rel=1e-9)


@pytest.mark.parametrize(("kwargs", "match"), [
    ({"levels": (1.0,)}, "above 1"),
    ({"window": 2}, "3 to 101"),
    ({"freq_hz": [1e6, 2e6]}, "at least 3"),
    ({"freq_hz": [1e6, 3e6, 2e6]}, "increasing"),
])
def test_bad_analysis_input_is_refused(kwargs, match):
    args = {"freq_hz": [1e6, 2e6, 3e6], **kwargs}
    f = args.pop("freq_hz")
    with pytest.raises(DesignError, match=match):
        analyse_sweep(f, swr=np.full(len(f), 1.5), **args)
    with pytest.raises(DesignError, match="no band"):
        analyse_sweep([1e6, 2e6, 3e6], swr=[2, 1.2, 2]).band(3.0)


@pytest.mark.parametrize(("offset", "words"), [
    (0.0, "without crossing it"), (1e-9, "without crossing it"),
    (5.0, "stays positive")])
def test_a_reactance_that_touches_zero_is_said_so(offset, words):
    # common practice, no source: a capacitor-tuned loop at critical coupling brings X to
    # zero at one frequency without crossing it; that is not "a resonance lies below"
    f = np.linspace(14.125e6, 14.225e6, 41)
    z = 40.0 + 1j * (1e-8 * (f - 14.175e6) ** 2 + offset)
    a = analyse_sweep(f, z_ohm=z)
    assert a.resonance is None and words in a.resonance_note
