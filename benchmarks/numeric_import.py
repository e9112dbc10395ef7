"""Start-up cost of the numerical helpers: fabplan.numeric against the scipy packages it
stands in for (issue 16).

Prints, as the median wall-clock and CPU time of fresh interpreters (N runs each,
default 10):

- the floor, `import numpy`;
- `import numpy, fabplan.numeric` (Brent's root finder and bounded minimiser, the
  monotone cubic, the grid neighbour search);
- `import numpy, scipy.optimize, scipy.interpolate, scipy.spatial`, what those
  replace; the difference is the saving once nothing else imports them;
- `python -m fabplan plan EXAMPLE --json`, with its own floor (`import numpy,
  scipy.linalg, scipy.special, click`) and the ratio of the two;

and which of scipy.optimize, scipy.interpolate and scipy.spatial a plan of the
example still loads, and from which fabplan module (the first fabplan frame on
the stack when each is first imported).

Run: .venv/bin/python benchmarks/numeric_import.py [N]
"""

from __future__ import annotations

import os
import resource
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"
REPLACED = ("scipy.optimize", "scipy.interpolate", "scipy.spatial")

CASES = [
    ("floor: import numpy", ["-c", "import numpy"]),
    ("import numpy, fabplan.numeric (and fabplan/__init__)",
     ["-c", "import numpy, fabplan.numeric"]),
    ("import numpy + the scipy packages it replaces",
     ["-c", "import numpy, " + ", ".join(REPLACED)]),
    ("floor of plan: numpy, scipy.linalg, scipy.special, click",
     ["-c", "import numpy, scipy.linalg, scipy.special, click"]),
    ("fabplan plan EXAMPLE --json", ["-m", "fabplan", "plan", str(EXAMPLE), "--json"]),
]

PROBE = """
import builtins, sys, traceback
watched = {names!r}
seen = {{}}
real_import = builtins.__import__
def spy(name, globals=None, locals=None, fromlist=(), level=0):
    for w in watched:
        if (name == w or name.startswith(w + ".")) and w not in sys.modules and w not in seen:
            frames = [f for f in traceback.extract_stack() if "/fabplan/" in f.filename]
            seen[w] = (f"{{frames[-1].filename.split('/fabplan/')[-1]}}:{{frames[-1].lineno}}"
                       if frames else "outside fabplan")
    return real_import(name, globals, locals, fromlist, level)
builtins.__import__ = spy
from fabplan import load_design, make_plan
make_plan(load_design({example!r}))
for w in watched:
    if w not in sys.modules:
        print(w, "not loaded")
    else:
        print(w, "loaded, first by", seen.get(w, "another scipy package (a dependency)"))
"""


def run(args: list[str]) -> tuple[float, float]:
    """Wall and CPU (user + system) seconds of one fresh interpreter."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    t = time.perf_counter()
    subprocess.run([sys.executable, *args], check=True, capture_output=True, cwd=ROOT.parent,
                   env=dict(os.environ, PYTHONDONTWRITEBYTECODE="1"))
    wall = time.perf_counter() - t
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    return wall, (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)


def main() -> int:
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 10
    for _, args in CASES:  # warm the file cache once
        run(args)
    times: dict[str, list[tuple[float, float]]] = {name: [] for name, _ in CASES}
    for _ in range(n):  # interleaved, so that a change of machine load hits every case
        for name, args in CASES:
            times[name].append(run(args))
    med = {name: (statistics.median(w for w, _ in v), statistics.median(c for _, c in v))
           for name, v in times.items()}
    print(f"{'median of ' + str(n) + ' fresh interpreters':58} {'wall s':>7} {'cpu s':>7}")
    for name, (wall, cpu) in med.items():
        print(f"{name:58} {wall:7.3f} {cpu:7.3f}")
    floor = med["floor: import numpy"]
    mine = med["import numpy, fabplan.numeric (and fabplan/__init__)"]
    theirs = med["import numpy + the scipy packages it replaces"]
    print(f"fabplan.numeric costs {1e3 * (mine[1] - floor[1]):.0f} ms CPU over numpy "
          f"(ratio {mine[1] / floor[1]:.2f}); the scipy packages it replaces cost "
          f"{1e3 * (theirs[1] - floor[1]):.0f} ms CPU: saving "
          f"{1e3 * (theirs[1] - mine[1]):.0f} ms CPU, {1e3 * (theirs[0] - mine[0]):.0f} ms wall")
    plan, plan_floor = (med["fabplan plan EXAMPLE --json"],
                        med["floor of plan: numpy, scipy.linalg, scipy.special, click"])
    print(f"fabplan plan / its floor: {plan[0] / plan_floor[0]:.2f} wall, "
          f"{plan[1] / plan_floor[1]:.2f} CPU (issue 16 target 1.2)")
    probe = subprocess.run([sys.executable, "-c", PROBE.format(names=REPLACED,
                                                               example=str(EXAMPLE))],
                           check=True, capture_output=True, text=True, cwd=ROOT.parent)
    print("a plan of the example, scipy packages that fabplan.numeric could replace:")
    for line in probe.stdout.splitlines():
        print("  " + line)
    return 0


if __name__ == "__main__":
    sys.exit(main())
