"""Thin-wire method of moments: a model of a whole structure, its impedances and currents.

Formulation: the mixed-potential integral equation on straight segments, Galerkin
testing, and the reduced kernel with exact near terms (see `kernel`). A basis function is
a rooftop made of at most two half-segments, each with its segment, its kind (rising: the
current u along the segment, falling: 1 - u) and a sign. Where two segment ends meet,
one basis carries the current through; where k ends meet (a junction), k - 1 bases each
carry current in through the first end and out through one of the others, so
Kirchhoff's current law holds at the node for any solution; a free end has none (the
current is zero there); a wire end on a perfect ground plane has a half-basis that
continues into its image (horizontal currents and all charges reverse in the image).

A gap is one segment of its real width. A source is a uniform field V/g along its gap,
so the result converges as the mesh is refined with the gap held fixed; its current is
the gap's mean current (the Galerkin reaction), and the input impedance V / I. A load
puts its impedance into the same place (Z += z_L e e^T), so its voltage is z_L times the
gap current. Conductor loss enters as the internal impedance per unit length (`loss`),
Galerkin-weighted; the powers (input, conductor, loads) come from the solved currents,
and the radiated power is the input minus the losses.

The matrix is filled once per frequency from the upper triangle of segment pairs only
(block by block of rows, see `kernel.block_halves`) and solved with LAPACK's symmetric
(Bunch-Kaufman) solver, which reads only that triangle. Geometry-only terms are computed
once per model; an evenly spaced sweep advances exp(-jkR) by one multiplication per step.

Memory: before filling, the model estimates the bytes of its pair data and matrices
from the segment and unknown counts (`fill_bytes`) and refuses, with one FabplanError
line, a structure needing more than `max_fill_bytes` (default `MAX_FILL_BYTES`, 768
MiB).

Ground: free space or a perfect ground plane (image theory). Real (lossy) ground is not
modelled.

Units: millimetres at the interface (nodes, radii, walls), hertz, ohms, watts, volts,
amperes (peak phasors); metres inside.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Literal

import numpy as np

from ..errors import FabplanError, Finding
from ..logs import log
from .kernel import (
    CHARGE_SIGN,
    SWAP,
    Block,
    SegmentSet,
    block_geometry,
    block_halves,
    exact_kernel_correction,
)
from .loss import MU0, internal_impedance
from .structure import Port, Structure, TunedCapacitor, close_pairs

if TYPE_CHECKING:  # pragma: no cover
    from ..geometry.path import BendPath
    from .mesh import Mesh, StructureMesh

__all__ = ["wire_model", "path_model", "structure_model", "WireModel", "StructureModel",
           "Solution", "GapFigure", "PowerFigures", "C0", "EPS0", "ETA0",
           "MIN_SEGMENT_RADII", "MAX_KA", "MAX_FILL_BYTES", "fill_bytes"]


C0 = 299_792_458.0  # m/s
EPS0 = 1.0 / (MU0 * C0 * C0)
ETA0 = MU0 * C0

MIN_SEGMENT_RADII = 1.0  # shortest segment, in wire radii (reduced-kernel guard)
MAX_KA = 0.1  # largest k a (wire circumference 1/60 of a wavelength)
MAX_SEGMENT_WAVELENGTHS = 0.1  # longest segment at the solved frequency
TIGHT_BEND_RADII = 3.0  # bends tighter than this many wire radii draw a warning
SPACING_DIAMETERS = 3.0  # closer conductors (centre to centre) draw a warning
DEFAULT_MAX_UNKNOWNS = 2000
# segments per wavelength at the sweep's top frequency (the longest a segment may be):
# a three-element beam's resonance moves 0.02 % from 40 to 80 and 0.1 % from 20 to 80,
# its gain 0.006 dB and 0.04 dB (the bundled beam, measured when this was set)
SEGMENTS_PER_WAVELENGTH = 40.0
MAX_FILL_BYTES = 768 * 2 ** 20  # the fill's pair data and matrices may take this much
_BAND_PAIRS = 48_000  # pairs per block of the fill (rows x columns)
_RESEED = 32  # a sweep recomputes exp(-jkR) afresh every this many steps
_SYM_SOLVE_FROM = 400  # from this many rows LAPACK's symmetric solver beats LU (one thread)


class _OneBlasThread:
    """Run the BLAS/LAPACK behind numpy and scipy on one thread while solving.

    The matrices here are small (a few hundred unknowns): OpenBLAS threads gain little
    and, on a busy two-core machine, spin against each other and slow a sweep several
    times over. The loaded OpenBLAS libraries are found in /proc/self/maps; where that
    fails (another platform, another BLAS) this does nothing.
    """

    _libs: list[tuple[Any, Any]] | None = None

    @classmethod
    def _find(cls) -> list[tuple[Any, Any]]:
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


# -- results -----------------------------------------------------------------------------------
@dataclass(frozen=True)
class GapFigure:
    """A port or load at a stated transmitter power: the gap's current and the voltage
    across it (peak phasors, A and V), and the load's impedance (ohm) for a load."""

    name: str
    kind: Literal["port", "load"]
    current_a: complex
    voltage_v: complex
    impedance_ohm: complex | None = None

    @property
    def current_rms_a(self) -> float:
        return abs(self.current_a) / math.sqrt(2)

    @property
    def voltage_rms_v(self) -> float:
        return abs(self.voltage_v) / math.sqrt(2)


@dataclass(frozen=True)
class PowerFigures:
    """The solution scaled to `power_w` delivered to the port(s): every gap's figures, the
    largest conductor current (peak and RMS, A) and the powers (W)."""

    power_w: float
    gaps: tuple[GapFigure, ...]
    i_max_a: float
    p_conductor_w: float
    p_load_w: float
    p_rad_w: float

    @property
    def i_max_rms_a(self) -> float:
        return self.i_max_a / math.sqrt(2)

    def gap(self, name: str) -> GapFigure:
        for g in self.gaps:
            if g.name == name:
                return g
        raise FabplanError("no port or load of that name", field="name", value=name)


@dataclass(frozen=True, eq=False)
class Solution:
    """The solved currents at one frequency with every port at its own voltage
    (`Port.amplitude` volts at `Port.phase_deg`; 1 V for the usual single port).

    `z_in` (ohm): the input impedance of the first port group, or else of the first port
    (its active impedance when other ports are driven too); `currents`: each basis
    function's amplitude (A); powers in W (peak phasors, P = Re(V I*)/2): `p_in_w` into
    the ports, `p_loss_w` = `p_conductor_w` (skin effect) + `p_load_w` (loads), `p_rad_w`
    = p_in - p_loss, `efficiency` = p_rad / p_in. Per port (in structure order):
    `port_names`, `port_voltages`, `port_currents` (the gap's mean current), `z_active`;
    `z_ports` the open-circuit impedance matrix between the ports (when there are
    several); `z_groups` the input impedance of each parallel group. Per load:
    `load_names`, `load_impedances`, `load_currents`, `load_voltages` (z_L I). `i_max_a`:
    the largest current on any conductor. `capacitance_f`: the solved tuning capacitor.
    """

    f_hz: float
    z_in: complex
    currents: np.ndarray
    p_in_w: float
    p_loss_w: float
    p_rad_w: float
    efficiency: float
    p_conductor_w: float = 0.0
    p_load_w: float = 0.0
    port_names: tuple[str, ...] = ()
    port_voltages: np.ndarray = field(default_factory=lambda: np.zeros(0, complex))
    port_currents: np.ndarray = field(default_factory=lambda: np.zeros(0, complex))
    z_ports: np.ndarray | None = None
    z_groups: dict[str, complex] = field(default_factory=dict)
    load_names: tuple[str, ...] = ()
    load_impedances: np.ndarray = field(default_factory=lambda: np.zeros(0, complex))
    load_currents: np.ndarray = field(default_factory=lambda: np.zeros(0, complex))
    load_voltages: np.ndarray = field(default_factory=lambda: np.zeros(0, complex))
    i_max_a: float = 0.0
    capacitance_f: float | None = None

    @property
    def z_active(self) -> np.ndarray:
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.asarray(self.port_voltages / self.port_currents)

    def at_power(self, power_w: float) -> PowerFigures:
        """Every gap's current and voltage, the largest conductor current and the powers
        with `power_w` (W) delivered to the port(s) (all scaled together)."""
        if not (math.isfinite(power_w) and power_w > 0):
            raise FabplanError("the transmitter power must be positive", field="power_w",
                               value=power_w)
        if not self.p_in_w > 0:
            raise FabplanError("the ports take no power at this frequency: no scale",
                               field="p_in_w", value=self.p_in_w)
        k = math.sqrt(power_w / self.p_in_w)
        p = k * k
        gaps = [GapFigure(n, "port", complex(i * k), complex(v * k))
                for n, v, i in zip(self.port_names, self.port_voltages, self.port_currents,
                                     strict=True)]
        gaps += [GapFigure(n, "load", complex(i * k), complex(v * k), complex(z))
                 for n, z, i, v in zip(self.load_names, self.load_impedances,
                                       self.load_currents, self.load_voltages, strict=True)]
        return PowerFigures(power_w, tuple(gaps), self.i_max_a * k, self.p_conductor_w * p,
                            self.p_load_w * p, self.p_rad_w * p)


# -- basis ------------------------------------------------------------------------------------
@dataclass
class _Basis:
    """Basis functions in matrix order: index p = m + 1 for the chain candidate m (rising
    half of segment m, falling half of segment m + 1), p = 0 and p = S unused, then the
    other bases from p = S + 1 on. Slots: (P, 2) segment, kind (0 rising, 1 falling) and
    sign (0: empty)."""

    seg: np.ndarray
    kind: np.ndarray
    sign: np.ndarray
    valid: np.ndarray
    n_seg: int

    @property
    def size(self) -> int:
        return len(self.valid)

    @property
    def extra_start(self) -> int:
        return self.n_seg + 1


def _build_basis(seg_start: np.ndarray, seg_end: np.ndarray, n_nodes: int,
                 on_ground: np.ndarray) -> _Basis:
    n_seg = len(seg_start)
    ends: list[list[tuple[int, int]]] = [[] for _ in range(n_nodes)]
    for s in range(n_seg):
        ends[int(seg_start[s])].append((s, 1))  # the falling half meets the start node
        ends[int(seg_end[s])].append((s, 0))  # the rising half meets the end node
    chain_valid = np.zeros(n_seg + 1, bool)
    extra: list[list[tuple[int, int, float]]] = []
    for node in range(n_nodes):
        e = sorted(ends[node])
        if not e:
            continue
        if on_ground[node]:
            for s, k in e:
                extra.append([(s, k, 1.0)])
            continue
        if len(e) < 2:
            continue
        first = None
        for s, k in e:
            if k == 0 and (s + 1, 1) in e and s + 1 < n_seg:
                first = (s, k)
                chain_valid[s + 1] = True  # p = m + 1 for m = s
                break
        rest = list(e)
        if first is not None:
            rest.remove(first)
            rest.remove((first[0] + 1, 1))
        else:
            first = rest.pop(0)
        inn = 1.0 if first[1] == 0 else -1.0  # current in through the first end
        for s, k in rest:
            out = -(1.0 if k == 0 else -1.0)  # and out through this one
            extra.append([(first[0], first[1], inn), (s, k, out)])
    n_big = n_seg + 1 + len(extra)
    seg = np.full((n_big, 2), -1, dtype=np.int64)
    kind = np.zeros((n_big, 2), dtype=np.int64)
    sign = np.zeros((n_big, 2))
    m = np.arange(n_seg - 1)
    seg[m + 1, 0], kind[m + 1, 0], sign[m + 1, 0] = m, 0, 1.0
    seg[m + 1, 1], kind[m + 1, 1], sign[m + 1, 1] = m + 1, 1, 1.0
    valid = np.zeros(n_big, bool)
    valid[:n_seg + 1] = chain_valid
    valid[0] = valid[n_seg] = False
    unused = np.nonzero(~chain_valid)[0]
    sign[unused] = 0.0
    seg[unused] = -1
    for q, slots in enumerate(extra):
        p = n_seg + 1 + q
        valid[p] = True
        for x, (s, k, sg) in enumerate(slots):
            seg[p, x], kind[p, x], sign[p, x] = s, k, sg
    return _Basis(seg, kind, sign, valid, n_seg)


def _chains(seg_start: np.ndarray, seg_end: np.ndarray, n_nodes: int, on_ground: np.ndarray
            ) -> list[tuple[list[int], list[bool], bool]]:
    """Runs of segments joined end to end through nodes where exactly two segment ends meet:
    (segments in order, each traversed backwards?, closed)."""
    n_seg = len(seg_start)
    ends: list[list[tuple[int, int]]] = [[] for _ in range(n_nodes)]
    for s in range(n_seg):
        ends[int(seg_start[s])].append((s, 0))  # 0: the segment's start
        ends[int(seg_end[s])].append((s, 1))  # 1: its end
    link: dict[tuple[int, int], tuple[int, int]] = {}
    for node in range(n_nodes):
        if len(ends[node]) == 2 and not on_ground[node]:
            a, b = ends[node]
            link[a] = b
            link[b] = a
    seen = np.zeros(n_seg, bool)
    out = []
    for s0 in range(n_seg):
        if seen[s0]:
            continue
        # back to the head: leave each segment through the end it was entered by
        s, flip, closed = s0, False, False
        while True:
            nxt = link.get((s, 1 if flip else 0))
            if nxt is None:
                break
            s, e = nxt
            if s == s0:
                closed = True
                break
            flip = e == 0  # walking back we leave through e: forwards it is the exit
        head, head_flip = (s0, False) if closed else (s, flip)
        segs, flips = [head], [head_flip]
        seen[head] = True
        s, flip = head, head_flip
        while True:
            nxt = link.get((s, 0 if flip else 1))  # leave through the far end
            if nxt is None:
                break
            s, e = nxt
            if s == head:
                closed = True
                break
            flip = e == 1  # entered at its end: traversed backwards
            segs.append(s)
            flips.append(flip)
            seen[s] = True
        out.append((segs, flips, closed))
    return out


# -- the model ----------------------------------------------------------------------------------
class WireModel:
    """A meshed structure with its ports, loads, conductors and ground.

    Build with `structure_model` (a `Structure`), `path_model` (one gapped bend path) or
    `wire_model` (one polyline). `unknowns` is the number of basis functions; `findings`
    lists warnings about the thin-wire limits and close approaches; `segments` (a
    `kernel.SegmentSet`, metres) and `segment_currents(solution)` give the current along
    every segment; `ground_z` is the ground plane's height (m) or None.
    """

    def __init__(self, mesh: StructureMesh, resistivity_ohm_m: np.ndarray,
                 tube_wall_m: np.ndarray, ground_z_m: float | None,
                 max_unknowns: int = DEFAULT_MAX_UNKNOWNS,
                 max_fill_bytes: float = MAX_FILL_BYTES) -> None:
        nodes = np.asarray(mesh.nodes, float) * 1e-3
        a, b = nodes[mesh.seg_start], nodes[mesh.seg_end]
        vec = b - a
        length = np.linalg.norm(vec, axis=1)
        if np.any(length <= 0):
            k = int(np.argmin(length))
            raise FabplanError("two consecutive nodes coincide: every segment needs a length",
                               field=f"segment {k}", value=0.0)
        self.mesh: Mesh | StructureMesh | None = mesh
        self.structure_mesh = mesh
        self.nodes = nodes
        self.segments = SegmentSet(a.copy(), vec / length[:, None], length,
                                   np.asarray(mesh.radius, float) * 1e-3)
        self.n_seg = len(length)
        self.seg_start = np.asarray(mesh.seg_start, np.int64)
        self.seg_end = np.asarray(mesh.seg_end, np.int64)
        self.resistivity = np.asarray(resistivity_ohm_m, float)
        self.tube_wall = np.asarray(tube_wall_m, float)
        self.lossless = np.asarray(mesh.lossless, bool).copy()
        self.ground_z = ground_z_m
        self.exact_kernel = True
        self.exact_reach_radii = 10.0
        self.max_fill_bytes = float(max_fill_bytes)
        self.findings: list[Finding] = []
        self.feeds = list(mesh.feeds)
        self.ports = [(f, f.element) for f in self.feeds if isinstance(f.element, Port)]
        self.loads = [(f, f.element) for f in self.feeds if not isinstance(f.element, Port)]
        if not self.ports:
            raise FabplanError("a model needs at least one port (a source in a gap)",
                               field="ports", value=0)
        on_ground = np.asarray(mesh.on_ground, bool)
        self.basis = _build_basis(self.seg_start, self.seg_end, len(nodes), on_ground)
        self.unknowns = int(self.basis.valid.sum())
        if self.unknowns == 0:
            raise FabplanError("an open wire needs at least two segments", field="nodes",
                               value=self.n_seg)
        if self.unknowns > max_unknowns:
            raise FabplanError(f"the model needs {self.unknowns} unknowns, more than the cap of "
                               f"{max_unknowns}: lower the top frequency or the segments per "
                               "wavelength, or raise the cap", field="unknowns",
                               value=self.unknowns)
        self._on_ground = on_ground
        need = fill_bytes(self.n_seg, self.basis.size, ground_z_m is not None,
                          rows_per_band=self._bands()[0][1])
        if need > self.max_fill_bytes:
            raise FabplanError(
                f"the fill would take about {need / 2 ** 20:.0f} MiB for {self.n_seg} segments "
                f"and {self.unknowns} unknowns, above the bound of "
                f"{self.max_fill_bytes / 2 ** 20:.0f} MiB: lower the top frequency or the "
                "segments per wavelength, or split the structure", field="segments",
                value=self.n_seg)
        self._valid_idx = np.nonzero(self.basis.valid)[0]
        self._invalid_idx = np.nonzero(~self.basis.valid)[0]
        self._feed_vectors = {id(f): self._gap_vector(f.segments) for f in self.feeds}
        self._check_segments()
        self._setup_done = False
        self._conductor_groups: tuple[np.ndarray, np.ndarray] | None = None
        self._capacitance: float | None = None
        self._slot_maps()

    # -- set-up ---------------------------------------------------------------------------------
    @property
    def source_segments(self) -> tuple[int, ...]:
        return tuple(self.ports[0][0].segments)

    @property
    def closed(self) -> bool:
        return bool(self.n_seg and self.seg_end[-1] == self.seg_start[0])

    def _gap_vector(self, segments: Sequence[int]) -> np.ndarray:
        """e with e . I the gap's mean current: a uniform field 1/g along the gap's segments
        (g their total length) tested with each basis: (l_k / 2) / g per half on them."""
        segs = sorted(set(int(s) for s in segments))
        g = float(sum(self.segments.length[s] for s in segs))
        e = np.zeros(self.basis.size)
        for s in segs:
            hit = self.basis.seg == s
            e += np.sum(np.where(hit, self.basis.sign, 0.0), axis=1) \
                * (0.5 * float(self.segments.length[s]) / g)
        return e

    def _slot_maps(self) -> None:
        b = self.basis
        p, x = np.nonzero(b.sign != 0)
        self._slot_p = p
        self._slot_seg = b.seg[p, x]
        self._slot_kind = b.kind[p, x]
        self._slot_sign = b.sign[p, x]
        # conductor loss: pairs of slots on the same segment, upper triangle (p <= q)
        rows, cols, segs, coef = [], [], [], []
        by_seg: dict[int, list[int]] = {}
        for t, s in enumerate(self._slot_seg):
            by_seg.setdefault(int(s), []).append(t)
        for s, lst in by_seg.items():
            for ta in lst:
                for tb in lst:
                    pa, pb = int(self._slot_p[ta]), int(self._slot_p[tb])
                    if pa > pb or (pa == pb and ta != tb):
                        continue
                    same = self._slot_kind[ta] == self._slot_kind[tb]
                    rows.append(pa)
                    cols.append(pb)
                    segs.append(s)
                    coef.append(self._slot_sign[ta] * self._slot_sign[tb]
                                * (1 / 3 if same else 1 / 6))
        self._loss_rows = np.asarray(rows, np.int64)
        self._loss_cols = np.asarray(cols, np.int64)
        self._loss_seg = np.asarray(segs, np.int64)
        self._loss_coef = np.asarray(coef, float)

    def _check_segments(self) -> None:
        seg = self.segments
        short = seg.length < MIN_SEGMENT_RADII * seg.radius * (1 - 1e-9)
        if np.any(short):
            k = int(np.argmax(short))
            raise FabplanError(
                f"segment {k} is {seg.length[k] * 1e3:.3g} mm long, shorter than "
                f"{MIN_SEGMENT_RADII:g} wire radius ({seg.radius[k] * 1e3:.3g} mm): the thin-wire "
                "kernel is not valid there; use fewer, longer segments or a wider feed gap",
                field="segment length", value=round(float(seg.length[k]) * 1e3, 4))

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

    def _bands(self) -> list[tuple[int, int]]:
        s = self.n_seg
        rows = max(8, min(s, _BAND_PAIRS // max(s, 1)))
        return [(i, min(i + rows, s)) for i in range(0, s, rows)]

    def fill_bytes(self) -> int:
        """Estimated bytes of the fill: pair data of the upper triangle (with the sweep's
        phase state), the matrices, and the largest block's temporaries."""
        return fill_bytes(self.n_seg, self.basis.size, self.ground_z is not None,
                          rows_per_band=self._bands()[0][1])

    def _corrections(self) -> tuple[tuple[np.ndarray, np.ndarray, np.ndarray],
                                    tuple[np.ndarray, np.ndarray, np.ndarray] | None]:
        """Exact-kernel corrections along every chain of segments (and through a ground
        node into the images): (i, j, moments) with i <= j, free space and image."""
        seg = self.segments
        free: list[tuple[np.ndarray, np.ndarray, np.ndarray]] = []
        image: list[tuple[np.ndarray, np.ndarray, np.ndarray]] = []
        for segs, flips, closed in _chains(self.seg_start, self.seg_end, len(self.nodes),
                                           self._on_ground):
            idx = np.asarray(segs)
            fl = np.asarray(flips)
            reach = self._reach(idx)
            ci, cj, mom = exact_kernel_correction(seg.length[idx], seg.radius[idx], closed,
                                                  reach)
            free.append(_orient(idx[ci], idx[cj], fl[ci], fl[cj], mom))
            if self.ground_z is None:
                continue
            first = self.seg_end[idx[0]] if fl[0] else self.seg_start[idx[0]]
            last = self.seg_start[idx[-1]] if fl[-1] else self.seg_end[idx[-1]]
            n = len(idx)
            for at_head, node in ((True, first), (False, last)):
                if closed or not self._on_ground[node]:
                    continue
                if at_head:  # the images (reversed) then the chain
                    ext, efl = np.concatenate([idx[::-1], idx]), \
                        np.concatenate([~fl[::-1], fl])
                    is_img = np.arange(2 * n) < n
                else:
                    ext, efl = np.concatenate([idx, idx[::-1]]), \
                        np.concatenate([fl, ~fl[::-1]])
                    is_img = np.arange(2 * n) >= n
                ci, cj, mom = exact_kernel_correction(seg.length[ext], seg.radius[ext], False,
                                                      reach)
                keep = ~is_img[ci] & is_img[cj]
                image.append(_orient(ext[ci[keep]], ext[cj[keep]], efl[ci[keep]],
                                     efl[cj[keep]], mom[:, keep]))
        return _canonical(free, self.n_seg), (_canonical(image, self.n_seg)
                                              if self.ground_z is not None else None)

    def _reach(self, idx: np.ndarray) -> int:
        seg = self.segments
        return int(min(40, max(2, math.ceil(self.exact_reach_radii * float(seg.radius[idx].max())
                                            / float(seg.length[idx].min())))))

    def _setup(self) -> None:
        """Geometry-only terms: the blocks' pair data and the static matrices."""
        if self._setup_done:
            return
        seg = self.segments
        s_n = self.n_seg
        n_big = self.basis.size
        image_set = seg.mirrored(self.ground_z) if self.ground_z is not None else None
        self._image_segments = image_set
        if self.exact_kernel:
            corr_free, corr_img = self._corrections()
        else:
            empty = (np.zeros(0, np.int64), np.zeros(0, np.int64), np.zeros((4, 0)))
            corr_free, corr_img = empty, (empty if image_set is not None else None)
        self._corr = (corr_free, corr_img)
        zv = np.zeros((n_big, n_big))
        zs = np.zeros((n_big, n_big))
        self._blocks: list[tuple[int, int, Block, Block | None]] = []
        for i0, i1 in self._bands():
            rows = np.arange(i0, i1)
            cols = np.arange(i0, s_n)
            keep = cols[None, :] >= rows[:, None]
            blk, v0, s0 = block_geometry(seg, seg, rows, cols, keep, corr_free)
            _accumulate(zv, v0, i0, i1, s_n)
            _accumulate(zs, CHARGE_SIGN[:, None, None] * s0[None], i0, i1, s_n)
            img = None
            if image_set is not None:
                img, v0, s0 = block_geometry(seg, image_set, rows, cols, keep, corr_img)
                _accumulate(zv, -v0, i0, i1, s_n)
                _accumulate(zs, -CHARGE_SIGN[:, None, None] * s0[None], i0, i1, s_n)
            self._blocks.append((i0, i1, blk, img))
        # the other bases: their segments' columns against every segment
        b = self.basis
        ex = np.arange(b.extra_start, n_big)
        self._xs = np.unique(b.seg[ex][b.sign[ex] != 0]) if len(ex) else np.zeros(0, np.int64)
        self._col: tuple[Block, Block | None] | None = None
        if len(ex):
            self._extra_maps()
            both_free = _both_orders(corr_free)
            blk, v0, s0 = block_geometry(seg, seg, np.arange(s_n), self._xs, None, both_free)
            self._place_extras(zv, v0)
            self._place_extras(zs, CHARGE_SIGN[:, None, None] * s0[None])
            img = None
            if image_set is not None and corr_img is not None:
                img, v0, s0 = block_geometry(seg, image_set, np.arange(s_n), self._xs, None,
                                             _both_orders(corr_img))
                self._place_extras(zv, -v0)
                self._place_extras(zs, -CHARGE_SIGN[:, None, None] * s0[None])
            self._col = (blk, img)
        self._zv = zv
        self._zs = zs
        self._setup_done = True
        log.debug("filled geometry of %d segments (%d unknowns) in %d blocks", s_n,
                  self.unknowns, len(self._blocks))

    def _extra_maps(self) -> None:
        """Index arrays for `_place_extras`: every slot of the other bases (column, combo
        offset, source column in `_xs`, sign) and every pair of such slots in the upper
        triangle (row, column, combo, row segment, source column, sign product)."""
        b = self.basis
        p, x = np.nonzero(b.sign[b.extra_start:] != 0)
        p = p + b.extra_start
        pos = np.full(self.n_seg, -1)
        pos[self._xs] = np.arange(len(self._xs))
        seg, kind, sign = b.seg[p, x], b.kind[p, x], b.sign[p, x]
        self._ex_col = p
        self._ex_kind = kind
        self._ex_y = pos[seg]
        self._ex_sign = sign
        rows_q, cols_p = np.meshgrid(np.arange(len(p)), np.arange(len(p)), indexing="ij")
        upper = p[rows_q] <= p[cols_p]
        qa, pa = rows_q[upper], cols_p[upper]
        self._ee = (p[qa], p[pa], 2 * kind[qa] + kind[pa], seg[qa], pos[seg[pa]],
                    sign[qa] * sign[pa])

    def _place_extras(self, z: np.ndarray, h: np.ndarray) -> None:
        """Add the other bases' columns (and their block among themselves) from the half
        interactions h (4, S, X) of every segment with the segments `_xs`."""
        s_n = self.n_seg
        cols, kind, y, sign = self._ex_col, self._ex_kind, self._ex_y, self._ex_sign
        # a rising half on the row segment i belongs to p = i + 1, a falling one to p = i
        start = self.basis.extra_start
        slab = np.zeros((s_n + 1, self.basis.size - start), dtype=z.dtype)
        rows = np.arange(s_n)[:, None]
        at = (cols - start)[None, :]
        np.add.at(slab, (rows + 1, at), h[kind, :, y].T * sign)
        np.add.at(slab, (rows, at), h[2 + kind, :, y].T * sign)
        z[:s_n + 1, start:] += slab
        rq, cp, combo, seg_q, y_p, sg = self._ee
        np.add.at(z, (rq, cp), sg * h[combo, seg_q, y_p])

    # -- matrix --------------------------------------------------------------------------------
    def internal_impedance(self, f_hz: float) -> np.ndarray:
        """Internal impedance per unit length of each segment (ohm/m); 0 where lossless."""
        zs = np.zeros(self.n_seg, dtype=complex)
        if self._conductor_groups is None:
            lossy = np.isfinite(self.resistivity) & ~self.lossless
            keys = np.stack([self.segments.radius, np.nan_to_num(self.resistivity, nan=-1.0),
                             np.nan_to_num(self.tube_wall, nan=-1.0)], axis=1)
            uniq, inverse = np.unique(keys[lossy], axis=0, return_inverse=True)
            groups = np.full(self.n_seg, -1)
            groups[lossy] = inverse.ravel()
            self._conductor_groups = (uniq, groups)
        uniq, groups = self._conductor_groups
        for g, (r, res, wall) in enumerate(uniq):
            zs[groups == g] = internal_impedance(f_hz, float(r), float(res),
                                                 None if wall < 0 else float(wall))
        return zs

    def _fill(self, f_hz: float, phases: list[tuple[np.ndarray, np.ndarray | None]] | None,
              skip_tuned: bool = False, zl: np.ndarray | None = None) -> np.ndarray:
        """The upper triangle of the matrix in basis order (see `_Basis`), unused rows as
        identity rows, loss and loads included. `zl`: the segments' internal impedance
        times their length (ohm), if the caller has it."""
        self._setup()
        omega = 2 * math.pi * f_hz
        k = omega / C0
        n = self.basis.size
        zr = np.zeros((n, n))
        zi = self._zv * (omega * MU0)
        zi -= self._zs * (1.0 / (omega * EPS0))
        s_n = self.n_seg
        for b, (i0, i1, blk, img) in enumerate(self._blocks):
            ph_f, ph_i = phases[b] if phases is not None else (None, None)
            h_re, h_im = block_halves(blk, k, omega, MU0, EPS0, ph_f)
            if img is not None:
                g_re, g_im = block_halves(img, k, omega, MU0, EPS0, ph_i)
                h_re -= g_re
                h_im -= g_im
            _accumulate(zr, h_re, i0, i1, s_n)
            _accumulate(zi, h_im, i0, i1, s_n)
        if self._col is not None:
            ph_f, ph_i = phases[len(self._blocks)] if phases is not None else (None, None)
            blk, img = self._col
            h_re, h_im = block_halves(blk, k, omega, MU0, EPS0, ph_f)
            if img is not None:
                g_re, g_im = block_halves(img, k, omega, MU0, EPS0, ph_i)
                h_re -= g_re
                h_im -= g_im
            self._place_extras(zr, h_re)
            self._place_extras(zi, h_im)
        z = np.empty((n, n), dtype=complex)
        z.real = zr
        z.imag = zi
        del zr, zi
        if zl is None:
            zl = self.internal_impedance(f_hz) * self.segments.length
        if np.any(zl != 0):
            np.add.at(z, (self._loss_rows, self._loss_cols), zl[self._loss_seg] * self._loss_coef)
        for f, element in self.loads:
            if isinstance(element, TunedCapacitor):
                if skip_tuned:
                    continue
                element = element.with_capacitance(self._tuned_capacitance())
            zload = element.impedance(f_hz)
            if zload != 0:
                e = self._feed_vectors[id(f)]
                nz = np.nonzero(e)[0]
                for a in nz:
                    for b in nz[nz >= a]:
                        z[a, b] += zload * e[a] * e[b]
        inv = self._invalid_idx
        z[inv, :] = 0.0
        z[:, inv] = 0.0
        z[inv, inv] = 1.0
        return z

    def matrix(self, f_hz: float, reference: bool = False
               ) -> tuple[np.ndarray, tuple[np.ndarray, np.ndarray] | None]:
        """The impedance matrix between the basis functions (unknowns x unknowns, ohm) at
        f_hz, loss and loads included, both triangles; and the conductor-loss part as
        (diagonal, None) for compatibility (None for a perfect conductor).

        `reference`: fill every pair of segments (not only the upper triangle) and assemble
        by plain indexing: slow, for checking the fast fill."""
        self._check_frequency(f_hz)
        if reference:
            z = self._reference(f_hz)
        else:
            with _OneBlasThread():
                up = self._fill(f_hz, None)
            v = self._valid_idx
            up = up[np.ix_(v, v)]
            z = np.triu(up) + np.triu(up, 1).T
        loss = self.loss_matrix(f_hz)
        return z, (None if loss is None else (np.diag(loss), loss))

    def _reference(self, f_hz: float) -> np.ndarray:
        self._setup()
        seg = self.segments
        omega = 2 * math.pi * f_hz
        k = omega / C0
        corr_free, corr_img = self._corr
        every = np.arange(self.n_seg)
        blk, v0, s0 = block_geometry(seg, seg, every, every, None, _both_orders(corr_free))
        h_re, h_im = block_halves(blk, k, omega, MU0, EPS0)
        h = h_re + 1j * (h_im + omega * MU0 * v0
                         - CHARGE_SIGN[:, None, None] * s0[None] / (omega * EPS0))
        if self._image_segments is not None and corr_img is not None:
            blk, v0, s0 = block_geometry(seg, self._image_segments, every, every, None,
                                         _both_orders(corr_img))
            h_re, h_im = block_halves(blk, k, omega, MU0, EPS0)
            h -= h_re + 1j * (h_im + omega * MU0 * v0
                              - CHARGE_SIGN[:, None, None] * s0[None] / (omega * EPS0))
        b = self.basis
        v = self._valid_idx
        z = np.zeros((len(v), len(v)), dtype=complex)
        for x in range(2):
            for y in range(2):
                sa, sb = b.seg[v, x], b.seg[v, y]
                ka, kb = b.kind[v, x], b.kind[v, y]
                w = b.sign[v, x][:, None] * b.sign[v, y][None, :]
                idx = 2 * ka[:, None] + kb[None, :]
                z += w * h[idx, sa[:, None], sb[None, :]]
        loss = self.loss_matrix(f_hz)
        if loss is not None:
            z += loss
        for f, element in self.loads:
            if isinstance(element, TunedCapacitor):
                element = element.with_capacitance(self._tuned_capacitance())
            e = self._feed_vectors[id(f)][v]
            z += element.impedance(f_hz) * np.outer(e, e)
        return z

    def loss_matrix(self, f_hz: float) -> np.ndarray | None:
        """The conductor-loss part of the impedance matrix (ohm), dense, between the
        basis functions; None for a perfect conductor."""
        zl = self.internal_impedance(f_hz) * self.segments.length
        if not np.any(zl != 0):
            return None
        n = self.basis.size
        z = np.zeros((n, n), dtype=complex)
        np.add.at(z, (self._loss_rows, self._loss_cols), zl[self._loss_seg] * self._loss_coef)
        z = np.triu(z) + np.triu(z, 1).T
        v = self._valid_idx
        return np.asarray(z[np.ix_(v, v)])

    # -- solving --------------------------------------------------------------------------------
    def solve(self, f_hz: float) -> Solution:
        """Currents, impedances and powers at `f_hz` (Hz), every port at its own voltage."""
        self._check_frequency(float(f_hz))
        with _OneBlasThread():
            return self._solve(float(f_hz), None)

    def _port_vectors(self) -> np.ndarray:
        return np.stack([self._feed_vectors[id(f)] for f, _ in self.ports], axis=1)

    def _solve(self, f_hz: float, phases: list[tuple[np.ndarray, np.ndarray | None]] | None
               ) -> Solution:
        zl = self.internal_impedance(f_hz) * self.segments.length
        z = self._fill(f_hz, phases, zl=zl)
        e = self._port_vectors()
        x = _solve_upper(z, e.astype(complex))
        y = e.T @ x  # short-circuit admittances between the ports
        v = np.array([p.voltage for _, p in self.ports], dtype=complex)
        cur = x @ v
        i_port = y @ v
        p_in = 0.5 * float(np.real(np.sum(v * np.conj(i_port))))
        # conductor loss: I^H Re(Z_loss) I over the upper-triangle entries
        p_cond = 0.0
        if np.any(zl != 0):
            r = np.real(zl[self._loss_seg]) * self._loss_coef
            a, b = self._loss_rows, self._loss_cols
            cross = np.real(np.conj(cur[a]) * cur[b])
            p_cond = 0.5 * float(np.sum(np.where(a == b, r * cross, 2 * r * cross)))
        names, zload, iload = [], [], []
        for f, element in self.loads:
            if isinstance(element, TunedCapacitor):
                element = element.with_capacitance(self._tuned_capacitance())
            names.append(element.name)
            zload.append(element.impedance(f_hz))
            iload.append(complex(self._feed_vectors[id(f)] @ cur))
        zload_a = np.asarray(zload, complex)
        iload_a = np.asarray(iload, complex)
        p_load = 0.5 * float(np.sum(zload_a.real * np.abs(iload_a) ** 2))
        p_loss = p_cond + p_load
        p_rad = p_in - p_loss
        groups: dict[str, complex] = {}
        for g in dict.fromkeys(p.group for _, p in self.ports if p.group is not None):
            sel = [k for k, (_, p) in enumerate(self.ports) if p.group == g]
            i_g = complex(np.sum(np.conj(v[sel]) * i_port[sel]))
            groups[str(g)] = 1.0 / i_g if i_g != 0 else complex(math.inf)
        if groups:
            z_in = next(iter(groups.values()))
        else:
            z_in = v[0] / i_port[0] if i_port[0] != 0 else complex(math.inf)
        z_ports = None
        if len(self.ports) > 1:
            z_ports = np.linalg.inv(y)
        i0, i1 = self._segment_currents_big(cur)
        wire = ~self.lossless
        i_max = float(max(np.max(np.abs(i0[wire]), initial=0.0),
                          np.max(np.abs(i1[wire]), initial=0.0)))
        eff = p_rad / p_in if p_in > 0 else float("nan")
        return Solution(f_hz, complex(z_in), cur[self._valid_idx], p_in, p_loss, p_rad, eff,
                        p_cond, p_load, tuple(p.name for _, p in self.ports), v, i_port,
                        z_ports, groups, tuple(names), zload_a, iload_a, zload_a * iload_a,
                        i_max, self._capacitance)

    def _tuned_capacitance(self) -> float:
        if self._capacitance is None:
            self._capacitance = self._solve_capacitance()
        return self._capacitance

    def tuning_capacitance(self, f_hz: float) -> float:
        """The tuning capacitor's value (F) that would put the target port (or group) at
        X = 0 at `f_hz` (Hz) instead of at its own frequency (a loop tuned across a band)."""
        return self._solve_capacitance(float(f_hz))

    def solve_tuned(self, f_hz: float) -> Solution:
        """Solve at `f_hz` (Hz) with the tuning capacitor re-solved for X = 0 there (its
        value is the solution's `capacitance_f`); the model's own value is kept."""
        c = self.tuning_capacitance(f_hz)
        own = self._capacitance
        self._capacitance = c
        try:
            return self.solve(f_hz)
        finally:
            self._capacitance = own

    def _solve_capacitance(self, at_hz: float | None = None) -> float:
        """The tuning capacitor's value: with the other ports driven as given, the target
        port (or group) sees X = 0 at the capacitor's frequency (or `at_hz`). The
        capacitor's gap is treated as one more port: the admittances Y between the ports
        and that gap give the target's admittance as a bilinear function of the
        capacitor's impedance z, and X = 0 is a quadratic in its reactance."""
        (f, cap), = [(f, e) for f, e in self.loads if isinstance(e, TunedCapacitor)]
        f_hz = cap.f_hz if at_hz is None else at_hz
        self._check_frequency(f_hz)
        omega = 2 * math.pi * f_hz
        with _OneBlasThread():
            z = self._fill(f_hz, None, skip_tuned=True)
            e = np.concatenate([self._port_vectors(), self._feed_vectors[id(f)][:, None]], axis=1)
            x = _solve_upper(z, e.astype(complex))
        y = e.T @ x
        n = len(self.ports)
        v = np.array([p.voltage for _, p in self.ports], dtype=complex)
        w = np.zeros(n, complex)
        names = [p.name for _, p in self.ports]
        if cap.port in names:
            k = names.index(cap.port)
            w[k] = 1.0 / v[k]
        else:
            for k, (_, p) in enumerate(self.ports):
                if p.group == cap.port:
                    w[k] = np.conj(v[k])
        alpha = complex(w @ y[:n, :n] @ v)
        beta = complex((w @ y[:n, n]) * (y[n, :n] @ v))
        gamma = complex(y[n, n])
        delta = alpha * gamma - beta
        z0 = complex((cap.esr_ohm or 0.0) + cap.r_ohm)
        z1 = complex(1.0 / cap.q, -1.0) if cap.q else complex(0.0, -1.0)
        a0, a1 = alpha + delta * z0, delta * z1
        b0, b1 = 1 + np.conj(gamma * z0), np.conj(gamma * z1)
        c0 = (a0 * b0).imag
        c1 = (a0 * b1 + a1 * b0).imag
        c2 = (a1 * b1).imag
        roots = np.roots([c2, c1, c0]) if abs(c2) > 1e-300 else np.roots([c1, c0])
        good = [float(r.real) for r in np.atleast_1d(roots)
                if abs(r.imag) <= 1e-9 * abs(r) and r.real > 0]

        def admittance(xc: float) -> complex:
            zc = z0 + z1 * xc
            return alpha - beta * zc / (1 + gamma * zc)

        if not good:
            best = _least_phase(admittance)
            log.debug("tuning capacitor %s: X = 0 is out of reach at %.6g MHz; set for the "
                      "least phase angle at the port", cap.name, f_hz / 1e6)
            if not math.isfinite(best):
                raise FabplanError(f"no capacitance brings {cap.port!r} near resonance at "
                                   f"{f_hz / 1e6:.6g} MHz", field=cap.name, value=f_hz)
            c = 1.0 / (omega * best)
            return c
        best = max(good, key=lambda xc: abs(admittance(xc)))
        c = 1.0 / (omega * best)
        log.debug("tuning capacitor %s: %.4g pF for X = 0 at %.6g MHz", cap.name, c * 1e12,
                  f_hz / 1e6)
        return c

    @property
    def capacitance_f(self) -> float | None:
        """The solved tuning capacitor (F), if the structure has one."""
        if any(isinstance(e, TunedCapacitor) for _, e in self.loads):
            return self._tuned_capacitance()
        return None

    def impedance(self, f_hz: float) -> complex:
        """Input impedance at the feed (ohm): see `Solution.z_in`."""
        return self.solve(f_hz).z_in

    def solutions(self, f_hz: np.ndarray) -> list[Solution]:
        """Solve at every frequency of `f_hz` (Hz). Equally spaced frequencies reuse the
        phase factors exp(-jkR), advancing them by one multiplication per step."""
        f = np.atleast_1d(np.asarray(f_hz, dtype=float))
        for x in f:
            self._check_frequency(float(x))
        steps = np.diff(f)
        uniform = len(f) > 2 and bool(np.allclose(steps, steps[0], rtol=1e-9, atol=0.0))
        if any(isinstance(e, TunedCapacitor) for _, e in self.loads):
            self._tuned_capacitance()
        with _OneBlasThread():
            if not uniform:
                return [self._solve(float(x), None) for x in f]
            return self._sweep(f)

    def _all_blocks(self) -> list[tuple[Block, Block | None]]:
        out = [(blk, img) for _, _, blk, img in self._blocks]
        if self._col is not None:
            out.append(self._col)
        return out

    def _sweep(self, f: np.ndarray) -> list[Solution]:
        self._setup()
        blocks = self._all_blocks()
        dk = 2 * math.pi * float(f[1] - f[0]) / C0
        rot = [(b.phases(dk), None if i is None else i.phases(dk)) for b, i in blocks]
        state: list[tuple[np.ndarray, np.ndarray | None]] = []
        out: list[Solution] = []
        try:
            for n, x in enumerate(f):
                k = 2 * math.pi * float(x) / C0
                if n % _RESEED == 0:
                    state = [(b.phases(k), None if i is None else i.phases(k)) for b, i in blocks]
                else:
                    for (ph_f, ph_i), (r_f, r_i) in zip(state, rot, strict=True):
                        ph_f *= r_f
                        if ph_i is not None and r_i is not None:
                            ph_i *= r_i
                out.append(self._solve(float(x), state))
        finally:
            del state, rot
        return out

    def sweep(self, f_hz: np.ndarray) -> np.ndarray:
        """Input impedances (ohm) at each frequency of `f_hz` (Hz)."""
        return np.array([s.z_in for s in self.solutions(f_hz)], dtype=complex)

    def _segment_currents_big(self, cur: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        w = self._slot_sign * cur[self._slot_p]
        start = np.zeros(self.n_seg, complex)
        end = np.zeros(self.n_seg, complex)
        fall = self._slot_kind == 1
        np.add.at(start, self._slot_seg[fall], w[fall])
        np.add.at(end, self._slot_seg[~fall], w[~fall])
        return start, end

    def segment_currents(self, solution: Solution) -> tuple[np.ndarray, np.ndarray]:
        """Current (A) at the start and at the end of every segment, along its direction."""
        cur = np.zeros(self.basis.size, complex)
        cur[self._valid_idx] = solution.currents
        return self._segment_currents_big(cur)

    def node_currents(self, solution: Solution) -> np.ndarray:
        """Net current (A) into every node from the segments meeting there (Kirchhoff's
        law: zero at every node but free ends and ground contacts, to round-off)."""
        i0, i1 = self.segment_currents(solution)
        net = np.zeros(len(self.nodes), complex)
        np.add.at(net, self.seg_end, i1)
        np.add.at(net, self.seg_start, -i0)
        return net

    @property
    def total_length_mm(self) -> float:
        return float(self.segments.length[~self.lossless].sum()) * 1e3


StructureModel = WireModel


def _least_phase(admittance: Callable[[float], complex]) -> float:
    """The capacitor reactance (ohm) that brings a port's admittance nearest the real axis
    (the least |phase|) when no reactance makes it real: a weakly coupled tuned loop set
    as close to resonance as it goes. A log grid from 1 milliohm to 1 megohm, refined by
    Brent's bounded minimiser between the best point's neighbours."""
    from ..numeric import minimize_bounded

    grid = np.logspace(-3.0, 6.0, 451)

    def cost(log_xc: float) -> float:
        y = admittance(10.0 ** log_xc)
        return abs(math.atan2(y.imag, y.real)) if y != 0 else math.pi

    values = [cost(float(g)) for g in np.log10(grid)]
    k = int(np.argmin(values))
    lo = float(np.log10(grid[max(k - 1, 0)]))
    hi = float(np.log10(grid[min(k + 1, len(grid) - 1)]))
    x, _ = minimize_bounded(cost, lo, hi, xatol=1e-9)
    return float(10.0 ** x)


def _solve_upper(z: np.ndarray, rhs: np.ndarray) -> np.ndarray:
    """Solve z x = rhs with z symmetric and only its upper triangle filled (z is
    overwritten): LAPACK's symmetric (Bunch-Kaufman) solver for large systems; for small
    ones, where LU is the faster on one thread, the lower triangle is mirrored first."""
    n = len(z)
    if n >= _SYM_SOLVE_FROM:
        from scipy.linalg import solve

        return np.asarray(solve(z, rhs, assume_a="sym", lower=False, overwrite_a=True,
                                check_finite=False))
    step = 64
    for i0 in range(0, n, step):
        i1 = min(i0 + step, n)
        z[i1:, i0:i1] = z[i0:i1, i1:].T
        d = z[i0:i1, i0:i1]
        lo = np.tril_indices(i1 - i0, -1)
        d[lo] = d.T[lo]
    return np.asarray(np.linalg.solve(z, rhs))


def _accumulate(z: np.ndarray, h: np.ndarray, i0: int, i1: int, s_n: int) -> None:
    """Add a block's half interactions h (4, nI, nJ) (rows [i0, i1), columns [i0, S)) to
    the upper triangle of the chain part of z (index p = m + 1 for the basis rising on
    segment m and falling on m + 1): rr (i, j) -> (i+1, j+1), rf -> (i+1, j),
    fr -> (i, j+1), ff -> (i, j). The diagonal's falling-rising term, whose pair (m+1, m)
    the triangle leaves out, is its mirror rf (m, m+1)."""
    z[i0 + 1:i1 + 1, i0 + 1:s_n + 1] += h[0]
    z[i0 + 1:i1 + 1, i0:s_n] += h[1]
    z[i0:i1, i0 + 1:s_n + 1] += h[2]
    z[i0:i1, i0:s_n] += h[3]
    last = min(i1, s_n - 1)
    if last > i0:
        m = np.arange(i0, last)
        z[m + 1, m + 1] += h[1][m - i0, m + 1 - i0]


def _orient(i: np.ndarray, j: np.ndarray, fi: np.ndarray, fj: np.ndarray, mom: np.ndarray
            ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Moments computed with u, v along a chain, turned to each segment's own direction."""
    m00, m01, m10, m11 = (mom[k].copy() for k in range(4))
    # observer reversed: u -> 1 - u
    m10 = np.where(fi, m00 - m10, m10)
    m11 = np.where(fi, m01 - m11, m11)
    # source reversed: v -> 1 - v
    m01n = np.where(fj, m00 - m01, m01)
    m11 = np.where(fj, m10 - m11, m11)
    return i, j, np.stack([m00, m01n, m10, m11])


def _canonical(parts: list[tuple[np.ndarray, np.ndarray, np.ndarray]], n_seg: int
               ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Pairs as i <= j (a pair (j, i) swaps its moments), each pair once."""
    if not parts:
        return np.zeros(0, np.int64), np.zeros(0, np.int64), np.zeros((4, 0))
    i = np.concatenate([p[0] for p in parts]).astype(np.int64)
    j = np.concatenate([p[1] for p in parts]).astype(np.int64)
    mom = np.concatenate([p[2] for p in parts], axis=1)
    swap = i > j
    mom[:, swap] = mom[SWAP][:, swap]
    i, j = np.where(swap, j, i), np.where(swap, i, j)
    _, first = np.unique(i * n_seg + j, return_index=True)
    first.sort()
    return i[first], j[first], mom[:, first]


def _both_orders(corr: tuple[np.ndarray, np.ndarray, np.ndarray] | None
                 ) -> tuple[np.ndarray, np.ndarray, np.ndarray] | None:
    if corr is None:
        return None
    i, j, mom = corr
    off = i != j
    return (np.concatenate([i, j[off]]), np.concatenate([j, i[off]]),
            np.concatenate([mom, mom[SWAP][:, off]], axis=1))


def fill_bytes(n_seg: int, n_big: int, ground: bool, rows_per_band: int = 64) -> int:
    """Estimated bytes of a model's fill with `n_seg` segments and `n_big` matrix rows:
    per pair of the upper triangle 1/R at 4 points, two pair factors and, during a sweep,
    exp(-jkR) and its step (4 complex each), for free space and the image; the static
    matrices (2 real) and the complex matrix with the solver's copy; a block's
    temporaries (the static part's 16 points per pair, the half interactions)."""
    pairs = n_seg * (n_seg + 1) // 2 + n_seg * rows_per_band // 2
    sets = 2 if ground else 1
    per_pair = 4 * 8 + 2 * 8 + 2 * 4 * 16
    block = rows_per_band * n_seg * (16 * 8 * 3 + 4 * 16 * 4)
    return int(sets * pairs * per_pair + n_big * n_big * (2 * 8 + 2 * 16) + block)


# -- builders ---------------------------------------------------------------------------------
def _polyline_mesh(nodes_mm: np.ndarray, radius_mm: np.ndarray, closed: bool,
                   source_segments: Sequence[int], lossless_segments: Sequence[int],
                   ground_z_mm: float | None) -> StructureMesh:
    from .mesh import MeshFeed, StructureMesh

    n = len(nodes_mm)
    n_seg = n if closed else n - 1
    a = np.arange(n_seg)
    b = (a + 1) % n if closed else a + 1
    length = np.linalg.norm(nodes_mm[b] - nodes_mm[a], axis=1)
    s = np.concatenate([[0.0], np.cumsum(length)])
    lossless = np.zeros(n_seg, bool)
    lossless[list(lossless_segments)] = True
    on_ground = np.zeros(n, bool)
    if ground_z_mm is not None and not closed:
        tol = 1e-6 + 1e-6 * float(length.min())
        for k in (0, n - 1):
            on_ground[k] = abs(nodes_mm[k, 2] - ground_z_mm) <= tol
    feed = MeshFeed(tuple(int(x) for x in source_segments), Port(), "source_segments")
    return StructureMesh(nodes_mm, a, b, radius_mm, np.zeros(n_seg, np.int64), s[:-1], s[1:],
                         lossless, (feed,), on_ground)


def wire_model(nodes_mm: np.ndarray, radius_mm: float | np.ndarray, *, closed: bool,
               source_segments: Sequence[int], resistivity_ohm_m: float | None = None,
               tube_wall_mm: float | None = None, lossless_segments: Sequence[int] = (),
               ground_z_mm: float | None = None,
               max_unknowns: int = DEFAULT_MAX_UNKNOWNS) -> WireModel:
    """A wire model from polyline nodes.

    nodes_mm: (N+1, 3) nodes in order (mm); closed: the last node joins the first
    (then there are N+1 segments, the last one closing the loop); radius_mm: the
    wire radius (mm), or one radius per segment; source_segments: indices of the
    segments carrying the gap field (one port, 1 V across them together);
    resistivity_ohm_m: None for a perfect conductor; tube_wall_mm: the wall of a tube
    (mm); lossless_segments: segments without conductor loss (the gap itself);
    ground_z_mm: height of a perfect ground plane (mm), None for free space (an end on it
    continues into its image).

    An open end has no end cap (the current is zero at its last node). For thick
    wires (a/lambda ~ 0.003) the resonance of an open-ended wire still moves by about
    0.2 % each time the end segments are halved.
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
    if tube_wall_mm is not None and tube_wall_mm <= 0:
        raise FabplanError("tube wall must be positive", field="tube_wall_mm",
                           value=tube_wall_mm)
    for s in tuple(source_segments) + tuple(lossless_segments):
        if not 0 <= int(s) < n_seg:
            raise FabplanError(f"segment index out of range 0..{n_seg - 1}",
                               field="source_segments", value=s)
    if not len(source_segments):
        raise FabplanError("a model needs at least one source segment (the feed gap)",
                           field="source_segments", value=[])
    if ground_z_mm is not None:
        below = nodes[:, 2] < ground_z_mm - 1e-9
        if np.any(below):
            raise FabplanError("the wire dips below the ground plane", field="ground_z_mm",
                               value=ground_z_mm)
    if np.any(np.linalg.norm(np.diff(nodes, axis=0), axis=1) <= 0):
        raise FabplanError("two consecutive nodes coincide: every segment needs a length",
                           field="nodes", value=0.0)
    mesh = _polyline_mesh(nodes, r, closed, source_segments, lossless_segments, ground_z_mm)
    rho = np.full(n_seg, math.nan if resistivity_ohm_m is None else resistivity_ohm_m)
    wall = np.full(n_seg, math.nan if tube_wall_mm is None else tube_wall_mm * 1e-3)
    model = WireModel(mesh, rho, wall, None if ground_z_mm is None else ground_z_mm * 1e-3,
                      max_unknowns)
    model.findings.extend(_polyline_closeness(nodes, r, closed))
    return model


def _polyline_closeness(nodes: np.ndarray, radius: np.ndarray, closed: bool) -> list[Finding]:
    """Parts of one polyline that come close to each other away from their neighbours
    along it: a warning; touching or crossing is an error (mm)."""
    a = nodes
    b = np.roll(nodes, -1, axis=0) if closed else nodes[1:]
    a = a[:len(b)]
    length = np.linalg.norm(b - a, axis=1)
    total = float(length.sum())
    step = max(float(radius.min()), total / 20000)
    counts = np.maximum(1, np.ceil(length / step).astype(int))
    idx = np.repeat(np.arange(len(length)), counts)
    frac = np.concatenate([(np.arange(c) + 0.5) / c for c in counts])
    pts = a[idx] + (b - a)[idx] * frac[:, None]
    along = (np.cumsum(length) - length)[idx] + length[idx] * frac
    rad = radius[idx]
    i, j = close_pairs(pts, SPACING_DIAMETERS * 2 * float(radius.max()))
    if len(i) == 0:
        return []
    dist = np.linalg.norm(pts[i] - pts[j], axis=1)
    apart = np.abs(along[i] - along[j])
    if closed:
        apart = np.minimum(apart, total - apart)
    dia = rad[i] + rad[j]
    other = apart > (math.pi / 2) * np.maximum(dist, SPACING_DIAMETERS * dia) + 2 * step
    touching = other & (dist <= dia * (1 + 1e-9))
    if np.any(touching):
        k = int(np.argmax(touching))
        raise FabplanError(f"segments {idx[i[k]]} and {idx[j[k]]} touch or cross "
                           f"({dist[k]:.3g} mm apart, centre to centre): separate "
                           "the conductors", field="geometry", value=round(float(dist[k]), 4))
    close = other & (dist < SPACING_DIAMETERS * dia)
    if np.any(close):
        k = int(np.argmax(close))
        return [Finding(
            "em-conductors-close", "warning",
            f"conductors {dist[k]:.3g} mm apart centre to centre, under "
            f"{SPACING_DIAMETERS:g} diameters: the thin-wire model ignores the proximity "
            "effect there and the impedance is less certain")]
    return []


def structure_model(structure: Structure, *, f_max_hz: float,
                    seg_per_wavelength: float = SEGMENTS_PER_WAVELENGTH,
                    min_seg_per_180: int = 8, max_unknowns: int = DEFAULT_MAX_UNKNOWNS,
                    max_fill_bytes: float = MAX_FILL_BYTES) -> WireModel:
    """Mesh a `Structure` and build its model.

    Arcs become length-keeping polygons (at least `min_seg_per_180` segments per 180
    degrees), no segment is longer than lambda/`seg_per_wavelength` at `f_max_hz`,
    neighbours stay within 2:1, every gap is one segment of its real width, and a node
    falls on every junction and radius step (see `mesh`). The findings of the structure
    (close approaches) and of the mesh (bends too tight) are on the model.
    """
    from .mesh import mesh_structure
    from .structure import resolve

    if not (f_max_hz > 0 and math.isfinite(f_max_hz)):
        raise FabplanError("top frequency must be positive", field="f_max_hz", value=f_max_hz)
    if not seg_per_wavelength >= 10:
        raise FabplanError("at least 10 segments per wavelength", field="seg_per_wavelength",
                           value=seg_per_wavelength)
    lam_mm = C0 / f_max_hz * 1e3
    for i, w in enumerate(structure.wires):
        a = max(w.radii())
        if 2 * math.pi * a / lam_mm > MAX_KA:
            raise FabplanError(f"a {2 * a:.3g} mm conductor is too thick for the thin-wire "
                               f"model at {f_max_hz / 1e6:.6g} MHz", field=f"wires[{i}].radius_mm",
                               value=a)
    topo = resolve(structure)
    mesh = mesh_structure(topo, lam_mm / seg_per_wavelength, min_seg_per_180,
                          MIN_SEGMENT_RADII)
    return _model_from_mesh(structure, mesh, topo.findings, max_unknowns, max_fill_bytes)


def _model_from_mesh(structure: Structure, mesh: StructureMesh, findings: list[Finding],
                     max_unknowns: int, max_fill_bytes: float) -> WireModel:
    n_seg = mesh.count
    rho = np.full(n_seg, math.nan)
    wall = np.full(n_seg, math.nan)
    for i, w in enumerate(structure.wires):
        sel = mesh.wire == i
        if w.resistivity_ohm_m is not None:
            rho[sel] = w.resistivity_ohm_m
        if w.tube_wall_mm is not None:
            wall[sel] = w.tube_wall_mm * 1e-3
    ground = None if structure.ground_z_mm is None else structure.ground_z_mm * 1e-3
    model = WireModel(mesh, rho, wall, ground, max_unknowns, max_fill_bytes)
    model.findings.extend(findings)
    if mesh.coarse_bends:
        model.findings.append(Finding(
            "em-tight-bend", "warning",
            f"{mesh.coarse_bends} bend(s) are too tight for {MIN_SEGMENT_RADII:g}-radius "
            "segments at the rule's count: the thin-wire model treats them with fewer, "
            "wire-radius-long segments and is less certain there"))
    return model


def path_model(path: BendPath, radius_mm: float, *, f_max_hz: float,
               resistivity_ohm_m: float | None = None, tube_wall_mm: float | None = None,
               ground_z_mm: float | None = None,
               seg_per_wavelength: float = SEGMENTS_PER_WAVELENGTH,
               min_seg_per_180: int = 8, max_unknowns: int = DEFAULT_MAX_UNKNOWNS) -> WireModel:
    """Mesh a bend path's centreline and build its wire model.

    Arcs become length-keeping polygons (at least `min_seg_per_180` segments per
    180 degrees), no segment is longer than lambda/`seg_per_wavelength` at
    `f_max_hz`, neighbours stay within 2:1, and a gapped path is closed by one
    source segment of the gap's real width (lossless) between end B and end A.
    A path without a gap is refused (there is nothing to feed). radius_mm: wire
    radius (mm); tube_wall_mm: the tube's wall (mm) for the internal impedance.
    """
    from .mesh import Mesh, mesh_structure
    from .structure import Gap, Wire, WireEnd, resolve

    if not (f_max_hz > 0):
        raise FabplanError("top frequency must be positive", field="f_max_hz", value=f_max_hz)
    lam_mm = C0 / f_max_hz * 1e3
    if 2 * math.pi * radius_mm / lam_mm > MAX_KA:
        raise FabplanError(f"a {2 * radius_mm:.3g} mm conductor is too thick for the thin-wire "
                           f"model at {f_max_hz / 1e6:.6g} MHz", field="radius_mm",
                           value=radius_mm)
    for bend in path.bends:
        if bend.radius_mm < radius_mm:
            raise FabplanError("a bend's centreline radius is smaller than the wire radius",
                               field="bend radius", value=bend.radius_mm)
    if path.gap_mm is None:
        raise FabplanError("the electrical model needs a feed gap on the path", field="gap",
                           value=None)
    b_end, a_end = path.gap_ends()
    if float(np.linalg.norm(a_end - b_end)) <= 0:
        raise FabplanError("the ends meet: the feed gap has no width", field="gap",
                           value=path.gap_mm)
    structure = Structure((Wire(path, radius_mm, tube_wall_mm=tube_wall_mm,
                                resistivity_ohm_m=resistivity_ohm_m),),
                          (Gap(WireEnd(0, "B"), WireEnd(0, "A"), Port()),),
                          ground_z_mm=ground_z_mm, detect_junctions=False)
    topo = resolve(structure)
    smesh = mesh_structure(topo, lam_mm / seg_per_wavelength, min_seg_per_180,
                           MIN_SEGMENT_RADII)
    n_wire = int(np.sum(smesh.wire == 0))
    if n_wire + 1 > max_unknowns:
        raise FabplanError(f"the mesh needs {n_wire + 1} unknowns, more than the cap of "
                           f"{max_unknowns}: lower the top frequency or the segments per "
                           "wavelength, or raise the cap", field="unknowns", value=n_wire + 1)
    model = _model_from_mesh(structure, smesh, topo.findings, max_unknowns, MAX_FILL_BYTES)
    model.findings = [f for f in model.findings if f.code != "em-tight-bend"]
    tight = [bd.radius_mm for bd in path.bends if bd.radius_mm < TIGHT_BEND_RADII * radius_mm]
    if tight or smesh.coarse_bends:
        r = min(tight) if tight else min(bd.radius_mm for bd in path.bends)
        model.findings.append(Finding(
            "em-tight-bend", "warning",
            f"a bend of {r:.3g} mm centreline radius is under {TIGHT_BEND_RADII:g} wire radii: "
            "the thin-wire model treats it with fewer, wire-radius-long segments and is less "
            "certain there"))
    nodes = smesh.nodes[np.append(smesh.seg_start[:n_wire], smesh.seg_end[n_wire - 1])]
    model.mesh = Mesh(nodes, (n_wire,), smesh.lengths, smesh.coarse_bends)
    log.debug("meshed %.1f mm of path into %d segments (%d unknowns), longest %.2f mm",
              path.centreline_length(), smesh.count, model.unknowns, smesh.lengths.max())
    return model
