"""What the electrical stage adds to the Plan (the interface the build sheet and
the JSON and text reports read). Frequencies in hertz, impedances in ohms,
lengths in millimetres.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from ..measure.analysis import Band

__all__ = ["SweepResult", "ElementElectrical", "PlanElectrical", "UNCERTAINTY_FRAC"]

# the stated uncertainty of a predicted frequency: about +-0.5 %, dominated by the
# terminal and feed geometry (how the feed gap and its connections are really made)
UNCERTAINTY_FRAC = 0.005


@dataclass(frozen=True)
class SweepResult:
    """One element's impedance over a frequency sweep, and what it means."""

    freq_hz: tuple[float, ...]
    z_ohm: tuple[complex, ...]  # at the element's terminals
    swr_terminals: tuple[float, ...]  # against `reference_ohm`
    swr_system: tuple[float, ...]  # through the matching (and feed line), against `system_ohm`
    reference_ohm: float
    system_ohm: float
    matching: str  # plain words: "ideal 4:1 transformer into 50 ohm", ...
    min_swr: float
    min_swr_hz: float
    resonance_hz: float | None  # reactance zero crossing, if any in the sweep
    bandwidth_hz: dict[str, float | None] = field(default_factory=dict)  # {"1.5": .., "2": ..}
    efficiency: float | None = None
    uncertainty_frac: float = UNCERTAINTY_FRAC
    # the SWR bands through the matching, "1.5" then "2": edges inside the sweep and which
    # edge lies beyond it (bandwidth_hz holds a width only when both edges are inside)
    bands: tuple[Band, ...] = ()


@dataclass(frozen=True)
class ElementElectrical:
    """The electrical check of one element as it will be bent."""

    target_hz: float | None
    sweep: SweepResult
    unknowns: int
    notes: tuple[str, ...] = ()
    least_swr_at_sweep_end: bool = False
    geometry: str = ""  # what was modelled, in words
    released_radii: bool = False  # the bends have their after-springback radii
    conductor_radius_mm: float | None = None
    tube_wall_mm: float | None = None
    resistivity_ohm_m: float | None = None  # None: a perfect conductor
    ground: str = "free-space"
    ground_height_mm: float | None = None


@dataclass(frozen=True)
class PlanElectrical:
    """Design-wide electrical figures: the matching's parts and the cautions."""

    matching: str
    ground: str
    real_ground_modelled: bool
    balun_loop_cut_length_mm: float | None
    balun_cable: str | None
    feed_line_loss_db: float | None  # matched loss at the target (or sweep centre)
    power_w: float | None
    cautions: tuple[str, ...]
    uncertainty_frac: float = UNCERTAINTY_FRAC
