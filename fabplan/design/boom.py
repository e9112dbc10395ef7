"""The design file's `[boom]` table and each element's place on the boom.

```toml
[boom]
square = { side = "1 in", wall = "1/16 in" }   # or catalogue = "al-1x0.058" (round tube),
material = "al-6063-t5"        # tube = { od, wall }; "wood" or "fibreglass" for an insulator
length = "1.2 m"
datum = "rear"                 # positions are measured from the rear end (or "front")
mounting = "insulated"         # "insulated", "bonded-through" or "above"
# height = "40 mm"             # "above": the element's axis above the boom's top face
# clearance = "0.3 mm"         # hole over the element (bonded) or over the bushing
# bushing_wall = "2.5 mm"      # insulated: the bushing's wall (hole = element + 2 walls)
# bolt_hole = "6.5 mm"         # "above": the hole for the clamp block's bolt
# frequency = "144.2 MHz"      # for the boom correction (default: [electrical] target)
# quantity = 1                 # booms to build

[[element]]
name = "director"
shape = "straight"
length = "890 mm"
position = "820 mm"            # along the boom from its datum (never from the last element)
# mounting = "above"           # this element's own mounting, instead of the boom's
```

The boom lies along +x from its rear end (the assembly's origin, on the boom's axis)
towards the front (the directors); an element with a `position` and no
`[element.placement]` is placed across the boom at that position: a flat element's
length along y, in the horizontal plane (z up), through the boom's axis, or at
`height` above its top face when mounted "above"; a loop stands in the plane across
the boom. Lengths in mm, frequency in Hz.

Trade figures marked [P] are common practice, no source: a drilled hole a little
over the rod (0.3 mm) for a snug push fit; nylon shoulder bushings of about 2.5 mm
wall; an M6 bolt (6.5 mm hole) through an insulating clamp block.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

from ..antennas.boom import MOUNTINGS, Mounting
from ..errors import DesignError
from ..section import Section
from ..stock.catalogue import get_stock_item
from ..stock.materials import Material, get_material
from ..stock.profiles import Round, Tube
from ..units import IN
from .element import placement_from
from .model import ElementSpec

__all__ = ["BoomStock", "BoomSpec", "MountSpec", "MOUNT_KEYS", "DATUMS", "INSULATORS",
           "SQUARE_CATALOGUE", "read_boom", "read_mount", "place_on_boom", "boom_x_mm",
           "element_z_mm", "FLAT_SHAPES", "LOOP_SHAPES"]

Datum = Literal["rear", "front"]
DATUMS: tuple[Datum, ...] = ("rear", "front")
MOUNT_KEYS = ("position", "mounting")
DEFAULT_CLEARANCE_MM = 0.3  # [P] a snug push fit
DEFAULT_BUSHING_WALL_MM = 2.5  # [P] nylon shoulder bushing
DEFAULT_BOLT_HOLE_MM = 6.5  # [P] M6 clearance hole
# shapes laid flat across the boom (length along y, in the horizontal plane), and
# loops that stand in the plane across the boom
FLAT_SHAPES = ("straight", "tip-coupled-pair", "folded-dipole", "hairpin")
LOOP_SHAPES = ("rect-loop", "delta-loop", "circle-loop")

# non-conducting booms: (name, density kg/m^3, source)
INSULATORS: dict[str, tuple[str, float, str]] = {
    "wood": ("seasoned hardwood (ash, oak)", 700.0, "typical density, common practice [P]"),
    "fibreglass": ("pultruded glass-fibre reinforced plastic", 1900.0,
                   "typical density of pultruded GRP [M]"),
}
# square aluminium boom tube: key -> (description, side in, wall in, material)
SQUARE_CATALOGUE: dict[str, tuple[str, float, float, str]] = {
    "al-sq-3/4x1/16": ("aluminium square tube 3/4 x 1/16 in", 0.75, 0.0625, "al-6063-t5"),
    "al-sq-1x1/16": ("aluminium square tube 1 x 1/16 in", 1.0, 0.0625, "al-6063-t5"),
    "al-sq-1-1/4x1/16": ("aluminium square tube 1 1/4 x 1/16 in", 1.25, 0.0625, "al-6063-t5"),
    "al-sq-1-1/2x1/8": ("aluminium square tube 1 1/2 x 1/8 in", 1.5, 0.125, "al-6063-t5"),
}
_SQUARE_SOURCE = "common extruded aluminium square tube sizes [P]"


@dataclass(frozen=True)
class BoomStock:
    """The boom's section: round or square, outside diameter or side (mm), wall (mm;
    None for solid), and its material (None with `insulator` for wood or fibreglass)."""

    section: Literal["round", "square"]
    outside_mm: float
    wall_mm: float | None
    material: Material | None
    insulator: str | None
    density_kg_m3: float
    description: str
    source: str
    catalogue: str | None = None

    @property
    def conductor(self) -> bool:
        """A metal boom (it shortens the elements near it)."""
        return self.material is not None

    @property
    def material_name(self) -> str:
        if self.material is not None:
            return self.material.name
        return INSULATORS[self.insulator or "wood"][0]

    @property
    def area_mm2(self) -> float:
        a, t = self.outside_mm, self.wall_mm
        if self.section == "round":
            return math.pi * a * a / 4 if t is None else math.pi * (a - t) * t
        return a * a if t is None else 4 * t * (a - t)

    @property
    def mass_per_m_kg(self) -> float:
        return self.density_kg_m3 * self.area_mm2 * 1e-6

    @property
    def equivalent_radius_mm(self) -> float:
        """The radius of the round wire the electrical model uses: a round boom's own;
        a square one of side a acts as a round one of radius 0.59 a (Balanis, Antenna
        Theory, equivalent radius of a square conductor [M])."""
        return self.outside_mm / 2 if self.section == "round" else 0.59 * self.outside_mm

    def model_profile(self) -> Round | Tube:
        """A round profile with the boom's equivalent radius, for the electrical model."""
        if self.section == "round" and self.wall_mm is not None:
            return Tube(self.outside_mm, self.wall_mm)
        return Round(2 * self.equivalent_radius_mm)


@dataclass(frozen=True)
class BoomSpec:
    """The boom: its stock, length (mm), datum end, how elements mount, the height of
    an element above its top face (mm, "above"), the hole sizes' allowances (mm), the
    frequency for the boom correction (Hz; None: the electrical target) and how many
    booms are built."""

    stock: BoomStock
    length_mm: float
    datum: Datum = "rear"
    mounting: Mounting = "insulated"
    height_mm: float | None = None
    clearance_mm: float = DEFAULT_CLEARANCE_MM
    bushing_wall_mm: float = DEFAULT_BUSHING_WALL_MM
    bolt_hole_mm: float = DEFAULT_BOLT_HOLE_MM
    frequency_hz: float | None = None
    quantity: int = 1


@dataclass(frozen=True)
class MountSpec:
    """An element's place on the boom: its distance from the boom's datum (mm) and its
    own mounting (None: the boom's)."""

    position_mm: float
    mounting: Mounting | None = None


def _read_boom_stock(sec: Section) -> BoomStock:
    given = [k for k in ("catalogue", "tube", "square") if sec.has(k)]
    sec.mark_used("catalogue", "tube", "square")
    if len(given) != 1:
        raise DesignError("give exactly one of catalogue, tube or square"
                          + (f" (found {', '.join(given)})" if given else ""), field=sec.path)
    kind = given[0]
    default_material: str | None = None
    section: Literal["round", "square"]
    wall: float | None
    catalogue = None
    if kind == "catalogue":
        catalogue = sec.string("catalogue")
        if catalogue in SQUARE_CATALOGUE:
            desc, side_in, wall_in, default_material = SQUARE_CATALOGUE[catalogue]
            section, outside, wall, source = "square", side_in * IN, wall_in * IN, _SQUARE_SOURCE
        else:
            item = get_stock_item(catalogue, sec.field("catalogue"))
            profile = item.profile
            outside = profile.outer_diameter_mm
            wall = getattr(profile, "wall_mm", None)
            section, desc, source = "round", item.description, item.source
            default_material = item.material
    else:
        t = sec.table(kind)
        outside = t.length("od" if kind == "tube" else "side")
        wall = t.length("wall", None)
        t.finish()
        if wall is not None and 2 * wall >= outside:
            raise DesignError("the wall must be less than half the outside size",
                              field=sec.field(f"{kind}.wall"), value=sec.raw(kind)["wall"])
        section = "round" if kind == "tube" else "square"
        shape = "round tube" if kind == "tube" else "square tube"
        desc = (f"{shape} {outside:.1f} mm" + (f" x {wall:.2f} mm wall" if wall else " solid"))
        source = "dimensions from the design"
    name = sec.string("material", default_material)
    if name is None:
        raise DesignError("is required: a metal (`fabplan materials` lists them), or "
                          f"{' or '.join(INSULATORS)} for an insulating boom",
                          field=sec.field("material"))
    material: Material | None = None
    insulator = None
    if name in INSULATORS:
        insulator = name
        density = INSULATORS[name][1]
    else:
        material = get_material(name)  # an unknown name: its own "did you mean"
        density = material.density_kg_m3
    return BoomStock(section, outside, wall, material, insulator, density, desc, source,
                     catalogue)


def read_boom(top: Section) -> BoomSpec | None:
    """Read `[boom]` (None when the design has none)."""
    sec = top.table("boom", None)
    if sec is None:
        return None
    stock = _read_boom_stock(sec)
    length = sec.length("length")
    datum = sec.string("datum", "rear", choices=DATUMS)
    mounting = sec.string("mounting", "insulated", choices=MOUNTINGS)
    height = sec.length("height", None, allow_zero=True)
    clearance = sec.length("clearance", DEFAULT_CLEARANCE_MM, allow_zero=True)
    bushing = sec.length("bushing_wall", DEFAULT_BUSHING_WALL_MM)
    bolt = sec.length("bolt_hole", DEFAULT_BOLT_HOLE_MM)
    frequency = sec.frequency("frequency", None)
    quantity = sec.integer("quantity", 1, low=1, high=10_000)
    sec.finish()
    if stock.outside_mm >= length:
        raise DesignError("the boom must be longer than it is thick", field=sec.field("length"),
                          value=sec.raw("length"))
    return BoomSpec(stock, length, datum, mounting, height, clearance, bushing, bolt,
                    frequency, quantity)


def read_mount(sec: Section) -> MountSpec | None:
    """An element's `position` (and own `mounting`) on the boom; None without one."""
    position = sec.length("position", None, allow_zero=True)
    mounting = sec.string("mounting", None, choices=MOUNTINGS)
    if position is None:
        if mounting is not None:
            raise DesignError("needs the element's `position` on the boom",
                              field=sec.field("mounting"))
        return None
    return MountSpec(position, mounting)


def boom_x_mm(boom: BoomSpec, position_mm: float) -> float:
    """The x (mm) along the boom from its rear end of a position from the datum."""
    return position_mm if boom.datum == "rear" else boom.length_mm - position_mm


def element_z_mm(boom: BoomSpec, mounting: Mounting) -> float:
    """The height (mm) of an element's axis above the boom's axis."""
    if mounting != "above":
        return 0.0
    return boom.stock.outside_mm / 2 + (boom.height_mm or 0.0)


def place_on_boom(elements: Sequence[ElementSpec], boom: BoomSpec | None,
                  fields: Sequence[str]) -> tuple[ElementSpec, ...]:
    """Each element with a position, placed across the boom (see the module
    docstring). `fields` name each element's table, for errors."""
    out = []
    for spec, where in zip(elements, fields):
        mount = spec.boom
        if mount is None:
            out.append(spec)
            continue
        if boom is None:
            raise DesignError("a position needs a [boom] table to be measured along",
                              field=f"{where}.position")
        if spec.placement is not None:
            raise DesignError("give the element's position on the boom or its placement, not "
                              "both", field=f"{where}.placement")
        mounting = mount.mounting or boom.mounting
        if mounting == "above" and boom.height_mm is None:
            raise DesignError('an element mounted "above" the boom needs [boom] height (its '
                              "axis above the boom's top face)", field="boom.height")
        x = boom_x_mm(boom, mount.position_mm)
        z = element_z_mm(boom, mounting)
        if spec.shape in FLAT_SHAPES:
            turn = (0.0, 0.0, 90.0)
        elif spec.shape in LOOP_SHAPES:
            turn = (90.0, 0.0, 90.0)
        else:
            raise DesignError(f"a {spec.shape} has no set way to sit on a boom: place it with "
                              "[element.placement]", field=f"{where}.position")
        out.append(dataclasses.replace(spec, placement=placement_from((x, 0.0, z), turn)))
    return tuple(out)
