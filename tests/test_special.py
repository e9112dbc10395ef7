"""fabplan.special against scipy.special (the reference library) on seeded cases."""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.special as ss

from fabplan.em.loss import internal_impedance
from fabplan.special import ellipkm1, ive, kve


def _arguments() -> list[complex]:
    """|z| from 1e-5 to 1e6 on the skin-effect ray arg z = pi/4, on the real axis,
    on the other edge -pi/4 and at seeded random angles between: 1600 points."""
    rng = np.random.default_rng(11)
    out = []
    for m in np.logspace(-5, 6, 400):
        for phase in (math.pi / 4, 0.0, -math.pi / 4, rng.uniform(-math.pi / 4, math.pi / 4)):
            out.append(complex(m * np.exp(1j * phase)))
    return out


@pytest.mark.parametrize("ours, theirs", [(ive, ss.ive), (kve, ss.kve)], ids=["ive", "kve"])
@pytest.mark.parametrize("order", [0, 1])
def test_scaled_bessel_functions_match_scipy(ours, theirs, order):
    # source: scipy.special.ive / kve (same exponential scaling)
    worst = 0.0
    for z in _arguments():
        want = complex(theirs(order, z))
        worst = max(worst, abs(ours(order, z) - want) / abs(want))
    assert worst < 1e-13


def test_each_method_is_checked_where_it_is_used():
    # the power series (|z| <= 2), the trapezoidal integrals (to 30) and the Hankel
    # expansions (beyond) each meet scipy near their joins
    # source: scipy.special.ive / kve
    for m in (1.999, 2.001, 29.999, 30.001):
        z = m * complex(math.cos(math.pi / 4), math.sin(math.pi / 4))
        for n in (0, 1):
            assert abs(ive(n, z) - ss.ive(n, z)) <= 1e-14 * abs(ss.ive(n, z))
            assert abs(kve(n, z) - ss.kve(n, z)) <= 1e-14 * abs(ss.kve(n, z))


def test_bessel_arguments_outside_the_implemented_range_are_refused():
    with pytest.raises(ValueError, match="order 2"):
        ive(2, 1 + 1j)
    with pytest.raises(ValueError, match="arg z"):
        kve(0, -1 + 0.1j)
    with pytest.raises(ValueError, match="arg z"):
        ive(0, 0j)


def test_ellipkm1_matches_scipy_from_1e_300_to_1():
    # source: scipy.special.ellipkm1; and K(m = 0) = pi/2 (A&S 17.3.11)
    rng = np.random.default_rng(5)
    p = np.concatenate([np.logspace(-300, 0, 500), rng.uniform(0, 1, 500), [1.0]])
    ours, want = ellipkm1(p), ss.ellipkm1(p)
    assert np.max(np.abs(ours - want) / want) < 1e-14
    assert ellipkm1(1.0) == pytest.approx(math.pi / 2, rel=1e-15)
    assert np.isinf(ellipkm1(0.0))
    with pytest.raises(ValueError):
        ellipkm1(-0.1)


def _internal_impedance_by_scipy(f, a, rho, wall):
    """The same formulas (Ramo-Whinnery-Van Duzer; Schelkunoff) with scipy's functions."""
    delta = math.sqrt(2 * rho / (2 * math.pi * f * 4e-7 * math.pi))
    g = (1 + 1j) / delta
    front = g * rho / (2 * math.pi * a)
    ga = g * a
    if wall is None:
        return front * ss.ive(0, ga) / ss.ive(1, ga)
    gb = g * (a - wall)
    scale = np.exp(-(g + g.real) * wall)
    num = ss.ive(0, ga) * ss.kve(1, gb) + ss.kve(0, ga) * ss.ive(1, gb) * scale
    den = ss.ive(1, ga) * ss.kve(1, gb) - ss.kve(1, ga) * ss.ive(1, gb) * scale
    return front * num / den


def test_internal_impedance_is_unchanged_from_the_scipy_evaluation():
    # source: scipy.special.ive / kve in the same formulas; wires and tubes from 10 kHz
    # to 3 GHz, walls from a tenth of a skin depth to solid
    rng = np.random.default_rng(3)
    for _ in range(300):
        f = 10 ** rng.uniform(4, 9.5)
        a = 10 ** rng.uniform(-4, -1.5)
        rho = rng.choice([1.72e-8, 2.65e-8, 7.2e-7])
        wall = None if rng.uniform() < 0.3 else a * 10 ** rng.uniform(-2.5, -0.05)
        want = _internal_impedance_by_scipy(f, a, rho, wall)
        got = internal_impedance(f, a, rho, wall)
        if wall is not None and abs((1 + 1j) / math.sqrt(2 * rho / (2 * math.pi * f * 4e-7
                                                                    * math.pi)) * a) < 1e-2:
            continue  # below that the DC value is used, tested in test_solver_loss
        assert got == pytest.approx(want, rel=1e-12)
