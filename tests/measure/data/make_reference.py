"""Make the scikit-rf reference files in this folder (run once; the outputs are committed).

    .venv/bin/pip install scikit-rf   # in a developer's venv only: not a project dependency
    .venv/bin/python tests/measure/data/make_reference.py

The values are a series R-L-C one-port (R = 35 ohm, resonant at 440 MHz, L = 120 nH)
sampled at 11 frequencies from 400 to 480 MHz. `reference_points()` gives them (numpy
only), so tests/measure/test_measure_touchstone.py can compare what fabplan's reader
reads from each file with the values scikit-rf was given. Each case names the file,
the reference impedance, the frequency unit, the data format, the Touchstone version and
the network parameter scikit-rf was asked to write (its Network.write_touchstone; the
files were written by scikit-rf 2.2.0).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
R_OHM = 35.0
L_H = 120e-9
F0_HZ = 440e6
C_F = 1.0 / ((2 * math.pi * F0_HZ) ** 2 * L_H)

# (file stem, z0 ohm, unit, format, version, parameter)
CASES: tuple[tuple[str, float, str, str, str, str], ...] = (
    ("skrf_v1_s_ri_hz_50", 50.0, "hz", "ri", "1.0", "S"),
    ("skrf_v1_s_ma_khz_50", 50.0, "khz", "ma", "1.0", "S"),
    ("skrf_v1_s_db_mhz_75", 75.0, "mhz", "db", "1.0", "S"),
    ("skrf_v1_s_ri_ghz_50", 50.0, "ghz", "ri", "1.0", "S"),
    ("skrf_v2_s_ma_mhz_50", 50.0, "mhz", "ma", "2.0", "S"),
    ("skrf_v2_s_db_ghz_75", 75.0, "ghz", "db", "2.0", "S"),
    ("skrf_v1_z_ri_mhz_50", 50.0, "mhz", "ri", "1.0", "Z"),
    ("skrf_v2_z_ma_mhz_50", 50.0, "mhz", "ma", "2.0", "Z"),
    ("skrf_v1_y_ri_mhz_50", 50.0, "mhz", "ri", "1.0", "Y"),
    ("skrf_v2_y_ri_mhz_50", 50.0, "mhz", "ri", "2.0", "Y"),
)


def reference_points() -> tuple[np.ndarray, np.ndarray]:
    """Frequencies (Hz) and the series R-L-C impedance (ohm) written to every file."""
    f = np.linspace(400e6, 480e6, 11)
    w = 2 * np.pi * f
    z = R_OHM + 1j * (w * L_H - 1.0 / (w * C_F))
    return f, z


def main() -> None:
    import skrf  # only here: scikit-rf is not a dependency of fabplan

    f, z = reference_points()
    for stem, z0, unit, form, version, parameter in CASES:
        s = (z - z0) / (z + z0)
        net = skrf.Network(frequency=skrf.Frequency.from_f(f, unit="hz"),
                           s=s.reshape(-1, 1, 1), z0=z0, name=stem)
        net.frequency.unit = unit
        net.write_touchstone(filename=stem, dir=str(HERE), form=form, r_ref=z0,
                             skrf_comment=False, parameter=parameter, version=version)
        print("wrote", stem, "with scikit-rf", skrf.__version__)


if __name__ == "__main__":
    main()
