"""Small numerical helpers in plain numpy, so that planning does not import scipy's
optimiser and spatial packages (about 0.4 s of start-up) for four small jobs.

- `brentq`: a root of f in a bracket [a, b] where f changes sign, by Brent's
  method (R. P. Brent, Algorithms for Minimization without Derivatives,
  Prentice-Hall 1973, ch. 4: bisection, secant and inverse quadratic
  interpolation, never slower than bisection by more than a small factor).
  Tolerances, defaults and errors follow scipy.optimize.brentq.
- `minimize_bounded`: a minimum of f on [lo, hi] by Brent's bounded minimiser
  (Brent 1973, ch. 5: golden-section search with parabolic interpolation), the
  method of scipy.optimize.minimize_scalar(method="bounded"), with its
  tolerance convention.
- `Pchip` / `pchip`: the monotone piecewise cubic Hermite interpolant (Fritsch &
  Carlson, "Monotone piecewise cubic interpolation", SIAM J. Numer. Anal. 17,
  1980), with the slopes and end conditions of scipy's PchipInterpolator.
- `pairs_within`: every pair of points closer than a radius, by a uniform grid
  of cells one radius wide (the result set of scipy's cKDTree.query_pairs).

Pure functions, numpy only; scipy is used only by the tests, as the reference.
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Callable
from dataclasses import dataclass
from functools import lru_cache

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = ["ConvergenceError", "Pchip", "brentq", "minimize_bounded", "pairs_within", "pchip"]

_EPS = float(np.finfo(float).eps)


class ConvergenceError(RuntimeError):
    """An iterative method used up its iterations before meeting its tolerance."""


# -- root finding -------------------------------------------------------------------------


def brentq(f: Callable[[float], float], a: float, b: float, *, xtol: float = 2e-12,
           rtol: float = 4 * _EPS, maxiter: int = 100) -> float:
    """A root of `f` between `a` and `b`, where f(a) and f(b) differ in sign.

    Brent's method (Brent 1973, ch. 4). The result x lies within
    xtol + rtol * |x| of a sign change of f (the convention and defaults of
    scipy.optimize.brentq: xtol 2e-12, rtol four machine epsilons, 100
    iterations). Raises ValueError when f(a) and f(b) have the same sign, when
    a value of f is NaN, or when a tolerance is too small; ConvergenceError
    when `maxiter` iterations do not meet the tolerance.
    """
    if not xtol > 0:
        raise ValueError(f"xtol too small ({xtol:g} <= 0)")
    if not rtol >= 4 * _EPS:
        raise ValueError(f"rtol too small ({rtol:g} < {4 * _EPS:g})")
    if maxiter < 0:
        raise ValueError(f"maxiter must be zero or more, not {maxiter}")
    a, b = float(a), float(b)
    fa, fb = _value(f, a), _value(f, b)
    if fa * fb > 0:
        raise ValueError(f"f(a) and f(b) must have different signs (f({a!r}) = {fa!r}, "
                         f"f({b!r}) = {fb!r}): widen or move the bracket")
    if fa == 0:
        return a
    if fb == 0:
        return b
    # b is the best estimate, a the previous one, c the far end of the bracket [b, c]
    c, fc = a, fa
    d = e = b - a
    for _ in range(maxiter):
        if (fb > 0) == (fc > 0):
            c, fc = a, fa
            d = e = b - a
        if abs(fc) < abs(fb):
            a, b, c = b, c, b
            fa, fb, fc = fb, fc, fb
        tol = 0.5 * (xtol + rtol * abs(b))
        m = 0.5 * (c - b)
        if abs(m) <= tol or fb == 0:
            return b
        if abs(e) < tol or abs(fa) <= abs(fb):
            d = e = m  # bisection
        else:
            s = fb / fa
            if a == c:  # secant
                p = 2 * m * s
                q = 1 - s
            else:  # inverse quadratic interpolation
                q = fa / fc
                r = fb / fc
                p = s * (2 * m * q * (q - r) - (b - a) * (r - 1))
                q = (q - 1) * (r - 1) * (s - 1)
            if p > 0:
                q = -q
            else:
                p = -p
            if 2 * p < 3 * m * q - abs(tol * q) and p < abs(0.5 * e * q):
                e, d = d, p / q
            else:
                d = e = m
        a, fa = b, fb
        b += d if abs(d) > tol else (tol if m > 0 else -tol)
        fb = _value(f, b)
    raise ConvergenceError(f"brentq: no convergence after {maxiter} iterations "
                           f"(last estimate {b!r})")


def _value(f: Callable[[float], float], x: float) -> float:
    y = float(f(x))
    if math.isnan(y):
        raise ValueError(f"the function is NaN at x = {x!r}; the method cannot continue")
    return y


# -- bounded minimisation -----------------------------------------------------------------

_GOLDEN = 0.5 * (3.0 - math.sqrt(5.0))  # (3 - sqrt 5) / 2, the golden-section fraction
# the relative part of the step tolerance: the square root of the machine epsilon
# (Brent), taken as 2.2e-16 as scipy's bounded minimize_scalar does, so that the two
# take the same steps
_SQRT_EPS = math.sqrt(2.2e-16)


def minimize_bounded(f: Callable[[float], float], lo: float, hi: float, *,
                     xatol: float = 1e-5, maxiter: int = 500) -> tuple[float, float]:
    """A local minimum of `f` on [lo, hi] and the value there: (x, f(x)).

    Brent's method (Brent 1973, ch. 5): golden-section steps, replaced by the
    minimum of a parabola through the three best points whenever that step is
    acceptable. The tolerance follows scipy's bounded minimize_scalar: each
    step's tolerance is sqrt(2.2e-16) |x| + xatol / 3 and the search stops when
    the bracket of the minimum is within twice that of x. Raises ValueError for a
    bad interval and ConvergenceError after `maxiter` evaluations of f.
    """
    lo, hi = float(lo), float(hi)
    if not (math.isfinite(lo) and math.isfinite(hi)):
        raise ValueError(f"the bounds must be finite, not ({lo!r}, {hi!r})")
    if lo > hi:
        raise ValueError(f"the lower bound {lo!r} exceeds the upper bound {hi!r}")
    if not xatol > 0:
        raise ValueError(f"xatol must be positive, not {xatol!r}")
    a, b = lo, hi
    x = w = v = a + _GOLDEN * (b - a)
    fx = fw = fv = _value(f, x)
    calls = 1
    d = e = 0.0
    while True:
        m = 0.5 * (a + b)
        tol = _SQRT_EPS * abs(x) + xatol / 3.0
        tol2 = 2.0 * tol
        if abs(x - m) <= tol2 - 0.5 * (b - a):
            return x, fx
        if calls >= maxiter:
            raise ConvergenceError(f"minimize_bounded: no convergence after {maxiter} "
                                   f"evaluations (best x {x!r})")
        parabolic = False
        if abs(e) > tol:
            # the parabola through (x, fx), (w, fw), (v, fv): its minimum at x + p / q
            r = (x - w) * (fx - fv)
            q = (x - v) * (fx - fw)
            p = (x - v) * q - (x - w) * r
            q = 2.0 * (q - r)
            if q > 0:
                p = -p
            else:
                q = -q
            if abs(p) < abs(0.5 * q * e) and q * (a - x) < p < q * (b - x):
                e, d = d, p / q
                u = x + d
                if u - a < tol2 or b - u < tol2:  # not too close to the ends
                    d = tol if x <= m else -tol
                parabolic = True
        if not parabolic:
            e = (b if x < m else a) - x
            d = _GOLDEN * e
        u = x + (d if abs(d) >= tol else (tol if d >= 0 else -tol))
        fu = _value(f, u)
        calls += 1
        if fu <= fx:
            if u < x:
                b = x
            else:
                a = x
            v, fv, w, fw, x, fx = w, fw, x, fx, u, fu
        else:
            if u < x:
                a = u
            else:
                b = u
            if fu <= fw or w == x:
                v, fv, w, fw = w, fw, u, fu
            elif fu <= fv or v == x or v == w:
                v, fv = u, fu


# -- monotone interpolation ---------------------------------------------------------------


@dataclass(frozen=True, eq=False)
class Pchip:
    """The monotone piecewise cubic Hermite interpolant through (x, y).

    Slopes (Fritsch & Carlson 1980, with the weighted harmonic mean of
    Fritsch & Butland, SIAM J. Sci. Stat. Comput. 5, 1984): zero at a point
    where the neighbouring secants differ in sign or either is zero, else
    (w1 + w2) / (w1 / m_{k-1} + w2 / m_k) with w1 = 2 h_k + h_{k-1},
    w2 = h_k + 2 h_{k-1}. At the ends, the one-sided three-point estimate,
    set to zero when its sign differs from the end secant's and limited to
    three times that secant when the first two secants differ in sign (the end
    conditions of scipy's PchipInterpolator). Two points give a straight line.
    Data that is monotone gives a monotone interpolant. Beyond the ends the
    end cubics extend.
    """

    x: NDArray[np.float64]
    y: NDArray[np.float64]
    slopes: NDArray[np.float64]

    def __call__(self, at: ArrayLike) -> NDArray[np.float64]:
        """Values at `at` (any shape)."""
        return self._evaluate(at, 0)

    def slope(self, at: ArrayLike) -> NDArray[np.float64]:
        """First derivative at `at` (any shape)."""
        return self._evaluate(at, 1)

    def derivative(self) -> Callable[[ArrayLike], NDArray[np.float64]]:
        """The first derivative as a function (as scipy's `derivative()` is used)."""
        return self.slope

    def _evaluate(self, at: ArrayLike, nu: int) -> NDArray[np.float64]:
        t_in = np.asarray(at, dtype=float)
        k = np.clip(np.searchsorted(self.x, t_in, side="right") - 1, 0, len(self.x) - 2)
        x0, h = self.x[k], self.x[k + 1] - self.x[k]
        y0, y1 = self.y[k], self.y[k + 1]
        d0, d1 = self.slopes[k], self.slopes[k + 1]
        t = (t_in - x0) / h
        delta = (y1 - y0) / h
        # cubic in t: y0 + h t (d0 + t (c2 + t c3))
        c2 = 3 * delta - 2 * d0 - d1
        c3 = d0 + d1 - 2 * delta
        if nu == 0:
            out = y0 + h * t * (d0 + t * (c2 + t * c3))
        else:
            out = d0 + t * (2 * c2 + 3 * t * c3)
        return np.asarray(out, dtype=float)


def pchip(x: ArrayLike, y: ArrayLike) -> Pchip:
    """The monotone cubic interpolant through points `x` (strictly increasing,
    at least two) and values `y` (one-dimensional, finite)."""
    xa = np.array(x, dtype=float)
    ya = np.array(y, dtype=float)
    if xa.ndim != 1 or ya.shape != xa.shape:
        raise ValueError(f"x and y must be one-dimensional and of one length, not shapes "
                         f"{xa.shape} and {ya.shape}")
    if len(xa) < 2:
        raise ValueError("x must contain at least 2 points")
    if not (np.isfinite(xa).all() and np.isfinite(ya).all()):
        raise ValueError("x and y must be finite")
    h = np.diff(xa)
    if np.any(h <= 0):
        raise ValueError("x must be strictly increasing")
    m = np.diff(ya) / h
    d = np.empty_like(ya)
    if len(xa) == 2:
        d[:] = m[0]
    else:
        w1 = 2 * h[1:] + h[:-1]
        w2 = h[1:] + 2 * h[:-1]
        flat = (np.sign(m[1:]) != np.sign(m[:-1])) | (m[1:] == 0) | (m[:-1] == 0)
        with np.errstate(divide="ignore", invalid="ignore"):
            mean = (w1 + w2) / (w1 / m[:-1] + w2 / m[1:])
        d[1:-1] = np.where(flat, 0.0, mean)
        d[0] = _end_slope(h[0], h[1], m[0], m[1])
        d[-1] = _end_slope(h[-1], h[-2], m[-1], m[-2])
    xa.flags.writeable = False
    ya.flags.writeable = False
    d.flags.writeable = False
    return Pchip(xa, ya, d)


def _end_slope(h0: float, h1: float, m0: float, m1: float) -> float:
    """One-sided three-point slope at an end, kept to the shape of the data."""
    d = ((2 * h0 + h1) * m0 - h0 * m1) / (h0 + h1)
    if np.sign(d) != np.sign(m0):
        return 0.0
    if np.sign(m0) != np.sign(m1) and abs(d) > 3 * abs(m0):
        return float(3 * m0)
    return float(d)


# -- neighbour search ---------------------------------------------------------------------

_LINEAR_KEY_LIMIT = 2 ** 62  # cell counts above this use tuple ranks instead of linear keys


def pairs_within(points: ArrayLike, radius: float) -> NDArray[np.intp]:
    """Every pair (i, j), i < j, of rows of `points` (n, k) whose Euclidean
    distance is at most `radius` (the same set as scipy's
    cKDTree(points).query_pairs(radius)), as an (m, 2) array in ascending
    order of i, then j.

    The points go into a uniform grid of cells a little over one radius wide
    (sorted by cell), so only points in the same or neighbouring cells are
    compared; the squared distance, summed over the coordinates in order, is
    compared with radius * radius. Meant for 1 to 3 dimensions (3^k cell
    neighbours). Raises ValueError for non-finite points or a negative or NaN
    radius.
    """
    pts = np.asarray(points, dtype=float)
    if pts.ndim != 2:
        raise ValueError(f"points must be an (n, k) array, not shape {pts.shape}")
    r = float(radius)
    if not r >= 0:
        raise ValueError(f"radius must be zero or more, not {radius!r}")
    if not np.isfinite(pts).all():
        raise ValueError("points must be finite")
    n, k = pts.shape
    if n < 2:
        return np.zeros((0, 2), dtype=np.intp)
    if math.isinf(r) or k == 0:
        return np.stack(np.triu_indices(n, 1), axis=1).astype(np.intp)
    if r == 0:
        # only equal points pair up: each distinct point is a cell of its own
        ranks = np.unique(pts, axis=0, return_inverse=True)[1].reshape(-1)
        order, ia, ib = _candidates(ranks.astype(np.int64).reshape(n, 1), neighbours=False)
    else:
        low = pts.min(axis=0)
        span = float((pts.max(axis=0) - low).max())
        # a little over r, so that rounding in (x - low) / h never puts two points
        # within r of each other two cells apart
        h = r * (1 + 1e-9) + 8 * _EPS * span
        cells = np.floor((pts - low) / h).astype(np.int64)
        order, ia, ib = _candidates(cells, neighbours=True)
    # ia, ib index the points sorted by cell: measure there, keep those within r
    d2 = np.zeros(len(ia))
    for c in range(k):
        col = pts[order, c]
        diff = col[ia] - col[ib]
        d2 += diff * diff
    keep = d2 <= r * r
    i, j = order[ia[keep]], order[ib[keep]]
    lo, hi = np.minimum(i, j).astype(np.int64), np.maximum(i, j).astype(np.int64)
    sort = np.argsort(lo * n + hi, kind="stable")
    return np.stack([lo[sort], hi[sort]], axis=1).astype(np.intp)


def _compress(cells: NDArray[np.int64]) -> NDArray[np.int64]:
    """Renumber each column of cell indices so that runs of empty cells shrink to
    one: neighbours stay neighbours, non-neighbours stay apart, and each column's
    range is under 2n."""
    out = np.empty_like(cells)
    for c in range(cells.shape[1]):
        u, inv = np.unique(cells[:, c], return_inverse=True)
        step = np.minimum(np.diff(u), 2)
        out[:, c] = np.concatenate([[0], np.cumsum(step)])[inv.reshape(-1)]
    return out


def _candidates(cells: NDArray[np.int64], neighbours: bool
                ) -> tuple[NDArray[np.intp], NDArray[np.int64], NDArray[np.int64]]:
    """The points sorted by cell (`order`) and the candidate pairs as positions
    in that order: two points of one cell (first before second) and, with
    `neighbours`, a point of a cell with one of a neighbouring cell (each pair
    of neighbouring cells once). `cells` holds non-negative cell indices."""
    k = cells.shape[1]
    extent = [int(cells[:, c].max()) + 3 for c in range(k)]
    if math.prod(extent) >= _LINEAR_KEY_LIMIT:
        cells = _compress(cells)
        extent = [int(cells[:, c].max()) + 3 for c in range(k)]
    linear = math.prod(extent) < _LINEAR_KEY_LIMIT
    if linear:
        # one integer per cell, shifted by one so that a neighbour's key never wraps
        stride = np.array([math.prod(extent[c + 1:]) for c in range(k)], dtype=np.int64)
        point_key = (cells + 1) @ stride
        order = np.argsort(point_key, kind="stable")
        sorted_key = point_key[order]
        new_cell = np.concatenate([[True], sorted_key[1:] != sorted_key[:-1]])
        start = np.flatnonzero(new_cell).astype(np.int64)
        keys = sorted_key[start]
        ucells = cells[:0]
    else:
        ucells, inverse = np.unique(cells, axis=0, return_inverse=True)
        order = np.argsort(inverse.reshape(-1), kind="stable")
        start = np.searchsorted(inverse.reshape(-1)[order], np.arange(len(ucells)))
        start = start.astype(np.int64)
        keys = np.zeros(0, dtype=np.int64)
    count = np.diff(np.append(start, len(order))).astype(np.int64)
    ia, ib = _block_pairs(start, count, start, count)
    first = ia < ib
    ia, ib = ia[first], ib[first]
    if not neighbours:
        return order, ia, ib
    # the forward half of the 3^k - 1 neighbouring cells: each pair of cells once
    offs = _forward_offsets(k)
    m = len(count)
    if linear:
        want = (keys[None, :] + (offs @ stride)[:, None]).reshape(-1)
        pos = np.minimum(np.searchsorted(keys, want), m - 1)
        other = np.where(keys[pos] == want, pos, -1)
    else:
        shifted = (ucells[None, :, :] + offs[:, None, :]).reshape(-1, k)
        other = _rows_of(ucells, shifted)
    hit = np.flatnonzero(other >= 0)
    a, b = hit % m, other[hit]
    na, nb = _block_pairs(start[a], count[a], start[b], count[b])
    return order, np.concatenate([ia, na]), np.concatenate([ib, nb])


@lru_cache(maxsize=8)
def _forward_offsets(k: int) -> NDArray[np.int64]:
    """Offsets to the neighbouring cells in k dimensions whose first non-zero
    entry is +1: one of each pair of opposite offsets."""
    offs = [o for o in itertools.product((-1, 0, 1), repeat=k)
            if any(o) and next(v for v in o if v) > 0]
    out = np.array(offs, dtype=np.int64).reshape(len(offs), k)
    out.flags.writeable = False
    return out


def _rows_of(table: NDArray[np.int64], query: NDArray[np.int64]) -> NDArray[np.int64]:
    """For each row of `query`, its row in `table` (rows unique), or -1: by ranking
    both sets of rows together (for grids too large for one integer per cell)."""
    ranks = np.unique(np.concatenate([table, query], axis=0), axis=0,
                      return_inverse=True)[1].reshape(-1)
    row_of = np.full(int(ranks.max()) + 1, -1, dtype=np.int64)
    row_of[ranks[:len(table)]] = np.arange(len(table))
    return np.asarray(row_of[ranks[len(table):]], dtype=np.int64)


def _block_pairs(sa: NDArray[np.int64], ca: NDArray[np.int64], sb: NDArray[np.int64],
                 cb: NDArray[np.int64]) -> tuple[NDArray[np.int64], NDArray[np.int64]]:
    """Every (position in block a, position in block b) for each pair of blocks
    (block a of `ca` positions from `sa`, block b of `cb` from `sb`)."""
    size = ca * cb
    total = int(size.sum())
    if total == 0:
        z = np.zeros(0, dtype=np.int64)
        return z, z
    blk = np.repeat(np.arange(len(size)), size)
    local = np.arange(total) - np.repeat(np.cumsum(size) - size, size)
    width = cb[blk]
    return sa[blk] + local // width, sb[blk] + local % width
