"""Internal impedance of a round conductor (skin effect), per unit length.

Solid round wire of radius a (Ramo, Whinnery & Van Duzer, Fields and Waves in
Communication Electronics, internal impedance of a round wire):

    Z = (gamma rho / (2 pi a)) I0(gamma a) / I1(gamma a),   gamma = (1 + j) / delta,

delta = sqrt(2 rho / (omega mu)). It tends to the DC resistance rho/(pi a^2) at
low frequency and to (1 + j) Rs/(2 pi a), Rs = sqrt(omega mu rho / 2), at high
frequency.

Tube of outer radius a and inner radius b = a - wall, current returning outside
(the outer-surface impedance of a tubular conductor, Schelkunoff 1934):

    Z = (gamma rho / (2 pi a)) [I0(ga) K1(gb) + K0(ga) I1(gb)] / [I1(ga) K1(gb) - K1(ga) I1(gb)]

with ga = gamma a, gb = gamma b; it tends to rho/(pi (a^2 - b^2)) at DC and to
the solid wire's value when the wall is many skin depths thick. The scaled
Bessel functions ive/kve keep it finite at any frequency.

Units: radius and wall in metres, resistivity in ohm metres, frequency in hertz;
the result in ohms per metre. Non-magnetic conductors (mu = mu0).
"""

from __future__ import annotations

import math

import numpy as np

from ..special import ive, kve

__all__ = ["MU0", "skin_depth", "surface_resistance", "internal_impedance"]

MU0 = 4e-7 * math.pi  # H/m (the classical value; the 2019 SI value differs by 1e-10)


def skin_depth(f_hz: float, resistivity_ohm_m: float) -> float:
    """Skin depth delta = sqrt(2 rho / (omega mu0)) (m)."""
    return math.sqrt(2 * resistivity_ohm_m / (2 * math.pi * f_hz * MU0))


def surface_resistance(f_hz: float, resistivity_ohm_m: float) -> float:
    """Rs = sqrt(omega mu0 rho / 2) (ohm)."""
    return math.sqrt(2 * math.pi * f_hz * MU0 * resistivity_ohm_m / 2)


def internal_impedance(f_hz: float, radius_m: float, resistivity_ohm_m: float,
                       wall_m: float | None = None) -> complex:
    """Internal impedance per unit length (ohm/m) of a round wire or tube.

    `wall_m` None or >= radius: solid wire; otherwise a tube with that wall.
    """
    a = radius_m
    rho = resistivity_ohm_m
    if f_hz <= 0:
        b = 0.0 if wall_m is None or wall_m >= a else a - wall_m
        return complex(rho / (math.pi * (a * a - b * b)))
    delta = skin_depth(f_hz, rho)
    gamma = (1 + 1j) / delta
    ga = gamma * a
    front = gamma * rho / (2 * math.pi * a)
    if wall_m is None or wall_m >= a:
        if abs(ga) < 1e-3:  # series: I0/I1 = 2/x + x/4 - x^3/96
            ratio = 2 / ga + ga / 4 - ga ** 3 / 96
        else:
            ratio = ive(0, ga) / ive(1, ga)
        return complex(front * ratio)
    b = a - wall_m
    gb = gamma * b
    if abs(ga) < 1e-2:
        # thin and slow: the DC resistance plus the first skin-effect term is enough
        return complex(rho / (math.pi * (a * a - b * b)))
    # I(ga) K(gb) = ive(ga) kve(gb) exp(Re ga - gb); I(gb) K(ga) carries
    # exp(Re gb - ga): their ratio exp(-(gamma + Re gamma)(a - b)) stays small
    scale = np.exp(-(gamma + gamma.real) * (a - b))
    num = ive(0, ga) * kve(1, gb) + kve(0, ga) * ive(1, gb) * scale
    den = ive(1, ga) * kve(1, gb) - kve(1, ga) * ive(1, gb) * scale
    return complex(front * num / den)
