"""Far field of a solved wire model: gain patterns, radiated power, efficiency.

The current on each segment is linear between its end values, so the radiation
vector N(r^) = sum over segments of t int I(l) exp(jk r^ . r(l)) dl is integrated
by Gauss quadrature (enough points for the segment's electrical length). The
radiation intensity is U = eta k^2 |N_transverse|^2 / (32 pi^2) (W/sr); gain
= 4 pi U / P_in (it includes the conductor loss), directivity = 4 pi U / P_rad.
Over a perfect ground the image currents are added and only the upper
half-space radiates.

Angles in radians: theta from +z, phi from +x in the xy plane.
"""

from __future__ import annotations

import math

import numpy as np

from .solver import C0, ETA0, Solution, WireModel

__all__ = ["radiation_vector", "intensity", "pattern", "directivity_pattern",
           "radiated_power", "radiation_efficiency", "principal_planes"]


def _directions(theta: np.ndarray, phi: np.ndarray) -> np.ndarray:
    st = np.sin(theta)
    return np.stack([st * np.cos(phi), st * np.sin(phi), np.cos(theta)], axis=-1)


def _sources(solution: Solution, model: WireModel
             ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Segments (start, direction, length) and currents at their ends, with the
    images over a ground plane (reversed horizontal current)."""
    seg = model.segments
    i0, i1 = model.segment_currents(solution)
    start, dirn, length = seg.start, seg.direction, seg.length
    if model.ground_z is not None:
        img = seg.mirrored(model.ground_z)
        # the image of current I along t flows as -I along the mirrored t
        start = np.vstack([start, img.start])
        dirn = np.vstack([dirn, img.direction])
        length = np.concatenate([length, img.length])
        i0 = np.concatenate([i0, -i0])
        i1 = np.concatenate([i1, -i1])
    return start, dirn, length, i0, i1


def radiation_vector(solution: Solution, model: WireModel, directions: np.ndarray) -> np.ndarray:
    """N (..., 3) in A m for unit `directions` (..., 3)."""
    k = 2 * math.pi * solution.f_hz / C0
    start, dirn, length, i0, i1 = _sources(solution, model)
    q = max(4, math.ceil(k * float(length.max()) * 2) + 2)
    x, w = np.polynomial.legendre.leggauss(q)
    u = (x + 1) / 2
    w = w / 2
    shape = directions.shape[:-1]
    dirs = directions.reshape(-1, 3)
    # points (S, q, 3) and the current there (S, q) times the weight and length
    pts = start[:, None, :] + dirn[:, None, :] * (length[:, None, None] * u[None, :, None])
    amp = (i0[:, None] * (1 - u) + i1[:, None] * u) * (w * length[:, None])
    out = np.zeros((len(dirs), 3), dtype=complex)
    chunk = max(1, 200_000 // max(1, pts.shape[0] * q))
    flat_pts = pts.reshape(-1, 3)
    flat_amp = amp.reshape(-1)
    for a in range(0, len(dirs), chunk):
        d = dirs[a:a + chunk]
        ph = np.exp(1j * k * (d @ flat_pts.T)) * flat_amp  # (D, S*q), segment-major
        out[a:a + chunk] = ph.reshape(len(d), len(length), q).sum(axis=2) @ dirn
    return out.reshape(*shape, 3)


def intensity(solution: Solution, model: WireModel, theta_rad: np.ndarray,
              phi_rad: np.ndarray) -> np.ndarray:
    """Radiation intensity U (W/sr) at 1 V, for broadcastable theta and phi (rad).
    Zero below a ground plane."""
    th, ph = np.broadcast_arrays(np.asarray(theta_rad, float), np.asarray(phi_rad, float))
    r = _directions(th, ph)
    n = radiation_vector(solution, model, r)
    nt = n - r * np.einsum("...k,...k", n, r)[..., None]
    k = 2 * math.pi * solution.f_hz / C0
    u = ETA0 * k * k / (32 * math.pi ** 2) * np.einsum("...k,...k", nt, nt.conj()).real
    if model.ground_z is not None:
        u = np.where(np.cos(th) < 0, 0.0, u)
    return u


def pattern(solution: Solution, model: WireModel, theta_rad: np.ndarray,
            phi_rad: np.ndarray) -> np.ndarray:
    """Gain (dBi, loss included) at each direction; -inf in a null or below ground."""
    u = intensity(solution, model, theta_rad, phi_rad)
    with np.errstate(divide="ignore"):
        return 10 * np.log10(4 * math.pi * u / solution.p_in_w)


def directivity_pattern(solution: Solution, model: WireModel, theta_rad: np.ndarray,
                        phi_rad: np.ndarray) -> np.ndarray:
    """Directivity (dBi, against the radiated power from the far-field integral)."""
    u = intensity(solution, model, theta_rad, phi_rad)
    with np.errstate(divide="ignore"):
        return 10 * np.log10(4 * math.pi * u / radiated_power(solution, model))


def radiated_power(solution: Solution, model: WireModel, n_theta: int = 48,
                   n_phi: int = 64) -> float:
    """Radiated power (W at 1 V) by integrating U over the sphere (or the upper
    half-space over ground): Gauss-Legendre in cos(theta), trapezoid in phi.
    Raise the point counts for elements several wavelengths long."""
    x, w = np.polynomial.legendre.leggauss(n_theta)
    if model.ground_z is not None:
        mu = (x + 1) / 2  # cos(theta) in [0, 1]
        wt = w / 2
    else:
        mu = x
        wt = w
    theta = np.arccos(mu)
    phi = np.arange(n_phi) * (2 * math.pi / n_phi)
    u = intensity(solution, model, theta[:, None], phi[None, :])
    return float(np.sum(u * wt[:, None]) * (2 * math.pi / n_phi))


def radiation_efficiency(solution: Solution, model: WireModel) -> float:
    """Radiated power (far-field integral) over input power."""
    return radiated_power(solution, model) / solution.p_in_w


def principal_planes(solution: Solution, model: WireModel, step_deg: float = 2.0
                     ) -> dict[str, tuple[np.ndarray, np.ndarray]]:
    """Gain (dBi) in the three principal planes, each as (angle_deg, gain_dbi):
    "xy" (theta 90 deg, phi 0..360), "xz" (phi 0, theta -180..180 through +x),
    "yz" (phi 90 deg, theta -180..180 through +y). Negative theta means phi + 180."""
    ang = np.arange(0.0, 360.0 + 1e-9, step_deg)
    rad = np.radians(ang)
    xy = pattern(solution, model, np.full_like(rad, math.pi / 2), rad)
    sweep = np.radians(np.arange(-180.0, 180.0 + 1e-9, step_deg))
    th = np.abs(sweep)
    out = {"xy": (ang, xy)}
    for name, base in (("xz", 0.0), ("yz", math.pi / 2)):
        ph = np.where(sweep < 0, base + math.pi, base)
        out[name] = (np.degrees(sweep), pattern(solution, model, th, ph))
    return out
