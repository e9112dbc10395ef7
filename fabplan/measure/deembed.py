"""De-embedding: move a measured sweep from the analyser's port to the element.

What lies between the analyser and the element is a list of `Stage`s, listed
from the analyser outward (a feed line, then the matching device). Each stage
is a linear two-port given by its chain (ABCD) parameters at each frequency,
port 1 toward the analyser and port 2 toward the element, so that the
impedance seen at port 1 with a load Z_L on port 2 is

    Z_in = (A Z_L + B) / (C Z_L + D)

and the load that gives a measured Z_in is its inverse

    Z_L = (D Z_in - B) / (A - C Z_in)

(source: Pozar, Microwave Engineering, 4th ed., sec. 4.4, the ABCD matrix;
the inverse is this equation solved for Z_L and needs no reciprocity).

- `feed_line`: a uniform lossy line, characteristic impedance Z0 (taken as
  real), velocity factor, physical length (mm) and matched loss (dB per metre)
  at a reference frequency. The loss is taken to scale with sqrt(f): conductor
  (skin-effect) loss dominating, as it does in coaxial cable at HF to UHF;
  dielectric loss, which grows with f, is neglected (an assumption, stated
  wherever the line is described). The line's ABCD is cosh(gamma l),
  Z0 sinh(gamma l), sinh(gamma l) / Z0, cosh(gamma l) with gamma = alpha + j
  beta (fabplan.feed.Line computes it, so model and measurement use one
  formula); its Z_in equals Pozar's terminated lossy line,
  Z_in = Z0 (Z_L + Z0 tanh(gamma l)) / (Z0 + Z_L tanh(gamma l)) (Pozar,
  sec. 2.7).
- `transformer`: an ideal n:1 impedance transformer (element side : analyser
  side), A = 1/sqrt(n), D = sqrt(n), B = C = 0.
- `two_port`: any two-port given as a function of frequency returning ABCD.
- `from_transform`: any linear two-port given the way fabplan.feed
  models a matching device, as a function (element impedance, frequency) ->
  impedance at the analyser side. The impedance a linear two-port presents is
  a bilinear (Moebius) function of its load, fixed by three values; the
  function is evaluated at three loads per frequency, the coefficients found
  as the null space of a 3 x 4 system, and checked at a fourth load (so a
  function that is not a linear two-port is refused). `from_matching` turns
  the em package's Direct, Transformer and CoaxBalun into stages this way.

A sweep without phase (SWR or return loss only) can pass two kinds of stage
exactly: a feed line whose Z0 equals the sweep's reference (|Gamma| at the
load is |Gamma| at the input times exp(2 alpha l): Pozar, sec. 2.7, the
reflection coefficient along a lossy line, Gamma(l) = Gamma_L exp(-2 gamma
l)), and an ideal transformer (the SWR against Z0 on the analyser side is the
SWR against n Z0 on the element side). Anything else needs the phase and is
refused with the reason.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np
import numpy.typing as npt

from ..errors import DesignError, Finding
from ..feed import CoaxBalun, Direct, Line, Transformer
from .sweep import (
    ComplexArray,
    FloatArray,
    MeasuredSweep,
    gamma_from_z,
    sweep_from_gamma_mag,
    sweep_from_s11,
)

__all__ = [
    "ABCD",
    "FEED_LINE_ASSUMPTION",
    "MAX_LINE_LENGTH_MM",
    "ABCDFunction",
    "Deembedded",
    "ImpedanceTransform",
    "Stage",
    "StageKind",
    "deembed",
    "embed",
    "feed_line",
    "from_matching",
    "from_transform",
    "line_stage",
    "transformer",
    "two_port",
]

MAX_LINE_LENGTH_MM = 1_000_000.0  # 1 km: a bound on the feed line a builder measures through
FEED_LINE_ASSUMPTION = ("matched loss scaled with sqrt(f) from the stated figure (conductor loss "
                        "dominating; dielectric loss neglected)")
StageKind = Literal["feed line", "matching", "two-port"]


@dataclass(frozen=True, eq=False)
class ABCD:
    """Chain parameters at each frequency; port 1 toward the analyser.

    a, d: dimensionless; b: ohm; c: siemens. Arrays of one length (or scalars
    broadcast against the impedances given).
    """

    a: ComplexArray
    b: ComplexArray
    c: ComplexArray
    d: ComplexArray

    def input_impedance(self, z_load_ohm: npt.ArrayLike) -> ComplexArray:
        """Impedance (ohm) at port 1 with `z_load_ohm` (ohm) on port 2."""
        z = np.asarray(z_load_ohm, dtype=np.complex128)
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.asarray((self.a * z + self.b) / (self.c * z + self.d), dtype=np.complex128)

    def load_impedance(self, z_in_ohm: npt.ArrayLike) -> ComplexArray:
        """The load (ohm) on port 2 that presents `z_in_ohm` (ohm) at port 1."""
        z = np.asarray(z_in_ohm, dtype=np.complex128)
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.asarray((self.d * z - self.b) / (self.a - self.c * z), dtype=np.complex128)


ABCDFunction = Callable[[FloatArray], ABCD]
ImpedanceTransform = Callable[[ComplexArray, FloatArray], ComplexArray]


@dataclass(frozen=True)
class Stage:
    """One thing between the analyser and the element.

    kind: "feed line", "matching" or "two-port"; description: plain words
    for reports; abcd: frequency (Hz) -> ABCD; ratio: nominal impedance ratio
    element side : analyser side (1 for a line, n for an n:1 transformer, 4 for
    a 4:1 balun), used to choose the reference of the de-embedded sweep;
    line: the feed line (for a sweep without phase), or None; ideal_ratio: True
    for an ideal transformer (passes a sweep without phase).
    """

    kind: StageKind
    description: str
    abcd: ABCDFunction
    ratio: float = 1.0
    line: Line | None = None
    ideal_ratio: bool = False


def _arr(x: object, n: int) -> ComplexArray:
    return np.broadcast_to(np.asarray(x, dtype=np.complex128), (n,)).copy()


def line_stage(line: Line) -> Stage:
    """A stage for a fabplan.feed.Line (the em package's feed line)."""
    if not (math.isfinite(line.z0_ohm) and line.z0_ohm > 0):
        raise DesignError("a line's characteristic impedance is a positive number of ohms",
                          field="z0_ohm", value=line.z0_ohm)
    if not (0 < line.velocity_factor <= 1):
        raise DesignError("a velocity factor lies between 0 (excluded) and 1",
                          field="velocity_factor", value=line.velocity_factor)
    if not (0 <= line.length_mm <= MAX_LINE_LENGTH_MM):
        raise DesignError(f"a feed line's length lies between 0 and {MAX_LINE_LENGTH_MM:g} mm",
                          field="length_mm", value=line.length_mm)
    if not (math.isfinite(line.loss_db_per_m) and line.loss_db_per_m >= 0):
        raise DesignError("a matched loss is a finite, non-negative number of dB per metre",
                          field="loss_db_per_m", value=line.loss_db_per_m)
    if not (math.isfinite(line.loss_ref_hz) and line.loss_ref_hz > 0):
        raise DesignError("the loss's reference frequency is a positive number of Hz",
                          field="loss_ref_hz", value=line.loss_ref_hz)

    def abcd(f_hz: FloatArray) -> ABCD:
        f = np.asarray(f_hz, dtype=np.float64)
        a, b, c, d = line.abcd(f)
        n = len(f)
        return ABCD(_arr(a, n), _arr(b, n), _arr(c, n), _arr(d, n))

    text = (f"{line.length_mm / 1000:.3f} m of {line.z0_ohm:g} ohm feed line (velocity factor "
            f"{line.velocity_factor:g}")
    if line.loss_db_per_m > 0:
        text += (f", {line.loss_db_per_m:g} dB/m at {line.loss_ref_hz / 1e6:g} MHz, "
                 + FEED_LINE_ASSUMPTION)
    return Stage("feed line", text + ")", abcd, 1.0, line)


def feed_line(z0_ohm: float, velocity_factor: float, length_mm: float,
              loss_db_per_m: float = 0.0, loss_ref_hz: float = 100e6) -> Stage:
    """A uniform feed line: characteristic impedance (ohm, real), velocity
    factor (0..1], physical length (mm), matched loss (dB/m) at `loss_ref_hz`
    (Hz), scaled with sqrt(f) (see FEED_LINE_ASSUMPTION)."""
    return line_stage(Line(z0_ohm, velocity_factor, length_mm, loss_db_per_m, loss_ref_hz))


def transformer(ratio: float) -> Stage:
    """An ideal `ratio`:1 impedance transformer (element side : analyser side)."""
    if not (math.isfinite(ratio) and ratio > 0):
        raise DesignError("a transformer's impedance ratio is a positive number",
                          field="ratio", value=ratio)
    root = math.sqrt(ratio)

    def abcd(f_hz: FloatArray) -> ABCD:
        n = len(np.asarray(f_hz))
        return ABCD(_arr(1 / root, n), _arr(0, n), _arr(0, n), _arr(root, n))

    return Stage("matching", f"ideal {ratio:g}:1 transformer", abcd, ratio, None, True)


def two_port(abcd: ABCDFunction, description: str, *, ratio: float = 1.0,
             kind: StageKind = "two-port") -> Stage:
    """Any two-port given as frequency (Hz) -> ABCD (port 1 toward the analyser)."""
    return Stage(kind, description, abcd, ratio)


_FIT_LOADS = np.array([0.3, 1 + 1j, 3 - 2j])  # times scale_ohm: three distinct loads
_CHECK_LOAD = 1.7 + 0.4j


def from_transform(transform: ImpedanceTransform, description: str, *, ratio: float = 1.0,
                   kind: StageKind = "matching", scale_ohm: float = 50.0) -> Stage:
    """A stage from a forward impedance function (element-side Z (ohm), f (Hz))
    -> analyser-side Z (ohm), as fabplan.feed's devices give it.

    The bilinear map is fitted per frequency from loads near `scale_ohm` and
    checked at a fourth; a function that is not a linear two-port's raises
    DesignError.
    """

    def abcd(f_hz: FloatArray) -> ABCD:
        f = np.asarray(f_hz, dtype=np.float64)
        n = len(f)
        zs = _FIT_LOADS  # normalised loads
        w = np.stack([np.asarray(transform(np.full(n, z * scale_ohm, dtype=np.complex128), f),
                                 dtype=np.complex128) / scale_ohm for z in zs], axis=1)
        m = np.empty((n, 3, 4), dtype=np.complex128)
        m[:, :, 0] = zs
        m[:, :, 1] = 1.0
        m[:, :, 2] = -zs * w
        m[:, :, 3] = -w
        if not np.all(np.isfinite(m)):
            raise DesignError("the matching function gave a non-finite impedance",
                              field="matching", value=description)
        _, _, vh = np.linalg.svd(m)
        v = vh[:, -1, :].conj()
        fit = ABCD(np.asarray(v[:, 0], dtype=np.complex128),
                   np.asarray(v[:, 1] * scale_ohm, dtype=np.complex128),
                   np.asarray(v[:, 2] / scale_ohm, dtype=np.complex128),
                   np.asarray(v[:, 3], dtype=np.complex128))
        zc = np.full(n, _CHECK_LOAD * scale_ohm, dtype=np.complex128)
        want = np.asarray(transform(zc, f), dtype=np.complex128)
        got = fit.input_impedance(zc)
        err = np.abs(got - want) / np.maximum(np.abs(want), scale_ohm)
        if not np.all(err < 1e-6):
            raise DesignError("the matching function is not a linear two-port's (its impedance "
                              "is not a bilinear function of the load)", field="matching",
                              value=description)
        return fit

    return Stage(kind, description, abcd, ratio)


def from_matching(device: Direct | Transformer | CoaxBalun) -> Stage | None:
    """A stage for a matching device of fabplan.feed (None for Direct)."""
    if isinstance(device, Direct):
        return None
    if isinstance(device, Transformer):
        return transformer(float(device.ratio))

    def forward(z: ComplexArray, f: FloatArray) -> ComplexArray:
        return np.asarray(device.transform(z, f), dtype=np.complex128)

    return from_transform(forward, device.describe(), ratio=float(device.ratio))


def embed(freq_hz: npt.ArrayLike, z_element_ohm: npt.ArrayLike, stages: Sequence[Stage]
          ) -> ComplexArray:
    """The impedance (ohm) the analyser sees for `z_element_ohm` (ohm) at the
    element, through `stages` (listed from the analyser outward)."""
    f = np.asarray(freq_hz, dtype=np.float64)
    z = np.asarray(z_element_ohm, dtype=np.complex128)
    for stage in reversed(stages):
        z = stage.abcd(f).input_impedance(z)
    return z


@dataclass(frozen=True)
class Deembedded:
    """A de-embedded sweep and what was done.

    sweep: the sweep at the new plane (its `plane` says where); removed: each
    stage's description, from the analyser outward; left: what the sweep
    still contains that was not removed; findings: problems seen in the result
    (code "measure-negative-resistance", "measure-loss-exceeds-measurement").
    """

    sweep: MeasuredSweep
    removed: tuple[str, ...]
    left: str
    findings: tuple[Finding, ...] = ()

    def describe(self) -> str:
        removed = "; ".join(self.removed) if self.removed else "nothing"
        return f"removed: {removed}. Now at the {self.sweep.plane}. Left in: {self.left}"


_ALWAYS_LEFT = ("connectors and adapters between the analyser's calibration plane and the first "
                "stage, the leads from the last stage to the element's terminals, and any "
                "current on the outside of a coaxial shield (not modelled)")


def _plane(stages: Sequence[Stage]) -> str:
    if not stages:
        return "analyser port"
    last = stages[-1]
    if last.kind == "matching":
        return "element terminals"
    if last.kind == "feed line":
        return "far end of the feed line"
    return f"far side of {last.description}"


def _left(stages: Sequence[Stage]) -> str:
    text = _ALWAYS_LEFT
    if not any(s.kind == "matching" for s in stages):
        text += "; no matching device was removed, so one that is fitted is still included"
    return text


def deembed(sweep: MeasuredSweep, stages: Sequence[Stage], *, z0_ohm: float | None = None
            ) -> Deembedded:
    """Remove `stages` (listed from the analyser outward) from `sweep`.

    z0_ohm: the reference (ohm) of the result; default: the sweep's reference
    times each stage's nominal ratio (50 ohm through a 4:1 device gives 200
    ohm). A sweep without phase passes only a feed line of the sweep's own
    impedance and ideal transformers (see the module docstring).
    """
    f = sweep.freq_hz
    src = sweep.source or None
    ratio = math.prod(s.ratio for s in stages)
    removed = tuple(s.description for s in stages)
    findings: list[Finding] = []
    if sweep.s11 is None:
        mag = np.array(sweep.gamma_mag, dtype=np.float64)
        ref = sweep.z0_ohm
        for s in stages:
            if s.ideal_ratio:
                ref *= s.ratio
            elif s.line is not None and math.isclose(s.line.z0_ohm, ref, rel_tol=1e-9):
                gl = np.asarray(s.line.gamma_l(f), dtype=np.complex128)
                mag = mag * np.exp(2 * gl.real)
            else:
                raise DesignError("removing this needs the phase of S11 (only a feed line of "
                                  "the sweep's own reference impedance and ideal transformers "
                                  "can be removed from a magnitude): " + sweep.phase_note,
                                  field="de-embedding", value=s.description, source=src)
        over = np.nonzero(mag > 1.0)[0]
        if len(over):
            findings.append(Finding(
                "measure-loss-exceeds-measurement", "warning",
                f"after removing the feed line's loss, |Gamma| exceeds 1 at {len(over)} of "
                f"{len(f)} frequencies (first at {f[over[0]] / 1e6:.3f} MHz): the stated loss "
                "or length is more than the measured return loss allows; check them"))
        if z0_ohm is not None and not math.isclose(z0_ohm, ref, rel_tol=1e-12):
            raise DesignError("a sweep without phase cannot be re-referenced: " + sweep.phase_note,
                              field="z0_ohm", value=z0_ohm, source=src)
        out = sweep_from_gamma_mag(f, mag, ref, plane=_plane(stages), source=sweep.source)
        return Deembedded(out, removed, _left(stages), tuple(findings))
    z = sweep.z_ohm
    if z is None or not np.all(np.isfinite(z)):
        raise DesignError("the measured impedance is infinite (S11 = 1, an open circuit) at some "
                          "frequency: it cannot be moved through a line", field="s11",
                          value="1", source=src)
    for s in stages:
        z = s.abcd(f).load_impedance(z)
        bad = np.nonzero(~np.isfinite(z))[0]
        if len(bad):
            raise DesignError("removing this gives an infinite impedance at "
                              f"{f[bad[0]] / 1e6:.6g} MHz", field="de-embedding",
                              value=s.description, source=src)
    neg = np.nonzero(z.real < -1e-9 * np.abs(z))[0]
    if len(neg):
        findings.append(Finding(
            "measure-negative-resistance", "warning",
            f"after de-embedding the resistance is negative at {len(neg)} of {len(f)} "
            f"frequencies (first at {f[neg[0]] / 1e6:.3f} MHz): the stated loss or length of "
            "what was removed is more than the measurement allows; check them"))
    ref = z0_ohm if z0_ohm is not None else sweep.z0_ohm * ratio
    out = sweep_from_s11(f, gamma_from_z(z, ref), ref, plane=_plane(stages), source=sweep.source)
    return Deembedded(out, removed, _left(stages), tuple(findings))
