"""The `[jig]` table of a design file and the `fabplan jig` options.

Every length is millimetres inside. Defaults follow common shop practice
for plywood or MDF jigs cut on a CNC router (no published source).

    [jig]
    bed = "600 x 400 mm"        # machine bed, width x height
    kerf = "0.2 mm"             # width of the cut (laser beam or router bit)
    units = "mm"                # drawing unit of the DXF: "mm" or "in"
    margin = "25 mm"            # plate edge beyond the conductor, pins and labels
    corner_radius = "10 mm"     # rounded plate corners
    bolt_hole = "6.5 mm"        # former bolt holes (M6 clearance)
    pin_diameter = "6 mm"       # hold-down pins (dowels)
    pin_pitch = "100 mm"        # pin spacing along straight runs
    tool_radius = "3.175 mm"    # router bit radius; "0 mm" for a laser
    mounting_hole = "5 mm"      # holes to screw the plate to a bench
    part_gap = "6 mm"           # space between parts on the bed
    split = "sections"          # plate too big for the bed: "sections" or "end-plates"
"""

from __future__ import annotations

import dataclasses
import re
from dataclasses import dataclass
from typing import Literal

from ..errors import DesignError
from ..section import Section
from ..units import parse_length

__all__ = ["JigSettings", "DrawingUnit", "DRAWING_UNITS", "SplitMode", "SPLIT_MODES",
           "read_jig", "parse_bed", "with_options"]

DrawingUnit = Literal["mm", "in"]
DRAWING_UNITS: tuple[DrawingUnit, ...] = ("mm", "in")
SplitMode = Literal["sections", "end-plates"]
SPLIT_MODES: tuple[SplitMode, ...] = ("sections", "end-plates")


@dataclass(frozen=True)
class JigSettings:
    """How the jig is drawn. Lengths in millimetres."""

    bed_mm: tuple[float, float] = (600.0, 400.0)  # machine bed width x height
    kerf_mm: float = 0.0  # cut width; outer contours grow and holes shrink by half of it
    units: DrawingUnit = "mm"  # drawing unit of the DXF file
    margin_mm: float = 25.0  # plate edge beyond conductor, pins and labels
    corner_radius_mm: float = 10.0  # plate corner radius
    bolt_hole_mm: float = 6.5  # diameter of former bolt holes
    pin_diameter_mm: float = 6.0  # hold-down pin (dowel) diameter
    pin_pitch_mm: float = 100.0  # hold-down pin spacing along straight runs
    tool_radius_mm: float = 3.175  # router bit radius (1/4 in bit); 0 for a laser
    mounting_hole_mm: float = 5.0  # mounting hole diameter
    part_gap_mm: float = 6.0  # clear space between parts on a bed
    split: SplitMode = "sections"  # what to do with a plate larger than the bed
    text_height_mm: float = 3.5  # engraved label height


def parse_bed(text: object, field: str = "bed") -> tuple[float, float]:
    """"600x400mm", "600 x 400 mm", "24 in x 18 in", "24x18in" -> (width, height) mm."""
    if not isinstance(text, str) or text.lower().count("x") != 1:
        raise DesignError('expected the bed as WIDTHxHEIGHT with a unit, e.g. "600x400mm" or '
                          '"24 x 18 in"', field=field, value=text)
    first, second = (s.strip() for s in re.split(r"[xX]", text))
    unit = re.search(r"[a-zA-Z\"']+\s*$", second)
    if unit and not re.search(r"[a-zA-Z\"']", first):
        first = f"{first} {unit.group(0)}"
    try:
        w = parse_length(first, field)
        h = parse_length(second, field)
    except DesignError:
        raise DesignError('expected the bed as WIDTHxHEIGHT with a unit, e.g. "600x400mm" or '
                          '"24 x 18 in"', field=field, value=text) from None
    return (w, h)


def read_jig(top: Section) -> JigSettings:
    """Read the optional `[jig]` table; defaults when it is absent."""
    sec = top.table("jig", None)
    if sec is None:
        return JigSettings()
    d = JigSettings()
    bed = parse_bed(sec.raw("bed"), sec.field("bed")) if sec.has("bed") else d.bed_mm
    settings = JigSettings(
        bed_mm=bed,
        kerf_mm=sec.length("kerf", d.kerf_mm, allow_zero=True),
        units=sec.string("units", d.units, choices=DRAWING_UNITS),
        margin_mm=sec.length("margin", d.margin_mm),
        corner_radius_mm=sec.length("corner_radius", d.corner_radius_mm, allow_zero=True),
        bolt_hole_mm=sec.length("bolt_hole", d.bolt_hole_mm),
        pin_diameter_mm=sec.length("pin_diameter", d.pin_diameter_mm),
        pin_pitch_mm=sec.length("pin_pitch", d.pin_pitch_mm),
        tool_radius_mm=sec.length("tool_radius", d.tool_radius_mm, allow_zero=True),
        mounting_hole_mm=sec.length("mounting_hole", d.mounting_hole_mm),
        part_gap_mm=sec.length("part_gap", d.part_gap_mm, allow_zero=True),
        split=sec.string("split", d.split, choices=SPLIT_MODES),
        text_height_mm=sec.length("text_height", d.text_height_mm),
    )
    sec.finish()
    _check(settings, "jig")
    return settings


def _check(s: JigSettings, where: str) -> None:
    if s.kerf_mm >= 5.0:
        raise DesignError("a kerf of 5 mm or more is not a cutting tool's; give the cut width, "
                          'e.g. "0.2 mm" for a laser', field=f"{where}.kerf", value=s.kerf_mm)
    if s.corner_radius_mm > s.margin_mm:
        raise DesignError("must not exceed the margin", field=f"{where}.corner_radius",
                          value=s.corner_radius_mm)
    if 2 * s.mounting_hole_mm >= s.margin_mm:
        raise DesignError("must be less than half the margin", field=f"{where}.mounting_hole",
                          value=s.mounting_hole_mm)
    if min(s.bed_mm) < 50.0:
        raise DesignError("a bed smaller than 50 mm cannot hold a jig part", field=f"{where}.bed",
                          value=s.bed_mm)


def with_options(settings: JigSettings, *, bed: str | None = None, kerf: str | None = None,
                 units: str | None = None) -> JigSettings:
    """The settings with command-line options applied (strings as typed)."""
    changes: dict[str, object] = {}
    if bed is not None:
        changes["bed_mm"] = parse_bed(bed, "--bed")
    if kerf is not None:
        changes["kerf_mm"] = parse_length(kerf, "--kerf", allow_zero=True)
    if units is not None:
        if units not in DRAWING_UNITS:
            raise DesignError(f"must be one of {', '.join(DRAWING_UNITS)}", field="--units",
                              value=units)
        changes["units"] = units
    out = dataclasses.replace(settings, **changes)  # type: ignore[arg-type]
    _check(out, "option")
    return out
