"""Speed of the method-of-moments solver: set-up, time per frequency, 81-point sweeps, memory.

Run:  .venv/bin/python benchmarks/em_speed.py          (every case, each in its own process)
      .venv/bin/python benchmarks/em_speed.py beam300   (one case)

Cases: a folded dipole of about 200 and 400 unknowns; a 3-element beam (reflector, folded
dipole, director) of about 300 unknowns, swept over 81 points, with its pattern (the
far-field module's principal planes at 2 degrees and the radiated power); an 8-element beam
of about 800 unknowns swept over 81 points. Targets (issue 11, 2 cores): the 300-unknown
beam's sweep plus pattern under 1.0 s, the 800-unknown sweep under 5 s, under 300 MiB.

Each case prints its figures and ratios against a floor measured in the same process: the
time of one LU solve (numpy.linalg.solve) of a complex matrix of the same size, on one
thread as the solver runs. The fill is the rest of a frequency's time. Peak memory is the
process's own (resource.getrusage), each case in a fresh process. Prints figures, asserts
nothing; the machine's load changes the wall clock (CPU time is the process's own).
"""

from __future__ import annotations

import os
import resource
import subprocess
import sys
import time

import numpy as np

CASES = ("fd200", "fd400", "beam300", "beam800")


def folded_dipole_model(unknowns_target: int):  # type: ignore[no-untyped-def]
    from fabplan.em.solver import path_model
    from fabplan.geometry.shapes import folded_dipole as fd

    path = fd.build(fd.Params("side", 300.0, "centre_spacing", 25.0, 12.0), 2.0)

    def make(spw: float):  # type: ignore[no-untyped-def]
        return path_model(path, 1.0, f_max_hz=470e6, seg_per_wavelength=spw,
                          resistivity_ohm_m=1.72e-8)

    return make, _spw_for(make, unknowns_target)


def beam_structure(elements: int):  # type: ignore[no-untyped-def]
    """A beam for 435 MHz along x: reflector, a folded dipole stood upright, directors;
    4 mm aluminium rod (2.8e-8 ohm m)."""
    from fabplan.em.structure import Gap, Placement, Port, Structure, Wire, WireEnd
    from fabplan.geometry.shapes import folded_dipole as fd

    rho = 2.8e-8
    path = fd.build(fd.Params("side", 300.0, "centre_spacing", 25.0, 12.0), 4.0)
    wires = [Wire(((-130.0, 0, -170.0), (-130.0, 0, 170.0)), 2.0, resistivity_ohm_m=rho,
                  name="reflector"),
             Wire(path, 2.0, resistivity_ohm_m=rho, placement=Placement.about((0, 1.0, 0), 90.0),
                  name="driven element")]
    for k in range(elements - 2):
        half = 150.0 - 4.0 * k
        x = 100.0 + 140.0 * k
        wires.append(Wire(((x, 0, -half), (x, 0, half)), 2.0, resistivity_ohm_m=rho,
                          name=f"director {k + 1}"))
    return Structure(tuple(wires), (Gap(WireEnd(1, "B"), WireEnd(1, "A"), Port()),))


def beam_model(elements: int, unknowns_target: int):  # type: ignore[no-untyped-def]
    from fabplan.em.solver import structure_model

    s = beam_structure(elements)

    def make(spw: float):  # type: ignore[no-untyped-def]
        return structure_model(s, f_max_hz=470e6, seg_per_wavelength=spw)

    return make, _spw_for(make, unknowns_target)


def _spw_for(make, target: int) -> float:  # type: ignore[no-untyped-def]
    """Segments per wavelength giving about `target` unknowns (the count is monotonic)."""
    lo, hi = 10.0, 600.0
    for _ in range(30):
        mid = (lo + hi) / 2
        if make(mid).unknowns < target:
            lo = mid
        else:
            hi = mid
    return hi


def lu_floor(n: int) -> float:
    """Seconds for one numpy LU solve of a complex n x n system on one BLAS thread
    (median of 7)."""
    from fabplan.em.solver import _OneBlasThread

    rng = np.random.default_rng(1)
    a = rng.standard_normal((n, n)) + 1j * rng.standard_normal((n, n))
    a = a + a.T
    b = rng.standard_normal(n) + 0j
    times = []
    with _OneBlasThread():
        np.linalg.solve(a, b)
        for _ in range(7):
            t = time.perf_counter()
            np.linalg.solve(a, b)
            times.append(time.perf_counter() - t)
    return float(np.median(times))


def run(case: str) -> None:
    import scipy.linalg  # noqa: F401  (import cost is not the solver's)
    import scipy.optimize  # noqa: F401
    import scipy.special  # noqa: F401

    freqs = np.linspace(420e6, 450e6, 81)
    if case.startswith("fd"):
        make, spw = folded_dipole_model(int(case[2:]))
    else:
        make, spw = beam_model(3 if case == "beam300" else 8, int(case[4:]))
    w0 = time.perf_counter()
    model = make(spw)
    model.impedance(435e6)  # fills the geometry-only terms
    w_setup = time.perf_counter() - w0
    n_single = 8
    w1 = time.perf_counter()
    for f in np.linspace(430e6, 440e6, n_single):
        model.impedance(f)
    w_single = (time.perf_counter() - w1) / n_single
    w2, c2 = time.perf_counter(), time.process_time()
    model2 = make(spw)
    sols = model2.solutions(freqs)
    w_sweep, c_sweep = time.perf_counter() - w2, time.process_time() - c2
    floor = lu_floor(model.basis.size)
    per = w_sweep / len(freqs)
    line = (f"{case:8s} {model.unknowns:4d} unknowns ({model.n_seg} segments): set-up "
            f"{w_setup * 1e3:5.0f} ms; one frequency {w_single * 1e3:5.1f} ms = "
            f"{w_single / floor:4.1f} x LU floor ({floor * 1e3:.1f} ms); 81-point sweep incl. "
            f"set-up {w_sweep:5.2f} s wall / {c_sweep:5.2f} s CPU = {per * 1e3:5.1f} ms per "
            f"point = {per / floor:4.1f} x LU floor")
    if case.startswith("beam"):
        from fabplan.em import farfield as ff

        w3 = time.perf_counter()
        sol = sols[len(sols) // 2]
        ff.principal_planes(sol, model2, step_deg=2.0)
        ff.radiated_power(sol, model2)
        w_pat = time.perf_counter() - w3
        line += f"; pattern {w_pat:5.2f} s; sweep + pattern {w_sweep + w_pat:5.2f} s"
    rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(line + f"; peak RSS {rss:.0f} MiB", flush=True)


def main() -> None:
    if len(sys.argv) > 1:
        run(sys.argv[1])
        return
    print(f"OPENBLAS_NUM_THREADS={os.environ.get('OPENBLAS_NUM_THREADS', '(unset)')}, "
          f"cpus={os.cpu_count()}, load average {os.getloadavg()[0]:.2f} (other work on the "
          "machine slows the wall clock)")
    for case in CASES:
        subprocess.run([sys.executable, __file__, case], check=True)


if __name__ == "__main__":
    main()
