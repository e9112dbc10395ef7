"""Tiling a 1:1 layout over office paper: how many pages, where the alignment
crosses go, and which tiles join up. Millimetres."""

from __future__ import annotations

import math

from .papers import paper_size

__all__ = ["MARGIN_MM", "FOOTER_MM", "OVERLAP_MM", "CROSS_MM", "content_area", "tile_count",
           "tile_grid", "crosses", "row_name", "connected"]

MARGIN_MM = 10.0  # unprintable edge most office printers leave, and some
FOOTER_MM = 26.0  # band for the tile label, the calibration bars and the instruction
OVERLAP_MM = 15.0  # tiles overlap by this much; alignment crosses sit in the overlap
CROSS_MM = 10.0  # arm length of an alignment cross


def content_area(paper_w: float, paper_h: float) -> tuple[float, float]:
    """The drawable width and height (mm) of a tile page, inside the margins and footer."""
    return paper_w - 2 * MARGIN_MM, paper_h - 2 * MARGIN_MM - FOOTER_MM


def tile_count(length_mm: float, room_mm: float, overlap_mm: float = OVERLAP_MM) -> int:
    """How many tiles of `room_mm` overlapping by `overlap_mm` cover `length_mm`."""
    if length_mm <= room_mm:
        return 1
    return math.ceil((length_mm - overlap_mm) / (room_mm - overlap_mm) - 1e-9)


def tile_grid(width_mm: float, height_mm: float, paper: str,
              overlap_mm: float = OVERLAP_MM) -> tuple[float, float, int, int]:
    """Page (w, h) in mm, columns and rows for a layout; portrait or landscape,
    whichever needs fewer pages (portrait on a tie)."""
    pw, ph = paper_size(paper)
    if ph is None:
        raise ValueError(f"{paper} is a roll: it is not tiled")
    best: tuple[float, float, int, int] | None = None
    for w, h in ((pw, ph), (ph, pw)):
        cw, ch = content_area(w, h)
        cols, rows = tile_count(width_mm, cw, overlap_mm), tile_count(height_mm, ch, overlap_mm)
        if best is None or cols * rows < best[2] * best[3]:
            best = (w, h, cols, rows)
    return best  # type: ignore[return-value]  # two orientations were tried


def crosses(cols: int, rows: int, cw: float, ch: float,
             overlap: float) -> list[tuple[int, float, float]]:
    """Numbered alignment crosses in the middle of each overlap band."""
    sx, sy = cw - overlap, ch - overlap
    xs_band = [c * sx + overlap / 2 for c in range(1, cols)]
    ys_band = [r * sy + overlap / 2 for r in range(1, rows)]
    xs_mid = [c * sx + cw / 2 for c in range(cols)]
    ys_mid = [r * sy + ch / 2 for r in range(rows)]
    pts = sorted({(round(x, 6), round(y, 6)) for x in xs_band for y in ys_band + ys_mid}
                 | {(round(x, 6), round(y, 6)) for x in xs_mid for y in ys_band},
                 key=lambda p: (-p[1], p[0]))
    return [(i + 1, x, y) for i, (x, y) in enumerate(pts)]


def row_name(r: int) -> str:
    name = ""
    r += 1
    while r:
        r, rem = divmod(r - 1, 26)
        name = chr(65 + rem) + name
    return name


def connected(tiles: list[tuple[int, int]]) -> bool:
    """Whether the tiles join up through shared alignment crosses (edge or
    corner neighbours), so that they can be laid out from any one of them."""
    left = set(tiles)
    todo = [tiles[0]]
    left.discard(tiles[0])
    while todo:
        r, c = todo.pop()
        for dr in (-1, 0, 1):
            for dc in (-1, 0, 1):
                t = (r + dr, c + dc)
                if t in left:
                    left.discard(t)
                    todo.append(t)
    return not left
