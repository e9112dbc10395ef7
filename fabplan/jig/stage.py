"""The jig stage: every flat piece's bending jig, laid out on the machine's beds.

For each piece of stock with bends: a base plate with the formers (flat
pieces), or a pitch guide and a winding mandrel (a helix); former discs; the
calibration squares; all packed on beds of the design's size. Its findings
(a plate too big for the bed, inside corners the router cannot cut) are the
Plan's, so every command reports them alike.

Pure: no files, no printing. mm.
"""

from __future__ import annotations

from collections.abc import Sequence

from ..design.jig import JigSettings
from ..errors import Finding
from .beds import pack
from .mandrel import helix_parts
from .parts import calibration_parts
from .plate import plate_parts
from .records import Bed, JigLayout, JigPiece, Part
from .shapes import Circle, Contour, Item, inside_corners

__all__ = ["layout_jig", "piece_parts", "all_shapes"]


def piece_parts(e: JigPiece, project: str, s: JigSettings) -> tuple[list[Part], list[Finding]]:
    """The parts of one piece's jig, and findings about them."""
    if any(b.pitch_mm for b in e.path.bends):
        return helix_parts(e, s)
    if not e.planar:
        return [], [Finding("jig-not-planar", "warning",
                            "the element is not flat, so no flat bending plate is drawn for it; "
                            "bend it with a hand bender from the tool marks", e.name)]
    return plate_parts(e, project, s)


def _router_findings(parts: list[Part], s: JigSettings) -> list[Finding]:
    if s.tool_radius_mm <= 0:
        return []
    out = []
    small: dict[str, float] = {}
    for p in parts:
        for it in p.items:
            if it.op == "cut" and isinstance(it.shape, Contour):
                tight = inside_corners(it.shape, s.tool_radius_mm)
                if tight:
                    where, r = min(tight, key=lambda wr: wr[1])
                    out.append(Finding("jig-inside-corner", "warning",
                                       f"{p.name}: {len(tight)} inside corner(s) tighter than "
                                       f"the {s.tool_radius_mm:.2f} mm router bit radius "
                                       f"(smallest {r:.2f} mm, at {where[0]:.1f}, "
                                       f"{where[1]:.1f} in the part): they come out rounded to "
                                       "the bit; use a smaller bit, a laser, or finish by hand",
                                       p.element))
            if it.op == "drill" and isinstance(it.shape, Circle) and \
                    it.shape.radius < s.tool_radius_mm:
                small[it.role.split(" ")[0]] = 2 * it.shape.radius
    for role, dia in sorted(small.items()):
        out.append(Finding("jig-hole-below-tool", "info",
                           f"{role} holes ({dia:.2f} mm as drawn) are smaller than the "
                           f"{2 * s.tool_radius_mm:.2f} mm router bit: drill them"))
    return out


def layout_jig(project: str, pieces: Sequence[JigPiece], settings: JigSettings) -> JigLayout:
    """The jig of every piece, laid out on beds."""
    parts: list[Part] = []
    findings: list[Finding] = []
    for e in pieces:
        got, found = piece_parts(e, project, settings)
        parts.extend(got)
        findings.extend(found)
    if parts:
        parts.extend(calibration_parts())
    findings.extend(_router_findings(parts, settings))
    beds, found = pack(parts, settings)
    findings.extend(found)
    notes = (f"{project}: bending jig, full size",
             f"drawing unit {settings.units}; kerf {settings.kerf_mm:.2f} mm "
             "(outlines grown, holes shrunk by half of it)",
             "layers: CUT outlines, DRILL holes, ENGRAVE lines and text, REFERENCE (do not "
             "machine), NOTES",
             "check the 100 mm and 4 in squares before cutting")
    beds = [Bed(b.index, b.width_mm, b.height_mm, b.parts,
                (f"bed {b.index} of {len(beds)}: {b.width_mm:.0f} x {b.height_mm:.0f} mm",))
            for b in beds]
    return JigLayout(project, settings, tuple(beds), tuple(findings), notes)


def all_shapes(layout: JigLayout) -> list[tuple[int, Item]]:
    """Every placed item with its bed index (for renderers and tests)."""
    out: list[tuple[int, Item]] = []
    for bed in layout.beds:
        for pl in bed.parts:
            out.extend((bed.index, it) for it in pl.items())
    return out
