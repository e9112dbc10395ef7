"""The validated design: frozen dataclasses, lengths in millimetres.

A `Design` is what the design file says, checked key by key: the elements to
build (each a shape with its dimensions, a quantity, and optionally its own
stock and a placement in the assembly's frame), the stock they are bent from,
the shop's habits, and the settings of each later stage (forming, purchase,
jig, electrical). Nothing here computes a figure; `fabplan.plan.make_plan`
turns a Design into a Plan.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from ..geometry.placement import Placement
from ..stock.materials import Material
from ..stock.profiles import Profile
from ..units import LengthUnit

if TYPE_CHECKING:  # pragma: no cover
    from .boom import BoomSpec, MountSpec
    from .electrical import ElectricalSettings
    from .forming import FormingSettings
    from .jig import JigSettings
    from .match import MatchSpec
    from .purchase import PurchaseSettings

__all__ = ["Design", "ElementSpec", "StockSpec", "Shop", "CapacitorSpec", "MAX_ELEMENTS",
           "MAX_PIECE_LENGTH_MM", "MAX_BENDS", "MAX_TRIM_MM", "MAX_KERF_MM", "MAX_QUANTITY",
           "MAX_FILE_BYTES", "MAX_DEPTH"]

# -- bounds on a design, checked while it is read (before any work starts) ----------
# Each says what a hand-built antenna needs, with room to spare; beyond it the work
# (sampling, meshing, drawing, packing) would grow without a useful answer.
MAX_FILE_BYTES = 1 << 20  # a design file: 1 MiB (the templates are about 1 KB)
MAX_DEPTH = 8  # tables and arrays nested in a design file (the deepest use is 3)
MAX_ELEMENTS = 100  # [[element]] tables in one design
MAX_PIECE_LENGTH_MM = 500_000.0  # developed length of one piece of stock: 500 m
MAX_BENDS = 200  # bends in one piece of stock (each gets a row, marks and a former)
MAX_TRIM_MM = 500.0  # trim per end: a bender's grip is 25-50 mm (common practice)
MAX_KERF_MM = 10.0  # saw kerf: an abrasive or cold saw cuts 1-3 mm (common practice)
MAX_QUANTITY = 100_000  # elements of one kind in an order


@dataclass(frozen=True)
class StockSpec:
    """The conductor stock: its material, cross-section and where they come from."""

    material: Material
    profile: Profile
    description: str
    source: str
    catalogue: str | None = None
    k_factor: float = 0.5
    k_factor_given: bool = False


@dataclass(frozen=True)
class Shop:
    """Shop habits: display units, fraction precision, saw kerf, trim per end (mm)."""

    units: LengthUnit = "in"
    fraction: int = 32
    kerf_mm: float = 0.0
    trim_mm: float = 0.0


@dataclass(frozen=True)
class CapacitorSpec:
    """A capacitor across an element's gap instead of a feed: a fixed value (F), or
    None to have the electrical check solve the value that resonates the antenna at
    the target; its loss as a Q or an ESR (ohm); its voltage rating (V, peak); the
    resistance of each joint in the loop's current path (ohm) and how many there are
    (None: the capacitor's two connections and two per fitting)."""

    capacitance_f: float | None = None
    q: float | None = None
    esr_ohm: float | None = None
    rating_v: float | None = None
    joint_resistance_ohm: float | None = None
    joints: int | None = None


@dataclass(frozen=True)
class ElementSpec:
    """One element to build: a shape with its dimensions, and how many.

    `params` is the shape's own frozen dataclass (see fabplan.geometry.shapes).
    `stock` overrides the design's stock for this element (None: the design's);
    `placement` puts the element's frame into the assembly's frame: the elements
    that have one are modelled together, as one antenna (None: the element stands
    alone). `capacitor`: the element's gap holds a capacitor, not the feed.
    `boom`: its place on the design's boom (fabplan.design.boom); `match`: its
    matching device (fabplan.design.match), and on the part the device is made as,
    the same; `part_of`: the element a part (a matching device) belongs to.
    """

    name: str
    shape: str
    params: Any
    quantity: int = 1
    trim_mm: float | None = None  # per end; None: the shop's
    stock: StockSpec | None = None
    placement: Placement | None = None
    capacitor: CapacitorSpec | None = None
    boom: MountSpec | None = None
    match: MatchSpec | None = None
    part_of: str | None = None


@dataclass(frozen=True)
class Design:
    """The validated input: lengths in mm, nothing else."""

    project: str
    elements: tuple[ElementSpec, ...]
    stock: StockSpec
    shop: Shop
    source: str = "<design>"
    forming: FormingSettings | None = None
    purchase: PurchaseSettings | None = None
    jig: JigSettings | None = None
    electrical: ElectricalSettings | None = None
    notes: str = ""
    raw: dict[str, Any] = field(default_factory=dict, compare=False, repr=False)
    boom: BoomSpec | None = None

    def stock_of(self, element: ElementSpec) -> StockSpec:
        """The stock an element is bent from: its own, or the design's."""
        return element.stock if element.stock is not None else self.stock
