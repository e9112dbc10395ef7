"""Rational fitting of a frequency sweep from a handful of solves (AAA, adaptive).

The input impedance of an antenna (and any other smooth scalar of the solution,
such as gain as a ratio) is a meromorphic function of frequency whose poles lie
off the real axis; across an ordinary band it is reproduced to many digits by a
rational function of low degree. `aaa` builds one in barycentric form,

    r(x) = sum_j w_j f_j / (x - z_j)  /  sum_j w_j / (x - z_j),

by the AAA algorithm: Y. Nakatsukasa, O. Sete and L. N. Trefethen, "The AAA
algorithm for rational approximation", SIAM J. Sci. Comput. 40(3), A1494-A1522,
2018 (greedy choice of support points z_j where the error is largest, weights
from the smallest singular vector of the Loewner matrix, poles and zeros as
eigenvalues of an arrowhead pencil). r is exact at its support points.

`fit_sweep` drives the solver adaptively:

1. solve at `n_initial` Chebyshev-Lobatto frequencies of [f_lo, f_hi] (ends
   included: nothing is ever extrapolated);
2. fit all samples with AAA (at most (n + 1) // 2 support points, so that the
   rational is determined by the samples: a type (m-1, m-1) rational has 2m - 1
   parameters; exact at its support points, the other samples matched to 1e-13);
3. the candidate fits are the leave-one-out fits (each sample left out in turn,
   as in cross-validation); a sample's leave-one-out error says how well the
   fit is pinned down around it. The test frequencies are the midpoints of the
   `checks` sample intervals whose end samples have the largest such errors;
4. solve there and compare with the fit of step 2 (fresh solves it has not
   seen); add them and refit;
5. stop when the last fresh solves agreed with the fit to |r - F| <= rtol |F| +
   atol and the new fit's largest leave-one-out error is also within that (so
   the fit holds with any one sample fewer); else go to 3.

`max_error` is the last check's error (fresh solves against the fit that had
not seen them) and `loo_error` the final fit's largest leave-one-out error;
both are at most rtol when `converged`. On the sweeps measured (a folded
dipole, a loop through antiresonance and resonance, dipoles over 2:1 and 3:1
bands) the fit then agrees with the full 81-point sweep to 1e-8 relative or
better at rtol = 1e-6: the leave-one-out test is conservative.

Only numpy here (no scipy): the module stays light to import.

Frequencies in hertz; values in the caller's units (ohms for an impedance).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..errors import FabplanError
from ..logs import log

__all__ = ["aaa", "Barycentric", "fit_sweep", "FittedSweep", "Resonance", "SwrMinimum",
           "chebyshev_points", "DEFAULT_RTOL", "DEFAULT_INITIAL", "DEFAULT_MAX_SOLVES",
           "AAA_RTOL", "TOUCH_TOL", "touch_candidates"]


FloatArray = NDArray[np.float64]
ComplexArray = NDArray[np.complex128]

DEFAULT_RTOL = 1e-6  # relative agreement of the fit with fresh solves
DEFAULT_INITIAL = 7  # first solves, Chebyshev-Lobatto over the band
DEFAULT_MAX_SOLVES = 48
AAA_RTOL = 1e-13  # AAA stops when every sample is matched to this (relative)
_SCAN = 4096  # dense grid for roots and minima of the fitted function
TOUCH_TOL = 1e-6  # |X| / |Z| below which a reactance that touches zero counts as a zero
_EDGE = 1e-12  # relative slack at the band's ends


# -- AAA ------------------------------------------------------------------------------------
@dataclass(frozen=True)
class Barycentric:
    """A rational function in barycentric form: support points `support` (m,),
    values there `values` (m,), weights `weights` (m,). `errors`: the largest
    (scaled) sample error after each AAA step."""

    support: ComplexArray
    values: ComplexArray
    weights: ComplexArray
    errors: tuple[float, ...] = ()

    @property
    def degree(self) -> int:
        """m - 1: the numerator and denominator degree."""
        return len(self.support) - 1

    def __call__(self, x: ArrayLike) -> ComplexArray:
        """r(x) for an array (or scalar) of points; exactly `values` at the support."""
        xa = np.asarray(x)
        flat = xa.reshape(-1).astype(complex)
        with np.errstate(divide="ignore", invalid="ignore"):
            c = 1.0 / (flat[:, None] - self.support[None, :])
            r = (c @ (self.weights * self.values)) / (c @ self.weights)
        hit_i, hit_j = np.nonzero(flat[:, None] == self.support[None, :])
        r[hit_i] = self.values[hit_j]
        return np.asarray(r.reshape(xa.shape), dtype=complex)

    def _pencil_roots(self, top: ComplexArray) -> ComplexArray:
        """Finite eigenvalues of the arrowhead pencil (E, B), E = [[0, top], [1, diag
        z]], B = diag(0, 1, ..., 1): the zeros of sum_j top_j / (x - z_j). numpy has no
        generalised eigensolver: a shift s turns it into eig((E - s B)^-1 B), whose
        eigenvalues mu = 1 / (x - s); the two infinite eigenvalues go to mu ~ 0. Each
        root is then polished by Newton's method on the partial-fraction sum."""
        m = len(self.support)
        if m < 2:
            return np.zeros(0, dtype=complex)
        e = np.zeros((m + 1, m + 1), dtype=complex)
        e[0, 1:] = top
        e[1:, 0] = 1.0
        e[1:, 1:] = np.diag(self.support)
        b = np.eye(m + 1, dtype=complex)
        b[0, 0] = 0.0
        z = self.support
        span = float(np.ptp(z.real) + np.ptp(z.imag)) or 1.0
        shift = complex(np.mean(z)) + span * (0.3183 + 0.5772j)
        mu = np.linalg.eigvals(np.linalg.solve(e - shift * b, b))
        keep = np.abs(mu) > 1e-7 / span
        roots = shift + 1.0 / mu[keep]
        if len(roots) > m - 1:  # drop the largest: the infinite ones that escaped
            roots = roots[np.argsort(np.abs(roots - shift))[:m - 1]]
        for _ in range(4):
            with np.errstate(divide="ignore", invalid="ignore"):
                d = roots[:, None] - z[None, :]
                g = (top / d).sum(axis=1)
                dg = -(top / d ** 2).sum(axis=1)
                step = g / dg
            ok = np.isfinite(step) & (np.abs(step) < 1e-3 * (np.abs(roots - shift) + span))
            roots = np.where(ok, roots - step, roots)
        return np.asarray(roots[np.argsort(roots.real)], dtype=complex)

    def poles(self) -> ComplexArray:
        """The poles (finite zeros of the denominator), sorted by real part."""
        return self._pencil_roots(self.weights)

    def zeros(self) -> ComplexArray:
        """The zeros (finite zeros of the numerator), sorted by real part."""
        return self._pencil_roots(self.weights * self.values)

    def residues(self, poles: ArrayLike | None = None) -> ComplexArray:
        """Residues N(p) / D'(p) at the poles."""
        p = self.poles() if poles is None else np.asarray(poles, dtype=complex)
        d = p[:, None] - self.support[None, :]
        n = ((self.weights * self.values) / d).sum(axis=1)
        dd = -(self.weights / d ** 2).sum(axis=1)
        return np.asarray(n / dd, dtype=complex)


def aaa(x: ArrayLike, f: ArrayLike, *, rtol: float = AAA_RTOL, mmax: int = 100,
        scale: ArrayLike | None = None) -> Barycentric:
    """The AAA rational approximation of samples f at distinct points x.

    Stops when every sample is matched to rtol * scale (per point; default the
    largest |f|, as in the paper) or at `mmax` support points. Support points are
    matched exactly; the other samples in the least-squares sense (rows of the
    Loewner matrix weighted by 1 / scale). With more than (n + 1) // 2 support
    points the rational is not determined by the samples (a null space of
    dimension > 1): keep mmax at or below that when the samples are few.
    """
    xs = np.asarray(x).reshape(-1).astype(complex)
    fs = np.asarray(f).reshape(-1).astype(complex)
    n = len(xs)
    if n == 0 or len(fs) != n:
        raise FabplanError("AAA needs as many values as points, at least one",
                           field="samples", value=(n, len(fs)))
    if not (np.all(np.isfinite(xs)) and np.all(np.isfinite(fs))):
        raise FabplanError("AAA samples must be finite", field="samples", value=None)
    if len(np.unique(xs)) != n:
        raise FabplanError("AAA sample points must be distinct", field="x", value=None)
    if mmax < 1:
        raise FabplanError("mmax must be at least 1", field="mmax", value=mmax)
    big = float(np.abs(fs).max())
    if scale is None:
        sc = np.full(n, big if big > 0 else 1.0)
    else:
        sc = np.broadcast_to(np.asarray(scale, dtype=float), (n,)).copy()
        if not np.all(sc > 0):
            raise FabplanError("AAA error scales must be positive", field="scale",
                               value=float(sc.min()))
    mmax = min(mmax, n)
    free = np.ones(n, dtype=bool)
    chosen: list[int] = []
    r = np.full(n, np.mean(fs), dtype=complex)
    cauchy = np.zeros((n, 0), dtype=complex)
    errors: list[float] = []
    w = np.ones(1, dtype=complex)
    for _ in range(mmax):
        err = np.abs(fs - r) / sc
        err[~free] = -1.0
        j = int(np.argmax(err))
        chosen.append(j)
        free[j] = False
        with np.errstate(divide="ignore", invalid="ignore"):
            col = 1.0 / (xs - xs[j])
        col[j] = 0.0
        cauchy = np.column_stack([cauchy, col])
        fj = fs[chosen]
        rows = cauchy[free]
        if rows.shape[0] == 0:
            # every sample is a support point: no equations left; weights of the
            # interpolant through all of them would be arbitrary: keep the last ones
            if len(chosen) > 1:
                chosen.pop()
                free[j] = True
                break
            w = np.ones(1, dtype=complex)
            r = np.full(n, fs[j])
            errors.append(0.0)
            break
        loewner = (fs[free][:, None] - fj[None, :]) * rows / sc[free][:, None]
        _, _, vh = np.linalg.svd(loewner, full_matrices=True)
        w = vh[-1].conj()
        num = rows @ (w * fj)
        den = rows @ w
        r = fs.copy()
        with np.errstate(divide="ignore", invalid="ignore"):
            r[free] = num / den
        r[~np.isfinite(r)] = np.inf
        e = float(np.max(np.abs(fs - r) / sc))
        errors.append(e)
        if e <= rtol:
            break
    support = xs[chosen]
    return Barycentric(support, fs[chosen], np.asarray(w[:len(chosen)], dtype=complex),
                       tuple(errors))


def chebyshev_points(n: int) -> FloatArray:
    """n Chebyshev-Lobatto points of [-1, 1], ascending (both ends included)."""
    if n < 2:
        raise FabplanError("at least two points", field="n", value=n)
    return np.asarray(-np.cos(np.pi * np.arange(n) / (n - 1)), dtype=float)


# -- the fitted sweep -----------------------------------------------------------------------
@dataclass(frozen=True)
class Resonance:
    """A zero of the reactance: `f_hz`, the resistance there (ohm), and its kind:
    "series" (X rises through zero: capacitive below, inductive above) or
    "parallel" (X falls through zero); `polished`: refined on the true model."""

    f_hz: float
    r_ohm: float
    kind: Literal["series", "parallel"]
    polished: bool


@dataclass(frozen=True)
class SwrMinimum:
    """A local minimum of SWR against `reference_ohm`: frequency (Hz), SWR,
    impedance there (ohm, as seen by the reference), and whether it lies at an
    end of the band (the true minimum may be outside)."""

    f_hz: float
    swr: float
    z_ohm: complex
    at_edge: bool


@dataclass(frozen=True)
class FittedSweep:
    """A rational fit of one or more values across [f_lo_hz, f_hi_hz].

    `fits`: one Barycentric per component, in the normalised frequency
    x = (f - f_mid) / f_half; `sample_hz` / `sample_x` / `samples` (n, k): every
    solve (Hz, normalised, values), ascending;
    `solves`: their number; `max_error`: the largest relative error of the
    fit at the last check's fresh solves; `loo_error`: the returned fit's largest
    leave-one-out error; `converged`: whether both met `rtol`; `rounds`: per round,
    (solves so far, the check's error, the checked fit's leave-one-out error);
    `scalar`: the solve function returned one value (not an array).
    """

    f_lo_hz: float
    f_hi_hz: float
    fits: tuple[Barycentric, ...]
    sample_hz: FloatArray
    sample_x: FloatArray
    samples: ComplexArray
    rtol: float
    atol: float
    max_error: float
    loo_error: float
    converged: bool
    rounds: tuple[tuple[int, float, float], ...]
    scalar: bool
    solve: Callable[[float], ArrayLike] | None = field(default=None, repr=False)

    @property
    def solves(self) -> int:
        return len(self.sample_hz)

    @property
    def _mid(self) -> float:
        return 0.5 * (self.f_lo_hz + self.f_hi_hz)

    @property
    def _half(self) -> float:
        return 0.5 * (self.f_hi_hz - self.f_lo_hz)

    def _x(self, freqs_hz: ArrayLike) -> FloatArray:
        f = np.asarray(freqs_hz, dtype=float)
        slack = _EDGE * max(abs(self.f_lo_hz), abs(self.f_hi_hz))
        if f.size and (not np.all(np.isfinite(f)) or f.min() < self.f_lo_hz - slack
                       or f.max() > self.f_hi_hz + slack):
            bad = f[~((f >= self.f_lo_hz - slack) & (f <= self.f_hi_hz + slack))]
            raise FabplanError(
                f"the fit covers {self.f_lo_hz / 1e6:.6g} to {self.f_hi_hz / 1e6:.6g} MHz "
                "only; it does not extrapolate: fit a wider band", field="frequency",
                value=float(bad.reshape(-1)[0]))
        x = (f - self._mid) / self._half
        # samples map back exactly onto their support points
        exact = np.searchsorted(self.sample_hz, f)
        exact = np.clip(exact, 0, len(self.sample_hz) - 1)
        hit = self.sample_hz[exact] == f
        return np.asarray(np.where(hit, self.sample_x[exact], x), dtype=float)

    def values(self, freqs_hz: ArrayLike, component: int = 0) -> ComplexArray:
        """The fitted component at each frequency (Hz), inside the band only."""
        if not 0 <= component < len(self.fits):
            raise FabplanError(f"component must lie in 0..{len(self.fits) - 1}",
                               field="component", value=component)
        return self.fits[component](self._x(freqs_hz))

    def z(self, freqs_hz: ArrayLike) -> ComplexArray:
        """The fitted first component (the impedance, ohm) at each frequency (Hz)."""
        return self.values(freqs_hz, 0)

    def poles_hz(self, component: int = 0) -> ComplexArray:
        """Poles of the fitted component as complex frequencies (Hz)."""
        return self._mid + self._half * self.fits[component].poles()

    def zeros_hz(self, component: int = 0) -> ComplexArray:
        """Zeros of the fitted component as complex frequencies (Hz)."""
        return self._mid + self._half * self.fits[component].zeros()

    # -- resonances and SWR minima --------------------------------------------------
    def _scan(self) -> FloatArray:
        return np.linspace(self.f_lo_hz, self.f_hi_hz, _SCAN + 1)

    def resonances(self, *, polish: bool = False, component: int = 0) -> list[Resonance]:
        """Zeros of the reactance Im r(f) in the band, found on a dense grid of the
        rational (4097 points) and refined by bisection on it to ~1e-13 relative.
        `polish`: refine each on the true model by secant steps (2-4 solves each;
        needs the solve function and a scalar fit)."""
        f = self._scan()
        x = self.values(f, component).imag
        out: list[Resonance] = []
        for i in np.nonzero(np.sign(x[:-1]) * np.sign(x[1:]) <= 0)[0]:
            if x[i] == 0 and i > 0 and out and out[-1].f_hz == f[i]:
                continue
            if x[i] == 0 and x[i + 1] == 0:
                continue

            def react(q: float) -> float:
                return float(self.values(np.array([q]), component)[0].imag)

            root = _bisect(react, float(f[i]), float(f[i + 1]), float(x[i]),
                           float(x[i + 1]), 1e-13 * float(f[i + 1]))
            kind: Literal["series", "parallel"] = "series" if x[i + 1] > x[i] else "parallel"
            done = False
            if polish:
                root, done = self._polish(root, component)
            r = float(self.values(np.array([root]), component)[0].real)
            out.append(Resonance(root, r, kind, done))
        out.extend(self._touches(f, x, component, {r.f_hz for r in out}))
        out.sort(key=lambda r: r.f_hz)
        # a reactance that dips a hair through zero and back (round-off around a touch)
        # is one touch, reported once at the middle, as when it stays a hair above
        merged: list[Resonance] = []
        step = float(f[1] - f[0])
        for res in out:
            if merged and res.f_hz - merged[-1].f_hz <= step and res.kind != merged[-1].kind:
                mid = 0.5 * (res.f_hz + merged[-1].f_hz)
                z = complex(self.values(np.array([mid]), component)[0])
                if abs(z.imag) <= TOUCH_TOL * abs(z):
                    first = merged.pop()
                    merged.append(Resonance(mid, z.real, first.kind, False))
                    continue
            merged.append(res)
        return merged

    def _touches(self, f: FloatArray, x: FloatArray, component: int,
                 found: set[float]) -> list[Resonance]:
        """Zeros of the reactance where it touches zero without changing sign: |X| has
        a local minimum of at most TOUCH_TOL |Z| (a loop whose tuning capacitor was
        solved for X = 0 where its coupling is critical touches the axis there; whether
        round-off puts that sample a hair above or below zero must not decide whether
        the resonance is reported)."""
        out: list[Resonance] = []
        for i in touch_candidates(x):
            lo, hi = float(f[i - 1]), float(f[i + 1])

            def size(q: float) -> float:
                return abs(float(self.values(np.array([q]), component)[0].imag))

            q = _golden_min(size, lo, hi, 1e-13 * hi)
            z = complex(self.values(np.array([q]), component)[0])
            if abs(z.imag) > TOUCH_TOL * abs(z) or q in found:
                continue
            kind: Literal["series", "parallel"] = "series" if x[i] > 0 else "parallel"
            out.append(Resonance(q, z.real, kind, False))
        return out

    def _polish(self, f0: float, component: int) -> tuple[float, bool]:
        if self.solve is None:
            raise FabplanError("polishing needs the solve function", field="polish",
                               value=True)
        h = 1e-6 * f0
        a, b = f0, min(f0 + h, self.f_hi_hz) if f0 + h <= self.f_hi_hz else f0 - h
        fa = float(np.imag(_component(self.solve(a), component)))
        fb = float(np.imag(_component(self.solve(b), component)))
        for _ in range(4):
            if fb == fa:
                break
            c = b - fb * (b - a) / (fb - fa)
            if not self.f_lo_hz <= c <= self.f_hi_hz:
                return f0, False
            a, fa = b, fb
            b = c
            if abs(b - a) <= 1e-11 * abs(b):
                return b, True
            fb = float(np.imag(_component(self.solve(b), component)))
        return b, abs(b - a) <= 1e-9 * abs(b)

    def swr_minima(self, reference_ohm: float = 50.0,
                   through: Callable[[ComplexArray, FloatArray], ComplexArray] | None = None
                   ) -> list[SwrMinimum]:
        """Local minima of the SWR of the fitted impedance against `reference_ohm`
        (after `through(z, f)`, e.g. a matching network's transformation, when given):
        a dense grid of the rational (4097 points), each interior minimum refined by
        golden-section search on it; a minimum at a band end is flagged `at_edge`."""
        if not reference_ohm > 0:
            raise FabplanError("the reference impedance must be positive",
                               field="reference_ohm", value=reference_ohm)

        def gamma(fr: FloatArray) -> tuple[FloatArray, ComplexArray]:
            z = self.z(fr)
            if through is not None:
                z = np.asarray(through(z, fr), dtype=complex)
            return np.asarray(np.abs((z - reference_ohm) / (z + reference_ohm)),
                              dtype=float), z

        f = self._scan()
        g, _ = gamma(f)
        out: list[SwrMinimum] = []
        n = len(f)
        for i in range(n):
            left = g[i - 1] if i > 0 else math.inf
            right = g[i + 1] if i < n - 1 else math.inf
            if not (g[i] <= left and g[i] < right) and not (g[i] < left and g[i] <= right):
                continue
            if 0 < i < n - 1:
                fmin = _golden_min(lambda q: float(gamma(np.array([q]))[0][0]),
                                   float(f[i - 1]), float(f[i + 1]), 1e-12 * float(f[i]))
            else:
                fmin = float(f[i])
            gm, zm = gamma(np.array([fmin]))
            s = (1 + gm[0]) / (1 - gm[0]) if gm[0] < 1 else math.inf
            out.append(SwrMinimum(fmin, float(s), complex(zm[0]), i in (0, n - 1)))
        return out


def touch_candidates(x: FloatArray) -> NDArray[np.intp]:
    """The samples (not at the ends) where |x| has a local minimum and x keeps one
    sign, not zero, across its neighbours: where a reactance may touch zero without
    crossing it (to be refined between the neighbours and judged by TOUCH_TOL)."""
    ax = np.abs(x)
    s = np.sign(x)
    return np.nonzero((ax[1:-1] <= ax[:-2]) & (ax[1:-1] <= ax[2:])
                      & (s[:-2] == s[1:-1]) & (s[1:-1] == s[2:]) & (s[1:-1] != 0))[0] + 1


def _component(value: ArrayLike, k: int) -> complex:
    arr = np.asarray(value, dtype=complex).reshape(-1)
    return complex(arr[k])


def _bisect(fun: Callable[[float], float], a: float, b: float, fa: float, fb: float,
            tol: float) -> float:
    """A sign change of `fun` in [a, b] by bisection (fa, fb: values at the ends)."""
    if fa == 0:
        return a
    if fb == 0:
        return b
    for _ in range(200):
        if b - a <= tol:
            break
        c = 0.5 * (a + b)
        fc = fun(c)
        if fc == 0:
            return c
        if (fc > 0) == (fa > 0):
            a, fa = c, fc
        else:
            b, fb = c, fc
    return a - fa * (b - a) / (fb - fa) if fb != fa else 0.5 * (a + b)


def _golden_min(fun: Callable[[float], float], lo: float, hi: float, tol: float) -> float:
    """Minimise a unimodal `fun` on [lo, hi] by golden-section search."""
    g = (math.sqrt(5) - 1) / 2
    a, b = lo, hi
    c, d = b - g * (b - a), a + g * (b - a)
    fc, fd = fun(c), fun(d)
    while b - a > tol:
        if fc <= fd:
            b, d, fd = d, c, fc
            c = b - g * (b - a)
            fc = fun(c)
        else:
            a, c, fc = c, d, fd
            d = a + g * (b - a)
            fd = fun(d)
    return c if fc <= fd else d


# -- the adaptive loop ------------------------------------------------------------------------
def _fit_all(xs: FloatArray, values: ComplexArray, floor: float, mmax: int | None = None
             ) -> list[Barycentric]:
    """AAA of each column with errors scaled by |F| + floor (a zero scale: the
    column's largest |F|), at most (n + 1) // 2 support points unless `mmax`."""
    n = len(xs)
    cap = (n + 1) // 2 if mmax is None else mmax
    out = []
    for k in range(values.shape[1]):
        col = values[:, k]
        scale = np.abs(col) + floor
        scale = np.where(scale > 0, scale, float(np.abs(col).max()) or 1.0)
        out.append(aaa(xs, col, rtol=AAA_RTOL, mmax=max(1, cap), scale=scale))
    return out


def _leave_one_out(xs: FloatArray, values: ComplexArray, floor: float) -> FloatArray:
    """For each sample i, the relative error |r_i(x_i) - F_i| / (|F_i| + floor) of the
    fit of all the other samples (the largest over components)."""
    n = len(xs)
    out = np.zeros(n)
    for i in range(n):
        keep = np.arange(n) != i
        for k, fit in enumerate(_fit_all(xs[keep], values[keep], floor)):
            f = values[i, k]
            e = abs(complex(fit(np.array([xs[i]]))[0]) - f) / (abs(f) + floor)
            out[i] = max(out[i], e if math.isfinite(e) else math.inf)
    return out


def _test_points(xs: FloatArray, loo: FloatArray, count: int) -> list[float]:
    """Midpoints of the `count` sample intervals whose end samples have the largest
    leave-one-out errors (the wider interval first on a tie)."""
    score = np.maximum(loo[:-1], loo[1:])
    width = np.diff(xs)
    order = np.lexsort((-width, -score))
    return [float(0.5 * (xs[k] + xs[k + 1])) for k in order[:count]]


def _as_row(value: ArrayLike, width: int | None) -> ComplexArray:
    arr = np.asarray(value, dtype=complex).reshape(-1)
    if arr.size == 0 or (width is not None and arr.size != width):
        raise FabplanError("the solve function must return one value, or the same number "
                           "of values at every frequency", field="solve", value=arr.size)
    if not np.all(np.isfinite(arr)):
        raise FabplanError("the solve function returned a value that is not finite",
                           field="solve", value=None)
    return arr


def fit_sweep(solve: Callable[[float], ArrayLike], f_lo_hz: float, f_hi_hz: float, *,
              rtol: float = DEFAULT_RTOL, atol: float = 0.0,
              n_initial: int = DEFAULT_INITIAL, max_solves: int = DEFAULT_MAX_SOLVES,
              checks: int = 2, guide: int | None = None) -> FittedSweep:
    """Fit `solve(f_hz)` (a complex value, e.g. the input impedance in ohm, or a
    1-D array of values, each fitted on its own) across [f_lo_hz, f_hi_hz] from as
    few solves as the tolerance allows (see the module notes).

    rtol / atol: a fresh solve F is reproduced when |r - F| <= rtol |F| + atol for
    every component (default 1e-6 relative; `max_error` is |r - F| / (|F| + atol /
    rtol)); n_initial: first solves (>= 3); checks: fresh solves per round (>= 1);
    max_solves: the budget. When the budget runs out first, the fit is returned with
    `converged` False (and a log warning). guide: the leave-one-out errors, which
    choose where to solve next and end the loop, are taken over the first `guide`
    components only (default: all); the fresh solves check every component.
    """
    if not (math.isfinite(f_lo_hz) and math.isfinite(f_hi_hz) and 0 < f_lo_hz < f_hi_hz):
        raise FabplanError("the band needs 0 < f_lo_hz < f_hi_hz", field="f_lo_hz/f_hi_hz",
                           value=(f_lo_hz, f_hi_hz))
    if not (rtol > 0 and atol >= 0):
        raise FabplanError("rtol must be positive and atol non-negative", field="rtol/atol",
                           value=(rtol, atol))
    if n_initial < 3:
        raise FabplanError("at least three initial solves", field="n_initial",
                           value=n_initial)
    if checks < 1:
        raise FabplanError("at least one check per round", field="checks", value=checks)
    if guide is not None and guide < 1:
        raise FabplanError("the leave-one-out needs one component at least", field="guide",
                           value=guide)
    if max_solves < n_initial + checks:
        raise FabplanError(f"the budget must allow the {n_initial} initial solves and one "
                           "round of checks", field="max_solves", value=max_solves)
    mid, half = 0.5 * (f_lo_hz + f_hi_hz), 0.5 * (f_hi_hz - f_lo_hz)

    def freq(x: float) -> float:
        return min(max(mid + half * x, f_lo_hz), f_hi_hz)

    xs_list = [float(x) for x in chebyshev_points(n_initial)]
    raw = solve(freq(xs_list[0]))
    scalar = np.ndim(raw) == 0
    first = _as_row(raw, None)
    width = first.size
    rows = [first] + [_as_row(solve(freq(x)), width) for x in xs_list[1:]]
    floor = atol / rtol
    rounds: list[tuple[int, float, float]] = []
    max_error = loo_max = math.inf
    converged = passed = False
    while True:
        order = np.argsort(xs_list)
        xs = np.asarray(xs_list, dtype=float)[order]
        vals = np.asarray(rows, dtype=complex)[order]
        fits = _fit_all(xs, vals, floor)
        loo = _leave_one_out(xs, vals if guide is None else vals[:, :guide], floor)
        loo_max = float(loo.max())
        if passed and loo_max <= rtol:
            converged = True
            break
        room = max_solves - len(xs_list)
        if room < 1:
            break
        tests = _test_points(xs, loo, min(checks, room))
        errs = []
        for x in tests:
            got = _as_row(solve(freq(x)), width)
            pred = np.array([f(np.array([x]))[0] for f in fits])
            errs.append(float(np.max(np.abs(pred - got) / (np.abs(got) + floor))))
            xs_list.append(x)
            rows.append(got)
        max_error = max(errs)
        passed = max_error <= rtol
        rounds.append((len(xs_list), max_error, loo_max))
        log.debug("rational fit: %d solves, check error %.3g, leave-one-out %.3g",
                  len(xs_list), max_error, loo_max)
    if not converged:
        log.warning("rational fit of %.6g-%.6g MHz did not reach rtol %g within %d solves "
                    "(last check %.3g, leave-one-out %.3g)", f_lo_hz / 1e6, f_hi_hz / 1e6,
                    rtol, max_solves, max_error, loo_max)
    sample_hz = np.array([freq(float(x)) for x in xs], dtype=float)
    return FittedSweep(float(f_lo_hz), float(f_hi_hz), tuple(fits), sample_hz, xs, vals, rtol,
                       atol, max_error, loo_max, converged, tuple(rounds), scalar, solve)
