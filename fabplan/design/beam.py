"""Elements on a boom, as the design reader finishes them.

After the elements and `[boom]` are read (fabplan.design.boom, fabplan.design.match):

1. a tip-coupled pair given by `frequency` gets the published starting dimensions for
   its stock (fabplan.antennas.tip_pair); a telescoping straight given by the uniform
   element it must behave as gets its tip tube's length (fabplan.antennas.taper);
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

from ..antennas.taper import tip_length_for
from ..errors import DesignError
from ..geometry.shapes import tip_coupled_pair
from ..geometry.shapes.base import PieceStock
from ..stock.catalogue import get_stock_item
from .boom import BoomSpec, place_on_boom
from .electrical import ElectricalSettings
from .match import match_parts
from .model import ElementSpec, StockSpec

__all__ = ["beam_elements", "boom_modelled", "mounting_of", "beam_frequency_hz"]


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


def beam_frequency_hz(boom: BoomSpec | None, electrical: ElectricalSettings | None
                      ) -> float | None:
    """The design frequency of a beam's published corrections (Hz): [boom] frequency,
    the electrical target, or the middle of the electrical sweep."""
    if boom is not None and boom.frequency_hz is not None:
        return boom.frequency_hz
    if electrical is None:
        return None
    if electrical.target_hz is not None:
        return float(electrical.target_hz)
    return 0.5 * (electrical.sweep_from_hz + electrical.sweep_to_hz)


def _section_diameter(ref: PieceStock) -> float:
    if ref.catalogue is not None:
        return get_stock_item(ref.catalogue, ref.field or "catalogue").profile.outer_diameter_mm
    return float(ref.od_mm or 0.0)


def _solve_tip(spec: ElementSpec, field: str, f_hz: float | None) -> ElementSpec:
    """A telescoping straight given by the uniform element it behaves as: its length,
    with the tip tube's solved by the stepped-element method (fabplan.antennas.taper)."""
    p = spec.params
    if p.uniform is None:
        return spec
    if f_hz is None:
        raise DesignError("solving the tip for `uniform` needs the design frequency: give "
                          "[electrical] target or [boom] frequency", field=f"{field}.uniform")
    inner = [(_section_diameter(s.stock), s.exposed_mm or 0.0) for s in p.sections[:-1]]
    tip = _section_diameter(p.sections[-1].stock)
    try:
        r = tip_length_for(inner, tip, p.uniform.length_mm, p.uniform.diameter_mm, f_hz)
    except DesignError as exc:
        raise DesignError(exc.rule, field=f"{field}.uniform", value=exc.value) from None
    uniform = dataclasses.replace(p.uniform, frequency_hz=f_hz, correction_mm=r.correction_mm)
    return dataclasses.replace(spec, params=dataclasses.replace(
        p, length_mm=r.tapered_length_mm, uniform=uniform))


def beam_elements(elements: Sequence[ElementSpec], boom: BoomSpec | None,
                  fields: Sequence[str], stock_of: Callable[[ElementSpec], StockSpec],
                  electrical: ElectricalSettings | None = None) -> tuple[ElementSpec, ...]:
    """The elements finished as the module docstring says. `fields` name each
    element's table (for errors); `stock_of` gives an element's stock; `electrical`
    the design's electrical settings (for the design frequency)."""
    out = []
    f_hz = beam_frequency_hz(boom, electrical)
    for spec, field in zip(elements, fields):
        if spec.shape == tip_coupled_pair.NAME:
            d = stock_of(spec).profile.outer_diameter_mm
            spec = dataclasses.replace(
                spec, params=tip_coupled_pair.with_starting_dimensions(spec.params, d))
        if spec.shape == "straight":
            spec = _solve_tip(spec, field, f_hz)
        out.append(spec)
    placed = place_on_boom(out, boom, fields)
    if boom_modelled(boom, placed):
        placed = tuple(
            dataclasses.replace(e, params=dataclasses.replace(e.params, model_centre="joined"))
            if mounting_of(e, boom) == "bonded-through" else e for e in placed)
    return match_parts(placed, fields, stock_of)
