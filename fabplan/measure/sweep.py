"""The measured sweep record, the reflection conversions, and the input bounds.

A `MeasuredSweep` holds sample frequencies (Hz) and what the analyser gave at
each: the complex reflection coefficient S11 against a real reference impedance
`z0_ohm` (from which the impedance follows), or only its magnitude (an SWR
analyser, or a CSV of SWR or return loss). Without phase the impedance, and so
the resonance (X = 0), cannot be found; `MeasuredSweep.phase_note` says so.

Conversions (source: Pozar, Microwave Engineering, 4th ed., sec. 2.3, the
terminated lossless line; equation numbers not cited):

- reflection coefficient  Gamma = (Z - Z0) / (Z + Z0),  Z = Z0 (1 + Gamma) / (1 - Gamma)
- standing-wave ratio     SWR = (1 + |Gamma|) / (1 - |Gamma|),  |Gamma| = (SWR - 1) / (SWR + 1)
- return loss             RL = -20 log10 |Gamma|  dB  (a positive figure for a passive load)

Every reader in this package is bounded: a text longer than `MAX_TEXT_CHARS`
characters (32 MiB) or `MAX_LINES` lines (1,000,000) is refused before any line
is split, and one holding more than `MAX_POINTS` frequencies (200,000) as soon
as the bound is passed, each with one `DesignError` line.
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np
import numpy.typing as npt

from ..errors import DesignError

__all__ = [
    "FREQUENCY_FACTORS",
    "FREQUENCY_UNITS",
    "MAX_LINES",
    "MAX_POINTS",
    "MAX_TEXT_CHARS",
    "MIN_POINTS",
    "ComplexArray",
    "FloatArray",
    "FrequencyUnit",
    "MeasuredSweep",
    "check_text",
    "check_text_size",
    "decode_sweep_bytes",
    "frequency_factor",
    "gamma_from_z",
    "gamma_mag_from_return_loss_db",
    "gamma_mag_from_swr",
    "return_loss_db_from_gamma_mag",
    "return_loss_db_from_swr",
    "sweep_from_gamma_mag",
    "sweep_from_impedance",
    "sweep_from_s11",
    "sweep_from_swr",
    "swr_from_gamma_mag",
    "swr_from_return_loss_db",
    "z_from_gamma",
]

FloatArray = npt.NDArray[np.float64]
ComplexArray = npt.NDArray[np.complex128]

FrequencyUnit = Literal["Hz", "kHz", "MHz", "GHz"]
FREQUENCY_UNITS: tuple[FrequencyUnit, ...] = ("Hz", "kHz", "MHz", "GHz")
FREQUENCY_FACTORS: dict[FrequencyUnit, float] = {"Hz": 1.0, "kHz": 1e3, "MHz": 1e6, "GHz": 1e9}

# The bounds every reader checks. A one-port Touchstone line is about 40-60
# characters, so 200,000 points is about 12 MB: MAX_TEXT_CHARS leaves room for
# comments and wide number formats. Inexpensive analysers give 101 to a few
# thousand points; laboratory analysers up to about 100,000 (common practice,
# no source).
MAX_TEXT_CHARS = 32 * 1024 * 1024
MAX_POINTS = 200_000
MAX_LINES = 1_000_000  # lines of any kind (data, comments, blank)
MIN_POINTS = 3  # a parabola through three points needs three

_NUMBER = re.compile(r"[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?\Z")
_SHOWN = 60  # characters of a bad value shown in an error line


def short(value: str) -> str:
    """A value as an error line shows it: at most `_SHOWN` characters."""
    return value if len(value) <= _SHOWN else value[:_SHOWN - 3] + "..."


def parse_number(token: str) -> float | None:
    """A finite decimal number (integer, decimal or exponent form), or None.

    Refuses "nan", "inf", hexadecimal, underscores and anything Python's
    float() accepts beyond plain decimal notation; refuses overflow to infinity.
    """
    if not _NUMBER.match(token):
        return None
    x = float(token)
    return x if math.isfinite(x) else None


def frequency_factor(unit: str, *, field: str = "frequency unit", source: str | None = None
                     ) -> float:
    """Hz per unit for "Hz", "kHz", "MHz" or "GHz" (any letter case)."""
    for name, factor in FREQUENCY_FACTORS.items():
        if unit.strip().lower() == name.lower():
            return factor
    raise DesignError("the frequency unit is one of Hz, kHz, MHz, GHz", field=field,
                      value=short(unit), source=source)


def check_text_size(n_chars: int, source: str) -> None:
    """Refuse a sweep text (or file, in bytes) longer than `MAX_TEXT_CHARS`.

    The command that reads a file calls this with the file's size before
    reading it; every reader calls it again with the text's length.
    """
    if n_chars > MAX_TEXT_CHARS:
        raise DesignError(f"a sweep file is at most {MAX_TEXT_CHARS // (1024 * 1024)} MiB "
                          f"({MAX_POINTS} frequencies): export fewer points or a narrower span",
                          field="size", value=f"{n_chars} bytes", source=source)


def check_text(text: str, source: str) -> None:
    """Refuse a text longer than `MAX_TEXT_CHARS` characters or `MAX_LINES`
    lines, counted before any line is split (every reader calls this first)."""
    check_text_size(len(text), source)
    n_lines = text.count("\n") + text.count("\r") - text.count("\r\n") + 1
    if n_lines > MAX_LINES:
        raise DesignError(f"a sweep file has at most {MAX_LINES} lines: export fewer points "
                          "or fewer comments", field="lines", value=n_lines, source=source)


def decode_sweep_bytes(data: bytes, source: str) -> str:
    """The text of a sweep file's bytes: size checked, a UTF-8 byte-order mark
    dropped, UTF-8 tried first and Latin-1 (which decodes any byte) after it.

    Touchstone files are ASCII (the specification, general syntax rules); some
    software writes a degree sign or an ohm sign in comments, which the
    readers accept inside comments only.
    """
    check_text_size(len(data), source)
    if data.startswith(b"\xef\xbb\xbf"):
        data = data[3:]
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError:
        return data.decode("latin-1")


# -- conversions -------------------------------------------------------------
def gamma_from_z(z_ohm: npt.ArrayLike, z0_ohm: float) -> ComplexArray:
    """Reflection coefficient of impedance `z_ohm` (ohm) against real `z0_ohm` (ohm)."""
    z = np.asarray(z_ohm, dtype=np.complex128)
    with np.errstate(divide="ignore", invalid="ignore"):
        g: ComplexArray = (z - z0_ohm) / (z + z0_ohm)
    return g


def z_from_gamma(gamma: npt.ArrayLike, z0_ohm: float) -> ComplexArray:
    """Impedance (ohm) of reflection coefficient `gamma` against real `z0_ohm` (ohm).

    Gamma = 1 (an open circuit) gives a non-finite value.
    """
    g = np.asarray(gamma, dtype=np.complex128)
    with np.errstate(divide="ignore", invalid="ignore"):
        z: ComplexArray = z0_ohm * (1 + g) / (1 - g)
    return z


def swr_from_gamma_mag(gamma_mag: npt.ArrayLike) -> FloatArray:
    """SWR of a reflection magnitude; infinity where |Gamma| >= 1."""
    m = np.asarray(gamma_mag, dtype=np.float64)
    with np.errstate(divide="ignore", invalid="ignore"):
        s = np.where(m < 1.0, (1.0 + m) / (1.0 - m), np.inf)
    return np.asarray(s, dtype=np.float64)


def gamma_mag_from_swr(swr: npt.ArrayLike) -> FloatArray:
    """|Gamma| of an SWR (>= 1); 1 for an infinite SWR."""
    s = np.asarray(swr, dtype=np.float64)
    with np.errstate(invalid="ignore"):
        m = np.where(np.isinf(s), 1.0, (s - 1.0) / (s + 1.0))
    return np.asarray(m, dtype=np.float64)


def return_loss_db_from_gamma_mag(gamma_mag: npt.ArrayLike) -> FloatArray:
    """Return loss (dB, positive) of a reflection magnitude; infinity for |Gamma| = 0."""
    m = np.asarray(gamma_mag, dtype=np.float64)
    with np.errstate(divide="ignore"):
        rl = -20.0 * np.log10(m)
    return np.asarray(rl, dtype=np.float64)


def gamma_mag_from_return_loss_db(rl_db: npt.ArrayLike) -> FloatArray:
    """|Gamma| of a return loss (dB)."""
    return np.asarray(10.0 ** (-np.asarray(rl_db, dtype=np.float64) / 20.0), dtype=np.float64)


def swr_from_return_loss_db(rl_db: npt.ArrayLike) -> FloatArray:
    """SWR of a return loss (dB)."""
    return swr_from_gamma_mag(gamma_mag_from_return_loss_db(rl_db))


def return_loss_db_from_swr(swr: npt.ArrayLike) -> FloatArray:
    """Return loss (dB) of an SWR."""
    return return_loss_db_from_gamma_mag(gamma_mag_from_swr(swr))


# -- the record ----------------------------------------------------------------
def _frozen(a: npt.NDArray[np.generic]) -> npt.NDArray[np.generic]:
    a = np.array(a, copy=True)
    a.flags.writeable = False
    return a


@dataclass(frozen=True, eq=False)
class MeasuredSweep:
    """One reflection sweep at one reference plane.

    freq_hz: sample frequencies (Hz), strictly increasing, >= 0.
    gamma_mag: |Gamma| against `z0_ohm` at each frequency (dimensionless, >= 0).
    s11: the complex reflection coefficient against `z0_ohm`, or None when the
        phase was not measured (SWR or return loss only).
    z0_ohm: the real reference impedance (ohm) S11 and SWR are against.
    plane: where the sweep applies, in words ("analyser port", or where
        de-embedding moved it).
    source: the file it came from ("" when built in code), for error lines.

    Arrays are read-only copies. Build it with `sweep_from_s11`,
    `sweep_from_impedance`, `sweep_from_swr` or `sweep_from_gamma_mag`.
    """

    freq_hz: FloatArray
    gamma_mag: FloatArray
    s11: ComplexArray | None
    z0_ohm: float
    plane: str = "analyser port"
    source: str = ""

    def __post_init__(self) -> None:
        src = self.source or None
        f = np.asarray(self.freq_hz, dtype=np.float64)
        m = np.asarray(self.gamma_mag, dtype=np.float64)
        if f.ndim != 1 or m.shape != f.shape:
            raise DesignError("frequencies and reflection values must be one-dimensional and "
                              "of equal length", field="sweep", value=f"{f.shape} and {m.shape}",
                              source=src)
        if len(f) < MIN_POINTS:
            raise DesignError(f"a sweep needs at least {MIN_POINTS} frequencies",
                              field="sweep", value=len(f), source=src)
        if len(f) > MAX_POINTS:
            raise DesignError(f"a sweep holds at most {MAX_POINTS} frequencies",
                              field="sweep", value=len(f), source=src)
        if not np.all(np.isfinite(f)) or np.any(f < 0):
            raise DesignError("frequencies must be finite and not negative",
                              field="freq_hz", value=float(f[~(np.isfinite(f) & (f >= 0))][0]),
                              source=src)
        bad = np.nonzero(np.diff(f) <= 0)[0]
        if len(bad):
            k = int(bad[0])
            raise DesignError("frequencies must increase from one point to the next",
                              field=f"freq_hz[{k + 1}]", value=float(f[k + 1]), source=src)
        if not (math.isfinite(self.z0_ohm) and self.z0_ohm > 0):
            raise DesignError("the reference impedance is a positive number of ohms",
                              field="z0_ohm", value=self.z0_ohm, source=src)
        if np.any(~np.isfinite(m)) or np.any(m < 0):
            raise DesignError("reflection magnitudes must be finite and not negative",
                              field="gamma_mag", value=float(m[~(np.isfinite(m) & (m >= 0))][0]),
                              source=src)
        object.__setattr__(self, "freq_hz", _frozen(f))
        object.__setattr__(self, "gamma_mag", _frozen(m))
        if self.s11 is not None:
            s = np.asarray(self.s11, dtype=np.complex128)
            if s.shape != f.shape or not np.all(np.isfinite(s)):
                raise DesignError("S11 must be finite and as long as the frequencies",
                                  field="s11", value=f"{s.shape}", source=src)
            object.__setattr__(self, "s11", _frozen(s))

    @property
    def n_points(self) -> int:
        return len(self.freq_hz)

    @property
    def has_phase(self) -> bool:
        """True when S11 (and so the impedance) is known, not only its magnitude."""
        return self.s11 is not None

    @property
    def phase_note(self) -> str:
        """Why the impedance is unknown, or "" when it is known."""
        if self.has_phase:
            return ""
        return ("only the reflection magnitude was measured (SWR or return loss), not its phase: "
                "the impedance, and so the resonance (X = 0), cannot be found; export S11 "
                "(Touchstone .s1p) or R and X from the analyser")

    @property
    def swr(self) -> FloatArray:
        """SWR against `z0_ohm` (infinity where |Gamma| >= 1)."""
        return swr_from_gamma_mag(self.gamma_mag)

    @property
    def return_loss_db(self) -> FloatArray:
        """Return loss (dB) against `z0_ohm`."""
        return return_loss_db_from_gamma_mag(self.gamma_mag)

    @property
    def z_ohm(self) -> ComplexArray | None:
        """Impedance (ohm) at the sweep's plane, or None without phase."""
        return None if self.s11 is None else z_from_gamma(self.s11, self.z0_ohm)

    def with_reference(self, z0_ohm: float) -> MeasuredSweep:
        """The same sweep with S11 and SWR against another real reference (ohm).

        Needs the phase: without it SWR against one reference says nothing
        exact about SWR against another.
        """
        z = self.z_ohm
        if z is None:
            raise DesignError("changing the reference impedance needs the phase of S11; "
                              + self.phase_note, field="z0_ohm", value=z0_ohm,
                              source=self.source or None)
        return sweep_from_impedance(self.freq_hz, z, z0_ohm, plane=self.plane,
                                    source=self.source)


def sweep_from_s11(freq_hz: npt.ArrayLike, s11: npt.ArrayLike, z0_ohm: float, *,
                   plane: str = "analyser port", source: str = "") -> MeasuredSweep:
    """A sweep of complex S11 (against `z0_ohm`, ohm) at `freq_hz` (Hz)."""
    s = np.asarray(s11, dtype=np.complex128)
    return MeasuredSweep(np.asarray(freq_hz, dtype=np.float64), np.abs(s), s, float(z0_ohm),
                         plane, source)


def sweep_from_impedance(freq_hz: npt.ArrayLike, z_ohm: npt.ArrayLike, z0_ohm: float, *,
                         plane: str = "analyser port", source: str = "") -> MeasuredSweep:
    """A sweep of complex impedance `z_ohm` (ohm), kept as S11 against `z0_ohm`."""
    z = np.asarray(z_ohm, dtype=np.complex128)
    if not np.all(np.isfinite(z)):
        raise DesignError("impedances must be finite", field="z_ohm",
                          value=str(z[~np.isfinite(z)][0]), source=source or None)
    return sweep_from_s11(freq_hz, gamma_from_z(z, z0_ohm), z0_ohm, plane=plane, source=source)


def sweep_from_swr(freq_hz: npt.ArrayLike, swr: npt.ArrayLike, z0_ohm: float, *,
                   plane: str = "analyser port", source: str = "") -> MeasuredSweep:
    """A sweep of SWR only (against `z0_ohm`, ohm): magnitude known, phase unknown."""
    s = np.asarray(swr, dtype=np.float64)
    low = np.nonzero(~(s >= 1.0))[0]
    if len(low):
        raise DesignError("an SWR is at least 1", field=f"swr[{int(low[0])}]",
                          value=float(s[low[0]]), source=source or None)
    return sweep_from_gamma_mag(freq_hz, gamma_mag_from_swr(s), z0_ohm, plane=plane,
                                source=source)


def sweep_from_gamma_mag(freq_hz: npt.ArrayLike, gamma_mag: npt.ArrayLike, z0_ohm: float, *,
                         plane: str = "analyser port", source: str = "") -> MeasuredSweep:
    """A sweep of |Gamma| only (against `z0_ohm`, ohm): phase unknown."""
    return MeasuredSweep(np.asarray(freq_hz, dtype=np.float64),
                         np.asarray(gamma_mag, dtype=np.float64), None, float(z0_ohm),
                         plane, source)


def as_float_array(values: Sequence[float] | npt.ArrayLike) -> FloatArray:
    return np.asarray(values, dtype=np.float64)
