"""A straight element: a rod or tube of a given tip-to-tip length.

Without `feed_gap` it is one piece (a parasitic element: a reflector or director).
With `feed_gap` it is a split element: two pieces of stock, one each side of an
insulator at the centre, fed across the gap between their inner ends; each half
is cut and marked on its own. The element lies along its frame's x axis, centred
on the origin.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

from ...errors import Finding
from ...section import Section
from ..path import BendPath, Straight
from .base import Dimension, ElementGeometry, End, Gap, PieceGeometry, ShapeSpec, TunedValue

NAME = "straight"
SUMMARY = "a straight rod or tube, whole or split at a centre feed gap (beam elements)"


@dataclass(frozen=True)
class Params:
    length_mm: float  # tip to tip
    feed_gap_mm: float | None = None  # None: one piece, not fed


def read(sec: Section) -> Params:
    return Params(sec.length("length"), sec.length("feed_gap", None))


def _half(p: Params) -> float:
    return (p.length_mm - (p.feed_gap_mm or 0.0)) / 2


def build(p: Params, d: float) -> BendPath:
    """The whole element as one path (a split element's geometry is two pieces)."""
    return BendPath((Straight(p.length_mm),), origin=(-p.length_mm / 2, 0.0, 0.0))


def geometry(p: Params, d: float) -> ElementGeometry:
    if p.feed_gap_mm is None:
        return ElementGeometry((PieceGeometry("", build(p, d)),))
    half = _half(p)
    g = p.feed_gap_mm
    left = BendPath((Straight(half),), origin=(-p.length_mm / 2, 0.0, 0.0))
    right = BendPath((Straight(half),), origin=(g / 2, 0.0, 0.0))
    return ElementGeometry((PieceGeometry("half A", left), PieceGeometry("half B", right)),
                           (Gap(End(0, "B"), End(1, "A"), g, "feed"),))


def problems(p: Params, d: float) -> list[Finding]:
    out = []
    if p.feed_gap_mm is not None and _half(p) <= d:
        out.append(Finding("gap-wider-than-side", "error",
                           f"a {p.feed_gap_mm:.1f} mm feed gap leaves halves of "
                           f"{_half(p):.1f} mm: shorten the gap or lengthen the element"))
    return out


def governing(p: Params) -> tuple[str, float]:
    return "length", p.length_mm


def with_governing(p: Params, value: float) -> Params:
    return dataclasses.replace(p, length_mm=value)


def tuned_keys(p: Params) -> dict[str, TunedValue]:
    return {"length": ("length", p.length_mm)}


def dimensions(p: Params, d: float) -> tuple[Dimension, ...]:
    """The tip-to-tip length, above the element."""
    half = p.length_mm / 2
    return (Dimension("length", p.length_mm, (-half, 0.0, 0.0), (half, 0.0, 0.0),
                      (0.0, 1.0, 0.0)),)


KEYS = ("length", "feed_gap")

SPEC = ShapeSpec(NAME, SUMMARY, KEYS, read, build, problems, governing, with_governing,
                 tuned_keys, geometry=geometry, dimensions=dimensions)
