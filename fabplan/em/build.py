"""The design's elements as one wire structure for the method of moments.

Every piece of stock of every element becomes a `Wire`: its bend path as it will
be after release (each bend at its after-springback radius, where the forming
stage has one), placed by the element's placement, with the stock's equivalent
radius, tube wall and resistivity. Every gap between piece ends becomes a `Gap`
of its real width holding the feed (a `Port`, all ports of one structure fed in
parallel from one feed point) or the element's capacitor (fixed, or tuned so the
feed sees resonance at the target). Junctions are found where ends meet.

Which elements are modelled together: every element with a placement forms one
structure (the assembled antenna); an element without one is modelled alone.

Pure: no files, no printing. mm, Hz, ohm, F.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..design.electrical import ElectricalSettings
from ..design.model import ElementSpec, StockSpec
from ..errors import DesignError
from ..forming.records import ElementForming
from ..geometry.path import Bend, BendPath
from ..geometry.placement import Placement as ElementPlacement
from ..geometry.shapes import SHAPES
from ..geometry.shapes.base import ElementGeometry
from ..lengths.records import PieceCore
from .structure import Gap, Load, Placement, Port, Structure, TunedCapacitor, Wire, WireEnd

__all__ = ["ElectricalInput", "Conductor", "conductor", "released_paths", "groups",
           "build_structure", "FEED_GROUP", "joint_count", "joint_resistance_ohm"]

FEED_GROUP = "feed"  # the ports of one structure are fed in parallel, as one group


@dataclass(frozen=True)
class ElectricalInput:
    """What the electrical stage models of one element: its spec (shape and
    dimensions, to rebuild it when tuning), its stock, its pieces of stock with
    their forming figures (for the released bend radii) and the gaps between
    their ends."""

    spec: ElementSpec
    stock: StockSpec
    pieces: tuple[PieceCore, ...]
    forming: tuple[ElementForming | None, ...]
    geometry: ElementGeometry

    @property
    def name(self) -> str:
        return self.spec.name

    @property
    def piece(self) -> PieceCore:
        return self.pieces[0]

    @property
    def fed(self) -> bool:
        """The element has a feed gap (and no capacitor in it)."""
        return self.geometry.modelled.feed is not None and self.spec.capacitor is None

    @property
    def gap_mm(self) -> float | None:
        feed = self.geometry.modelled.feed
        return None if feed is None else feed.width_mm

    @property
    def line_part(self) -> bool:
        """A matching device's part modelled as a transmission line (a gamma or T rod),
        not as wires: the structure leaves it out."""
        m = self.spec.match
        return self.spec.part_of is not None and m is not None and m.line_modelled


@dataclass(frozen=True)
class Conductor:
    """The conductor the model uses: radius and tube wall (mm), resistivity (ohm m,
    None for a perfect conductor)."""

    radius_mm: float
    tube_wall_mm: float | None
    resistivity_ohm_m: float | None


def conductor(stock: StockSpec, settings: ElectricalSettings) -> Conductor:
    """Radius, tube wall and resistivity of the stock as the model sees them."""
    profile = stock.profile
    material = stock.material
    rho: float | None
    if settings.perfect_conductor:
        rho = None
    elif settings.resistivity_ohm_m is not None:
        rho = settings.resistivity_ohm_m
    else:
        rho = material.rf_resistivity_ohm_m or material.resistivity_ohm_m
    wall = getattr(profile, "wall_mm", None) if profile.kind == "tube" else None
    return Conductor(profile.equivalent_radius_mm, wall, rho)


def _released(path: BendPath, design_path: BendPath,
              forming: ElementForming | None) -> tuple[BendPath, bool]:
    design_radii = [b.radius_mm for b in design_path.bends]
    if forming is None or len(path.bends) != len(design_radii):
        return path, False
    # a bend that springs straight (infinite final radius) is already an error
    # finding; the model keeps its design radius rather than an unbendable one
    ratios = {b.index: b.final_radius_mm / design_radii[b.index - 1] for b in forming.bends
              if 1 <= b.index <= len(design_radii) and math.isfinite(b.final_radius_mm)}
    pieces = []
    index = 0
    for piece in path.pieces:
        if isinstance(piece, Bend):
            index += 1
            piece = dataclasses.replace(piece, radius_mm=piece.radius_mm * ratios.get(index, 1.0))
        pieces.append(piece)
    return dataclasses.replace(path, pieces=tuple(pieces), _cache={}), True


def released_paths(element: ElectricalInput, params: Any = None
                   ) -> tuple[tuple[BendPath, ...], ElementGeometry, bool]:
    """The element's pieces as they will be after release, its geometry, and
    whether the released radii were applied.

    `params` (the shape's params, e.g. with a new governing length) rebuilds the
    geometry; None uses the element's own. Each bend takes its final radius where
    the forming stage has one (for rebuilt params, its own radius scaled by the
    element's final/design ratio for that bend, so a loop whose radius is the tuned
    length keeps its springback figure)."""
    geometry = element.geometry
    if params is not None:
        geometry = SHAPES[element.spec.shape].element_geometry(
            params, element.stock.profile.outer_diameter_mm)
    if geometry.model is not None:
        # the model's conductors are not the pieces of stock (telescoping, fed or joined
        # at the centre): straight runs, no bends to release
        geometry = geometry.model
        return tuple(p.path for p in geometry.pieces), geometry, False
    out = []
    released_all = bool(geometry.pieces)
    for i, piece in enumerate(geometry.pieces):
        design = element.pieces[i].path if i < len(element.pieces) else piece.path
        forming = element.forming[i] if i < len(element.forming) else None
        path, released = _released(piece.path, design, forming)
        out.append(path)
        released_all = released_all and released
    return tuple(out), geometry, released_all


def groups(elements: Sequence[ElectricalInput | None]) -> list[list[int]]:
    """Which elements are modelled together: the placed ones as one structure (in the
    design's order), each unplaced one alone. Indices into `elements`."""
    placed = [i for i, e in enumerate(elements) if e is not None and e.spec.placement is not None]
    out = [[i] for i, e in enumerate(elements) if e is not None and e.spec.placement is None]
    if placed:
        out.insert(0, placed)
    return sorted(out, key=lambda g: g[0])


def _placement(p: ElementPlacement | None) -> Placement:
    if p is None:
        return Placement()
    r = p.rotation
    rows = tuple(tuple(float(x) for x in row) for row in r)
    return Placement(rows, tuple(float(x) for x in p.origin_mm))  # type: ignore[arg-type]


def build_structure(elements: Sequence[ElectricalInput], settings: ElectricalSettings,
                    overrides: Mapping[str, Any] | None = None
                    ) -> tuple[Structure, tuple[str, ...]]:
    """The elements as one `Structure`, and the name of each wire's element.

    `overrides` gives other params for some elements (by name), as a tuner asks."""
    overrides = overrides or {}
    wires: list[Wire] = []
    owners: list[str] = []
    gaps: list[Gap] = []
    n_ports = sum(1 for e in elements if e.fed for g in e.geometry.gaps if g.role == "feed")
    group = FEED_GROUP if n_ports > 1 else None
    feed_name = next((e.name for e in elements if e.fed), None)
    for e in elements:
        if e.line_part:
            continue
        paths, geometry, _ = released_paths(e, overrides.get(e.name))
        place = _placement(e.spec.placement)
        base = len(wires)
        for piece, path in zip(geometry.pieces, paths):
            c, steps = _conductor_along(e, piece.conductor_of, settings)
            wires.append(Wire(path, c.radius_mm, steps=steps, tube_wall_mm=c.tube_wall_mm,
                              resistivity_ohm_m=c.resistivity_ohm_m, placement=place,
                              name=e.name if not piece.label else f"{e.name}, {piece.label}"))
            owners.append(e.name)
        for n, g in enumerate(geometry.gaps):
            ends = (WireEnd(base + g.a.piece, g.a.end), WireEnd(base + g.b.piece, g.b.end))
            element: Port | Load | TunedCapacitor
            if g.role == "joint":  # a fitting: conductor (its resistance is the joints')
                element = Load(f"{e.name} joint {n + 1}", "series")
            elif g.role == "feed" and e.spec.capacitor is None:
                element = Port(e.name if n == 0 else f"{e.name} {n + 1}", group=group)
            else:
                element = _capacitor(e, settings, feed_name)
            gaps.append(Gap(ends[0], ends[1], element))
    return Structure(tuple(wires), tuple(gaps), ground_z_mm=settings.ground_z_mm()), tuple(owners)


def _conductor_along(e: ElectricalInput, conductor_of: Sequence[tuple[float, int]],
                     settings: ElectricalSettings
                     ) -> tuple[Conductor, tuple[tuple[float, float], ...]]:
    """A modelled conductor's stock where it starts, and where its radius steps (from
    arc length mm, radius mm) as it runs through telescoping tubes."""
    if not conductor_of:
        return conductor(e.stock, settings), ()
    radii = [(s, conductor(e.pieces[i].stock.spec, settings)) for s, i in conductor_of]
    first = radii[0][1]
    steps = []
    last = first.radius_mm
    for s, c in radii[1:]:
        if abs(c.radius_mm - last) > 1e-12:
            steps.append((float(s), c.radius_mm))
            last = c.radius_mm
    return first, tuple(steps)


def _capacitor(e: ElectricalInput, settings: ElectricalSettings,
               feed_name: str | None) -> Load | TunedCapacitor:
    cap = e.spec.capacitor
    name = f"{e.name} capacitor"
    if cap is None:
        return Load(name, "series")  # a gap that is not the feed and has no part: shorted
    joints = joint_resistance_ohm(e)
    if cap.capacitance_f is not None:
        return Load(name, "series", r_ohm=joints or None, c_f=cap.capacitance_f, q=cap.q,
                    esr_ohm=cap.esr_ohm)
    if settings.target_hz is None:
        raise DesignError("a capacitor solved for resonance needs [electrical] target; or give "
                          "its capacitance", field=f"element {e.name!r}.capacitor")
    if feed_name is None:
        raise DesignError("a capacitor solved for resonance needs a fed element modelled with "
                          "it (e.g. a coupling loop placed beside the loop)",
                          field=f"element {e.name!r}.capacitor")
    return TunedCapacitor(settings.target_hz, feed_name, name, cap.q, cap.esr_ohm, joints)


def joint_count(e: ElectricalInput) -> int:
    """The joints in a capacitor loop's current path: as the design says, or the
    capacitor's two connections and two per fitting (a joint gap)."""
    cap = e.spec.capacitor
    if cap is not None and cap.joints is not None:
        return cap.joints
    return 2 + 2 * sum(1 for g in e.geometry.gaps if g.role == "joint")


def joint_resistance_ohm(e: ElectricalInput) -> float:
    """The joints' total resistance in series with the loop (ohm): per joint times count."""
    cap = e.spec.capacitor
    if cap is None or not cap.joint_resistance_ohm:
        return 0.0
    return cap.joint_resistance_ohm * joint_count(e)


def gap_points(structure: Structure) -> tuple[list[tuple[float, float, float]],
                                                list[tuple[float, float, float]]]:
    """The middle of every port gap and every load gap (mm, structure frame)."""
    feeds: list[tuple[float, float, float]] = []
    loads: list[tuple[float, float, float]] = []
    for g in structure.gaps:
        pa = _end_point(structure.wires[g.a.wire], g.a.end)
        pb = _end_point(structure.wires[g.b.wire], g.b.end)
        x, y, z = (float(v) for v in (pa + pb) / 2)
        (feeds if isinstance(g.element, Port) else loads).append((x, y, z))
    return feeds, loads


def _end_point(w: Wire, end: str) -> np.ndarray:
    path = w.path
    if isinstance(path, BendPath):
        local = np.asarray(path.origin, float) if end == "A" else path.end_point()
    else:
        local = np.asarray(path[0] if end == "A" else path[-1], float)
    return np.asarray(w.placement.apply(local), float)
