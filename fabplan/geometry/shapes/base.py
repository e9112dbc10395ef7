"""What every shape template provides, and what it tells the other stages.

A shape reads its own keys from an `[[element]]` table into a frozen `params`
dataclass (lengths in mm), turns the params into the element's geometry (one
or more pieces of stock, each a `BendPath` in the element's own frame, and the
gaps between piece ends) for a conductor of a given outside diameter, and
reports the problems it can see in its own dimensions as findings. It also
names its governing length (the one a tuner scales to move the resonance),
returns params with that length changed, and says which design-file keys
carry that length (so a tuned design can be written back).

Shapes whose element is two parallel sides joined by 180-degree ends (a folded
dipole, a hairpin) declare it with `ParallelEnds`: the forming stage uses it
to make square ends where a bender cannot make round ones, and to report how
far the legs would splay if springback were ignored.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any, Literal

from ...errors import DesignError, Finding
from ...section import Section
from ..path import BendPath

__all__ = ["ShapeSpec", "ParallelEnds", "PieceGeometry", "PieceStock", "End", "Gap",
           "ElementGeometry", "Dimension", "TunedValue", "pick_one", "spacing_centre",
           "gap_and_offset",
           "arc_angle_of_chord", "centre_to_centre"]

# a design-file value the tuner writes back: ("length", mm) or ("number", value)
TunedValue = tuple[Literal["length", "number"], float]


@dataclass(frozen=True)
class PieceStock:
    """A piece's own stock, when it is not the element's: a catalogue key, or a
    round tube's outside diameter and wall (mm) in the element's material. The core
    stage resolves it (the shapes cannot see the catalogue)."""

    catalogue: str | None = None
    od_mm: float | None = None
    wall_mm: float | None = None
    field: str = ""  # where the design gives it, for errors


@dataclass(frozen=True)
class PieceGeometry:
    """One piece of stock: its bend path in the element's frame (mm). `label`
    names it on the sheet ("" for an element of one piece).

    `stock`: the piece's own stock (telescoping tubes), None for the element's.
    `tips`: which of its ends ("A", "B") are the element's tips, where a length
    correction (the boom's) is added. `marks`: extra pencil marks (label, mm along
    the stock from end A), e.g. how far a tube slides into the next.
    `inside`: the index of the piece this one slides into (telescoping tubes).
    `conductor_of`: for a piece of the electrical model that runs through several
    pieces of stock, (from arc length mm, index of the stock piece whose section the
    conductor has from there); empty: the element's stock. `rolled`: a ring of one
    large radius rolled in passes (a ring roller or by hand), not bent round a disc:
    the forming stage gives its rolling radius and no jig is drawn."""

    label: str
    path: BendPath
    stock: PieceStock | None = None
    tips: tuple[Literal["A", "B"], ...] = ()
    marks: tuple[tuple[str, float], ...] = ()
    inside: int | None = None
    conductor_of: tuple[tuple[float, int], ...] = ()
    rolled: bool = False


@dataclass(frozen=True)
class End:
    """One end of a piece: `piece` indexes the element's pieces; "A" is where its
    bend path starts, "B" where it ends."""

    piece: int
    end: Literal["A", "B"]


@dataclass(frozen=True)
class Gap:
    """A gap between two piece ends (or the two ends of one piece) of `width_mm`:
    the feed point ("feed"), where a lumped part sits ("load"), or a fitting that
    joins two pieces of stock ("joint": a conductor in the model, the straight
    between the ends)."""

    a: End
    b: End
    width_mm: float
    role: Literal["feed", "load", "joint"] = "feed"


Vec3 = tuple[float, float, float]


@dataclass(frozen=True)
class Dimension:
    """A dimension the user gave, for a drawing to show (data only, no drawing).

    It measures `value_mm`, the value of the design-file key `key`, from point
    `a` to point `b` (both in the element's frame, mm; for a helix, points of
    its side view, see `fabplan.geometry.shapes.helix`). The dimension line
    stands off the element on the side `away` points to (a unit vector in the
    element's frame), with extension lines back to `a` and `b`; `away` =
    (0, 0, 0) draws the dimension line between `a` and `b` themselves (a
    dimension inside the element, such as the spacing between two sides).
    """

    key: str
    value_mm: float
    a: Vec3
    b: Vec3
    away: Vec3 = (0.0, 0.0, 0.0)


@dataclass(frozen=True)
class ElementGeometry:
    """The pieces of stock an element is made of, the gaps between their ends,
    and the dimensions the user gave (for drawings).

    `model`: the conductors the electrical model sees, when they are not the pieces
    of stock (telescoping tubes modelled as one stepped conductor per side; a whole
    element fed at its centre through a gamma or T match; an element joined to a
    boom modelled as a conductor); None: the pieces themselves."""

    pieces: tuple[PieceGeometry, ...]
    gaps: tuple[Gap, ...] = ()
    dimensions: tuple[Dimension, ...] = ()
    model: ElementGeometry | None = None

    @property
    def modelled(self) -> ElementGeometry:
        """What the electrical model sees: `model`, or the pieces and gaps."""
        return self.model if self.model is not None else self

    @property
    def feed(self) -> Gap | None:
        """The feed gap, when the element is fed."""
        return next((g for g in self.gaps if g.role == "feed"), None)


@dataclass(frozen=True)
class ParallelEnds:
    """Two parallel sides joined by ends that may be round (one 180-degree bend
    of half the centre spacing) or square (two 90-degree bends and a straight).

    `centre_spacing(params, d)`: centre-to-centre spacing (mm) for stock of
    diameter d; `is_round(params)`; `squared(params, radius_mm)`: the params
    with square ends of that centreline radius."""

    centre_spacing: Callable[[Any, float], float]
    is_round: Callable[[Any], bool]
    squared: Callable[[Any, float], Any]


def _one_piece(build: Callable[[Any, float], BendPath]) -> Callable[[Any, float],
                                                                    ElementGeometry]:
    def geometry(params: Any, diameter_mm: float) -> ElementGeometry:
        path = build(params, diameter_mm)
        gaps = (() if path.gap_mm is None
                else (Gap(End(0, "B"), End(0, "A"), path.gap_mm, "feed"),))
        return ElementGeometry((PieceGeometry("", path),), gaps)

    return geometry


@dataclass(frozen=True)
class ShapeSpec:
    """Everything the rest of fabplan knows about one shape.

    `build(params, d)` gives the bend path of a one-piece shape; `geometry`
    (by default the one piece `build` makes, fed across its gap when it has one)
    gives every piece and gap. `tuned_keys(params)` gives the design-file keys
    that carry the governing length and their values for these params.
    `dimensions(params, d)` gives the dimensions the user gave, for drawings.
    """

    name: str
    summary: str
    keys: tuple[str, ...]  # every key `read` may take from the element table
    read: Callable[[Section], Any]
    build: Callable[[Any, float], BendPath]
    problems: Callable[[Any, float], list[Finding]]
    governing: Callable[[Any], tuple[str, float]]
    with_governing: Callable[[Any, float], Any]
    tuned_keys: Callable[[Any], dict[str, TunedValue]]
    parallel_ends: ParallelEnds | None = None
    geometry: Callable[[Any, float], ElementGeometry] | None = None
    dimensions: Callable[[Any, float], tuple[Dimension, ...]] | None = None
    # a single-turn loop's circle or regular polygon for the small-loop formulas
    # (fabplan.antennas.small_loop.LoopGeometry), for stock of diameter d
    small_loop: Callable[[Any, float], Any] | None = None

    def element_geometry(self, params: Any, diameter_mm: float) -> ElementGeometry:
        """Every piece and gap of an element of this shape, with its dimensions."""
        make = self.geometry or _one_piece(self.build)
        geo = make(params, diameter_mm)
        if self.dimensions is None:
            return geo
        return dataclasses.replace(geo, dimensions=self.dimensions(params, diameter_mm))


def pick_one(sec: Section, keys: tuple[str, ...]) -> tuple[str, float]:
    """Exactly one of `keys` (all lengths) must be present; returns (key, mm)."""
    present = [k for k in keys if sec.has(k)]
    sec.mark_used(*keys)
    if len(present) != 1:
        names = " or ".join(f"`{k}`" for k in keys)
        if not present:
            raise DesignError(f"give one of {names}", field=sec.path)
        raise DesignError(f"give only one of {names}, not {' and '.join(present)}",
                          field=sec.path)
    return present[0], sec.length(present[0])


def spacing_centre(sec: Section) -> tuple[str, float]:
    """`spacing` (inside, between conductor surfaces) or `centre_spacing`."""
    return pick_one(sec, ("spacing", "centre_spacing"))


def centre_to_centre(kind: str, spacing_mm: float, diameter_mm: float) -> float:
    """Centre-to-centre spacing (mm) from `spacing` (inside) or `centre_spacing`."""
    return spacing_mm + diameter_mm if kind == "spacing" else spacing_mm


def gap_and_offset(sec: Section, default_gap_mm: float = 10.0) -> tuple[float, float]:
    """`feed_gap` (default 10 mm) and `feed_offset` (signed, default 0) in mm."""
    gap = sec.length("feed_gap", default_gap_mm)
    offset = sec.length("feed_offset", 0.0, allow_zero=True, allow_negative=True)
    return gap, offset


def arc_angle_of_chord(chord: float, radius: float) -> float:
    """Angle (rad) subtended by a chord on a circle."""
    return 2 * math.asin(min(1.0, chord / (2 * radius)))

