"""Far field of a solved wire model: gain, directivity, beam figures, polarisation, power.

Sources. Every segment carries a current that is linear between its end values
(`WireModel.segment_currents`). The radiation vector

    N(r^) = sum over segments of t L int_0^1 (I0 (1 - u) + I1 u) exp(j k r^ . r(u)) du

is integrated in closed form on each segment (no quadrature error), with the
phase referred to the centre of the structure. Over a perfect ground plane the
image currents (horizontal components reversed) are added and only the upper
half-space radiates.

Figures (time convention exp(j omega t), fields at unit distance with the
exp(-j k r) dropped):

- far field r E = -j k eta / (4 pi) N_transverse (V); radiation intensity
  U = eta k^2 |N_transverse|^2 / (32 pi^2) (W/sr);
- gain = 4 pi U / P_in (conductor loss included), directivity = 4 pi U / P_rad
  with P_rad the integral of U over the sphere (IEEE Std 145 definitions);
- P_rad by Gauss-Legendre quadrature in cos(theta) and the trapezoid rule in
  phi, the orders chosen from the electrical size k R of the structure (R the
  radius of the smallest centred box's corner sphere), so that the integral is
  exact to round-off for any length (see `quadrature_order`);
- polarisation: the field split into right- and left-hand circular parts,
  e_R = (theta^ - j phi^)/sqrt 2, e_L = (theta^ + j phi^)/sqrt 2; right-hand
  means clockwise rotation for an observer looking in the direction of
  propagation (IEEE Std 145 and IEEE Std 149, clause 11). Axial ratio
  (|E_R| + |E_L|) / ||E_R| - |E_L||.

Angles: theta from +z, phi from +x towards +y; radians in the array functions,
degrees in the records (`_deg`). Elevation = 90 deg - theta.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal, Protocol

import numpy as np
from numpy.typing import ArrayLike, NDArray

from ..errors import FabplanError
from .kernel import SegmentSet
from .solver import C0, ETA0, Solution

__all__ = ["radiation_vector", "intensity", "pattern", "directivity_pattern",
           "radiated_power", "radiation_efficiency", "principal_planes",
           "RadiatingModel", "SourceCurrents", "FarField", "far_field", "quadrature_order",
           "Pattern", "Beam", "Cut", "Cuts", "Polarisation", "PowerBalance",
           "DEFAULT_STEP_DEG", "CUT_STEP_DEG", "HALF_POWER_DB", "VERTICAL_LIMIT_DEG"]

FloatArray = NDArray[np.float64]
ComplexArray = NDArray[np.complex128]

DEFAULT_STEP_DEG = 5.0  # pattern grid step in theta and phi (the maximum is refined off-grid)
CUT_STEP_DEG = 1.0  # step of the principal-plane cuts
HALF_POWER_DB = 10 * math.log10(2.0)  # 3.0103 dB
VERTICAL_LIMIT_DEG = 1.0  # a forward direction this close to the zenith has no azimuth
_LINEAR_RATIO = 1e-9  # minor/major axis below this: linear polarisation (AR > 180 dB)
_CHUNK = 16_384  # directions x segments per block (temporaries stay in cache)
# refining a half-power edge from a 6 deg scan (a maximum from a 2 deg scan): scans of
# 10 steps, each a tenth of the last, three for an edge (to 0.006 deg) and two for a
# maximum (to 0.02 deg); an edge is then interpolated linearly (for a pattern smooth
# over a degree the error is below 1e-5 deg), a maximum's value is off by (0.01 deg)^2
# times the curvature (below 1e-7 relative)
_SCAN_DEG = 6.0
_REAR_SCAN_DEG = 2.0
_REFINE_POINTS = 10
_EDGE_ROUNDS = 3
_MAX_ROUNDS = 2


class RadiatingModel(Protocol):
    """What the far field needs from a model: its segments (metres), the current at
    each segment's start and end for a solution, and the ground plane's height (m)."""

    @property
    def segments(self) -> SegmentSet: ...

    @property
    def ground_z(self) -> float | None: ...

    def segment_currents(self, solution: Solution) -> tuple[np.ndarray, np.ndarray]: ...


@dataclass(frozen=True)
class SourceCurrents:
    """Line currents that radiate: straight segments with a current linear along each.

    start_m (S, 3), direction (S, 3) unit vectors, length_m (S,); i_start_a and
    i_end_a (S,) complex currents (A) at each segment's start and end along its
    direction; ground_z_m: height of a perfect ground plane (m), None in free space;
    p_in_w / p_loss_w: input and loss power (W) when known (from a solution), for
    gain and the power balance (p_in_w None: directivity only).
    """

    f_hz: float
    start_m: FloatArray
    direction: FloatArray
    length_m: FloatArray
    i_start_a: ComplexArray
    i_end_a: ComplexArray
    ground_z_m: float | None = None
    p_in_w: float | None = None
    p_loss_w: float = 0.0

    @classmethod
    def of(cls, solution: Solution, model: RadiatingModel) -> SourceCurrents:
        """The currents of a solved model (with its input and loss power)."""
        seg = model.segments
        i0, i1 = model.segment_currents(solution)
        return cls(float(solution.f_hz), np.asarray(seg.start, float),
                   np.asarray(seg.direction, float), np.asarray(seg.length, float),
                   np.asarray(i0, complex), np.asarray(i1, complex), model.ground_z,
                   float(solution.p_in_w), float(solution.p_loss_w))


def quadrature_order(k_r: float) -> tuple[int, int]:
    """Points (n_theta Gauss-Legendre in cos theta, n_phi trapezoid in phi) that
    integrate the radiation intensity of sources within radius R of the centre
    (k_r = k R, radians) to round-off.

    The radiation vector of such sources is a sum of spherical harmonics whose
    coefficients fall off like spherical Bessel functions j_l(k R), fast once l
    exceeds k R by a few (k R)^(1/3); with L = k R + 2 (k R)^(1/3) + 8 the power is
    exact to about 1e-12 (measured on wires 3 and 6 wavelengths long); U = |N_t|^2
    then has degree 2 L. The phi rule is exact for harmonics |m| < n_phi = 2 L + 2, after
    which the integrand is a polynomial of degree 2 L in cos theta: Gauss with
    n_theta = L + 1 points is exact for it (on [-1, 1] and on the half [0, 1]).
    """
    kr = max(0.0, float(k_r))
    big_l = math.ceil(kr + 2.0 * kr ** (1.0 / 3.0) + 8.0)
    return big_l + 1, 2 * big_l + 2


def _directions(theta: np.ndarray, phi: np.ndarray) -> FloatArray:
    st = np.sin(theta)
    return np.stack([st * np.cos(phi), st * np.sin(phi), np.cos(theta)], axis=-1)


_POLE = 1e-4  # rad: a strongest direction this close to the z axis is reported at phi 0


def _angles(d: np.ndarray) -> tuple[FloatArray, FloatArray]:
    """(theta, phi) in radians of unit directions (..., 3); phi in [0, 2 pi)."""
    theta = np.arccos(np.clip(d[..., 2], -1.0, 1.0))
    phi = np.mod(np.arctan2(d[..., 1], d[..., 0]), 2 * math.pi)
    return theta, phi


def _unit(v: np.ndarray) -> FloatArray:
    return np.asarray(v / np.linalg.norm(v, axis=-1, keepdims=True), dtype=float)


def _segment_weights(alpha: np.ndarray) -> tuple[ComplexArray, ComplexArray]:
    """g0 = int_0^1 (1 - u) exp(j alpha u) du and g1 = int_0^1 u exp(j alpha u) du
    for real alpha, without cancellation at small alpha:

        g0 = (1 - cos a)/a^2 + j (a - sin a)/a^2
        g1 = sin(a)/a - (1 - cos a)/a^2 + j ((1 - cos a)/a - (a - sin a)/a^2)

    with 1 - cos a = 2 sin^2(a/2) and (a - sin a)/a^2 by its series below 0.1."""
    h = 0.5 * alpha
    sh, ch = np.sin(h), np.cos(h)
    tiny = np.abs(h) < 1e-300
    with np.errstate(divide="ignore", invalid="ignore"):
        sinc_h = np.where(tiny, 1.0, sh / h)  # sin(a/2) / (a/2)
    c2 = 0.5 * sinc_h * sinc_h  # (1 - cos a) / a^2
    s1 = sinc_h * ch  # sin(a) / a
    b1 = alpha * c2  # (1 - cos a) / a
    a2 = alpha * alpha
    # (a - sin a)/a^2 = a/6 - a^3/120 + a^5/5040 - a^7/362880 (+ a^9/39916800: < 3e-17)
    d2 = alpha * (1 / 6 - a2 * (1 / 120 - a2 * (1 / 5040 - a2 * (1 / 362880))))
    big = np.abs(alpha) >= 0.1
    if np.any(big):
        ab = alpha[big]
        d2[big] = (ab - 2.0 * sh[big] * ch[big]) / (ab * ab)
    g0 = np.empty(alpha.shape, dtype=complex)
    g0.real, g0.imag = c2, d2
    g1 = np.empty(alpha.shape, dtype=complex)
    g1.real, g1.imag = s1 - c2, b1 - d2
    return g0, g1


class FarField:
    """The far field of some line currents at one frequency.

    Build with `far_field(solution, model)` or `FarField(SourceCurrents(...))`.
    The radiated power (far-field integral) is computed once, on first use.
    """

    def __init__(self, sources: SourceCurrents) -> None:
        if not (sources.f_hz > 0 and math.isfinite(sources.f_hz)):
            raise FabplanError("frequency must be positive", field="f_hz", value=sources.f_hz)
        n = len(sources.length_m)
        shapes = (np.shape(sources.start_m), np.shape(sources.direction),
                  np.shape(sources.i_start_a), np.shape(sources.i_end_a))
        if n == 0 or shapes != ((n, 3), (n, 3), (n,), (n,)):
            raise FabplanError("source currents need (S, 3) starts and directions and (S,) "
                               "lengths and end currents, S >= 1", field="sources",
                               value=(n, *shapes))
        self.sources = sources
        self.f_hz = float(sources.f_hz)
        self.k = 2 * math.pi * self.f_hz / C0
        self.ground_z = sources.ground_z_m
        start, dirn = sources.start_m, sources.direction
        length = sources.length_m
        i0, i1 = sources.i_start_a, sources.i_end_a
        if self.ground_z is not None:
            img_start = start.copy()
            img_start[:, 2] = 2 * self.ground_z - img_start[:, 2]
            img_dir = dirn.copy()
            img_dir[:, 2] = -img_dir[:, 2]
            # the image of current I along t flows as -I along the mirrored t
            start = np.vstack([start, img_start])
            dirn = np.vstack([dirn, img_dir])
            length = np.concatenate([length, length])
            i0 = np.concatenate([i0, -i0])
            i1 = np.concatenate([i1, -i1])
        ends = np.vstack([start, start + dirn * length[:, None]])
        centre = 0.5 * (ends.min(axis=0) + ends.max(axis=0))
        if self.ground_z is not None:
            centre[2] = self.ground_z
        self.centre_m = centre
        self.radius_m = float(np.linalg.norm(ends - centre, axis=1).max())
        self._start = start - centre
        self._dir = dirn
        self._length = length
        self._i0 = i0
        self._i1 = i1
        self._p_rad: float | None = None
        self._order: tuple[int, int] | None = None
        self._patterns: dict[float, Pattern] = {}

    # -- the field ------------------------------------------------------------------
    @property
    def wavelength_m(self) -> float:
        return C0 / self.f_hz

    def radiation_vector(self, directions: ArrayLike) -> ComplexArray:
        """N (..., 3) in A m for unit `directions` (..., 3), phase referred to the
        structure's centre (`centre_m`)."""
        d_all = np.asarray(directions, dtype=float)
        shape = d_all.shape[:-1]
        dirs = d_all.reshape(-1, 3)
        n_seg = len(self._length)
        out = np.zeros((len(dirs), 3), dtype=complex)
        chunk = max(1, _CHUNK // max(1, n_seg))
        lt = self._dir * self._length[:, None]  # (S, 3) t L
        k = self.k
        # the products with 3-vectors are written out: a BLAS call per block is slower
        # here, and its threads contend on a busy machine
        for a in range(0, len(dirs), chunk):
            d = dirs[a:a + chunk]
            dx, dy, dz = d[:, 0:1] * k, d[:, 1:2] * k, d[:, 2:3] * k
            st = self._start
            phase = dx * st[:, 0] + dy * st[:, 1] + dz * st[:, 2]  # (D, S) at segment starts
            alpha = dx * lt[:, 0] + dy * lt[:, 1] + dz * lt[:, 2]  # phase along each segment
            g0, g1 = _segment_weights(alpha)
            amp = np.exp(1j * phase)
            amp *= g0 * self._i0 + g1 * self._i1
            for c in range(3):
                out[a:a + chunk, c] = (amp * lt[:, c]).sum(axis=1)
        return out.reshape(*shape, 3)

    def field(self, theta_rad: ArrayLike, phi_rad: ArrayLike
              ) -> tuple[ComplexArray, ComplexArray]:
        """(r E_theta, r E_phi) in volts (the field times the distance, exp(-j k r)
        dropped) for broadcastable theta and phi (rad); zero below a ground plane."""
        th, ph = np.broadcast_arrays(np.asarray(theta_rad, float), np.asarray(phi_rad, float))
        n = self.radiation_vector(_directions(th, ph))
        ct, st, cp, sp = np.cos(th), np.sin(th), np.cos(ph), np.sin(ph)
        n_theta = n[..., 0] * ct * cp + n[..., 1] * ct * sp - n[..., 2] * st
        n_phi = -n[..., 0] * sp + n[..., 1] * cp
        c = -1j * self.k * ETA0 / (4 * math.pi)
        e_t, e_p = c * n_theta, c * n_phi
        if self.ground_z is not None:
            below = np.cos(th) < 0
            e_t = np.where(below, 0.0, e_t)
            e_p = np.where(below, 0.0, e_p)
        return np.asarray(e_t, complex), np.asarray(e_p, complex)

    def intensity(self, theta_rad: ArrayLike, phi_rad: ArrayLike) -> FloatArray:
        """Radiation intensity U (W/sr) for broadcastable theta and phi (rad)."""
        e_t, e_p = self.field(theta_rad, phi_rad)
        return np.asarray((np.abs(e_t) ** 2 + np.abs(e_p) ** 2) / (2 * ETA0), dtype=float)

    def _intensity_dirs(self, d: np.ndarray) -> FloatArray:
        th, ph = _angles(d)
        return self.intensity(th, ph)

    # -- power ------------------------------------------------------------------------
    def quadrature(self) -> tuple[int, int]:
        """(n_theta, n_phi) used for the radiated power (see `quadrature_order`)."""
        if self._order is None:
            self._order = quadrature_order(self.k * self.radius_m)
        return self._order

    def radiated_power(self, n_theta: int | None = None, n_phi: int | None = None) -> float:
        """Radiated power (W): U integrated over the sphere (the upper half-space
        over ground). Without point counts, the orders follow from the electrical
        size (exact to round-off) and the result is cached."""
        if n_theta is None and n_phi is None and self._p_rad is not None:
            return self._p_rad
        auto_t, auto_p = self.quadrature()
        nt = auto_t if n_theta is None else int(n_theta)
        npf = auto_p if n_phi is None else int(n_phi)
        if nt < 1 or npf < 1:
            raise FabplanError("quadrature needs at least one point", field="n_theta/n_phi",
                               value=(nt, npf))
        x, w = np.polynomial.legendre.leggauss(nt)
        if self.ground_z is not None:
            mu, wt = (x + 1) / 2, w / 2  # cos(theta) in [0, 1]
        else:
            mu, wt = x, w
        theta = np.arccos(mu)
        phi = np.arange(npf) * (2 * math.pi / npf)
        u = self.intensity(theta[:, None], phi[None, :])
        p = float(np.sum(u * wt[:, None]) * (2 * math.pi / npf))
        if n_theta is None and n_phi is None:
            self._p_rad = p
        return p

    def _p_in(self) -> float:
        p = self.sources.p_in_w
        if p is None or not p > 0:
            raise FabplanError("gain needs the input power of a solved model; use the "
                               "directivity for given currents", field="p_in_w", value=p)
        return float(p)

    def power_balance(self) -> PowerBalance:
        """Input power against conductor loss plus the integrated radiated power."""
        p_in = self._p_in()
        p_rad = self.radiated_power()
        nt, npf = self.quadrature()
        loss = float(self.sources.p_loss_w)
        return PowerBalance(p_in, loss, p_rad, (p_in - loss - p_rad) / p_in,
                            p_rad / p_in, nt, npf)

    # -- gain -------------------------------------------------------------------------
    def gain(self, theta_rad: ArrayLike, phi_rad: ArrayLike) -> FloatArray:
        """Gain 4 pi U / P_in (ratio, loss included)."""
        return 4 * math.pi * self.intensity(theta_rad, phi_rad) / self._p_in()

    def gain_dbi(self, theta_rad: ArrayLike, phi_rad: ArrayLike) -> FloatArray:
        """Gain in dBi; -inf in a null or below a ground plane."""
        with np.errstate(divide="ignore"):
            return np.asarray(10 * np.log10(self.gain(theta_rad, phi_rad)), dtype=float)

    def directivity_dbi(self, theta_rad: ArrayLike, phi_rad: ArrayLike) -> FloatArray:
        """Directivity 4 pi U / P_rad in dBi (P_rad from the far-field integral)."""
        u = self.intensity(theta_rad, phi_rad)
        with np.errstate(divide="ignore"):
            return np.asarray(10 * np.log10(4 * math.pi * u / self.radiated_power()),
                              dtype=float)

    def _db(self, u: np.ndarray) -> FloatArray:
        """dBi of intensities: gain when the input power is known, else directivity."""
        p = self.sources.p_in_w
        ref = float(p) if p is not None and p > 0 else self.radiated_power()
        with np.errstate(divide="ignore"):
            return np.asarray(10 * np.log10(4 * math.pi * np.asarray(u) / ref), dtype=float)

    @property
    def has_gain(self) -> bool:
        return self.sources.p_in_w is not None and self.sources.p_in_w > 0

    # -- the pattern grid and its maximum --------------------------------------------------
    def pattern(self, step_deg: float = DEFAULT_STEP_DEG) -> Pattern:
        """Gain and directivity on a theta/phi grid: theta 0..180 deg (0..90 over
        ground), phi 0..360 deg (end excluded), both by `step_deg`; the maximum is
        searched off the grid from the best grid point (to about 1e-4 deg). Cached
        per step (the arrays are shared: do not modify them)."""
        if not (0 < step_deg <= 90) or abs(180 / step_deg - round(180 / step_deg)) > 1e-9:
            raise FabplanError("the grid step must divide 180 degrees", field="step_deg",
                               value=step_deg)
        key = float(step_deg)
        if key in self._patterns:
            return self._patterns[key]
        top = 90.0 if self.ground_z is not None else 180.0
        theta = np.linspace(0.0, top, round(top / step_deg) + 1)
        phi = np.arange(round(360 / step_deg), dtype=float) * step_deg
        u = self.intensity(np.radians(theta)[:, None], np.radians(phi)[None, :])
        i, j = np.unravel_index(int(np.argmax(u)), u.shape)
        start = _directions(np.radians(theta[i]), np.radians(phi[j]))
        d, u_max = self._refine_max(start, math.radians(step_deg) / 2)
        th, ph = _angles(d)
        if math.sin(float(th)) < _POLE:  # at the zenith or nadir phi means nothing:
            ph = np.zeros_like(ph)  # say 0, not what round-off left in x and y
        p_rad = self.radiated_power()
        with np.errstate(divide="ignore"):
            dir_db = 10 * np.log10(4 * math.pi * u / p_rad)
            max_dir = 10 * math.log10(4 * math.pi * u_max / p_rad) if u_max > 0 else -math.inf
        gain_db = self._db(u) if self.has_gain else None
        max_gain = float(self._db(np.array(u_max))) if self.has_gain else None
        eff = p_rad / self._p_in() if self.has_gain else None
        out = Pattern(theta, phi, gain_db, dir_db, max_gain, max_dir,
                      float(math.degrees(float(th))), float(math.degrees(float(ph))), eff)
        self._patterns[key] = out
        return out

    def maximum(self, step_deg: float = DEFAULT_STEP_DEG) -> tuple[float, float, float]:
        """(theta_deg, phi_deg, dBi) of the strongest direction (gain when the input
        power is known, else directivity)."""
        p = self.pattern(step_deg)
        value = p.max_gain_dbi if p.max_gain_dbi is not None else p.max_directivity_dbi
        return p.max_theta_deg, p.max_phi_deg, value

    def _refine_max(self, d0: np.ndarray, step: float, tol: float = 2e-6
                    ) -> tuple[FloatArray, float]:
        """Compass search on the sphere for the largest intensity from `d0`: try 8
        directions at angle `step` around the current best, move to a better one or
        halve the step."""
        d = _unit(np.asarray(d0, float))
        u = float(self._intensity_dirs(d[None, :])[0])
        ang = np.arange(8) * (math.pi / 4)
        h = step
        for _ in range(400):
            if h < tol:
                break
            e1, e2 = _frame(d)
            cand = _unit(np.cos(h) * d + np.sin(h) * (np.cos(ang)[:, None] * e1
                                                      + np.sin(ang)[:, None] * e2))
            if self.ground_z is not None:
                cand[:, 2] = np.maximum(cand[:, 2], 0.0)
                cand = _unit(cand)
            uc = self._intensity_dirs(cand)
            k = int(np.argmax(uc))
            if uc[k] > u:
                d, u = cand[k], float(uc[k])
            else:
                h /= 2
        return d, u

    # -- cuts and beam figures -------------------------------------------------------------
    def _forward(self, forward_deg: tuple[float, float] | None) -> tuple[FloatArray, float]:
        if forward_deg is None:
            th, ph, _ = self.maximum()
        else:
            th, ph = float(forward_deg[0]), float(forward_deg[1])
            if not 0 <= th <= 180:
                raise FabplanError("theta must lie in 0..180 degrees", field="forward theta",
                                   value=th)
            if self.ground_z is not None and th > 90:
                raise FabplanError("over ground the forward direction must be above the "
                                   "horizon (theta <= 90 deg)", field="forward theta", value=th)
        return _directions(np.radians(th), np.radians(ph)), ph

    def cuts(self, forward_deg: tuple[float, float] | None = None,
             step_deg: float = CUT_STEP_DEG) -> Cuts:
        """Azimuth and elevation cuts through the forward direction (given as
        (theta_deg, phi_deg), or the maximum).

        Azimuth cut: the cone of constant elevation through the forward direction,
        angle = azimuth phi in 0..360 deg. Elevation cut: the vertical plane through
        the forward azimuth, angle = elevation from the forward horizon: 0..180 deg
        over ground (forward horizon, zenith, rear horizon), -180..180 in free space.
        Values are gain (dBi) for a solved model, directivity for given currents.
        """
        if not 0 < step_deg <= 45:
            raise FabplanError("the cut step must lie in (0, 45] degrees", field="step_deg",
                               value=step_deg)
        f, ph_f = self._forward(forward_deg)
        th_f = float(np.arccos(np.clip(f[2], -1, 1)))
        az = np.arange(0.0, 360.0 + 1e-9, step_deg)
        az_db = self._db(self.intensity(np.full(az.shape, th_f), np.radians(az)))
        lo = 0.0 if self.ground_z is not None else -180.0
        el = np.arange(lo, 180.0 + 1e-9, step_deg)
        el_db = self._db(self._intensity_dirs(_vertical_plane(math.radians(ph_f),
                                                              np.radians(el))))
        what = "gain_dbi" if self.has_gain else "directivity_dbi"
        return Cuts(Cut("azimuth", az, az_db, what, 90.0 - math.degrees(th_f)),
                    Cut("elevation", el, el_db, what, ph_f % 360.0),
                    math.degrees(th_f), ph_f % 360.0)

    def beam(self, forward_deg: tuple[float, float] | None = None) -> Beam:
        """Front-to-back, front-to-rear and half-power beamwidths about the forward
        direction ((theta_deg, phi_deg), or the maximum).

        - Back: exactly opposite the forward direction in free space; over ground
          (where that lies below the ground), the same elevation at the opposite
          azimuth (phi + 180 deg). front_to_back_db = forward - back (dB).
        - Rear: the worst (strongest) direction of the rear half of the azimuth cut
          at the forward elevation (azimuths 90 to 270 deg from the forward one,
          ends included; common practice, no source). front_to_rear_db = forward -
          rear.
        - Half-power beamwidth (IEEE Std 145): in two planes containing the forward
          direction f: "horizontal" through f and h = z x f (the azimuth plane for a
          horizontal f) and "vertical" through f and f x h (the elevation plane),
          the angle between the nearest directions on either side where the
          intensity falls to half the forward intensity; each edge is found on the
          true pattern (a scan, then finer scans and interpolation to 1e-5 deg). A
          side without such a direction (not within 180 deg, or below the ground)
          gives None for that edge and for the width.

        Azimuth-based figures are None for a forward direction within
        `VERTICAL_LIMIT_DEG` of the vertical (no azimuth), except the front-to-back
        in free space.
        """
        f, ph_f = self._forward(forward_deg)
        u_f = float(self._intensity_dirs(f[None, :])[0])
        if not u_f > 0:
            raise FabplanError("the forward direction is a null of the pattern",
                               field="forward", value=forward_deg)
        th_f = float(np.arccos(np.clip(f[2], -1, 1)))
        vertical = min(th_f, math.pi - th_f) < math.radians(VERTICAL_LIMIT_DEG)
        g_f = float(self._db(np.array(u_f)))
        # back
        back: FloatArray | None
        if self.ground_z is None:
            back = -f
        elif vertical:
            back = None
        else:
            back = _directions(np.array(th_f), np.radians(ph_f) + np.array(math.pi))
        g_back = fb = None
        if back is not None:
            g_back = float(self._db(self._intensity_dirs(back[None, :]))[0])
            fb = g_f - g_back
        # rear: worst of the rear half of the azimuth cone at the forward elevation
        g_rear = fr = rear_phi = None
        if not vertical:
            rear_phi, u_rear = self._rear_max(th_f, math.radians(ph_f))
            g_rear = float(self._db(np.array(u_rear)))
            fr = g_f - g_rear
            rear_phi = math.degrees(rear_phi) % 360.0
        # beamwidths in the two planes through f: the four edges found together
        h = np.array([-math.sin(math.radians(ph_f)), math.cos(math.radians(ph_f)), 0.0])
        v = np.cross(f, h)
        lo_h, hi_h, lo_v, hi_v = self._edges(f, ((h, -1.0), (h, 1.0), (v, -1.0), (v, 1.0)),
                                             u_f)
        widths = []
        for lo, hi in ((lo_h, hi_h), (lo_v, hi_v)):
            width = None if lo is None or hi is None else hi - lo
            widths.append((lo, hi, width))
        back_th = back_ph = None
        if back is not None:
            bt, bp = _angles(back)
            back_th, back_ph = math.degrees(float(bt)), math.degrees(float(bp))
        return Beam(math.degrees(th_f), ph_f % 360.0, g_f, self.has_gain,
                    back_th, back_ph, g_back, fb, rear_phi, g_rear, fr,
                    widths[0][2], widths[1][2], (widths[0][0], widths[0][1]),
                    (widths[1][0], widths[1][1]))

    def _rear_max(self, th_f: float, ph_f: float) -> tuple[float, float]:
        """Azimuth (rad) and intensity of the strongest direction at elevation
        90 deg - th_f with azimuth in [ph_f + 90, ph_f + 270] deg: a 2 deg scan, then
        finer scans about the best (each step a tenth of the last, to 0.02 deg)."""
        lo_a, hi_a = ph_f + math.pi / 2, ph_f + 3 * math.pi / 2
        az = ph_f + np.radians(np.arange(90.0, 270.0 + 1e-9, _REAR_SCAN_DEG))
        u = self.intensity(np.full(az.shape, th_f), az)
        k = int(np.argmax(u))
        best_a, best_u = float(az[k]), float(u[k])
        step = math.radians(_REAR_SCAN_DEG)
        offsets = np.linspace(-1.0, 1.0, 2 * _REFINE_POINTS + 1)
        for _ in range(_MAX_ROUNDS):
            a = np.clip(best_a + step * offsets, lo_a, hi_a)
            u = self.intensity(np.full(a.shape, th_f), a)
            k = int(np.argmax(u))
            if u[k] >= best_u:
                best_a, best_u = float(a[k]), float(u[k])
            step /= _REFINE_POINTS
        return best_a, best_u

    def _edges(self, f: np.ndarray, sides: Sequence[tuple[np.ndarray, float]], u_f: float
               ) -> list[float | None]:
        """For each (axis, sign): the signed angle (deg) from f towards sign*axis
        where U first falls to u_f/2, or None (not within 180 deg, or the ground
        comes first). A 6 deg scan of every side in one call brackets each edge;
        finer scans of all the brackets together narrow them (each to a tenth) to
        0.006 deg, and the edge is interpolated linearly inside the last."""
        half = 0.5 * u_f
        psi = np.radians(np.arange(0.0, 180.0 + 1e-9, _SCAN_DEG))
        n = len(psi)

        def along(ang: np.ndarray, which: list[int]) -> FloatArray:
            """U at angles ang (m, j) off f towards each chosen side's axis."""
            axes = np.array([sides[i][0] * sides[i][1] for i in which])  # (m, 3)
            d = np.cos(ang)[..., None] * f + np.sin(ang)[..., None] * axes[:, None, :]
            u = self._intensity_dirs(d.reshape(-1, 3)).reshape(ang.shape)
            if self.ground_z is not None:
                u = np.where(d[..., 2] < -1e-12, -1.0, u)  # below ground: the beam stops
            return np.asarray(u, dtype=float)

        all_sides = list(range(len(sides)))
        u = along(np.broadcast_to(psi, (len(sides), n)), all_sides)
        out: list[float | None] = [None] * len(sides)
        live: list[int] = []
        lo: list[float] = []
        for i in all_sides:
            below = np.nonzero(u[i] <= half)[0]
            if len(below) == 0 or u[i, below[0]] < 0:  # none, or the ground came first
                continue
            live.append(i)
            lo.append(float(psi[below[0] - 1]))
        if not live:
            return out
        width = math.radians(_SCAN_DEG)
        a = np.array(lo)
        grid = np.linspace(0.0, 1.0, _REFINE_POINTS + 1)
        for _ in range(_EDGE_ROUNDS):
            ang = a[:, None] + width * grid[None, :]
            ua = along(ang, live)
            j = np.array([int(np.nonzero(row <= half)[0][0]) if np.any(row <= half)
                          else len(row) - 1 for row in ua])
            j = np.maximum(j, 1)
            idx = np.arange(len(live))
            u_lo, u_hi = ua[idx, j - 1], ua[idx, j]
            a = ang[idx, j - 1]
            width /= _REFINE_POINTS
        # linear interpolation inside the last bracket of `width` (radians)
        frac = np.where(u_lo > u_hi, (u_lo - half) / np.where(u_lo > u_hi, u_lo - u_hi, 1.0),
                        0.5)
        edge = a + np.clip(frac, 0.0, 1.0) * width
        for i, e in zip(live, edge):
            out[i] = math.degrees(float(e)) * sides[i][1]
        return out

    # -- polarisation ----------------------------------------------------------------------
    def polarisation(self, theta_deg: float, phi_deg: float) -> Polarisation:
        """Circular components, axial ratio and sense of the field towards
        (theta_deg, phi_deg)."""
        th, ph = math.radians(theta_deg), math.radians(phi_deg)
        e_t, e_p = (complex(v) for v in self.field(np.array(th), np.array(ph)))
        e_r = (e_t + 1j * e_p) / math.sqrt(2)
        e_l = (e_t - 1j * e_p) / math.sqrt(2)
        a, b = abs(e_r), abs(e_l)
        sense: Literal["right", "left", "linear", "none"]
        if a + b == 0:
            ar, sense, tilt = math.nan, "none", math.nan
        else:
            minor = abs(a - b)
            if minor <= _LINEAR_RATIO * (a + b):
                ar, sense = math.inf, "linear"
            else:
                ar = 20 * math.log10((a + b) / minor)
                sense = "right" if a > b else "left"
            tilt = math.degrees(0.5 * (np.angle(e_r) - np.angle(e_l))) % 180.0
        u_r = a * a / (2 * ETA0)
        u_l = b * b / (2 * ETA0)
        g_r, g_l = (float(x) for x in self._db(np.array([u_r, u_l])))
        return Polarisation(theta_deg, phi_deg, e_t, e_p, e_r, e_l, g_r, g_l, self.has_gain,
                            ar, sense, tilt)


def _frame(d: np.ndarray) -> tuple[FloatArray, FloatArray]:
    """Two unit vectors perpendicular to unit d and to each other."""
    ref = np.array([0.0, 0.0, 1.0]) if abs(d[2]) < 0.9 else np.array([1.0, 0.0, 0.0])
    e1 = _unit(np.cross(d, ref))
    e2 = np.cross(d, e1)
    return e1, e2


def _vertical_plane(phi: float, elevation: np.ndarray) -> FloatArray:
    """Directions at `elevation` (rad, from the horizon at azimuth phi, over the
    zenith past 90) in the vertical plane of azimuth `phi` (rad)."""
    horiz = np.array([math.cos(phi), math.sin(phi), 0.0])
    up = np.array([0.0, 0.0, 1.0])
    return np.asarray(np.cos(elevation)[:, None] * horiz + np.sin(elevation)[:, None] * up,
                      dtype=float)


# -- records ------------------------------------------------------------------------------
@dataclass(frozen=True)
class Pattern:
    """The pattern on a grid: gain_dbi / directivity_dbi (n_theta, n_phi) at
    theta_deg (n_theta,) x phi_deg (n_phi,); gain_dbi None for given currents
    (no input power). The maximum is refined off the grid. `efficiency`: radiated
    over input power (None without input power)."""

    theta_deg: FloatArray
    phi_deg: FloatArray
    gain_dbi: FloatArray | None
    directivity_dbi: FloatArray
    max_gain_dbi: float | None
    max_directivity_dbi: float
    max_theta_deg: float
    max_phi_deg: float
    efficiency: float | None


@dataclass(frozen=True)
class Cut:
    """One principal-plane cut: angles (deg) and values (dB, `quantity`), with the
    fixed angle of the cut (the elevation of an azimuth cut, the azimuth of an
    elevation cut, deg)."""

    plane: Literal["azimuth", "elevation"]
    angle_deg: FloatArray
    value_db: FloatArray
    quantity: str
    fixed_deg: float

    def as_json(self) -> dict[str, object]:
        """Lists for JSON (a null or below-ground value as None)."""
        vals = [float(v) if math.isfinite(v) else None for v in self.value_db]
        return {"plane": self.plane, "fixed_deg": self.fixed_deg,
                "angle_deg": [float(a) for a in self.angle_deg], self.quantity: vals}


@dataclass(frozen=True)
class Cuts:
    """The azimuth and elevation cuts through the forward direction (theta, phi deg)."""

    azimuth: Cut
    elevation: Cut
    forward_theta_deg: float
    forward_phi_deg: float


@dataclass(frozen=True)
class Beam:
    """Forward direction and value, back and rear figures, half-power beamwidths
    (deg) in the horizontal and vertical planes through the forward direction with
    their edges (signed angles from forward, deg). Values are gain (dBi) when
    `is_gain`, else directivity. See `FarField.beam` for the definitions."""

    forward_theta_deg: float
    forward_phi_deg: float
    forward_dbi: float
    is_gain: bool
    back_theta_deg: float | None
    back_phi_deg: float | None
    back_dbi: float | None
    front_to_back_db: float | None
    rear_phi_deg: float | None
    rear_dbi: float | None
    front_to_rear_db: float | None
    beamwidth_h_deg: float | None
    beamwidth_v_deg: float | None
    edges_h_deg: tuple[float | None, float | None]
    edges_v_deg: tuple[float | None, float | None]


@dataclass(frozen=True)
class Polarisation:
    """The field towards (theta_deg, phi_deg): r E_theta, r E_phi (V), its right-
    and left-hand circular components (V), their partial gains (dBi; directivity
    when not `is_gain`), the axial ratio (dB; inf for linear, nan in a null), the
    sense ("right", "left", "linear", "none") and the tilt of the major axis from
    theta^ towards phi^ (deg, 0..180)."""

    theta_deg: float
    phi_deg: float
    e_theta_v: complex
    e_phi_v: complex
    e_rhcp_v: complex
    e_lhcp_v: complex
    rhcp_dbi: float
    lhcp_dbi: float
    is_gain: bool
    axial_ratio_db: float
    sense: Literal["right", "left", "linear", "none"]
    tilt_deg: float


@dataclass(frozen=True)
class PowerBalance:
    """Input power against loss plus the far-field integral (W); error =
    (p_in - p_loss - p_rad) / p_in; efficiency = p_rad / p_in; the quadrature
    orders used."""

    p_in_w: float
    p_loss_w: float
    p_rad_w: float
    error: float
    efficiency: float
    n_theta: int
    n_phi: int


# -- functions on a solution and its model (the first interface) ---------------------------
def far_field(solution: Solution, model: RadiatingModel) -> FarField:
    """The far field of a solved model."""
    return FarField(SourceCurrents.of(solution, model))


def radiation_vector(solution: Solution, model: RadiatingModel,
                     directions: np.ndarray) -> ComplexArray:
    """N (..., 3) in A m for unit `directions` (..., 3), phase referred to the
    structure's centre."""
    return far_field(solution, model).radiation_vector(directions)


def intensity(solution: Solution, model: RadiatingModel, theta_rad: ArrayLike,
              phi_rad: ArrayLike) -> FloatArray:
    """Radiation intensity U (W/sr) at 1 V, for broadcastable theta and phi (rad).
    Zero below a ground plane."""
    return far_field(solution, model).intensity(theta_rad, phi_rad)


def pattern(solution: Solution, model: RadiatingModel, theta_rad: ArrayLike,
            phi_rad: ArrayLike) -> FloatArray:
    """Gain (dBi, loss included) at each direction; -inf in a null or below ground."""
    return far_field(solution, model).gain_dbi(theta_rad, phi_rad)


def directivity_pattern(solution: Solution, model: RadiatingModel, theta_rad: ArrayLike,
                        phi_rad: ArrayLike) -> FloatArray:
    """Directivity (dBi, against the radiated power from the far-field integral)."""
    return far_field(solution, model).directivity_dbi(theta_rad, phi_rad)


def radiated_power(solution: Solution, model: RadiatingModel, n_theta: int | None = None,
                   n_phi: int | None = None) -> float:
    """Radiated power (W at 1 V) by integrating U over the sphere (or the upper
    half-space over ground); the quadrature orders follow from the structure's
    electrical size unless given."""
    return far_field(solution, model).radiated_power(n_theta, n_phi)


def radiation_efficiency(solution: Solution, model: RadiatingModel) -> float:
    """Radiated power (far-field integral) over input power."""
    return radiated_power(solution, model) / solution.p_in_w


def principal_planes(solution: Solution, model: RadiatingModel, step_deg: float = 2.0
                     ) -> dict[str, tuple[FloatArray, FloatArray]]:
    """Gain (dBi) in the three coordinate planes, each as (angle_deg, gain_dbi):
    "xy" (theta 90 deg, phi 0..360), "xz" (phi 0, theta -180..180 through +x),
    "yz" (phi 90 deg, theta -180..180 through +y). Negative theta means phi + 180."""
    field = far_field(solution, model)
    ang = np.arange(0.0, 360.0 + 1e-9, step_deg)
    rad = np.radians(ang)
    xy = field.gain_dbi(np.full_like(rad, math.pi / 2), rad)
    sweep = np.radians(np.arange(-180.0, 180.0 + 1e-9, step_deg))
    th = np.abs(sweep)
    out = {"xy": (ang, xy)}
    for name, base in (("xz", 0.0), ("yz", math.pi / 2)):
        ph = np.where(sweep < 0, base + math.pi, base)
        out[name] = (np.degrees(sweep), field.gain_dbi(th, ph))
    return out
