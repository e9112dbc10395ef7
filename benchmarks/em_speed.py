"""Speed of the method-of-moments solver: set-up, time per frequency, 81-point sweeps.

Run:  .venv/bin/python benchmarks/em_speed.py
Targets (issue 7, 2 cores): ~200 unknowns under 15 ms per frequency and an 81-point sweep
under 1 s including set-up; ~400 unknowns, 81 points under 4 s. Prints figures, asserts
nothing. OpenBLAS threads spin against each other on a busy 2-core machine; run with
OPENBLAS_NUM_THREADS=1 to see the single-thread figures as well.
"""

from __future__ import annotations

import os
import time

import numpy as np


def folded_dipole_model(unknowns_target: int):
    from fabplan.em.solver import path_model
    from fabplan.geometry.shapes import folded_dipole as fd

    p = fd.Params("side", 300.0, "centre_spacing", 25.0, 12.0)
    path = fd.build(p, 2.0)
    lo, hi = 5.0, 400.0
    for _ in range(40):  # segments per wavelength giving about the wanted unknowns
        spw = (lo + hi) / 2
        n = path_model(path, 1.0, f_max_hz=470e6, seg_per_wavelength=spw,
                       resistivity_ohm_m=1.72e-8).unknowns
        if n < unknowns_target:
            lo = spw
        else:
            hi = spw
    return lambda: path_model(path, 1.0, f_max_hz=470e6, seg_per_wavelength=hi,
                              resistivity_ohm_m=1.72e-8)


def main() -> None:
    import scipy.linalg  # noqa: F401  (import cost is not the solver's)
    import scipy.spatial  # noqa: F401
    import scipy.special  # noqa: F401

    print(f"OPENBLAS_NUM_THREADS={os.environ.get('OPENBLAS_NUM_THREADS', '(unset)')}, "
          f"cpus={os.cpu_count()}")
    print(f"load average {os.getloadavg()[0]:.2f} (other work on the machine slows the wall "
          "clock; CPU time is this process's own)")
    freqs = np.linspace(400e6, 470e6, 81)
    for target in (200, 400):
        make = folded_dipole_model(target)
        w0, c0 = time.perf_counter(), time.process_time()
        model = make()
        model.impedance(435e6)  # fills the geometry-only terms
        w_setup, c_setup = time.perf_counter() - w0, time.process_time() - c0
        n_single = 10
        w1, c1 = time.perf_counter(), time.process_time()
        for f in np.linspace(430e6, 440e6, n_single):
            model.impedance(f)
        w_f = (time.perf_counter() - w1) / n_single
        c_f = (time.process_time() - c1) / n_single
        w2, c2 = time.perf_counter(), time.process_time()
        model2 = make()
        model2.sweep(freqs)
        w_sw, c_sw = time.perf_counter() - w2, time.process_time() - c2
        print(f"{model.unknowns:4d} unknowns (wall / CPU): set-up {w_setup * 1e3:6.0f} / "
              f"{c_setup * 1e3:6.0f} ms; one frequency {w_f * 1e3:5.1f} / {c_f * 1e3:5.1f} ms; "
              f"81-point sweep incl. set-up {w_sw:5.2f} / {c_sw:5.2f} s "
              f"({w_sw / 81 * 1e3:.1f} / {c_sw / 81 * 1e3:.1f} ms per point)")

if __name__ == "__main__":
    main()
