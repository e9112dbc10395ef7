"""The few special functions the electrical model needs, in plain numpy, so that
planning and building do not import scipy.special (about 0.15-0.2 s of start-up
on the bundled example, issue 16: scipy.special pulls scipy's array-API layer,
which loads numpy.testing, numpy.f2py and more).

- `ive(n, z)`, `kve(n, z)` for n = 0, 1 and complex z with |arg z| <= pi/4: the
  modified Bessel functions of the first and second kind, exponentially scaled as
  scipy.special.ive and kve are (ive = I e^-|Re z|, kve = K e^z). The skin-effect
  internal impedance of a wire or tube needs them on the ray arg z = pi/4.
  Near zero I is its power series (A&S 9.6.10). For |z| <= 30 they are
  integrals evaluated by the trapezoidal rule, which converges geometrically for
  these analytic, decaying or periodic integrands (L. N. Trefethen and J. A. C.
  Weideman, "The exponentially convergent trapezoidal rule", SIAM Review 56,
  2014; from memory):
      I_n(z) = (1/pi) int_0^pi exp(z cos t) cos(n t) dt        (periodic),
      K_n(z) = int_0^inf exp(-z cosh t) cosh(n t) dt,  Re z > 0
  (Abramowitz & Stegun 9.6.19 and 9.6.24). Beyond, the Hankel asymptotic
  expansions (A&S 9.7.1, 9.7.2), summed until the terms stop falling; the
  neglected exponentially small part of I is below e^(-2 Re z) < 1e-18 there.
- `ellipkm1(p)`: the complete elliptic integral of the first kind K(m) at
  m = 1 - p (scipy.special.ellipkm1's argument), by the arithmetic-geometric
  mean, K = pi / (2 AGM(1, sqrt(p))) (A&S 17.6), accurate as p -> 0 where the
  form K(m) loses digits.

Pure functions; scipy is used only by the tests, as the reference, on hundreds
of arguments (tests/test_special.py).
"""

from __future__ import annotations

import cmath
import math

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = ["ive", "kve", "ellipkm1"]

_ASYMPTOTIC_FROM = 30.0  # |z| from which the Hankel expansions are used
_PERIODIC_NODES = 128  # trapezoid nodes on [0, pi] for I (error far below 1e-16 for |z| <= 30)
_STEP = 0.08  # trapezoid step in t for K: error ~ exp(-pi^2 / (2 h)) ~ 1e-27
_DECAY = 50.0  # K's integrand is cut where Re z (cosh t - 1) reaches this (e^-50)


def _check(n: int, z: complex) -> complex:
    if n not in (0, 1):
        raise ValueError(f"order {n}: only orders 0 and 1 are implemented")
    z = complex(z)
    if z == 0 or abs(cmath.phase(z)) > math.pi / 4 + 1e-12:
        raise ValueError(f"argument {z}: needs z != 0 and |arg z| <= pi/4")
    return z


def _hankel_terms(n: int, z: complex, sign: float) -> complex:
    """sum_k sign^k a_k(n) / z^k of A&S 9.7.1/9.7.2, to its smallest term."""
    mu = 4.0 * n * n
    total = term = complex(1.0)
    last = math.inf
    for k in range(1, 200):
        term = term * sign * (mu - (2 * k - 1) ** 2) / (k * 8.0 * z)
        size = abs(term)
        if size >= last:  # the divergent tail begins: stop before it
            break
        total += term
        last = size
        if size < 1e-17 * abs(total):
            break
    return total


_THETA = np.linspace(0.0, math.pi, _PERIODIC_NODES + 1)
_W_THETA = np.full(_PERIODIC_NODES + 1, 1.0 / _PERIODIC_NODES)
_W_THETA[[0, -1]] *= 0.5
_COS_THETA = np.cos(_THETA)


def ive(n: int, z: complex) -> complex:
    """I_n(z) exp(-|Re z|) for n in (0, 1), |arg z| <= pi/4 (scipy.special.ive)."""
    z = _check(n, z)
    if abs(z) >= _ASYMPTOTIC_FROM:
        # I_n(z) ~ e^z / sqrt(2 pi z) sum (-1)^k a_k / z^k
        return complex(cmath.exp(1j * z.imag) / cmath.sqrt(2 * math.pi * z)
                       * _hankel_terms(n, z, -1.0))
    if abs(z) <= 2.0:
        # the power series (A&S 9.6.10); the integral would lose I_1's digits to
        # cancellation as z -> 0
        q = z * z / 4
        term = total = (z / 2) ** n / math.factorial(n)
        for k in range(1, 40):
            term = term * q / (k * (k + n))
            total += term
            if abs(term) < 1e-17 * abs(total):
                break
        return complex(total * math.exp(-abs(z.real)))
    # (1/pi) int_0^pi e^{z (cos t - 1)} cos(n t) dt, times e^{z - Re z} = e^{i Im z}
    f = np.exp(z * (_COS_THETA - 1.0))
    if n == 1:
        f = f * _COS_THETA
    return complex(np.dot(_W_THETA, f) * cmath.exp(1j * z.imag))


def kve(n: int, z: complex) -> complex:
    """K_n(z) exp(z) for n in (0, 1), |arg z| <= pi/4 (scipy.special.kve)."""
    z = _check(n, z)
    if abs(z) >= _ASYMPTOTIC_FROM:
        # K_n(z) ~ sqrt(pi / (2 z)) e^-z sum a_k / z^k
        return complex(cmath.sqrt(math.pi / (2 * z)) * _hankel_terms(n, z, 1.0))
    # int_0^inf e^{-z (cosh t - 1)} cosh(n t) dt, an even integrand: trapezoid from 0
    t_end = math.acosh(1.0 + _DECAY / z.real)
    t = np.arange(0.0, t_end + _STEP, _STEP)
    f = np.exp(-z * (np.cosh(t) - 1.0))
    if n == 1:
        f = f * np.cosh(t)
    return complex(_STEP * (f.sum() - 0.5 * f[0]))


def ellipkm1(p: ArrayLike) -> NDArray[np.float64]:
    """K(m) at m = 1 - p for 0 <= p <= 1 (scipy.special.ellipkm1); inf at p = 0."""
    p = np.asarray(p, dtype=float)
    if np.any((p < 0) | (p > 1)):
        raise ValueError("ellipkm1 needs 0 <= p <= 1")
    out = np.full(p.shape, np.inf)
    live = p > 0
    a = np.ones(int(live.sum()))
    b = np.sqrt(p[live])
    for _ in range(40):  # quadratic once a ~ b; about 13 steps for p = 1e-300
        if np.all(np.abs(a - b) <= 4e-16 * a):  # a few units in the last place
            break
        a, b = 0.5 * (a + b), np.sqrt(a * b)
    out[live] = math.pi / (2.0 * a)
    return out
