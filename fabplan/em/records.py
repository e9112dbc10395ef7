"""What the electrical stage adds to the Plan (the interface the build sheet and
the JSON and text reports read). Frequencies in hertz, impedances in ohms,
lengths in millimetres.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from ..measure.analysis import Band

__all__ = ["SweepResult", "ElementElectrical", "PlanElectrical", "UNCERTAINTY_FRAC", "PatternCut",
           "FarFieldFigures", "BandFigures", "LoadFigures", "WirePicture", "StructureElectrical",
           "LoopBandPoint", "LoopFigures", "HelixFigures"]

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
    # a circularly polarised antenna (a helix, axial ratio <= 10 dB): the gain towards
    # the zenith (+z), and at `low_elevation_deg` above the horizon averaged over the
    # azimuth (dBi); the axial ratio (dB) and sense towards the zenith
    gain_zenith_dbi: float | None = None
    gain_low_dbi: float | None = None
    low_elevation_deg: float | None = None
    axial_ratio_zenith_db: float | None = None
    polarisation_zenith: str | None = None


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
    loop: LoopFigures | None = None  # a capacitor-tuned loop (fabplan.em.loop)
    helix: HelixFigures | None = None  # two loops fed in parallel (a quadrifilar helix)


@dataclass(frozen=True)
class LoopBandPoint:
    """A capacitor-tuned loop retuned to `f_hz` (the model solves the capacitor for
    X = 0 at the feed there): the capacitance (F), the capacitor's RMS and peak
    voltage (V) and current (A RMS) at the design power, the efficiency, the feed's
    impedance (ohm) and SWR through the matching."""

    f_hz: float
    capacitance_f: float
    capacitor_v_rms: float
    capacitor_v_peak: float
    current_a_rms: float
    efficiency: float
    feed_z_ohm: complex
    swr: float


@dataclass(frozen=True)
class LoopFigures:
    """A small transmitting loop tuned by a capacitor, at the design frequency and
    power: the published small-loop formulas (`*_formula_*`, None where the loop is
    not small enough for them) beside the method-of-moments model (`*_model_*`: the
    loop alone, its gap driven), the losses referred to the loop current (ohm), the
    tuning, Q and bandwidth of the assembled antenna, the capacitor's range across
    `[electrical] band`, its voltage and current, and the coupling loop's check.
    H, ohm, F, V, A, Hz, mm."""

    element: str  # the loop with the capacitor
    coupling: tuple[str, ...]  # the fed elements (the coupling loop)
    f_hz: float
    power_w: float
    circumference_wl: float
    inductance_model_h: float  # X / omega of the loop alone (self-capacitance included)
    inductance_formula_h: float | None  # Grover: ring or polygon
    radiation_resistance_model_ohm: float
    radiation_resistance_formula_ohm: float | None  # Balanis: 320 pi^4 (A / lambda^2)^2
    conductor_loss_model_ohm: float
    conductor_loss_formula_ohm: float | None  # skin effect: R_s l / (pi d)
    joint_loss_ohm: float
    joints: int
    capacitor_loss_ohm: float
    total_resistance_ohm: float  # everything the input power goes to, per capacitor current
    efficiency: float  # radiated / input power, the assembled antenna (model)
    efficiency_formula: float | None
    reactance_ohm: float  # the capacitor's reactance at resonance
    q_unloaded: float
    q_loaded: float  # matched: half the unloaded Q
    bandwidth_hz: float  # half-power bandwidth when matched: f / q_loaded
    bandwidth_swr2_hz: float  # SWR 2 bandwidth when matched (Yaghjian & Best)
    capacitance_f: float  # at the design frequency: solved, or the design's
    solved: bool
    capacitance_formula_f: float | None  # 1 / (omega^2 L) with Grover's L
    capacitance_range_f: tuple[float, float] | None  # across [electrical] band
    band: tuple[LoopBandPoint, ...]
    capacitor_v_rms: float
    capacitor_v_peak: float
    current_a_rms: float
    capacitor_v_peak_max: float  # the worst at the design frequency and across the band
    capacitor_v_peak_max_hz: float
    rating_v: float | None
    coupling_rule_diameter_mm: float
    coupling_rule_basis: str
    coupling_diameter_mm: float | None  # as drawn (equal-perimeter circle)
    feed_z_ohm: complex
    feed_swr: float  # at the design frequency, through the matching
    notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class HelixFigures:
    """Two loops fed in parallel (a quadrifilar helix) at the design frequency and
    power: each loop's gap current (A RMS) and the phase by which the second
    (small) loop's current leads the first's (deg; self-phasing wants +90)."""

    element: str
    loops: tuple[str, str]
    current_a_rms: tuple[float, float]
    phase_deg: float
