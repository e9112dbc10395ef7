"""The design file's `[forming]` table: how the bends are made.

    [forming]
    method = "former"            # "former" (round a disc on a jig) or "bender"
    model = "hardening"          # stress-strain law: "hardening" or "elastic-plastic"
    square_ends = true           # in a bender, allow square ends for wide folded dipoles

    [forming.bender]             # a hand or ratchet tube bender (method = "bender")
    radius = "15/16 in"          # its centreline radius
    reference = "bend-start"     # tool mark the pencil mark lines up with:
                                 # "bend-start" (where the bend begins) or
                                 # "corner" (one centreline radius on: the corner of a 90)
    stock_direction = "forward"  # "forward": the bend forms on the far side of the mark
                                 # from the end measured; "reverse": on the near side
    grip = "2 in"                # straight stock the tool must hold beside a bend

    [forming.calibration]        # a test bend made in the shop, this stock
    former_radius = "1/2 in"     # disc radius (the inside of the bend)
    angle_held = 95              # degrees, while held
    angle_released = 90          # degrees, after letting go

Everything comes out in millimetres and degrees.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from ..errors import DesignError
from ..section import Section
from .model import StockSpec

__all__ = ["FormingSettings", "BenderTool", "TestBend", "read_forming", "METHODS",
           "REFERENCES", "DIRECTIONS", "Model", "MODELS"]

Model = Literal["hardening", "elastic-plastic"]  # the stress-strain law
MODELS: tuple[Model, ...] = ("hardening", "elastic-plastic")
Method = Literal["former", "bender"]
METHODS: tuple[Method, ...] = ("former", "bender")
Reference = Literal["bend-start", "corner"]
REFERENCES: tuple[Reference, ...] = ("bend-start", "corner")
Direction = Literal["forward", "reverse"]
DIRECTIONS: tuple[Direction, ...] = ("forward", "reverse")


@dataclass(frozen=True)
class BenderTool:
    """A hand/ratchet bender: centreline radius (mm), mark convention, grip (mm)."""

    radius_mm: float
    reference: Reference = "bend-start"
    stock_direction: Direction = "forward"
    grip_mm: float = 0.0


@dataclass(frozen=True)
class TestBend:
    """A test bend: disc radius (inside of the bend, mm), angles held and released (deg)."""

    former_radius_mm: float
    angle_held_deg: float
    angle_released_deg: float


@dataclass(frozen=True)
class FormingSettings:
    method: Method = "former"
    model: Model = "hardening"
    square_ends: bool = True
    bender: BenderTool | None = None
    calibration: TestBend | None = None


MAX_GRIP_MM = 1000.0  # straight stock a hand bender holds: a few inches (common practice)


def read_forming(top: Section, stock: StockSpec | None) -> FormingSettings:
    """Read `[forming]` (defaults when absent); every key checked. `stock` (None
    when it could not be read) bounds the bender's radius."""
    sec = top.table("forming", None)
    if sec is None:
        return FormingSettings()
    method = sec.string("method", "former", choices=METHODS)
    model = sec.string("model", "hardening", choices=MODELS)
    square = sec.boolean("square_ends", True)
    bender = None
    b = sec.table("bender", None)
    if b is not None:
        bender = BenderTool(b.length("radius"),
                            b.string("reference", "bend-start", choices=REFERENCES),
                            b.string("stock_direction", "forward", choices=DIRECTIONS),
                            b.length("grip", 0.0, allow_zero=True, max_mm=MAX_GRIP_MM))
        b.finish()
        depth = stock.profile.depth_mm if stock is not None else 0.0
        if bender.radius_mm <= depth / 2:
            raise DesignError(f"must be more than half the {depth:.2f} mm stock depth",
                              field=b.field("radius"), value=b.data["radius"])
    if method == "bender" and bender is None:
        raise DesignError("method = \"bender\" needs a [forming.bender] table with the tool's "
                          "radius", field=sec.field("bender"))
    cal = None
    c = sec.table("calibration", None)
    if c is not None:
        cal = TestBend(c.length("former_radius"), c.angle("angle_held"),
                       c.angle("angle_released"))
        c.finish()
        if not 0 < cal.angle_held_deg <= 360:
            raise DesignError("must be between 0 and 360 degrees",
                              field=c.field("angle_held"), value=cal.angle_held_deg)
        if not 0 < cal.angle_released_deg < cal.angle_held_deg:
            raise DesignError("must be more than 0 and less than angle_held (a test bend "
                              "always springs back a little; measure both angles again)",
                              field=c.field("angle_released"), value=cal.angle_released_deg)
    sec.finish()
    return FormingSettings(method, model, square, bender, cal)
