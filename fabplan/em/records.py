"""What the electrical stage adds to the Plan (the interface the build sheet and
the JSON and text reports read). Frequencies in hertz, impedances in ohms,
lengths in millimetres.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from ..measure.analysis import Band

__all__ = ["SweepResult", "ElementElectrical", "PlanElectrical", "UNCERTAINTY_FRAC", "PatternCut",
           "FarFieldFigures", "BandFigures", "LoadFigures", "WirePicture", "StructureElectrical"]

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
    structure: int = 0  # index into PlanElectrical.structures: the model it was part of


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
    structures: tuple[StructureElectrical, ...] = ()  # each group of elements modelled together


@dataclass(frozen=True)
class PatternCut:
    """One principal-plane cut of the pattern: angles (deg) and gain (dBi; None in a
    null or below the ground). `fixed_deg`: the elevation of an azimuth cut, the
    azimuth of an elevation cut."""

    plane: str  # "azimuth" or "elevation"
    fixed_deg: float
    angle_deg: tuple[float, ...]
    gain_dbi: tuple[float | None, ...]


@dataclass(frozen=True)
class FarFieldFigures:
    """The radiated field of the whole structure at one frequency (gain includes the
    conductor and load losses)."""

    f_hz: float
    gain_dbi: float  # at the maximum
    directivity_dbi: float
    efficiency: float  # radiated / input power, from the far-field integral
    max_theta_deg: float  # direction of the maximum: theta from +z
    max_phi_deg: float  # phi from +x
    front_to_back_db: float | None
    front_to_rear_db: float | None
    beamwidth_h_deg: float | None  # half power, horizontal plane through the maximum
    beamwidth_v_deg: float | None  # ... vertical plane
    axial_ratio_db: float | None  # towards the maximum; None for a linear field
    polarisation: str  # "linear", "right" or "left" (IEEE Std 145 sense), "elliptical ..."
    power_balance_error: float  # (P_in - P_loss - P_rad) / P_in
    azimuth: PatternCut
    elevation: PatternCut


@dataclass(frozen=True)
class BandFigures:
    """The structure's forward gain and front-to-back at each sweep frequency, in the
    forward and back directions of the pattern at the design frequency (a rational
    fit through the solves)."""

    freq_hz: tuple[float, ...]
    gain_dbi: tuple[float | None, ...]
    front_to_back_db: tuple[float | None, ...]
    # half-power beamwidths about the same forward direction (deg), interpolated between
    # the frequencies that were solved (None where a half-power edge is not found)
    beamwidth_h_deg: tuple[float | None, ...] = ()
    beamwidth_v_deg: tuple[float | None, ...] = ()


@dataclass(frozen=True)
class LoadFigures:
    """A capacitor (or other load) in a gap at the design frequency and power: its
    value (F; solved when tuned), the RMS and peak voltage across it (V), the RMS
    current through it (A), the power it dissipates (W), and its rating (V peak)."""

    name: str
    element: str
    capacitance_f: float | None
    solved: bool
    impedance_ohm: complex
    current_a_rms: float
    voltage_v_rms: float
    voltage_v_peak: float
    power_w: float
    rating_v: float | None


@dataclass(frozen=True)
class WirePicture:
    """A conductor as modelled, for the picture on the sheet: its centreline in the
    structure's frame (mm) and the element it belongs to."""

    element: str
    points_mm: tuple[tuple[float, float, float], ...]


@dataclass(frozen=True)
class StructureElectrical:
    """The electrical check of everything modelled together: which elements, the
    far field and the band figures, the loads and currents at the design power, and
    what was modelled (for the picture)."""

    elements: tuple[str, ...]
    fed: tuple[str, ...]  # elements with a port
    unknowns: int
    f_hz: float  # the design frequency (target, or the sweep's centre)
    power_w: float  # the power the near-field figures are for
    power_stated: bool  # the design gives it (else a default)
    far_field: FarFieldFigures | None
    band: BandFigures | None
    loads: tuple[LoadFigures, ...]
    max_current_a_rms: float
    efficiency: float
    wires: tuple[WirePicture, ...]
    feed_points_mm: tuple[tuple[float, float, float], ...]
    load_points_mm: tuple[tuple[float, float, float], ...]
    ground_z_mm: float | None
    solves: int  # full solves the sweep needed (rational fit)
