"""Constants and small helpers shared by the antenna design formulas.

Units: millimetres, hertz, ohms, henries, farads; angles in radians inside,
degrees only where a name says `_deg`.

SOURCES
- Speed of light: exact by definition of the metre (SI brochure, 9th ed.) [S].
- mu0 = 4 pi 1e-7 H/m: the classical value; the 2019 SI value differs by about
  1e-10 relative, far below anything these formulas resolve [S].
- eta0 = 120 pi ohm (376.73): the free-space impedance as Balanis, Antenna Theory,
  uses it in the small-loop and dipole formulas [S]; the exact SI value
  (376.730 313...) differs by 3e-6 relative.
"""

from __future__ import annotations

import math

from ..errors import DesignError

__all__ = ["C0_MM_S", "MU0_H_PER_MM", "MU0_H_PER_M", "ETA0_OHM", "wavelength_mm",
           "require_positive", "require_range"]

C0_MM_S = 299_792_458_000.0  # speed of light in vacuum, mm/s (exact)
MU0_H_PER_M = 4e-7 * math.pi  # H/m
MU0_H_PER_MM = MU0_H_PER_M / 1000.0  # H/mm
ETA0_OHM = 120.0 * math.pi  # free-space wave impedance as the textbooks round it


def wavelength_mm(frequency_hz: float) -> float:
    """Free-space wavelength (mm) at `frequency_hz` (Hz)."""
    require_positive("frequency_hz", frequency_hz)
    return C0_MM_S / frequency_hz


def require_positive(field: str, value: float) -> None:
    """Raise DesignError unless `value` is a finite number above zero."""
    if not (isinstance(value, (int, float)) and math.isfinite(value) and value > 0):
        raise DesignError("must be a finite number above zero", field=field, value=value)


def require_range(field: str, value: float, low: float, high: float, rule: str) -> None:
    """Raise DesignError unless low <= value <= high; `rule` says why the range holds."""
    if not (isinstance(value, (int, float)) and math.isfinite(value)):
        raise DesignError("must be a finite number", field=field, value=value)
    if not low <= value <= high:
        raise DesignError(f"must lie in [{low:g}, {high:g}]: {rule}", field=field, value=value)
