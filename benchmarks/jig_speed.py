"""Time the jig drawings of the bundled example, imports included.

Run: .venv/bin/python benchmarks/jig_speed.py [RUNS]

1. `python -m fabplan jig examples/club-uhf-folded-dipoles.toml -o TMP --force`
   in a fresh subprocess per run: start-up, every import, the whole plan (all
   stages) and the drawings.
2. In a fresh subprocess per run, given the plan already made: importing
   shapely and ezdxf, the layout and the DXF and SVG files (the jig's own share;
   target under 1 s).
Prints each run, the medians, the target and the size of each file.
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"
TARGET_S = 1.0

JIG_ONLY = f"""
import time
from fabplan.design.read import load_design
from fabplan.plan import make_plan
plan = make_plan(load_design({str(EXAMPLE)!r}))
t0 = time.perf_counter()
from fabplan.design.jig import JigSettings
from fabplan.plan import jig_for
from fabplan.render.jig import jig_files
import dataclasses
plan = dataclasses.replace(plan, jig=jig_for(plan, plan.design.jig or JigSettings()))
files = jig_files(plan)
print(time.perf_counter() - t0, sum(len(b) for b in files.values()))
"""


def main(runs: int = 5) -> None:
    cli, own = [], []
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "jig"
        for i in range(runs):
            t0 = time.perf_counter()
            proc = subprocess.run([sys.executable, "-m", "fabplan", "jig", str(EXAMPLE), "-o",
                                   str(out), "--force"], capture_output=True, text=True,
                                  cwd=ROOT)
            dt = time.perf_counter() - t0
            if proc.returncode not in (0, 1):
                sys.exit(f"jig failed: {proc.stderr.strip()}")
            cli.append(dt)
            res = subprocess.run([sys.executable, "-c", JIG_ONLY], capture_output=True,
                                 text=True, cwd=ROOT, check=True).stdout.split()
            own.append(float(res[0]))
            print(f"run {i + 1}: fabplan jig {dt:.2f} s wall; jig share (imports of shapely "
                  f"and ezdxf, layout, DXF + SVG) {own[-1]:.3f} s")
        for p in sorted(out.iterdir()):
            print(f"  {p.name}: {p.stat().st_size} bytes")
    print(f"median fabplan jig (whole plan included): {statistics.median(cli):.2f} s")
    med = statistics.median(own)
    verdict = "meets" if med < TARGET_S else "MISSES"
    print(f"median jig share: {med:.3f} s ({verdict} the {TARGET_S:.0f} s target)")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 5)
