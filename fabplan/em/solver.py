"""Thin-wire method of moments: a wire model, its impedance and currents.

Formulation: the mixed-potential integral equation on straight segments,
triangle (rooftop) basis functions spanning two neighbouring segments, Galerkin
testing, and the reduced kernel (see `kernel`). An open wire has no basis at its
free ends (the current is zero there); a closed loop has one at every node; a
wire end lying on the ground plane gets a half-basis that continues into its
image. The source is a uniform field V/g along the feed-gap segment(s), so the
gap has its real width and the result converges as the mesh is refined with the
gap held fixed; the input impedance follows from the reaction
Z = V^2 / (integral of E_gap . I over the gap). Conductor loss enters as the
internal impedance per unit length (`loss`), Galerkin-weighted; the loss power
is computed with the solved current. A perfect ground plane at z = ground_z is
handled by image theory (horizontal currents and all charges reverse).

Units: millimetres at the interface (nodes, radii, walls), hertz, ohms, watts;
metres inside.
"""

from __future__ import annotations

import logging
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from ..errors import FabplanError, Finding
from .kernel import PairIntegrals, SegmentSet, exact_kernel_correction, pair_integrals
from .loss import MU0, internal_impedance

if TYPE_CHECKING:  # pragma: no cover
    from ..geometry.path import BendPath

__all__ = ["wire_model", "path_model", "WireModel", "Solution", "C0", "EPS0", "ETA0",
           "MIN_SEGMENT_RADII", "MAX_KA"]

log = logging.getLogger("fabplan")

C0 = 299_792_458.0  # m/s
EPS0 = 1.0 / (MU0 * C0 * C0)
ETA0 = MU0 * C0

MIN_SEGMENT_RADII = 1.0  # shortest segment, in wire radii (reduced-kernel guard)
MAX_KA = 0.1  # largest k a (wire circumference 1/60 of a wavelength)
MAX_SEGMENT_WAVELENGTHS = 0.1  # longest segment at the solved frequency
TIGHT_BEND_RADII = 3.0  # bends tighter than this many wire radii draw a warning
SPACING_DIAMETERS = 3.0  # closer conductors (centre to centre) draw a warning
DEFAULT_MAX_UNKNOWNS = 2000


class _OneBlasThread:
    """Run the BLAS/LAPACK behind numpy and scipy on one thread while solving.

    The matrices here are small (a few hundred unknowns): OpenBLAS threads gain little
    and, on a busy two-core machine, spin against each other and slow a sweep several
    times over. The loaded OpenBLAS libraries are found in /proc/self/maps; where that
    fails (another platform, another BLAS) this does nothing.
    """

    _libs: list | None = None

    @classmethod
    def _find(cls) -> list:
        if cls._libs is None:
            import ctypes

            libs = []
            try:
                with open("/proc/self/maps", encoding="utf-8") as fh:
                    paths = {line.split()[-1] for line in fh if "openblas" in line.lower()}
            except OSError:
                paths = set()
            for path in sorted(p for p in paths if ".so" in p):
                try:
                    lib = ctypes.CDLL(path)
                except OSError:
                    continue
                for get, put in (("scipy_openblas_get_num_threads64_",
                                  "scipy_openblas_set_num_threads64_"),
                                 ("scipy_openblas_get_num_threads",
                                  "scipy_openblas_set_num_threads"),
                                 ("openblas_get_num_threads", "openblas_set_num_threads")):
                    if hasattr(lib, get) and hasattr(lib, put):
                        getter, setter = getattr(lib, get), getattr(lib, put)
                        getter.restype = ctypes.c_int
                        setter.argtypes = [ctypes.c_int]
                        libs.append((getter, setter))
                        break
            cls._libs = libs
        return cls._libs

    def __enter__(self) -> _OneBlasThread:
        self._saved = []
        for getter, setter in self._find():
            n = int(getter())
            self._saved.append((setter, n))
            if n != 1:
                setter(1)
        return self

    def __exit__(self, *exc: object) -> None:
        for setter, n in self._saved:
            if n != 1:
                setter(n)


@dataclass(frozen=True)
class Solution:
    """The solved current at one frequency, with a 1 V source across the gap.

    `currents`: complex amplitude of each basis function (A, at 1 V);
    `p_in_w`, `p_loss_w`, `p_rad_w` (W, at 1 V peak); p_rad = p_in - p_loss;
    `efficiency` = p_rad / p_in.
    """

    f_hz: float
    z_in: complex
    currents: np.ndarray
    p_in_w: float
    p_loss_w: float
    p_rad_w: float
    efficiency: float


class WireModel:
    """A meshed wire (or loop) with its feed, conductor and ground.

    Build with `wire_model` or `path_model`. `unknowns` is the number of basis
    functions; `findings` lists warnings about the thin-wire limits.
    """

    def __init__(self, nodes_m: np.ndarray, radius_m: np.ndarray, closed: bool,
                 source_segments: Sequence[int], resistivity_ohm_m: float | None,
                 tube_wall_m: float | None, lossless_segments: Sequence[int],
                 ground_z_m: float | None, max_unknowns: int = DEFAULT_MAX_UNKNOWNS) -> None:
        self.nodes = nodes_m
        self.closed = closed
        n_seg = len(nodes_m) if closed else len(nodes_m) - 1
        a = nodes_m
        b = np.roll(nodes_m, -1, axis=0)[:n_seg] if closed else nodes_m[1:]
        vec = b - a[:n_seg]
        length = np.linalg.norm(vec, axis=1)
        if np.any(length <= 0):
            k = int(np.argmin(length))
            raise FabplanError("two consecutive nodes coincide: every segment needs a length",
                               field=f"segment {k}", value=0.0)
        self.segments = SegmentSet(a[:n_seg].copy(), vec / length[:, None], length,
                                   radius_m.astype(float))
        self.n_seg = n_seg
        self.source_segments = tuple(int(s) for s in source_segments)
        for s in self.source_segments + tuple(int(x) for x in lossless_segments):
            if not 0 <= s < n_seg:
                raise FabplanError(f"segment index out of range 0..{n_seg - 1}",
                                   field="source_segments", value=s)
        if not self.source_segments:
            raise FabplanError("a model needs at least one source segment (the feed gap)",
                               field="source_segments", value=[])
        self.resistivity = resistivity_ohm_m
        self.tube_wall = tube_wall_m
        self.lossless = np.zeros(n_seg, bool)
        self.lossless[list(lossless_segments)] = True
        self.ground_z = ground_z_m
        self.exact_kernel = True
        self.exact_reach_radii = 10.0
        self.findings: list[Finding] = []
        self._basis(max_unknowns)
        self._check_limits()
        self.mesh = None  # the Mesh, when built by path_model
        self._gather_idx: list[np.ndarray] | None = None
        self._loss_pairs: tuple[np.ndarray, np.ndarray] | None = None
        self._free: PairIntegrals | None = None
        self._image: PairIntegrals | None = None
        self._image_segments: SegmentSet | None = None

    # -- set-up ---------------------------------------------------------------
    def _basis(self, max_unknowns: int) -> None:
        n = self.n_seg
        rise: list[int] = []  # half index 2*seg (current u on seg), or pad
        fall: list[int] = []  # half index 2*seg+1 (current 1-u on seg), or pad
        pad = 2 * n
        if self.closed:
            for node in range(n):
                rise.append(2 * ((node - 1) % n))
                fall.append(2 * node + 1)
        else:
            on_ground = []
            if self.ground_z is not None:
                tol = 1e-9 + 1e-6 * float(self.segments.length.min())
                on_ground = [abs(self.nodes[0, 2] - self.ground_z) <= tol,
                             abs(self.nodes[-1, 2] - self.ground_z) <= tol]
            if on_ground and on_ground[0]:
                rise.append(pad)
                fall.append(1)
            for node in range(1, n):
                rise.append(2 * (node - 1))
                fall.append(2 * node + 1)
            if on_ground and on_ground[1]:
                rise.append(2 * (n - 1))
                fall.append(pad)
        if not rise:
            raise FabplanError("an open wire needs at least two segments", field="nodes",
                               value=n)
        if len(rise) > max_unknowns:
            raise FabplanError(f"the model needs {len(rise)} unknowns, more than the cap of "
                               f"{max_unknowns}: lower the top frequency or the segments per "
                               "wavelength, or raise the cap", field="unknowns",
                               value=len(rise))
        self.rise = np.asarray(rise)
        self.fall = np.asarray(fall)
        self._rs = self.rise // 2  # segment of the rising half (n_seg: none)
        self._fs = self.fall // 2
        self.unknowns = len(rise)
        # which basis carries each half (for currents along the wire)
        self.half_basis = np.full(2 * n + 1, -1)
        self.half_basis[self.rise] = np.arange(self.unknowns)
        self.half_basis[self.fall] = np.arange(self.unknowns)
        self.half_basis[pad] = -1
        # 1 V across the whole gap: the field 1/g along every source segment, g their
        # total length; int f_m . E dl = (l_k / 2) / g for each half on segment k
        gap = sum(float(self.segments.length[s]) for s in set(self.source_segments))
        ex = np.zeros(self.unknowns)
        for s in set(self.source_segments):
            for h in (2 * s, 2 * s + 1):
                m = self.half_basis[h]
                if m >= 0:
                    ex[m] += 0.5 * float(self.segments.length[s]) / gap
        self.excitation = ex
        self.gap_m = gap

    def _check_limits(self) -> None:
        seg = self.segments
        short = seg.length < MIN_SEGMENT_RADII * seg.radius
        if np.any(short):
            k = int(np.argmax(short))
            raise FabplanError(
                f"segment {k} is {seg.length[k] * 1e3:.3g} mm long, shorter than "
                f"{MIN_SEGMENT_RADII:g} wire radius ({seg.radius[k] * 1e3:.3g} mm): the thin-wire "
                "kernel is not valid there; use fewer, longer segments or a wider feed gap",
                field="segment length", value=round(float(seg.length[k]) * 1e3, 4))
        # conductors close together (not neighbours along the wire): sample the axis
        from scipy.spatial import cKDTree

        total = float(seg.length.sum())
        step = max(float(seg.radius.min()), total / 20000)
        counts = np.maximum(1, np.ceil(seg.length / step).astype(int))
        idx = np.repeat(np.arange(self.n_seg), counts)
        frac = np.concatenate([(np.arange(c) + 0.5) / c for c in counts])
        pts = seg.start[idx] + seg.direction[idx] * (seg.length[idx] * frac)[:, None]
        along = (np.cumsum(seg.length) - seg.length)[idx] + seg.length[idx] * frac
        rad = seg.radius[idx]
        reach = SPACING_DIAMETERS * 2 * float(seg.radius.max())
        pairs = cKDTree(pts).query_pairs(reach, output_type="ndarray")
        if len(pairs) == 0:
            return
        i, j = pairs[:, 0], pairs[:, 1]
        dist = np.linalg.norm(pts[i] - pts[j], axis=1)
        apart = np.abs(along[i] - along[j])
        if self.closed:
            apart = np.minimum(apart, total - apart)
        dia = rad[i] + rad[j]
        # along one bend the chord is at least 2/pi of the arc: closer is another conductor
        other = apart > (math.pi / 2) * np.maximum(dist, SPACING_DIAMETERS * dia) + 2 * step
        touching = other & (dist <= dia * (1 + 1e-9))
        if np.any(touching):
            k = int(np.argmax(touching))
            raise FabplanError(f"segments {idx[i[k]]} and {idx[j[k]]} touch or cross "
                               f"({dist[k] * 1e3:.3g} mm apart, centre to centre): separate "
                               "the conductors", field="geometry",
                               value=round(float(dist[k]) * 1e3, 4))
        close = other & (dist < SPACING_DIAMETERS * dia)
        if np.any(close):
            k = int(np.argmax(close))
            self.findings.append(Finding(
                "em-conductors-close", "warning",
                f"conductors {dist[k] * 1e3:.3g} mm apart centre to centre, under "
                f"{SPACING_DIAMETERS:g} diameters: the thin-wire model ignores the proximity "
                "effect there and the impedance is less certain"))

    def _integrals(self) -> tuple[PairIntegrals, PairIntegrals | None]:
        if self._free is None:
            seg = self.segments
            reach = min(40, max(2, math.ceil(self.exact_reach_radii * float(seg.radius.max())
                                             / float(seg.length.min()))))
            free = pair_integrals(seg, seg, symmetric=True)
            if self.exact_kernel:
                ii, jj, mom = exact_kernel_correction(seg.length, seg.radius, self.closed,
                                                      reach)
                free.static[:, ii, jj] += mom
            free.symmetrise()
            free.prepare(seg, seg)
            self._free = free
            if self.ground_z is not None:
                self._image_segments = seg.mirrored(self.ground_z)
                image = pair_integrals(seg, self._image_segments, symmetric=True)
                if self.exact_kernel:
                    self._ground_chain_correction(image, reach)
                image.symmetrise()
                image.prepare(seg, self._image_segments)
                self._image = image
        return self._free, self._image

    def _ground_chain_correction(self, image: PairIntegrals, reach: int) -> None:
        """The exact-kernel correction between a wire end on the ground and its image:
        the wire and its image form one chain through the ground node."""
        seg = self.segments
        n = self.n_seg
        for at_start, has in ((True, self.fall[0] // 2 == 0 and self.rise[0] == 2 * n),
                              (False, self.rise[-1] // 2 == n - 1 and self.fall[-1] == 2 * n)):
            if not has:
                continue
            order = np.arange(n)
            # chain: images (reversed) then the wire from node 0, or the wire then images
            chain = np.concatenate([order[::-1], order]) if at_start else \
                np.concatenate([order, order[::-1]])
            is_image = np.arange(2 * n) < n if at_start else np.arange(2 * n) >= n
            ii, jj, mom = exact_kernel_correction(seg.length[chain], seg.radius[chain], False,
                                                  reach)
            keep = ~is_image[ii] & is_image[jj]
            obs, src, mom = chain[ii[keep]], chain[jj[keep]], mom[:, keep]
            # an image segment runs against the chain: v -> 1 - v
            m00, m01, m10, m11 = mom
            image.static[:, obs, src] += np.stack([m00, m00 - m01, m10, m10 - m11])

    def _check_frequency(self, f_hz: float) -> None:
        if not (f_hz > 0 and math.isfinite(f_hz)):
            raise FabplanError("frequency must be positive", field="frequency", value=f_hz)
        lam = C0 / f_hz
        ka = 2 * math.pi * float(self.segments.radius.max()) / lam
        if ka > MAX_KA:
            raise FabplanError(f"the wire is too thick for the thin-wire model at "
                               f"{f_hz / 1e6:.6g} MHz (k a = {ka:.3g} > {MAX_KA:g})",
                               field="frequency", value=f_hz)
        longest = float(self.segments.length.max())
        if longest > MAX_SEGMENT_WAVELENGTHS * lam:
            raise FabplanError(f"segments up to {longest * 1e3:.4g} mm are too long at "
                               f"{f_hz / 1e6:.6g} MHz (limit lambda/"
                               f"{1 / MAX_SEGMENT_WAVELENGTHS:g}): mesh for a higher top "
                               "frequency", field="frequency", value=f_hz)

    # -- matrix -----------------------------------------------------------------
    def _assemble(self, v: np.ndarray, s: np.ndarray, omega: float) -> np.ndarray:
        """Basis-to-basis matrix (unknowns x unknowns, ohm) from the pair terms of
        `PairIntegrals.fill`: each basis is a rising half on one segment and a falling
        half on the next; the scalar-potential part carries their charge densities
        (+1/l rising, -1/l falling), hence the signs."""
        n = self.n_seg
        if self._gather_idx is None:
            r, f = self._rs, self._fs  # segment index of each basis' halves (n = none)
            self._gather_idx = [(rows[:, None] * (n + 1) + cols[None, :])
                                for rows, cols in ((r, r), (r, f), (f, r), (f, f))]
        jwmu = 1j * omega * MU0
        sc = s * (1.0 / (1j * omega * EPS0))
        h = np.zeros((n + 1, n + 1), dtype=complex)
        body = h[:n, :n]
        out = None
        for c, (idx, sign) in enumerate(zip(self._gather_idx, (1.0, -1.0, -1.0, 1.0))):
            np.multiply(v[c], jwmu, out=body)
            if sign > 0:
                body += sc
            else:
                body -= sc
            part = np.take(h, idx)
            out = part if out is None else out.__iadd__(part)
        return out

    def internal_impedance(self, f_hz: float) -> np.ndarray:
        """Internal impedance per unit length of each segment (ohm/m); 0 where lossless."""
        zs = np.zeros(self.n_seg, dtype=complex)
        if self.resistivity is None:
            return zs
        for r in np.unique(self.segments.radius):
            zs[self.segments.radius == r] = internal_impedance(f_hz, float(r), self.resistivity,
                                                               self.tube_wall)
        zs[self.lossless] = 0.0
        return zs

    def _loss_terms(self, f_hz: float) -> tuple[np.ndarray, np.ndarray] | None:
        """The Z_s-weighted overlap of the basis functions (ohm), which is tridiagonal in
        the basis order: (diagonal (unknowns,), couplings (pairs,)) for the pairs
        `self._loss_pairs`. Rising-rising and falling-falling halves l/3, a rising and a
        falling half on one segment l/6."""
        if self.resistivity is None:
            return None
        zl = np.append(self.internal_impedance(f_hz) * self.segments.length, 0.0)
        if self._loss_pairs is None:
            # basis m's falling half and basis n's rising half on the same segment
            seg_of_rise = np.full(self.n_seg + 1, -1)
            seg_of_rise[self._rs] = np.arange(self.unknowns)
            n = seg_of_rise[self._fs]
            ok = (self._fs < self.n_seg) & (n >= 0)
            self._loss_pairs = (np.nonzero(ok)[0], n[ok])
        pm, _ = self._loss_pairs
        return zl[self._rs] / 3 + zl[self._fs] / 3, zl[self._fs[pm]] / 6

    def loss_matrix(self, f_hz: float) -> np.ndarray | None:
        """The conductor-loss part of the impedance matrix (ohm), dense; None if lossless."""
        terms = self._loss_terms(f_hz)
        if terms is None:
            return None
        z = np.zeros((self.unknowns, self.unknowns), dtype=complex)
        self._add_loss(z, terms)
        return z

    def _add_loss(self, z: np.ndarray, terms: tuple[np.ndarray, np.ndarray]) -> None:
        diag, off = terms
        pm, pn = self._loss_pairs  # type: ignore[misc]
        idx = np.arange(self.unknowns)
        z[idx, idx] += diag
        z[pm, pn] += off
        z[pn, pm] += off

    def matrix(self, f_hz: float, phases: tuple[np.ndarray, np.ndarray | None] | None = None
               ) -> tuple[np.ndarray, tuple[np.ndarray, np.ndarray] | None]:
        """The impedance matrix (unknowns x unknowns, ohm) at f_hz, loss included, and the
        loss terms (see `_loss_terms`; None for a perfect conductor).

        `phases`: exp(-jkR) at the quadrature points (free, image), when the caller
        already has them (a sweep advances them from one frequency to the next).
        """
        self._check_frequency(f_hz)
        free, image = self._integrals()
        omega = 2 * math.pi * f_hz
        k = omega / C0
        ph_free, ph_image = phases if phases is not None else (None, None)
        z = self._assemble(*free.fill(k, ph_free), omega)
        if image is not None:
            z -= self._assemble(*image.fill(k, ph_image), omega)
        terms = self._loss_terms(f_hz)
        if terms is not None:
            self._add_loss(z, terms)
        return z, terms

    # -- solving ------------------------------------------------------------------
    def solve(self, f_hz: float) -> Solution:
        """Currents, impedance and powers at `f_hz` (Hz), 1 V across the gap."""
        with _OneBlasThread():
            return self._solve(float(f_hz), None)

    def _solve(self, f_hz: float, phases: tuple[np.ndarray, np.ndarray | None] | None
               ) -> Solution:
        from scipy.linalg import solve

        z, loss = self.matrix(f_hz, phases)
        cur = solve(z, self.excitation.astype(complex), assume_a="sym", check_finite=False)
        i_in = complex(self.excitation @ cur)
        z_in = 1.0 / i_in
        p_in = 0.5 * i_in.real
        p_loss = 0.0
        if loss is not None:
            diag, off = loss
            pm, pn = self._loss_pairs  # type: ignore[misc]
            cross = np.conj(cur[pm]) * cur[pn]
            # Re(I^H Z I) = I^H Re(Z) I: Re(Z) is real symmetric, so I^H Re(Z) I is real
            p_loss = 0.5 * float(np.sum(diag.real * np.abs(cur) ** 2)
                                 + 2 * np.sum(off.real * cross.real))
        p_rad = p_in - p_loss
        eff = p_rad / p_in if p_in > 0 else float("nan")
        return Solution(f_hz, z_in, cur, p_in, p_loss, p_rad, eff)

    def impedance(self, f_hz: float) -> complex:
        """Input impedance at the feed (ohm)."""
        return self.solve(f_hz).z_in

    def solutions(self, f_hz: np.ndarray) -> list[Solution]:
        """Solve at every frequency of `f_hz` (Hz). Equally spaced frequencies reuse the
        phase factors exp(-jkR), advancing them by one multiplication per step."""
        f = np.atleast_1d(np.asarray(f_hz, dtype=float))
        for x in f:
            self._check_frequency(float(x))
        steps = np.diff(f)
        uniform = len(f) > 2 and np.allclose(steps, steps[0], rtol=1e-9, atol=0.0)
        with _OneBlasThread():
            return self._sweep(f, uniform)

    def _sweep(self, f: np.ndarray, uniform: bool) -> list[Solution]:
        free, image = self._integrals()
        out: list[Solution] = []
        if not uniform:
            return [self._solve(float(x), None) for x in f]
        steps = np.diff(f)
        dk = 2 * math.pi * float(steps[0]) / C0
        rot_free = free.phase(dk)
        rot_image = image.phase(dk) if image is not None else None
        ph_free = ph_image = None
        for n, x in enumerate(f):
            k = 2 * math.pi * float(x) / C0
            if n % 32 == 0:  # start afresh now and then: no drift from the products
                ph_free = free.phase(k)
                ph_image = image.phase(k) if image is not None else None
            else:
                ph_free = ph_free * rot_free
                if rot_image is not None and ph_image is not None:
                    ph_image = ph_image * rot_image
            out.append(self._solve(float(x), (ph_free, ph_image)))
        return out

    def sweep(self, f_hz: np.ndarray) -> np.ndarray:
        """Input impedances (ohm) at each frequency of `f_hz` (Hz)."""
        return np.array([s.z_in for s in self.solutions(f_hz)], dtype=complex)

    def segment_currents(self, solution: Solution) -> tuple[np.ndarray, np.ndarray]:
        """Current (A) at the start and at the end of every segment, along its direction."""
        cur = np.append(solution.currents, 0.0)
        n = self.n_seg
        start = cur[self.half_basis[2 * np.arange(n) + 1]]
        end = cur[self.half_basis[2 * np.arange(n)]]
        return start, end

    @property
    def total_length_mm(self) -> float:
        return float(self.segments.length.sum()) * 1e3


def wire_model(nodes_mm: np.ndarray, radius_mm: float | np.ndarray, *, closed: bool,
               source_segments: Sequence[int], resistivity_ohm_m: float | None = None,
               tube_wall_mm: float | None = None, lossless_segments: Sequence[int] = (),
               ground_z_mm: float | None = None,
               max_unknowns: int = DEFAULT_MAX_UNKNOWNS) -> WireModel:
    """A wire model from polyline nodes.

    nodes_mm: (N+1, 3) nodes in order (mm); closed: the last node joins the first
    (then there are N+1 segments, the last one closing the loop); radius_mm: the
    wire radius (mm), or one radius per segment; source_segments: indices of the
    segments carrying the gap field; resistivity_ohm_m: None for a perfect
    conductor; tube_wall_mm: the wall of a tube (mm); lossless_segments: segments
    without conductor loss (the gap itself); ground_z_mm: height of a perfect
    ground plane (mm), None for free space.

    An open end has no end cap (the current is zero at its last node). For thick
    wires (a/lambda ~ 0.003) the resonance of an open-ended wire still moves by about
    0.2 % each time the end segments are halved; closed paths (every `path_model`)
    have no open ends.
    """
    nodes = np.asarray(nodes_mm, dtype=float)
    if nodes.ndim != 2 or nodes.shape[1] != 3 or len(nodes) < 2:
        raise FabplanError("nodes must be an (N, 3) array of at least two points",
                           field="nodes", value=getattr(nodes, "shape", None))
    n_seg = len(nodes) if closed else len(nodes) - 1
    r = np.broadcast_to(np.asarray(radius_mm, dtype=float), (n_seg,)).copy()
    if np.any(r <= 0):
        raise FabplanError("wire radius must be positive", field="radius_mm",
                           value=float(r.min()))
    if resistivity_ohm_m is not None and resistivity_ohm_m <= 0:
        raise FabplanError("resistivity must be positive", field="resistivity_ohm_m",
                           value=resistivity_ohm_m)
    wall = None
    if tube_wall_mm is not None:
        if tube_wall_mm <= 0:
            raise FabplanError("tube wall must be positive", field="tube_wall_mm",
                               value=tube_wall_mm)
        wall = tube_wall_mm * 1e-3
    if ground_z_mm is not None:
        below = nodes[:, 2] < ground_z_mm - 1e-9
        if np.any(below):
            raise FabplanError("the wire dips below the ground plane", field="ground_z_mm",
                               value=ground_z_mm)
    return WireModel(nodes * 1e-3, r * 1e-3, closed, source_segments, resistivity_ohm_m,
                     wall, lossless_segments, None if ground_z_mm is None else ground_z_mm * 1e-3,
                     max_unknowns)


def path_model(path: BendPath, radius_mm: float, *, f_max_hz: float,
               resistivity_ohm_m: float | None = None, tube_wall_mm: float | None = None,
               ground_z_mm: float | None = None, seg_per_wavelength: float = 20.0,
               min_seg_per_180: int = 8, max_unknowns: int = DEFAULT_MAX_UNKNOWNS) -> WireModel:
    """Mesh a bend path's centreline and build its wire model.

    Arcs become length-keeping polygons (at least `min_seg_per_180` segments per
    180 degrees), no segment is longer than lambda/`seg_per_wavelength` at
    `f_max_hz`, neighbours stay within 2:1, and a gapped path is closed by one
    source segment of the gap's real width (lossless) between end B and end A.
    A path without a gap is refused (there is nothing to feed). radius_mm: wire
    radius (mm); tube_wall_mm: the tube's wall (mm) for the internal impedance.
    """
    from .mesh import mesh_path

    if not (f_max_hz > 0):
        raise FabplanError("top frequency must be positive", field="f_max_hz", value=f_max_hz)
    lam_mm = C0 / f_max_hz * 1e3
    if 2 * math.pi * radius_mm / lam_mm > MAX_KA:
        raise FabplanError(f"a {2 * radius_mm:.3g} mm conductor is too thick for the thin-wire "
                           f"model at {f_max_hz / 1e6:.6g} MHz", field="radius_mm",
                           value=radius_mm)
    for b in path.bends:
        if b.radius_mm < radius_mm:
            raise FabplanError("a bend's centreline radius is smaller than the wire radius",
                               field="bend radius", value=b.radius_mm)
    if path.gap_mm is None:
        raise FabplanError("the electrical model needs a feed gap on the path", field="gap",
                           value=None)
    mesh = mesh_path(path, lam_mm / seg_per_wavelength, min_seg_per_180,
                     MIN_SEGMENT_RADII * radius_mm)
    unknowns = len(mesh.nodes)
    if unknowns > max_unknowns:
        raise FabplanError(f"the mesh needs {unknowns} unknowns, more than the cap of "
                           f"{max_unknowns}: lower the top frequency or the segments per "
                           "wavelength, or raise the cap", field="unknowns", value=unknowns)
    model = wire_model(mesh.nodes, radius_mm, closed=True, source_segments=mesh.source_segments,
                       resistivity_ohm_m=resistivity_ohm_m, tube_wall_mm=tube_wall_mm,
                       lossless_segments=mesh.source_segments, ground_z_mm=ground_z_mm,
                       max_unknowns=max_unknowns)
    tight = [b.radius_mm for b in path.bends if b.radius_mm < TIGHT_BEND_RADII * radius_mm]
    if tight or mesh.coarse_bends:
        r = min(tight) if tight else min(b.radius_mm for b in path.bends)
        model.findings.append(Finding(
            "em-tight-bend", "warning",
            f"a bend of {r:.3g} mm centreline radius is under {TIGHT_BEND_RADII:g} wire radii: "
            "the thin-wire model treats it with fewer, wire-radius-long segments and is less "
            "certain there"))
    model.mesh = mesh
    log.debug("meshed %.1f mm of path into %d segments (%d unknowns), longest %.2f mm",
              path.centreline_length(), len(mesh.lengths), model.unknowns, mesh.lengths.max())
    return model
