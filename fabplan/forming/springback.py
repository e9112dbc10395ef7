"""Springback of a bent bar from its cross-section and its stress-strain law.

Pure bending of a bar whose section is symmetric about the bending axis
(solid round, round tube, rectangular strip bent flat). Plane sections stay
plane, so the strain at a distance y (mm) from the centroidal axis is
eps = kappa * y, kappa = 1/rho the curvature (1/mm) of that axis, and the
bending moment (N mm) is

    M(kappa) = 2 * integral_0^c sigma(kappa * y) * y * b(y) dy

with c the half-depth (mm) and b(y) the width of the section at y (mm):
B for a rectangle, 2*sqrt(a^2 - y^2) for a solid round of radius a, and the
outer round minus the inner round for a tube. (Marciniak, Duncan & Hu,
Mechanics of Sheet Metal Forming, ch. 6, general method.)

Release is elastic: 1/rho_i - 1/rho_f = M/(E I). The neutral axis keeps its
length, so theta_i * rho_i = theta_f * rho_f on that axis.

The section integral uses fixed Gauss-Legendre nodes on each smooth piece of
the law (a round's width is handled by y = a sin(phi), which removes the
square-root end), vectorised over curvatures. The inverse (curvature to hold
for a finished curvature) is root finding on that integral: Brent's method
(fabplan.numeric.brentq) for one bend, and for many bends at once a cached
per-section table (a monotone cubic, fabplan.numeric.pchip) for the start
followed by secant steps on the exact integral (Brent's method as the fallback).

Units: mm, MPa (N/mm^2), N mm, radians inside; degrees at the interface.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from functools import lru_cache

import numpy as np
import numpy.typing as npt

from ..design.forming import MODELS, Model
from ..errors import DesignError
from ..numeric import Pchip, brentq, pchip
from ..stock.materials import Material
from ..stock.profiles import Profile, Round, Strip, Tube

__all__ = ["FlowLaw", "SectionModel", "section_model", "law_for", "BendState",
           "held_for_final", "final_for_held", "calibrate_scale", "Model", "MODELS"]


# Gauss-Legendre nodes and weights on [-1, 1]; every sub-interval of the
# section integral is smooth, so a fixed rule of this order is exact to
# rounding for the elastic and plateau parts and to ~1e-12 for the power law.
_GL_N = 20
_GL_X, _GL_W = np.polynomial.legendre.leggauss(_GL_N)


@dataclass(frozen=True)
class FlowLaw:
    """Uniaxial stress-strain law, symmetric in tension and compression.

    `youngs_mpa` E, `yield_mpa` Y, `k_mpa` and `n` the Hollomon constants
    (sigma = K eps^n). With `hardening` False the law is elastic-perfectly-
    plastic: sigma = min(E eps, Y).

    With hardening the law is sigma = min(E eps, max(Y, K eps^n)): the elastic
    line until it meets the upper of the yield plateau and the Hollomon curve,
    then that upper curve. Why this join: K and n are fitted to large-strain
    tests, and at the small strains of a gentle bend K eps^n falls far below the
    measured yield of a soft metal (annealed copper, K = 315 MPa, n = 0.54,
    gives 6 MPa at eps = Y/E, against a yield of about 69 MPa); joining the
    elastic line straight to K eps^n (eps0 = (K/E)^(1/(1-n))) would make soft
    copper spring back almost not at all. Taking the larger of Y and K eps^n
    keeps the measured yield as a floor (a Lueders-like plateau) and lets the
    hardening take over once it is the higher curve (about 6 % strain for
    annealed copper). For a hard temper whose K eps^n already exceeds Y at
    eps = Y/E (6061-T6), the elastic line runs on to meet the Hollomon curve,
    which keeps the law continuous. Scaling Y and K together (`scaled`) is how a
    test bend calibrates the law.
    """

    youngs_mpa: float
    yield_mpa: float
    k_mpa: float = 0.0
    n: float = 0.0
    hardening: bool = False

    def scaled(self, factor: float) -> FlowLaw:
        """The same law with every flow stress times `factor` (E unchanged)."""
        return FlowLaw(self.youngs_mpa, self.yield_mpa * factor, self.k_mpa * factor, self.n,
                       self.hardening)

    @property
    def limit_strain(self) -> float:
        """Strain at the end of the elastic line (fraction)."""
        eps_y = self.yield_mpa / self.youngs_mpa
        if not self.hardening or self.k_mpa <= 0:
            return eps_y
        eps0 = (self.k_mpa / self.youngs_mpa) ** (1.0 / (1.0 - self.n))
        return float(max(eps_y, eps0))

    @property
    def limit_stress(self) -> float:
        """Stress at the end of the elastic line (MPa)."""
        return self.youngs_mpa * self.limit_strain

    @property
    def hardening_strain(self) -> float:
        """Strain where K eps^n overtakes the plateau (inf: never)."""
        if not self.hardening or self.k_mpa <= 0:
            return math.inf
        if self.n <= 0:
            return 0.0 if self.k_mpa > self.yield_mpa else math.inf
        return float(max((self.yield_mpa / self.k_mpa) ** (1.0 / self.n), self.limit_strain))

    def stress(self, eps: np.ndarray) -> np.ndarray:
        """Stress (MPa) at strain `eps` (fraction, any sign)."""
        e = np.abs(eps)
        flow = np.full_like(e, self.yield_mpa)
        if self.hardening and self.k_mpa > 0:
            flow = np.maximum(flow, self.k_mpa * e ** self.n)
        out: np.ndarray = np.sign(eps) * np.minimum(self.youngs_mpa * e, flow)
        return out


def law_for(material: Material, model: Model = "hardening", scale: float = 1.0) -> FlowLaw:
    """The flow law of a material record, flow stresses times `scale`."""
    law = FlowLaw(material.youngs_modulus_mpa, material.yield_mpa, material.hollomon_k_mpa,
                  material.hollomon_n, model == "hardening")
    return law.scaled(scale) if scale != 1.0 else law


def _section_key(profile: Profile) -> tuple[str, float, float]:
    if isinstance(profile, Round):
        return ("round", profile.diameter_mm / 2, 0.0)
    if isinstance(profile, Tube):
        return ("tube", profile.od_mm / 2, profile.id_mm / 2)
    if isinstance(profile, Strip):
        return ("rect", profile.thickness_mm / 2, profile.width_mm)
    raise DesignError("no springback model for this profile", value=profile)


class SectionModel:
    """Moment-curvature and springback of one section in one flow law."""

    def __init__(self, profile: Profile, law: FlowLaw) -> None:
        self.kind, self.c, self.other = _section_key(profile)
        self.law = law
        self.second_moment = profile.second_moment_mm4
        self.ei = law.youngs_mpa * self.second_moment  # N mm^2
        self._inverse: tuple[Pchip, Callable[[npt.ArrayLike], np.ndarray], float] | None = None

    # -- the section integral -------------------------------------------------
    def _nodes(self, kappa: np.ndarray, top: np.ndarray,
               to_var: Callable[[np.ndarray], np.ndarray]) -> tuple[np.ndarray, np.ndarray]:
        """Gauss-Legendre nodes and weights of the integration variable.

        The variable runs from 0 to `top` (m,) for m sections at once; `to_var`
        maps a distance y (mm) from the axis to the variable. The range is cut
        where the law changes piece (end of the elastic line, start of the
        hardening), so each piece is smooth. Shapes (k, m, 3 * n)."""
        y1 = self.law.limit_strain / kappa
        eh = self.law.hardening_strain
        y2 = np.full_like(y1, np.inf) if math.isinf(eh) else np.maximum(eh / kappa, y1)
        hi = np.broadcast_to(top, (len(kappa), len(top)))
        b1 = np.minimum(to_var(y1[:, None]), hi)
        b2 = np.minimum(to_var(y2[:, None]), hi)
        edges = np.stack([np.zeros_like(hi), b1, b2, hi], axis=-1)  # (k, m, 4)
        half = (edges[..., 1:] - edges[..., :-1])[..., None] / 2  # (k, m, 3, 1)
        nodes = edges[..., :-1, None] + half * (_GL_X + 1)
        shape = (len(kappa), len(top), -1)
        return nodes.reshape(shape), (half * _GL_W).reshape(shape)

    def moment(self, kappa: np.ndarray | float) -> np.ndarray:
        """Bending moment (N mm) at curvature `kappa` (1/mm, > 0) of the centroidal axis."""
        k = np.atleast_1d(np.asarray(kappa, dtype=float))
        kk = k[:, None, None]
        if self.kind == "rect":
            # M = 2 B int_0^c sigma(kappa y) y dy
            y, w = self._nodes(k, np.array([self.c]), lambda y: y)
            rect: np.ndarray = 2 * self.other * (self.law.stress(kk * y) * y * w).sum(axis=(1, 2))
            return rect
        # solid round of radius a, with y = a sin(phi):
        # M = 4 a^3 int_0^{pi/2} sigma(kappa a sin phi) sin phi cos^2 phi dphi;
        # a tube is the outer round less the inner one (the stress depends on y only)
        radii = np.array([self.c, self.other] if self.kind == "tube" else [self.c])
        phi, w = self._nodes(k, np.full(len(radii), math.pi / 2),
                             lambda y: np.arcsin(np.minimum(y / radii, 1.0)))
        s = np.sin(phi)
        f = self.law.stress(kk * radii[:, None] * s) * s * (1.0 - s * s)
        per = 4 * radii ** 3 * (f * w).sum(axis=2)  # (k, m)
        out: np.ndarray = per[:, 0] - per[:, 1] if self.kind == "tube" else per[:, 0]
        return out

    # -- elastic limit and release ---------------------------------------------
    @property
    def elastic_limit_radius(self) -> float:
        """Radius (mm) above which the bar springs straight back: c over the strain
        at the end of the elastic line, i.e. E c / Y (trade-notes.md), or E c /
        sigma at the join with the Hollomon curve when that lies above Y."""
        return float(self.c / self.law.limit_strain)

    @property
    def first_yield_moment(self) -> float:
        """Moment (N mm) at which the outer fibre reaches the elastic limit."""
        return float(self.law.limit_stress * self.second_moment / self.c)

    def released(self, kappa_held: np.ndarray | float) -> np.ndarray:
        """Curvature after release (1/mm) for curvature held (1/mm); 0 if elastic."""
        k = np.atleast_1d(np.asarray(kappa_held, dtype=float))
        return np.maximum(k - self.moment(k) / self.ei, 0.0)

    def released_one(self, kappa_held: float) -> float:
        """`released` for one curvature (1/mm), as a float."""
        return float(self.released(kappa_held)[0])

    def _bracket(self, kappa_final: float) -> tuple[float, float]:
        """Held curvatures (1/mm) either side of the one that releases to `kappa_final`.

        The held curvature exceeds the elastic-limit curvature k_e, and
        M(k) >= E I k_e beyond it, so k_held >= k_final + k_e; the moment of an
        elastic-perfectly-plastic section stays below 2 E I k_e (shape factors
        1.5, 16/(3 pi), 4/pi), so k_final + 2 k_e brackets it unless the metal
        hardens, when the step is doubled until it does."""
        k_e = self.law.limit_strain / self.c
        lo, step = kappa_final + k_e, 2 * k_e
        while self.released_one(kappa_final + step) < kappa_final:
            lo, step = kappa_final + step, step * 2
        return lo, kappa_final + step

    def held_curvature(self, kappa_final: float) -> float:
        """Curvature to hold (1/mm) so the bar springs back to `kappa_final`
        (1/mm), by Brent's method on the section integral."""
        if kappa_final <= 0:
            return 0.0
        lo, hi = self._bracket(kappa_final)
        return brentq(lambda k: self.released_one(k) - kappa_final, lo, hi,
                      xtol=1e-15, rtol=1e-14)

    def _table(self) -> tuple[Pchip, Callable[[npt.ArrayLike], np.ndarray], float]:
        """Held curvature as a function of released curvature: a monotone
        interpolant (PCHIP) through one vectorised pass of the section integral,
        from the elastic limit to a held radius of half the half-depth."""
        if self._inverse is None:
            k_e = self.law.limit_strain / self.c
            held = k_e * np.geomspace(1.0, max(2.0 / (self.c * k_e), 2.0), 64)
            rel = self.released(held)
            keep = np.concatenate([[True], np.diff(rel) > 0])
            interp = pchip(rel[keep], held[keep])
            self._inverse = (interp, interp.derivative(), float(rel[keep][-1]))
        return self._inverse

    def held_curvatures(self, kappa_final: np.ndarray) -> np.ndarray:
        """`held_curvature` for many curvatures (1/mm) at once.

        Speed: the table's interpolant gives a first estimate to about 1e-4,
        a Newton step with the table's slope and then secant steps on the exact
        section integral (all bends in one vectorised pass per step) bring it to
        1e-13 in two or three passes. Anything that does not converge, or lies
        beyond the table, goes to `held_curvature` (Brent's method)."""
        kf = np.atleast_1d(np.asarray(kappa_final, dtype=float))
        out = np.zeros_like(kf)
        interp, slope, top = self._table()
        fast = (kf > 0) & (kf < top)
        if fast.any():
            k = kf[fast]
            x0 = interp(k)
            g0 = self.released(x0) - k
            x1 = x0 - g0 * slope(k)
            ok = np.zeros(len(k), dtype=bool)
            for _ in range(6):
                g1 = self.released(x1) - k
                ok = np.abs(g1) <= 1e-13 * k
                if ok.all():
                    break
                denom = g1 - g0
                step = np.where(denom != 0, g1 * (x1 - x0) / np.where(denom != 0, denom, 1.0),
                                0.0)
                x0, g0, x1 = x1, g1, x1 - step
            out[fast] = x1
            fast[np.flatnonzero(fast)[~ok]] = False
        for i in np.flatnonzero(~fast & (kf > 0)):
            out[i] = self.held_curvature(float(kf[i]))
        return out


@lru_cache(maxsize=256)
def section_model(profile: Profile, law: FlowLaw) -> SectionModel:
    """The (cached) model of one section in one law."""
    return SectionModel(profile, law)


@dataclass(frozen=True)
class BendState:
    """One bend held and released. Radii are of the centreline (mm), angles deg."""

    held_radius_mm: float
    held_angle_deg: float
    final_radius_mm: float  # inf: springs straight
    final_angle_deg: float
    outer_strain: float  # at the outer fibre while held (fraction)

    @property
    def springback_deg(self) -> float:
        return self.held_angle_deg - self.final_angle_deg


def _neutral_shift(depth_mm: float, k_factor: float) -> float:
    """Neutral radius minus centreline radius (mm)."""
    return depth_mm * (k_factor - 0.5)


def held_for_final(model: SectionModel, final_radius_mm: float, final_angle_deg: float,
                   depth_mm: float, k_factor: float = 0.5) -> BendState:
    """Former (held) radius and overbend angle that release to the design's
    centreline radius `final_radius_mm` and angle `final_angle_deg`.

    The moment-curvature is of the centroidal (centreline) axis; the angle
    relation uses the neutral axis of the developed length (centreline + depth
    (K - 1/2)), which keeps its length: theta_i rho_i = theta_f rho_f.
    """
    k_held = model.held_curvature(1.0 / final_radius_mm)
    r_held = 1.0 / k_held
    dn = _neutral_shift(depth_mm, k_factor)
    angle = final_angle_deg * (final_radius_mm + dn) / (r_held + dn)
    return BendState(r_held, angle, final_radius_mm, final_angle_deg, model.c / r_held)


def final_for_held(model: SectionModel, held_radius_mm: float, final_angle_deg: float,
                   depth_mm: float, k_factor: float = 0.5) -> BendState:
    """A bend held at centreline radius `held_radius_mm` (a tool's die): the
    radius it releases to, and the angle to bend to for `final_angle_deg`."""
    k_rel = model.released_one(1.0 / held_radius_mm)
    if k_rel <= 0:
        return BendState(held_radius_mm, math.inf, math.inf, final_angle_deg,
                         model.c / held_radius_mm)
    r_final = 1.0 / k_rel
    dn = _neutral_shift(depth_mm, k_factor)
    angle = final_angle_deg * (r_final + dn) / (held_radius_mm + dn)
    return BendState(held_radius_mm, angle, r_final, final_angle_deg, model.c / held_radius_mm)


def calibrate_scale(profile: Profile, law: FlowLaw, former_radius_mm: float,
                    angle_held_deg: float, angle_released_deg: float,
                    k_factor: float = 0.5, field: str = "forming.calibration") -> float:
    """Factor on the flow stresses that reproduces a test bend.

    The test bend was held round a disc of radius `former_radius_mm` (the
    inside of the bend, mm) at `angle_held_deg` and opened to
    `angle_released_deg` when let go. Returns the factor f such that the law
    with Y and K times f gives that springback; the effective yield is f Y.
    """
    depth = profile.depth_mm
    r_held = former_radius_mm + depth / 2
    if not 0 < angle_released_deg < angle_held_deg:
        raise DesignError("the angle after release must be greater than 0 and less than the "
                          "angle held (a test bend always springs back a little; measure "
                          "both angles again)", field=f"{field}.angle_released",
                          value=angle_released_deg)
    dn = _neutral_shift(depth, k_factor)
    r_final = (r_held + dn) * angle_held_deg / angle_released_deg - dn
    target = 1.0 / r_final

    def gap(f: float) -> float:
        m = SectionModel(profile, law.scaled(f))
        return m.released_one(1.0 / r_held) - target

    lo, hi = 1e-6, 1.0
    if gap(lo) < 0:
        raise DesignError("the test bend springs back less than any real metal would; check "
                          "the angles", field=f"{field}.angle_released", value=angle_released_deg)
    while gap(hi) > 0:
        lo, hi = hi, hi * 2
        if hi > 1e4:
            raise DesignError("no flow stress reproduces this test bend; check the former "
                              "radius and angles", field=field)
    return brentq(gap, lo, hi, xtol=1e-12, rtol=1e-10)
