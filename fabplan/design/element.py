"""An element's own tables: its stock, its placement in the assembly, its capacitor.

    [[element]]
    name = "reflector"
    ...
    [element.stock]              # this element's stock, instead of the design's [stock]
    catalogue = "al-3/8"         # the same keys as [stock]

    [element.placement]          # where the element sits in the assembled antenna
    at = ["0 mm", "0 mm", "0 mm"]    # its own origin, in the assembly's x, y, z
    turn = [0, 0, 90]            # degrees about x, then y, then z (right hand), in that order

    [element.capacitor]          # the element's gap holds a capacitor, not the feed
    capacitance = "120 pF"       # omit it to have the electrical check solve the value
    q = 2000                     # the capacitor's Q, or esr = "0.02 ohm"
    rating = "6 kV"              # its peak voltage rating (a finding when exceeded)
    joint_resistance = "1 mohm"  # each soldered or clamped joint in the loop's path
    joints = 2                   # how many (default: the capacitor's 2, and 2 per fitting)

Elements with a placement are modelled together as one antenna by the electrical
check; an element without one is modelled alone, in its own frame. Lengths in mm,
angles in degrees, capacitance in F, resistance in ohm, voltage in V.
"""

from __future__ import annotations

import math
from collections.abc import Callable

import numpy as np

from ..errors import DesignError
from ..geometry.placement import Placement
from ..section import Section
from ..units import parse_capacitance, parse_length, parse_resistance, parse_voltage
from .model import CapacitorSpec, StockSpec

__all__ = ["EXTRA_KEYS", "read_element_extras", "placement_from"]

EXTRA_KEYS = ("stock", "placement", "capacitor")
MAX_PLACEMENT_MM = 100_000.0  # an assembly fits in a 100 m cube (a hand-built antenna)


def placement_from(at_mm: tuple[float, float, float],
                   turn_deg: tuple[float, float, float]) -> Placement:
    """A placement: turned about x, then y, then z (degrees, right hand, about the
    assembly's axes), then moved so the element's origin sits at `at_mm`."""
    rx, ry, rz = (math.radians(a) for a in turn_deg)
    cx, sx, cy, sy, cz, sz = (math.cos(rx), math.sin(rx), math.cos(ry), math.sin(ry),
                              math.cos(rz), math.sin(rz))
    mx = np.array([[1, 0, 0], [0, cx, -sx], [0, sx, cx]])
    my = np.array([[cy, 0, sy], [0, 1, 0], [-sy, 0, cy]])
    mz = np.array([[cz, -sz, 0], [sz, cz, 0], [0, 0, 1]])
    r = mz @ my @ mx
    r[np.abs(r) < 1e-15] = 0.0
    x_axis = (float(r[0, 0]), float(r[1, 0]), float(r[2, 0]))
    y_axis = (float(r[0, 1]), float(r[1, 1]), float(r[2, 1]))
    return Placement(at_mm, x_axis, y_axis)


def _triple(sec: Section, key: str, parse: Callable[[object, str], float],
            default: tuple[float, float, float]) -> tuple[float, float, float]:
    if not sec.has(key):
        return default
    raw = sec.raw(key)
    if not isinstance(raw, list) or len(raw) != 3:
        raise DesignError("expected three values: x, y and z", field=sec.field(key), value=raw)
    a, b, c = (parse(v, f"{sec.field(key)}[{i}]") for i, v in enumerate(raw, 1))
    return (a, b, c)


def _length(value: object, field: str) -> float:
    mm = parse_length(value, field, allow_zero=True, allow_negative=True)
    if abs(mm) > MAX_PLACEMENT_MM:
        raise DesignError(f"must lie within {MAX_PLACEMENT_MM / 1000:g} m of the assembly's "
                          "origin", field=field, value=value)
    return mm


def _angle(value: object, field: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)) \
            or not math.isfinite(value) or abs(value) > 360:
        raise DesignError("expected an angle in degrees between -360 and 360", field=field,
                          value=value)
    return float(value)


def _read_placement(sec: Section) -> Placement:
    at = _triple(sec, "at", _length, (0.0, 0.0, 0.0))
    turn = _triple(sec, "turn", _angle, (0.0, 0.0, 0.0))
    sec.finish()
    return placement_from(at, turn)


def _read_capacitor(sec: Section) -> CapacitorSpec:
    c_f = None if not sec.has("capacitance") else parse_capacitance(
        sec.raw("capacitance"), sec.field("capacitance"))
    q = sec.number("q", None, low=1.0, high=1e7)
    esr = None if not sec.has("esr") else parse_resistance(sec.raw("esr"), sec.field("esr"))
    if q is not None and esr is not None:
        raise DesignError("give the capacitor's q or its esr, not both", field=sec.field("esr"))
    rating = None if not sec.has("rating") else parse_voltage(sec.raw("rating"),
                                                              sec.field("rating"))
    joint = None if not sec.has("joint_resistance") else parse_resistance(
        sec.raw("joint_resistance"), sec.field("joint_resistance"))
    joints = sec.integer("joints", None, low=0, high=1000)
    if joints is not None and joint is None:
        raise DesignError("joints counts the joints of joint_resistance: give that too",
                          field=sec.field("joints"), value=joints)
    sec.finish()
    return CapacitorSpec(c_f, q, esr, rating, joint, joints)


def read_element_extras(sec: Section, read_stock: Callable[[Section], StockSpec]
                        ) -> tuple[StockSpec | None, Placement | None, CapacitorSpec | None]:
    """An element's own stock, placement and capacitor tables (None where absent).
    `read_stock` reads a stock table as `[stock]` is read."""
    stock_sec = sec.table("stock", None)
    stock = read_stock(stock_sec) if stock_sec is not None else None
    place_sec = sec.table("placement", None)
    placement = _read_placement(place_sec) if place_sec is not None else None
    cap_sec = sec.table("capacitor", None)
    capacitor = _read_capacitor(cap_sec) if cap_sec is not None else None
    return stock, placement, capacitor
