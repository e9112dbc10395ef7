"""What the core stage adds to the Plan: each piece's lengths, bend table and marks.

Positions are along the stock's neutral axis in mm, from the stock's centre
(negative towards end A) and from the cut end A (trim included). Points are
in the element's own frame (mm).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from ..design.model import StockSpec
from ..geometry.path import BendPath
from ..stock.profiles import Profile

__all__ = ["BendRow", "Mark", "MarkKind", "PieceCore", "StockSummary", "Vec"]

Vec = tuple[float, float, float]
MarkKind = Literal["centre", "bend-start", "bend-end", "gap", "end", "fit"]  # fit: a fitting


@dataclass(frozen=True)
class BendRow:
    """One bend, in trade order from end A."""

    index: int
    angle_deg: float
    centreline_radius_mm: float
    rotation_deg: float
    pitch_mm: float
    straight_before_mm: float
    neutral_radius_mm: float
    arc_length_mm: float
    start_from_centre_mm: float
    end_from_centre_mm: float
    start_from_end_mm: float
    end_from_end_mm: float
    start_point: Vec
    end_point: Vec


@dataclass(frozen=True)
class Mark:
    """A pencil mark on the straight stock."""

    label: str
    kind: MarkKind
    from_centre_mm: float
    from_end_mm: float


@dataclass(frozen=True)
class StockSummary:
    """The stock a piece is cut from, as the reports show it."""

    spec: StockSpec
    mass_per_m_kg: float

    @property
    def description(self) -> str:
        return self.spec.description

    @property
    def profile(self) -> Profile:
        return self.spec.profile

    @property
    def material_key(self) -> str:
        return self.spec.material.key

    @property
    def material_name(self) -> str:
        return self.spec.material.name

    @property
    def material_source(self) -> str:
        return self.spec.material.source

    @property
    def source(self) -> str:
        return self.spec.source

    @property
    def k_factor(self) -> float:
        return self.spec.k_factor


@dataclass(frozen=True)
class PieceCore:
    """One piece of stock: its bend path, lengths, bend table and marks (mm, kg)."""

    label: str  # "" for an element of one piece
    stock: StockSummary
    path: BendPath
    conductor_diameter_mm: float
    centreline_length_mm: float
    developed_length_mm: float
    trim_mm: float  # per end
    cut_length_mm: float
    gap_mm: float | None  # feed gap between this piece's own ends (a loop), else None
    bends: tuple[BendRow, ...]
    marks: tuple[Mark, ...]
    tail_straight_mm: float
    planar: bool
    mass_kg: float  # one piece, cut length of stock
    rolled: bool = False  # a ring rolled to one radius (no jig), see PieceGeometry
