"""Resource bounds (issue 15): time and peak memory of `check` and `plan` on designs
that used to crash or run away, and on large but legitimate ones, against a floor.

Run: .venv/bin/python benchmarks/resource_bounds.py [--cap-seconds S] [--cap-mb MB]
                                                    [--only NAME ...]

Each case is a design invented here, written to a temporary folder, and run as
`python -m fabplan COMMAND design.toml` in a subprocess whose CPU time and address
space are capped with resource.setrlimit (by default 120 s and 4096 MiB; a wall-clock
limit of twice the CPU cap backs them up). For each run the script prints the wall
time, the child's CPU time and peak resident memory (os.wait4's rusage, i.e.
getrusage of that child alone), the outcome (exit 0/1: a plan; 2: one-line refusal;
or killed at a cap) and the ratio of CPU time (steadier than wall time on a shared
machine) and of peak memory to the floor: the bundled
example's run of the same command, measured in the same run of this script.
A case is marked "as expected" when a design fabplan should refuse exits 2 with one
line per error, and a design it should plan exits 0 or 1.
"""

from __future__ import annotations

import argparse
import os
import resource
import subprocess
import sys
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "examples" / "club-uhf-folded-dipoles.toml"
EXAMPLE_TEXT = EXAMPLE.read_text(encoding="utf-8")


def example_with(old: str, new: str) -> str:
    if old not in EXAMPLE_TEXT:
        raise SystemExit(f"the example no longer holds {old!r}: update this benchmark")
    return EXAMPLE_TEXT.replace(old, new, 1)


WIRE = """
[project]
name = "{name}"
[stock]
gauge = "AWG 14"
material = "cu-c11000-hard"
[shop]
units = "mm"
"""


def wire(name: str, element: str, extra: str = "") -> str:
    return WIRE.format(name=name) + "\n[[element]]\n" + element.strip() + "\n" + extra


HELIX = 'name = "coil"\nshape = "helix"\nturns = {turns}\ndiameter = "{d}"\npitch = "{p}"\n'
LEG = 'side = "10 7/8 in"'


@dataclass(frozen=True)
class Case:
    name: str
    text: str
    should_plan: bool  # True: a legitimate design (exit 0 or 1); False: refused (exit 2)


CASES = [
    # refused before any work starts: one line naming the field
    Case("leg 10 km", example_with(LEG, 'side = "10000 m"'), False),
    Case("leg 1 km", example_with(LEG, 'side = "1000 m"'), False),
    Case("leg 1e15 mm", example_with(LEG, 'side = "1e15 mm"'), False),
    Case("leg 1e30 mm", example_with(LEG, 'side = "1e30 mm"'), False),
    Case("gap 1e300 mm", example_with('feed_gap = "1/2 in"', 'feed_gap = "1e300 mm"'), False),
    Case("trim 1e30 mm", example_with('trim = "3/4 in"', 'trim = "1e30 mm"'), False),
    Case("huge fraction", example_with(LEG, 'side = "1' + "0" * 90 + '/3 in"'), False),
    Case("target 1e-300 Hz", example_with('target = "440 MHz"', 'target = "1e-300 Hz"'), False),
    Case("nested 100 000 deep", "x = " + "[" * 100_000 + "]" * 100_000 + "\n" + EXAMPLE_TEXT,
         False),
    Case("helix pitch 1 km", wire("helix", HELIX.format(turns=8, d="100 mm", p="1000 m")), False),
    Case("helix 1000 turns of 1 m", wire("helix", HELIX.format(turns=1000, d="100 mm",
                                                                p="1 m")), False),
    Case("loop side 10 km", wire("loop", 'shape = "rect-loop"\nside = "10000 m"\n'
                                         'corner_radius = "50 mm"\nfeed_gap = "20 mm"'), False),
    Case("300 000 cuts", example_with("quantity = 7\n", "quantity = 100000\n")
         + '\n[[element]]\nname = "b"\nshape = "hairpin"\nleg = "5 in"\nspacing = "1 in"\n'
           'quantity = 100000\n[[element]]\nname = "c"\nshape = "hairpin"\nleg = "6 in"\n'
           'spacing = "1 in"\nquantity = 100000\n', False),
    # legitimate and large: they must plan, in seconds
    Case("80 m band loop, 85 m of wire", wire("80 m loop", 'shape = "rect-loop"\n'
                                              'side = "21.3 m"\ncorner_radius = "50 mm"\n'
                                              'feed_gap = "20 mm"'), True),
    Case("80 m band folded dipole", wire("80 m folded dipole", 'shape = "folded-dipole"\n'
                                         'side = "38 m"\nspacing = "100 mm"\n'
                                         'feed_gap = "20 mm"'), True),
    Case("helix 1000 turns", wire("coil", HELIX.format(turns=1000, d="100 mm", p="5 mm")), True),
    Case("quantity 100 000", example_with("quantity = 7\n", "quantity = 100000\n"), True),
]


@dataclass(frozen=True)
class Run:
    exit: int | None  # None: killed by a signal
    signal: int | None
    wall_s: float
    cpu_s: float
    peak_mb: float
    stderr: str


def run(command: str, design: Path, cap_s: float, cap_mb: float) -> Run:
    """One capped subprocess; its own rusage from os.wait4."""

    def limit() -> None:
        cpu = int(cap_s)
        resource.setrlimit(resource.RLIMIT_CPU, (cpu, cpu + 5))
        size = int(cap_mb * 1024 * 1024)
        resource.setrlimit(resource.RLIMIT_AS, (size, size))

    with tempfile.TemporaryFile() as out, tempfile.TemporaryFile() as err:
        t0 = time.perf_counter()
        proc = subprocess.Popen([sys.executable, "-m", "fabplan", command, str(design)],
                                stdout=out, stderr=err, cwd=ROOT, preexec_fn=limit)
        deadline = t0 + 2 * cap_s
        while True:
            pid, status, usage = os.wait4(proc.pid, os.WNOHANG)
            if pid:
                break
            if time.perf_counter() > deadline:
                proc.kill()
                pid, status, usage = os.wait4(proc.pid, 0)
                break
            time.sleep(0.02)
        wall = time.perf_counter() - t0
        proc.returncode = os.waitstatus_to_exitcode(status)
        err.seek(0)
        text = err.read().decode("utf-8", "replace")
    code = proc.returncode
    return Run(code if code >= 0 else None, -code if code < 0 else None, wall,
               usage.ru_utime + usage.ru_stime, usage.ru_maxrss / 1024, text)


def outcome(r: Run, design: Path) -> str:
    if r.exit is None:
        return f"killed (signal {r.signal}: a cap was reached)"
    if r.exit in (0, 1):
        return f"plan (exit {r.exit})"
    lines = [line for line in r.stderr.splitlines() if line.strip()]
    one_line = all(line.startswith(f"fabplan: error: {design}: ") for line in lines)
    first = lines[0][len("fabplan: error: "):][:110] if lines else ""
    return f"exit {r.exit}, {len(lines)} line(s){'' if one_line else ' NOT one-line'}: {first}"


def expected(case: Case, r: Run, design: Path) -> bool:
    if case.should_plan:
        return r.exit in (0, 1)
    return r.exit == 2 and all(line.startswith(f"fabplan: error: {design}: ")
                               for line in r.stderr.splitlines() if line.strip())


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--cap-seconds", type=float, default=120.0)
    parser.add_argument("--cap-mb", type=float, default=4096.0)
    parser.add_argument("--only", nargs="*", default=None, help="case names to run")
    args = parser.parse_args()
    cases = [c for c in CASES if args.only is None or c.name in args.only]
    with tempfile.TemporaryDirectory() as tmp:
        design = Path(tmp) / "design.toml"
        floors = {}
        for command in ("check", "plan"):
            design.write_text(EXAMPLE_TEXT, encoding="utf-8")
            floors[command] = run(command, design, args.cap_seconds, args.cap_mb)
            f = floors[command]
            print(f"floor: the example, {command}: {f.wall_s:.2f} s wall, {f.cpu_s:.2f} s CPU, "
                  f"{f.peak_mb:.0f} MiB peak, {outcome(f, design)}")
        print(f"caps: {args.cap_seconds:g} s CPU, {args.cap_mb:g} MiB address space\n")
        header = f"{'case':32} {'cmd':5} {'wall s':>7} {'CPU s':>7} {'CPU x fl':>8} " \
                 f"{'peak MiB':>8} {'x floor':>7}  ok  outcome"
        print(header)
        print("-" * len(header))
        bad = 0
        for case in cases:
            design.write_text(case.text, encoding="utf-8")
            for command in ("check", "plan"):
                r = run(command, design, args.cap_seconds, args.cap_mb)
                f = floors[command]
                ok = expected(case, r, design)
                bad += not ok
                print(f"{case.name[:32]:32} {command:5} {r.wall_s:7.2f} {r.cpu_s:7.2f} "
                      f"{r.cpu_s / f.cpu_s:8.1f} {r.peak_mb:8.0f} {r.peak_mb / f.peak_mb:7.1f}"
                      f"  {'yes' if ok else 'NO '}  {outcome(r, design)}", flush=True)
        print(f"\n{len(cases) * 2 - bad} of {len(cases) * 2} runs as expected "
              "(refused in one line, or planned)")


if __name__ == "__main__":
    main()
