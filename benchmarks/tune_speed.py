"""How long `fabplan tune` takes on the bundled folded dipole (target: under 2 s).

Prints figures; not a test. Run from the project's root:
    .venv/bin/python benchmarks/tune_speed.py
"""

from __future__ import annotations

import dataclasses
import os
import resource
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"


def main() -> None:
    from fabplan import tuning
    from fabplan.design.read import load_design
    from fabplan.plan import make_plan

    print(f"load average (1 min): {os.getloadavg()[0]:.2f} on {os.cpu_count()} CPUs; wall times "
          "stretch on a busy machine, CPU times much less")
    t0 = time.perf_counter()
    design = load_design(EXAMPLE)
    settings = design.electrical
    if settings is None:
        sys.exit(f"{EXAMPLE} has no [electrical] table")
    plan = make_plan(dataclasses.replace(design, electrical=None))
    element = tuning.fed_element(plan, None)
    t1, c1 = time.perf_counter(), time.process_time()
    result = tuning.tune(plan, element, settings, settings.target_hz)
    t2, c2 = time.perf_counter(), time.process_time()
    print(f"element: {element.name}; {result.key} {result.old_value_mm:.2f} -> "
          f"{result.new_value_mm:.2f} mm; {result.old_hz / 1e6:.3f} -> "
          f"{result.new_hz / 1e6:.4f} MHz")
    print(f"secant steps: {result.iterations}; models built: {result.models_built}")
    print(f"load + plan (no electrical): {t1 - t0:.2f} s; tuning: {t2 - t1:.2f} s wall, "
          f"{c2 - c1:.2f} s CPU")

    for args in (["tune", str(EXAMPLE)], ["--help"]):
        before = resource.getrusage(resource.RUSAGE_CHILDREN)
        t = time.perf_counter()
        proc = subprocess.run([sys.executable, "-m", "fabplan", *args], capture_output=True,
                              text=True)
        took = time.perf_counter() - t
        after = resource.getrusage(resource.RUSAGE_CHILDREN)
        cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
        print(f"fabplan {args[0]}: {took:.2f} s wall, {cpu:.2f} s CPU, exit {proc.returncode}"
              + ("  (target: under 2 s)" if args[0] == "tune" else ""))


if __name__ == "__main__":
    main()
