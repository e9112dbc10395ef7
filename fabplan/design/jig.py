"""The `[jig]` table of a design file and the `fabplan jig` options.

Every length is millimetres inside. Defaults follow common shop practice
for plywood or MDF jigs cut on a CNC router (no published source).

    [jig]
    bed = "600 x 400 mm"        # machine bed, width x height
    kerf = "0 mm"               # width of the cut (laser beam or router bit); default 0
    units = "mm"                # drawing unit of the DXF: "mm" or "in"
    margin = "25 mm"            # plate edge beyond the conductor, pins and labels
    corner_radius = "10 mm"     # rounded plate corners
    bolt_hole = "6.5 mm"        # former bolt holes (M6 clearance)
    pin_diameter = "6 mm"       # hold-down pins (dowels)
    pin_pitch = "100 mm"        # pin spacing along straight runs
    tool_radius = "3.175 mm"    # router bit radius; "0 mm" for a laser
    mounting_hole = "5 mm"      # holes to screw the plate to a bench
    part_gap = "6 mm"           # space between parts on the bed
    text_height = "3.5 mm"      # engraved labels
    notch_clearance = "0.5 mm"  # helix pitch guide: notch width beyond the wire's diameter
    split = "sections"          # plate too big for the bed: "sections" or "end-plates"

Every size has a stated physical range (`LIMITS`), checked when the table or
an option is read, so that no setting can make the jig stage's work explode
(a pin pitch of 0.001 mm would ask for millions of pins).
"""

from __future__ import annotations

import dataclasses
import re
from dataclasses import dataclass
from typing import Literal

from ..choices import DRAWING_UNITS, DrawingUnit
from ..errors import DesignError
from ..section import Section
from ..units import parse_length

__all__ = ["JigSettings", "DrawingUnit", "DRAWING_UNITS", "SplitMode", "SPLIT_MODES",
           "Limit", "LIMITS", "read_jig", "parse_bed", "with_options", "check_settings"]

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
    # helix pitch guide: each notch is the wire's diameter plus this, so that the
    # wire drops in without binding and the guide slides off the finished coil
    # (common practice for a sliding fit in a routed or lasered slot, no source)
    notch_clearance_mm: float = 0.5


@dataclass(frozen=True)
class Limit:
    """The physical range of one `[jig]` size (mm), and why."""

    key: str  # the design-file key
    attr: str  # the JigSettings attribute
    low_mm: float
    high_mm: float
    why: str
    low_open: bool = False  # the low end itself is excluded
    high_open: bool = False  # the high end itself is excluded


# common practice for hand-built antenna jigs cut on a CNC router or laser, no source
LIMITS: tuple[Limit, ...] = (
    Limit("bed", "bed_mm", 100.0, 4000.0, "from 100 mm to 4 m a side (a router or laser bed)"),
    Limit("kerf", "kerf_mm", 0.0, 5.0, "from 0 up to (not including) 5 mm (a cutting tool's "
          'kerf, e.g. "0.2 mm" for a laser)', high_open=True),
    Limit("margin", "margin_mm", 5.0, 200.0, "from 5 mm to 200 mm"),
    Limit("corner_radius", "corner_radius_mm", 0.0, 200.0,
          "from 0 to 200 mm (and at most the margin)"),
    Limit("bolt_hole", "bolt_hole_mm", 1.0, 30.0, "from 1 mm to 30 mm"),
    Limit("pin_diameter", "pin_diameter_mm", 1.0, 30.0, "from 1 mm to 30 mm"),
    Limit("pin_pitch", "pin_pitch_mm", 3.0, 2000.0,
          "from 3 mm to 2 m (and at least the pin diameter plus 2 mm)"),
    Limit("tool_radius", "tool_radius_mm", 0.0, 15.0, "from 0 (a laser) to 15 mm"),
    Limit("mounting_hole", "mounting_hole_mm", 1.0, 50.0,
          "from 1 mm to 50 mm (and under half the margin)"),
    Limit("part_gap", "part_gap_mm", 0.0, 100.0, "from 0 to 100 mm"),
    Limit("text_height", "text_height_mm", 1.0, 50.0, "from 1 mm to 50 mm"),
    Limit("notch_clearance", "notch_clearance_mm", 0.0, 5.0, "from 0 to 5 mm"),
)


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
        notch_clearance_mm=sec.length("notch_clearance", d.notch_clearance_mm,
                                      allow_zero=True),
    )
    typed = {key: sec.raw(key) for key in (lim.key for lim in LIMITS) if sec.has(key)}
    sec.finish()
    check_settings(settings, "jig", typed)
    return settings


def _shown(mm: float) -> str:
    return f"{mm:.6g} mm"


def check_settings(s: JigSettings, where: str = "jig",
                   typed: dict[str, object] | None = None) -> None:
    """Raise a one-line DesignError naming the first size outside its range.

    `where` prefixes the field ("jig" for the design file's table, "option"
    for the command line); `typed` holds the values as the user wrote them,
    shown in the error instead of the millimetres."""
    typed = typed or {}

    def fail(key: str, rule: str, mm: object) -> None:
        field = f"--{key}" if where == "option" else f"{where}.{key}"
        raise DesignError(rule, field=field, value=typed.get(key, mm))

    for lim in LIMITS:
        raw = getattr(s, lim.attr)
        values = raw if isinstance(raw, tuple) else (raw,)
        for v in values:
            low_bad = v <= lim.low_mm if lim.low_open else v < lim.low_mm
            high_bad = v >= lim.high_mm if lim.high_open else v > lim.high_mm
            if low_bad or high_bad or v != v:
                shown = " x ".join(_shown(x) for x in values)
                fail(lim.key, f"must be {lim.why}", shown)
    if s.corner_radius_mm > s.margin_mm:
        fail("corner_radius", f"must be at most the margin ({_shown(s.margin_mm)})",
             _shown(s.corner_radius_mm))
    if 2 * s.mounting_hole_mm >= s.margin_mm:
        fail("mounting_hole", f"must be less than half the margin ({_shown(s.margin_mm)})",
             _shown(s.mounting_hole_mm))
    if s.pin_pitch_mm < s.pin_diameter_mm + 2.0:
        fail("pin_pitch", f"must be at least the pin diameter plus 2 mm "
             f"({_shown(s.pin_diameter_mm + 2.0)}), so that neighbouring pins do not touch",
             _shown(s.pin_pitch_mm))


def with_options(settings: JigSettings, *, bed: str | None = None, kerf: str | None = None,
                 units: str | None = None) -> JigSettings:
    """The settings with command-line options applied (strings as typed)."""
    changes: dict[str, object] = {}
    typed: dict[str, object] = {}
    if bed is not None:
        changes["bed_mm"] = parse_bed(bed, "--bed")
        typed["bed"] = bed
    if kerf is not None:
        changes["kerf_mm"] = parse_length(kerf, "--kerf", allow_zero=True)
        typed["kerf"] = kerf
    if units is not None:
        if units not in DRAWING_UNITS:
            raise DesignError(f"must be one of {', '.join(DRAWING_UNITS)}", field="--units",
                              value=units)
        changes["units"] = units
    out = dataclasses.replace(settings, **changes)  # type: ignore[arg-type]
    # a range broken by the design file's own table is reported against it
    check_settings(out, "option" if typed else "jig", typed)
    return out
