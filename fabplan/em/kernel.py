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
distances precomputed.

The kernel is symmetric: M_pq(j, i) = M_qp(i, j). The fill keeps only pairs i <= j, in
`Block`s of rows [i0, i1) against columns [i0, S) (pairs with j < i inside a block are
zeroed), so each pair is integrated once; the half-segment pairings of a pair are
rising-rising, rising-falling, falling-rising and falling-falling ("rr", "rf", "fr",
"ff"), and swapping the pair swaps "rf" with "fr". Lengths in metres here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..special import ellipkm1

__all__ = ["SegmentSet", "Block", "block_geometry", "block_halves", "segment_distance",
           "exact_kernel_correction", "COMBO", "SWAP", "CHARGE_SIGN"]

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
        return np.asarray(self.start + self.direction * self.length[:, None])

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
    return np.asarray(np.linalg.norm(p - q, axis=-1))


# half pairings rr, rf, fr, ff from the moments M00, M01, M10, M11 (u on the observer)
COMBO = np.array([[0, 0, 0, 1], [0, 0, 1, -1], [0, 1, 0, -1], [1, -1, -1, 1]], float)
SWAP = [0, 2, 1, 3]  # the pair (j, i) from (i, j): M01 <-> M10, and rf <-> fr
CHARGE_SIGN = np.array([1.0, -1.0, -1.0, 1.0])  # charge of rising +1/l, falling -1/l


def _weights(u: np.ndarray, wu: np.ndarray, v: np.ndarray, wv: np.ndarray) -> np.ndarray:
    """(len(u)*len(v), 4) weights for M00, M01, M10, M11 on a tensor grid."""
    uu = np.repeat(u, len(v))
    vv = np.tile(v, len(u))
    ww = np.repeat(wu, len(v)) * np.tile(wv, len(u))
    return np.stack([ww, ww * vv, ww * uu, ww * uu * vv], axis=1)


def _grid_points(seg: SegmentSet, u: np.ndarray) -> np.ndarray:
    """(S, len(u), 3) points at parameters u on every segment."""
    step = seg.length[:, None, None] * u[None, :, None]
    return np.asarray(seg.start[:, None, :] + seg.direction[:, None, :] * step)


def _grid_d2(obs: SegmentSet, src: SegmentSet, u: np.ndarray, centre: np.ndarray) -> np.ndarray:
    """Squared distances (S_obs, S_src, q*q) between the Gauss points of every pair."""
    po = (_grid_points(obs, u) - centre).reshape(-1, 3)
    ps = (_grid_points(src, u) - centre).reshape(-1, 3)
    d2 = (np.einsum("ik,ik->i", po, po)[:, None] + np.einsum("ik,ik->i", ps, ps)[None, :]
          - 2.0 * (po @ ps.T))
    q = len(u)
    d2 = d2.reshape(obs.count, q, src.count, q).transpose(0, 2, 1, 3)
    return np.asarray(np.maximum(d2, 0.0).reshape(obs.count, src.count, q * q))


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
    lc = lj[:, None]
    r_hi = np.sqrt((lc - x) ** 2 + h2)
    r_lo = np.sqrt(x * x + h2)
    f0 = np.arcsinh((lc - x) / h) + np.arcsinh(x / h)  # int_0^l ds / R
    f1 = (r_hi - r_lo + x * f0) / lc  # int (s/l) ds / R
    g0 = 0.5 * ((lc - x) * r_hi + x * r_lo + h2 * f0)  # int_0^l R ds
    g1 = ((r_hi ** 3 - r_lo ** 3) / 3 + x * g0) / lc  # int (s/l) R ds

    def moments(a0: np.ndarray, a1: np.ndarray) -> np.ndarray:
        return np.asarray(np.stack([np.sum(wu * a0, axis=1), np.sum(wu * a1, axis=1),
                                    np.sum(wu * u * a0, axis=1), np.sum(wu * u * a1, axis=1)])
                          / lj)

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
                               zip(parts, sorted(range(-reach, reach + 1), key=abs), strict=True)])
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
                    for h, l_ in zip(w_hi, w_lo, strict=True)])
    return np.asarray(mom * (li * lj / (4 * math.pi)))


# -- blocks of pairs ----------------------------------------------------------------------------
@dataclass
class Block:
    """Geometry-only data for rows `rows` (observer segment indices) against columns `cols`
    (source segment indices, into the source set: the segments or their images).

    `inv_r` (q*q, nI, nJ): 1/R at the smooth part's Gauss points; `p_v` (nI, nJ):
    t_i . t_j l_i l_j / (4 pi), `p_s` (nI, nJ): 1/(4 pi) (both zero for pairs left out);
    `near` (flat indices into nI*nJ) with `fix_v` (4, Pn) and `fix_s` (Pn,): the exact
    minus the Gauss moments of R (as `p_v`-weighted pairings and as M00 / (l_i l_j)), for
    the -k^2 R / 2 term of the remainder, which has a kink. `phase` and `rot` hold
    exp(-jkR) and exp(-j dk R) during an evenly spaced sweep."""

    rows: np.ndarray
    cols: np.ndarray
    inv_r: np.ndarray
    p_v: np.ndarray
    p_s: np.ndarray
    near: np.ndarray
    fix_v: np.ndarray
    fix_s: np.ndarray
    phase: np.ndarray | None = None
    rot: np.ndarray | None = None

    @property
    def shape(self) -> tuple[int, int]:
        return (len(self.rows), len(self.cols))

    @property
    def nbytes(self) -> int:
        out = self.inv_r.nbytes + self.p_v.nbytes + self.p_s.nbytes
        for a in (self.phase, self.rot):
            if a is not None:
                out += a.nbytes
        return out

    def phases(self, k: float) -> np.ndarray:
        """exp(-j k R) at the smooth part's points (q*q, nI, nJ)."""
        with np.errstate(divide="ignore"):
            r = 1.0 / self.inv_r
        return np.asarray(np.exp(-1j * k * r))


def _take(seg: SegmentSet, idx: np.ndarray) -> SegmentSet:
    return SegmentSet(seg.start[idx], seg.direction[idx], seg.length[idx], seg.radius[idx])


def _block_d2(po: np.ndarray, ps: np.ndarray, centre: np.ndarray, n_o: int, n_s: int,
              q: int) -> np.ndarray:
    """Squared distances (q*q, n_o, n_s) between points po (n_o*q, 3) and ps (n_s*q, 3),
    observer point major."""
    a = po - centre
    b = ps - centre
    d2 = np.einsum("ik,ik->i", a, a)[:, None] + np.einsum("ik,ik->i", b, b)[None, :] \
        - 2.0 * (a @ b.T)
    d2 = d2.reshape(n_o, q, n_s, q).transpose(1, 3, 0, 2).reshape(q * q, n_o, n_s)
    return np.asarray(np.maximum(d2, 0.0))


def block_geometry(obs_all: SegmentSet, src_all: SegmentSet, rows: np.ndarray,
                   cols: np.ndarray, keep: np.ndarray | None,
                   corrections: tuple[np.ndarray, np.ndarray, np.ndarray] | None = None
                   ) -> tuple[Block, np.ndarray, np.ndarray]:
    """The block of pairs (rows x cols) and its static part.

    `keep` (nI, nJ) bool: the pairs to fill (None: all); `corrections`: (i, j, moments
    (4, P)): extra static moments (M00, M01, M10, M11, times l_i l_j) of pairs (i, j) of
    segment indices, added where the block holds the pair and keeps it. Returns (block,
    V0 (4, nI, nJ): the t_i . t_j weighted half pairings of the static moments of
    1/(4 pi R), S0 (nI, nJ): M00 / (l_i l_j)), zero where not kept.
    """
    obs = _take(obs_all, rows)
    src = _take(src_all, cols)
    n_o, n_s = obs.count, src.count
    a2 = 0.5 * (obs.radius[:, None] ** 2 + src.radius[None, :] ** 2)
    len_prod = obs.length[:, None] * src.length[None, :]
    centre = obs_all.start.mean(axis=0)
    scale = len_prod / (4 * math.pi)
    # static part, far pairs: plain Gauss
    us, ws = _gauss01(_Q_STATIC)
    d2 = _block_d2(_grid_points(obs, us).reshape(-1, 3), _grid_points(src, us).reshape(-1, 3),
                   centre, n_o, n_s, _Q_STATIC)
    inv = 1.0 / np.sqrt(d2 + a2[None])
    del d2
    static = np.tensordot(_weights(us, ws, us, ws).T, inv, axes=1)  # (4, n_o, n_s)
    del inv
    # smooth remainder: the Gauss points' distances
    u, w = _gauss01(_Q_SMOOTH)
    w_s = _weights(u, w, u, w)
    r = np.sqrt(_block_d2(_grid_points(obs, u).reshape(-1, 3),
                          _grid_points(src, u).reshape(-1, 3), centre, n_o, n_s, _Q_SMOOTH)
                + a2[None])
    # near pairs: exact inner integral, graded outer quadrature
    gap = segment_distance(obs.start[:, None, :], obs.end[:, None, :],
                           src.start[None, :, :], src.end[None, :, :])
    is_near = gap < _NEAR * np.maximum(obs.length[:, None], src.length[None, :])
    if keep is not None:
        is_near &= keep
    ii, jj = np.nonzero(is_near)
    near_fix = np.zeros((4, 0))
    if len(ii):
        m_inv, m_r = _near_moments(obs, src, ii, jj, a2[ii, jj])
        static[:, ii, jj] = m_inv
        gauss = np.einsum("qp,qm->mp", r[:, ii, jj], w_s)
        near_fix = (m_r - gauss) * scale[ii, jj]
    static *= scale[None]
    if corrections is not None and len(corrections[0]):
        ci, cj, mom = corrections
        size = int(max(obs_all.count, src_all.count))
        row_pos = np.full(size, -1)
        row_pos[rows] = np.arange(n_o)
        col_pos = np.full(size, -1)
        col_pos[cols] = np.arange(n_s)
        a, b = row_pos[ci], col_pos[cj]
        ok = (a >= 0) & (b >= 0)
        if keep is not None:
            ok[ok] &= keep[a[ok], b[ok]]
        for m in range(4):
            np.add.at(static[m], (a[ok], b[ok]), mom[m, ok])
    tt = obs.direction @ src.direction.T
    p_v = tt * scale
    p_s = np.full((n_o, n_s), 1.0 / (4 * math.pi))
    v0 = np.tensordot(COMBO, static, axes=1) * tt[None]
    s0 = static[0] / len_prod
    if keep is not None:
        p_v = np.where(keep, p_v, 0.0)
        p_s = np.where(keep, p_s, 0.0)
        v0 *= keep[None]
        s0 = np.where(keep, s0, 0.0)
    flat = ii * n_s + jj
    fix_v = (COMBO @ near_fix) * tt[ii, jj] if len(ii) else np.zeros((4, 0))
    fix_s = near_fix[0] / len_prod[ii, jj] if len(ii) else np.zeros(0)
    block = Block(np.asarray(rows), np.asarray(cols), np.ascontiguousarray(1.0 / r), p_v, p_s,
                  flat, fix_v, fix_s)
    return block, v0, s0


def _pair_weights() -> tuple[np.ndarray, np.ndarray]:
    u, w = _gauss01(_Q_SMOOTH)
    w_s = _weights(u, w, u, w)  # (q*q, 4)
    return np.ascontiguousarray(COMBO @ w_s.T), np.ascontiguousarray(w_s[:, 0])


_WV, _W00 = _pair_weights()


def block_halves(block: Block, k: float, omega: float, mu: float, eps: float,
                 phase: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray]:
    """The smooth part of the half-segment interactions of `block` at wavenumber k (1/m),
    angular frequency omega: H (4, nI, nJ) as its real and imaginary parts, in the order
    rr, rf, fr, ff, with H_c = j omega mu V_c + s_c S / (j omega eps) (s_c the charge
    signs) and the near pairs' -k^2 R / 2 correction. `phase`: exp(-jkR) at the points, if
    the caller has it."""
    e = block.phases(k) if phase is None else phase
    n_o, n_s = block.shape
    q2 = e.shape[0]
    er = e.real - 1.0
    er *= block.inv_r
    ei = e.imag * block.inv_r
    er2 = er.reshape(q2, -1)
    ei2 = ei.reshape(q2, -1)
    wm = omega * mu
    we = 1.0 / (omega * eps)
    h_im = (_WV @ er2).reshape(4, n_o, n_s)
    h_re = (_WV @ ei2).reshape(4, n_o, n_s)
    h_im *= block.p_v * wm
    h_re *= block.p_v * (-wm)
    y_re = (_W00 @ er2).reshape(n_o, n_s)
    y_re *= block.p_s * we
    y_im = (_W00 @ ei2).reshape(n_o, n_s)
    y_im *= block.p_s * we
    # + s_c S / (j omega eps): real part s_c Im(S) / (omega eps), imaginary -s_c Re(S) / ...
    for c, sign in enumerate(CHARGE_SIGN):
        if sign > 0:
            h_re[c] += y_im
            h_im[c] -= y_re
        else:
            h_re[c] -= y_im
            h_im[c] += y_re
    if len(block.near):
        kk = 0.5 * k * k
        hv = h_im.reshape(4, -1)
        hv[:, block.near] -= kk * (wm * block.fix_v
                                   - (CHARGE_SIGN * we)[:, None] * block.fix_s[None, :])
    return h_re, h_im
