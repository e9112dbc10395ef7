"""Time `fabplan build` on the bundled example, wall clock, imports included.

Run: .venv/bin/python benchmarks/build_speed.py [RUNS]

Each run is a fresh `python -m fabplan build examples/club-uhf-folded-dipoles.toml
-o TMP --force` in a subprocess, so Python's start-up and every import count.
Prints each run, the median and the target (under 2 s). Also prints, in one
process after the imports, the time of the build sheet and of the template
alone, and the size of every file written.
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
TARGET_S = 2.0


def main(runs: int = 5) -> None:
    times = []
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "build"
        for i in range(runs):
            t0 = time.perf_counter()
            proc = subprocess.run([sys.executable, "-m", "fabplan", "build", str(EXAMPLE), "-o",
                                   str(out), "--force"], capture_output=True, text=True,
                                  cwd=ROOT)
            dt = time.perf_counter() - t0
            if proc.returncode not in (0, 1):
                sys.exit(f"build failed: {proc.stderr.strip()}")
            times.append(dt)
            print(f"run {i + 1}: {dt:.2f} s wall")
        for p in sorted(out.iterdir()):
            print(f"  {p.name:40} {p.stat().st_size / 1024:8.1f} KiB")
    med = statistics.median(times)
    print(f"fabplan build, median of {runs}: {med:.2f} s wall "
          f"(target under {TARGET_S:g} s: {'met' if med < TARGET_S else 'NOT met'})")

    from fabplan.design.read import load_design
    from fabplan.plan import make_plan
    from fabplan.render.fullscale import template_pdf
    from fabplan.render.sheet import sheet_pdf

    t0 = time.perf_counter()
    plan = make_plan(load_design(EXAMPLE))
    t1 = time.perf_counter()
    sheet_pdf(plan, "a4")  # first call loads reportlab
    t2 = time.perf_counter()
    sheet_pdf(plan, "a4")
    t3 = time.perf_counter()
    template_pdf(plan, "a4")
    t4 = time.perf_counter()
    print(f"in one process: plan {t1 - t0:.2f} s (imports included), build sheet "
          f"{t2 - t1:.2f} s first / {t3 - t2:.2f} s again, template {t4 - t3:.2f} s")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 5)
