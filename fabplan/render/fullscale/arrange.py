"""How the 1:1 layout goes onto office paper: which way up, whether a long
marking strip is folded into rows, where each block and label goes, which
tiles are printed and why (mm).

The choice. For each orientation (portrait, landscape) the layout is tried
with every strip in one row, and folded into rows that fit the width the
other drawings already need (that width and up to three tile columns more).
Each try is stacked with its strip rows and headings clear of the seams
between tile rows, and its printed tiles counted by the rule in tiling.py.
The fewest pages win, portrait on a tie; but every strip stays in one row
unless folding saves at least three pages on the best single-row layout (a
strip in one row is quicker and surer to mark from; a fold must pay for the
joins it adds).

Reasons. Each printed tile says what it carries ("marks M3-M5; bend 2"),
or, for a tile printed only to join others, which alignment crosses it
carries for that.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from ...plan import Plan
from .layout import (
    END_RUN_MM,
    GUTTER_MM,
    Block,
    Item,
    PieceBlocks,
    Placement,
    Source,
    item_box,
    materialize,
    piece_blocks,
    stack,
)
from .papers import paper_size
from .tiling import (
    CROSS_MM,
    OVERLAP_MM,
    SEAM_MARGIN_MM,
    Grid,
    Reason,
    Tile,
    content_area,
    crosses,
    joining,
    keep_tiles,
    place_labels,
    tile_count,
)
from .tiling import buckets as make_buckets

__all__ = ["Tiling", "tile_layout", "reason_text", "FOLD_SAVES_PAGES"]

FOLD_SAVES_PAGES = 3
NOTE_MAX_MM = 250.0  # longest line of a note or heading
LABEL_SPILL_MM = 6.0  # labels at a row's ends may spread past it by about this much
MIN_ROW_MM = 100.0  # a strip is not folded into rows shorter than this


@dataclass
class Tiling:
    """The layout on its tiles: items in grid coordinates (mm, crosses
    included), the printed tiles row by row from the top, what each carries,
    and the items to draw on each."""

    grid: Grid
    items: list[Item]
    printed: list[Tile]
    reasons: dict[Tile, str]
    buckets: dict[Tile, list[int]]
    crosses: list[tuple[int, float, float]]
    strip_rows: int  # the most rows a strip is folded into (1: none folded)


def _width(b: Block) -> float:
    return b.box[2] - b.box[0]


def _content_boxes(b: Block) -> list[tuple[float, float, float, float]]:
    return [item_box(it) for it in b.items if it.why]


def _quick_pages(grid: Grid, placements: list[Placement], ox: float,
                 boxes: dict[int, list[tuple[float, float, float, float]]]) -> int:
    """Tiles a try would print, counting each item on every tile its box meets."""
    kept: set[Tile] = set()
    for b, dx, dy in placements:
        for x0, y0, x1, y1 in boxes[id(b)]:
            kept.update(grid.owners((x0 + dx + ox, y0 + dy, x1 + dx + ox, y1 + dy)))
    return len(kept) + len(joining(grid, kept))


def _grid(w: float, h: float, width: float, height: float, overlap: float) -> Grid:
    cw, ch = content_area(w, h)
    return Grid(w, h, tile_count(width, cw, overlap), tile_count(height, ch, overlap), overlap)


def tile_layout(plan: Plan, paper: str, overlap: float = OVERLAP_MM) -> Tiling:
    """The plan's 1:1 layout tiled over `paper` (see the module's note)."""
    pw, ph = paper_size(paper)
    if ph is None:
        raise ValueError(f"{paper} is a roll: it is not tiled")
    source = Source(plan)
    tries: list[tuple[int, int, int, float, float, float, list[PieceBlocks]]] = []
    boxes: dict[int, list[tuple[float, float, float, float]]] = {}  # by id of a live block
    for orient, (w, h) in enumerate(((pw, ph), (ph, pw))):
        cw, ch = content_area(w, h)
        sx, sy = cw - overlap, ch - overlap
        wrap = min(NOTE_MAX_MM, sx - 10)
        one_row = piece_blocks(source, None, wrap)
        options: list[tuple[float | None, list[PieceBlocks]]] = [(None, one_row)]
        others = max(max(_width(pb.bent), _width(pb.heading)) for pb in one_row)
        strips = max(_width(b) for pb in one_row for b in pb.strip)
        if strips > others:
            k_other = tile_count(others + 2 * GUTTER_MM, cw, overlap)
            k_strip = tile_count(strips + 2 * GUTTER_MM, cw, overlap)
            for k in range(k_other, min(k_strip, k_other + 4)):
                row_mm = k * sx + overlap - 2 * GUTTER_MM - 2 * END_RUN_MM - LABEL_SPILL_MM
                if row_mm >= MIN_ROW_MM:
                    options.append((row_mm, piece_blocks(source, row_mm, wrap)))
        counts = []
        for _, blocks in options:
            placements, width, height = stack(blocks, sy, SEAM_MARGIN_MM)
            grid = _grid(w, h, width, height, overlap)
            for b, _, _ in placements:
                if id(b) not in boxes:
                    boxes[id(b)] = _content_boxes(b)
            pages = _quick_pages(grid, placements, (grid.width - width) / 2, boxes)
            folds = max(len(pb.strip) for pb in blocks)
            counts.append((pages, folds, blocks))
        tries += [(pages, orient, folds, w, h, sy, blocks) for pages, folds, blocks in counts]
    # one row unless folding saves FOLD_SAVES_PAGES pages on the best single row
    unfolded = min((t for t in tries if t[2] == 1), key=lambda t: (t[0], t[1]))
    folded = min((t for t in tries if t[2] > 1), key=lambda t: (t[0], t[2], t[1]),
                 default=None)
    pick = unfolded
    if folded is not None and unfolded[0] - folded[0] >= FOLD_SAVES_PAGES:
        pick = folded
    _, _, folds, w, h, sy, blocks = pick

    placements, width, height = stack(blocks, sy, SEAM_MARGIN_MM)
    grid = _grid(w, h, width, height, overlap)
    slack = grid.height - height
    if slack > 1.0:  # sit the drawing in the middle of the grid if it still fits
        again, width2, height2 = stack(blocks, sy, SEAM_MARGIN_MM, GUTTER_MM + slack / 2)
        if height2 <= grid.height:
            placements, height = again, height2
    items = materialize(placements, (grid.width - width) / 2, 0.0)
    alignment = crosses(grid.cols, grid.rows, grid.cw, grid.ch, overlap)
    marks = [[Item("line", ((x - CROSS_MM / 2, y), (x + CROSS_MM / 2, y)), width=0.4),
              Item("line", ((x, y - CROSS_MM / 2), (x, y + CROSS_MM / 2)), width=0.4),
              _cross_number(n, x, y)] for n, x, y in alignment]
    place_labels(grid, items, [_box_of(m) for m in marks])
    kept = keep_tiles(grid, items)
    for m in marks:
        items += m
    printed = sorted(kept)
    single = len({pb.name for pb in blocks}) == 1
    reasons = {t: reason_text(kept[t], single) for t in printed}
    for t in printed:
        if kept[t] == [("", "join")]:
            box = grid.box(*t)
            shared = [n for n, x, y in alignment
                      if box[0] < x < box[2] and box[1] < y < box[3]
                      and any(u != t and u in kept and grid.box(*u)[0] < x < grid.box(*u)[2]
                              and grid.box(*u)[1] < y < grid.box(*u)[3] for u in kept)]
            reasons[t] = (f"crosses {', '.join(map(str, shared))}: joins its neighbours"
                          if shared else "joins its neighbours")
    return Tiling(grid, items, printed, reasons, make_buckets(grid, items, printed), alignment,
                  folds)


def _box_of(items: list[Item]) -> tuple[float, float, float, float]:
    boxes = [item_box(it) for it in items]
    return (min(b[0] for b in boxes) - 0.5, min(b[1] for b in boxes) - 0.5,
            max(b[2] for b in boxes) + 0.5, max(b[3] for b in boxes) + 0.5)


def _cross_number(n: int, x: float, y: float) -> Item:
    from .layout import text

    size = 8.0
    it = text(x + 1.2, y + 1.2, str(n), size, bold=True)
    while it.tw > OVERLAP_MM / 2 - 1.6 and size > 4.5:  # keep it inside the overlap band
        size -= 0.5
        it = text(x + 1.2, y + 1.2, str(n), size, bold=True)
    return it


_ORDER = ("marks", "end A", "bends", "formers", "turns", "strip joins", "bender marks",
          "drawing", "title", "notes", "line end")


def _ranges(prefix: str, numbers: list[int]) -> str:
    nums = sorted(set(numbers))
    parts = []
    i = 0
    while i < len(nums):
        j = i
        while j + 1 < len(nums) and nums[j + 1] == nums[j] + 1:
            j += 1
        parts.append(f"{prefix}{nums[i]}" + (f"-{prefix}{nums[j]}" if j > i else ""))
        i = j + 1
    return ", ".join(parts)


def reason_text(reasons: list[Reason], single_owner: bool) -> str:
    """What a tile carries, in words: `marks M3-M5; bend 2; former F1`,
    each piece's own list after its name when the template holds several."""
    owners: dict[str, dict[str, list[int]]] = {}
    for owner, why in reasons:
        kinds = owners.setdefault(owner, {})
        for w in why.split(", "):
            m = re.fullmatch(r"(M|F|J|T)(\d+)", w)
            if m:
                kind = {"M": "marks", "F": "formers", "J": "strip joins",
                        "T": "bender marks"}[m.group(1)]
                kinds.setdefault(kind, []).append(int(m.group(2)))
                continue
            m = re.fullmatch(r"F(\d+)-F(\d+)", w)
            if m:
                kinds.setdefault("formers", []).extend(int(g) for g in m.groups())
                continue
            m = re.fullmatch(r"(bend|turn) (\d+)", w)
            if m:
                kinds.setdefault(m.group(1) + "s", []).append(int(m.group(2)))
                continue
            kinds.setdefault(w if w in _ORDER else "drawing", [])
    out = []
    for owner, kinds in owners.items():
        words = []
        for kind in _ORDER:
            if kind not in kinds:
                continue
            nums = kinds[kind]
            if not nums:
                words.append(kind)
                continue
            one = len(set(nums)) == 1
            name = {"marks": "mark" if one else "marks", "bends": "bend" if one else "bends",
                    "formers": "former" if one else "formers",
                    "turns": "turn" if one else "turns",
                    "strip joins": "strip join" if one else "strip joins",
                    "bender marks": "bender mark" if one else "bender marks"}[kind]
            prefix = {"marks": "M", "formers": "F", "strip joins": "J",
                      "bender marks": "T"}.get(kind, "")
            words.append(f"{name} {_ranges(prefix, nums)}")
        text = "; ".join(words)
        out.append(text if single_owner or not owner else f"{owner}: {text}")
    return "; ".join(out)
