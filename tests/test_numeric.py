"""fabplan.numeric against scipy (the reference library) on seeded random cases."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.interpolate import PchipInterpolator
from scipy.optimize import brentq as scipy_brentq
from scipy.optimize import minimize_scalar
from scipy.spatial import cKDTree

from fabplan import numeric
from fabplan.numeric import (
    ConvergenceError,
    brentq,
    minimize_bounded,
    pairs_within,
    pchip,
)

EPS = float(np.finfo(float).eps)


# -- brentq ---------------------------------------------------------------------------------

def _root_func(kind: int, r0: float, s: float, c: float):
    """One of five smooth functions with a single sign change at r0."""
    funcs = [
        lambda x: s * (x - r0) * (1 + c * (x - r0) ** 2),
        lambda x: math.tanh(c * (x - r0)),
        lambda x: math.expm1(c * (x - r0)),
        lambda x: s * (math.atan(x - r0) + 0.2 * (x - r0)),
        lambda x: (x - r0) / (1 + abs(x - r0)) ** c,
    ]
    f = funcs[kind % len(funcs)]
    return (lambda x: -f(x)) if kind % 2 else f  # decreasing through the root too


def _root_cases(seed: int, count: int):
    """Seeded functions with one sign change in their bracket, and the bracket."""
    rng = np.random.default_rng(seed)
    for t in range(count):
        r0 = float(rng.uniform(-50, 50))
        a = r0 - float(rng.uniform(1e-3, 20))
        b = r0 + float(rng.uniform(1e-3, 20))
        s = float(10 ** rng.uniform(-3, 3))
        c = float(rng.uniform(0.1, 3))
        yield _root_func(t, r0, s, c), a, b


@pytest.mark.parametrize("xtol,rtol", [(2e-12, 4 * EPS), (1e-6, 1e-10), (1e-15, 1e-14)])
def test_brentq_agrees_with_scipy(xtol, rtol):
    # source: scipy.optimize.brentq (reference library); both roots lie within
    # xtol + rtol |x| of the sign change, so they differ by at most twice that
    n = 0
    for f, a, b in _root_cases(seed=11, count=200):
        mine = brentq(f, a, b, xtol=xtol, rtol=rtol)
        ref = scipy_brentq(f, a, b, xtol=xtol, rtol=rtol)
        assert abs(mine - ref) <= 2 * (xtol + rtol * abs(ref)), (a, b)
        assert a <= mine <= b
        n += 1
    assert n == 200


def test_brentq_meets_its_tolerance_on_a_known_root():
    # source: textbook root, x^2 - 2 = 0 at sqrt(2); cos x = x at 0.7390851332151607
    # (the Dottie number, from memory; checked here against scipy too)
    assert brentq(lambda x: x * x - 2, 0, 2) == pytest.approx(math.sqrt(2), abs=4e-12)
    dottie = scipy_brentq(lambda x: math.cos(x) - x, 0, 1)
    assert brentq(lambda x: math.cos(x) - x, 0, 1) == pytest.approx(dottie, abs=4e-12)
    assert dottie == pytest.approx(0.7390851332151607, abs=1e-12)


def test_brentq_ends_and_errors_like_scipy():
    # source: scipy.optimize.brentq returns an end where f is zero and refuses a
    # bracket without a sign change or with too small a tolerance
    assert brentq(lambda x: x - 1, 1, 3) == scipy_brentq(lambda x: x - 1, 1, 3) == 1
    assert brentq(lambda x: x - 3, 1, 3) == scipy_brentq(lambda x: x - 3, 1, 3) == 3
    with pytest.raises(ValueError):
        scipy_brentq(lambda x: x * x + 1, -1, 1)
    with pytest.raises(ValueError, match="different signs"):
        brentq(lambda x: x * x + 1, -1, 1)
    with pytest.raises(ValueError, match="xtol"):
        brentq(lambda x: x, -1, 1, xtol=0)
    with pytest.raises(ValueError, match="rtol"):
        brentq(lambda x: x, -1, 1, rtol=1e-17)
    with pytest.raises(ValueError, match="NaN"):
        brentq(lambda x: math.nan if x > 0 else -1.0, -1, 1)


def test_brentq_gives_up_where_scipy_does():
    # source: scipy.optimize.brentq raises RuntimeError after maxiter iterations; a
    # triple root creeps in slowly for both, a simple root converges for both
    def cube(x: float) -> float:
        return (x - 3.2770259382044173) ** 3

    with pytest.raises(RuntimeError):
        scipy_brentq(cube, 1.2251222477223025, 6.0294984396929845)
    with pytest.raises(ConvergenceError, match="100 iterations"):
        brentq(cube, 1.2251222477223025, 6.0294984396929845)
    with pytest.raises(ConvergenceError):
        brentq(lambda x: math.exp(x) - 5, 0, 4, maxiter=2)
    # fewer evaluations than bisection needs on a smooth function
    calls = []
    brentq(lambda x: calls.append(x) or math.exp(x) - 5, 0, 4)
    assert len(calls) < math.log2(4 / 2e-12)


# -- minimize_bounded ------------------------------------------------------------------------

def _min_func(kind: int, x0: float, p: float, c: float, k: float):
    """One of five unimodal functions with its minimum at x0 (or none: exp)."""
    funcs = [
        lambda x: abs(x - x0) ** p + c * (x - x0) ** 4,
        lambda x: math.cosh(k * (x - x0)) + c * (x - x0),
        lambda x: (x - x0) ** 2 / (1 + c * abs(x - x0)),
        lambda x: -1 / (1 + (k * (x - x0)) ** 2),
        lambda x: math.exp(k * (x - x0)),  # minimum at the lower end
    ]
    return funcs[kind % len(funcs)]


def _min_cases(seed: int, count: int):
    """Seeded unimodal functions on a bracket: interior and end minima."""
    rng = np.random.default_rng(seed)
    for t in range(count):
        x0 = float(rng.uniform(-20, 20))
        lo = x0 - float(rng.uniform(0.01, 10))
        hi = x0 + float(rng.uniform(0.01, 10))
        p = float(rng.uniform(1.2, 4))
        c = float(rng.uniform(0, 2))
        k = float(rng.uniform(0.2, 3))
        yield _min_func(t, x0, p, c, k), lo, hi


@pytest.mark.parametrize("xatol", [1e-5, 1e-8, 1e-3])
def test_minimize_bounded_agrees_with_scipy(xatol):
    # source: scipy.optimize.minimize_scalar(method="bounded") (reference library)
    n = 0
    for f, lo, hi in _min_cases(seed=5, count=200):
        x, fx = minimize_bounded(f, lo, hi, xatol=xatol)
        ref = minimize_scalar(f, bounds=(lo, hi), method="bounded", options={"xatol": xatol})
        assert ref.success
        assert abs(x - ref.x) <= xatol, (lo, hi)
        assert fx == f(x)
        assert lo <= x <= hi
        n += 1
    assert n == 200


def test_minimize_bounded_on_a_parabola_and_its_errors():
    # source: textbook, (x - 1.5)^2 + 2 has its minimum 2 at x = 1.5
    x, fx = minimize_bounded(lambda x: (x - 1.5) ** 2 + 2, -4, 7, xatol=1e-9)
    assert x == pytest.approx(1.5, abs=1e-9) and fx == pytest.approx(2.0, abs=1e-15)
    with pytest.raises(ValueError, match="exceeds"):
        minimize_bounded(lambda x: x, 2, 1)
    with pytest.raises(ValueError, match="finite"):
        minimize_bounded(lambda x: x, 0, math.inf)
    with pytest.raises(ConvergenceError):
        minimize_bounded(lambda x: (x - 0.3) ** 2, 0, 1, xatol=1e-12, maxiter=3)


# -- pchip ---------------------------------------------------------------------------------

def _pchip_data(rng: np.random.Generator, kind: int):
    n = int(rng.integers(2, 40))
    x = np.cumsum(rng.uniform(0.01, 3, n)) + rng.uniform(-100, 100)
    y = rng.normal(size=n) * 10 ** rng.uniform(-3, 3)
    if kind == 1:
        y = np.cumsum(np.abs(y))  # increasing
    elif kind == 2:
        y = -np.cumsum(np.abs(y))  # decreasing
    elif kind == 3:
        y = np.round(y)  # repeated values: flat pieces and zero slopes
        y[len(y) // 2:] = y[len(y) // 2]
    return x, y


def test_pchip_agrees_with_scipy():
    # source: scipy.interpolate.PchipInterpolator (reference library), values and
    # first derivatives inside the data and on the extended end cubics
    rng = np.random.default_rng(3)
    for case in range(400):
        x, y = _pchip_data(rng, case % 4)
        ref, mine = PchipInterpolator(x, y), pchip(x, y)
        span = x[-1] - x[0]
        q = np.concatenate([np.linspace(x[0], x[-1], 301), x,
                            np.linspace(x[0] - 0.2 * span, x[0], 7),
                            np.linspace(x[-1], x[-1] + 0.2 * span, 7)])
        want = ref(q)
        scale = np.maximum(np.abs(want), np.abs(y).max())
        assert np.all(np.abs(mine(q) - want) <= 1e-12 * scale), case
        slope_ref = ref.derivative()(q)
        slope_scale = np.maximum(np.abs(slope_ref), np.abs(mine.slopes).max() + 1e-300)
        assert np.all(np.abs(mine.derivative()(q) - slope_ref) <= 1e-12 * slope_scale), case
        assert np.all(np.abs(mine(x) - y) <= 1e-14 * np.abs(y).max()), case


def test_pchip_keeps_monotone_data_monotone():
    # source: Fritsch & Carlson 1980, the interpolant of monotone data is monotone
    rng = np.random.default_rng(8)
    for case in range(200):
        x, y = _pchip_data(rng, 1 + case % 2)
        q = np.linspace(x[0], x[-1], 2001)
        v = pchip(x, y)(q)
        step = np.diff(v)
        tol = 1e-12 * np.abs(y).max()
        assert np.all(step >= -tol) if y[-1] > y[0] else np.all(step <= tol)
        assert v.min() >= y.min() - tol and v.max() <= y.max() + tol


def test_pchip_two_points_is_a_line_and_errors():
    # source: scipy.interpolate.PchipInterpolator, two points give linear interpolation
    line = pchip([1.0, 2.0], [1.0, 3.0])
    assert np.allclose(line([0.0, 1.5, 3.0]), PchipInterpolator([1, 2], [1, 3])([0, 1.5, 3]))
    assert np.allclose(line.slope([1.2, 1.7]), 2.0)
    with pytest.raises(ValueError, match="strictly increasing"):
        pchip([1.0, 1.0, 2.0], [1.0, 2.0, 5.0])
    with pytest.raises(ValueError, match="at least 2"):
        pchip([1.0], [1.0])
    with pytest.raises(ValueError, match="one-dimensional"):
        pchip([1.0, 2.0], [1.0, 2.0, 3.0])
    assert line(1.5).shape == ()


# -- pairs_within ---------------------------------------------------------------------------

def _kd_pairs(pts: np.ndarray, r: float) -> set[tuple[int, int]]:
    return {(int(i), int(j)) for i, j in cKDTree(pts).query_pairs(r, output_type="ndarray")}


def test_pairs_within_matches_ckdtree_on_random_clouds():
    # source: scipy.spatial.cKDTree.query_pairs (reference library)
    rng = np.random.default_rng(21)
    for case in range(300):
        n = int(rng.integers(0, 300))
        k = 1 + case % 3
        pts = rng.uniform(-50, 50, (n, k)) * 10 ** rng.uniform(-3, 3)
        r = float(rng.uniform(0.01, 0.15)) * float(np.ptp(pts)) if n else 1.0
        if case % 5 == 0 and n:  # clusters and duplicates
            pts = np.round(pts[rng.integers(0, n, n)] / r) * r
        got = pairs_within(pts, r)
        assert got.dtype == np.intp and got.shape[1] == 2
        assert {tuple(p) for p in got.tolist()} == _kd_pairs(pts, r), case
        assert np.all(got[:, 0] < got[:, 1])
        assert np.array_equal(got, got[np.lexsort((got[:, 1], got[:, 0]))])


def test_pairs_within_edge_cases_follow_ckdtree():
    # source: scipy.spatial.cKDTree.query_pairs: a pair exactly at the radius counts
    # (distance <= r); duplicates are pairs at distance 0
    pts = np.array([[0.0, 0, 0], [3, 4, 0], [3, 4, 0], [6, 8, 0], [6, 8, 5]])
    for r in (5.0, 4.999999, 0.0, 1e-9, 10.0, 1e12, math.inf):
        assert {tuple(p) for p in pairs_within(pts, r).tolist()} == _kd_pairs(pts, r), r
    assert (0, 1) in {tuple(p) for p in pairs_within(pts, 5.0).tolist()}
    assert pairs_within(np.zeros((0, 3)), 1.0).shape == (0, 2)
    assert pairs_within(np.zeros((1, 3)), 1.0).shape == (0, 2)
    same = np.ones((6, 2))
    assert len(pairs_within(same, 0.0)) == len(_kd_pairs(same, 0.0)) == 15
    # integer lattice: many pairs exactly at the radius, in every direction
    lattice = np.array(np.meshgrid(*[np.arange(5.0)] * 3)).reshape(3, -1).T
    for r in (1.0, math.sqrt(2), 2.0, 3.0):
        assert {tuple(p) for p in pairs_within(lattice, r).tolist()} == _kd_pairs(lattice, r)
    with pytest.raises(ValueError, match="radius"):
        pairs_within(pts, -1.0)
    with pytest.raises(ValueError, match="finite"):
        pairs_within(np.array([[0.0, math.nan]]), 1.0)


def test_pairs_within_far_apart_points_and_the_rank_fallback(monkeypatch):
    # source: scipy.spatial.cKDTree.query_pairs; clusters far apart relative to the
    # radius, and the same with cell keys by tuple rank instead of linear keys
    rng = np.random.default_rng(4)
    centres = rng.uniform(-1e9, 1e9, (20, 3))
    pts = np.repeat(centres, 10, axis=0) + rng.uniform(0, 2, (200, 3))
    want = _kd_pairs(pts, 1.5)
    assert {tuple(p) for p in pairs_within(pts, 1.5).tolist()} == want
    monkeypatch.setattr(numeric, "_LINEAR_KEY_LIMIT", 1)
    assert {tuple(p) for p in pairs_within(pts, 1.5).tolist()} == want
    line = np.c_[np.arange(50.0), np.zeros(50), np.zeros(50)]
    assert {tuple(p) for p in pairs_within(line, 2.0).tolist()} == _kd_pairs(line, 2.0)


def test_pairs_within_at_a_radius_equal_to_a_rounded_distance():
    # source: scipy.spatial.cKDTree.query_pairs; the radius is one pair's distance as
    # rounded, or one unit in the last place either side of it: the same rule decides
    rng = np.random.default_rng(9)
    for case in range(200):
        pts = rng.uniform(-10, 10, (40, 3))
        i, j = rng.choice(40, 2, replace=False)
        d = pts[i] - pts[j]
        r = float(np.sqrt(d[0] * d[0] + d[1] * d[1] + d[2] * d[2]))
        r = [r, float(np.nextafter(r, 0)), float(np.nextafter(r, np.inf)),
             float(np.linalg.norm(d))][case % 4]
        assert {tuple(p) for p in pairs_within(pts, r).tolist()} == _kd_pairs(pts, r), case
