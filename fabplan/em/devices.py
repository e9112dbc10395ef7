"""Matching devices the electrical model treats as transmission lines: gamma and T.

The published analyses of the gamma and T matches (fabplan.antennas.matching: the
folded-dipole decomposition of Balanis applied over the match section, as Healey,
QST April 1969, analyses the gamma) turn the element's centre impedance into the
impedance at the device's input. The method of moments computes the centre
impedance (the element fed at its centre); this module applies the device at every
frequency of the sweep, and reports the series capacitor at the design power. The
rods themselves are not wires of the model (their radiation is neglected, as in the
published model).

A hairpin is not here: it is modelled as wires joined to the element.

Pure: no files, no printing. mm, Hz, ohm, F, W.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..antennas.matching import gamma_input_ohm, t_match_input_ohm
from ..design.match import MatchSpec
from .records import LoadFigures

__all__ = ["LineMatch", "line_match", "Through"]


@dataclass(frozen=True)
class LineMatch:
    """A gamma or T match on an element (mm, F; capacitance None: none fitted yet)."""

    element: str
    kind: str  # "gamma" or "t-match"
    length_mm: float
    spacing_mm: float
    rod_diameter_mm: float
    element_diameter_mm: float
    capacitance_f: float | None
    solved: bool = False

    def _one(self, z: complex, f: float, cap: float | None) -> complex:
        if self.kind == "gamma":
            return gamma_input_ohm(z, f, rod_length_mm=self.length_mm, spacing_mm=self.spacing_mm,
                                   rod_diameter_mm=self.rod_diameter_mm,
                                   element_diameter_mm=self.element_diameter_mm,
                                   capacitance_f=cap)
        return t_match_input_ohm(z, f, t_length_mm=self.length_mm, spacing_mm=self.spacing_mm,
                                 rod_diameter_mm=self.rod_diameter_mm,
                                 element_diameter_mm=self.element_diameter_mm,
                                 capacitance_each_f=cap)

    def transform(self, z_ohm: Any, f_hz: Any) -> np.ndarray:
        """The impedance (ohm) at the device's input for the element's centre `z_ohm`."""
        z = np.atleast_1d(np.asarray(z_ohm, dtype=complex))
        f = np.broadcast_to(np.atleast_1d(np.asarray(f_hz, dtype=float)), z.shape)
        return np.array([self._one(complex(a), float(b), self.capacitance_f)
                         for a, b in zip(z, f)], dtype=complex)

    def solved_for(self, z_element_ohm: complex, f_hz: float) -> LineMatch:
        """With no capacitance given: the one that leaves no reactance at `f_hz` (F)
        (none, if the section alone is capacitive there)."""
        if self.capacitance_f is not None:
            return self
        x = self._one(z_element_ohm, f_hz, None).imag
        if x <= 0:
            return self
        w = 2 * math.pi * f_hz
        cap = 1 / (w * x) if self.kind == "gamma" else 2 / (w * x)
        return dataclasses.replace(self, capacitance_f=cap, solved=True)

    def describe(self) -> str:
        name = "gamma match" if self.kind == "gamma" else "T match"
        return (f"{name} (transmission-line model after Healey and Balanis; rod "
                f"{self.length_mm:.1f} mm, {self.spacing_mm:.1f} mm from the element)")

    def loads(self, z_element_ohm: complex, f_hz: float, power_w: float) -> list[LoadFigures]:
        """The series capacitor(s) at `power_w` delivered to the device's input."""
        if self.capacitance_f is None:
            return []
        z_in = self._one(z_element_ohm, f_hz, self.capacitance_f)
        if not z_in.real > 0:
            return []
        current = math.sqrt(power_w / z_in.real)
        x_each = 1 / (2 * math.pi * f_hz * self.capacitance_f)
        count = 1 if self.kind == "gamma" else 2
        names = ([f"{self.element} gamma capacitor"] if count == 1 else
                 [f"{self.element} T capacitor {n}" for n in (1, 2)])
        return [LoadFigures(name, self.element, self.capacitance_f, self.solved,
                            complex(0.0, -x_each), current, current * x_each,
                            current * x_each * math.sqrt(2), 0.0, None) for name in names]


def line_match(elements: Sequence[Any]) -> LineMatch | None:
    """The gamma or T match on one of `elements` (ElectricalInputs), if any."""
    for e in elements:
        m: MatchSpec | None = e.spec.match
        if m is None or not m.line_modelled or e.spec.part_of is not None:
            continue
        rod = m.stock if m.stock is not None else e.stock
        return LineMatch(e.name, m.kind, m.length_mm, m.spacing_mm or 0.0,
                         rod.profile.outer_diameter_mm, e.stock.profile.outer_diameter_mm,
                         m.capacitance_f)
    return None


class Through:
    """A model seen through a device: the sweep's impedances are at the device's input."""

    def __init__(self, model: Any, device: LineMatch) -> None:
        self.model = model
        self.device = device
        self.unknowns = model.unknowns

    def sweep(self, f_hz: np.ndarray) -> np.ndarray:
        return self.device.transform(self.model.sweep(f_hz), f_hz)

    def impedance(self, f_hz: float) -> complex:
        return complex(self.device.transform(self.model.impedance(f_hz), f_hz)[0])

    def solve(self, f_hz: float) -> Any:
        return self.model.solve(f_hz)
