"""What a sweep says: resonance, least SWR, the SWR 1.5 and 2 bands, R at resonance.

Works on any sampled sweep, measured or predicted (`analyse_sweep` takes
arrays; `analyse` takes a `MeasuredSweep`). Frequencies in Hz, impedances in
ohm, SWR dimensionless. Every figure comes with two uncertainties:

- step: a bound on the interpolation error that the sweep's step allows;
- noise: one standard deviation propagated from the noise estimated in the
  data around the figure.

The `*_unc_*` properties add the two (a bound plus one standard deviation:
conservative, not a confidence level).

Methods
-------
Resonance is where X crosses zero, capacitive to inductive (rising, a series
resonance) preferred over inductive to capacitive; the crossing nearest
`near_hz` (default: the least-SWR frequency) is "the" resonance, all are
listed. A crossing between samples x0 < x1 is found by linear interpolation;
its step bound is the linear-interpolation error theorem,
|y(x) - p1(x)| <= (x - x0)(x1 - x)/2 max|y''| (any numerical analysis text,
e.g. Burden & Faires, Numerical Analysis, the Lagrange interpolation error
theorem [memory]), divided by the least of the secant slope and the fitted
slopes |y'| at the two samples to turn a value error into a frequency error
(y'' and y' from the local fit below). R at resonance is interpolated the
same way, its uncertainty adding dR/df times the frequency's uncertainty.

Least SWR is found on |Gamma|^2, which is a smooth (analytic) function of
frequency even where |Gamma| and SWR have a sharp dip: the vertex of a
least-squares parabola through the grid minimum and its neighbours. The
samples fitted are the smallest of QUAD_REGIONS (the minimum and its two
neighbours first, then the samples within a growing fraction of the way from
the least |Gamma|^2 to 1) whose fitted curvature stands CURVATURE_SNR standard
deviations clear of the noise, so that the vertex, a ratio of fitted
coefficients, is nearly linear in the noise; on a clean sweep that is the
parabola through three points. Its step error is what the fitted parabola
makes of the cubic term of the local fit, t/6 (x - x*)^3, doubled to cover the
estimate of t and higher terms (for three points this is the Taylor expansion
of the three-point vertex formula about the true minimum, derived here: with
y = k/2 u^2 + t/6 u^3 the vertex moves by about t h^2 / (6 k)); the value's
step error likewise.

The bands are found by walking from the grid minimum down and up until
|Gamma|^2 exceeds the level's ((L - 1)/(L + 1))^2 and interpolating that
crossing as above. An edge that lies beyond the sweep (the SWR is still below
the level at the sweep's first or last point) is reported as beyond, and the
edge inside the sweep is still reported: a band partly inside the sweep is
never "not reached" (fabplan issue 15). "Not reached" means the least SWR
itself is not below the level.

Noise is estimated from the residual of a least-squares polynomial (cubic
when the window holds at least 5 finite points) over a window of `window`
samples centred on the figure: sigma^2 = RSS / (m - degree - 1). It includes
any structure a cubic cannot follow over the window, so it is an upper
estimate on coarse sweeps. The same fit gives y'' and y''' for the step
bounds. Noise is propagated to a crossing through the local slope,
sigma_x = sigma sqrt((1 - t)^2 + t^2) / |y'| (t the interpolation fraction;
the law of propagation of uncertainty, JCGM 100:2008 (GUM), sec. 5.1 [memory]),
and to the parabola's vertex through the fit's covariance.

Checked by Monte Carlo (a series R-L-C, complex Gaussian noise on S11, 200 to 300
sweeps; tests/measure/test_measure_analysis.py): the stated noise matches the
spread of resonance, R and least-SWR frequency within a factor of about 1.3.
A known weakness: on dense, noisy sweeps the walk from the minimum stops at the
first sample across the level, which noise can bring early, so a band edge
spreads more than stated (about twice, at 401 samples with |S11| noise 0.002
per component, while agreeing within 1.3 at 41 samples and 0.003).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
import numpy.typing as npt

from ..errors import DesignError
from .sweep import (
    MIN_POINTS,
    FloatArray,
    MeasuredSweep,
    gamma_from_z,
    gamma_mag_from_swr,
)

__all__ = [
    "swr_bands",
    "DEFAULT_LEVELS",
    "DEFAULT_WINDOW",
    "Band",
    "BandEdge",
    "LeastSwr",
    "Resonance",
    "SweepAnalysis",
    "analyse",
    "analyse_sweep",
]

TOUCH_FRAC = 1e-3  # |X| / |Z| at or below which X that does not cross zero touches it

DEFAULT_LEVELS: tuple[float, ...] = (1.5, 2.0)
DEFAULT_WINDOW = 7
# candidate regions for the parabola at least SWR: the samples within each fraction of the way
# from the least |Gamma|^2 to 1 (0: the least sample and its two neighbours)
QUAD_REGIONS: tuple[float, ...] = (0.0, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1)
# the smallest region whose fitted curvature is this many of its standard deviations is used
# (so that the vertex, a ratio of fitted coefficients, is nearly linear in the noise)
CURVATURE_SNR = 5.0


def _mhz(f_hz: float) -> str:
    return f"{f_hz / 1e6:.3f} MHz"


@dataclass(frozen=True)
class Resonance:
    """An X = 0 crossing.

    frequency_hz (Hz) with its step bound and noise (Hz); r_ohm: R at the
    crossing (ohm) with its step bound and noise (ohm); rising: True when X
    goes from negative (capacitive) to positive (inductive) with frequency (a
    series resonance); slope_ohm_per_hz: dX/df across the crossing (ohm/Hz).
    """

    frequency_hz: float
    frequency_step_unc_hz: float
    frequency_noise_unc_hz: float
    r_ohm: float
    r_step_unc_ohm: float
    r_noise_unc_ohm: float
    rising: bool
    slope_ohm_per_hz: float

    @property
    def frequency_unc_hz(self) -> float:
        return self.frequency_step_unc_hz + self.frequency_noise_unc_hz

    @property
    def r_unc_ohm(self) -> float:
        return self.r_step_unc_ohm + self.r_noise_unc_ohm


@dataclass(frozen=True)
class LeastSwr:
    """The least SWR and where it lies.

    frequency_hz (Hz) with step bound and noise (Hz); swr with its step bound
    and noise (dimensionless); at_sweep_end: the lowest sample is the first or
    last of the sweep, so the true minimum may lie beyond it (then the step
    bound is the distance to the neighbouring sample and says nothing of how
    far beyond).
    """

    frequency_hz: float
    frequency_step_unc_hz: float
    frequency_noise_unc_hz: float
    swr: float
    swr_step_unc: float
    swr_noise_unc: float
    at_sweep_end: bool

    @property
    def frequency_unc_hz(self) -> float:
        return self.frequency_step_unc_hz + self.frequency_noise_unc_hz

    @property
    def swr_unc(self) -> float:
        return self.swr_step_unc + self.swr_noise_unc


@dataclass(frozen=True)
class BandEdge:
    """One edge of an SWR band: frequency (Hz), step bound (Hz), noise (Hz)."""

    frequency_hz: float
    step_unc_hz: float
    noise_unc_hz: float

    @property
    def unc_hz(self) -> float:
        return self.step_unc_hz + self.noise_unc_hz


@dataclass(frozen=True)
class Band:
    """Where the SWR stays below `level` around the least SWR.

    reached: the least SWR is below the level. lower, upper: the edges found
    inside the sweep (None when not reached or beyond the sweep);
    lower_beyond_sweep, upper_beyond_sweep: the SWR is still below the level at
    the sweep's first (last) sample, so that edge lies beyond the sweep.
    sweep_start_hz, sweep_stop_hz: the sweep's ends (Hz).
    """

    level: float
    reached: bool
    lower: BandEdge | None
    upper: BandEdge | None
    lower_beyond_sweep: bool
    upper_beyond_sweep: bool
    sweep_start_hz: float
    sweep_stop_hz: float

    @property
    def width_hz(self) -> float | None:
        """The band's width (Hz) when both edges lie inside the sweep, else None."""
        if self.lower is None or self.upper is None:
            return None
        return self.upper.frequency_hz - self.lower.frequency_hz

    @property
    def width_at_least_hz(self) -> float | None:
        """A lower bound on the width (Hz): from the lower edge (or the sweep's
        start) to the upper edge (or the sweep's end); None when not reached."""
        if not self.reached:
            return None
        lo = self.lower.frequency_hz if self.lower else self.sweep_start_hz
        hi = self.upper.frequency_hz if self.upper else self.sweep_stop_hz
        return hi - lo

    def describe(self) -> str:
        """One line, e.g. "SWR < 2: from below 400.000 MHz (the lower edge lies
        beyond the sweep's start) to 475.000 MHz"."""
        head = f"SWR < {self.level:g}"
        if not self.reached:
            return f"{head}: not reached (the least SWR is not below {self.level:g})"
        if self.lower is not None:
            lo = _mhz(self.lower.frequency_hz)
        else:
            lo = f"below {_mhz(self.sweep_start_hz)} (the lower edge lies beyond the sweep's start)"
        if self.upper is not None:
            hi = _mhz(self.upper.frequency_hz)
        else:
            hi = f"above {_mhz(self.sweep_stop_hz)} (the upper edge lies beyond the sweep's end)"
        text = f"{head}: from {lo} to {hi}"
        if self.width_hz is not None:
            text += f", {self.width_hz / 1e6:.3f} MHz wide"
        return text


@dataclass(frozen=True)
class SweepAnalysis:
    """What `analyse_sweep` found.

    resonance: the chosen X = 0 crossing, or None (see resonance_note);
    crossings: every X = 0 crossing in the sweep, by frequency;
    resonance_note: "" or why there is no resonance (no phase, or X does not
    cross zero, with the side the resonance lies on);
    least_swr; bands: one per level, in the order asked;
    z0_ohm: the reference of the SWR figures (ohm);
    sweep_start_hz, sweep_stop_hz, n_points, step_hz: the sweep (median step, Hz);
    window: samples in each local fit.
    """

    resonance: Resonance | None
    crossings: tuple[Resonance, ...]
    resonance_note: str
    least_swr: LeastSwr
    bands: tuple[Band, ...]
    z0_ohm: float
    sweep_start_hz: float
    sweep_stop_hz: float
    n_points: int
    step_hz: float
    window: int

    def band(self, level: float) -> Band:
        for b in self.bands:
            if math.isclose(b.level, level):
                return b
        raise DesignError("no band was computed at this SWR level", field="level", value=level)


# -- local fits ------------------------------------------------------------------
@dataclass(frozen=True)
class _Fit:
    """y ~ sum c_k u^k, u = (x - xc) / h; sigma: residual standard deviation."""

    coef: FloatArray
    xc: float
    h: float
    sigma: float

    def deriv(self, x: float, order: int) -> float:
        u = (x - self.xc) / self.h
        p = np.polynomial.polynomial.polyder(self.coef, order) if order else self.coef
        if len(p) == 0:
            return 0.0
        return float(np.polynomial.polynomial.polyval(u, p)) / self.h ** order


def _local_fit(x: FloatArray, y: FloatArray, lo: int, hi: int, window: int) -> _Fit:
    n = len(x)
    w = min(window, n)
    start = round((lo + hi) / 2 - (w - 1) / 2)
    start = max(0, min(start, n - w))
    xs, ys = x[start:start + w], y[start:start + w]
    ok = np.isfinite(ys)
    xs, ys = xs[ok], ys[ok]
    m = len(xs)
    xc = float(0.5 * (x[lo] + x[hi]))
    h = float(np.median(np.diff(xs))) if m >= 2 else 1.0
    if m == 0:
        return _Fit(np.zeros(1), xc, h, 0.0)
    deg = min(3, m - 2) if m >= 3 else m - 1
    u = (xs - xc) / h
    vander = u[:, None] ** np.arange(deg + 1)
    coef = np.linalg.lstsq(vander, ys, rcond=None)[0]
    dof = m - deg - 1
    sigma = float(np.sqrt(np.sum((ys - vander @ coef) ** 2) / dof)) if dof > 0 else 0.0
    return _Fit(np.asarray(coef, dtype=np.float64), xc, h, sigma)


def _crossing(x: FloatArray, y: FloatArray, i: int, level: float, window: int
              ) -> tuple[float, float, float, float, _Fit]:
    """Where y crosses `level` between samples i and i + 1: (x, step bound,
    noise, t, local fit)."""
    x0, x1, y0, y1 = float(x[i]), float(x[i + 1]), float(y[i]), float(y[i + 1])
    t = 0.0 if y1 == y0 else (level - y0) / (y1 - y0)
    xc = x0 + t * (x1 - x0)
    slope = abs((y1 - y0) / (x1 - x0))
    fit = _local_fit(x, y, i, i + 1, window)
    if slope == 0:
        return xc, 0.5 * (x1 - x0), 0.0, t, fit
    curv = max(abs(fit.deriv(x0, 2)), abs(fit.deriv(x1, 2)))
    # the value error over the least slope in the interval (secant or either end's)
    least = min(slope, abs(fit.deriv(x0, 1)), abs(fit.deriv(x1, 1)))
    least = least if least > 0 else slope
    step = min(curv * (xc - x0) * (x1 - xc) / 2 / least, x1 - x0)
    noise = fit.sigma * math.hypot(1 - t, t) / slope
    return xc, step, noise, t, fit


# -- the figures ---------------------------------------------------------------------
def _swr_of_g(g: float) -> float:
    m = math.sqrt(max(g, 0.0))
    return (1 + m) / (1 - m) if m < 1 else math.inf


def _swr_spread(g: float, dg: float) -> float:
    s = _swr_of_g(g)
    if dg <= 0 or not math.isfinite(s):
        return 0.0
    return max(abs(_swr_of_g(g + dg) - s), abs(s - _swr_of_g(max(g - dg, 0.0))))


def _quadratic(u: FloatArray, y: FloatArray) -> tuple[FloatArray, FloatArray] | None:
    """Least-squares y ~ c0 + c1 u + c2 u^2: coefficients and (V^T V)^-1."""
    vander = u[:, None] ** np.arange(3)
    gram = vander.T @ vander
    if np.linalg.cond(gram) > 1e12:
        return None
    inv = np.linalg.inv(gram)
    return np.asarray(inv @ (vander.T @ y), dtype=np.float64), np.asarray(inv, dtype=np.float64)


def _vertex_fit(f: FloatArray, g: FloatArray, i: int, lo: int, hi: int, window: int
                ) -> tuple[LeastSwr, bool] | None:
    """Least |Gamma|^2 from a least-squares parabola over samples lo..hi, and
    whether its curvature stands clear of the noise (CURVATURE_SNR)."""
    fit = _local_fit(f, g, lo, hi, max(window, hi - lo + 1))
    sig = fit.sigma
    h = float(np.median(np.diff(f[lo:hi + 1])))
    u = (f[lo:hi + 1] - f[i]) / h
    y = g[lo:hi + 1].astype(np.float64)
    q = _quadratic(u, y)
    if q is None or not q[0][2] > 0:
        return None
    (c0, c1, c2), inv = q
    us = -c1 / (2 * c2)
    if not u[0] <= us <= u[-1]:
        return None
    ys = c0 - c1 * c1 / (4 * c2)
    # noise: the fit's covariance sigma^2 (V^T V)^-1 through the vertex's gradient
    grad_u = np.array([0.0, -1 / (2 * c2), c1 / (2 * c2 * c2)])
    grad_y = np.array([1.0, -c1 / (2 * c2), c1 * c1 / (4 * c2 * c2)])
    u_noise = sig * math.sqrt(max(float(grad_u @ inv @ grad_u), 0.0))
    y_noise = sig * math.sqrt(max(float(grad_y @ inv @ grad_y), 0.0))
    # step: what the fitted parabola makes of a cubic term t/6 (u - u*)^3, doubled
    t = fit.deriv(float(f[i]) + us * h, 3) * h ** 3
    cq = inv @ (u[:, None] ** np.arange(3)).T @ (t / 6 * (u - us) ** 3)
    u_step = 2 * abs(float((cq[1] + 2 * cq[2] * us) / (2 * c2)))
    y_step = 2 * abs(float(cq[0] + cq[1] * us + cq[2] * us * us))
    ys = min(max(ys, 0.0), float(g[i]))
    f_step = max(u_step * h, 4 * float(np.finfo(float).eps) * float(f[i]))
    clear = c2 >= CURVATURE_SNR * sig * math.sqrt(max(float(inv[2, 2]), 0.0))
    return LeastSwr(float(f[i] + us * h), float(min(f_step, f[hi] - f[lo])),
                    float(u_noise * h), _swr_of_g(float(ys)), _swr_spread(float(ys), y_step),
                    _swr_spread(float(ys), y_noise), False), bool(clear)


def _least_swr(f: FloatArray, g: FloatArray, window: int) -> LeastSwr:
    n = len(f)
    i = int(np.argmin(g))
    if i == 0 or i == n - 1:
        fit = _local_fit(f, g, max(i - 1, 0), min(i + 1, n - 1), window)
        j = 1 if i == 0 else n - 2
        g0 = float(g[i])
        return LeastSwr(float(f[i]), abs(float(f[j] - f[i])), 0.0, _swr_of_g(g0), 0.0,
                        _swr_spread(g0, fit.sigma), True)
    best: LeastSwr | None = None
    tried: set[tuple[int, int]] = set()
    for frac in QUAD_REGIONS:
        limit = g[i] + frac * (1.0 - g[i])
        lo, hi = i - 1, i + 1
        while lo > 0 and g[lo - 1] <= limit:
            lo -= 1
        while hi < n - 1 and g[hi + 1] <= limit:
            hi += 1
        if (lo, hi) in tried:
            continue
        tried.add((lo, hi))
        got = _vertex_fit(f, g, i, lo, hi, window)
        if got is None:
            continue
        best = got[0]
        if got[1]:
            break
    if best is None:
        fit = _local_fit(f, g, i - 1, i + 1, window)
        g0 = float(g[i])
        return LeastSwr(float(f[i]), 0.5 * float(f[i + 1] - f[i - 1]), 0.0, _swr_of_g(g0), 0.0,
                        _swr_spread(g0, fit.sigma), False)
    return best


def _band(f: FloatArray, g: FloatArray, level: float, window: int) -> Band:
    n = len(f)
    start, stop = float(f[0]), float(f[-1])
    gl = ((level - 1) / (level + 1)) ** 2
    i = int(np.argmin(g))
    if not g[i] < gl:
        return Band(level, False, None, None, False, False, start, stop)
    edges: list[BandEdge | None] = []
    beyond: list[bool] = []
    for step in (-1, 1):
        j = i
        while 0 <= j + step < n and g[j + step] <= gl:
            j += step
        if not 0 <= j + step < n:
            edges.append(None)
            beyond.append(True)
            continue
        k = min(j, j + step)
        x, su, nu, _, _ = _crossing(f, g, k, gl, window)
        edges.append(BandEdge(x, su, nu))
        beyond.append(False)
    return Band(level, True, edges[0], edges[1], beyond[0], beyond[1], start, stop)


def swr_bands(freq_hz: npt.ArrayLike, swr: npt.ArrayLike,
              levels: Sequence[float] = DEFAULT_LEVELS,
              window: int = DEFAULT_WINDOW) -> tuple[Band, ...]:
    """The SWR bands of a sweep around its least SWR, one per level: the edges
    found inside the sweep, and which edge lies beyond it (the predicted sweep of
    the electrical stage and a measured one are read alike). Frequencies in Hz."""
    f = np.asarray(freq_hz, dtype=np.float64)
    s = np.asarray(swr, dtype=np.float64)
    mag = np.where(np.isfinite(s), (s - 1) / (s + 1), 1.0)
    g = np.minimum(mag, 1.0) ** 2
    w = max(3, min(window, len(f) if len(f) % 2 else len(f) - 1))
    return tuple(_band(f, g, float(level), w) for level in levels)


def _crossings(f: FloatArray, z: npt.NDArray[np.complex128], window: int
               ) -> tuple[Resonance, ...]:
    x, r = z.imag, z.real
    out: list[Resonance] = []
    for i in range(len(f) - 1):
        x0, x1 = x[i], x[i + 1]
        if not (math.isfinite(x0) and math.isfinite(x1) and math.isfinite(r[i])
                and math.isfinite(r[i + 1])):
            continue
        rising = x0 < 0 <= x1
        if not (rising or x0 > 0 >= x1):
            continue
        if x1 == 0 and i + 2 < len(f) and np.sign(x[i + 2]) == np.sign(x0):
            continue  # X comes to zero and goes back: a touch, not a crossing
        fc, f_step, f_noise, t, _ = _crossing(f, x, i, 0.0, window)
        h = float(f[i + 1] - f[i])
        rc = float(r[i] + t * (r[i + 1] - r[i]))
        dr = float(r[i + 1] - r[i]) / h
        rfit = _local_fit(f, r, i, i + 1, window)
        r_curv = max(abs(rfit.deriv(float(f[i]), 2)), abs(rfit.deriv(float(f[i + 1]), 2)))
        r_step = r_curv * (fc - f[i]) * (f[i + 1] - fc) / 2 + abs(dr) * f_step
        r_noise = math.hypot(rfit.sigma * math.hypot(1 - t, t), dr * f_noise)
        out.append(Resonance(fc, f_step, f_noise, rc, float(r_step), r_noise, bool(rising),
                             float((x1 - x0) / h)))
    return tuple(out)


def analyse_sweep(freq_hz: npt.ArrayLike, *, swr: npt.ArrayLike | None = None,
                  z_ohm: npt.ArrayLike | None = None, gamma_mag: npt.ArrayLike | None = None,
                  z0_ohm: float = 50.0, levels: Sequence[float] = DEFAULT_LEVELS,
                  near_hz: float | None = None, window: int = DEFAULT_WINDOW,
                  source: str = "") -> SweepAnalysis:
    """Analyse a sampled sweep.

    freq_hz: increasing frequencies (Hz). The SWR used for least SWR and the
    bands is `swr` if given, else `gamma_mag`'s, else that of `z_ohm` against
    `z0_ohm` (ohm). z_ohm: impedance (ohm) for the resonance (it may be at the
    element while `swr` is through the matching, as a predicted sweep has
    them); without it there is no resonance and the note says why.
    levels: SWR levels (> 1) of the bands; near_hz: pick the crossing nearest
    this frequency (default: the least-SWR frequency); window: samples in each
    local fit (3 to 101).
    """
    src = source or None
    f = np.asarray(freq_hz, dtype=np.float64)
    if f.ndim != 1 or len(f) < MIN_POINTS:
        raise DesignError(f"a sweep needs at least {MIN_POINTS} frequencies", field="freq_hz",
                          value=int(f.size), source=src)
    if not (np.all(np.isfinite(f)) and np.all(np.diff(f) > 0)):
        raise DesignError("frequencies must be finite and increasing", field="freq_hz",
                          value=f"{len(f)} values", source=src)
    if not (3 <= window <= 101):
        raise DesignError("a local fit's window holds 3 to 101 samples", field="window",
                          value=window, source=src)
    for level in levels:
        if not (math.isfinite(level) and level > 1):
            raise DesignError("an SWR level is a number above 1", field="levels", value=level,
                              source=src)
    z = None if z_ohm is None else np.asarray(z_ohm, dtype=np.complex128)
    if z is not None and z.shape != f.shape:
        raise DesignError("as many impedances as frequencies are needed", field="z_ohm",
                          value=f"{z.shape} for {f.shape}", source=src)
    if swr is not None:
        mag = gamma_mag_from_swr(swr)
    elif gamma_mag is not None:
        mag = np.asarray(gamma_mag, dtype=np.float64)
    elif z is not None:
        mag = np.abs(gamma_from_z(z, z0_ohm))
    else:
        raise DesignError("give the SWR, |Gamma| or the impedance", field="sweep",
                          value="(none)", source=src)
    if mag.shape != f.shape:
        raise DesignError("as many values as frequencies are needed", field="swr",
                          value=f"{mag.shape} for {f.shape}", source=src)
    g = np.where(np.isfinite(mag), np.minimum(mag, 1.0), 1.0) ** 2
    least = _least_swr(f, g, window)
    bands = tuple(_band(f, g, float(level), window) for level in levels)
    crossings: tuple[Resonance, ...] = ()
    resonance: Resonance | None = None
    if z is None:
        note = ("only the reflection magnitude is known (SWR or return loss), not its phase: "
                "the resonance (X = 0) cannot be found")
    else:
        crossings = _crossings(f, z, window)
        note = ""
        if crossings:
            near = least.frequency_hz if near_hz is None else near_hz
            pool = [c for c in crossings if c.rising] or list(crossings)
            resonance = min(pool, key=lambda c: abs(c.frequency_hz - near))
            if not resonance.rising:
                note = ("X crosses zero only from inductive to capacitive (a parallel "
                        "resonance) in this sweep")
        else:
            xs = z.imag[np.isfinite(z.imag)]
            ok = np.isfinite(z)
            k = int(np.argmin(np.where(ok, np.abs(z.imag), np.inf))) if np.any(ok) else 0
            touch = bool(np.any(ok)) and abs(z.imag[k]) <= TOUCH_FRAC * abs(z[k])
            if touch:
                note = (f"X comes to zero at {f[k] / 1e6:.4f} MHz without crossing it (a "
                        "touch: a capacitor-tuned loop at critical coupling does this); no "
                        "crossing to read a resonance from")
            elif len(xs) and np.all(xs < 0):
                note = ("X stays negative (capacitive) over the whole sweep: a series resonance "
                        "lies above it")
            elif len(xs) and np.all(xs > 0):
                note = ("X stays positive (inductive) over the whole sweep: a series resonance "
                        "lies below it")
            else:
                note = "X does not cross zero in the sweep"
    return SweepAnalysis(resonance, crossings, note, least, bands, float(z0_ohm), float(f[0]),
                         float(f[-1]), len(f), float(np.median(np.diff(f))), int(window))


def analyse(sweep: MeasuredSweep, *, levels: Sequence[float] = DEFAULT_LEVELS,
            near_hz: float | None = None, window: int = DEFAULT_WINDOW) -> SweepAnalysis:
    """`analyse_sweep` of a `MeasuredSweep` (SWR against its reference)."""
    return analyse_sweep(sweep.freq_hz, gamma_mag=sweep.gamma_mag, z_ohm=sweep.z_ohm,
                         z0_ohm=sweep.z0_ohm, levels=levels, near_hz=near_hz, window=window,
                         source=sweep.source)
