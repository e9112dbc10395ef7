"""A driven element's matching device, `[element.match]`, made as a part.

```toml
[[element]]
name = "driven"
shape = "straight"
length = "955 mm"
feed_gap = "25 mm"
position = "400 mm"

[element.match]
kind = "hairpin"             # "hairpin", "gamma" or "t-match"
length = "60 mm"             # hairpin: its legs, from the feed terminals to the bend;
                             # gamma: element centre to the strap; t-match: strap to strap
direction = "back"           # which way the hairpin runs from the feed: "back" (along the
                             # boom towards the reflector), "forward", "down" or "up";
                             # gamma and T rods: the side of the element they lie on
# end_style = "square"       # hairpin: two 90-degree bends instead of one 180
# bend_radius = "10 mm"      # hairpin, square end: centreline radius of its bends
# spacing = "40 mm"          # gamma, t-match: rod to element, centre to centre
# capacitance = "30 pF"      # gamma: the series capacitor; t-match: one in each leg
#                            # (omit it: the electrical check solves the value at the target)
# rod_gap = "20 mm"          # t-match: the gap at the middle of the T rod (its feed)
[element.match.stock]        # the rod's stock (default: the element's); keys as [stock]
diameter = "4 mm"
material = "al-6061-t6"
```

Each device becomes a part of its own, listed after its element and named after it
("driven hairpin", "driven gamma rod", "driven T rod"): cut, marked, bent and bought
like any element, placed in the element's frame. The hairpin is a U of rod whose legs
start at the driven element's inner ends (its centre spacing is the feed gap) and is
modelled by the method of moments as wires joined to the element there. The gamma
and T rods are modelled by the published transmission-line model of those matches
(fabplan.antennas.matching, after Healey, QST 1969, and the folded-dipole
decomposition in Balanis) applied to the element's centre impedance, which the
method of moments computes with the element fed at its centre; their rods are not
wires of that model. Starting dimensions: `fabplan tune` designs them from
fabplan.antennas.matching (hairpin_match, gamma_match, t_match) and then refines
them against the model. mm, F.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any, Literal

import numpy as np

from ..errors import DesignError
from ..geometry.placement import Placement
from ..geometry.shapes import hairpin, straight
from ..section import Section
from ..units import parse_capacitance
from .model import ElementSpec, StockSpec

__all__ = ["MatchSpec", "MatchKind", "MATCH_KINDS", "DIRECTIONS", "read_match",
           "match_parts", "LINE_MODELLED", "part_placement", "DEFAULT_ROD_GAP_MM"]

MatchKind = Literal["hairpin", "gamma", "t-match"]
MATCH_KINDS: tuple[MatchKind, ...] = ("hairpin", "gamma", "t-match")
LINE_MODELLED: tuple[MatchKind, ...] = ("gamma", "t-match")  # by the transmission-line model
Direction = Literal["back", "forward", "down", "up"]
DIRECTIONS: tuple[Direction, ...] = ("back", "forward", "down", "up")
DEFAULT_ROD_GAP_MM = 20.0  # [P] room for the T's two capacitors and the balun's leads
# the direction in the element's frame (its length along x, y along the boom towards
# the rear, z up; see fabplan.design.boom)
_DIRECTION: dict[Direction, tuple[float, float, float]] = {
    "back": (0.0, 1.0, 0.0), "forward": (0.0, -1.0, 0.0), "down": (0.0, 0.0, -1.0),
    "up": (0.0, 0.0, 1.0)}


@dataclass(frozen=True)
class MatchSpec:
    """A matching device (see the module docstring). Lengths in mm, capacitance in F
    (None: solved at the target). `part` names the part it is made as; `element` the
    element it matches."""

    kind: MatchKind
    length_mm: float
    spacing_mm: float | None = None
    direction: Direction = "back"
    end_style: Literal["round", "square"] = "round"
    bend_radius_mm: float | None = None
    stock: StockSpec | None = None
    capacitance_f: float | None = None
    rod_gap_mm: float = DEFAULT_ROD_GAP_MM
    element: str = ""
    part: str = ""

    @property
    def line_modelled(self) -> bool:
        """Modelled by the transmission-line model (gamma, T), not as wires."""
        return self.kind in LINE_MODELLED


def read_match(sec: Section, read_stock: Callable[[Section], StockSpec]) -> MatchSpec | None:
    """`[element.match]` of one element (None when absent)."""
    m = sec.table("match", None)
    if m is None:
        return None
    kind = m.string("kind", choices=MATCH_KINDS)
    length = m.length("length")
    default_direction = "back" if kind == "hairpin" else "down"
    direction = m.string("direction", default_direction, choices=DIRECTIONS)
    stock_sec = m.table("stock", None)
    stock = read_stock(stock_sec) if stock_sec is not None else None
    if kind == "hairpin":
        for key in ("spacing", "capacitance", "rod_gap"):
            if m.has(key):
                raise DesignError("a hairpin's legs start at the feed gap's ends (its spacing is "
                                  "the feed gap) and it has no capacitor: leave this out",
                                  field=m.field(key))
        style = m.string("end_style", "round", choices=("round", "square"))
        radius = m.length("bend_radius", None)
        m.finish()
        return MatchSpec(kind, length, None, direction, style, radius, stock)
    spacing = m.length("spacing")
    cap = None if not m.has("capacitance") else parse_capacitance(m.raw("capacitance"),
                                                                  m.field("capacitance"))
    rod_gap = m.length("rod_gap", DEFAULT_ROD_GAP_MM) if kind == "t-match" else \
        DEFAULT_ROD_GAP_MM
    m.finish()
    return MatchSpec(kind, length, spacing, direction, "round", None, stock, cap, rod_gap)


def part_placement(outer: Placement | None, origin_mm: tuple[float, float, float],
                   x_axis: tuple[float, float, float],
                   y_axis: tuple[float, float, float]) -> Placement:
    """A part's placement: its frame given in its element's frame, then the element's."""
    base = outer or Placement()
    r = base.rotation

    def clean(v: np.ndarray) -> tuple[float, float, float]:
        w = [0.0 if abs(float(c)) < 1e-12 else float(c) for c in v]
        return (w[0], w[1], w[2])

    return Placement(clean(base.apply(np.asarray(origin_mm, float))),
                     clean(r @ np.asarray(x_axis, float)), clean(r @ np.asarray(y_axis, float)))


def match_parts(elements: Sequence[ElementSpec], fields: Sequence[str],
                stock_of: Callable[[ElementSpec], StockSpec]) -> tuple[ElementSpec, ...]:
    """Every element, each followed by its matching device's part; an element matched by
    a gamma or T is modelled fed at its centre. `stock_of` gives an element's stock."""
    names = {e.name for e in elements}
    out: list[ElementSpec] = []
    for spec, where in zip(elements, fields):
        m = spec.match
        if m is None:
            out.append(spec)
            continue
        field = f"{where}.match"
        p = spec.params
        d = stock_of(spec).profile.outer_diameter_mm
        if m.kind == "hairpin":
            gap = _feed_gap(spec)
            if gap is None:
                raise DesignError("a hairpin goes across a feed gap: give the element a "
                                  "feed_gap", field=field)
        elif spec.shape != "straight" or p.feed_gap_mm is not None:
            raise DesignError(f"a {m.kind} matches a whole straight element (no feed_gap: its "
                              "centre is not cut)", field=field)
        part = (f"{spec.name} hairpin" if m.kind == "hairpin" else
                f"{spec.name} gamma rod" if m.kind == "gamma" else f"{spec.name} T rod")
        if part in names:
            raise DesignError("another element already has the name of this part",
                              field=field, value=part)
        m = dataclasses.replace(m, element=spec.name, part=part)
        u = _DIRECTION[m.direction]
        params: Any
        if m.kind == "hairpin":
            params = hairpin.Params(m.length_mm, "centre_spacing", float(gap or 0.0),
                                    m.end_style, m.bend_radius_mm, anchor="ends")
            # the U's legs run along its x from its ends (at its origin), its y across:
            # the ends go to the feed gap's ends, the legs along `direction`
            place = part_placement(spec.placement, (0.0, 0.0, 0.0), u, (1.0, 0.0, 0.0))
            shape = "hairpin"
        else:
            s = m.spacing_mm or 0.0
            if s <= d:
                raise DesignError("the rod must lie clear of the element: its centre spacing "
                                  "must exceed the element's diameter", field=f"{field}.spacing",
                                  value=s)
            across = (0.0, 1.0, 0.0) if m.direction in ("down", "up") else (0.0, 0.0, 1.0)
            if m.kind == "gamma":
                params = straight.Params(m.length_mm)
                centre = (m.length_mm / 2 + s * u[0], s * u[1], s * u[2])
            else:
                params = straight.Params(m.length_mm, m.rod_gap_mm)
                centre = (s * u[0], s * u[1], s * u[2])
            place = part_placement(spec.placement, centre, (1.0, 0.0, 0.0), across)
            shape = "straight"
            spec = dataclasses.replace(spec, params=dataclasses.replace(
                p, model_centre="fed", model_gap_mm=max(2 * d, 2.0)))
        spec = dataclasses.replace(spec, match=m)
        out.append(spec)
        out.append(ElementSpec(part, shape, params, spec.quantity, spec.trim_mm,
                               m.stock if m.stock is not None else stock_of(spec), place,
                               match=m, part_of=spec.name))
    return tuple(out)


def _feed_gap(spec: ElementSpec) -> float | None:
    return getattr(spec.params, "feed_gap_mm", None)
