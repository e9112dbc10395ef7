"""What the boom stage adds to the Plan: the boom, where each element sits on it, the
boom correction added to each element's cut, the drilling plan and the hardware.

Lengths in mm (positions from the boom's datum, never from the element before),
masses in kg, frequencies in Hz.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..drilling.records import DrillPattern

__all__ = ["CutPiece", "ElementMount", "BillLine", "BoomPlan"]


@dataclass(frozen=True)
class CutPiece:
    """One piece of an element as it is cut for the beam: the shape's cut length, the
    boom correction added to it (at its tip end), and the length to cut."""

    label: str
    shape_cut_mm: float
    added_mm: float
    cut_length_mm: float


@dataclass(frozen=True)
class ElementMount:
    """One element on the boom.

    position_mm: from the datum; x_mm: from the boom's rear end; height_mm: its axis
    above the boom's axis. correction_mm: the boom correction added to its length tip
    to tip (0 when not applied); published_mm: the published figure for its mounting
    (shown even when the boom is modelled instead); upper_bound_mm: for "above", the
    insulated figure as a bound; applied: how the boom's effect is accounted for, in
    words; basis: the source. hole_mm: the hole it passes through (None when it sits
    above); crossing_mm: its diameter where it crosses the boom. pieces: each piece as
    cut.
    """

    element: str
    position_mm: float
    x_mm: float
    height_mm: float
    mounting: str
    correction_mm: float
    published_mm: float | None
    upper_bound_mm: float | None
    fraction_of_boom: float | None
    applied: str
    basis: str
    hole_mm: float | None
    crossing_mm: float
    pieces: tuple[CutPiece, ...]


@dataclass(frozen=True)
class BillLine:
    """Hardware to buy or make: what, how many, its size, and why."""

    item: str
    quantity: int
    size: str
    note: str


@dataclass(frozen=True)
class BoomPlan:
    """The boom: its stock and length, datum, how the elements mount, whether the
    electrical model includes it, each element on it, its holes, the hardware, and
    where it balances (the centre of mass of boom and elements, from the datum)."""

    description: str
    section: str  # "round" or "square"
    outside_mm: float
    wall_mm: float | None
    length_mm: float
    material: str
    conductor: bool
    mass_kg: float  # one boom
    quantity: int
    datum: str  # "rear" or "front"
    mounting: str
    modelled: bool  # the electrical model includes the boom as a conductor
    frequency_hz: float | None  # of the boom correction
    mounts: tuple[ElementMount, ...]
    drilling: DrillPattern
    bill: tuple[BillLine, ...]
    balance_mm: float | None
    notes: tuple[str, ...]

    def mount(self, element: str) -> ElementMount | None:
        return next((m for m in self.mounts if m.element == element), None)
