"""Time the forming stage (all forming figures) for a design of 20 bends.

Run: .venv/bin/python benchmarks/forming_speed.py

Prints the time of the forming stage alone (springback, limits, jig formers
and marks, bend order) on a plan whose core figures are already made, for a
flat 20-bend custom element with 20 different radii (former method) and the
same element in a hand bender. The first run includes the imports and the
per-section cache fill; the figure reported is the median of fresh runs with
the caches cleared.
"""

from __future__ import annotations

import statistics
import time

from fabplan.design.forming import FormingSettings
from fabplan.design.read import parse_design
from fabplan.forming.springback import section_model
from fabplan.forming.stage import form_piece, stock_model
from fabplan.plan import core_element

ROWS = "\n".join(
    f'  {{ straight = "{40 + 3 * i} mm", angle = {30 + (i * 7) % 60}, '
    f'radius = "{20 + 2.5 * i} mm", rotation = {180 if i % 2 else 0} }},'
    for i in range(20))

DESIGN = f"""
[project]
name = "20-bend benchmark"
[stock]
tube = {{ od = "3/8 in", wall = "0.032 in" }}
material = "cu-c12200-annealed"
[shop]
units = "mm"
trim = "60 mm"
{{forming}}
[[element]]
name = "zigzag"
shape = "custom"
bends = [
{ROWS}
]
tail = "60 mm"
"""

BENDER = """
[forming]
method = "bender"
[forming.bender]
radius = "15/16 in"
grip = "40 mm"
"""


def forming_stage(design, piece):
    """The forming stage on one piece: the stock's model, then the piece's figures."""
    settings = design.forming or FormingSettings()
    return form_piece(piece, "zigzag", stock_model(design.stock, settings), settings)


def main() -> None:
    for label, extra in (("former", ""), ("bender", BENDER)):
        design = parse_design(DESIGN.replace("{forming}", extra), "<benchmark>")
        piece = core_element(design, design.elements[0])[1][0]
        forming_stage(design, piece)  # imports, first fill
        times = []
        for _ in range(15):
            section_model.cache_clear()
            t0 = time.perf_counter()
            out, _ = forming_stage(design, piece)
            times.append(time.perf_counter() - t0)
        bends = len(out.bends)
        print(f"forming stage, {label} method, {bends} bends: median "
              f"{1000 * statistics.median(times):.1f} ms, best {1000 * min(times):.1f} ms "
              f"(target: well under 50 ms)")


if __name__ == "__main__":
    main()
