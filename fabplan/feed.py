"""Feed lines, baluns and matching: from the element's terminals to the radio.

Pure functions of impedances (ohm) and frequencies (Hz); lengths in mm.

- `reflection` and `swr`: against a real reference impedance.
- `Line`: a uniform transmission line (characteristic impedance, velocity
  factor, length, matched loss in dB per metre at a reference frequency,
  scaling with the square root of frequency as conductor loss does).
- `Direct`, `Transformer` (ideal n:1 impedance ratio) and `CoaxBalun` (the
  half-wave coaxial loop that gives 4:1 only where the loop is an electrical
  half wave) turn the element's impedance into the one the feed line sees.
- `MatchChain`: reference impedance at the terminals, the matching device, an
  optional feed line and the system impedance the radio expects.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import ArrayLike

__all__ = ["C0_M_S", "NEPER_DB", "reflection", "swr", "Line", "Direct", "Transformer",
           "CoaxBalun", "Matching", "MatchChain", "db_per_m"]

C0_M_S = 299_792_458.0  # speed of light in vacuum (m/s), exact by definition (SI)
NEPER_DB = 20.0 / math.log(10.0)  # 1 Np = 8.686 dB
FT_M = 0.3048


def db_per_m(loss_db: float, per: str) -> float:
    """A cable's matched loss quoted per 100 ft or per 100 m, as dB per metre.

    `per` is "100ft" or "100m".
    """
    if per == "100ft":
        return loss_db / (100 * FT_M)
    if per == "100m":
        return loss_db / 100.0
    raise ValueError(f"unknown length basis {per!r}")


def reflection(z_ohm: ArrayLike, z0_ohm: float) -> Any:
    """Voltage reflection coefficient of `z_ohm` against a real `z0_ohm`."""
    z = np.asarray(z_ohm, dtype=complex)
    return (z - z0_ohm) / (z + z0_ohm)


def swr(z_ohm: ArrayLike, z0_ohm: float) -> Any:
    """Standing-wave ratio of `z_ohm` on a line of real impedance `z0_ohm`.

    Returns a float for a scalar input, an array otherwise; infinity where the
    load reflects everything (a pure reactance).
    """
    g = np.abs(reflection(z_ohm, z0_ohm))
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.where(g < 1 - 1e-12, (1 + g) / (1 - g), np.inf)
    return float(out) if np.ndim(out) == 0 else out


@dataclass(frozen=True)
class Line:
    """A uniform transmission line.

    z0_ohm: characteristic impedance (ohm, taken as real); velocity_factor:
    phase velocity / c (0..1]; length_mm: physical length (mm);
    loss_db_per_m: matched loss (dB/m) at `loss_ref_hz` (Hz), scaled with
    sqrt(f) (conductor loss dominating, as it does in coaxial cable at VHF/UHF).
    """

    z0_ohm: float
    velocity_factor: float
    length_mm: float
    loss_db_per_m: float = 0.0
    loss_ref_hz: float = 100e6

    def alpha_np_per_m(self, f_hz: ArrayLike) -> Any:
        """Attenuation constant (Np/m) at `f_hz`."""
        f = np.asarray(f_hz, dtype=float)
        return self.loss_db_per_m / NEPER_DB * np.sqrt(f / self.loss_ref_hz)

    def beta_rad_per_m(self, f_hz: ArrayLike) -> Any:
        """Phase constant (rad/m) at `f_hz`."""
        return 2 * math.pi * np.asarray(f_hz, dtype=float) / (C0_M_S * self.velocity_factor)

    def matched_loss_db(self, f_hz: ArrayLike) -> Any:
        """Loss (dB) of the whole line into a matched load at `f_hz`."""
        return self.alpha_np_per_m(f_hz) * NEPER_DB * self.length_mm / 1000.0

    def gamma_l(self, f_hz: ArrayLike) -> Any:
        """Complex propagation constant times length (dimensionless)."""
        ell = self.length_mm / 1000.0
        return (self.alpha_np_per_m(f_hz) + 1j * self.beta_rad_per_m(f_hz)) * ell

    def abcd(self, f_hz: ArrayLike) -> tuple[Any, Any, Any, Any]:
        """Chain (ABCD) parameters (A, B, C, D) at `f_hz`; B in ohm, C in S."""
        gl = self.gamma_l(f_hz)
        ch, sh = np.cosh(gl), np.sinh(gl)
        return ch, self.z0_ohm * sh, sh / self.z0_ohm, ch

    def input_impedance(self, z_load_ohm: ArrayLike, f_hz: ArrayLike) -> Any:
        """Impedance (ohm) looking into the line terminated by `z_load_ohm`."""
        a, b, c, d = self.abcd(f_hz)
        zl = np.asarray(z_load_ohm, dtype=complex)
        return (a * zl + b) / (c * zl + d)


@dataclass(frozen=True)
class Direct:
    """No matching device: the feed line connects straight to the terminals."""

    ratio: float = 1.0

    def transform(self, z_ohm: ArrayLike, f_hz: ArrayLike) -> Any:
        return np.asarray(z_ohm, dtype=complex)

    def describe(self) -> str:
        return "direct connection"


@dataclass(frozen=True)
class Transformer:
    """An ideal transformer of impedance ratio `ratio`:1 (element : feed side)."""

    ratio: float

    def transform(self, z_ohm: ArrayLike, f_hz: ArrayLike) -> Any:
        return np.asarray(z_ohm, dtype=complex) / self.ratio

    def describe(self) -> str:
        return f"ideal {self.ratio:g}:1 transformer"


@dataclass(frozen=True)
class CoaxBalun:
    """Half-wave coaxial loop balun (4:1 at the loop's half-wave frequency).

    The feed line's centre conductor goes to terminal A and to one end of a
    loop of coaxial cable; the loop's other centre conductor goes to terminal
    B; all shields are bonded. The element is a two-terminal load between A
    and B. The loop is a `Line` of characteristic impedance `z0_ohm`, velocity
    factor `velocity_factor`, matched loss `loss_db_per_m` (dB/m) at
    `loss_ref_hz`, cut to half an electrical wavelength at `half_wave_hz` (Hz).
    Currents on the outside of the shields are not modelled.
    """

    z0_ohm: float
    velocity_factor: float
    half_wave_hz: float
    loss_db_per_m: float = 0.0
    loss_ref_hz: float = 100e6
    ratio: float = 4.0

    @property
    def loop_length_mm(self) -> float:
        """Cut length of the loop (mm): half an electrical wavelength x velocity factor."""
        return C0_M_S / (2 * self.half_wave_hz) * self.velocity_factor * 1000.0

    @property
    def line(self) -> Line:
        return Line(self.z0_ohm, self.velocity_factor, self.loop_length_mm, self.loss_db_per_m,
                    self.loss_ref_hz)

    def transform(self, z_ohm: ArrayLike, f_hz: ArrayLike) -> Any:
        """Impedance (ohm) at the unbalanced input with the element `z_ohm` across A-B.

        Port 1 of the loop is at A (voltage V1), port 2 at B (V2, current I2
        out of the loop into B). The load carries (V2 - V1)/Z = I2 from B to A,
        so V2 = V1 + Z I2 and V1 = A V2 + B I2 give I2 = V1 (1 - A)/(A Z + B);
        the feed supplies the loop's input current plus the load's return:
        I = C V2 + D I2 - I2. For a lossless half wave (A = D = -1, B = C = 0)
        this is I = 4 V1 / Z: exactly Z/4.
        """
        a, b, c, d = self.line.abcd(f_hz)
        z = np.asarray(z_ohm, dtype=complex)
        i2 = (1 - a) / (a * z + b)  # per volt at A
        v2 = 1 + z * i2
        return 1.0 / (c * v2 + (d - 1) * i2)

    def describe(self) -> str:
        return (f"half-wave coaxial 4:1 balun ({self.z0_ohm:g} ohm cable, velocity factor "
                f"{self.velocity_factor:g}, half wave at {self.half_wave_hz / 1e6:.3f} MHz)")


Matching = Direct | Transformer | CoaxBalun


@dataclass(frozen=True)
class MatchChain:
    """Terminals -> matching device -> optional feed line -> radio.

    reference_ohm: SWR at the terminals is against this (ohm); system_ohm:
    the radio's (feed line's) impedance (ohm) that the SWR through the
    matching is computed against.
    """

    reference_ohm: float
    system_ohm: float
    matching: Matching = Direct()
    feed_line: Line | None = None

    def at_radio(self, z_ohm: ArrayLike, f_hz: ArrayLike) -> Any:
        """Impedance (ohm) seen at the radio end for the element's `z_ohm` at `f_hz`."""
        z = self.matching.transform(z_ohm, f_hz)
        if self.feed_line is not None:
            z = self.feed_line.input_impedance(z, f_hz)
        return z

    def swr_terminals(self, z_ohm: ArrayLike) -> Any:
        return swr(z_ohm, self.reference_ohm)

    def swr_system(self, z_ohm: ArrayLike, f_hz: ArrayLike) -> Any:
        return swr(self.at_radio(z_ohm, f_hz), self.system_ohm)

    def describe(self) -> str:
        text = f"{self.matching.describe()} into {self.system_ohm:g} ohm"
        if self.feed_line is not None:
            fl = self.feed_line
            text += (f", through {fl.length_mm / 1000:.2f} m of {fl.z0_ohm:g} ohm feed line "
                     f"(velocity factor {fl.velocity_factor:g})")
        return text
