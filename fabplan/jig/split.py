"""Splitting a base plate that does not fit the machine's bed.

"sections": the plate is cut across its length into sections no longer than
the bed, at places clear of holes and labels, joined by splice plates on
alignment holes. "end-plates": only the two ends carrying the formers are
kept, set apart by a spacing bar drilled at the formers' centre distance.
"""

from __future__ import annotations

import math
from typing import Any

from ..design.jig import JigSettings
from ..errors import Finding
from ..units import format_drawing_length, wrap_words
from .parts import Board, hole, plate
from .records import JigPiece, Part
from .shapes import Arc, Circle, Item, Line, RefPoint, Text, clip_arc_x, clip_line_x

__all__ = ["split_plate", "choose_cuts"]


def split_plate(e: JigPiece, s: JigSettings, board: Board,
                rect: tuple[float, float, float, float],
                usable: tuple[float, float]) -> tuple[list[Part], list[Finding]]:
    from shapely.ops import unary_union

    g = s.kerf_mm / 2
    x0, y0, x1, y1 = rect
    h = y1 - y0 + 2 * g
    longest = max((u for u, other in ((usable[0], usable[1]), (usable[1], usable[0]))
                   if h <= other), default=None)
    if longest is None:
        return [], [Finding("jig-too-big", "error",
                            f"the base plate is {h:.0f} mm wide across the element, more than "
                            f"the {s.bed_mm[0]:.0f} x {s.bed_mm[1]:.0f} mm bed takes; use a larger "
                            "bed or a smaller margin", e.name)]
    holes = [i.shape for i in board.items if isinstance(i.shape, Circle)]
    bad = [(c.centre[0] - c.radius - 3, c.centre[0] + c.radius + 3) for c in holes]
    blocked = unary_union(board.keep_out)
    maxlen = longest - 2 * g
    if s.split == "end-plates":
        bad += [(b.bounds[0] - 2, b.bounds[2] + 2) for b in board.texts
                if not any(b is lb for lb in board.label_boxes)]
        return _end_plates(e, s, board, rect, bad, maxlen)
    bad += [(b.bounds[0] - 2, b.bounds[2] + 2) for b in board.texts]
    cuts = choose_cuts(x0, x1, bad, maxlen)
    if cuts is None:
        return [], [Finding("jig-too-big", "error", "found no place to cut the base plate "
                            "into sections that fit the bed; use a larger bed", e.name)]
    parts: list[Part] = []
    findings = [Finding("jig-plate-split", "info",
                        f"the base plate is {x1 - x0:.0f} mm long: cut in {len(cuts) + 1} "
                        "sections joined with splice plates on the alignment holes", e.name)]
    edges = [x0, *cuts, x1]
    joint_items: dict[int, list[Item]] = {i: [] for i in range(len(edges) - 1)}
    a = max(12.0, 2 * s.bolt_hole_mm)
    for j, xc in enumerate(cuts, 1):
        ys = _alignment_ys(xc, a, s.bolt_hole_mm / 2 + 3.0, rect, blocked, board)
        if not ys:
            findings.append(Finding("jig-alignment-holes", "warning",
                                    f"no room for alignment holes at the joint x = {xc:.0f} mm",
                                    e.name))
            continue
        for y in ys:
            joint_items[j - 1].append(hole((xc - a, y), s.bolt_hole_mm, g, f"align {j}"))
            joint_items[j].append(hole((xc + a, y), s.bolt_hole_mm, g, f"align {j}"))
        parts.append(_splice(e, s, j, a, ys))
    r = s.corner_radius_mm
    for i, (xa, xb) in enumerate(zip(edges, edges[1:])):
        radii = (r if i == 0 else 0.0, r if i == len(edges) - 2 else 0.0,
                 r if i == len(edges) - 2 else 0.0, r if i == 0 else 0.0)
        items = _clip_items(board.items, xa, xb) + joint_items[i]
        items.append(Item("engrave", Text((xa + 6.0 if i else xa + s.margin_mm, y1 - 8.0),
                                          f"section {i + 1} of {len(edges) - 1}",
                                          s.text_height_mm), "label"))
        parts.append(plate(e.name, "section", f"{e.name}: plate section {i + 1}", items,
                            (xa, y0, xb, y1), s, radii))
    return parts, findings


def choose_cuts(x0: float, x1: float, bad: list[tuple[float, float]],
                 maxlen: float) -> list[float] | None:
    """Cut positions between x0 and x1, clear of the `bad` intervals, leaving
    no section longer than `maxlen` (mm); as even as the obstacles allow."""
    length = x1 - x0
    merged: list[list[float]] = []
    for lo, hi in sorted(bad):
        if merged and lo <= merged[-1][1]:
            merged[-1][1] = max(merged[-1][1], hi)
        else:
            merged.append([lo, hi])

    def allowed(x: float) -> bool:
        return all(not (lo < x < hi) for lo, hi in merged)

    n0 = max(2, math.ceil(length / maxlen))
    for n in range(n0, n0 + 20):
        cuts: list[float] = []
        prev = x0
        ok = True
        for i in range(1, n):
            target = x0 + i * length / n
            options = [target] if allowed(target) else []
            for lo, hi in merged:
                if lo < target < hi:
                    options = [lo, hi]
            options = [x for x in options if prev + 1.0 < x <= prev + maxlen and x < x1 - 1.0]
            if not options:
                ok = False
                break
            x = min(options, key=lambda v: abs(v - target))
            cuts.append(x)
            prev = x
        if ok and x1 - prev <= maxlen:
            return cuts
    return None


def _alignment_ys(xc: float, a: float, rr: float, rect: tuple[float, float, float, float],
                  blocked: Any, board: Board) -> list[float]:
    """Heights (1 mm steps) where a hole of radius `rr` fits on both sides of
    the joint at `xc`, clear of everything on the plate; the lowest and highest."""
    import numpy as np
    import shapely
    from shapely.ops import unary_union

    x0, y0, x1, y1 = rect
    taken = board.cache.get("taken")
    if taken is None:
        taken = board.cache["taken"] = unary_union([blocked, *board.texts])
        shapely.prepare(taken)
    ys = np.arange(y0 + rr + 3.0, y1 - rr - 3.0 + 1e-9, 1.0)
    hit = np.zeros(len(ys), dtype=bool)
    for x in (xc - a, xc + a):
        discs = shapely.buffer(shapely.points(np.full(len(ys), x), ys), rr, quad_segs=8)
        hit |= shapely.intersects(discs, taken)
    free = [float(y) for y in ys[~hit]]
    if not free:
        return []
    return [free[0], free[-1]] if free[-1] - free[0] > 4 * rr else [free[0]]


def _splice(e: JigPiece, s: JigSettings, j: int, a: float, ys: list[float]) -> Part:
    g = s.kerf_mm / 2
    pad = s.bolt_hole_mm / 2 + 8.0
    rect = (-a - pad, min(ys) - pad, a + pad, max(ys) + pad)
    items = [hole((sx, y), s.bolt_hole_mm, g, f"align {j}") for y in ys for sx in (-a, a)]
    items.append(Item("engrave", Text((-a + pad / 2 - 4, (min(ys) + max(ys)) / 2 - 1.5),
                                      f"splice {j}", 3.0), "label"))
    return plate(e.name, "splice", f"{e.name}: splice plate {j}", items, rect, s,
                  (min(4.0, pad / 2),) * 4)


def _clip_items(items: list[Item], xa: float, xb: float) -> list[Item]:
    out: list[Item] = []
    for it in items:
        sh = it.shape
        if isinstance(sh, Line):
            c = clip_line_x(sh, xa, xb)
            if c is not None:
                out.append(Item(it.op, c, it.role))
        elif isinstance(sh, Arc):
            out.extend(Item(it.op, a, it.role) for a in clip_arc_x(sh, xa, xb))
        elif isinstance(sh, Circle):
            if xa <= sh.centre[0] < xb:
                out.append(it)
            elif it.role.startswith("former-outline"):
                out.extend(Item(it.op, a, it.role) for a in
                           clip_arc_x(Arc(sh.centre, sh.radius, 0.0, 360.0), xa, xb))
        elif isinstance(sh, (Text, RefPoint)):
            if xa <= sh.at[0] < xb:
                out.append(it)
    return out


def _end_plates(e: JigPiece, s: JigSettings, board: Board,
                rect: tuple[float, float, float, float], bad: list[tuple[float, float]],
                maxlen: float) -> tuple[list[Part], list[Finding]]:
    formers = sorted(e.forming.formers, key=lambda fm: fm.centre_mm[0])
    x0, y0, x1, y1 = rect
    if len(formers) < 2:
        return [], [Finding("jig-too-big", "error", "the plate does not fit the bed and has "
                            "fewer than two formers to make end plates from", e.name)]
    gaps = [b.centre_mm[0] - a.centre_mm[0] for a, b in zip(formers, formers[1:])]
    k = max(range(len(gaps)), key=lambda i: gaps[i])
    left, right = formers[:k + 1], formers[k + 1:]
    reach = s.margin_mm + s.pin_diameter_mm
    cut_a = max(fm.centre_mm[0] + fm.radius_mm for fm in left) + reach
    cut_b = min(fm.centre_mm[0] - fm.radius_mm for fm in right) - reach
    for lo, hi in sorted(bad):
        if lo < cut_a < hi:
            cut_a = hi
    for lo, hi in sorted(bad, reverse=True):
        if lo < cut_b < hi:
            cut_b = lo
    if cut_a - x0 > maxlen or x1 - cut_b > maxlen or cut_a >= cut_b:
        return [], [Finding("jig-too-big", "error", "the end plates do not fit the bed either; "
                            "use split = \"sections\" or a larger bed", e.name)]
    fa, fb = left[-1], right[0]
    idx = {fm.label: i for i, fm in enumerate(e.forming.formers)}
    ia, ib = sorted((idx[fa.label], idx[fb.label]))
    if ib == ia + 1 and ia < len(e.forming.former_spacing_mm):
        dist = e.forming.former_spacing_mm[ia]
    else:
        dist = math.dist(fa.centre_mm, fb.centre_mm)
    r = s.corner_radius_mm
    parts = []
    note = (f"set the end plates with formers {fa.label} and {fb.label} "
            f"{format_drawing_length(dist, s.units)} apart, centre to centre")
    h = s.text_height_mm
    for i, (xa, xb, radii, group) in enumerate(((x0, cut_a, (r, 0.0, 0.0, r), left),
                                                (cut_b, x1, (0.0, r, r, 0.0), right)), 1):
        items = [it for it in _clip_items(board.items, xa, xb) if it.role != "label"]
        bends = {b for fm in group for b in fm.bend_indices}
        lines = [f"{e.name}: end plate {i} of 2", note]
        lines += [f"former {fm.label}: dia {format_drawing_length(2 * fm.radius_mm, s.units)}"
                  for fm in group]
        lines += [f"bend {b.index}: bend to {b.overbend_deg:.1f} deg" for b in e.forming.bends
                  if b.index in bends]
        width = max(12, int((xb - xa - 2 * s.margin_mm) / (0.62 * h)))
        y = board.label_at[1]
        for text in (w for line in lines for w in wrap_words(line, width)):
            if y < y0 + s.margin_mm * 0.75:
                break  # the rest is in the notes
            items.append(Item("engrave", Text((xa + s.margin_mm, y), text, h), "label"))
            y -= 1.6 * h
        parts.append(plate(e.name, "end-plate", f"{e.name}: end plate {i}", items,
                            (xa, y0, xb, y1), s, radii))
    findings = [Finding("jig-end-plates", "info", note + " (the spacing bar sets it)", e.name)]
    g = s.kerf_mm / 2
    pad = s.bolt_hole_mm / 2 + 10.0
    bar_rect = (-pad, -pad, dist + pad, pad)
    items = [hole((0.0, 0.0), s.bolt_hole_mm, g, f"bolt-hole {fa.label}"),
             hole((dist, 0.0), s.bolt_hole_mm, g, f"bolt-hole {fb.label}"),
             Item("engrave", Text((pad, -1.5), f"spacing bar {fa.label}-{fb.label} "
                                  f"{format_drawing_length(dist, s.units)}", 3.0), "label")]
    bar = plate(e.name, "spacing-bar", f"{e.name}: spacing bar", items, bar_rect, s,
                 (min(5.0, pad),) * 4)
    if bar.bounds()[2] - bar.bounds()[0] > max(s.bed_mm) - 2 * s.part_gap_mm:
        findings.append(Finding("jig-bar-too-long", "warning",
                                f"the spacing bar is longer than the bed: drill two holes "
                                f"{format_drawing_length(dist, s.units)} apart in a straight "
                                "batten instead",
                                e.name))
    else:
        parts.append(bar)
    return parts, findings
