"""How long `fabplan tune` takes on the bundled folded dipole (target: under 2 s).

Prints figures; not a test. Run from the project's root:
    .venv/bin/python benchmarks/tune_speed.py
"""

from __future__ import annotations

import dataclasses
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"


def main() -> None:
    from fabplan.design import load_design
    from fabplan.em import tuning
    from fabplan.plan import make_plan

    t0 = time.perf_counter()
    design = load_design(EXAMPLE)
    settings = design.electrical
    if settings is None:
        sys.exit(f"{EXAMPLE} has no [electrical] table")
    plan = make_plan(dataclasses.replace(design, electrical=None))
    element = tuning.fed_element(plan, None)
    t1 = time.perf_counter()
    result = tuning.tune(plan, element, settings, settings.target_hz)
    t2 = time.perf_counter()
    print(f"element: {element.name}; {result.key} {result.old_value_mm:.2f} -> "
          f"{result.new_value_mm:.2f} mm; {result.old_hz / 1e6:.3f} -> {result.new_hz / 1e6:.4f} MHz")
    print(f"secant steps: {result.iterations}; models built: {result.models_built}")
    print(f"load + plan (no electrical): {t1 - t0:.2f} s; tuning: {t2 - t1:.2f} s")

    for args in (["tune", str(EXAMPLE)], ["--help"]):
        t = time.perf_counter()
        proc = subprocess.run([sys.executable, "-m", "fabplan", *args], capture_output=True,
                              text=True)
        took = time.perf_counter() - t
        print(f"fabplan {' '.join(args[:1])}: {took:.2f} s wall, exit {proc.returncode}"
              + ("  (target: under 2 s)" if args[0] == "tune" else ""))


if __name__ == "__main__":
    main()
