"""Shape templates: each turns a few dimensions into a bend path.

`SHAPES[name]` is the `ShapeSpec` of one shape; to add a shape, write a module
with `read`, `build`, `problems`, `governing`, `with_governing` and `SPEC`, list
it here, and add its commented design file under `fabplan/templates/`.
"""

from __future__ import annotations

from . import (
    circle_loop,
    custom,
    delta_loop,
    folded_dipole,
    hairpin,
    helix,
    polygon_loop,
    quadrifilar,
    rect_loop,
    straight,
    tip_coupled_pair,
)
from .base import ShapeSpec

__all__ = ["SHAPES", "ShapeSpec"]

SHAPES: dict[str, ShapeSpec] = {m.SPEC.name: m.SPEC for m in (
    folded_dipole, hairpin, rect_loop, delta_loop, circle_loop, polygon_loop, helix, custom,
    straight, tip_coupled_pair, quadrifilar)}
