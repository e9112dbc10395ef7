"""King's three-term approximation for the centre-fed straight dipole (a test reference).

source: S. J. Orfanidis, Electromagnetic Waves and Antennas, chapter "Currents on Linear
Antennas", section "King's Three-Term Approximation" (read this session from the author's
published algorithm, the companion function `king`). The current is

    I(z) = A1 (sin k|z| - sin kh) + A2 (cos kz - cos kh) + A3 (cos(kz/2) - cos(kh/2)),

put into Hallen's equation sum_i A_i V_i(z) = C cos kz + V0 sin k|z| with
V_i(z) = (j eta / 2 pi) int_{-h}^{h} I_i(z') exp(-jkR)/R dz', R = sqrt(a^2 + (z - z')^2)
(the reduced kernel). King's approximation V_i(z) - V_i(h) ~ j X_i I_i(z) + R_i I_3(z)
(i = 1, 2) and V_3(z) - V_3(h) ~ Z_3 I_3(z), with the coefficients taken at
z_m = max(h - lambda/4, 0) for i = 1 and at z = 0 for i = 2, 3, gives four linear
equations for A1, A2, A3 and C; the input impedance is V0 / I(0). Written here from that
description, lengths in wavelengths; the integrals by scipy's adaptive quadrature.
"""

from __future__ import annotations

import math

import numpy as np
from scipy.integrate import quad

ETA0 = 376.730313


def _term(i: int, z: np.ndarray | float, h: float) -> np.ndarray:
    k = 2 * math.pi
    z = np.asarray(z, dtype=float)
    if i == 1:
        return np.sin(k * np.abs(z)) - math.sin(k * h)
    if i == 2:
        return np.cos(k * z) - math.cos(k * h)
    return np.cos(k * z / 2) - math.cos(k * h / 2)


def _potential(i: int, z: float, h: float, a: float) -> complex:
    """V_i(z) = (j eta / 2 pi) int_{-h}^{h} I_i(z') exp(-jkR)/R dz'."""
    k = 2 * math.pi

    def part(fn):  # type: ignore[no-untyped-def]
        pts = sorted({-h, 0.0, z, h})
        total = 0.0
        for lo, hi in zip(pts[:-1], pts[1:]):
            if hi - lo <= 0:
                continue
            total += quad(fn, lo, hi, limit=400, epsabs=1e-13, epsrel=1e-11)[0]
        return total

    def re(x: float) -> float:
        r = math.sqrt(a * a + (z - x) ** 2)
        return float(_term(i, x, h)) * math.cos(k * r) / r

    def im(x: float) -> float:
        r = math.sqrt(a * a + (z - x) ** 2)
        return -float(_term(i, x, h)) * math.sin(k * r) / r

    return 1j * ETA0 / (2 * math.pi) * complex(part(re), part(im))


def king_impedance(length: float, radius: float) -> complex:
    """Input impedance (ohm) of a centre-fed dipole `length` wavelengths long and `radius`
    wavelengths thick, by King's three-term approximation (Orfanidis's algorithm)."""
    k = 2 * math.pi
    h = length / 2
    zm = max(h - 0.25, 0.0)
    vh = [_potential(i, h, h, radius) for i in (1, 2, 3)]
    vd1 = _potential(1, zm, h, radius) - vh[0]
    vd2 = _potential(2, 0.0, h, radius) - vh[1]
    vd3 = _potential(3, 0.0, h, radius) - vh[2]
    x1 = vd1.imag / float(_term(1, zm, h))
    r1 = vd1.real / float(_term(3, zm, h))
    x2 = vd2.imag / float(_term(2, 0.0, h))
    r2 = vd2.real / float(_term(3, 0.0, h))
    z3 = vd3 / float(_term(3, 0.0, h))
    m = np.array([[1j * x1, 0, 0, 0], [0, 1j * x2, 0, -1], [r1, r2, z3, 0],
                  [vh[0], vh[1], vh[2], -math.cos(k * h)]], dtype=complex)
    rhs = np.array([1.0, 0.0, 0.0, math.sin(k * h)], dtype=complex)
    a1, a2, a3, _ = np.linalg.solve(m, rhs)
    i0 = a1 * float(_term(1, 0.0, h)) + a2 * float(_term(2, 0.0, h)) \
        + a3 * float(_term(3, 0.0, h))
    return complex(1.0 / i0)


def king_resonant_length(radius: float, lo: float = 0.42, hi: float = 0.5) -> float:
    """The length (wavelengths) near a half wave where King's reactance is zero."""
    from scipy.optimize import brentq

    return float(brentq(lambda x: king_impedance(x, radius).imag, lo, hi, xtol=1e-6))
