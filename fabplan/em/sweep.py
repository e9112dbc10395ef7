"""Reading a frequency sweep: least SWR, resonance, bandwidths.

`analyse(model, chain, freqs)` sweeps a model through the matching chain and
finds the frequency of least SWR (refined by Brent's bounded minimiser between
the grid's neighbours), the resonance (the reactance's zero crossing nearest a
given frequency, refined by Brent's root finder) and the SWR bandwidths.

Pure: no files, no printing. Hz, ohm.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import Any, Protocol

import numpy as np

from ..feed import MatchChain
from ..measure.analysis import Band, swr_bands
from ..numeric import brentq, minimize_bounded
from .fitting import TOUCH_TOL, touch_candidates
from .records import UNCERTAINTY_FRAC, SweepResult

__all__ = ["Model", "Progress", "least_swr", "resonance", "bandwidths", "analyse", "SWR_LEVELS",
           "CHUNK"]

Progress = Callable[[int], None]
SWR_LEVELS = ("1.5", "2")
CHUNK = 8  # frequencies per solver call between progress reports


class Model(Protocol):
    """What a sweep needs of an electrical model."""

    unknowns: int

    def sweep(self, f_hz: np.ndarray) -> np.ndarray: ...

    def impedance(self, f_hz: float) -> complex: ...

    def solve(self, f_hz: float) -> Any: ...


def _sweep(model: Model, freqs: np.ndarray, progress: Progress | None) -> np.ndarray:
    if progress is None:
        return np.asarray(model.sweep(freqs), dtype=complex)
    out = []
    for i in range(0, len(freqs), CHUNK):
        part = freqs[i:i + CHUNK]
        out.append(np.asarray(model.sweep(part), dtype=complex))
        progress(len(part))
    return np.concatenate(out)


def _gamma_sys(model: Model, chain: MatchChain, f: float) -> float:
    z = complex(chain.at_radio(model.impedance(f), f))
    return abs((z - chain.system_ohm) / (z + chain.system_ohm))


def least_swr(model: Model, chain: MatchChain, freqs: np.ndarray, swr_sys: np.ndarray,
              rel_tol: float = 2e-6) -> tuple[float, float, bool]:
    """Frequency (Hz) and value of least SWR through the matching, refined
    between the sweep's neighbours of its lowest point by bounded Brent search.
    Returns (f, swr, at_edge); at_edge when the lowest point is a sweep end."""
    i = int(np.argmin(swr_sys))
    if i == 0 or i == len(freqs) - 1:
        return float(freqs[i]), float(swr_sys[i]), True
    lo, hi = float(freqs[i - 1]), float(freqs[i + 1])
    x_best, g = minimize_bounded(lambda f: _gamma_sys(model, chain, f), lo, hi,
                                 xatol=rel_tol * float(freqs[i]))
    s = (1 + g) / (1 - g) if g < 1 else math.inf
    if s > swr_sys[i]:  # the grid point itself is better (a kink): keep it
        return float(freqs[i]), float(swr_sys[i]), False
    return float(x_best), s, False


def resonance(model: Model, freqs: np.ndarray, z: np.ndarray, near_hz: float,
              rel_tol: float = 1e-7) -> float | None:
    """The reactance zero crossing nearest `near_hz` (Hz), refined by Brent's
    method; crossings from capacitive to inductive (series resonance) first."""
    x = z.imag
    idx = np.nonzero(np.sign(x[:-1]) * np.sign(x[1:]) <= 0)[0]
    if len(idx) == 0:
        return _touch(model, freqs, z, near_hz, rel_tol)
    rising = [i for i in idx if x[i] < x[i + 1]]
    pool = rising or list(idx)
    i = min(pool, key=lambda k: abs(0.5 * (freqs[k] + freqs[k + 1]) - near_hz))
    if x[i] == 0:
        return float(freqs[i])
    if x[i + 1] == 0:
        return float(freqs[i + 1])
    return float(brentq(lambda f: model.impedance(f).imag, float(freqs[i]),
                        float(freqs[i + 1]), xtol=rel_tol * float(freqs[i])))


_TOUCH_LOOK = 1e-2  # a local minimum of |X| / |Z| below this is refined for a touch


def _touch(model: Model, freqs: np.ndarray, z: np.ndarray, near_hz: float,
           rel_tol: float) -> float | None:
    """Where the reactance touches zero without changing sign (a loop whose tuning
    capacitor was solved for X = 0 at critical coupling): the local minimum of |X|
    nearest `near_hz` whose |X| is at most TOUCH_TOL |Z|, refined between the
    sweep's neighbours. Whether round-off leaves that sample a hair above or below
    zero must not decide whether the resonance is reported."""
    ax = np.abs(z.imag)
    inner = [int(i) for i in touch_candidates(z.imag) if ax[i] <= _TOUCH_LOOK * abs(z[i])]
    for i in sorted(inner, key=lambda k: abs(freqs[k] - near_hz)):
        lo, hi = float(freqs[i - 1]), float(freqs[i + 1])
        f_best, x_best = minimize_bounded(lambda f: abs(model.impedance(f).imag), lo, hi,
                                          xatol=rel_tol * float(freqs[i]))
        f_best, x_best = (f_best, x_best) if x_best <= ax[i] else (float(freqs[i]), ax[i])
        if x_best <= TOUCH_TOL * abs(z[i]):
            return float(f_best)
    return None


def bandwidths(freqs: np.ndarray, swr_sys: np.ndarray) -> tuple[Band, ...]:
    """The SWR bands around least SWR, one per level of SWR_LEVELS: the edges that
    lie inside the sweep (Hz), and which edge lies beyond it (fabplan.measure's
    reading, so that a predicted and a measured sweep are read alike)."""
    return swr_bands(freqs, swr_sys, tuple(float(k) for k in SWR_LEVELS))


def analyse(model: Model, chain: MatchChain, freqs: np.ndarray, *, progress: Progress | None = None,
            near_hz: float | None = None, efficiency: bool = True
            ) -> tuple[SweepResult, bool]:
    """Sweep `model` over `freqs` (Hz) and read the sweep through `chain`.

    Returns the SweepResult and whether least SWR lies at an end of the sweep.
    """
    freqs = np.asarray(freqs, dtype=float)
    z = _sweep(model, freqs, progress)
    s_term = np.atleast_1d(chain.swr_terminals(z))
    s_sys = np.atleast_1d(chain.swr_system(z, freqs))
    f_min, s_min, at_edge = least_swr(model, chain, freqs, s_sys)
    f_res = resonance(model, freqs, z, near_hz if near_hz is not None else f_min)
    bands = bandwidths(freqs, s_sys)
    eff = model.solve(f_min).efficiency if efficiency else None
    result = SweepResult(
        tuple(float(f) for f in freqs), tuple(complex(v) for v in z),
        tuple(float(v) for v in s_term), tuple(float(v) for v in s_sys),
        chain.reference_ohm, chain.system_ohm, chain.describe(), s_min, f_min, f_res,
        {k: b.width_hz for k, b in zip(SWR_LEVELS, bands)},
        None if eff is None else float(eff), UNCERTAINTY_FRAC, bands)
    return result, at_edge


