"""Start-up cost of the commands people run most, against floors measured in the
same run (issue 16).

Run: .venv/bin/python benchmarks/startup.py [ROUNDS]

Each round starts, in a fresh interpreter each and in a rotating order (so that a
change in the machine's load falls on every case alike):

- `fabplan build` on the bundled example, and its floor: the bare import of the
  libraries that command needs as issue 16 names them (`import numpy, scipy.linalg,
  scipy.special, ezdxf, reportlab.platypus, shapely, click`); since the build no
  longer loads scipy at all, it is also compared with the bare import of what it
  does load ("build own floor": the same without scipy), the stricter ratio;
- `fabplan plan` on the example, and its floor: the bare import of what a plan
  loads (`import numpy, shapely, click`);
- `fabplan --help`, and its floor: `import click`.

Before timing, each command runs once under `-X importtime` and the script prints
the libraries it loaded, so that a floor that no longer matches what the command
loads shows at once.

For each case it prints the median wall clock, the median processor time of the
child (user + system, from os.wait4, which the load of other processes disturbs
far less than the wall clock), the ratio of each to its floor, and the peak
resident memory of the child (ru_maxrss). Targets: build and plan at most 1.2x
their floors, --help at most 1.5x; the build's peak memory is printed for the
record (compare it with an older revision by running this script there).
The verdict is taken on processor time; the wall-clock ratio is printed beside it.

The package's bytecode is compiled first (as `pip install` does for an installed
package; an editable install under PYTHONDONTWRITEBYTECODE would otherwise compile
every module on every run, which the libraries of the floor never pay).
"""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"

FLOORS = {
    "build": "import numpy, scipy.linalg, scipy.special, ezdxf, reportlab.platypus, shapely, click",
    "build own": "import numpy, ezdxf, reportlab.platypus, shapely, click",
    "plan": "import numpy, shapely, click",
    "help": "import click",
}
TARGETS = {"build": 1.2, "build own": 1.2, "plan": 1.2, "help": 1.5}
LIBRARIES = ("numpy", "scipy", "shapely", "ezdxf", "reportlab", "click", "tomlkit",
             "fontTools", "pyparsing", "PIL", "matplotlib")


def _loaded(argv: list[str]) -> str:
    """The libraries (scipy by subpackage) one run of `argv` imports."""
    proc = subprocess.run([argv[0], "-X", "importtime", *argv[1:]], cwd=ROOT,
                          capture_output=True, text=True)
    names = set()
    for line in proc.stderr.splitlines():
        if line.startswith("import time:") and "|" in line:
            mod = line.rsplit("|", 1)[1].strip()
            top = mod.split(".")[0]
            if top == "scipy" and mod.count(".") >= 1 and not mod.split(".")[1].startswith("_"):
                names.add(".".join(mod.split(".")[:2]))
            elif top in LIBRARIES:
                names.add(top)
    return ", ".join(sorted(names)) or "(none of the listed libraries)"


def _run(argv: list[str]) -> tuple[float, float, float]:
    """Wall seconds, child CPU seconds and peak RSS (MiB) of one fresh process."""
    import time

    t0 = time.perf_counter()
    proc = subprocess.Popen(argv, cwd=ROOT, stdout=subprocess.DEVNULL,
                            stderr=subprocess.PIPE)
    _, status, usage = os.wait4(proc.pid, 0)
    wall = time.perf_counter() - t0
    proc.returncode = os.waitstatus_to_exitcode(status)
    err = proc.stderr.read().decode() if proc.stderr else ""
    if proc.stderr:
        proc.stderr.close()
    if proc.returncode not in (0, 1):
        sys.exit(f"{' '.join(argv)} failed ({proc.returncode}): {err.strip()}")
    return wall, usage.ru_utime + usage.ru_stime, usage.ru_maxrss / 1024


def main(rounds: int = 10) -> None:
    py = sys.executable
    import compileall

    compileall.compile_dir(str(ROOT / "fabplan"), quiet=1)
    with tempfile.TemporaryDirectory() as tmp:
        cases = {
            "build": [py, "-m", "fabplan", "-q", "build", str(EXAMPLE), "-o",
                      str(Path(tmp) / "build"), "--force"],
            "plan": [py, "-m", "fabplan", "plan", str(EXAMPLE)],
            "help": [py, "-m", "fabplan", "--help"],
        }
        for name, cmd in cases.items():
            print(f"{name} loads: {_loaded(cmd)}")
        argv = {}
        for name, cmd in cases.items():
            argv[name] = cmd
            argv[name + " floor"] = [py, "-c", FLOORS[name]]
        argv["build own floor"] = [py, "-c", FLOORS["build own"]]
        names = list(argv)
        for name in names:  # warm the file cache once
            _run(argv[name])
        got: dict[str, list[tuple[float, float, float]]] = {n: [] for n in names}
        for r in range(rounds):
            k = r % len(names)
            for name in names[k:] + names[:k]:
                got[name].append(_run(argv[name]))
    med = {n: tuple(statistics.median(x[i] for x in got[n]) for i in range(3)) for n in names}
    try:
        load = os.getloadavg()[0]
    except OSError:
        load = float("nan")
    print(f"{rounds} rounds, load average {load:.1f} on {os.cpu_count()} CPUs; medians")
    print(f"{'case':15} {'wall s':>7} {'cpu s':>7} {'peak MiB':>9} {'wall x':>7} "
          f"{'cpu x':>7} {'target':>7}")
    failed = []
    # (label, measured case, its floor); a floor's own row has no floor
    rows = [("build floor", "build floor", None), ("build", "build", "build floor"),
            ("build own floor", "build own floor", None),
            ("build vs own", "build", "build own floor"),
            ("plan floor", "plan floor", None), ("plan", "plan", "plan floor"),
            ("help floor", "help floor", None), ("help", "help", "help floor")]
    for label, case, floor in rows:
        wall, cpu, rss = med[case]
        line = f"{label:15} {wall:7.3f} {cpu:7.3f} {rss:9.1f}"
        if floor is not None:
            target = TARGETS["build own" if floor == "build own floor" else case]
            fw, fc, _ = med[floor]
            ok = cpu / fc <= target
            line += (f" {wall / fw:7.2f} {cpu / fc:7.2f} {'<= ' + str(target):>7}"
                     f"  {'met' if ok else 'NOT met'}")
            if not ok:
                failed.append(label)
        print(line)
    print(f"peak memory of `fabplan build` on the example: {med['build'][2]:.1f} MiB")
    if failed:
        print("targets not met: " + ", ".join(failed))


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 10)
