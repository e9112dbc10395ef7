"""De-embedding a feed line and the matching device.

source: Pozar, Microwave Engineering 4th ed., sec. 2.7 (terminated lossy line):
Zin = Z0 (ZL + Z0 tanh(gamma l)) / (Z0 + ZL tanh(gamma l)), gamma = alpha + j beta,
and Gamma(l) = Gamma_L exp(-2 gamma l); sec. 4.4 (ABCD matrix of a cascade).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from fabplan.errors import DesignError
from fabplan.feed import C0_M_S, CoaxBalun, Direct, MatchChain, Transformer
from fabplan.measure import (
    ABCD,
    deembed,
    embed,
    feed_line,
    from_matching,
    from_transform,
    sweep_from_impedance,
    sweep_from_swr,
    transformer,
    two_port,
)

F = np.linspace(400e6, 480e6, 9)
Z_EL = 35 + 1j * np.linspace(-80, 60, 9)  # an element near resonance (ohm)


def _pozar_zin(zl, z0, gamma, ell_m):
    t = np.tanh(gamma * ell_m)
    return z0 * (zl + z0 * t) / (z0 + zl * t)


@pytest.mark.parametrize("loss_db_per_m", [0.0, 0.2])
def test_embedding_a_line_is_pozars_lossy_line(loss_db_per_m):
    line = feed_line(50.0, 0.66, 3210.0, loss_db_per_m, 100e6)
    alpha = loss_db_per_m / (20 / math.log(10)) * np.sqrt(F / 100e6)  # sqrt(f) scaling
    beta = 2 * math.pi * F / (C0_M_S * 0.66)
    expect = _pozar_zin(Z_EL, 50.0, alpha + 1j * beta, 3.210)
    np.testing.assert_allclose(embed(F, Z_EL, [line]), expect, rtol=1e-12)


@pytest.mark.parametrize("loss_db_per_m", [0.0, 0.2])
def test_deembedding_a_line_returns_the_element(loss_db_per_m):
    line = feed_line(50.0, 0.66, 3210.0, loss_db_per_m, 100e6)
    measured = sweep_from_impedance(F, embed(F, Z_EL, [line]), 50.0)
    out = deembed(measured, [line])
    np.testing.assert_allclose(out.sweep.z_ohm, Z_EL, rtol=1e-9, atol=1e-9)
    assert out.sweep.plane == "far end of the feed line" and out.findings == ()
    assert "3.210 m of 50 ohm feed line" in out.removed[0]
    assert ("sqrt(f)" in out.removed[0]) == (loss_db_per_m > 0)
    assert "no matching device was removed" in out.left


def test_feed_line_and_4_to_1_balun_round_trip_and_the_reference_follows_the_ratio():
    balun = from_matching(CoaxBalun(75.0, 0.8, 440e6, loss_db_per_m=0.1))
    line = feed_line(50.0, 0.66, 5000.0, 0.1)
    assert balun is not None
    measured = sweep_from_impedance(F, embed(F, 4 * Z_EL, [line, balun]), 50.0)
    out = deembed(measured, [line, balun])
    np.testing.assert_allclose(out.sweep.z_ohm, 4 * Z_EL, rtol=1e-9)
    assert out.sweep.z0_ohm == 200.0 and out.sweep.plane == "element terminals"
    assert "half-wave coaxial 4:1 balun" in out.removed[1]
    assert "no matching device" not in out.left and "outside of a coaxial shield" in out.left


def test_the_fitted_balun_is_the_em_packages_balun():
    # the bilinear map fitted from three loads must reproduce the em package's own
    # transform at loads it was not fitted on
    dev = CoaxBalun(75.0, 0.8, 440e6, loss_db_per_m=0.05)
    stage = from_matching(dev)
    assert stage is not None
    for z in (12 - 300j, 300 + 0j, 1500 + 800j):
        np.testing.assert_allclose(stage.abcd(F).input_impedance(np.full(len(F), z)),
                                   dev.transform(np.full(len(F), z), F), rtol=1e-9)


def test_a_whole_match_chain_is_undone():
    # MatchChain.at_radio (the em package's forward model) then deembed gives the element back
    chain = MatchChain(200.0, 50.0, Transformer(4.0), feed_line(50.0, 0.85, 2000.0, 0.05).line)
    at_radio = np.array([complex(chain.at_radio(z, f)) for z, f in zip(Z_EL, F, strict=True)])
    stages = [feed_line(50.0, 0.85, 2000.0, 0.05), from_matching(Transformer(4.0))]
    out = deembed(sweep_from_impedance(F, at_radio, 50.0), [s for s in stages if s])
    np.testing.assert_allclose(out.sweep.z_ohm, Z_EL, rtol=1e-9)
    assert from_matching(Direct()) is None


def test_ideal_transformer_and_general_two_port():
    np.testing.assert_allclose(embed(F, Z_EL, [transformer(4.0)]), Z_EL / 4, rtol=1e-15)

    def series_10_ohm(f):
        n = len(f)
        return ABCD(np.ones(n, complex), np.full(n, 10 + 0j), np.zeros(n, complex),
                    np.ones(n, complex))

    stage = two_port(series_10_ohm, "10 ohm series resistor")
    out = deembed(sweep_from_impedance(F, Z_EL + 10, 50.0), [stage])
    np.testing.assert_allclose(out.sweep.z_ohm, Z_EL, rtol=1e-12)
    assert out.sweep.plane == "far side of 10 ohm series resistor"


def test_a_function_that_is_no_two_port_is_refused():
    stage = from_transform(lambda z, f: z * z / 50.0, "a square law")
    with pytest.raises(DesignError, match="not a linear two-port"):
        stage.abcd(F)


def test_swr_only_passes_a_matched_line_and_an_ideal_transformer():
    # source: Pozar sec. 2.7: |Gamma| at the load = |Gamma| at the input x exp(2 alpha l)
    line = feed_line(50.0, 0.66, 10000.0, 0.1, 100e6)
    z_feed = Z_EL * 1.0
    measured = sweep_from_impedance(F, embed(F, z_feed, [line]), 50.0)
    swr_only = sweep_from_swr(F, measured.swr, 50.0)
    out = deembed(swr_only, [line, transformer(4.0)])
    np.testing.assert_allclose(out.sweep.swr, sweep_from_impedance(F, z_feed, 50.0).swr,
                               rtol=1e-9)
    assert out.sweep.z0_ohm == 200.0 and not out.sweep.has_phase
    with pytest.raises(DesignError, match="needs the phase"):
        deembed(swr_only, [feed_line(75.0, 0.66, 1000.0)])
    balun = from_matching(CoaxBalun(75.0, 0.8, 440e6))
    assert balun is not None
    with pytest.raises(DesignError, match="needs the phase"):
        deembed(swr_only, [balun])


def test_too_much_stated_loss_is_a_finding():
    line = feed_line(50.0, 0.66, 10000.0, 0.3)
    out = deembed(sweep_from_impedance(F, Z_EL, 50.0), [line])
    assert [f.code for f in out.findings] == ["measure-negative-resistance"]
    out = deembed(sweep_from_swr(F, np.full(len(F), 20.0), 50.0), [line])
    assert [f.code for f in out.findings] == ["measure-loss-exceeds-measurement"]


@pytest.mark.parametrize(("args", "match"), [
    ((0.0, 0.66, 1000.0), "characteristic impedance"),
    ((50.0, 1.2, 1000.0), "velocity factor"),
    ((50.0, 0.66, -1.0), "length"),
    ((50.0, 0.66, 2e6), "length"),
    ((50.0, 0.66, 1000.0, -0.1), "matched loss"),
])
def test_bad_feed_lines_are_refused(args, match):
    with pytest.raises(DesignError, match=match):
        feed_line(*args)


def test_describe_says_what_was_removed_and_what_is_left():
    out = deembed(sweep_from_impedance(F, Z_EL, 50.0), [feed_line(50.0, 0.66, 1500.0)])
    text = out.describe()
    assert text.startswith("removed: 1.500 m of 50 ohm feed line (velocity factor 0.66)")
    assert "Now at the far end of the feed line" in text and "Left in:" in text
