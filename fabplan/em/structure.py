"""Whole antennas for the wire model: wires placed in one frame, gaps, loads, junctions.

A `Structure` describes everything the method of moments sees:

- `Wire`: one conductor, a `BendPath` (its lines and arcs in the path's own frame) or a
  polyline, placed in the structure's frame by a rigid `Placement` (rotation matrix and
  translation, mm); open or closed (a closed wire joins end B to end A, by a straight when
  they do not meet); its radius (mm), which may step along the wire (telescoping tubes:
  `steps` of (from arc length mm, radius mm)); a tube wall (mm) or None for solid stock;
  a resistivity (ohm m) or None for a perfect conductor.
- `Gap`: two wire ends facing each other across their real width; it is meshed as one
  segment joining the two end points and holds a `Port` (a voltage source) or a load
  (`Load`, or a `TunedCapacitor` whose value is solved so that a port sees X = 0 at a
  given frequency). `WireGap` is the same cut into a wire at an arc length.
- `Junction`: two or more wire ends meeting at a point, or wire ends meeting another
  wire's interior (a T). Junctions are also found from coincident points (within
  `JOIN_TOL_RADII` of the smallest wire radius); declared ones may join ends up to
  `DECLARED_JOIN_RADII` radii apart (the ends are taken to the first one's point).
- Ground: free space, or a perfect ground plane at `ground_z_mm` (image theory). Real
  (lossy, finite) ground is not modelled: over real earth the impedance and especially
  the low-angle gain differ from what the perfect plane gives.

`resolve(structure)` checks the description and returns its `Topology`: each wire's
centreline in the structure's frame, the junction nodes, where each gap sits, and the
findings (wires that nearly touch without a junction). Wires that touch or cross without
a junction are an error.

Units: millimetres, hertz, ohms, henries, farads; angles in degrees at the interface.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from itertools import pairwise
from typing import Literal

import numpy as np

from ..errors import FabplanError, Finding
from ..geometry.path import Arc3, BendPath, Line3

__all__ = ["Vec3", "Matrix3", "IDENTITY", "Placement", "Wire", "WireEnd", "Port", "Load",
           "TunedCapacitor", "GapElement", "Gap", "WireGap", "Junction", "Structure",
           "Centreline", "TopologyNode", "Topology", "resolve", "close_pairs",
           "JOIN_TOL_RADII", "DECLARED_JOIN_RADII", "CLOSE_DIAMETERS", "EndName"]

Vec3 = tuple[float, float, float]
Matrix3 = tuple[Vec3, Vec3, Vec3]
EndName = Literal["A", "B"]
IDENTITY: Matrix3 = ((1.0, 0.0, 0.0), (0.0, 1.0, 0.0), (0.0, 0.0, 1.0))

JOIN_TOL_RADII = 0.1  # ends closer than this many (smallest) radii are one junction
DECLARED_JOIN_RADII = 3.0  # declared junctions may join ends up to this many radii apart
CLOSE_DIAMETERS = 3.0  # conductors closer than this (centre to centre) draw a warning


# -- description ---------------------------------------------------------------------
@dataclass(frozen=True)
class Placement:
    """A rigid placement: world = rotation @ local + translation_mm.

    `rotation` is a proper rotation matrix (rows), `translation_mm` in mm."""

    rotation: Matrix3 = IDENTITY
    translation_mm: Vec3 = (0.0, 0.0, 0.0)

    def __post_init__(self) -> None:
        r = np.asarray(self.rotation, dtype=float)
        if r.shape != (3, 3) or not np.allclose(r @ r.T, np.eye(3), atol=1e-9) \
                or np.linalg.det(r) < 0:
            raise FabplanError("the rotation must be a proper 3x3 rotation matrix (orthonormal "
                               "rows, determinant +1)", field="placement.rotation",
                               value=self.rotation)
        if len(self.translation_mm) != 3:
            raise FabplanError("the translation needs three coordinates (mm)",
                               field="placement.translation_mm", value=self.translation_mm)

    @staticmethod
    def about(axis: Vec3, angle_deg: float, translation_mm: Vec3 = (0.0, 0.0, 0.0)
              ) -> Placement:
        """A rotation of `angle_deg` about `axis` (right hand), then a translation (mm)."""
        a = np.asarray(axis, dtype=float)
        n = float(np.linalg.norm(a))
        if n == 0:
            raise FabplanError("the rotation axis has no length", field="placement.axis",
                               value=axis)
        a = a / n
        t = math.radians(angle_deg)
        k = np.array([[0, -a[2], a[1]], [a[2], 0, -a[0]], [-a[1], a[0], 0]])
        r = np.eye(3) + math.sin(t) * k + (1 - math.cos(t)) * (k @ k)
        rows = tuple(tuple(float(x) for x in row) for row in r)
        return Placement(rows, translation_mm)  # type: ignore[arg-type]

    def matrix(self) -> np.ndarray:
        return np.asarray(self.rotation, dtype=float)

    def apply(self, points_mm: np.ndarray) -> np.ndarray:
        """Points (..., 3) in mm from the local frame to the structure's frame."""
        return np.asarray(np.asarray(points_mm, float) @ self.matrix().T
                          + np.asarray(self.translation_mm))

    def apply_primitive(self, prim: Line3 | Arc3) -> Line3 | Arc3:
        if isinstance(prim, Line3):
            a, b = self.apply(np.asarray(prim.start)), self.apply(np.asarray(prim.end))
            return Line3(_vec(a), _vec(b), prim.s_start)
        r = self.matrix()
        return Arc3(_vec(self.apply(np.asarray(prim.centre))), prim.radius,
                    _vec(r @ np.asarray(prim.u)), _vec(r @ np.asarray(prim.v)),
                    _vec(r @ np.asarray(prim.axis)), prim.angle, prim.pitch, prim.s_start)


@dataclass(frozen=True)
class Wire:
    """One conductor.

    `path`: a `BendPath` (its centreline from end A; its own gap, if any, is ignored: declare
    a `Gap`) or a polyline of points (mm). `radius_mm`: the radius from end A; `steps`:
    (from arc length mm, radius mm) where the radius changes (telescoping), in increasing
    order of arc length; the mesh puts a node on each. `closed`: end B joins end A.
    `tube_wall_mm`: the wall of a tube (mm), None for solid stock. `resistivity_ohm_m`: None
    for a perfect conductor. `placement`: where the path's frame sits in the structure's.
    """

    path: BendPath | tuple[Vec3, ...]
    radius_mm: float
    steps: tuple[tuple[float, float], ...] = ()
    closed: bool = False
    tube_wall_mm: float | None = None
    resistivity_ohm_m: float | None = None
    placement: Placement = field(default_factory=Placement)
    name: str = ""

    def radius_at(self, s_mm: np.ndarray) -> np.ndarray:
        """The radius (mm) at arc lengths `s_mm` from end A."""
        s = np.asarray(s_mm, dtype=float)
        r = np.full(s.shape, float(self.radius_mm))
        for at, rad in self.steps:
            r = np.where(s >= at, rad, r)
        return r

    def radii(self) -> list[float]:
        return [float(self.radius_mm)] + [float(r) for _, r in self.steps]


@dataclass(frozen=True)
class WireEnd:
    """End A (the start of the path) or B of wire number `wire`."""

    wire: int
    end: EndName = "A"


@dataclass(frozen=True)
class Port:
    """A voltage source. `amplitude` (V) and `phase_deg` are relative: the model solves with
    these voltages and scales to a transmitter power where asked. Ports with the same
    `group` are fed in parallel from one feed point (the two loops of a quadrifilar helix);
    the group's input impedance is V0 / sum(conj(a_k) I_k) over its ports (a_k the relative
    voltages, as if each were fed from the common point through an ideal lossless coupler),
    which for equal voltages is the plain parallel combination."""

    name: str = "feed"
    amplitude: float = 1.0
    phase_deg: float = 0.0
    group: str | None = None

    @property
    def voltage(self) -> complex:
        return complex(self.amplitude * np.exp(1j * math.radians(self.phase_deg)))


LoadKind = Literal["series", "parallel"]


@dataclass(frozen=True)
class Load:
    """A lumped network in a gap.

    `kind` "series": Z = R + j omega L + Z_C; "parallel": 1/Z = 1/R + 1/(j omega L) + 1/Z_C.
    Absent parts (None) are left out (series: no resistance, no inductance, no capacitor
    (a short); parallel: open). The capacitor's own loss: `q` (Q, ESR = 1/(omega C Q) at
    each frequency) or `esr_ohm` (a fixed series resistance); Z_C = ESR + 1/(j omega C).
    Units: ohms, henries, farads."""

    name: str = "load"
    kind: LoadKind = "series"
    r_ohm: float | None = None
    l_h: float | None = None
    c_f: float | None = None
    q: float | None = None
    esr_ohm: float | None = None

    def __post_init__(self) -> None:
        if self.kind not in ("series", "parallel"):
            raise FabplanError("a load is 'series' or 'parallel'", field=f"{self.name}.kind",
                               value=self.kind)
        for key in ("r_ohm", "l_h", "c_f", "q", "esr_ohm"):
            v = getattr(self, key)
            if v is not None and not (math.isfinite(v) and v >= 0):
                raise FabplanError("must be zero or positive", field=f"{self.name}.{key}",
                                   value=v)
        if self.q is not None and self.esr_ohm is not None:
            raise FabplanError("give the capacitor's Q or its ESR, not both",
                               field=f"{self.name}.q", value=self.q)
        if (self.q is not None or self.esr_ohm is not None) and self.c_f is None:
            raise FabplanError("a Q or ESR needs a capacitor (c_f)", field=f"{self.name}.c_f",
                               value=None)
        if self.q == 0:
            raise FabplanError("a capacitor's Q must be positive", field=f"{self.name}.q",
                               value=self.q)
        if self.c_f == 0:
            raise FabplanError("a capacitance must be positive", field=f"{self.name}.c_f",
                               value=self.c_f)
        if self.kind == "parallel" and self.r_ohm is None and self.l_h is None \
                and self.c_f is None:
            raise FabplanError("a parallel load needs at least one part (an open circuit is no "
                               "load: leave the ends unjoined)", field=self.name, value=None)

    def capacitor_impedance(self, f_hz: float) -> complex | None:
        if self.c_f is None:
            return None
        omega = 2 * math.pi * f_hz
        x = 1.0 / (omega * self.c_f)
        esr = self.esr_ohm if self.esr_ohm is not None else (x / self.q if self.q else 0.0)
        return complex(esr, -x)

    def impedance(self, f_hz: float) -> complex:
        """The network's impedance (ohm) at `f_hz` (Hz)."""
        omega = 2 * math.pi * f_hz
        zc = self.capacitor_impedance(f_hz)
        if self.kind == "series":
            z = complex(self.r_ohm or 0.0, omega * (self.l_h or 0.0))
            return z + (zc if zc is not None else 0.0)
        y = 0j
        if self.r_ohm is not None:
            y += math.inf if self.r_ohm == 0 else 1.0 / self.r_ohm
        if self.l_h is not None:
            y += math.inf if self.l_h == 0 else 1.0 / (1j * omega * self.l_h)
        if zc is not None:
            y += 1.0 / zc
        return 0j if not np.isfinite(abs(y)) else complex(1.0 / y)


@dataclass(frozen=True)
class TunedCapacitor:
    """A series capacitor whose value the model solves so that `port` (a port's or a port
    group's name) sees X = 0 at `f_hz`; `q` or `esr_ohm` its loss as for `Load`; `r_ohm`
    a resistance in series with it (the joints of a loop, ohm). Of the (at most two)
    capacitances that do it, the one giving the smaller |Z| at the port is taken (the
    series resonance)."""

    f_hz: float
    port: str = "feed"
    name: str = "tuning capacitor"
    q: float | None = None
    esr_ohm: float | None = None
    r_ohm: float = 0.0

    def __post_init__(self) -> None:
        if not (math.isfinite(self.f_hz) and self.f_hz > 0):
            raise FabplanError("the resonance frequency must be positive",
                               field=f"{self.name}.f_hz", value=self.f_hz)
        if self.q is not None and self.esr_ohm is not None:
            raise FabplanError("give the capacitor's Q or its ESR, not both",
                               field=f"{self.name}.q", value=self.q)
        if self.q is not None and not self.q > 0:
            raise FabplanError("a capacitor's Q must be positive", field=f"{self.name}.q",
                               value=self.q)
        if self.esr_ohm is not None and not self.esr_ohm >= 0:
            raise FabplanError("an ESR must be zero or positive", field=f"{self.name}.esr_ohm",
                               value=self.esr_ohm)
        if not (math.isfinite(self.r_ohm) and self.r_ohm >= 0):
            raise FabplanError("a series resistance must be zero or positive",
                               field=f"{self.name}.r_ohm", value=self.r_ohm)

    def with_capacitance(self, c_f: float) -> Load:
        return Load(self.name, "series", self.r_ohm or None, None, c_f, self.q, self.esr_ohm)


GapElement = Port | Load | TunedCapacitor


@dataclass(frozen=True)
class Gap:
    """Wire ends `a` and `b` across a gap of their real width, holding `element`. For a
    port, the source drives current from `a` to `b` through the gap."""

    a: WireEnd
    b: WireEnd
    element: GapElement


@dataclass(frozen=True)
class WireGap:
    """A gap of `width_mm` cut into wire `wire`, centred `at_mm` along it from end A,
    holding `element` (a port, or a load at a point of the wire)."""

    wire: int
    at_mm: float
    width_mm: float
    element: GapElement


@dataclass(frozen=True)
class Junction:
    """Wire `ends` joined at one point; with `wire` and `at_mm`, they meet that wire's
    interior at arc length `at_mm` (mm from its end A): a T."""

    ends: tuple[WireEnd, ...]
    wire: int | None = None
    at_mm: float | None = None


@dataclass(frozen=True)
class Structure:
    """Everything the wire model sees (see the module docstring). `ground_z_mm`: height of a
    perfect ground plane (mm), None for free space; real ground is not modelled.
    `detect_junctions`: join coincident ends (and ends on another wire) automatically."""

    wires: tuple[Wire, ...]
    gaps: tuple[Gap, ...] = ()
    wire_gaps: tuple[WireGap, ...] = ()
    junctions: tuple[Junction, ...] = ()
    ground_z_mm: float | None = None
    detect_junctions: bool = True

    def elements(self) -> list[tuple[str, GapElement]]:
        """(where, element) of every gap, gaps first, then wire gaps."""
        return ([(f"gaps[{i}]", g.element) for i, g in enumerate(self.gaps)]
                + [(f"wire_gaps[{i}]", g.element) for i, g in enumerate(self.wire_gaps)])


# -- centrelines ----------------------------------------------------------------------------
def _vec(v: np.ndarray) -> Vec3:
    return (float(v[0]), float(v[1]), float(v[2]))


def sub_arc(arc: Arc3, phi0: float, phi1: float) -> Arc3:
    """The part of `arc` between angles phi0 and phi1 (rad) as an arc of its own."""
    u, v, ax = np.asarray(arc.u), np.asarray(arc.v), np.asarray(arc.axis)
    c = np.asarray(arc.centre) + arc.pitch * phi0 / (2 * math.pi) * ax
    u2 = math.cos(phi0) * u + math.sin(phi0) * v
    v2 = -math.sin(phi0) * u + math.cos(phi0) * v
    s0 = arc.s_start + phi0 * math.hypot(arc.radius, arc.pitch / (2 * math.pi))
    return Arc3(_vec(c), arc.radius, _vec(u2), _vec(v2), arc.axis, phi1 - phi0, arc.pitch, s0)


def _arc_point(arc: Arc3, phi: np.ndarray) -> np.ndarray:
    p = np.asarray(phi, dtype=float)[..., None]
    return np.asarray(np.asarray(arc.centre) + arc.radius * (np.cos(p) * np.asarray(arc.u)
                      + np.sin(p) * np.asarray(arc.v)) + arc.pitch * p / (2 * math.pi)
                      * np.asarray(arc.axis))


class Centreline:
    """A wire's centreline in the structure's frame: lines and arcs with arc length s from
    end A (mm). A closed wire whose ends do not meet gets a closing straight."""

    def __init__(self, prims: list[Line3 | Arc3], closed: bool, join_tol_mm: float) -> None:
        prims = [p for p in prims if p.length > 1e-9]
        if not prims:
            raise FabplanError("a wire needs some length", field="wire", value=0.0)
        self.closed = closed
        if closed:
            a = np.asarray(_start(prims[0]))
            b = np.asarray(_end(prims[-1]))
            if float(np.linalg.norm(a - b)) > join_tol_mm:
                prims.append(Line3(_vec(b), _vec(a), 0.0))
        starts = np.concatenate([[0.0], np.cumsum([p.length for p in prims])])
        self.prims = prims
        self.starts = starts[:-1]
        self.length = float(starts[-1])
        pts, _ = self.sample(max(self.length / 64, 1e-6))
        # a box holding the whole centreline (samples, widened by the chord error)
        pad = max(self.length / 64, 1e-6)
        self.box = (pts.min(axis=0) - pad, pts.max(axis=0) + pad)

    def near_box(self, x: np.ndarray, tol: float) -> bool:
        """Whether `x` (mm) lies within `tol` of the box holding the centreline."""
        lo, hi = self.box
        return bool(np.all(x >= lo - tol) and np.all(x <= hi + tol))

    def locate(self, s: float) -> tuple[int, float]:
        """(primitive index, arc length into it) for arc length s (mm)."""
        k = int(np.clip(np.searchsorted(self.starts, s, side="right") - 1, 0,
                        len(self.prims) - 1))
        return k, float(s - self.starts[k])

    def point(self, s: float) -> np.ndarray:
        k, t = self.locate(s)
        p = self.prims[k]
        if isinstance(p, Line3):
            a, b = np.asarray(p.start), np.asarray(p.end)
            return np.asarray(a + (b - a) * (t / p.length))
        return _arc_point(p, np.asarray(t / p.length * p.angle))

    def end_point(self, end: EndName) -> np.ndarray:
        if self.closed:
            return self.point(0.0)
        return np.asarray(_start(self.prims[0]) if end == "A" else _end(self.prims[-1]),
                          dtype=float)

    def sample(self, step_mm: float) -> tuple[np.ndarray, np.ndarray]:
        """Points no further apart than `step_mm` along the centreline and their arc length."""
        pts, ss = [], []
        for p, s0 in zip(self.prims, self.starts, strict=True):
            n = max(1, math.ceil(p.length / step_mm))
            t = np.linspace(0.0, 1.0, n + 1)
            if isinstance(p, Line3):
                a, b = np.asarray(p.start), np.asarray(p.end)
                q = a + (b - a) * t[:, None]
            else:
                q = _arc_point(p, t * p.angle)
            pts.append(q[:-1])
            ss.append(s0 + t[:-1] * p.length)
        if not self.closed:
            pts.append(self.end_point("B")[None, :])
            ss.append(np.array([self.length]))
        return np.vstack(pts), np.concatenate(ss)

    def closest(self, x: np.ndarray) -> tuple[float, float]:
        """(arc length, distance) of the centreline point closest to `x` (mm)."""
        best = (0.0, math.inf)
        for p, s0 in zip(self.prims, self.starts, strict=True):
            if isinstance(p, Line3):
                a, b = np.asarray(p.start), np.asarray(p.end)
                d = b - a
                t = float(np.clip(np.dot(x - a, d) / np.dot(d, d), 0.0, 1.0))
                dist = float(np.linalg.norm(a + d * t - x))
                s = s0 + t * p.length
            else:
                n = max(16, math.ceil(p.angle / (math.pi / 32)))
                phi = np.linspace(0.0, p.angle, n + 1)
                dd = np.linalg.norm(_arc_point(p, phi) - x, axis=1)
                k = int(np.argmin(dd))
                lo, hi = phi[max(k - 1, 0)], phi[min(k + 1, n)]
                g = (math.sqrt(5) - 1) / 2
                for _ in range(60):  # golden-section refinement between the neighbours
                    m1 = hi - g * (hi - lo)
                    m2 = lo + g * (hi - lo)
                    f1 = float(np.linalg.norm(_arc_point(p, np.asarray(m1)) - x))
                    f2 = float(np.linalg.norm(_arc_point(p, np.asarray(m2)) - x))
                    if f1 < f2:
                        hi = m2
                    else:
                        lo = m1
                ph = 0.5 * (lo + hi)
                dist = float(np.linalg.norm(_arc_point(p, np.asarray(ph)) - x))
                s = s0 + ph / p.angle * p.length
            if dist < best[1]:
                best = (s, dist)
        return best


def _start(p: Line3 | Arc3) -> np.ndarray:
    return np.asarray(p.start, dtype=float)


def _end(p: Line3 | Arc3) -> np.ndarray:
    return np.asarray(p.end, dtype=float)


# -- topology -------------------------------------------------------------------------------
@dataclass
class TopologyNode:
    """A point where wires end or meet: `members` (wire, arc length mm) on it, `point` (mm),
    and whether it lies on the ground plane."""

    point: np.ndarray
    members: list[tuple[int, float]]
    on_ground: bool = False
    declared: bool = False


@dataclass
class Topology:
    """What `resolve` found: the centrelines, the nodes (every wire end's node is
    `end_node[(wire, "A"|"B")]`; closed wires have one node where they close), the gaps as
    (node a, node b, element, where), the wire gaps as (wire, s0, s1, element, where) and
    the findings."""

    structure: Structure
    centrelines: list[Centreline]
    nodes: list[TopologyNode]
    end_node: dict[tuple[int, str], int]
    gaps: list[tuple[int, int, GapElement, str]]
    wire_gaps: list[tuple[int, float, float, GapElement, str]]
    findings: list[Finding]

    def marks(self, wire: int) -> list[float]:
        """Arc lengths on `wire` where a node is required: ends, junctions (T points)."""
        out: list[float] = []
        for node in self.nodes:
            out.extend(s for w, s in node.members if w == wire)
        return sorted(set(out))


class _Union:
    def __init__(self, n: int) -> None:
        self.parent = list(range(n))

    def find(self, i: int) -> int:
        while self.parent[i] != i:
            self.parent[i] = self.parent[self.parent[i]]
            i = self.parent[i]
        return i

    def join(self, i: int, j: int) -> None:
        a, b = self.find(i), self.find(j)
        if a != b:
            self.parent[max(a, b)] = min(a, b)


def _check_wire(i: int, w: Wire) -> None:
    where = f"wires[{i}]"
    if not (math.isfinite(w.radius_mm) and w.radius_mm > 0):
        raise FabplanError("the wire radius must be positive", field=f"{where}.radius_mm",
                           value=w.radius_mm)
    last = 0.0
    for k, (at, r) in enumerate(w.steps):
        if not (math.isfinite(at) and at > last) or not (math.isfinite(r) and r > 0):
            raise FabplanError("radius steps need increasing positive arc lengths and positive "
                               "radii (mm)", field=f"{where}.steps[{k}]", value=(at, r))
        last = at
    if w.tube_wall_mm is not None and not w.tube_wall_mm > 0:
        raise FabplanError("a tube wall must be positive", field=f"{where}.tube_wall_mm",
                           value=w.tube_wall_mm)
    if w.resistivity_ohm_m is not None and not w.resistivity_ohm_m > 0:
        raise FabplanError("resistivity must be positive", field=f"{where}.resistivity_ohm_m",
                           value=w.resistivity_ohm_m)
    if not isinstance(w.path, BendPath):
        pts = np.asarray(w.path, dtype=float)
        if pts.ndim != 2 or pts.shape[1] != 3 or len(pts) < 2:
            raise FabplanError("a polyline needs at least two points of three coordinates",
                               field=f"{where}.path", value=getattr(pts, "shape", None))
        if np.any(np.linalg.norm(np.diff(pts, axis=0), axis=1) <= 0):
            raise FabplanError("two consecutive polyline points coincide", field=f"{where}.path",
                               value=None)


def _centreline(w: Wire, join_tol: float) -> Centreline:
    if isinstance(w.path, BendPath):
        prims: list[Line3 | Arc3] = [w.placement.apply_primitive(p) for p in w.path.primitives()]
    else:
        pts = w.placement.apply(np.asarray(w.path, dtype=float))
        prims = []
        s = 0.0
        for a, b in pairwise(pts):
            prims.append(Line3(_vec(a), _vec(b), s))
            s += float(np.linalg.norm(b - a))
    return Centreline(prims, w.closed, join_tol)


def _end_ref(structure: Structure, e: WireEnd, where: str) -> None:
    if not 0 <= e.wire < len(structure.wires):
        raise FabplanError(f"no wire number {e.wire} (there are {len(structure.wires)})",
                           field=f"{where}.wire", value=e.wire)
    if e.end not in ("A", "B"):
        raise FabplanError("a wire end is 'A' (start) or 'B' (end)", field=f"{where}.end",
                           value=e.end)
    if structure.wires[e.wire].closed:
        raise FabplanError("a closed wire has no free ends: open it or cut a wire gap",
                           field=f"{where}.wire", value=e.wire)


def resolve(structure: Structure) -> Topology:
    """Check `structure` and find its nodes, junctions and close approaches."""
    if not structure.wires:
        raise FabplanError("a structure needs at least one wire", field="wires", value=0)
    for i, w in enumerate(structure.wires):
        _check_wire(i, w)
    a_min = min(min(w.radii()) for w in structure.wires)
    join_tol = JOIN_TOL_RADII * a_min
    lines = [_centreline(w, join_tol) for w in structure.wires]
    for i, (w, c) in enumerate(zip(structure.wires, lines, strict=True)):
        if w.steps and w.steps[-1][0] >= c.length:
            raise FabplanError(f"a radius step lies beyond the wire's end ({c.length:.6g} mm)",
                               field=f"wires[{i}].steps", value=w.steps[-1][0])
    # every open end is a node to begin with; a closed wire has one node at s = 0
    ends: list[tuple[int, str, float]] = []
    for i, c in enumerate(lines):
        if c.closed:
            ends.append((i, "A", 0.0))
        else:
            ends.extend([(i, "A", 0.0), (i, "B", c.length)])
    index = {(w, e): k for k, (w, e, _) in enumerate(ends)}
    if any(c.closed for c in lines):
        for i, c in enumerate(lines):
            if c.closed:
                index[(i, "B")] = index[(i, "A")]
    pts = np.array([lines[w].point(s) for w, _, s in ends])
    uf = _Union(len(ends))
    t_points: list[tuple[list[int], int, float, bool]] = []  # (end nodes, host wire, s, declared)
    # declared junctions
    for j, jn in enumerate(structure.junctions):
        where = f"junctions[{j}]"
        if not jn.ends:
            raise FabplanError("a junction needs at least one wire end", field=where, value=())
        for k, e in enumerate(jn.ends):
            _end_ref(structure, e, f"{where}.ends[{k}]")
        ids = [index[(e.wire, e.end)] for e in jn.ends]
        radius = min(min(structure.wires[e.wire].radii()) for e in jn.ends)
        if jn.wire is not None or jn.at_mm is not None:
            if jn.wire is None or jn.at_mm is None or not 0 <= jn.wire < len(lines):
                raise FabplanError("a T junction names the host wire and the arc length on it",
                                   field=f"{where}.wire", value=jn.wire)
            host_line = lines[jn.wire]
            if not 0 < jn.at_mm < host_line.length or host_line.closed and jn.at_mm == 0:
                raise FabplanError(f"must lie inside the host wire (0..{host_line.length:.6g} "
                                   "mm)", field=f"{where}.at_mm", value=jn.at_mm)
            target = host_line.point(jn.at_mm)
            radius = min(radius, min(structure.wires[jn.wire].radii()))
            t_points.append((ids, jn.wire, float(jn.at_mm), True))
        else:
            target = pts[ids[0]]
            for i in ids[1:]:
                uf.join(ids[0], i)
        far = float(np.max(np.linalg.norm(pts[ids] - target, axis=1)))
        if far > DECLARED_JOIN_RADII * radius:
            raise FabplanError(f"the ends of this junction are {far:.4g} mm apart, more than "
                               f"{DECLARED_JOIN_RADII:g} wire radii: bring them together",
                               field=where, value=round(far, 4))
    gap_ends: set[int] = set()
    for g, gap in enumerate(structure.gaps):
        _end_ref(structure, gap.a, f"gaps[{g}].a")
        _end_ref(structure, gap.b, f"gaps[{g}].b")
        for e in (gap.a, gap.b):
            k = index[(e.wire, e.end)]
            if k in gap_ends:
                raise FabplanError("this wire end already faces another gap",
                                   field=f"gaps[{g}]", value=(e.wire, e.end))
            gap_ends.add(k)
    if structure.detect_junctions:
        # ends that coincide
        for i in range(len(ends)):
            d = np.linalg.norm(pts[i + 1:] - pts[i], axis=1)
            for jj in np.nonzero(d <= join_tol)[0]:
                uf.join(i, i + 1 + int(jj))
        # ends on another wire's interior (or on their own wire, away from the end)
        declared_t = {i for ids, _, _, _ in t_points for i in ids}
        for k, (wk, _end, s) in enumerate(ends):
            if k in declared_t:
                continue
            for h, cl in enumerate(lines):
                if not cl.near_box(pts[k], join_tol):
                    continue
                sh, dist = cl.closest(pts[k])
                if dist > join_tol:
                    continue
                if not cl.closed and (sh <= join_tol or sh >= cl.length - join_tol):
                    continue  # an end-to-end contact, found above
                if cl.closed and min(sh, cl.length - sh) <= join_tol:
                    continue
                if h == wk and abs(sh - s) <= 10 * max(structure.wires[wk].radii()):
                    continue
                t_points.append(([k], h, float(sh), False))
    # nodes: groups of ends, then T points (their ends merged in)
    groups: dict[int, list[int]] = {}
    for k in range(len(ends)):
        groups.setdefault(uf.find(k), []).append(k)
    node_of_end: dict[int, int] = {}
    nodes: list[TopologyNode] = []
    for root in sorted(groups):
        members = groups[root]
        nodes.append(TopologyNode(pts[members[0]].copy(),
                                  [(ends[k][0], ends[k][2]) for k in members]))
        for k in members:
            node_of_end[k] = len(nodes) - 1
    for ids, host, s, declared in t_points:
        target = lines[host].point(s)
        # the same T point found twice (or declared and found): one node on the host
        existing = next((n for n, node in enumerate(nodes)
                         if any(mw == host and abs(x - s) <= join_tol
                                for mw, x in node.members)), None)
        merged = {node_of_end[i] for i in ids}
        if existing is None:
            nodes.append(TopologyNode(target.copy(), [(host, s)], declared=declared))
            existing = len(nodes) - 1
        keep = nodes[existing]
        for m in sorted(merged - {existing}):
            keep.members.extend(nodes[m].members)
            nodes[m].members = []
            for k, n in node_of_end.items():
                if n == m:
                    node_of_end[k] = existing
        keep.declared |= declared
    live = [n for n, node in enumerate(nodes) if node.members]
    renum = {old: new for new, old in enumerate(live)}
    nodes = [nodes[n] for n in live]
    for node in nodes:
        node.members = sorted(set(node.members))
    end_node = {(w, e): renum[node_of_end[index[(w, e)]]] for (w, e) in index}
    for i, gap in enumerate(structure.gaps):
        if end_node[(gap.a.wire, gap.a.end)] == end_node[(gap.b.wire, gap.b.end)]:
            raise FabplanError("the two ends of this gap are joined: a gap needs a width",
                               field=f"gaps[{i}]", value=None)
    ground = structure.ground_z_mm
    if ground is not None:
        for i, c in enumerate(lines):
            p, _ = c.sample(max(c.length / 2000, a_min))
            if float(p[:, 2].min()) < ground - join_tol:
                raise FabplanError("the wire dips below the ground plane",
                                   field=f"wires[{i}]", value=round(float(p[:, 2].min()), 4))
        for node in nodes:
            node.on_ground = abs(float(node.point[2]) - ground) <= join_tol
    gaps = [(end_node[(g.a.wire, g.a.end)], end_node[(g.b.wire, g.b.end)], g.element,
             f"gaps[{i}]") for i, g in enumerate(structure.gaps)]
    wire_gaps: list[tuple[int, float, float, GapElement, str]] = []
    for i, wg in enumerate(structure.wire_gaps):
        where = f"wire_gaps[{i}]"
        if not 0 <= wg.wire < len(lines):
            raise FabplanError(f"no wire number {wg.wire}", field=f"{where}.wire", value=wg.wire)
        c = lines[wg.wire]
        s0, s1 = wg.at_mm - wg.width_mm / 2, wg.at_mm + wg.width_mm / 2
        if not wg.width_mm > 0 or s0 < -1e-9 or s1 > c.length + 1e-9:
            raise FabplanError(f"the gap must have a width and lie on the wire (0..{c.length:.6g} "
                               "mm)", field=where, value=(wg.at_mm, wg.width_mm))
        wire_gaps.append((wg.wire, max(s0, 0.0), min(s1, c.length), wg.element, where))
    _check_elements(structure)
    topo = Topology(structure, lines, nodes, end_node, gaps, wire_gaps, [])
    topo.findings.extend(_proximity(topo))
    return topo


def _check_elements(structure: Structure) -> None:
    ports = [e for _, e in structure.elements() if isinstance(e, Port)]
    names = [p.name for p in ports]
    dup = sorted({n for n in names if names.count(n) > 1})
    if dup:
        raise FabplanError("port names must differ (group them with `group` to feed them in "
                           "parallel)", field="ports", value=dup[0])
    if not ports:
        raise FabplanError("the structure has no port: put a Port in a gap", field="gaps",
                           value=None)
    tuned = [(w, e) for w, e in structure.elements() if isinstance(e, TunedCapacitor)]
    if len(tuned) > 1:
        raise FabplanError("one capacitor to be solved per structure", field=tuned[1][0],
                           value=tuned[1][1].name)
    targets = set(names) | {p.group for p in ports if p.group is not None}
    for where, e in tuned:
        if e.port not in targets:
            raise FabplanError(f"names no port or port group (have {sorted(targets)})",
                               field=f"{where}.port", value=e.port)


# -- close approaches -----------------------------------------------------------------------
def close_pairs(points: np.ndarray, reach: float) -> tuple[np.ndarray, np.ndarray]:
    """Index pairs (i < j) of `points` (N, 3) closer than `reach`, by a uniform grid of
    cells `reach` wide (each point is compared with its own and the 26 neighbouring cells)."""
    n = len(points)
    if n < 2:
        return np.zeros(0, np.int64), np.zeros(0, np.int64)
    cell = np.floor((points - points.min(axis=0)) / reach).astype(np.int64)
    dims = cell.max(axis=0) + 3
    key = ((cell[:, 0] + 1) * dims[1] + cell[:, 1] + 1) * dims[2] + cell[:, 2] + 1
    order = np.argsort(key, kind="stable")
    skey = key[order]
    out_i, out_j = [], []
    for dx in (-1, 0, 1):
        for dy in (-1, 0, 1):
            for dz in (-1, 0, 1):
                off = (dx * dims[1] + dy) * dims[2] + dz
                if off < 0:
                    continue  # each pair of cells once
                lo = np.searchsorted(skey, skey + off, side="left")
                hi = np.searchsorted(skey, skey + off, side="right")
                cnt = hi - lo
                if off == 0:  # same cell: only later points
                    lo = np.arange(n) + 1
                    cnt = np.maximum(hi - lo, 0)
                total = int(cnt.sum())
                if total == 0:
                    continue
                a = np.repeat(np.arange(n), cnt)
                start = np.repeat(lo - np.concatenate([[0], np.cumsum(cnt)[:-1]]), cnt)
                b = start + np.arange(total)
                i, j = order[a], order[b]
                d = np.linalg.norm(points[i] - points[j], axis=1)
                keep = d < reach
                out_i.append(i[keep])
                out_j.append(j[keep])
    if not out_i:
        return np.zeros(0, np.int64), np.zeros(0, np.int64)
    i = np.concatenate(out_i)
    j = np.concatenate(out_j)
    lo_, hi_ = np.minimum(i, j), np.maximum(i, j)
    return lo_, hi_


def _graph_distances(topo: Topology) -> tuple[np.ndarray, list[list[tuple[int, float]]]]:
    """All-pairs conductor distances (mm) between topology nodes, along wires and across
    gaps, and for each wire its nodes as (node, s)."""
    n = len(topo.nodes)
    on_wire: list[list[tuple[int, float]]] = [[] for _ in topo.centrelines]
    for k, node in enumerate(topo.nodes):
        for w, s in node.members:
            on_wire[w].append((k, s))
    d = np.full((n, n), math.inf)
    np.fill_diagonal(d, 0.0)
    for w, c in enumerate(topo.centrelines):
        lst = sorted(on_wire[w], key=lambda t: t[1])
        for (a, sa), (b, sb) in pairwise(lst):
            d[a, b] = d[b, a] = min(d[a, b], sb - sa)
        if c.closed and len(lst) > 1:
            (a, sa), (b, sb) = lst[0], lst[-1]
            d[a, b] = d[b, a] = min(d[a, b], c.length - sb + sa)
    for a, b, _, _ in topo.gaps:
        g = float(np.linalg.norm(topo.nodes[a].point - topo.nodes[b].point))
        d[a, b] = d[b, a] = min(d[a, b], g)
    for k in range(n):  # Floyd-Warshall: a handful of nodes
        d = np.minimum(d, d[:, k:k + 1] + d[k:k + 1, :])
    return d, on_wire


def _proximity(topo: Topology) -> list[Finding]:
    """Conductors that come within CLOSE_DIAMETERS of each other away from where they join:
    a warning each (one per pair of wires); touching or crossing is an error."""
    wires = topo.structure.wires
    a_min = min(min(w.radii()) for w in wires)
    a_max = max(max(w.radii()) for w in wires)
    total = sum(c.length for c in topo.centrelines)
    reach = CLOSE_DIAMETERS * 2 * a_max
    # samples about a radius apart (a sixteenth of the reach at most, so that thin wires
    # beside a thick one do not make a crowd of pairs), and never more than 20000
    step = max(a_min, total / 20000, reach / 16)
    pts_l, wid_l, s_l, rad_l = [], [], [], []
    for w, c in enumerate(topo.centrelines):
        p, s = c.sample(step)
        pts_l.append(p)
        s_l.append(s)
        wid_l.append(np.full(len(s), w))
        rad_l.append(wires[w].radius_at(s))
    pts = np.vstack(pts_l)
    wid = np.concatenate(wid_l)
    ss = np.concatenate(s_l)
    rad = np.concatenate(rad_l)
    i, j = close_pairs(pts, reach)
    if len(i) == 0:
        return []
    dist = np.linalg.norm(pts[i] - pts[j], axis=1)
    dmat, on_wire = _graph_distances(topo)
    apart = np.full(len(i), math.inf)
    same = wid[i] == wid[j]
    if np.any(same):
        length = np.array([c.length for c in topo.centrelines])[wid[i]]
        closed = np.array([c.closed for c in topo.centrelines])[wid[i]]
        d = np.abs(ss[i] - ss[j])
        d = np.where(closed, np.minimum(d, length - d), d)
        apart = np.where(same, d, apart)
    lengths = [c.length for c in topo.centrelines]
    closed_l = [c.closed for c in topo.centrelines]
    for wa in range(len(topo.centrelines)):
        for wb in range(len(topo.centrelines)):
            sel = np.nonzero((wid[i] == wa) & (wid[j] == wb))[0]
            if len(sel) == 0 or not on_wire[wa] or not on_wire[wb]:
                continue
            for na, sa in on_wire[wa]:
                da = np.abs(ss[i[sel]] - sa)
                if closed_l[wa]:
                    da = np.minimum(da, lengths[wa] - da)
                for nb, sb in on_wire[wb]:
                    db = np.abs(ss[j[sel]] - sb)
                    if closed_l[wb]:
                        db = np.minimum(db, lengths[wb] - db)
                    apart[sel] = np.minimum(apart[sel], da + dmat[na, nb] + db)
    dia = rad[i] + rad[j]
    other = apart > (math.pi / 2) * np.maximum(dist, CLOSE_DIAMETERS * dia) + 2 * step
    touching = other & (dist <= dia * (1 + 1e-9))
    if np.any(touching):
        k = int(np.argmax(touching))
        raise FabplanError(
            f"wire {wid[i[k]]} at {ss[i[k]]:.1f} mm and wire {wid[j[k]]} at {ss[j[k]]:.1f} mm "
            f"touch or cross ({dist[k]:.3g} mm apart, centre to centre) without a junction: "
            "join them with a junction or move them apart", field="geometry",
            value=round(float(dist[k]), 4))
    close = other & (dist < CLOSE_DIAMETERS * dia)
    out: list[Finding] = []
    seen: set[tuple[int, int]] = set()
    for k in np.nonzero(close)[0][np.argsort(dist[close], kind="stable")]:
        key = (int(wid[i[k]]), int(wid[j[k]]))
        if key in seen:
            continue
        seen.add(key)
        wa, wb = key
        name_a = wires[wa].name or f"wire {wa}"
        name_b = wires[wb].name or f"wire {wb}"
        if wa == wb:
            out.append(Finding(
                "em-conductors-close", "warning",
                f"{name_a} passes itself {dist[k]:.3g} mm apart centre to centre (at "
                f"{ss[i[k]]:.1f} and {ss[j[k]]:.1f} mm along it), under {CLOSE_DIAMETERS:g} "
                "diameters: the thin-wire model ignores the proximity effect there and the "
                "impedance is less certain", name_a))
        else:
            out.append(Finding(
                "em-wires-nearly-touch", "warning",
                f"{name_a} (at {ss[i[k]]:.1f} mm along it) and {name_b} (at {ss[j[k]]:.1f} mm) "
                f"come {dist[k]:.3g} mm apart centre to centre without a junction, under "
                f"{CLOSE_DIAMETERS:g} diameters: join them with a junction if they should touch, "
                "or move them apart; the thin-wire model is less certain there", name_a))
    return out
