"""Capacitor-tuned small transmitting loop: the published lumped-circuit formulas.

A single-turn loop (circle or regular polygon) of round conductor, a capacitor
across a gap, matched at resonance. Everything here is a closed form or a short
quadrature; the method-of-moments check lives in fabplan/em.

Units: lengths in mm, frequency in Hz, resistance and reactance in ohm,
inductance in H, capacitance in F, power in W, voltage in V, current in A.

Where the formulas hold: the loop must be electrically small, so that the current
is nearly the same all round it. Balanis calls a loop small when its
circumference C < lambda/10 [M]; fabplan accepts C <= 0.3 lambda and reports a
`small-loop-approximate` finding above 0.1 lambda (the radiation resistance and
the lumped inductance drift from the method-of-moments result as C grows; the
common advice to builders is to stay under about lambda/4 [P]). Above 0.3 lambda
the functions refuse: use the electrical model instead.

SOURCES (tags as in trade-notes.md: [S] read or published and quoted in this
session, [M] recalled from the named source, [P] common practice)
- Radiation resistance R_r = 320 pi^4 (A / lambda^2)^2 = 31171 (A / lambda^2)^2:
  Balanis, Antenna Theory, small circular loop (3rd ed. eq. 5-24) [M]; the
  coefficient follows from eta = 120 pi as (8/3) pi^3 eta, worked by hand in the
  tests. It depends on the area only, so it serves any small loop shape (Balanis
  notes this for small loops of any shape) [M].
- Circular loop inductance L = mu0 b (ln(8b/a) - 2) with the current on the
  conductor's surface (high frequency, skin depth << a), and ln(8b/a) - 1.75 with
  the current uniform over the cross-section (low frequency): Grover, Inductance
  Calculations (single circular turn of round wire) [M]. The difference, mu0 b/4,
  is exactly the internal inductance mu0/(8 pi) per unit length of a round wire
  times the length 2 pi b, so the -2 form applies to a transmitting loop at HF,
  where the skin depth is a few micrometres and no current flows inside the
  conductor. (Not the other way round: -1.75 is the uniform, low-frequency case.)
- Regular polygon inductance: Grover's method for polygons of straight round
  wire (Grover, Inductance Calculations, chapter on plane polygons; Rosa,
  "The self and mutual inductances of linear conductors", Bull. Bureau of
  Standards 4, 1908) [M]: the sum of the sides' self-inductances plus the mutual
  inductances of every pair of sides (Neumann's formula). Self-inductance of a
  straight side of length l, radius a (surface current) is the mutual inductance
  of two filaments l long at distance a:
      (mu0 / 2 pi) [l asinh(l/a) - sqrt(l^2 + a^2) + a];
  adjacent sides meeting at a corner use Grover's closed form for filaments
  meeting at a point,
      M = (mu0 / 2 pi) cos(eps) [l atanh(m / (l + R)) + m atanh(l / (m + R))],
  eps the angle between them, R the distance between their far ends [M];
  non-adjacent sides use Gauss-Legendre quadrature of Neumann's double integral.
  The tests check the result against the shape constants of Terman's
  single-turn formula L = 0.2 l (ln(2l/a) - theta) uH/m (Terman, Radio Engineers'
  Handbook, after Grover [M]) and the polygon's approach to the circle. The
  straight-side method counts the corners with the wire on its axis; its error is
  of first order in a/side at sharp corners (Dengler, "Self inductance of a wire
  loop as a curve integral", arXiv:1204.1486, abstract [S]).
- Conductor loss R = R_s l / (pi d), R_s = sqrt(pi f mu0 rho) (skin effect in a
  round conductor whose radius and wall are several skin depths; Ramo, Whinnery &
  Van Duzer, Fields and Waves in Communication Electronics [M]); the proximity
  effect of a single turn is small and not included [M, trade-notes.md].
- Tuning C = 1 / (omega X_L); current I = sqrt(P / R_total); capacitor voltage
  V = I X = X sqrt(P / R_total) (RMS), peak sqrt(2) V; unloaded Q = X / R_total;
  loaded Q = X / (2 R_total) when matched; half-power bandwidth f / Q_loaded:
  the series resonant circuit (any circuit-theory text) [S].
- Matched SWR bandwidth FBW = (s - 1) / (Q sqrt(s)): Yaghjian & Best,
  "Impedance, bandwidth, and Q of antennas", IEEE Trans. Antennas Propag. 53(4),
  2005 [M]; for s = 5.83 it equals the half-power bandwidth 2/Q (checked in the
  tests).
- Loop self-capacitance: no published estimate was read in this session, so
  the caller may pass `self_capacitance_f` (measured, or from the electrical
  model); it defaults to zero, which overstates the capacitor needed.
- Coupling loop diameter about 1/5 of the main loop's: common practice, no
  source [P]; check it with the electrical model.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

import numpy as np

from ..errors import DesignError, Finding
from .common import (
    ETA0_OHM,
    MU0_H_PER_M,
    require_positive,
    require_range,
    wavelength_mm,
)

__all__ = [
    "CurrentDistribution", "LoopGeometry", "LoopPoint", "BandTuning", "CouplingLoop",
    "SMALL_LOOP_LIMIT_WL", "SMALL_LOOP_MAX_WL", "RADIATION_COEFFICIENT",
    "radiation_resistance_ohm", "circle_inductance_h", "polygon_inductance_h",
    "loop_inductance_h", "straight_wire_inductance_h", "corner_mutual_inductance_h",
    "surface_resistance_ohm", "skin_depth_mm", "conductor_loss_ohm", "small_loop_findings",
    "analyse_loop", "tune_band", "coupling_loop",
]

CurrentDistribution = Literal["surface", "uniform"]

# (8/3) pi^3 eta0 with eta0 = 120 pi: 320 pi^4 = 31170.9 (Balanis rounds it to 31171)
RADIATION_COEFFICIENT = (8.0 / 3.0) * math.pi ** 3 * ETA0_OHM
SMALL_LOOP_LIMIT_WL = 0.1  # Balanis's "electrically small" circumference [M]
SMALL_LOOP_MAX_WL = 0.3  # beyond this fabplan refuses the lumped formulas
_GAUSS_NODES = 24


@dataclass(frozen=True)
class LoopGeometry:
    """A single-turn loop: circle (`sides` = 0) or regular polygon of `sides` sides.

    `perimeter_mm` is the conductor's centreline length around the loop (the
    capacitor gap ignored); `conductor_diameter_mm` the outside diameter of the
    wire or tube. Build it with `circle`, `polygon` or `with_perimeter`.
    """

    sides: int
    perimeter_mm: float
    conductor_diameter_mm: float

    def __post_init__(self) -> None:
        if self.sides != 0 and self.sides < 3:
            raise DesignError("a loop is a circle (0 sides) or a polygon of 3 or more sides",
                              field="sides", value=self.sides)
        require_positive("perimeter_mm", self.perimeter_mm)
        require_positive("conductor_diameter_mm", self.conductor_diameter_mm)
        if self.conductor_diameter_mm * 20 > self.inscribed_diameter_mm:
            raise DesignError("the conductor must be thin beside the loop (diameter at most "
                              "1/20 of the loop's inscribed diameter) for these formulas",
                              field="conductor_diameter_mm", value=self.conductor_diameter_mm)

    @classmethod
    def circle(cls, diameter_mm: float, conductor_diameter_mm: float) -> LoopGeometry:
        """A circle of centreline diameter `diameter_mm`."""
        require_positive("diameter_mm", diameter_mm)
        return cls(0, math.pi * diameter_mm, conductor_diameter_mm)

    @classmethod
    def polygon(cls, sides: int, side_mm: float, conductor_diameter_mm: float) -> LoopGeometry:
        """A regular polygon of `sides` sides, each `side_mm` long (centreline, sharp corners)."""
        require_positive("side_mm", side_mm)
        return cls(sides, sides * side_mm, conductor_diameter_mm)

    @classmethod
    def with_perimeter(cls, sides: int, perimeter_mm: float,
                       conductor_diameter_mm: float) -> LoopGeometry:
        """A circle (`sides` 0) or polygon of centreline perimeter `perimeter_mm`."""
        return cls(sides, perimeter_mm, conductor_diameter_mm)

    @property
    def side_mm(self) -> float:
        """Length of one side (mm); for a circle, the circumference."""
        return self.perimeter_mm / self.sides if self.sides else self.perimeter_mm

    @property
    def circumradius_mm(self) -> float:
        """Radius of the circle through the corners (mm); a circle's own radius."""
        if self.sides == 0:
            return self.perimeter_mm / (2 * math.pi)
        return self.side_mm / (2 * math.sin(math.pi / self.sides))

    @property
    def inscribed_diameter_mm(self) -> float:
        """Diameter across the flats (mm); a circle's own diameter."""
        if self.sides == 0:
            return 2 * self.circumradius_mm
        return 2 * self.circumradius_mm * math.cos(math.pi / self.sides)

    @property
    def area_mm2(self) -> float:
        """Enclosed area (mm^2): pi r^2, or (n/2) R^2 sin(2 pi / n) for the polygon."""
        r = self.circumradius_mm
        if self.sides == 0:
            return math.pi * r * r
        n = self.sides
        return 0.5 * n * r * r * math.sin(2 * math.pi / n)


def radiation_resistance_ohm(area_mm2: float, frequency_hz: float) -> float:
    """Radiation resistance (ohm) of a small single-turn loop of area `area_mm2`.

    R_r = 320 pi^4 (A / lambda^2)^2, Balanis, Antenna Theory, eq. 5-24 [M].
    Valid while the loop is electrically small (see `small_loop_findings`).
    """
    require_positive("area_mm2", area_mm2)
    lam = wavelength_mm(frequency_hz)
    return RADIATION_COEFFICIENT * (area_mm2 / lam ** 2) ** 2


def _internal_term(current: CurrentDistribution) -> float:
    if current == "surface":
        return 0.0
    if current == "uniform":
        return 0.25
    raise DesignError("current distribution is 'surface' (RF, skin effect) or 'uniform' (DC)",
                      field="current", value=current)


def circle_inductance_h(loop_diameter_mm: float, conductor_diameter_mm: float,
                        current: CurrentDistribution = "surface") -> float:
    """Inductance (H) of a single circular turn of round conductor.

    L = mu0 b (ln(8b/a) - 2) for `current` "surface" (RF: the transmitting-loop
    case) or - 1.75 for "uniform" (DC); b the centreline radius, a the conductor
    radius. Grover, Inductance Calculations [M]; valid for a << b.
    """
    require_positive("loop_diameter_mm", loop_diameter_mm)
    require_positive("conductor_diameter_mm", conductor_diameter_mm)
    if conductor_diameter_mm * 20 > loop_diameter_mm:
        raise DesignError("Grover's ring formula needs a thin conductor (diameter at most "
                          "1/20 of the loop diameter)", field="conductor_diameter_mm",
                          value=conductor_diameter_mm)
    b = loop_diameter_mm / 2000.0  # m
    a = conductor_diameter_mm / 2000.0
    return MU0_H_PER_M * b * (math.log(8 * b / a) - 2.0 + _internal_term(current))


def straight_wire_inductance_h(length_mm: float, conductor_diameter_mm: float,
                               current: CurrentDistribution = "surface") -> float:
    """Partial self-inductance (H) of a straight round conductor `length_mm` long.

    (mu0 / 2 pi) [l asinh(l/a) - sqrt(l^2 + a^2) + a] for surface current (the
    mutual inductance of two parallel filaments at distance a), plus mu0 l / (8 pi)
    for uniform current. Grover, Inductance Calculations; Rosa 1908 [M].
    """
    require_positive("length_mm", length_mm)
    require_positive("conductor_diameter_mm", conductor_diameter_mm)
    ell = length_mm / 1000.0
    a = conductor_diameter_mm / 2000.0
    k = MU0_H_PER_M / (2 * math.pi)
    return k * (ell * math.asinh(ell / a) - math.hypot(ell, a) + a
                + _internal_term(current) * ell)


def corner_mutual_inductance_h(length1_mm: float, length2_mm: float, angle_rad: float) -> float:
    """Mutual inductance (H) of two straight filaments meeting at a point.

    Both filaments run away from the common point; `angle_rad` is the angle
    between them. M = (mu0 / 2 pi) cos(eps) [l atanh(m/(l+R)) + m atanh(l/(m+R))],
    R the distance between the far ends: Grover, Inductance Calculations,
    filaments meeting at a point [M]; the tests check it against scipy quadrature
    of Neumann's integral.
    """
    require_positive("length1_mm", length1_mm)
    require_positive("length2_mm", length2_mm)
    require_range("angle_rad", angle_rad, 1e-9, math.pi, "filaments meeting at a point")
    ell = length1_mm / 1000.0
    m = length2_mm / 1000.0
    r = math.sqrt(ell * ell + m * m - 2 * ell * m * math.cos(angle_rad))
    k = MU0_H_PER_M / (2 * math.pi)
    return k * math.cos(angle_rad) * (ell * math.atanh(m / (ell + r))
                                      + m * math.atanh(ell / (m + r)))


def _polygon_mutual_sum_h(sides: int, side_m: float) -> float:
    """Sum over ordered pairs of non-adjacent sides of Neumann's integral (H)."""
    n = sides
    if n < 4:
        return 0.0
    x, w = np.polynomial.legendre.leggauss(_GAUSS_NODES)
    t = (x + 1.0) / 2.0
    w = w / 2.0
    radius = side_m / (2 * math.sin(math.pi / n))
    angles = 2 * math.pi * np.arange(n + 1) / n
    corners = np.column_stack([radius * np.cos(angles), radius * np.sin(angles)])
    p0, p1 = corners[0], corners[1]
    pts0 = p0 + np.outer(t, p1 - p0)
    total = 0.0
    # by symmetry every side sees the same set of others: side 0 against side k
    for k in range(2, n - 1):
        q0, q1 = corners[k], corners[k + 1]
        ptsk = q0 + np.outer(t, q1 - q0)
        dist = np.linalg.norm(pts0[:, None, :] - ptsk[None, :, :], axis=2)
        dot = float(np.dot(p1 - p0, q1 - q0))
        total += dot * float(w @ (1.0 / dist) @ w)
    return n * MU0_H_PER_M / (4 * math.pi) * total


def polygon_inductance_h(sides: int, side_mm: float, conductor_diameter_mm: float,
                         current: CurrentDistribution = "surface") -> float:
    """Inductance (H) of a regular polygon of `sides` straight sides `side_mm` long.

    Grover's method (sum of the sides' self-inductances and all mutual
    inductances), see SOURCES. Sharp corners on the conductor's axis.
    """
    if sides < 3:
        raise DesignError("a polygon has 3 or more sides", field="sides", value=sides)
    require_positive("side_mm", side_mm)
    require_positive("conductor_diameter_mm", conductor_diameter_mm)
    if conductor_diameter_mm * 10 > side_mm:
        raise DesignError("the straight-side method needs sides at least 10 conductor "
                          "diameters long", field="side_mm", value=side_mm)
    self_sum = sides * straight_wire_inductance_h(side_mm, conductor_diameter_mm, current)
    interior = math.pi - 2 * math.pi / sides
    # neighbours: currents run head to tail, so the filaments pointing away from the
    # shared corner carry opposite senses: minus the meeting-point formula
    adjacent = -2 * sides * corner_mutual_inductance_h(side_mm, side_mm, interior)
    return self_sum + adjacent + _polygon_mutual_sum_h(sides, side_mm / 1000.0)


def loop_inductance_h(geometry: LoopGeometry, current: CurrentDistribution = "surface") -> float:
    """Inductance (H) of `geometry`: Grover's ring or polygon formula."""
    if geometry.sides == 0:
        return circle_inductance_h(2 * geometry.circumradius_mm, geometry.conductor_diameter_mm,
                                   current)
    return polygon_inductance_h(geometry.sides, geometry.side_mm, geometry.conductor_diameter_mm,
                                current)


def surface_resistance_ohm(frequency_hz: float, resistivity_ohm_m: float) -> float:
    """Surface resistance R_s = sqrt(pi f mu0 rho) (ohm per square), non-magnetic metal."""
    require_positive("frequency_hz", frequency_hz)
    require_positive("resistivity_ohm_m", resistivity_ohm_m)
    return math.sqrt(math.pi * frequency_hz * MU0_H_PER_M * resistivity_ohm_m)


def skin_depth_mm(frequency_hz: float, resistivity_ohm_m: float) -> float:
    """Skin depth delta = sqrt(rho / (pi f mu0)) (mm), non-magnetic metal."""
    require_positive("frequency_hz", frequency_hz)
    require_positive("resistivity_ohm_m", resistivity_ohm_m)
    return 1000.0 * math.sqrt(resistivity_ohm_m / (math.pi * frequency_hz * MU0_H_PER_M))


def conductor_loss_ohm(length_mm: float, conductor_diameter_mm: float, frequency_hz: float,
                       resistivity_ohm_m: float) -> float:
    """Skin-effect resistance (ohm) of a round conductor: R_s l / (pi d).

    Holds when the radius (and a tube's wall) is several skin depths; see
    `small_loop_findings` for the check.
    """
    require_positive("length_mm", length_mm)
    require_positive("conductor_diameter_mm", conductor_diameter_mm)
    rs = surface_resistance_ohm(frequency_hz, resistivity_ohm_m)
    return rs * length_mm / (math.pi * conductor_diameter_mm)


def small_loop_findings(geometry: LoopGeometry, frequency_hz: float, resistivity_ohm_m: float,
                        wall_mm: float | None = None, element: str = "") -> tuple[Finding, ...]:
    """Where the small-loop formulas stop holding at `frequency_hz`.

    Raises DesignError when the circumference exceeds 0.3 wavelength; returns a
    `small-loop-approximate` warning above 0.1 wavelength and a
    `loop-wall-thin` warning when a tube wall (`wall_mm`) is under three skin
    depths (the skin-effect loss is then underestimated).
    """
    lam = wavelength_mm(frequency_hz)
    c_wl = geometry.perimeter_mm / lam
    if c_wl > SMALL_LOOP_MAX_WL:
        raise DesignError(f"circumference is {c_wl:.3f} wavelength; the small-loop formulas "
                          f"hold below {SMALL_LOOP_MAX_WL} wavelength: use the electrical model",
                          field="frequency_hz", value=frequency_hz)
    found: list[Finding] = []
    if c_wl > SMALL_LOOP_LIMIT_WL:
        found.append(Finding(
            "small-loop-approximate", "warning",
            f"circumference is {c_wl:.3f} wavelength at {frequency_hz / 1e6:.4g} MHz, above "
            f"{SMALL_LOOP_LIMIT_WL} where the small-loop formulas are exact; take the radiation "
            "resistance and inductance from the electrical model", element))
    delta = skin_depth_mm(frequency_hz, resistivity_ohm_m)
    if wall_mm is not None:
        require_positive("wall_mm", wall_mm)
        if wall_mm < 3 * delta:
            found.append(Finding(
                "loop-wall-thin", "warning",
                f"tube wall {wall_mm:.3g} mm is under three skin depths ({3 * delta:.3g} mm) at "
                f"{frequency_hz / 1e6:.4g} MHz; the conductor loss is underestimated", element))
    return tuple(found)


@dataclass(frozen=True)
class LoopPoint:
    """The loop at one frequency, matched and tuned to resonance.

    Resistances in ohm (series, referred to the loop current), `reactance_ohm`
    the loop's inductive reactance (equal to the capacitor's at resonance),
    `capacitance_f` the capacitor to fit (F, after subtracting the loop's own
    self-capacitance), voltages (V) and current (A) at `power_w` delivered to the
    loop, bandwidths in Hz.
    """

    frequency_hz: float
    circumference_wl: float
    inductance_h: float
    reactance_ohm: float
    radiation_resistance_ohm: float
    conductor_loss_ohm: float
    joint_loss_ohm: float
    capacitor_loss_ohm: float
    total_resistance_ohm: float
    efficiency: float
    efficiency_db: float
    capacitance_f: float
    q_unloaded: float
    q_loaded: float
    bandwidth_3db_hz: float
    bandwidth_swr2_hz: float
    power_w: float
    current_a_rms: float
    capacitor_v_rms: float
    capacitor_v_peak: float
    findings: tuple[Finding, ...]


def analyse_loop(geometry: LoopGeometry, frequency_hz: float, *, resistivity_ohm_m: float,
                 power_w: float, joint_resistance_ohm: float = 0.0,
                 capacitor_esr_ohm: float | None = None, capacitor_q: float | None = None,
                 self_capacitance_f: float = 0.0, wall_mm: float | None = None,
                 element: str = "") -> LoopPoint:
    """The small loop at `frequency_hz`: losses, efficiency, tuning, Q, voltage.

    resistivity_ohm_m: the conductor's resistivity; power_w: power delivered to
    the matched loop; joint_resistance_ohm: the sum of the joints' resistances in
    series with the loop (ohm); the capacitor's loss as an ESR (ohm) or a Q
    (`capacitor_q`, ESR = X / Q), not both; self_capacitance_f: the loop's own
    distributed capacitance (F) across the gap, subtracted from the tuning
    capacitance; wall_mm: a tube's wall, for the skin-depth check.
    """
    require_positive("power_w", power_w)
    if joint_resistance_ohm < 0 or not math.isfinite(joint_resistance_ohm):
        raise DesignError("must be zero or more", field="joint_resistance_ohm",
                          value=joint_resistance_ohm)
    if self_capacitance_f < 0 or not math.isfinite(self_capacitance_f):
        raise DesignError("must be zero or more", field="self_capacitance_f",
                          value=self_capacitance_f)
    if capacitor_esr_ohm is not None and capacitor_q is not None:
        raise DesignError("give the capacitor's ESR or its Q, not both", field="capacitor_q",
                          value=capacitor_q)
    findings = small_loop_findings(geometry, frequency_hz, resistivity_ohm_m, wall_mm, element)
    lam = wavelength_mm(frequency_hz)
    omega = 2 * math.pi * frequency_hz
    ind = loop_inductance_h(geometry, "surface")
    x = omega * ind
    r_rad = radiation_resistance_ohm(geometry.area_mm2, frequency_hz)
    r_cond = conductor_loss_ohm(geometry.perimeter_mm, geometry.conductor_diameter_mm,
                                frequency_hz, resistivity_ohm_m)
    if capacitor_q is not None:
        require_positive("capacitor_q", capacitor_q)
        r_cap = x / capacitor_q
    elif capacitor_esr_ohm is not None:
        if capacitor_esr_ohm < 0 or not math.isfinite(capacitor_esr_ohm):
            raise DesignError("must be zero or more", field="capacitor_esr_ohm",
                              value=capacitor_esr_ohm)
        r_cap = capacitor_esr_ohm
    else:
        r_cap = 0.0
    r_tot = r_rad + r_cond + joint_resistance_ohm + r_cap
    c_total = 1.0 / (omega * x)
    c_fit = c_total - self_capacitance_f
    if c_fit <= 0:
        raise DesignError(f"the loop's self-capacitance exceeds the {c_total:.4g} F that "
                          "tunes it: the loop is above self-resonance here",
                          field="self_capacitance_f", value=self_capacitance_f)
    eff = r_rad / r_tot
    q_u = x / r_tot
    q_l = x / (2 * r_tot)
    current = math.sqrt(power_w / r_tot)
    v_rms = current * x
    swr = 2.0
    return LoopPoint(
        frequency_hz=frequency_hz, circumference_wl=geometry.perimeter_mm / lam,
        inductance_h=ind, reactance_ohm=x, radiation_resistance_ohm=r_rad,
        conductor_loss_ohm=r_cond, joint_loss_ohm=joint_resistance_ohm,
        capacitor_loss_ohm=r_cap, total_resistance_ohm=r_tot, efficiency=eff,
        efficiency_db=10 * math.log10(eff), capacitance_f=c_fit, q_unloaded=q_u, q_loaded=q_l,
        bandwidth_3db_hz=frequency_hz / q_l,
        bandwidth_swr2_hz=frequency_hz * (swr - 1) / (q_u * math.sqrt(swr)),
        power_w=power_w, current_a_rms=current, capacitor_v_rms=v_rms,
        capacitor_v_peak=math.sqrt(2) * v_rms, findings=findings)


@dataclass(frozen=True)
class BandTuning:
    """The loop tuned across a band: one `LoopPoint` per frequency, low to high.

    `capacitance_min_f`/`capacitance_max_f` bound the capacitor's range (the
    highest frequency needs the least); `capacitor_v_peak_max` is the worst
    peak voltage over the band (V) at the points' power.
    """

    points: tuple[LoopPoint, ...]
    capacitance_min_f: float
    capacitance_max_f: float
    capacitor_v_peak_max: float
    findings: tuple[Finding, ...]


def tune_band(geometry: LoopGeometry, low_hz: float, high_hz: float, *, steps: int = 5,
              resistivity_ohm_m: float, power_w: float, joint_resistance_ohm: float = 0.0,
              capacitor_esr_ohm: float | None = None, capacitor_q: float | None = None,
              self_capacitance_f: float = 0.0, wall_mm: float | None = None,
              element: str = "") -> BandTuning:
    """`analyse_loop` at `steps` frequencies evenly spread from `low_hz` to `high_hz`."""
    require_positive("low_hz", low_hz)
    if not high_hz > low_hz:
        raise DesignError("the band's top must be above its bottom", field="high_hz",
                          value=high_hz)
    if steps < 2:
        raise DesignError("at least 2 frequencies", field="steps", value=steps)
    freqs = np.linspace(low_hz, high_hz, steps)
    pts = tuple(analyse_loop(geometry, float(f), resistivity_ohm_m=resistivity_ohm_m,
                             power_w=power_w, joint_resistance_ohm=joint_resistance_ohm,
                             capacitor_esr_ohm=capacitor_esr_ohm, capacitor_q=capacitor_q,
                             self_capacitance_f=self_capacitance_f, wall_mm=wall_mm,
                             element=element) for f in freqs)
    seen: dict[str, Finding] = {}
    for p in pts:  # one finding per code, the worst (highest frequency) kept
        for fnd in p.findings:
            seen[fnd.code] = fnd
    return BandTuning(points=pts,
                      capacitance_min_f=min(p.capacitance_f for p in pts),
                      capacitance_max_f=max(p.capacitance_f for p in pts),
                      capacitor_v_peak_max=max(p.capacitor_v_peak for p in pts),
                      findings=tuple(seen[k] for k in sorted(seen)))


@dataclass(frozen=True)
class CouplingLoop:
    """Starting size of the coupling loop (mm), with the basis of the figure."""

    diameter_mm: float
    perimeter_mm: float
    fraction: float
    basis: str


COUPLING_FRACTION = 0.2


def coupling_loop(main_diameter_mm: float, fraction: float = COUPLING_FRACTION) -> CouplingLoop:
    """Coupling-loop diameter as a fraction of the main loop's (default 1/5).

    Common practice, no source [P]: a starting size to check with the
    electrical model (the coupling sets the match to 50 ohm).
    """
    require_positive("main_diameter_mm", main_diameter_mm)
    require_range("fraction", fraction, 0.05, 0.5, "a coupling loop is a small fraction of "
                  "the main loop")
    d = main_diameter_mm * fraction
    return CouplingLoop(diameter_mm=d, perimeter_mm=math.pi * d, fraction=fraction,
                        basis="[P] common practice, no source: about 1/5 of the main loop's "
                              "diameter; adjust with the electrical model")
