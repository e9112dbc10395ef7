"""Speed of the rational (AAA) sweep fit against the full sweep, and of the far field.

Run:  .venv/bin/python benchmarks/sweep_fit_speed.py
Prints, for the example's folded dipole and a ~300-unknown folded dipole: the full 81-point
sweep, the fitted sweep (solves + fitting + evaluation at the 81 points), the number of
solves, the largest relative error of the fit against the full sweep, and both times as a
ratio to the floor measured in the same run (one solve at one frequency, median of 7).
Then the far field of a ~300-unknown structure: the pattern grid (default step, and 2 deg),
the beam figures and the power balance, as ratios to one solve. Median of 5 runs each.
Prints figures, asserts nothing: the machine's load varies.
"""

from __future__ import annotations

import math
import os
import statistics
import time
from collections.abc import Callable
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent


def median_time(fn: Callable[[], object], runs: int = 5) -> float:
    times = []
    for _ in range(runs):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return statistics.median(times)


def example_model():
    from fabplan import load_design, make_plan
    from fabplan.em.stage import structure_model_of
    from fabplan.plan import electrical_input

    plan = make_plan(load_design(ROOT / "examples" / "club-uhf-folded-dipoles.toml"))
    settings = plan.design.electrical
    freqs = settings.frequencies()
    e = plan.elements[0]
    inputs = [electrical_input(plan.design, e.spec, e.geometry, e.pieces)]
    return structure_model_of(inputs, settings, float(freqs[-1]), {}), freqs


def folded_dipole_model(unknowns_target: int):
    from fabplan.em.solver import path_model
    from fabplan.geometry.shapes import folded_dipole as fd

    path = fd.build(fd.Params("side", 300.0, "centre_spacing", 25.0, 12.0), 2.0)
    lo, hi = 5.0, 400.0
    for _ in range(40):  # segments per wavelength giving about the wanted unknowns
        spw = (lo + hi) / 2
        n = path_model(path, 1.0, f_max_hz=470e6, seg_per_wavelength=spw,
                       resistivity_ohm_m=1.72e-8).unknowns
        lo, hi = (spw, hi) if n < unknowns_target else (lo, spw)
    return path_model(path, 1.0, f_max_hz=470e6, seg_per_wavelength=hi,
                      resistivity_ohm_m=1.72e-8), np.linspace(400e6, 470e6, 81)


def helix_model(turns: int):
    """An axial-mode helix over ground (C = lambda at 300 MHz, 12.5 deg), ~21 unknowns
    per turn."""
    from fabplan.em.mesh import arc_polygon
    from fabplan.em.solver import wire_model
    from fabplan.geometry.path import Bend, BendPath

    a = math.radians(12.5)
    circ = 1000.0
    path = BendPath((Bend(circ / (2 * math.pi), 360.0 * turns, 0.0, circ * math.tan(a)),),
                    origin=(0.0, 0.0, 30.0), heading=(math.cos(a), 0.0, math.sin(a)),
                    normal=(0.0, 1.0, 0.0))
    arc = path.primitives()[0]
    nodes = np.vstack([[[0.0, 0.0, 0.0], [0.0, 0.0, 15.0]],
                       arc_polygon(arc, math.ceil(arc.length / 50.0))])
    return wire_model(nodes, 5.0, closed=False, source_segments=[0], ground_z_mm=0.0,
                      resistivity_ohm_m=1.72e-8)


def sweep_figures(name: str, make: Callable[[], tuple[object, np.ndarray]]) -> None:
    from fabplan.em.fitting import fit_sweep

    model, freqs = make()
    model.impedance(float(freqs[0]))  # geometry-only terms filled once
    mids = np.linspace(float(freqs[0]), float(freqs[-1]), 7)
    floor = statistics.median(median_time(lambda f=f: model.impedance(float(f)), 3)
                              for f in mids)
    full = median_time(lambda: model.sweep(freqs))
    z_full = model.sweep(freqs)
    holder: dict[str, object] = {}

    def fitted() -> None:
        fit = fit_sweep(model.impedance, float(freqs[0]), float(freqs[-1]))
        holder["fit"] = fit
        holder["z"] = fit.z(freqs)

    fitted_t = median_time(fitted)
    fit = holder["fit"]
    z_fit = np.asarray(holder["z"])
    err = float(np.max(np.abs(z_fit - z_full) / np.abs(z_full)))
    print(f"{name}: {model.unknowns} unknowns; one solve (floor) {floor * 1e3:.2f} ms")
    print(f"  full 81-point sweep     {full * 1e3:8.1f} ms  = {full / floor:6.1f} x floor")
    print(f"  fitted sweep            {fitted_t * 1e3:8.1f} ms  = {fitted_t / floor:6.1f} x floor"
          f"  ({fit.solves} solves)")
    print(f"  speed-up {full / fitted_t:5.1f}; max relative error against the full sweep "
          f"{err:.2e} (rtol {fit.rtol:g}; check {fit.max_error:.1e}, leave-one-out "
          f"{fit.loo_error:.1e})")


def far_field_figures(name: str, model, f_hz: float) -> None:
    from fabplan.em import farfield as ff

    model.impedance(f_hz)
    floor = median_time(lambda: model.solve(f_hz), 7)
    sol = model.solve(f_hz)

    def fresh() -> ff.FarField:  # nothing cached from an earlier run
        return ff.far_field(sol, model)

    balance = median_time(lambda: fresh().power_balance())
    grid = median_time(lambda: fresh().pattern())
    fine = median_time(lambda: fresh().pattern(2.0))
    beam = median_time(lambda: fresh().beam())
    cuts = median_time(lambda: fresh().cuts())
    field = fresh()
    bal = field.power_balance()
    g = field.pattern()
    print(f"{name}: {model.unknowns} unknowns, k R = {field.k * field.radius_m:.1f}; "
          f"one solve (floor) {floor * 1e3:.1f} ms; max gain {g.max_gain_dbi:.2f} dBi, "
          f"power balance {bal.error:.1e}")
    print(f"  power balance ({bal.n_theta} x {bal.n_phi} points)      {balance * 1e3:7.1f} ms "
          f"= {balance / floor:5.2f} x floor")
    print(f"  pattern, {ff.DEFAULT_STEP_DEG:g} deg grid, max, power     {grid * 1e3:7.1f} ms "
          f"= {grid / floor:5.2f} x floor")
    print(f"  pattern, 2 deg grid, max, power     {fine * 1e3:7.1f} ms = {fine / floor:5.2f} "
          "x floor")
    print(f"  beam figures (grid, max, F/B, F/R, beamwidths) {beam * 1e3:7.1f} ms "
          f"= {beam / floor:5.2f} x floor")
    print(f"  azimuth + elevation cuts (1 deg, grid, max) {cuts * 1e3:7.1f} ms "
          f"= {cuts / floor:5.2f} x floor")


def main() -> None:
    import scipy.linalg  # noqa: F401  (import cost is not the solver's)

    print(f"OPENBLAS_NUM_THREADS={os.environ.get('OPENBLAS_NUM_THREADS', '(unset)')}, "
          f"cpus={os.cpu_count()}, load average {os.getloadavg()[0]:.2f}")
    sweep_figures("example folded dipole", example_model)
    sweep_figures("folded dipole ~300", lambda: folded_dipole_model(300))
    model, _ = folded_dipole_model(300)
    far_field_figures("far field, folded dipole ~300", model, 435e6)
    far_field_figures("far field, 14-turn helix over ground", helix_model(14), 299.792458e6)


if __name__ == "__main__":
    main()
