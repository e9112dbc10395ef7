"""Elements on a boom, as the design reader finishes them.

After the elements and `[boom]` are read (fabplan.design.boom, fabplan.design.match):

1. a tip-coupled pair given by `frequency` gets the published starting dimensions for
   its stock (fabplan.antennas.tip_pair);
2. each element with a `position` is placed across the boom;
3. when the boom is modelled as a conductor (`boom_modelled`), each whole straight
   element bonded through it is modelled as two halves joined at the boom's axis;
4. each matching device becomes its part, after its element.

The boom is modelled as a conductor when it is metal, at least one element is bonded
through it, and nothing else passes through it (an element through the boom in
insulating bushings would cross the boom's wire in the model) and no element bonded
through it is fed at its centre (split, or matched by a gamma or T whose published
model needs the element's centre impedance). Otherwise its effect on each element is
the boom correction (fabplan.antennas.boom), added to the cut lengths by the boom stage.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Callable, Sequence

from ..geometry.shapes import tip_coupled_pair
from .boom import BoomSpec, place_on_boom
from .match import match_parts
from .model import ElementSpec, StockSpec

__all__ = ["beam_elements", "boom_modelled", "mounting_of"]


def mounting_of(spec: ElementSpec, boom: BoomSpec | None) -> str | None:
    """How an element on the boom is mounted (None: not on the boom)."""
    if spec.boom is None or boom is None:
        return None
    return spec.boom.mounting or boom.mounting


def boom_modelled(boom: BoomSpec | None, elements: Sequence[ElementSpec]) -> bool:
    """Whether the electrical model includes the boom as a conductor (module docstring)."""
    if boom is None or not boom.stock.conductor:
        return False
    mounts = [(e, mounting_of(e, boom)) for e in elements if e.part_of is None]
    bonded = [e for e, m in mounts if m == "bonded-through"]
    if not bonded or any(m == "insulated" for _, m in mounts):
        return False
    return all(e.shape == "straight" and e.params.feed_gap_mm is None and e.match is None
               for e in bonded)


def beam_elements(elements: Sequence[ElementSpec], boom: BoomSpec | None,
                  fields: Sequence[str],
                  stock_of: Callable[[ElementSpec], StockSpec]) -> tuple[ElementSpec, ...]:
    """The elements finished as the module docstring says. `fields` name each
    element's table (for errors); `stock_of` gives an element's stock."""
    out = []
    for spec in elements:
        if spec.shape == tip_coupled_pair.NAME:
            d = stock_of(spec).profile.outer_diameter_mm
            spec = dataclasses.replace(
                spec, params=tip_coupled_pair.with_starting_dimensions(spec.params, d))
        out.append(spec)
    placed = place_on_boom(out, boom, fields)
    if boom_modelled(boom, placed):
        placed = tuple(
            dataclasses.replace(e, params=dataclasses.replace(e.params, model_centre="joined"))
            if mounting_of(e, boom) == "bonded-through" else e for e in placed)
    return match_parts(placed, fields, stock_of)
