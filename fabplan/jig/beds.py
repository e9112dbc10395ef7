"""Laying jig parts out on machine beds: first-fit shelves, largest first.

Beds are capped (`MAX_BEDS`): a layout that would need more is refused with a
finding before packing, judged by the parts' area.
"""

from __future__ import annotations

from ..design.jig import JigSettings
from ..errors import Finding
from .records import Bed, Part, Placed

__all__ = ["pack", "MAX_BEDS"]

MAX_BEDS = 50  # beds one layout may fill


def pack(parts: list[Part], s: JigSettings,
         height_mm: float | None = None) -> tuple[list[Bed], list[Finding]]:
    """First-fit shelf packing: largest parts first; each goes on the first
    shelf of the first bed with room, else on a new shelf, else on a new bed.
    A part turns 90 degrees when only that way fits, or to lie along a shelf.
    `height_mm` is the height of the bed the parts may use (from its bottom
    edge; default the whole bed)."""
    W, H = s.bed_mm[0], s.bed_mm[1] if height_mm is None else height_mm
    gap = s.part_gap_mm
    findings: list[Finding] = []
    area = sum((p.bounds()[2] - p.bounds()[0] + gap) * (p.bounds()[3] - p.bounds()[1] + gap)
               for p in parts)
    least = area / max((W - gap) * (H - gap), 1.0)
    if least > MAX_BEDS:
        return [], [Finding("jig-too-many-beds", "error",
                            f"the jig's parts would fill at least {least:.0f} beds of "
                            f"{s.bed_mm[0]:.0f} x {s.bed_mm[1]:.0f} mm, more than the "
                            f"{MAX_BEDS} one layout may take; use a larger bed, or "
                            "split = \"end-plates\" for long elements")]
    beds: list[list[Placed]] = []
    shelves: list[list[list[float]]] = []  # per bed: [y, height, next x]

    def size(p: Part, rot: bool) -> tuple[float, float]:
        x0, y0, x1, y1 = p.bounds()
        return (y1 - y0, x1 - x0) if rot else (x1 - x0, y1 - y0)

    def key(p: Part) -> tuple[float, float, str]:
        w, h = size(p, False)
        return (-min(w, h), -max(w, h), p.name)

    def spot(w: float, h: float) -> tuple[int, list[float]] | None:
        for b, bed_shelves in enumerate(shelves):
            for sh in bed_shelves:
                if h <= sh[1] + 1e-9 and sh[2] + w <= W - gap + 1e-9:
                    return b, sh
            top = bed_shelves[-1][0] + bed_shelves[-1][1] + gap if bed_shelves else gap
            if top + h <= H - gap + 1e-9 and gap + w <= W - gap + 1e-9:
                sh = [top, h, gap]
                bed_shelves.append(sh)
                return b, sh
        return None

    for p in sorted(parts, key=key):
        options = [rot for rot in (False, True)
                   if size(p, rot)[0] <= W - 2 * gap + 1e-9 and size(p, rot)[1] <= H - 2 * gap
                   + 1e-9]
        if not options:
            w, h = size(p, False)
            findings.append(Finding("jig-too-big", "error",
                                    f"{p.name} ({w:.0f} x {h:.0f} mm) does not fit the "
                                    f"{s.bed_mm[0]:.0f} x {s.bed_mm[1]:.0f} mm bed ("
                                    f"{W - 2 * gap:.0f} x {H - 2 * gap:.0f} mm inside the "
                                    "part gap and below the notes); use a larger bed",
                                    p.element))
            continue
        # prefer lying flat along the shelf (the shorter side up)
        options.sort(key=lambda rot: size(p, rot)[1])
        found = None
        for rot in options:
            found = spot(*size(p, rot))
            if found is not None:
                break
        if found is None:
            if len(beds) >= MAX_BEDS:
                findings.append(Finding("jig-too-many-beds", "error",
                                        f"the jig's parts need more than {MAX_BEDS} beds of "
                                        f"{s.bed_mm[0]:.0f} x {s.bed_mm[1]:.0f} mm; use a "
                                        "larger bed", p.element))
                break
            beds.append([])
            shelves.append([])
            rot = options[0]
            found = spot(*size(p, rot))
        if found is None:  # cannot happen: the part fits an empty bed
            continue
        b, sh = found
        w, h = size(p, rot)
        x0, y0, x1, y1 = p.bounds()
        x, y = sh[2], sh[0]
        # rotated bounds run from (-y1, x0) to (-y0, x1)
        dx, dy = (x + y1, y - x0) if rot else (x - x0, y - y0)
        beds[b].append(Placed(p, dx, dy, rot))
        sh[2] = x + w + gap
    out = [Bed(i, s.bed_mm[0], s.bed_mm[1], tuple(b)) for i, b in enumerate(beds, 1) if b]
    for bed in out:
        shapes = [pl.outline() for pl in bed.parts]
        for i in range(len(shapes)):
            for j in range(i + 1, len(shapes)):
                if shapes[i].intersects(shapes[j]):
                    findings.append(Finding("jig-overlap", "error",
                                            f"bed {bed.index}: {bed.parts[i].part.name} overlaps "
                                            f"{bed.parts[j].part.name}"))
    return out, findings
