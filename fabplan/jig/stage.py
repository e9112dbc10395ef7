"""The jig stage: every flat piece's bending jig, laid out on the machine's beds.

For each piece of stock with bends: a base plate with the formers (flat
pieces), or a pitch guide and a winding mandrel (a helix); former discs; the
calibration squares; all packed on beds of the design's size. Its findings
(a plate too big for the bed, inside corners the router cannot cut) are the
Plan's, so every command reports them alike.

Every bed keeps a strip along its top edge for its notes (what the drawing
is, its unit and kerf, the layers, which bed of how many), so that every note
lies inside the bed; the parts are packed below it.

Pure: no files, no printing. mm.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from ..design.jig import JigSettings
from ..errors import Finding
from ..units import wrap_words
from .beds import pack
from .mandrel import helix_parts
from .parts import calibration_parts
from .plate import plate_parts
from .records import Bed, JigLayout, JigPiece, Part
from .shapes import SAFE_CHAR_WIDTH, Circle, Contour, Item, P, Text, inside_corners

__all__ = ["layout_jig", "piece_parts", "all_shapes", "STATUS_LINES", "NoteStrip",
           "note_strip", "usable_room"]

NOTE_PITCH = 1.6  # baseline to baseline, in text heights
STATUS_LINES = 1  # lines kept free at the top of the notes for a renderer's status line
MAX_NOTE_HEIGHT_MM = 5.0
MIN_NOTE_HEIGHT_MM = 1.5
MAX_STRIP_SHARE = 0.2  # the notes take at most this share of the bed's height


@dataclass(frozen=True)
class NoteStrip:
    """The notes along a bed's top edge: text height (mm), characters per line,
    the lines common to every bed, and the strip's height (mm)."""

    height_mm: float
    chars: int
    lines: tuple[str, ...]
    strip_mm: float
    edge_mm: float  # from the bed's edges to the text


def _heading(project: str) -> str:
    return f"{project}: bending jig, full size"


def _title(project: str, s: JigSettings, index: int, count: int) -> str:
    w, h = s.bed_mm
    return f"{_heading(project)}; bed {index} of {count}, {w:.0f} x {h:.0f} mm"


def _common_notes(s: JigSettings) -> list[str]:
    return [f"drawing unit {s.units}; kerf {s.kerf_mm:.2f} mm (outlines grown, holes shrunk by "
            "half of it); check the 100 mm and 4 in squares before cutting",
            "layers: CUT outlines, DRILL holes, ENGRAVE lines and text, REFERENCE (do not "
            "machine), NOTES (do not machine)"]


def note_strip(project: str, s: JigSettings) -> NoteStrip:
    """How the notes fit along the top of a bed of the settings' size: the
    largest text height up to 5 mm (and the engraving height) that keeps them
    within a fifth of the bed's height; lines beyond that are left out."""
    w, h = s.bed_mm
    edge = max(s.part_gap_mm, 2.0)
    th = min(s.text_height_mm, MAX_NOTE_HEIGHT_MM)
    while True:
        chars = max(8, int((w - 2 * edge) / (SAFE_CHAR_WIDTH * th)))
        title = wrap_words(_title(project, s, 999, 999), chars)
        lines = [ln for text in _common_notes(s) for ln in wrap_words(text, chars)]
        count = STATUS_LINES + len(title) + len(lines)
        strip = edge + count * NOTE_PITCH * th
        if strip <= MAX_STRIP_SHARE * h or th <= MIN_NOTE_HEIGHT_MM:
            break
        th = max(MIN_NOTE_HEIGHT_MM, th - 0.25)
    room = int((MAX_STRIP_SHARE * h - edge) / (NOTE_PITCH * th)) - STATUS_LINES - len(title)
    lines = lines[:max(0, room)]
    strip = edge + (STATUS_LINES + len(title) + len(lines)) * NOTE_PITCH * th
    return NoteStrip(th, chars, tuple(lines), strip, edge)


def usable_room(s: JigSettings, strip: NoteStrip) -> tuple[float, float]:
    """Width and height (mm) a part may take on a bed: inside the part gap all
    round and below the notes."""
    w, h = s.bed_mm
    return (w - 2 * s.part_gap_mm, h - strip.strip_mm - 2 * s.part_gap_mm)


def piece_parts(e: JigPiece, project: str, s: JigSettings,
                room: tuple[float, float] | None = None) -> tuple[list[Part], list[Finding]]:
    """The parts of one piece's jig, and findings about them. `room` is the
    width and height (mm) a part may take on a bed (default: the bed below
    its notes)."""
    if room is None:
        room = usable_room(s, note_strip(project, s))
    if e.forming.method == "rolled":  # a ring is rolled in passes, not bent on a jig
        return [], []
    if any(b.pitch_mm for b in e.path.bends):
        if len(e.path.bends) == 1:  # a coil: a pitch guide and a winding mandrel
            return helix_parts(e, s)
        return [], [Finding("jig-not-planar", "info",
                            "the piece's helical arms are wound on its support (a quadrifilar "
                            "helix's loop: its radials pass through the mast's holes); no jig is "
                            "drawn: bend the corners at the marks and twist the arms onto the "
                            "mast", e.name)]
    if not e.planar:
        return [], [Finding("jig-not-planar", "warning",
                            "the element is not flat, so no flat bending plate is drawn for it; "
                            "bend it with a hand bender from the tool marks", e.name)]
    return plate_parts(e, project, s, room)


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
    if small:
        # one finding for every hole the bit cannot cut, naming what to do once
        kinds = ", ".join(f"{role.replace('-hole', '')} ({dia:.2f} mm)"
                          for role, dia in sorted(small.items()))
        out.append(Finding("jig-hole-below-tool", "info",
                           f"holes smaller than the {2 * s.tool_radius_mm:.2f} mm router bit "
                           f"(as drawn: {kinds}): drill them"))
    return out


def _bed_notes(project: str, s: JigSettings, strip: NoteStrip, index: int,
               count: int) -> tuple[tuple[Text, ...], tuple[P, ...]]:
    w, h = s.bed_mm
    th, pitch = strip.height_mm, NOTE_PITCH * strip.height_mm
    x = strip.edge_mm
    ys = [h - strip.edge_mm - th - k * pitch for k in range(100)]
    status = tuple((x, y) for y in ys[:STATUS_LINES])
    lines = [*wrap_words(_title(project, s, index, count), strip.chars), *strip.lines]
    texts = tuple(Text((x, y), line, th) for y, line in zip(ys[STATUS_LINES:], lines))
    return texts, status


def layout_jig(project: str, pieces: Sequence[JigPiece], settings: JigSettings) -> JigLayout:
    """The jig of every piece, laid out on beds."""
    strip = note_strip(project, settings)
    room = usable_room(settings, strip)
    parts: list[Part] = []
    findings: list[Finding] = []
    for e in pieces:
        got, found = piece_parts(e, project, settings, room)
        parts.extend(got)
        findings.extend(found)
    if parts:
        parts.extend(calibration_parts())
    findings.extend(_router_findings(parts, settings))
    beds, found = pack(parts, settings, settings.bed_mm[1] - strip.strip_mm)
    findings.extend(found)
    notes = (_heading(project), *_common_notes(settings))
    placed = []
    for b in beds:
        texts, status = _bed_notes(project, settings, strip, b.index, len(beds))
        placed.append(Bed(b.index, b.width_mm, b.height_mm, b.parts, texts, status))
    return JigLayout(project, settings, tuple(placed), tuple(findings), notes,
                     strip.height_mm, strip.chars)


def all_shapes(layout: JigLayout) -> list[tuple[int, Item]]:
    """Every placed item with its bed index (for renderers and tests)."""
    out: list[tuple[int, Item]] = []
    for bed in layout.beds:
        for pl in bed.parts:
            out.extend((bed.index, it) for it in pl.items())
    return out

