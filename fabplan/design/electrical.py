"""The design file's `[electrical]` table -> `ElectricalSettings`.

```toml
[electrical]
target = "440 MHz"                   # where least SWR (or resonance) should fall
sweep = { from = "420 MHz", to = "460 MHz", step = "0.5 MHz" }   # default: target +-10 %
reference_impedance = 200            # ohm; SWR at the terminals (default: the matching's)
tune_for = "least-swr"               # or "resonance" (reactance zero at the terminals)
ground = "free-space"                # or "perfect" with ground_height
# ground_height = "2 m"              # perfect ground plane this far below the element's plane
# resistivity = 1.72e-8              # ohm m, overrides the stock material's
# perfect_conductor = true           # no conductor loss
# power = "50 W"                     # transmitter power, for the RF exposure caution
# band = { from = "14.0 MHz", to = "14.35 MHz" }   # a tuned loop: the range it must cover

[electrical.matching]
kind = "coax-balun"                  # "none", "transformer" or "coax-balun"
system_impedance = 50                # ohm, the radio's and feed line's
# ratio = 4                          # transformer only: impedance ratio n:1
cable_impedance = 50                 # coax-balun: the loop's cable (ohm)
velocity_factor = 0.66
loss_db_per_100ft = 4.0              # or loss_db_per_100m; matched loss at loss_frequency
loss_frequency = "100 MHz"
# half_wave_at = "440 MHz"           # loop's half-wave frequency (default: the target)

[electrical.feed_line]                # optional
length = "10 m"
impedance = 50
velocity_factor = 0.66
loss_db_per_100m = 13.0
loss_frequency = "100 MHz"
```

A real-ground model is not implemented: "free-space" or a perfect ground only.
Frequencies in Hz, impedances in ohm, lengths in mm, power in W.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Literal

import numpy as np

from ..errors import DesignError
from ..feed import CoaxBalun, Direct, Line, MatchChain, Matching, Transformer, db_per_m
from ..section import Section
from ..units import parse_power

__all__ = ["ElectricalSettings", "read_electrical", "sweep_frequencies", "GROUNDS", "TUNE_FOR",
           "MAX_SWEEP_POINTS", "check_sweep"]

GroundKind = Literal["free-space", "perfect"]
GROUNDS: tuple[GroundKind, ...] = ("free-space", "perfect")
TuneFor = Literal["least-swr", "resonance"]
TUNE_FOR: tuple[TuneFor, ...] = ("least-swr", "resonance")
MATCHING_KINDS = ("none", "transformer", "coax-balun")
MAX_SWEEP_POINTS = 2001
DEFAULT_SPAN = 0.10  # sweep target +-10 % when no sweep is given
DEFAULT_POINTS = 81


@dataclass(frozen=True)
class ElectricalSettings:
    """What the electrical check is asked to do. Hz, ohm, mm, ohm m, W."""

    target_hz: float | None
    sweep_from_hz: float
    sweep_to_hz: float
    sweep_step_hz: float
    chain: MatchChain
    tune_for: TuneFor = "least-swr"
    ground: GroundKind = "free-space"
    ground_height_mm: float | None = None
    resistivity_ohm_m: float | None = None  # override of the material's
    perfect_conductor: bool = False
    power_w: float | None = None
    band_hz: tuple[float, float] | None = None  # a capacitor-tuned loop must cover this

    @property
    def reference_ohm(self) -> float:
        return self.chain.reference_ohm

    def frequencies(self) -> np.ndarray:
        return sweep_frequencies(self.sweep_from_hz, self.sweep_to_hz, self.sweep_step_hz)

    def ground_z_mm(self) -> float | None:
        """The ground plane's z (mm) under an element drawn in the z = 0 plane."""
        return None if self.ground == "free-space" else -float(self.ground_height_mm or 0.0)

    def ground_text(self) -> str:
        if self.ground == "free-space":
            return "free space (no ground); a real-ground model is not implemented"
        return (f"perfect ground plane {(self.ground_height_mm or 0.0) / 1000:.3f} m below the "
                "element's "
                "plane (image theory); a real (lossy) ground is not modelled")


def sweep_frequencies(f_from: float, f_to: float, step: float) -> np.ndarray:
    """Frequencies from `f_from` to `f_to` (Hz) every `step` (Hz), both ends included."""
    n = int(math.floor((f_to - f_from) / step * (1 + 1e-12))) + 1
    freqs = f_from + step * np.arange(n)
    if f_to - freqs[-1] > 1e-9 * f_to:
        freqs = np.append(freqs, f_to)
    return freqs


def check_sweep(f_from: float, f_to: float, step: float, field: str = "electrical.sweep") -> None:
    """Raise DesignError unless the sweep is ordered and of a sane size."""
    if f_to <= f_from:
        raise DesignError(f"'to' ({f_to / 1e6:g} MHz) must be above 'from' ({f_from / 1e6:g} MHz)",
                          field=field)
    points = (f_to - f_from) / step + 1
    if points > MAX_SWEEP_POINTS:
        raise DesignError(f"{points:.0f} points is more than {MAX_SWEEP_POINTS}: use a larger step",
                          field=field)
    if points < 3:
        raise DesignError("gives fewer than 3 points: use a smaller step", field=field)


def _impedance(sec: Section, key: str, default: float | None = None) -> Any:
    return sec.number(key, default, low=0.0, low_open=True, high=1e6)


def _loss(sec: Section) -> tuple[float, float]:
    """(dB per metre, reference frequency Hz) from loss_db_per_100ft / _100m."""
    given = [k for k in ("loss_db_per_100ft", "loss_db_per_100m") if sec.has(k)]
    sec.mark_used("loss_db_per_100ft", "loss_db_per_100m")
    if len(given) > 1:
        raise DesignError("give loss_db_per_100ft or loss_db_per_100m, not both", field=sec.path)
    ref = sec.frequency("loss_frequency", None)
    if not given:
        if ref is not None:
            raise DesignError("loss_frequency needs loss_db_per_100ft or loss_db_per_100m",
                              field=sec.field("loss_frequency"))
        return 0.0, 100e6
    key = given[0]
    loss = sec.number(key, low=0.0, high=1000.0)
    if ref is None and loss > 0:
        raise DesignError("give loss_frequency: the frequency the loss figure is quoted at "
                          "(it scales with the square root of frequency)",
                          field=sec.field("loss_frequency"))
    return db_per_m(loss, "100ft" if key.endswith("ft") else "100m"), ref or 100e6


def _velocity_factor(sec: Section, default: float | None = None) -> Any:
    return sec.number("velocity_factor", default, low=0.0, low_open=True, high=1.0)


def _read_matching(sec: Section | None,
                   target: float | None) -> tuple[Matching, float | None]:
    if sec is None:
        return Direct(), None
    kind = sec.string("kind", choices=MATCHING_KINDS)
    system = _impedance(sec, "system_impedance", 50.0)
    matching: Matching
    if kind == "none":
        matching = Direct()
    elif kind == "transformer":
        matching = Transformer(sec.number("ratio", 4.0, low=0.0, low_open=True, high=1000.0))
    else:
        half = sec.frequency("half_wave_at", target)
        if half is None:
            raise DesignError("give half_wave_at (the loop's half-wave frequency) or a target",
                              field=sec.field("half_wave_at"))
        loss, ref = _loss(sec)
        matching = CoaxBalun(_impedance(sec, "cable_impedance", system),
                             _velocity_factor(sec, 0.66), half, loss, ref)
    sec.finish()
    return matching, system


FEED_LINE_MAX_MM = 1_000_000.0  # 1 km


def _read_feed_line(sec: Section | None) -> Line | None:
    if sec is None:
        return None
    length = sec.length("length", max_mm=FEED_LINE_MAX_MM,
                        bound="a feed line up to 1 km (the loss model covers it)")
    z0 = _impedance(sec, "impedance", 50.0)
    vf = _velocity_factor(sec)
    loss, ref = _loss(sec)
    sec.finish()
    return Line(z0, vf, length, loss, ref)


def _read_sweep(sec: Section, target: float | None) -> tuple[float, float, float]:
    sw = sec.table("sweep", None)
    if sw is None:
        if target is None:
            raise DesignError("give a target frequency or a sweep = { from, to, step }",
                              field=sec.path)
        lo, hi = target * (1 - DEFAULT_SPAN), target * (1 + DEFAULT_SPAN)
        return lo, hi, (hi - lo) / (DEFAULT_POINTS - 1)
    lo, hi = sw.frequency("from"), sw.frequency("to")
    # a small tuned loop's band may be a few kHz wide: steps down to 1 Hz
    step = sw.frequency("step", (hi - lo) / (DEFAULT_POINTS - 1) if hi > lo else 1.0,
                        low_hz=1.0)
    sw.finish()
    check_sweep(lo, hi, step, sw.path)
    return lo, hi, step


def read_electrical(top: Section) -> ElectricalSettings | None:
    """Read `[electrical]` (None when the design has no such table)."""
    sec = top.table("electrical", None)
    if sec is None:
        return None
    target = sec.frequency("target", None)
    lo, hi, step = _read_sweep(sec, target)
    matching, system = _read_matching(sec.table("matching", None), target)
    feed = _read_feed_line(sec.table("feed_line", None))
    expected = matching.ratio * system if system is not None else 50.0
    reference = _impedance(sec, "reference_impedance", expected)
    if system is None:
        system = feed.z0_ohm if feed is not None else reference
    tune_for = sec.string("tune_for", "least-swr", choices=TUNE_FOR)
    ground = sec.string("ground", "free-space", choices=GROUNDS)
    height = sec.length("ground_height", None)
    if ground == "perfect" and height is None:
        raise DesignError("give ground_height: how far the perfect ground plane lies below the "
                          "element's plane", field=sec.field("ground_height"))
    if ground == "free-space" and height is not None:
        raise DesignError('ground_height needs ground = "perfect" (a real-ground model is not '
                          'implemented)', field=sec.field("ground_height"))
    rho = sec.number("resistivity", None, low=0.0, low_open=True, high=1e-3)
    perfect = sec.boolean("perfect_conductor", False)
    if perfect and rho is not None:
        raise DesignError("give resistivity or perfect_conductor = true, not both",
                          field=sec.field("resistivity"))
    power = sec.raw("power", None)
    power_w = None if power is None else parse_power(power, sec.field("power"))
    band = _read_band(sec.table("band", None))
    sec.finish()
    chain = MatchChain(reference, system, matching, feed)
    return ElectricalSettings(target, lo, hi, step, chain, tune_for, ground, height, rho, perfect,
                              power_w, band)


def _read_band(sec: Section | None) -> tuple[float, float] | None:
    """`band = { from, to }`: the frequencies a capacitor-tuned loop must cover (Hz)."""
    if sec is None:
        return None
    lo, hi = sec.frequency("from"), sec.frequency("to")
    sec.finish()
    if hi <= lo:
        raise DesignError(f"'to' ({hi / 1e6:g} MHz) must be above 'from' ({lo / 1e6:g} MHz)",
                          field=sec.path)
    if hi > 2 * lo:
        raise DesignError("a tuned loop covers at most an octave: split the band",
                          field=sec.path, value=f"{lo / 1e6:g}-{hi / 1e6:g} MHz")
    return lo, hi
