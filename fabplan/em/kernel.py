"""Matrix fill for the thin-wire method of moments (mixed-potential, Galerkin).

Each straight segment carries two half-triangle ("rooftop") pieces: the rising
piece u and the falling piece 1 - u (u from 0 at the segment's start to 1 at
its end). Every interaction reduces to four moments per pair of segments,

    M_pq(i, j) = int_seg_i int_seg_j u^p v^q G(R) dl dl',   p, q in {0, 1},

with the reduced kernel G = exp(-jkR) / (4 pi R), R = sqrt(|r - r'|^2 + a^2)
(observation on the axis, source current on the surface). G is split into the
static part 1/(4 pi R), integrated once per geometry (exactly on the inner
segment, by graded Gauss quadrature on the outer one for near pairs; plain
Gauss for far pairs), and the smooth remainder (exp(-jkR) - 1)/(4 pi R),
integrated per frequency by a few Gauss points on each segment, with the
distances precomputed. Lengths in metres here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

__all__ = ["SegmentSet", "PairIntegrals", "pair_integrals", "segment_distance",
           "exact_kernel_correction"]

_Q_SMOOTH = 2  # Gauss points per segment for the smooth remainder
_Q_STATIC = 4  # Gauss points per segment for the static part of far pairs
_Q_GRADED = 6  # Gauss points per graded sub-interval (near pairs)
_Q_CORRECTION = 4  # Gauss points per graded sub-interval (exact-kernel correction)
_GRADE = 0.15  # ratio of successive graded sub-intervals towards a breakpoint
_NEAR = 1.0  # a pair is near when its gap is below this many segment lengths


def _gauss01(n: int) -> tuple[np.ndarray, np.ndarray]:
    x, w = np.polynomial.legendre.leggauss(n)
    return (x + 1) / 2, w / 2


@dataclass(frozen=True)
class SegmentSet:
    """Straight segments: start points (S, 3), unit directions (S, 3), lengths (S,),
    radii (S,) in metres."""

    start: np.ndarray
    direction: np.ndarray
    length: np.ndarray
    radius: np.ndarray

    @property
    def end(self) -> np.ndarray:
        return self.start + self.direction * self.length[:, None]

    @property
    def count(self) -> int:
        return len(self.length)

    def mirrored(self, z0: float) -> SegmentSet:
        """The image segments in the plane z = z0 (same start/end order)."""
        s = self.start.copy()
        s[:, 2] = 2 * z0 - s[:, 2]
        d = self.direction.copy()
        d[:, 2] = -d[:, 2]
        return SegmentSet(s, d, self.length.copy(), self.radius.copy())


def segment_distance(a0: np.ndarray, a1: np.ndarray, b0: np.ndarray,
                     b1: np.ndarray) -> np.ndarray:
    """Least distance between segments a0-a1 and b0-b1 (arrays (..., 3)), vectorised."""
    d1 = a1 - a0
    d2 = b1 - b0
    r = a0 - b0
    a = np.einsum("...i,...i", d1, d1)
    e = np.einsum("...i,...i", d2, d2)
    f = np.einsum("...i,...i", d2, r)
    c = np.einsum("...i,...i", d1, r)
    b = np.einsum("...i,...i", d1, d2)
    denom = a * e - b * b
    with np.errstate(divide="ignore", invalid="ignore"):
        s = np.where(denom > 1e-14 * a * e, np.clip((b * f - c * e) / denom, 0, 1), 0.0)
        t = (b * s + f) / e
        t = np.clip(t, 0, 1)
        s = np.clip((b * t - c) / a, 0, 1)
    p = a0 + d1 * s[..., None]
    q = b0 + d2 * t[..., None]
    return np.linalg.norm(p - q, axis=-1)


@dataclass
class PairIntegrals:
    """Geometry-only data for every (observation, source) pair of segments.

    `static` (4, S_obs, S_src): the moments of 1/(4 pi R) (m), order M00, M01,
    M10, M11 (first index: power of u on the observation segment). For the smooth
    remainder, every pair (flattened row-major) carries the Gauss-point distances
    `r` (q*q, P) and weights `w` (q*q, 4); near pairs (`near`, flat indices) also
    carry `near_fix` (4, P_near): the exact minus the Gauss moments of R/(4 pi),
    so that the -k^2 R/2 term of the remainder, which has a kink, is integrated
    exactly. (Keeping every pair, not only i <= j, costs less than scattering a
    triangle back into a square at every frequency.)
    """

    static: np.ndarray
    r: np.ndarray
    w: np.ndarray
    scale: np.ndarray  # (P,) l_i l_j / (4 pi)
    near: np.ndarray  # flat indices of the near pairs
    near_fix: np.ndarray
    symmetric: bool

    def __post_init__(self) -> None:
        self._inv_r = 1.0 / self.r
        self._wt = np.ascontiguousarray(self.w.T)
        self._tri_r: np.ndarray | None = None
        self._tri_map: np.ndarray | None = None
        n_o, n_s = self.static.shape[1:]
        if self.symmetric and n_o == n_s:
            # exp(-jkR) on i <= j only, then gathered: pair (j, i) point (a, b) is (i, j) (b, a)
            q2 = self.r.shape[0]
            q = int(round(math.sqrt(q2)))
            ti, tj = np.triu_indices(n_o)
            pos = np.empty((n_o, n_o), dtype=np.int64)
            pos[ti, tj] = np.arange(len(ti))
            pos[tj, ti] = np.arange(len(ti))
            pts = np.arange(q2)
            swapped_pts = (pts % q) * q + pts // q
            lower = np.tril(np.ones((n_o, n_o), bool), -1).ravel()
            # layout (q*q, P): point-major, so the map is point * P_tri + pair
            n_tri = len(ti)
            point = np.where(lower[None, :], swapped_pts[:, None], pts[:, None])
            self._tri_map = (point * n_tri + pos.ravel()[None, :]).ravel()
            self._tri_r = np.ascontiguousarray(self.r[:, ti * n_o + tj])

    def symmetrise(self) -> None:
        """Average M(i, j) with M(j, i) (u and v swapped): the pair set is symmetric, and
        the near-pair quadratures of the two orders differ by about 1e-7."""
        if self.symmetric:
            self.static = 0.5 * (self.static + self.static[[0, 2, 1, 3]].transpose(0, 2, 1))

    def phase(self, k: float) -> np.ndarray:
        """exp(-j k R) at the smooth-part quadrature points, (q*q, P)."""
        if self._tri_r is not None and self._tri_map is not None:
            return np.take(np.exp(-1j * k * self._tri_r), self._tri_map).reshape(self.r.shape)
        return np.exp(-1j * k * self.r)

    def prepare(self, obs: SegmentSet, src: SegmentSet) -> None:
        """Fold the per-pair factors into the data once `static` is final.

        The matrix needs, per pair, the vector-potential moments of the four pairings of
        rising (u) and falling (1 - u) halves weighted by t_i . t_j, and the scalar-potential
        moment M00 / (l_i l_j). Both are linear in the moments, so the weights and the
        per-pair factors absorb them and each frequency costs two small products.
        """
        # rows: rising-rising, rising-falling, falling-rising, falling-falling
        combo = np.array([[0, 0, 0, 1], [0, 0, 1, -1], [0, 1, 0, -1], [1, -1, -1, 1]], float)
        n_o, n_s = self.static.shape[1:]
        tt = (obs.direction @ src.direction.T).ravel()
        inv_ll = (1.0 / (obs.length[:, None] * src.length[None, :])).ravel()
        flat = self.static.reshape(4, -1)
        self._static_v = (combo @ flat) * tt
        self._static_s = flat[0] * inv_ll
        self._w_v = np.ascontiguousarray((self.w @ combo.T).T)  # (4, q*q)
        self._w_s = np.ascontiguousarray(self.w[:, 0])[None, :]  # (1, q*q)
        self._inv_v = self._inv_r * (self.scale * tt)[None, :]
        self._inv_s = self._inv_r * (self.scale * inv_ll)[None, :]
        self._fix_v = (combo @ self.near_fix) * tt[self.near]
        self._fix_s = self.near_fix[0] * inv_ll[self.near]
        self._shape = (n_o, n_s)

    def fill(self, k: float, phase: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray]:
        """At wavenumber k (1/m): V (4, S_obs, S_src), the t_i . t_j weighted moments of G
        for the four half pairings, and S (S_obs, S_src), M00 / (l_i l_j), both complex
        (G = exp(-jkR) / (4 pi R)). Call `prepare` first."""
        e = self.phase(k) if phase is None else phase
        er = e.real - 1.0
        ei = e.imag
        v = np.empty(self._static_v.shape, dtype=complex)
        v.real = self._static_v + self._w_v @ (er * self._inv_v)
        v.imag = self._w_v @ (ei * self._inv_v)
        s = np.empty(self._static_s.shape, dtype=complex)
        s.real = self._static_s + (self._w_s @ (er * self._inv_s))[0]
        s.imag = (self._w_s @ (ei * self._inv_s))[0]
        if len(self.near):
            kk = 0.5 * k * k
            v[:, self.near] -= kk * self._fix_v
            s[self.near] -= kk * self._fix_s
        return v.reshape(4, *self._shape), s.reshape(self._shape)


def _weights(u: np.ndarray, wu: np.ndarray, v: np.ndarray, wv: np.ndarray) -> np.ndarray:
    """(len(u)*len(v), 4) weights for M00, M01, M10, M11 on a tensor grid."""
    uu = np.repeat(u, len(v))
    vv = np.tile(v, len(u))
    ww = np.repeat(wu, len(v)) * np.tile(wv, len(u))
    return np.stack([ww, ww * vv, ww * uu, ww * uu * vv], axis=1)


def _grid_points(seg: SegmentSet, u: np.ndarray) -> np.ndarray:
    """(S, len(u), 3) points at parameters u on every segment."""
    return seg.start[:, None, :] + seg.direction[:, None, :] * (seg.length[:, None, None]
                                                               * u[None, :, None])


def _grid_d2(obs: SegmentSet, src: SegmentSet, u: np.ndarray, centre: np.ndarray) -> np.ndarray:
    """Squared distances (S_obs, S_src, q*q) between the Gauss points of every pair."""
    po = (_grid_points(obs, u) - centre).reshape(-1, 3)
    ps = (_grid_points(src, u) - centre).reshape(-1, 3)
    d2 = (np.einsum("ik,ik->i", po, po)[:, None] + np.einsum("ik,ik->i", ps, ps)[None, :]
          - 2.0 * (po @ ps.T))
    q = len(u)
    d2 = d2.reshape(obs.count, q, src.count, q).transpose(0, 2, 1, 3)
    return np.maximum(d2, 0.0).reshape(obs.count, src.count, q * q)


def pair_integrals(obs: SegmentSet, src: SegmentSet, symmetric: bool = False) -> PairIntegrals:
    """All geometry-only integrals between `obs` and `src` segments.

    `symmetric`: the pair set is symmetric (free space, or a set against its own
    mirror image), so only i <= j is kept for the per-frequency work.
    """
    a2 = 0.5 * (obs.radius[:, None] ** 2 + src.radius[None, :] ** 2)
    len_prod = obs.length[:, None] * src.length[None, :]
    centre = obs.start.mean(axis=0)

    # static part, far pairs: plain Gauss
    us, ws = _gauss01(_Q_STATIC)
    inv = 1.0 / np.sqrt(_grid_d2(obs, src, us, centre) + a2[:, :, None])
    static = np.einsum("ijq,qm->mij", inv, _weights(us, ws, us, ws))

    # smooth remainder: Gauss grid distances on every pair
    u, w = _gauss01(_Q_SMOOTH)
    n_o, n_s = obs.count, src.count
    r = np.ascontiguousarray(
        np.sqrt(_grid_d2(obs, src, u, centre) + a2[:, :, None]).reshape(n_o * n_s, -1).T)
    w_s = _weights(u, w, u, w)
    scale = (len_prod / (4 * math.pi)).ravel()

    # near pairs: exact inner integral, graded outer quadrature
    gap = segment_distance(obs.start[:, None, :], obs.end[:, None, :],
                           src.start[None, :, :], src.end[None, :, :])
    is_near = gap < _NEAR * np.maximum(obs.length[:, None], src.length[None, :])
    if symmetric:
        is_near = np.triu(is_near)
    ii, jj = np.nonzero(is_near)
    near = np.zeros(0, dtype=int)
    near_fix = np.zeros((4, 0))
    if len(ii):
        m_inv, m_r = _near_moments(obs, src, ii, jj, a2[ii, jj])
        static[:, ii, jj] = m_inv
        flat = ii * n_s + jj
        near_fix = (m_r - (r[:, flat].T @ w_s).T) * scale[flat]
        near = flat
        if symmetric:  # M(j, i) is M(i, j) with u and v swapped
            off = ii != jj
            static[:, jj[off], ii[off]] = m_inv[[0, 2, 1, 3]][:, off]
            flat_t = jj[off] * n_s + ii[off]
            fix_t = (m_r[[0, 2, 1, 3]][:, off] - (r[:, flat_t].T @ w_s).T) * scale[flat_t]
            near = np.concatenate([flat, flat_t])
            near_fix = np.concatenate([near_fix, fix_t], axis=1)
    static *= len_prod / (4 * math.pi)
    return PairIntegrals(static, r, w_s, scale, near, near_fix, symmetric)


def _graded_template(levels: int) -> np.ndarray:
    """Fractions of [0, 1] clustered geometrically towards both ends."""
    lo = 0.5 * _GRADE ** np.arange(levels, 0, -1)
    return np.concatenate([[0.0], lo, [0.5], 1.0 - lo[::-1], [1.0]])


def _near_moments(obs: SegmentSet, src: SegmentSet, ii: np.ndarray, jj: np.ndarray,
                  a2: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Moments of 1/R and of R, divided by l_i l_j, for the listed near pairs: two (4, P)."""
    li = obs.length[ii]
    lj = src.length[jj]
    a_min = float(np.sqrt(a2.min()))
    ratio = float(np.max(li)) / a_min
    levels = max(2, math.ceil(math.log(0.1 / ratio) / math.log(_GRADE)))
    tpl = _graded_template(levels)
    # breakpoints: segment ends and where the source's ends project onto the observer
    ti = obs.direction[ii]
    ua = np.clip(np.einsum("pk,pk->p", src.start[jj] - obs.start[ii], ti) / li, 0, 1)
    ub = np.clip(np.einsum("pk,pk->p", src.end[jj] - obs.start[ii], ti) / li, 0, 1)
    bp = np.sort(np.stack([np.zeros_like(ua), ua, ub, np.ones_like(ua)], axis=1), axis=1)
    edges = (bp[:, :-1, None] + (bp[:, 1:, None] - bp[:, :-1, None]) * tpl[None, None, :])
    lo = edges[:, :, :-1].reshape(len(ii), -1)
    hi = edges[:, :, 1:].reshape(len(ii), -1)
    xg, wg = _gauss01(_Q_GRADED)
    u = (lo[:, :, None] + (hi - lo)[:, :, None] * xg).reshape(len(ii), -1)  # (P, Nq)
    wu = ((hi - lo)[:, :, None] * wg).reshape(len(ii), -1)
    # observation points, projected onto the source line
    p = obs.start[ii][:, None, :] + ti[:, None, :] * (li[:, None, None] * u[:, :, None])
    rel = p - src.start[jj][:, None, :]
    tj = src.direction[jj]
    x = np.einsum("pqk,pk->pq", rel, tj)
    rho2 = np.maximum(np.einsum("pqk,pqk->pq", rel, rel) - x * x, 0.0)
    h2 = rho2 + a2[:, None]
    h = np.sqrt(h2)
    l = lj[:, None]
    r_hi = np.sqrt((l - x) ** 2 + h2)
    r_lo = np.sqrt(x * x + h2)
    f0 = np.arcsinh((l - x) / h) + np.arcsinh(x / h)  # int_0^l ds / R
    f1 = (r_hi - r_lo + x * f0) / l  # int (s/l) ds / R
    g0 = 0.5 * ((l - x) * r_hi + x * r_lo + h2 * f0)  # int_0^l R ds
    g1 = ((r_hi ** 3 - r_lo ** 3) / 3 + x * g0) / l  # int (s/l) R ds

    def moments(a0: np.ndarray, a1: np.ndarray) -> np.ndarray:
        return np.stack([np.sum(wu * a0, axis=1), np.sum(wu * a1, axis=1),
                         np.sum(wu * u * a0, axis=1), np.sum(wu * u * a1, axis=1)]) / lj

    return moments(f0, f1), moments(g0, g1)


def exact_kernel_correction(length: np.ndarray, radius: np.ndarray, closed: bool,
                            reach: int = 2) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Moments of (K_exact - K_reduced)/(4 pi) for pairs along a chain of segments.

    K_exact(y) = (1/2 pi) int dphi / sqrt(y^2 + 4 a^2 sin^2(phi/2)) = (2/pi) K(m) /
    sqrt(y^2 + 4 a^2), m = 4 a^2/(y^2 + 4 a^2), is the kernel with both the source
    current and the testing on the wire surface; K_reduced = 1/sqrt(y^2 + a^2).
    Their difference is confined to a few radii, so it is applied to each segment
    and its `reach` neighbours along the chain, laid out as if collinear (a polygon
    bend of at most 22.5 degrees barely changes it). This keeps the solution
    convergent when segments come down to about a radius.

    Returns (i, j, moments (4, P)) with moments already multiplied by l_i l_j.
    """
    n = len(length)
    cum = np.concatenate([[0.0], np.cumsum(length)])
    total = cum[-1]
    seen = np.zeros((n, n), bool)
    parts = []
    for d in sorted(range(-reach, reach + 1), key=abs):
        i = np.arange(n)
        j = i + d
        if closed:
            j %= n
        ok = (j >= 0) & (j < n)
        i, j = i[ok], j[ok]
        fresh = ~seen[i, j]
        i, j = i[fresh], j[fresh]
        seen[i, j] = True
        # chain distance from the start of i to the start of j, |d| segments along
        if d >= 0:
            c = cum[np.minimum(i + d, n)] - cum[i] if not closed else \
                np.where(i + d <= n, cum[np.minimum(i + d, n)] - cum[i],
                         total - cum[i] + cum[(i + d) % n])
        else:
            c = -(cum[i] - cum[np.maximum(i + d, 0)]) if not closed else \
                np.where(i + d >= 0, -(cum[i] - cum[np.maximum(i + d, 0)]),
                         -(cum[i] + total - cum[(i + d) % n]))
        parts.append((i, j, c))
    ii_a = np.concatenate([p[0] for p in parts])
    jj_a = np.concatenate([p[1] for p in parts])
    c = np.concatenate([p[2] for p in parts]).astype(float)
    touching = np.concatenate([np.full(len(p[0]), abs(d) <= 1) for p, d in
                               zip(parts, sorted(range(-reach, reach + 1), key=abs))])
    mom = np.empty((4, len(c)))
    a2 = 0.5 * (radius[ii_a] ** 2 + radius[jj_a] ** 2)
    a_min = float(np.sqrt(a2.min()))
    # the kernels differ by a log singularity at y = 0 for a segment and its neighbours
    # (graded towards it); further along the chain the difference is smooth
    levels = max(2, math.ceil(math.log(1e-3 * a_min / float(length.max())) / math.log(_GRADE)))
    for sel, lev in ((touching, levels), (~touching, 0)):
        if np.any(sel):
            mom[:, sel] = _correction_moments(length[ii_a[sel]], length[jj_a[sel]], c[sel],
                                              a2[sel], lev)
    return ii_a, jj_a, mom


def _correction_moments(li: np.ndarray, lj: np.ndarray, c: np.ndarray, a2: np.ndarray,
                        levels: int) -> np.ndarray:
    """(K_exact - K_reduced)/(4 pi) moments (x l_i l_j) of collinear pairs whose source
    starts `c` along the line after the observer's start (see exact_kernel_correction)."""
    from scipy.special import ellipkm1

    # y = s - s' runs over [-(c + lj), li - c]; breakpoints where W changes form, and 0
    y_lo = -(c + lj)
    y_hi = li - c
    k1 = np.clip(li - c - lj, y_lo, y_hi)
    k2 = np.clip(-c, y_lo, y_hi)
    zero = np.clip(np.zeros_like(c), y_lo, y_hi)
    bp = np.sort(np.stack([y_lo, k1, k2, zero, y_hi], axis=1), axis=1)
    tpl = _graded_template(levels)
    edges = bp[:, :-1, None] + (bp[:, 1:, None] - bp[:, :-1, None]) * tpl[None, None, :]
    lo = edges[:, :, :-1].reshape(len(c), -1)
    hi = edges[:, :, 1:].reshape(len(c), -1)
    xg, wg = _gauss01(_Q_CORRECTION)
    y = (lo[:, :, None] + (hi - lo)[:, :, None] * xg).reshape(len(c), -1)
    wy = ((hi - lo)[:, :, None] * wg).reshape(len(c), -1)
    y2 = y * y
    big = y2 + 4 * a2[:, None]
    with np.errstate(divide="ignore"):
        k_exact = (2 / math.pi) * ellipkm1(y2 / big) / np.sqrt(big)
    dk = k_exact - 1.0 / np.sqrt(y2 + a2[:, None])
    dk[~np.isfinite(dk)] = 0.0  # a quadrature node exactly at y = 0 has zero weight
    # W_pq(y) = (1/lj) int u^p v^q du over the u where v = (li u - c - y)/lj lies in [0, 1]
    al = (li / lj)[:, None]
    be = -(c[:, None] + y) / lj[:, None]
    u_lo = np.clip(np.maximum(0.0, (c[:, None] + y) / li[:, None]), 0, 1)
    u_hi = np.clip(np.minimum(1.0, (c[:, None] + y + lj[:, None]) / li[:, None]), 0, 1)
    u_hi = np.maximum(u_hi, u_lo)

    def prim(u: np.ndarray) -> tuple[np.ndarray, ...]:
        return (u, al * u * u / 2 + be * u, u * u / 2, al * u ** 3 / 3 + be * u * u / 2)

    w_hi, w_lo = prim(u_hi), prim(u_lo)
    mom = np.stack([np.sum(wy * dk * (h - l_) / lj[:, None], axis=1)
                    for h, l_ in zip(w_hi, w_lo)])
    return mom * (li * lj / (4 * math.pi))
