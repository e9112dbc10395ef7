"""Time the jig stage: the bundled example, and long elements to show it scales linearly.

Run: .venv/bin/python benchmarks/jig_speed.py [RUNS]

Each run is a fresh subprocess that makes the plans first (not timed), lays
every jig out once to load shapely, then times the jig stage alone (`jig_for`,
the best of five) for:
  - the bundled example (club-uhf-folded-dipoles.toml);
  - a folded dipole of 2 m side (about 4 m of stock) and of 4 m side (about
    8 m of stock), whose plates are cut into sections on the default bed.
The floor, measured in the same run in a fresh subprocess: importing shapely
and building one polygon. Prints each run, the medians, each time against the
floor, the doubling ratio (8 m against 4 m: near 2 when the work grows
linearly with the length, near 4 when quadratically) and the target (a jig
for an 8 m element under 0.2 s, issue 16).
"""

from __future__ import annotations

import statistics
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"
TARGET_S = 0.2

FLOOR = """
import time
t0 = time.perf_counter()
import shapely
from shapely.geometry import Polygon
Polygon([(0, 0), (100, 0), (100, 50), (0, 50)]).buffer(1.0).area
print(time.perf_counter() - t0)
"""

JIG = f"""
import time
from fabplan.design.jig import JigSettings
from fabplan.design.read import load_design, parse_design
from fabplan.plan import jig_for, make_plan

DIPOLE = '''
[project]
name = "long folded dipole"
[stock]
diameter = "4 mm"
material = "cu-c11000-annealed"
[shop]
units = "mm"
[[element]]
name = "fd"
shape = "folded-dipole"
side = "SIDE"
spacing = "50 mm"
feed_gap = "12 mm"
'''
plans = [make_plan(load_design({str(EXAMPLE)!r})),
         make_plan(parse_design(DIPOLE.replace("SIDE", "2000 mm"))),
         make_plan(parse_design(DIPOLE.replace("SIDE", "4000 mm")))]
s = JigSettings()
out = []
for plan in plans:
    jig_for(plan, s)  # imports and caches
    times = []
    for _ in range(5):
        t0 = time.perf_counter()
        jig_for(plan, s)
        times.append(time.perf_counter() - t0)
    out.append(min(times))
stock = [sum(e.developed_length_mm for e in plan.elements)
         for plan in plans]
print(" ".join(f"{{t:.6f}}" for t in out), " ".join(f"{{m:.0f}}" for m in stock))
"""


def _run(code: str) -> list[float]:
    res = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT)
    if res.returncode:
        sys.exit(f"benchmark run failed: {res.stderr.strip()}")
    return [float(v) for v in res.stdout.split()]


def main(runs: int = 5) -> None:
    floors, example, four, eight = [], [], [], []
    stock: list[float] = []
    for i in range(runs):
        floors.append(_run(FLOOR)[0])
        got = _run(JIG)
        example.append(got[0])
        four.append(got[1])
        eight.append(got[2])
        stock = got[3:]
        print(f"run {i + 1}: floor {floors[-1]:.3f} s; jig of the example {example[-1]:.4f} s, "
              f"4 m element {four[-1]:.4f} s, 8 m element {eight[-1]:.4f} s")
    floor = statistics.median(floors)
    med = {name: statistics.median(ts) for name, ts in
           (("example", example), ("4 m", four), ("8 m", eight))}
    print(f"floor (import shapely, build one polygon): median {floor:.3f} s")
    print(f"stock lengths: example {stock[0]:.0f} mm, '4 m' {stock[1]:.0f} mm, "
          f"'8 m' {stock[2]:.0f} mm")
    for name, t in med.items():
        print(f"jig of the {name + ' element' if name != 'example' else 'example'}: "
              f"median {t:.4f} s = {t / floor:.2f} x floor")
    ratio = med["8 m"] / med["4 m"]
    print(f"doubling ratio (8 m / 4 m): {ratio:.2f} (2 = linear, 4 = quadratic)")
    verdict = "meets" if med["8 m"] < TARGET_S else "MISSES"
    print(f"8 m element: {med['8 m']:.4f} s ({verdict} the {TARGET_S:.1f} s target)")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 5)
